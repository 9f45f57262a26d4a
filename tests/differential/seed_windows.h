#pragma once
// Which seeds the differential test runs. A fixed window, the same on every run, keeps a known set
// of programs passing; a rotating window, chosen by the commit checked out, lets every change of
// the code explore programs no run has tried, while a rerun of the same commit tries the same ones.
// Both come from the environment (DEVELOPERS.md, "Tests"); a failure prints the command line that
// reruns its one program from the seed alone.

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace tickbench::differential {

// Seeds first .. first + count - 1, and what chose them (for the log).
struct seed_window {
    std::uint64_t first = 1;
    std::uint64_t count = 0;
    std::string origin;
};

// The number of programs per window: TICKBENCH_DIFF_PROGRAMS, else `default_count`. Throws
// std::invalid_argument on a value that is not a whole number.
std::uint64_t programs_per_window(std::uint64_t default_count);
// The fixed window: from TICKBENCH_DIFF_FIRST_SEED (default 1), programs_per_window programs.
seed_window fixed_window(std::uint64_t default_count);
// The rotating window, programs_per_window programs: from TICKBENCH_DIFF_ROTATING_SEED when set (a
// first seed, or "off" for none), else from the commit checked out in `source_dir` (the UTC date
// when git cannot say). Throws std::invalid_argument on a bad TICKBENCH_DIFF_ROTATING_SEED.
std::optional<seed_window> rotating_window(std::uint64_t default_count,
                                           const std::string& source_dir);
// The first seed of the rotating window named by `text` (a commit id, a date): a multiple of 1000
// in [1 000 000, 1 000 000 000), far above the fixed window.
std::uint64_t rotating_first_seed(const std::string& text);
// The seeds shard `shard` of `shard_count` runs: every shard_count-th seed of the window.
std::vector<std::uint64_t> shard_seeds(const seed_window& w, unsigned shard, unsigned shard_count);
// The shell command that reruns program `seed` alone, in shard 0 of the fixed window of test
// `fixed_shard_test` (its name up to the shard number, e.g.
// "shards/fast_vs_reference.fixed_seeds"), with the test binary `program`.
std::string rerun_command(std::uint64_t seed, const std::string& program,
                          const std::string& fixed_shard_test);
// "first..last (origin)", for the log.
std::string describe(const seed_window& w);

}  // namespace tickbench::differential
