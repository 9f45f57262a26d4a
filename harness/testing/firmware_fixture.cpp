#include "harness/testing/firmware_fixture.h"

#include "harness/testing/run_in_child.h"
#include "models/layout/register_layout.h"
#include "tickbench/firmware.h"

#include <unistd.h>
#include <algorithm>
#include <cstdio>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <utility>

// The firmware linked into the test binary, if any: a weak reference, so a test binary without one
// still links and run_firmware_main() can say what is missing.
#pragma weak tick_firmware_main

namespace harness {

namespace {

// The child writes its results to a file the parent reads after the child has ended: a pipe could
// fill up while the parent is still draining the child's output. Strings are length-prefixed, so
// any text (newlines in a report, colons in a path) survives.
void put(std::ostream& out, const std::string& s) { out << s.size() << ':' << s; }

std::string get(std::istream& in) {
    std::size_t n = 0;
    char colon = 0;
    in >> n;
    in.get(colon);
    std::string s(n, '\0');
    in.read(s.data(), static_cast<std::streamsize>(n));
    return s;
}

void write_results(const std::string& path, const firmware_run& r) {
    std::ofstream out(path, std::ios::binary | std::ios::trunc);
    for (const firmware_check_record& c : r.checks) {
        out << "C " << c.line << ' ' << c.passes << ' ' << c.failures << ' ' << c.first_at << ' '
            << c.last_at << ' ' << c.first_failure_at << ' ' << c.first_failure_evaluation << ' ';
        const std::vector<firmware_evaluation> recent = c.recent();
        out << recent.size();
        for (const firmware_evaluation& e : recent) out << ' ' << (e.passed ? 1 : 0) << ' ' << e.at;
        out << ' ';
        put(out, c.name);
        out << ' ';
        put(out, c.file);
        out << '\n';
    }
    for (const firmware_log_line& l : r.log) {
        out << "L " << l.at << ' ';
        put(out, l.text);
        out << '\n';
    }
    out << "R " << static_cast<int>(r.outcome) << ' ' << r.firmware_time << ' ' << r.accesses << ' '
        << (r.firmware_returned ? 1 : 0) << ' ';
    put(out, r.report);
    out << '\n';
}

// Reads what the child wrote into `r`; false when the child ended before writing its result line.
bool read_results(const std::string& path, firmware_run& r) {
    std::ifstream in(path, std::ios::binary);
    char tag = 0;
    while (in >> tag) {
        if (tag == 'C') {
            firmware_check_record c;
            std::size_t kept = 0;
            in >> c.line >> c.passes >> c.failures >> c.first_at >> c.last_at >>
                c.first_failure_at >> c.first_failure_evaluation >> kept;
            std::vector<firmware_evaluation> recent(
                std::min(kept, firmware_check_record::recent_capacity));
            for (firmware_evaluation& e : recent) {
                int passed = 0;
                in >> passed >> e.at;
                e.passed = passed != 0;
            }
            in.get();
            c.name = get(in);
            in.get();
            c.file = get(in);
            c.passed = c.failures == 0;
            c.at = c.passed ? c.last_at : c.first_failure_at;
            c.restore_recent(recent);
            r.checks.push_back(std::move(c));
        } else if (tag == 'L') {
            firmware_log_line l;
            in >> l.at;
            in.get();
            l.text = get(in);
            r.log.push_back(std::move(l));
        } else if (tag == 'R') {
            int outcome = 0;
            int returned = 0;
            in >> outcome >> r.firmware_time >> r.accesses >> returned;
            in.get();
            r.report = get(in);
            r.outcome = static_cast<run_outcome>(outcome);
            r.firmware_returned = returned != 0;
            return static_cast<bool>(in);
        } else {
            return false;
        }
    }
    return false;
}

}  // namespace

::testing::AssertionResult firmware_run::passed() const {
    if (outcome == run_outcome::completed && failed_checks().empty())
        return ::testing::AssertionSuccess();
    return ::testing::AssertionFailure() << *this;
}

std::vector<firmware_check_record> firmware_run::failed_checks() const {
    std::vector<firmware_check_record> v;
    for (const firmware_check_record& c : checks)
        if (!c.passed) v.push_back(c);
    return v;
}

std::optional<firmware_check_record> firmware_run::check(const std::string& name) const {
    for (const firmware_check_record& c : checks)
        if (c.name == name) return c;
    return std::nullopt;
}

bool firmware_run::logged(const std::string& text) const {
    for (const firmware_log_line& l : log)
        if (l.text.find(text) != std::string::npos) return true;
    return false;
}

std::ostream& operator<<(std::ostream& out, const firmware_run& run) {
    out << "firmware run " << to_string(run.outcome) << " (exit code " << run.exit_code;
    if (run.signal != 0) out << ", killed by signal " << run.signal;
    out << ") at " << sim::format_time(run.firmware_time) << " after " << run.accesses
        << " bus accesses\n";
    for (const firmware_check_record& c : run.checks) {
        out << "  check " << (c.passed ? "passed" : "FAILED") << " at " << sim::format_time(c.at)
            << ": '" << c.name << "' (" << c.file << ":" << c.line << ")";
        if (c.evaluations() > 1) {
            out << ", " << c.failures << " of " << c.evaluations() << " evaluations failed; last:";
            for (const firmware_evaluation& e : c.recent())
                out << ' ' << (e.passed ? "pass" : "FAIL") << '@' << sim::format_time(e.at);
        }
        out << "\n";
    }
    for (const firmware_log_line& l : run.log)
        out << "  log " << sim::format_time(l.at) << ": " << l.text << "\n";
    if (!run.report.empty())
        out << run.report;
    else if (run.outcome != run_outcome::completed && !run.output.empty())
        out << "child output:\n" << run.output;
    return out;
}

firmware_fixture::firmware_fixture(std::string layout_dir) : layout_dir_(std::move(layout_dir)) {}

void firmware_fixture::add_crystal_clock(const std::string& name, std::uint64_t hz) {
    clock_steps_.push_back([name, hz](sim::clock_tree& tree) {
        sim::crystal_params x;
        x.nominal = sim::frequency::hz(hz);
        tree.add_crystal(name, x);
    });
    if (!cpu_clock_chosen_) cpu_.clock = name;
    cpu_clock_chosen_ = true;
}

void firmware_fixture::add_pll_clock(const std::string& name, std::uint64_t crystal_hz,
                                     std::uint64_t multiplier, std::uint64_t divider) {
    clock_steps_.push_back([name, crystal_hz, multiplier, divider](sim::clock_tree& tree) {
        sim::crystal_params x;
        x.nominal = sim::frequency::hz(crystal_hz);
        tree.add_crystal(name + "_xtal", x);
        sim::pll_params pll;
        pll.multiplier = multiplier;
        pll.output_divider = divider;
        tree.add_pll(name, name + "_xtal", pll);
    });
    if (!cpu_clock_chosen_) cpu_.clock = name;
    cpu_clock_chosen_ = true;
}

void firmware_fixture::describe_clocks(std::function<void(sim::clock_tree&)> f) {
    clock_steps_.push_back(std::move(f));
}

timer_spec& firmware_fixture::add_timer(const std::string& name, const std::string& layout,
                                        const std::string& clock, std::uint64_t base) {
    const bool is_path =
        layout.find('/') != std::string::npos || layout.find(".toml") != std::string::npos;
    if (!is_path && layout_dir_.empty())
        throw std::invalid_argument("add_timer(\"" + name + "\"): layout \"" + layout +
                                    "\" is a name, and no folder of shipped layouts is known "
                                    "(TICKBENCH_LAYOUT_DIR, which the CMake target "
                                    "tickbench::firmware_fixture defines); expected a path to a "
                                    "layout file");
    const std::string path = is_path ? layout : layout_dir_ + "/" + layout + ".toml";
    timer_spec t;
    t.name = name;
    t.layout = models::load_register_layout_file(path);
    t.clock = clock;
    t.base = base;
    timers_.push_back(std::move(t));
    return timers_.back();
}

const firmware_run& firmware_fixture::run_firmware(std::function<void()> firmware,
                                                   time_ps duration) {
    const std::string path = ::testing::TempDir() + "tickbench_fixture_" +
                             std::to_string(getpid()) + "_" + std::to_string(runs_++);
    std::remove(path.c_str());
    last_ = firmware_run{};
    const child_result child = run_in_child(
        [&]() -> int {
            firmware_run r;
            auto& ctx = firmware_context::get();
            ctx.params = params_;
            ctx.checks.clear();
            ctx.on_log = [&r](time_ps at, const std::string& text) {
                r.log.push_back({at, text});
                std::printf("[%s] firmware: %s\n", sim::format_time(at).c_str(), text.c_str());
            };
            platform p;
            // Written on the way out of every kind of ending: a failure report comes here first.
            auto finish = [&](run_outcome outcome, const std::string& report) {
                r.outcome = outcome;
                r.report = report;
                r.checks = ctx.checks.records();
                if (harness::cpu* c = p.cpu()) {
                    r.firmware_time = c->now();
                    r.accesses = c->access_count();
                    r.firmware_returned = c->state() == firmware_state::finished;
                }
                write_results(path, r);
            };
            try {
                for (const auto& step : clock_steps_) step(p.clocks());
                for (const timer_spec& t : timers_) p.add_timer(t);
                p.set_firmware(cpu_, firmware);
                p.set_map_peripherals(map_peripherals_);
                p.set_hang_wall_seconds(hang_wall_seconds_);
                p.on_failure(
                    [&](const failure_report& report) { finish(report.outcome, report.text()); });
                p.build();
                if (before_run_) before_run_(p);
                p.run(duration);
                if (after_run_) after_run_(p);
            } catch (const std::exception& e) {
                finish(run_outcome::failed,
                       std::string("the run could not go on: ") + e.what() + "\n");
                return 1;
            }
            finish(run_outcome::completed, "");
            return 0;
        },
        true);
    last_.exit_code = child.exit_code;
    last_.signal = child.signal;
    last_.output = child.output;
    if (!read_results(path, last_)) {
        last_.outcome = run_outcome::failed;
        last_.report = "the run's child process ended without a result (exit code " +
                       std::to_string(child.exit_code) + ", signal " +
                       std::to_string(child.signal) + ")\n";
    }
    std::remove(path.c_str());
    return last_;
}

const firmware_run& firmware_fixture::run_firmware_main(time_ps duration) {
    if (&tick_firmware_main == nullptr) {
        ADD_FAILURE() << "run_firmware_main: no tick_firmware_main is linked into this test binary";
        last_ = firmware_run{};
        return last_;
    }
    return run_firmware([] { tick_firmware_main(); }, duration);
}

}  // namespace harness
