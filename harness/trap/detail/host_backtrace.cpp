#include "harness/trap/detail/host_backtrace.h"

#include <cxxabi.h>
#include <dlfcn.h>
#include <execinfo.h>

#include <cinttypes>
#include <cstdio>
#include <cstdlib>
#include <cstring>

namespace harness::detail {
namespace {

constexpr int max_frames = 64;

const char* base_name(const char* path) {
    if (path == nullptr || *path == '\0') return "?";
    const char* slash = std::strrchr(path, '/');
    return slash ? slash + 1 : path;
}

// `lookup` is the address used to find the symbol: a return address minus one, so that a call
// at the very end of a function is attributed to that function and not the next.
std::string describe_frame(int index, std::uint64_t pc, std::uint64_t lookup) {
    Dl_info info{};
    char line[1024];
    if (dladdr(reinterpret_cast<void*>(lookup), &info) == 0) {
        std::snprintf(line, sizeof line, "#%d 0x%016" PRIx64 " ?", index, pc);
        return line;
    }
    const char* module = base_name(info.dli_fname);
    if (info.dli_sname == nullptr) {
        const auto offset = pc - reinterpret_cast<std::uint64_t>(info.dli_fbase);
        std::snprintf(line, sizeof line, "#%d 0x%016" PRIx64 " ? (%s+0x%" PRIx64 ")", index, pc,
                      module, offset);
        return line;
    }
    int status = 0;
    char* demangled = abi::__cxa_demangle(info.dli_sname, nullptr, nullptr, &status);
    const char* name = status == 0 && demangled ? demangled : info.dli_sname;
    const auto offset = pc - reinterpret_cast<std::uint64_t>(info.dli_saddr);
    std::snprintf(line, sizeof line, "#%d 0x%016" PRIx64 " %s+0x%" PRIx64 " (%s)", index, pc, name,
                  offset, module);
    std::free(demangled);
    return line;
}

}  // namespace

std::vector<std::string> host_backtrace(std::uint64_t first_pc) {
    void* frames[max_frames];
    const int count = backtrace(frames, max_frames);
    int start = -1;
    for (int i = 0; i < count; ++i) {
        if (reinterpret_cast<std::uint64_t>(frames[i]) == first_pc) {
            start = i;
            break;
        }
    }
    std::vector<std::string> lines;
    if (start < 0) {
        // The unwinder did not step through the signal frame: name the interrupted instruction
        // first, then the whole stack as seen from here.
        lines.push_back(describe_frame(0, first_pc, first_pc));
        start = 0;
    }
    for (int i = start; i < count; ++i) {
        const auto pc = reinterpret_cast<std::uint64_t>(frames[i]);
        const bool interrupted = pc == first_pc && lines.empty();
        // Apart from the interrupted instruction itself, frames hold return addresses.
        lines.push_back(
            describe_frame(static_cast<int>(lines.size()), pc, interrupted ? pc : pc - 1));
    }
    return lines;
}

void prepare_backtrace() {
    void* frames[2];
    backtrace(frames, 2);
}

}  // namespace harness::detail
