#include "harness/firmware_library.h"

#include <dlfcn.h>
#include <link.h>

#include <cstdint>
#include <cstring>
#include <map>
#include <vector>

namespace harness {

namespace {

// One writable segment of a loaded library and its bytes as first loaded.
struct data_segment {
    unsigned char* at = nullptr;
    std::vector<unsigned char> pristine;
};

// Per library (by handle), its writable segments as first loaded in this process.
std::map<void*, std::vector<data_segment>>& snapshots() {
    static std::map<void*, std::vector<data_segment>> s;
    return s;
}

// Byte by byte through volatile accesses, not memcpy: the sanitizers' memcpy refuses the padding
// between a library's globals, which a segment includes.
__attribute__((no_sanitize("address"))) void copy_segment(const unsigned char* from,
                                                          unsigned char* to, std::size_t n) {
    const volatile unsigned char* const src = from;
    for (std::size_t i = 0; i < n; ++i) to[i] = src[i];
}

struct segment_search {
    ElfW(Addr) base = 0;
    std::vector<data_segment>* out = nullptr;
};

int collect_segments(dl_phdr_info* info, std::size_t, void* arg) {
    auto* search = static_cast<segment_search*>(arg);
    if (info->dlpi_addr != search->base) return 0;
    for (ElfW(Half) i = 0; i < info->dlpi_phnum; ++i) {
        const ElfW(Phdr)& ph = info->dlpi_phdr[i];
        if (ph.p_type != PT_LOAD || (ph.p_flags & PF_W) == 0 || ph.p_memsz == 0) continue;
        data_segment seg;
        seg.at = reinterpret_cast<unsigned char*>(info->dlpi_addr + ph.p_vaddr);
        seg.pristine.resize(ph.p_memsz);
        copy_segment(seg.at, seg.pristine.data(), ph.p_memsz);
        search->out->push_back(std::move(seg));
    }
    return 1;
}

// Writes back the bytes of `seg` that differ from its copy. Only changed bytes are written: the
// part of the segment that the loader made read-only after relocation never changes, so it is
// never written. Word by word through volatile accesses, not memcmp/memcpy (see copy_segment).
__attribute__((no_sanitize("address"))) void restore_segment(const data_segment& seg) {
    volatile unsigned char* const at = seg.at;
    const unsigned char* const from = seg.pristine.data();
    const std::size_t n = seg.pristine.size();
    std::size_t i = 0;
    for (; i < n && (reinterpret_cast<std::uintptr_t>(at + i) % sizeof(std::uint64_t)) != 0; ++i)
        if (at[i] != from[i]) at[i] = from[i];
    for (; i + sizeof(std::uint64_t) <= n; i += sizeof(std::uint64_t)) {
        auto* word = reinterpret_cast<volatile std::uint64_t*>(at + i);
        std::uint64_t want = 0;
        std::memcpy(&want, from + i, sizeof want);
        if (*word != want) *word = want;
    }
    for (; i < n; ++i)
        if (at[i] != from[i]) at[i] = from[i];
}

}  // namespace

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
    auto& all = snapshots();
    if (all.find(handle_) == all.end()) {
        std::vector<data_segment>& segments = all[handle_];
        link_map* map = nullptr;
        if (dlinfo(handle_, RTLD_DI_LINKMAP, &map) == 0 && map) {
            segment_search search{map->l_addr, &segments};
            dl_iterate_phdr(collect_segments, &search);
        }
    }
}

void firmware_library::restore_data() const {
    const auto it = snapshots().find(handle_);
    if (it == snapshots().end()) return;
    for (const data_segment& seg : it->second) restore_segment(seg);
}

firmware_library::~firmware_library() {
    if (!handle_) return;
    dlclose(handle_);
    // Once unloaded, the handle may come back for another library: forget the copy.
    const std::string where = path_.find('/') == std::string::npos ? "./" + path_ : path_;
    if (void* still = dlopen(where.c_str(), RTLD_NOW | RTLD_NOLOAD))
        dlclose(still);
    else
        snapshots().erase(handle_);
}

void* firmware_library::symbol(const std::string& name) const {
    return dlsym(handle_, name.c_str());
}

}  // namespace harness
