// Helper for the CTest checks that run outside tools on our waveforms (see check_*.cmake):
//   waves_tool pwm DIR      runs the 3-channel PWM workload for 2 ms through timer_probe into two
//                           VCD files, DIR/pwm_1ps.vcd (1 ps) and DIR/pwm_10ns.vcd (10 ns), and
//                           writes our own measurement of each channel, taken from the timer's
//                           edges, to DIR/pwm_measured.txt:
//                           "<signal> <period_ps> <period_us, 1 decimal> <duty_percent, 6
//                           decimals>"
//   waves_tool features DIR writes DIR/features.vcd: 300 signals (identifier codes of one, two
//                           and '$'-led characters) in nested scopes, glitches (two changes of one
//                           signal at one time), a time past 2^32 units and a final time mark
//   waves_tool compare A B  compares the scalar value changes of two VCD files by signal name,
//                           exit 0 when they agree, 1 (with the differences) when not.
#include "models/timer/timer_probe.h"
#include "sim/vcd_writer.h"
#include "tests/support/timer_event_log.h"
#include "tests/waves/pwm_workload.h"
#include "tests/waves/vcd_reader.h"

#include <cinttypes>
#include <cstdio>
#include <exception>
#include <map>
#include <string>
#include <vector>

namespace {

using namespace tickbench::waves_test;
constexpr sim::time_ps run_ps = 2'000'000'000;  // 2 ms

int dump_pwm(const std::string& dir) {
    tickbench::test_support::timer_event_log log;
    std::vector<sim::time_ps> ends;
    {
        sim::vcd_options fine;
        fine.date = "fixed for the tests";
        sim::vcd_options coarse = fine;
        coarse.unit_ps = 10'000;  // 10 ns
        sim::vcd_writer exact(dir + "/pwm_1ps.vcd", fine);
        sim::vcd_writer sampled(dir + "/pwm_10ns.vcd", coarse);
        // Two probes chained: one timer feeds both files and the event log.
        models::timer_probe second("pwm_timer", pwm_config(), sampled, 0, &log);
        models::timer_probe first("pwm_timer", pwm_config(), exact, 0, &second);
        const sim::clock_domain clock(sim::frequency::hz(clock_hz));
        models::timer_core timer(pwm_config(), clock, &first);
        exact.begin();
        sampled.begin();
        start_pwm(timer);
        timer.advance_to(run_ps);
        exact.end(run_ps);
        sampled.end(run_ps);
        if (sampled.rounded_changes() != 0) {
            std::fprintf(stderr, "waves_tool: %" PRIu64 " edges rounded at 10 ns\n",
                         sampled.rounded_changes());
            return 1;
        }
    }
    // Our own measurement from the timer's edges: period rise to rise, duty high time / period.
    std::FILE* out = std::fopen((dir + "/pwm_measured.txt").c_str(), "w");
    if (out == nullptr) return 1;
    for (unsigned c = 0; c < compare_ticks.size(); ++c) {
        const auto rises = log.pin_edges(models::main_pin(c), true);
        const auto falls = log.pin_edges(models::main_pin(c), false);
        if (rises.size() < 3 || falls.size() < 3) return 1;
        // Whole periods only, skipping the first one (it begins at time 0).
        const sim::time_ps period = rises[2] - rises[1];
        sim::time_ps high = 0;
        for (const sim::time_ps f : falls)
            if (f > rises[1]) {
                high = f - rises[1];
                break;
            }
        for (std::size_t i = 1; i + 1 < rises.size(); ++i)
            if (rises[i + 1] - rises[i] != period) {
                std::fprintf(stderr, "waves_tool: channel%u period varies\n", c + 1);
                return 1;
            }
        std::fprintf(out, "pwm_timer.channel%u %" PRIu64 " %.1f %.6f\n", c + 1, period,
                     static_cast<double>(period) / 1e6,
                     100.0 * static_cast<double>(high) / static_cast<double>(period));
    }
    return std::fclose(out) == 0 ? 0 : 1;
}

int dump_features(const std::string& dir) {
    sim::vcd_options o;
    o.date = "fixed for the tests";
    o.buffer_bytes = 4096;  // many partial writes
    sim::vcd_writer w(dir + "/features.vcd", o);
    constexpr unsigned n = 300;
    for (unsigned id = 0; id < n; ++id) {
        const std::string scope = id % 3 == 0   ? "board"
                                  : id % 3 == 1 ? "board.motor_timer"
                                                : "board.motor_timer.deep";
        w.declare(id, {scope, "s" + std::to_string(id), id % 2 == 1});
    }
    w.begin();
    sim::time_ps t = 0;
    for (unsigned step = 0; step < 2000; ++step) {
        t += 1 + (step * 7919) % 100'000;
        const unsigned id = (step * 31) % n;
        const bool level = (step / n) % 2 == 0;
        w.change(id, level, t);
        if (step % 10 == 0) {  // a glitch: back again at the same time
            w.change(id, !level, t);
            w.change(id, level, t);
        }
    }
    w.change(5, true, 10'000'000'000'000);  // 10 s: past 2^32 ps
    w.change(5, false, 10'000'000'000'000);
    w.end(12'000'000'000'000);
    return 0;
}

// A signal's changes with everything at time 0 folded into its initial value (a converter may
// write time-0 changes into $dumpvars), as (time, value) pairs.
std::map<std::string, std::vector<std::pair<sim::time_ps, char>>> normalized(
    const vcd_contents& v) {
    std::map<std::string, std::vector<std::pair<sim::time_ps, char>>> out;
    for (const std::string& s : v.signals) {
        char level = v.initial.count(s) ? v.initial.at(s) : 'x';
        std::vector<std::pair<sim::time_ps, char>> list;
        for (const auto& [at, value] : v.of(s)) {
            if (at == 0)
                level = value;
            else
                list.emplace_back(at, value);
        }
        list.insert(list.begin(), {0, level});
        out[s] = list;
    }
    return out;
}

int compare(const std::string& a_path, const std::string& b_path) {
    const auto a = normalized(read_vcd(a_path));
    const auto b = normalized(read_vcd(b_path));
    int differences = 0;
    std::size_t changes = 0;
    for (const auto& [name, list] : a) {
        const auto other = b.find(name);
        if (other == b.end()) {
            std::printf("%s: only in %s\n", name.c_str(), a_path.c_str());
            ++differences;
            continue;
        }
        changes += list.size() - 1;
        if (other->second != list) {
            std::printf("%s: %zu changes in %s, %zu in %s\n", name.c_str(), list.size() - 1,
                        a_path.c_str(), other->second.size() - 1, b_path.c_str());
            for (std::size_t i = 0; i < std::min(list.size(), other->second.size()); ++i)
                if (list[i] != other->second[i]) {
                    std::printf("  first difference: %c at %" PRIu64 " ps against %c at %" PRIu64
                                " ps\n",
                                list[i].second, list[i].first, other->second[i].second,
                                other->second[i].first);
                    break;
                }
            ++differences;
        }
    }
    for (const auto& [name, list] : b)
        if (a.count(name) == 0) {
            std::printf("%s: only in %s\n", name.c_str(), b_path.c_str());
            ++differences;
        }
    std::printf("%zu signals, %zu value changes compared, %d differ\n", a.size(), changes,
                differences);
    return differences == 0 && changes > 0 ? 0 : 1;
}

}  // namespace

int main(int argc, char** argv) {
    try {
        const std::vector<std::string> args(argv + 1, argv + argc);
        if (args.size() == 2 && args[0] == "pwm") return dump_pwm(args[1]);
        if (args.size() == 2 && args[0] == "features") return dump_features(args[1]);
        if (args.size() == 3 && args[0] == "compare") return compare(args[1], args[2]);
        std::fprintf(stderr,
                     "usage: waves_tool pwm DIR | waves_tool features DIR | waves_tool compare "
                     "A.vcd B.vcd\n");
        return 2;
    } catch (const std::exception& e) {
        std::fprintf(stderr, "waves_tool: %s\n", e.what());
        return 1;
    }
}
