// Metrics of `tickbench sweep` (docs/cli.md, "sweep").
//
// - sweep_runs_per_second: points per wall second of `tickbench sweep` on the counter-extension
//   example (the naive read) over start offsets 0..399 with --jobs 2 and --waves none, output to
//   /dev/shm when it exists; the wall time of the whole command, from start to exit, so the
//   scenario check and the reports count. Median of 3 runs.

#include "tests/bench/metric.h"

#include <sys/wait.h>
#include <unistd.h>
#include <algorithm>
#include <chrono>
#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

namespace {

// Wall seconds of one `tickbench sweep` over `points` start offsets.
double sweep_seconds(unsigned points) {
    const std::string dir =
        (std::filesystem::exists("/dev/shm") ? std::string("/dev/shm") : std::string("/tmp")) +
        "/tickbench_sweep_bench_" + std::to_string(::getpid());
    const std::string vary = "start-offset=0.." + std::to_string(points - 1);
    std::vector<std::string> args = {TICKBENCH_COMMAND,
                                     "sweep",
                                     TICKBENCH_COUNTER_SCENARIO,
                                     "--firmware",
                                     TICKBENCH_COUNTER_FIRMWARE,
                                     "--vary",
                                     "param.variant=naive",
                                     "--vary",
                                     vary,
                                     "--jobs",
                                     "2",
                                     "--waves",
                                     "none",
                                     "--out",
                                     dir};
    std::vector<char*> argv;
    for (std::string& a : args) argv.push_back(a.data());
    argv.push_back(nullptr);
    const auto start = std::chrono::steady_clock::now();
    const pid_t pid = ::fork();
    if (pid < 0) throw std::runtime_error("cannot fork for tickbench sweep");
    if (pid == 0) {
        if (std::freopen("/dev/null", "w", stdout) == nullptr) _exit(127);
        if (std::freopen("/dev/null", "w", stderr) == nullptr) _exit(127);
        ::execv(argv[0], argv.data());
        _exit(127);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    std::error_code ec;
    std::filesystem::remove_all(dir, ec);
    // The naive read fails at some offsets: exit code 3 is the expected verdict.
    if (!WIFEXITED(status) || WEXITSTATUS(status) != 3)
        throw std::runtime_error("tickbench sweep ended with status " + std::to_string(status) +
                                 ", expected exit code 3");
    return seconds;
}

double sweep_runs_per_second(bool quick) {
    const unsigned points = quick ? 20 : 400;
    std::vector<double> rates;
    for (int i = 0; i < (quick ? 1 : 3); ++i) rates.push_back(points / sweep_seconds(points));
    std::sort(rates.begin(), rates.end());
    return rates[rates.size() / 2];
}

const bench::add_metric sweep_rate{
    {"sweep_runs_per_second", "points/s",
     "tickbench sweep of the counter-extension example over 400 start offsets, --jobs 2, "
     "--waves none; points per wall second, median of 3 runs",
     nullptr, 0, sweep_runs_per_second}};

}  // namespace
