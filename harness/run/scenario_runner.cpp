// Running a scenario and writing its outputs; see scenario_runner.h.

#include "harness/run/scenario_runner.h"

#include "harness/firmware_context.h"
#include "harness/firmware_library.h"
#include "harness/platform.h"
#include "harness/run/firmware_log.h"
#include "harness/run/log_setup.h"
#include "harness/run/progress_line.h"
#include "harness/run/signal_fanout.h"
#include "models/timer/timer_probe.h"
#include "models/watchdog/watchdog_probe.h"
#include "sim/checks/check_engine.h"
#include "sim/clock_plan.h"
#include "sim/report/checks_jsonl.h"
#include "sim/report/junit_xml.h"
#include "sim/report/report_html.h"
#include "sim/report/report_model.h"
#include "sim/report/summary_text.h"
#include "sim/report/wave_recorder.h"
#include "sim/vcd_writer.h"

#include <spdlog/spdlog.h>

#include <algorithm>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <memory>
#include <optional>

namespace harness::run {

namespace {

namespace fs = std::filesystem;

const char* const output_names[] = {"waves.vcd",    "checks.jsonl", "junit.xml",   "summary.txt",
                                    "firmware.log", "failure.txt",  "report.json", "report.html"};

// One result per distinct firmware check (name, file and line), in order of first evaluation: how
// often it was evaluated and its first failure.
std::vector<sim::check_result> firmware_results(const firmware_check_log& checks,
                                                sim::time_ps end) {
    std::vector<sim::check_result> out;
    for (const firmware_check_record& c : checks.records()) {
        sim::check_result r;
        r.name = c.name;
        r.kind = sim::check_kind::never;
        r.kind_name = "firmware";
        r.signal = c.file + ":" + std::to_string(c.line);
        r.unit = "evaluations";
        r.expected_text = "holds every time it is evaluated";
        r.count = c.evaluations();
        r.passed = c.passed;
        if (c.passed) {
            r.at = end;
            r.detail = "held in all " + std::to_string(r.count) + " evaluations";
        } else {
            r.at = c.first_failure_at;
            r.detail = "failed at " + sim::format_time(c.first_failure_at) + " (evaluation " +
                       std::to_string(c.first_failure_evaluation) + "); " +
                       std::to_string(c.failures) + " of " + std::to_string(r.count) +
                       " evaluations failed";
        }
        out.push_back(std::move(r));
    }
    return out;
}

// Everything a run keeps alive until the process ends (a failure exits from inside the kernel).
struct run_state {
    scenario s;
    std::string out_dir;
    std::ostream* out = nullptr;
    std::unique_ptr<firmware_library> firmware;
    std::unique_ptr<sim::check_engine> engine;
    std::unique_ptr<sim::vcd_writer> vcd;
    // The failure report's waveform memory (only when outputs are written).
    std::unique_ptr<sim::wave_recorder> recorder;
    const sim::clock_tree* clocks = nullptr;
    std::unique_ptr<firmware_log> log;
    signal_fanout fanout;
    std::vector<std::unique_ptr<models::timer_probe>> probes;
    std::vector<std::unique_ptr<models::watchdog_probe>> watchdog_probes;
    std::optional<failure_report> failure;
    std::unique_ptr<progress_line> progress;
    bool write_outputs = true;
    std::function<void(const std::vector<sim::check_result>&, const failure_report*)> on_results;
    bool finished = false;

    std::string path(const char* name) const { return (fs::path(out_dir) / name).string(); }

    // Ends the sinks at `end` and writes the reports; returns the results.
    std::vector<sim::check_result> finish(sim::time_ps end) {
        if (progress) progress->stop();
        finished = true;
        fanout.end(end);
        if (vcd && vcd->rounded_changes() != 0)
            spdlog::warn(
                "waves.vcd: {} changes moved to the nearest {} (set [waves] timescale = \"1 ps\" "
                "to keep "
                "every edge exact)",
                vcd->rounded_changes(), sim::vcd_writer::timescale_text(vcd->unit()));
        // The log first: a failure to write it must not cost the reports.
        std::optional<sim::output_error> log_error;
        try {
            log->close();
        } catch (const sim::output_error& e) {
            log_error = e;
        }
        std::vector<sim::check_result> results = engine->results();
        const auto fw = firmware_results(firmware_context::get().checks, end);
        results.insert(results.end(), fw.begin(), fw.end());
        const std::vector<std::string> notes = {
            "firmware log: " + std::to_string(log->lines()) +
            (log->lines() == 1 ? " line in firmware.log" : " lines in firmware.log")};
        if (write_outputs) {
            sim::write_checks_jsonl(path("checks.jsonl"), results);
            sim::write_junit_xml(path("junit.xml"), results, s.name);
            sim::write_summary(path("summary.txt"), results, notes);
            if (failure) {
                std::ofstream f(path("failure.txt"), std::ios::binary);
                f << failure->text();
                f.close();
                if (!f) throw sim::output_error("cannot write " + path("failure.txt"));
            }
            // Last: the report draws on everything above, and its loss costs none of it.
            write_report(results, end);
        }
        if (on_results) on_results(results, failure ? &*failure : nullptr);
        *out << sim::summary_text(results, notes);
        if (failure)
            *out << "firmware " << to_string(failure->outcome) << ": see " << path("failure.txt")
                 << "\n";
        std::string written;
        for (const char* name : output_names) {
            const std::string n = name;
            if ((n == "waves.vcd" && !vcd) || (n == "failure.txt" && !failure)) continue;
            written += (written.empty() ? "" : ", ") + n;
        }
        *out << "outputs in " << out_dir << ": " << written << "\n";
        out->flush();
        if (log_error) throw *log_error;
        return results;
    }

    // report.json and report.html: the results with the recorder's windows and the clock plan.
    void write_report(const std::vector<sim::check_result>& results, sim::time_ps end) {
        sim::report_model m;
        m.scenario = s.name;
        m.end = end;
        if (clocks) m.clocks = sim::report_clocks(clocks->plan(0));
        for (std::size_t i = 0; i < results.size(); ++i) {
            const bool from_engine = i < engine->check_count();
            m.checks.push_back(sim::make_report_check(
                from_engine && i < s.checks.size() ? &s.checks[i] : nullptr, results[i],
                from_engine && recorder ? recorder->traces(i) : std::vector<sim::wave_trace>{}));
        }
        sim::write_report_json(path("report.json"), m);
        sim::write_report_html(path("report.html"), m);
    }

    // Flushes and closes what was opened when bad input stops the run before it starts.
    void abandon() {
        if (progress) progress->stop();
        finished = true;
        try {
            if (log) log->close();
            if (vcd) vcd->end(0);
        } catch (const std::exception& e) {
            spdlog::error("while closing outputs: {}", e.what());
        }
    }
};

std::unique_ptr<firmware_library> load_firmware(const scenario& s) {
    if (!s.firmware) return nullptr;
    try {
        return std::make_unique<firmware_library>(s.firmware->library, s.firmware->entry);
    } catch (const firmware_load_error& e) {
        throw firmware_load_error(s.firmware->origin + ": " + e.what());
    }
}

// Everything between opening the outputs and starting the kernel: the sinks, the part, the
// firmware. Throws on bad input.
void start_run(platform& part, run_state& state, const std::string& path,
               const run_options& options) {
    const scenario& s = state.s;
    const sim::time_ps duration = *s.run.duration;
    firmware_context& ctx = firmware_context::get();
    ctx.checks.clear();
    if (s.firmware) ctx.params = s.firmware->parameters;
    ctx.on_log = [&state](sim::time_ps at, const std::string& line) {
        state.log->write(at, line);
        // Stamped with the firmware's time already (log_setup.h).
        spdlog::info("firmware: {}", line);
    };

    state.engine = std::make_unique<sim::check_engine>(s.checks);
    state.fanout.add(*state.engine, {}, true);
    if (s.waves.enabled && state.write_outputs) {
        sim::vcd_options vo;
        vo.unit_ps = s.waves.unit_ps;
        // A fixed date: the same inputs give a byte-identical file.
        vo.date = "not recorded (runs are reproducible)";
        vo.version = std::string("tickbench ") + TICKBENCH_VERSION;
        vo.end_ps = duration;
        state.vcd = std::make_unique<sim::vcd_writer>(state.path("waves.vcd"), vo);
        state.fanout.add(*state.vcd, s.waves.signals, false);
    }
    if (state.write_outputs) {
        // After the engine in the fan-out: a failure the engine finds in a change is frozen
        // before the recorder sees that change, which then counts among the edges after it.
        state.recorder = std::make_unique<sim::wave_recorder>();
        state.fanout.add(*state.recorder, {}, true);
        state.engine->set_failure_listener(
            [&state](std::size_t check, sim::time_ps) { state.recorder->failure_detected(check); });
    }
    state.clocks = &part.clocks();
    sim::signal_id id = 0;
    for (timer_spec spec : s.timers) {
        state.probes.push_back(std::make_unique<models::timer_probe>(
            spec.name, spec.layout.instance, state.fanout, id, nullptr, s.shown_inputs(spec.name)));
        id = state.probes.back()->end_id();
        spec.observers.push_back(state.probes.back().get());
        spec.input_observers.push_back(state.probes.back().get());
        part.add_timer(std::move(spec));
    }
    for (peripheral_spec p : s.peripherals) {
        if (p.layout.kind == "watchdog") {
            state.watchdog_probes.push_back(
                std::make_unique<models::watchdog_probe>(p.name, state.fanout, id));
            id = state.watchdog_probes.back()->end_id();
            p.reset_observers.push_back(state.watchdog_probes.back().get());
        }
        part.add_peripheral(std::move(p));
    }
    for (const input_wiring& w : s.inputs) part.add_input(w);
    part.set_unmapped_policy(s.run.unmapped);
    part.set_hang_wall_seconds(s.run.hang_wall_seconds);
    if (s.firmware) {
        part.set_map_peripherals(s.firmware->map_peripherals);
        void (*entry)() = state.firmware->entry();
        part.set_firmware(*s.cpu, [entry] { entry(); });
    }
    try {
        part.build();
    } catch (const std::exception& e) {
        throw sim::scenario_error(sim::scenario_finding{
            path, 0, 0, "", std::string("cannot build the part: ") + e.what()});
    }
    state.fanout.begin();
    if (state.recorder) {
        std::vector<std::vector<sim::signal_id>> watched;
        for (std::size_t c = 0; c < state.engine->check_count(); ++c)
            watched.push_back(state.engine->check_signals(c));
        state.recorder->watch(watched);
    }
    part.on_failure([&state](const failure_report& r) { state.failure = r; });
    part.on_close([&state] {
        if (state.finished) return;
        const sim::time_ps end =
            std::max(state.fanout.last_time(), state.failure ? state.failure->at : 0);
        state.finish(end);
    });
    if (options.progress) {
        state.progress =
            std::make_unique<progress_line>(duration, [&state] { return state.fanout.reached(); });
        state.progress->start();
    }
}

}  // namespace

run_summary run_scenario(const std::string& path, const run_options& options, std::ostream& out) {
    // The platform and the run state live until the process ends: a firmware failure exits from
    // inside the kernel, after the closers have used them.
    // Neither is ever destroyed: SystemC modules must not be torn down after the kernel's own
    // statics, nor while their kernel's stopped threads may still refer to them.
    // Held through statics so that they stay reachable: leak checkers see no leak on any path.
    static std::vector<std::pair<platform*, run_state*>>* const kept =
        new std::vector<std::pair<platform*, run_state*>>();
    kept->emplace_back(new platform(), new run_state());
    platform* const p = kept->back().first;
    run_state& state = *kept->back().second;
    state.out = &out;
    state.out_dir = options.out_dir;
    state.s = load_scenario(path, p->clocks(), options.overrides);
    scenario& s = state.s;
    if (!s.run.duration)
        throw sim::scenario_error(
            sim::scenario_finding{path, 0, 0, "run.duration",
                                  "missing: give [run] duration = \"10 ms\" (a time), or "
                                  "--duration on the command line"});
    const sim::time_ps duration = *s.run.duration;
    state.firmware = load_firmware(s);
    // A process that ran the firmware before starts it from its data as first loaded.
    if (state.firmware) state.firmware->restore_data();

    state.write_outputs = options.write_outputs;
    state.on_results = options.on_results;
    if (options.write_outputs) {
        std::error_code ec;
        fs::create_directories(state.out_dir, ec);
        if (ec || !fs::is_directory(state.out_dir))
            throw sim::output_error("cannot create the output folder '" + state.out_dir +
                                    "': " + (ec ? ec.message() : "not a folder"));
        for (const char* name : output_names) fs::remove(state.path(name), ec);
    }
    state.log = std::make_unique<firmware_log>(options.write_outputs ? state.path("firmware.log")
                                                                     : "/dev/null");
    try {
        start_run(*p, state, path, options);
    } catch (...) {
        state.abandon();
        throw;
    }
    spdlog::info("{}: running {} (seed {}), outputs in {}", path, sim::format_time(duration),
                 s.run.seed, state.out_dir);
    stamp_simulated_time(true);
    p->set_keep_process(options.keep_process);
    p->run(duration);
    run_summary summary;
    if (p->failed()) {
        // The closers finished the outputs when the firmware failed.
        stamp_simulated_time(false);
        summary.firmware_failed = true;
        return summary;
    }
    const auto results = state.finish(duration);
    stamp_simulated_time(false);
    summary.checks = results.size();
    for (const auto& r : results) summary.failed += r.passed ? 0 : 1;
    return summary;
}

void check_scenario(const std::string& path, std::ostream& out) {
    sim::clock_tree tree;
    const scenario s = load_scenario(path, tree);
    // Building every timeline catches what only shows when edges are computed.
    tree.start();
    const std::vector<sim::clock_plan_row> rows = tree.plan(0);
    out << sim::clock_plan_text(rows);
    for (const timer_spec& t : s.timers) {
        char window[64];
        std::snprintf(window, sizeof window, "0x%08llx..0x%08llx",
                      static_cast<unsigned long long>(t.base),
                      static_cast<unsigned long long>(t.base + t.layout.size - 1));
        out << "timer " << t.name << ": layout " << t.layout.name << " at " << window << ", clock "
            << t.clock << ", " << t.layout.instance.counter_bits << "-bit counter, "
            << t.layout.instance.channels << " channels\n";
    }
    for (const peripheral_spec& p : s.peripherals) {
        char window[64];
        std::snprintf(window, sizeof window, "0x%08llx..0x%08llx",
                      static_cast<unsigned long long>(p.base),
                      static_cast<unsigned long long>(p.base + p.layout.size - 1));
        out << p.layout.kind << " " << p.name << ": layout " << p.layout.name << " at " << window
            << ", clock " << p.clock << "\n";
    }
    const auto fw = load_firmware(s);
    if (fw)
        out << "firmware " << fw->path() << ": loads, entry " << s.firmware->entry << " found\n";
    if (!s.run.duration) out << "no [run] duration: `tickbench run` needs --duration\n";
    for (const input_wiring& w : s.inputs)
        out << "input " << w.timer << "."
            << (w.kind == input_wiring::source_kind::chain ? "chain" : input_name(w.input)) << ": "
            << w.label << "\n";
    out << path << ": ok, " << rows.size() << " clocks, " << s.timers.size() << " timers, ";
    if (!s.peripherals.empty()) out << s.peripherals.size() << " other peripherals, ";
    out << s.inputs.size() << " inputs, " << s.checks.size() << " checks\n";
}

}  // namespace harness::run
