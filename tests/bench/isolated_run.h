#pragma once
// Runs one measurement in a forked child process and returns the number it produced.
//
// SystemC elaborates once per process and its kernel cannot be restarted, so each workload that
// needs a kernel (a SystemC-clocked reference, the fast model in its module, firmware on a
// platform) runs in a child of its own; the parent compares the children's results side by side.

#include <functional>

namespace bench {

// The value `body` returns, computed in a child process. Throws std::runtime_error if the child
// fails or dies.
double run_isolated(const std::function<double()>& body);

}  // namespace bench
