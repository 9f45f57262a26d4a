#pragma once
// Side-by-side measurement: the sides of a comparison run in interleaved rounds, one sample of each
// side per round, and each side's result is the median of its samples.
//
// Every ratio tickbench-bench reports compares like with like this way: the same workload, the same
// number of samples on both sides, and a busy moment on a shared machine lands in one round of
// every side rather than in all samples of one side.

#include <functional>
#include <vector>

namespace bench {

// The median of `v` (the mean of the two middle values for an even count). `v` is not empty.
double median(std::vector<double> v);

// Runs `rounds` rounds; in each, every side once (the order rotates from round to round, so no
// side always runs first). Returns each side's median, in the order of `sides`.
std::vector<double> interleaved_medians(int rounds,
                                        const std::vector<std::function<double()>>& sides);

}  // namespace bench
