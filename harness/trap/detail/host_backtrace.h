#pragma once

// A symbolised backtrace of the calling thread for crash reports: function (demangled) plus
// offset and module, from the dynamic symbol table. Executables must be linked with
// -rdynamic (CMake ENABLE_EXPORTS) for their own functions to have names.

#include <cstdint>
#include <string>
#include <vector>

namespace harness::detail {

// Frames of the calling thread, innermost first, starting at the frame whose address is
// `first_pc` when it is on the stack (so the signal handler's own frames are left out), as
// "#N 0xADDR function+0xOFF (module)".
std::vector<std::string> host_backtrace(std::uint64_t first_pc);

// Loads what backtrace() loads lazily (the unwinder), so that a crash does not do it first.
void prepare_backtrace();

}  // namespace harness::detail
