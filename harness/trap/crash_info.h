#pragma once

// What the trap engine knows about a fatal signal in the host process: a crash outside the
// mapped peripherals, an abort, an illegal instruction, or a trapped access it cannot complete.
// The firmware runner's crash hook turns it into a run report before the process goes down.

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

namespace harness {

// A fatal signal, described for a report.
struct crash_info {
    // Signal number (SIGSEGV, SIGBUS, SIGFPE, SIGILL or SIGABRT).
    int signal_number = 0;
    // Signal name, e.g. "SIGSEGV".
    std::string signal_name;
    // One line saying what went wrong, e.g. "write to unmapped address 0x0".
    std::string message;
    // Data address of the fault (si_addr); 0 when the signal has none (SIGABRT).
    std::uint64_t fault_address = 0;
    // Address of the instruction that was executing.
    std::uint64_t instruction_address = 0;
    // Host backtrace, innermost frame first, one "#N 0xADDR function+0xOFF (module)" per entry.
    std::vector<std::string> backtrace;
};

// Called on the crashing thread before the process dies; it may write a report and _exit().
using crash_hook = std::function<void(const crash_info& info)>;

// Renders the crash as text: the signal and message on the first line, then the backtrace.
std::string describe(const crash_info& info);

}  // namespace harness
