// Metrics of a whole run (issue: the tickbench command), measured side by side in this run.
//
// - vcd_overhead: wall time of the 3-channel 25 kHz PWM workload (timer_bench.cpp's) with its pins
//   probed into the streamed VCD writer, over the same with the probe feeding a sink that drops
//   everything: the cost of the waveform. Medians of 5 interleaved rounds, each run in its own
//   process (interleaved.h). The file goes to /dev/shm when it exists: the writer's cost, not the
//   disk's.
// - rss_growth_ratio: peak resident memory of the `tickbench run` process itself on the fan
//   controller example for 100 s simulated over the same for 10 s. Nothing in a run may grow with
//   its length: waveforms and checks stream, histories are forgotten. The peak is the process's own
//   high-water mark (VmHWM), read when it is about to exit: the resource usage a parent gets from
//   wait() would also count the pages the child inherited from the forking benchmark.

#include "models/timer/timer_module.h"
#include "models/timer/timer_probe.h"
#include "sim/clock_tree.h"
#include "sim/vcd_writer.h"
#include "tests/bench/interleaved.h"
#include "tests/bench/isolated_run.h"
#include "tests/bench/metric.h"
#include "tests/bench/pwm_workload.h"

#include <systemc>

#include <sys/ptrace.h>
#include <sys/wait.h>
#include <unistd.h>
#include <algorithm>
#include <chrono>
#include <csignal>
#include <cstdio>
#include <fstream>
#include <stdexcept>
#include <string>

namespace {

// A sink that declares and drops: the probe's own cost without any output.
struct null_sink final : sim::signal_sink {
    std::uint64_t changes = 0;
    void declare(sim::signal_id, const sim::signal_info&) override {}
    void begin() override {}
    void change(sim::signal_id, bool, sim::time_ps) override { ++changes; }
    void end(sim::time_ps) override {}
};

// The PWM workload with its pins probed into `sink`; wall seconds of the run. Child process only.
double probed_pwm(sim::signal_sink& sink, sim::time_ps simulated) {
    constexpr std::uint64_t hz = 48'000'000;
    sim::clock_tree tree;
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(hz);
    tree.add_crystal("timer_clock", x);
    const models::timer_config cfg = bench::pwm_config();
    models::timer_module timer("pwm", cfg, tree, "timer_clock");
    models::timer_probe probe("pwm", cfg, sink, 0);
    timer.add_observer(&probe);
    tree.start();
    sink.begin();
    bench::program_pwm(
        hz, [&](models::timer_field f, unsigned c, std::uint32_t v) { timer.write(f, c, v, 0); });
    sc_core::sc_start(sc_core::SC_ZERO_TIME);
    const auto t0 = std::chrono::steady_clock::now();
    sc_core::sc_start(sc_core::sc_time::from_value(simulated));
    timer.advance_to(simulated);
    sink.end(simulated);
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

double vcd_overhead(bool quick) {
    const sim::time_ps simulated = quick ? 20'000'000'000 : 10'000'000'000'000;  // 20 ms / 10 s
    // On a memory file system where there is one: the metric is the writer's cost, not the disk's
    // (whose write-back throttling on a shared machine varies from run to run).
    const std::string dir = access("/dev/shm", W_OK) == 0 ? "/dev/shm" : "/tmp";
    const std::string path = dir + "/tickbench-bench-" + std::to_string(getpid()) + ".vcd";
    const std::vector<double> m =
        bench::interleaved_medians(quick ? 1 : 5, {[&] {
                                                       return bench::run_isolated([&] {
                                                           sim::vcd_options o;
                                                           o.date = "bench";
                                                           sim::vcd_writer vcd(path, o);
                                                           return probed_pwm(vcd, simulated);
                                                       });
                                                   },
                                                   [&] {
                                                       return bench::run_isolated([&] {
                                                           null_sink sink;
                                                           return probed_pwm(sink, simulated);
                                                       });
                                                   }});
    std::remove(path.c_str());
    return m[0] / m[1];
}

// The high-water mark of resident memory (VmHWM) of process `pid`, in KiB, or -1.
double vm_hwm_kib(pid_t pid) {
    std::ifstream status("/proc/" + std::to_string(pid) + "/status");
    for (std::string line; std::getline(status, line);)
        if (line.rfind("VmHWM:", 0) == 0) return std::stod(line.substr(6));
    return -1;
}

// Peak resident set size in KiB of `tickbench run` on the fan controller for `duration`. The
// child asks to be traced before it starts the program, so that it stops as it is about to exit
// and its own high-water mark can be read.
double peak_rss_kib(const std::string& duration) {
    const std::string out = "/tmp/tickbench-bench-rss-" + std::to_string(getpid());
    const pid_t pid = fork();
    if (pid < 0) throw std::runtime_error("fork failed");
    if (pid == 0) {
        std::freopen("/dev/null", "w", stdout);
        std::freopen("/dev/null", "w", stderr);
        ptrace(PTRACE_TRACEME, 0, nullptr, nullptr);
        execl(TICKBENCH_COMMAND, TICKBENCH_COMMAND, "run", TICKBENCH_FAN_SCENARIO, "--firmware",
              TICKBENCH_FAN_FIRMWARE, "--duration", duration.c_str(), "--out", out.c_str(),
              static_cast<char*>(nullptr));
        _exit(127);
    }
    int status = 0;
    double peak = -1;
    // The first stop is the exec; from then on only the exit stop matters.
    waitpid(pid, &status, 0);
    if (WIFSTOPPED(status)) {
        ptrace(PTRACE_SETOPTIONS, pid, nullptr, PTRACE_O_TRACEEXIT);
        ptrace(PTRACE_CONT, pid, nullptr, nullptr);
        for (;;) {
            waitpid(pid, &status, 0);
            if (!WIFSTOPPED(status)) break;
            int signal = 0;
            if ((status >> 8) == (SIGTRAP | (PTRACE_EVENT_EXIT << 8)))
                peak = vm_hwm_kib(pid);
            else
                signal = WSTOPSIG(status);  // pass on what the program itself received
            ptrace(PTRACE_CONT, pid, nullptr, signal);
        }
    }
    std::system(("rm -rf " + out).c_str());
    // Exit 1 only says a check failed (a short run leaves the late checks without data).
    if (!WIFEXITED(status) || WEXITSTATUS(status) > 1 || peak < 0)
        throw std::runtime_error("tickbench run --duration " + duration + " failed (status " +
                                 std::to_string(status) + ")");
    return peak;
}

double rss_growth_ratio(bool quick) {
    const double short_run = peak_rss_kib(quick ? "10 ms" : "10 s");
    const double long_run = peak_rss_kib(quick ? "100 ms" : "100 s");
    return long_run / short_run;
}

const bench::add_metric vcd{{"vcd_overhead", "x",
                             "wall time with the VCD writer / with a sink that drops, 3-channel "
                             "25 kHz PWM at 48 MHz, 10 s simulated, median of 5 interleaved "
                             "rounds",
                             nullptr, 0, vcd_overhead}};
const bench::add_metric rss{
    {"rss_growth_ratio", "x",
     "peak RSS (VmHWM) of the tickbench run process on the fan controller, 100 s / 10 s "
     "simulated",
     nullptr, 0, rss_growth_ratio}};

}  // namespace
