#pragma once
// Runs a function in a forked child process and returns its exit status.
//
// SystemC elaborates once per process and cannot be restarted, and a firmware failure ends the
// process with exit code 3 by design. Tests that need many runs (a sweep of start offsets) or that
// expect a run to fail elaborate once, then fork a child per run: the child inherits the elaborated
// platform, sets its run parameters, runs, and exits; the parent collects exit codes.

#include <functional>
#include <string>

namespace harness {

struct child_result {
    int exit_code = -1;  // the child's exit code, or -1 if it died by a signal
    int signal = 0;      // the signal that ended it, or 0
    std::string output;  // what it wrote to stdout and stderr (when captured)
};

// Runs `body` in a child; its return value is the child's exit code. With capture, the child's
// stdout and stderr are collected; otherwise they are discarded when `quiet`, inherited if not.
child_result run_in_child(const std::function<int()>& body, bool capture = false,
                          bool quiet = false);

}  // namespace harness
