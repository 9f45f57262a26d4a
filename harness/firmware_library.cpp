#include "harness/firmware_library.h"

#include <dlfcn.h>

namespace harness {

firmware_library::firmware_library(const std::string& path, const std::string& entry)
    : path_(path) {
    // A bare file name would make the loader search system paths; firmware is always a file of
    // ours.
    const std::string where = path.find('/') == std::string::npos ? "./" + path : path;
    handle_ = dlopen(where.c_str(), RTLD_NOW | RTLD_LOCAL);
    if (!handle_) {
        const char* e = dlerror();
        throw firmware_load_error("cannot load firmware '" + path +
                                  "': " + (e ? e : "unknown error") +
                                  "; expected a shared library built with -fPIC -shared");
    }
    void* f = dlsym(handle_, entry.c_str());
    if (!f) {
        dlclose(handle_);
        handle_ = nullptr;
        throw firmware_load_error("firmware '" + path + "' has no entry point '" + entry +
                                  "'; define `void " + entry + "(void)` with C linkage");
    }
    entry_ = reinterpret_cast<void (*)()>(f);
}

firmware_library::~firmware_library() {
    if (handle_) dlclose(handle_);
}

void* firmware_library::symbol(const std::string& name) const {
    return dlsym(handle_, name.c_str());
}

}  // namespace harness
