// Reading a scenario file; see scenario.h and docs/scenario.md.
//
// The file is parsed once. [run] is read first because its seed is the default jitter seed of
// the crystals; then the clock tree (sim::load_clocks), the timers (their layout files, clocks and
// address windows), the cpu, the firmware, the waveform settings and the checks. Every reader
// collects findings instead of stopping, so one run shows every mistake of the file; names that
// refer to a part that failed to read (a timer whose layout is broken) are not reported again.

#include "harness/run/scenario.h"
#include "harness/run/scenario_key_overrides.h"

#include "harness/run/scenario_inputs.h"

#include "models/clock/clock_bindings.h"
#include "models/layout/register_layout.h"
#include "sim/checks/check_spec_text.h"
#include "sim/checks/condition.h"
#include "sim/clock_tree_loader_toml.h"
#include "sim/quantity.h"
#include "sim/toml_reader.h"
#include "sim/toml_text.h"
#include "sim/vcd_writer.h"

#include <algorithm>
#include <filesystem>
#include <set>

namespace harness::run {

namespace {

using sim::findings_list;
using sim::got;
using sim::hint;
using sim::in_quotes;
using sim::join;
using sim::named_table;
using sim::table_reader;
using sim::unknown_name;
namespace fs = std::filesystem;

constexpr std::int64_t int64_max = std::numeric_limits<std::int64_t>::max();
constexpr std::int64_t max_cycles = 1'000'000'000;

std::string hex(std::uint64_t v) {
    char b[24];
    std::snprintf(b, sizeof b, "0x%08llx", static_cast<unsigned long long>(v));
    return b;
}

// Everything the readers share.
struct context {
    findings_list& out;
    const std::string& file;
    fs::path dir;  // the scenario file's folder: relative paths start here
    sim::clock_tree& tree;
    bool clocks_ok = false;
    scenario& s;
    std::set<std::string> broken_timers;  // declared, but failed to read
};

// A path as written relative to the scenario file's folder.
std::string resolve(const fs::path& dir, const std::string& p) {
    const fs::path path(p);
    if (path.is_absolute() || dir.empty()) return path.lexically_normal().string();
    return (dir / path).lexically_normal().string();
}

// The optional table under `key` of `root`, or null (with a finding when it is something else).
const toml::table* sub_table(context& c, const toml::table& root, const std::string& key,
                             const std::string& accepted) {
    return table_reader(c.out, root, "").sub_table(key, false, accepted);
}

// ---- [run] ---------------------------------------------------------------------------------

void read_run(context& c, const toml::table& root) {
    const toml::table* t = sub_table(c, root, "run", "duration, seed, resolution, unmapped");
    if (!t) return;
    table_reader r(c.out, *t, "run");
    r.reject_unknown_keys({"duration", "seed", "resolution", "unmapped"}, "the run");
    c.s.run.duration = r.positive_time("duration");
    if (auto seed = r.integer("seed", 0, int64_max))
        c.s.run.seed = static_cast<std::uint64_t>(*seed);
    if (const toml::node* res = r.get("resolution", false, "")) {
        bool ok = false;
        if (res->is_string()) {
            try {
                ok = sim::parse_time(res->as_string()->get()) == 1;
            } catch (const sim::quantity_error&) {
            }
        }
        if (!ok)
            r.wrong(*res, "resolution",
                    "\"1 ps\" (the only kernel time resolution supported for now: the models and "
                    "the cpu "
                    "compute exact picosecond times)");
    }
    if (auto u = r.choice("unmapped", {"ignore", "warn", "error"}))
        c.s.run.unmapped = *models::unmapped_policy_from_string(*u);
}

// ---- [clocks] ------------------------------------------------------------------------------

void read_clocks(context& c, toml::table& root, std::uint64_t seed) {
    // The run's seed is the default jitter seed of every crystal that names none. The key is added
    // in place: a copy of the document would lose the source positions the messages need.
    if (toml::table* clocks = root["clocks"].as_table()) {
        for (auto&& [name, node] : *clocks) {
            (void)name;
            toml::table* t = node.as_table();
            if (!t) continue;
            const toml::node* kind = t->get("kind");
            if (kind && kind->is_string() && kind->as_string()->get() == "crystal" &&
                !t->get("seed"))
                t->insert("seed",
                          static_cast<std::int64_t>(seed & static_cast<std::uint64_t>(int64_max)));
        }
    }
    try {
        sim::load_clocks(root, c.file, c.tree);
        c.clocks_ok = true;
    } catch (const sim::scenario_error& e) {
        c.out.add_own(e.findings());
    }
}

// The node names a timer or cpu may use, with a finding when `name` is not one.
bool known_clock(context& c, table_reader& r, const std::string& key, const std::string& name) {
    if (!c.clocks_ok) return false;  // the clock tree's own findings say what is wrong
    if (c.tree.has_node(name)) return true;
    auto names = c.tree.node_names();
    std::sort(names.begin(), names.end());
    r.report(key, unknown_name("clock", name, names));
    return false;
}

// ---- [timers.NAME] -------------------------------------------------------------------------

const std::vector<std::string> timer_keys = {"layout",
                                             "clock",
                                             "base",
                                             "interrupt-priority",
                                             "interrupt-delay",
                                             "counter-start",
                                             "running-at-start",
                                             "access-latency"};

// The keys a timer and a peripheral of another kind share, in file order: `layout` (a file whose
// kind `refuse_kind(path, kind)` accepts by returning ""), `clock`, `base`, `interrupt-priority`
// and `interrupt-delay`. Each mistake is reported; returns false if there was one.
template <typename Spec, typename Refuse>
bool read_placement(context& c, table_reader& r, Spec& spec, Refuse refuse_kind) {
    bool ok = true;
    if (auto layout = r.string(
            "layout", true, "the path of a register layout file, relative to the scenario file")) {
        const std::string p = resolve(c.dir, *layout);
        std::error_code ec;
        if (!fs::is_regular_file(p, ec)) {
            r.report("layout", "no layout file " + in_quotes(*layout) + " (looked for " + p +
                                   "); accepted: the path of a register layout file "
                                   "(docs/register-layouts.md), relative to the scenario file");
            ok = false;
        } else {
            try {
                spec.layout = models::load_register_layout_file(p);
                if (const std::string refused = refuse_kind(*layout, spec.layout.kind);
                    !refused.empty()) {
                    r.report("layout", refused);
                    ok = false;
                }
            } catch (const sim::scenario_error& e) {
                r.report("layout", "layout file " + in_quotes(*layout) +
                                       " has mistakes (listed after this file's)");
                c.out.add_foreign(e.findings());
                ok = false;
            }
        }
    } else {
        ok = false;
    }
    if (auto clock = r.string("clock", true, "the name of a clock of [clocks]")) {
        spec.clock = *clock;
        if (!known_clock(c, r, "clock", *clock)) ok = false;
    } else {
        ok = false;
    }
    if (auto base = r.integer("base", 0, 0xffff'ffffLL, true))
        spec.base = static_cast<std::uint64_t>(*base);
    else
        ok = false;
    if (auto p = r.integer("interrupt-priority", 0, 255))
        spec.irq_priority = static_cast<unsigned>(*p);
    else if (r.has("interrupt-priority"))
        ok = false;
    if (auto d = r.time("interrupt-delay"))
        spec.irq_extra_delay = *d;
    else if (r.has("interrupt-delay"))
        ok = false;
    return ok;
}

// `access-latency`, and the window inside the 32-bit address space (after the layout was read).
template <typename Spec>
bool read_window(table_reader& r, Spec& spec, bool ok) {
    if (auto l = r.time("access-latency"))
        spec.access_latency = sc_core::sc_time::from_value(*l);
    else if (r.has("access-latency"))
        ok = false;
    if (ok && spec.base + spec.layout.size > 0x1'0000'0000ULL) {
        r.report("base", "the window " + hex(spec.base) + " + " + hex(spec.layout.size) +
                             " runs past the 32-bit address space; accepted: a base at most " +
                             hex(0x1'0000'0000ULL - spec.layout.size));
        ok = false;
    }
    return ok;
}

void read_timers(context& c, const toml::table& root) {
    const toml::table* timers = sub_table(c, root, "timers", "one table [timers.NAME] per timer");
    if (!timers) return;
    std::vector<const toml::table*> windows;  // parallel to c.s.timers
    for (const named_table& entry :
         table_reader(c.out, *timers, "timers")
             .named_tables("timer", sim::is_plain_name, sim::plain_name_words)) {
        const std::string& name = entry.name;
        if (!entry.name_ok || !entry.table) {
            c.broken_timers.insert(name);
            continue;
        }
        const toml::table& t = *entry.table;
        table_reader r(c.out, t, "timers." + name);
        r.reject_unknown_keys(timer_keys, "a timer");
        timer_spec spec;
        spec.name = name;
        bool ok = true;
        ok = read_placement(c, r, spec,
                            [](const std::string& path, const std::string& kind) {
                                return kind == "timer"
                                           ? std::string()
                                           : "layout " + in_quotes(path) + " describes a " +
                                                 in_quotes(kind) +
                                                 " peripheral; accepted: a timer layout";
                            }) &&
             ok;
        if (auto v2 = r.integer("counter-start", 0, 0xffff'ffffLL)) {
            spec.counter_start = static_cast<std::uint32_t>(*v2);
            if (ok && *spec.counter_start > spec.layout.instance.counter_max()) {
                r.report("counter-start", "counter start " + std::to_string(*v2) +
                                              " does not fit the " +
                                              std::to_string(spec.layout.instance.counter_bits) +
                                              "-bit counter; accepted: 0 to " +
                                              std::to_string(spec.layout.instance.counter_max()));
                ok = false;
            }
        } else if (r.has("counter-start")) {
            ok = false;
        }
        if (auto b = r.boolean("running-at-start"))
            spec.running_at_start = *b;
        else if (r.has("running-at-start"))
            ok = false;
        ok = read_window(r, spec, ok);
        if (!ok) {
            c.broken_timers.insert(name);
            continue;
        }
        c.s.timers.push_back(std::move(spec));
        windows.push_back(&t);
    }
    // Address windows must not overlap: each overlap is reported at the later table.
    for (std::size_t i = 0; i < c.s.timers.size(); ++i)
        for (std::size_t j = 0; j < i; ++j) {
            const timer_spec& a = c.s.timers[j];
            const timer_spec& b = c.s.timers[i];
            if (b.base < a.base + a.layout.size && a.base < b.base + b.layout.size) {
                table_reader r(c.out, *windows[i], "timers." + b.name);
                r.report("base", "the window " + hex(b.base) + ".." +
                                     hex(b.base + b.layout.size - 1) + " overlaps timers." +
                                     a.name + " (" + hex(a.base) + ".." +
                                     hex(a.base + a.layout.size - 1) +
                                     "); accepted: a base whose window overlaps no other timer's");
            }
        }
}

// ---- [peripherals.NAME] --------------------------------------------------------------------

const std::vector<std::string> peripheral_keys = {
    "layout",          "clock",          "base",          "interrupt-priority",
    "interrupt-delay", "access-latency", "reset-expected"};

// Peripherals of kinds other than the timer: the layout's kind says which model serves them.
void read_peripherals(context& c, const toml::table& root) {
    const toml::table* all = sub_table(c, root, "peripherals",
                                       "one table [peripherals.NAME] per peripheral of another "
                                       "kind (a tick timer)");
    if (!all) return;
    for (const named_table& entry :
         table_reader(c.out, *all, "peripherals")
             .named_tables("peripheral", sim::is_plain_name, sim::plain_name_words)) {
        const std::string& name = entry.name;
        if (!entry.name_ok || !entry.table) continue;
        const toml::table& t = *entry.table;
        table_reader r(c.out, t, "peripherals." + name);
        r.reject_unknown_keys(peripheral_keys, "a peripheral");
        peripheral_spec spec;
        spec.name = name;
        bool ok = true;
        for (const timer_spec& other : c.s.timers)
            if (other.name == name) {
                r.report("layout", "the name " + in_quotes(name) +
                                       " is a timer's too; accepted: a name no timer has (it "
                                       "names the interrupt line)");
                ok = false;
            }
        ok = read_placement(
                 c, r, spec,
                 [](const std::string& path, const std::string& kind) {
                     return kind != "timer"
                                ? std::string()
                                : "layout " + in_quotes(path) +
                                      " describes a timer; accepted: a layout of another kind "
                                      "(\"tick_timer\", \"watchdog\", \"slow_counter\", "
                                      "\"clock_control\"); timers "
                                      "go "
                                      "under [timers]";
                 }) &&
             ok;
        ok = read_window(r, spec, ok);
        if (ok && spec.layout.kind == "clock_control") {
            // The layout names nodes of this scenario's tree; a mismatch is the layout file's.
            const auto bad = models::check_clock_bindings(spec.layout, c.tree);
            if (!bad.empty()) {
                c.out.add_foreign(bad);
                ok = false;
            }
        }
        if (auto e = r.boolean("reset-expected")) {
            spec.reset_expected = *e;
            if (ok && spec.layout.kind != "watchdog") {
                r.report("reset-expected",
                         "only a watchdog resets the part, and this layout is a " +
                             in_quotes(spec.layout.kind) +
                             "; accepted: no reset-expected key here");
                ok = false;
            }
        } else if (r.has("reset-expected")) {
            ok = false;
        }
        if (!ok) continue;
        // Windows must not overlap a timer's or an earlier peripheral's.
        const auto overlaps = [&](const std::string& what, std::uint64_t base, std::uint32_t size) {
            if (spec.base < base + size && base < spec.base + spec.layout.size) {
                r.report("base", "the window " + hex(spec.base) + ".." +
                                     hex(spec.base + spec.layout.size - 1) + " overlaps " + what +
                                     " (" + hex(base) + ".." + hex(base + size - 1) +
                                     "); accepted: a base whose window overlaps no other "
                                     "peripheral's");
                return true;
            }
            return false;
        };
        bool clash = false;
        for (const timer_spec& o : c.s.timers)
            clash = overlaps("timers." + o.name, o.base, o.layout.size) || clash;
        for (const peripheral_spec& o : c.s.peripherals)
            clash = overlaps("peripherals." + o.name, o.base, o.layout.size) || clash;
        if (!clash) c.s.peripherals.push_back(std::move(spec));
    }
}

// ---- [cpu] ---------------------------------------------------------------------------------

void read_cpu(context& c, const toml::table& root) {
    const toml::table* t = sub_table(c, root, "cpu", "the cpu's clock and costs");
    if (!t) return;
    table_reader r(c.out, *t, "cpu");
    r.reject_unknown_keys(
        {"clock", "access-cycles", "interrupt-entry-cycles", "interrupt-exit-cycles", "quantum",
         "start-offset", "hang-accesses", "hang-wall-time"},
        "the cpu");
    // A key left out keeps cpu_config's default; the interrupt entry and exit costs there are demo
    // values (harness/cpu.h).
    cpu_config cfg;
    if (auto clock = r.string("clock", true, "the name of a clock of [clocks]")) {
        cfg.clock = *clock;
        known_clock(c, r, "clock", *clock);
    }
    if (auto v = r.integer("access-cycles", 0, max_cycles))
        cfg.access_cycles = static_cast<unsigned>(*v);
    if (auto v = r.integer("interrupt-entry-cycles", 0, max_cycles))
        cfg.irq_entry_cycles = static_cast<unsigned>(*v);
    if (auto v = r.integer("interrupt-exit-cycles", 0, max_cycles))
        cfg.irq_exit_cycles = static_cast<unsigned>(*v);
    if (auto q = r.positive_time("quantum")) cfg.quantum = *q;
    if (auto v = r.integer("start-offset", 0, int64_max))
        cfg.start_offset_cycles = static_cast<std::uint64_t>(*v);
    if (auto v = r.integer("hang-accesses", 1, int64_max))
        cfg.hang_accesses = static_cast<std::uint64_t>(*v);
    if (auto w = r.time("hang-wall-time"))
        c.s.run.hang_wall_seconds =
            static_cast<double>(*w) / static_cast<double>(sim::ps_per_second);
    c.s.cpu = cfg;
}

// ---- [firmware] ----------------------------------------------------------------------------

void read_firmware(context& c, const toml::table& root, const scenario_overrides& ov) {
    const toml::table* t =
        sub_table(c, root, "firmware", "library, entry, map-peripherals, [firmware.parameters]");
    if (!t && !ov.firmware) return;
    firmware_settings fw;
    if (t) {
        table_reader r(c.out, *t, "firmware");
        r.reject_unknown_keys({"library", "entry", "map-peripherals", "parameters"},
                              "the firmware");
        if (auto lib = r.string(
                "library", !ov.firmware,
                "the path of the firmware's shared library, relative to the scenario file")) {
            fw.library = resolve(c.dir, *lib);
            const auto& b = t->get("library")->source().begin;
            fw.origin = c.file + ":" + std::to_string(b.line) + ":" + std::to_string(b.column) +
                        ": firmware.library";
        }
        if (auto e = r.string("entry", false, "the name of a C function `void NAME(void)`"))
            fw.entry = *e;
        if (auto m = r.boolean("map-peripherals")) fw.map_peripherals = *m;
        if (const toml::node* p = t->get("parameters")) {
            if (!p->is_table()) {
                r.wrong(*p, "parameters",
                        "a table [firmware.parameters] of names and string or integer values");
            } else {
                for (auto&& [k, v] : *p->as_table()) {
                    const std::string key = "firmware.parameters." + std::string(k.str());
                    if (v.is_string())
                        fw.parameters[std::string(k.str())] = v.as_string()->get();
                    else if (v.is_integer())
                        fw.parameters[std::string(k.str())] = std::to_string(v.as_integer()->get());
                    else if (v.is_boolean())
                        fw.parameters[std::string(k.str())] =
                            v.as_boolean()->get() ? "true" : "false";
                    else
                        c.out.add(v.source(), key,
                                  "expected a string, a whole number or true/false, got " + got(v));
                }
            }
        }
    }
    if (ov.firmware) {
        fw.library = *ov.firmware;
        fw.origin = "--firmware";
    }
    if (!c.s.cpu)
        c.out.add(t ? t->source() : root.source(), "firmware",
                  "firmware needs a processor: add a table [cpu] with at least `clock`");
    c.s.firmware = fw;
}

// ---- [waves] -------------------------------------------------------------------------------

void read_waves(context& c, const toml::table& root, const std::vector<std::string>& signals) {
    const toml::table* t = sub_table(c, root, "waves", "signals, timescale, enabled");
    if (!t) {
        c.s.waves.signals = signals;
        return;
    }
    table_reader r(c.out, *t, "waves");
    r.reject_unknown_keys({"signals", "timescale", "enabled"}, "the waveform");
    if (auto e = r.boolean("enabled")) c.s.waves.enabled = *e;
    if (const toml::node* ts = r.get("timescale", false, "")) {
        bool ok = false;
        if (ts->is_string()) {
            try {
                const std::uint64_t unit = sim::parse_time(ts->as_string()->get());
                sim::vcd_writer::timescale_text(unit);  // throws for a unit VCD cannot name
                c.s.waves.unit_ps = unit;
                c.s.waves.unit_given = true;
                ok = true;
            } catch (const std::exception&) {
            }
        }
        if (!ok)
            r.wrong(*ts, "timescale",
                    "1, 10 or 100 of ps, ns, us, ms or s (\"1 ps\", \"10 ns\", \"1 us\"); edges "
                    "between units are "
                    "rounded to the nearest one");
    }
    const toml::node* n = t->get("signals");
    if (!n) {
        c.s.waves.signals = signals;
        return;
    }
    const std::string expected = "a list of signal names such as [\"fan.channel1\", \"tick.*\"]";
    const toml::array* a = n->as_array();
    if (!a) {
        r.wrong(*n, "signals", expected);
        return;
    }
    std::vector<bool> chosen(signals.size(), false);
    for (std::size_t i = 0; i < a->size(); ++i) {
        const toml::node& e = *a->get(i);
        const std::string key = "signals[" + std::to_string(i) + "]";
        if (!e.is_string()) {
            r.wrong(e, key,
                    "a signal name such as \"fan.channel1\", or \"fan.*\" for all of a timer's");
            continue;
        }
        const std::string pattern = e.as_string()->get();
        bool matched = false;
        const bool all_of_timer =
            pattern.size() > 2 && pattern.compare(pattern.size() - 2, 2, ".*") == 0;
        const std::string scope = all_of_timer ? pattern.substr(0, pattern.size() - 2) : "";
        for (std::size_t s = 0; s < signals.size(); ++s) {
            const bool hit = all_of_timer
                                 ? signals[s].compare(0, scope.size() + 1, scope + ".") == 0
                                 : signals[s] == pattern;
            if (hit) chosen[s] = matched = true;
        }
        const std::string owner = pattern.substr(0, pattern.find('.'));
        if (!matched && !c.broken_timers.count(owner)) {
            std::vector<std::string> accepted = signals;
            for (const timer_spec& ts : c.s.timers) accepted.push_back(ts.name + ".*");
            c.out.add(
                e.source(), "waves." + key,
                unknown_name("signal", pattern, accepted, "none (the scenario has no timers)"));
        }
    }
    for (std::size_t s = 0; s < signals.size(); ++s)
        if (chosen[s]) c.s.waves.signals.push_back(signals[s]);
}

// The coarsest timescale that keeps every edge of the clocks the part uses exact: their periods
// at the start, and every configured delay, must be whole multiples of it. Anything unknown in
// advance (jitter, a fractional period, a fan's tachometer) gives 1 ps.
void choose_timescale(context& c, const toml::table& root) {
    if (c.s.waves.unit_given || !c.clocks_ok) return;
    for (const input_wiring& w : c.s.inputs)
        if (w.kind == input_wiring::source_kind::stimulus && sim::stimulus::is_fan(w.stimulus))
            return;
    std::vector<sim::time_ps> times;
    std::set<std::string> used;
    for (const timer_spec& t : c.s.timers) {
        used.insert(t.clock);
        times.push_back(t.irq_extra_delay);
        times.push_back(static_cast<sim::time_ps>(t.access_latency.value()));
    }
    if (c.s.cpu && c.s.firmware) used.insert(c.s.cpu->clock);
    if (const toml::table* clocks = root["clocks"].as_table()) {
        for (auto&& [k, v] : *clocks) {
            (void)k;
            const toml::table* t = v.as_table();
            if (!t) continue;
            for (const char* key : {"jitter", "lock-time"}) {
                const toml::node* n = t->get(key);
                if (!n || !n->is_string()) continue;
                const sim::time_ps ps = sim::parse_time(n->as_string()->get());
                if (std::string(key) == "jitter" && ps != 0) return;  // edges anywhere: 1 ps
                times.push_back(ps);
            }
        }
    }
    for (const sim::clock_plan_row& row : c.tree.plan(0)) {
        if (!used.count(row.name) || row.freq.is_zero()) continue;
        // Period in ps = 10^12 * den / num; it must be whole.
        const sim::u128 scaled = sim::u128{sim::ps_per_second} * row.freq.den();
        if (scaled % row.freq.num() != 0) return;
        times.push_back(static_cast<sim::time_ps>(scaled / row.freq.num()));
    }
    if (times.empty()) return;
    // No coarser than 1 us: finer edges of firmware activity stay readable.
    c.s.waves.unit_ps = sim::vcd_writer::coarsest_exact_unit(times, 1'000'000);
}

// ---- [[checks]] ----------------------------------------------------------------------------

const std::vector<std::string> check_keys = {
    "name", "kind",  "signal", "signals", "expected",      "minimum", "maximum",  "tolerance",
    "from", "until", "settle", "edge",    "response-edge", "pulse",   "condition"};

bool single_signal(sim::check_kind k) {
    return k != sim::check_kind::phase && k != sim::check_kind::latency &&
           k != sim::check_kind::dead_time && k != sim::check_kind::never;
}

bool is_angle(const std::string& s) {
    const auto t = s.find_last_not_of(' ');
    if (t == std::string::npos) return false;
    const std::string u = s.substr(0, t + 1);
    return (u.size() >= 3 && u.compare(u.size() - 3, 3, "deg") == 0) || u.back() == '%';
}

// The value of expected/minimum/maximum in the kind's unit.
std::optional<std::uint64_t> check_value(table_reader& r, const std::string& key,
                                         const sim::check_spec& spec) {
    const toml::node* n = r.table().get(key);
    if (!n) return std::nullopt;
    std::string expected;
    try {
        switch (spec.kind) {
            case sim::check_kind::edge_count:
                expected = "a whole number of edges";
                if (const auto* i = n->as_integer(); i && i->get() >= 0)
                    return static_cast<std::uint64_t>(i->get());
                break;
            case sim::check_kind::duty_cycle:
                expected = "a duty cycle such as \"25 %\"";
                if (n->is_string()) return sim::parse_duty(n->as_string()->get());
                break;
            case sim::check_kind::phase:
                expected = "a time such as \"2 us\" or an angle such as \"120 deg\" or \"25 %\"";
                if (n->is_string()) {
                    const std::string text = n->as_string()->get();
                    return spec.phase_as_angle ? sim::parse_angle(text) : sim::parse_time(text);
                }
                break;
            case sim::check_kind::never:
                expected = "nothing (a never check has only a condition)";
                break;
            default:
                expected = sim::time_words;
                if (n->is_string()) return sim::parse_time(n->as_string()->get());
                break;
        }
    } catch (const sim::quantity_error& e) {
        r.report(key, std::string(e.what()) + "; expected " + expected);
        return std::nullopt;
    }
    r.wrong(*n, key, expected);
    return std::nullopt;
}

// The timer clock behind a signal "timer.xxx", if the timer is known.
std::optional<std::string> clock_of_signal(const scenario& s, const std::string& signal) {
    const std::string timer = signal.substr(0, signal.find('.'));
    for (const timer_spec& t : s.timers)
        if (t.name == timer) return t.clock;
    return std::nullopt;
}

void read_tolerance(context& c, table_reader& r, sim::check_spec& spec) {
    const toml::node* n = r.table().get("tolerance");
    if (!n) return;
    std::string text;
    if (n->is_integer() && spec.kind == sim::check_kind::edge_count &&
        n->as_integer()->get() >= 0) {
        spec.tol =
            sim::tolerance::absolute_units(static_cast<std::uint64_t>(n->as_integer()->get()));
        return;
    }
    const std::string accepted =
        "a tolerance such as \"100 ppm\", \"1 %\", \"20 ns\", \"2 Hz\" (frequency), \"2 deg\" "
        "(angles), \"3 ticks\" "
        "or \"3 ticks of CLOCK\"";
    if (!n->is_string()) {
        r.wrong(*n, "tolerance", accepted);
        return;
    }
    text = n->as_string()->get();
    std::string clock;
    const auto of = text.find(" of ");
    std::string amount = text;
    if (of != std::string::npos) {
        clock = text.substr(of + 4);
        clock.erase(0, clock.find_first_not_of(' '));
        clock.erase(clock.find_last_not_of(' ') + 1);
        amount = text.substr(0, of);
    }
    try {
        sim::tolerance tol = sim::parse_tolerance(amount, spec);
        if (tol.kind != sim::tolerance_kind::ticks) {
            if (!clock.empty()) {
                r.report("tolerance", "tolerance " + in_quotes(text) +
                                          ": \"of CLOCK\" goes with ticks; accepted: " + accepted);
                return;
            }
            spec.tol = tol;
            return;
        }
        if (clock.empty()) {
            const auto sig = spec.signals.empty() ? std::optional<std::string>{}
                                                  : clock_of_signal(c.s, spec.signals[0]);
            if (!sig) {
                r.report("tolerance", "tolerance " + in_quotes(text) +
                                          ": say whose ticks; accepted: \"N ticks of CLOCK\" with "
                                          "a clock of [clocks]");
                return;
            }
            clock = *sig;
        }
        if (!c.clocks_ok) return;
        if (!c.tree.has_node(clock)) {
            auto names = c.tree.node_names();
            std::sort(names.begin(), names.end());
            r.report("tolerance",
                     "tolerance " + in_quotes(text) + ": " + unknown_name("clock", clock, names));
            return;
        }
        for (const sim::clock_plan_row& row : c.tree.plan(0)) {
            if (row.name != clock) continue;
            if (row.freq.is_zero()) {
                r.report("tolerance",
                         "tolerance " + in_quotes(text) + ": clock " + in_quotes(clock) +
                             " is stopped at the start; accepted: ticks of a running clock");
                return;
            }
            spec.tol = sim::tolerance::ticks_of(tol.amount, clock, row.freq);
        }
    } catch (const sim::quantity_error& e) {
        r.report("tolerance", std::string(e.what()) + "; expected " + accepted);
    }
}

// Reports a signal name that no timer declares (unless its timer failed to read).
void check_signal_name(context& c, const toml::node& where, const std::string& key,
                       const std::string& name, const std::vector<std::string>& signals) {
    if (std::find(signals.begin(), signals.end(), name) != signals.end()) return;
    if (c.broken_timers.count(name.substr(0, name.find('.')))) return;
    c.out.add(where.source(), key,
              unknown_name("signal", name, signals, "none (the scenario has no timers)"));
}

void read_check(context& c, const toml::table& t, const std::string& path,
                const std::vector<std::string>& signals, std::set<std::string>& names) {
    table_reader r(c.out, t, path);
    r.reject_unknown_keys(check_keys, "a check");
    sim::check_spec spec;
    bool ok = true;
    std::vector<std::string> kinds;
    for (auto k :
         {sim::check_kind::frequency, sim::check_kind::period, sim::check_kind::duty_cycle,
          sim::check_kind::pulse_width, sim::check_kind::edge_count, sim::check_kind::phase,
          sim::check_kind::dead_time, sim::check_kind::latency, sim::check_kind::never})
        kinds.push_back(sim::to_string(k));
    if (auto name = r.string("name", true, "a name for the check, unique in the file")) {
        spec.name = *name;
        if (!names.insert(*name).second) {
            r.report("name", "a second check named " + in_quotes(*name) +
                                 "; accepted: a name no other check has");
            ok = false;
        }
    } else {
        ok = false;
    }
    const auto kind_text = r.choice("kind", kinds, true);
    if (!kind_text) return;
    spec.kind = *sim::check_kind_from_string(*kind_text);

    // Signals.
    if (spec.kind == sim::check_kind::never) {
        if (r.has("signal") || r.has("signals"))
            r.report(
                r.has("signal") ? "signal" : "signals",
                "a never check takes its signals from its condition; accepted: condition only");
        if (auto cond = r.string(
                "condition", true,
                "a condition such as \"bridge.channel1 and bridge.channel1_complement\"")) {
            spec.condition = *cond;
            try {
                const sim::condition parsed = sim::condition::parse(*cond);
                for (const std::string& s : parsed.signals())
                    check_signal_name(c, *t.get("condition"), path + ".condition", s, signals);
            } catch (const sim::condition_error&) {
                // validate() reports it with the column.
            }
        } else {
            ok = false;
        }
    } else if (single_signal(spec.kind)) {
        if (r.has("signals")) {
            r.report("signals",
                     "a " + *kind_text +
                         " check watches one signal; accepted: signal = \"TIMER.SIGNAL\"");
            ok = false;
        } else if (auto s = r.string("signal", true, "a signal name such as \"fan.channel1\"")) {
            spec.signals.push_back(*s);
            check_signal_name(c, *t.get("signal"), path + ".signal", *s, signals);
        } else {
            ok = false;
        }
    } else {
        const std::string expected = spec.kind == sim::check_kind::latency
                                         ? "two signal names [event, response]"
                                     : spec.kind == sim::check_kind::dead_time
                                         ? "two signal names [output, complementary output]"
                                         : "two signal names [A, B]";
        if (r.has("signal")) {
            r.report("signal", "a " + *kind_text +
                                   " check watches two signals; accepted: signals = " + expected);
            ok = false;
        } else if (const toml::node* n = r.get("signals", true, expected)) {
            const toml::array* a = n->as_array();
            if (!a || a->size() != 2 || !a->get(0)->is_string() || !a->get(1)->is_string()) {
                r.wrong(*n, "signals", expected);
                ok = false;
            } else {
                for (std::size_t i = 0; i < 2; ++i) {
                    spec.signals.push_back(a->get(i)->as_string()->get());
                    check_signal_name(c, *a->get(i), path + ".signals[" + std::to_string(i) + "]",
                                      spec.signals.back(), signals);
                }
            }
        } else {
            ok = false;
        }
    }

    // Edges and pulses.
    if (auto e = r.choice("edge", {"rising", "falling", "both"}))
        spec.edge = *sim::edge_select_from_string(*e);
    if (auto e = r.choice("response-edge", {"rising", "falling", "both"}))
        spec.response_edge = *sim::edge_select_from_string(*e);
    if (auto p = r.choice("pulse", {"high", "low"})) {
        if (spec.kind != sim::check_kind::pulse_width)
            r.report("pulse", "only pulse_width checks take `pulse`");
        spec.high_pulses = *p == "high";
    }
    if (r.has("response-edge") && spec.kind != sim::check_kind::phase &&
        spec.kind != sim::check_kind::latency)
        r.report("response-edge", "only phase and latency checks take `response-edge`");

    // Values.
    if (spec.kind == sim::check_kind::phase) {
        std::optional<bool> angle;
        for (const char* key : {"expected", "minimum", "maximum"}) {
            const toml::node* n = t.get(key);
            if (!n || !n->is_string()) continue;
            const bool a = is_angle(n->as_string()->get());
            if (angle && *angle != a) {
                r.report(key,
                         "mixes times and angles; accepted: all values of a phase check as times, "
                         "or all as angles");
                ok = false;
            }
            if (!angle) angle = a;
        }
        spec.phase_as_angle = angle.value_or(false);
    }
    if (spec.kind == sim::check_kind::frequency) {
        for (const char* key : {"minimum", "maximum"})
            if (r.has(key)) {
                r.report(key,
                         "a frequency check takes `expected` and `tolerance`; for bounds use a "
                         "period check");
                ok = false;
            }
        // 0 Hz reads, and validate() below says a frequency check needs more.
        spec.expected_frequency = r.frequency_at("expected", true);
        if (!spec.expected_frequency) ok = false;
    } else {
        for (const char* key : {"expected", "minimum", "maximum"}) {
            auto v = check_value(r, key, spec);
            if (!v && r.has(key)) ok = false;
            if (std::string(key) == "expected")
                spec.expected = v;
            else if (std::string(key) == "minimum")
                spec.minimum = v;
            else
                spec.maximum = v;
        }
    }
    read_tolerance(c, r, spec);
    if (auto f = r.time("from"))
        spec.from = *f;
    else if (r.has("from"))
        ok = false;
    if (auto u = r.time("until"))
        spec.until = *u;
    else if (r.has("until"))
        ok = false;
    if (auto s = r.time("settle"))
        spec.settle = *s;
    else if (r.has("settle"))
        ok = false;
    if (!ok) return;

    // The spec's own rules, each pointed at the key it concerns.
    for (const sim::check_spec_problem& p : sim::validate(spec)) {
        std::string key = p.field;
        if (key == "signals")
            key = r.has("signal") ? "signal" : r.has("signals") ? "signals" : "condition";
        if (key == "expected" && !r.has("expected"))
            key = r.has("minimum") ? "minimum" : r.has("maximum") ? "maximum" : "";
        if (!key.empty() && !r.has(key)) key.clear();
        r.report(key, p.message);
    }
    c.s.checks.push_back(std::move(spec));
}

void read_checks(context& c, const toml::table& root, const std::vector<std::string>& signals) {
    const toml::node* n = root.get("checks");
    if (!n) return;
    const toml::array* a = n->as_array();
    if (!a || !a->is_array_of_tables()) {
        c.out.add(n->source(), "checks", "expected one [[checks]] table per check, got " + got(*n));
        return;
    }
    std::set<std::string> names;
    for (std::size_t i = 0; i < a->size(); ++i)
        read_check(c, *a->get(i)->as_table(), "checks[" + std::to_string(i) + "]", signals, names);
}

}  // namespace

std::vector<std::string> timer_signal_names(const std::string& timer,
                                            const models::timer_config& cfg,
                                            const std::vector<models::shown_input>& inputs) {
    std::vector<std::string> v;
    for (unsigned ch = 1; ch <= cfg.channels; ++ch) {
        v.push_back(timer + ".channel" + std::to_string(ch));
        if (cfg.complementary) v.push_back(timer + ".channel" + std::to_string(ch) + "_complement");
    }
    v.push_back(timer + ".irq");
    for (const models::shown_input& in : inputs) v.push_back(timer + "." + in.name);
    return v;
}

namespace {
// Whether make_source() can run `ref`: not a fan (its tachometer starts low, sim/stimulus/
// fan_tach.h), and not glitches whose base the file got wrong (reported already, and the scenario
// is refused once its signals are known).
bool runnable(const sim::stimulus::source_ref& ref) {
    if (!ref.spec || sim::stimulus::is_fan(ref)) return false;
    if (const auto* g = std::get_if<sim::stimulus::glitch_spec>(&ref.spec->settings))
        return runnable(g->base);
    return true;
}
}  // namespace

std::vector<models::shown_input> scenario::shown_inputs(const std::string& timer) const {
    std::vector<models::shown_input> v;
    for (const input_wiring& w : inputs) {
        if (w.timer != timer || w.kind == input_wiring::source_kind::chain) continue;
        const bool initial = w.kind == input_wiring::source_kind::stimulus &&
                             runnable(w.stimulus) &&
                             sim::stimulus::make_source(w.stimulus)->initial_level();
        v.push_back({w.input, input_name(w.input), initial});
    }
    std::sort(v.begin(), v.end(), [](const models::shown_input& a, const models::shown_input& b) {
        return a.input < b.input;
    });
    return v;
}

std::vector<std::string> scenario::signal_names() const {
    std::vector<std::string> v;
    for (const timer_spec& t : timers) {
        const auto names = timer_signal_names(t.name, t.layout.instance, shown_inputs(t.name));
        v.insert(v.end(), names.begin(), names.end());
    }
    for (const peripheral_spec& p : peripherals)
        if (p.layout.kind == "watchdog") v.push_back(p.name + ".reset");
    return v;
}

scenario load_scenario(const std::string& path, sim::clock_tree& tree,
                       const scenario_overrides& ov) {
    toml::table root = sim::read_toml_file(path);
    apply_key_overrides(root, ov.keys, path);
    scenario s;
    s.file = path;
    s.name = fs::path(path).stem().string();
    findings_list out(path);
    context c{out, path, fs::path(path).parent_path(), tree, false, s, {}};

    const std::vector<std::string> tables = {"clocks", "timers",     "cpu",    "firmware",
                                             "run",    "waves",      "checks", "stimulus",
                                             "inputs", "peripherals"};
    for (auto&& [k, v] : root) {
        (void)v;
        const std::string key(k.str());
        if (std::find(tables.begin(), tables.end(), key) == tables.end()) {
            out.add(k.source(), key,
                    "unknown table " + in_quotes(key) + hint(key, tables) +
                        "; accepted: " + join(tables));
        }
    }

    read_run(c, root);
    if (ov.duration) s.run.duration = ov.duration;
    if (ov.seed) s.run.seed = *ov.seed;
    read_clocks(c, root, s.run.seed);
    read_timers(c, root);
    read_peripherals(c, root);
    s.inputs = read_inputs(out, root, c.dir, s.timers, c.broken_timers, s.run.seed);
    read_cpu(c, root);
    if (s.cpu && ov.start_offset_cycles) s.cpu->start_offset_cycles = *ov.start_offset_cycles;
    read_firmware(c, root, ov);
    // Command-line firmware parameters replace the file's (and may add new ones).
    if (s.firmware)
        for (const auto& [name, value] : ov.parameters) s.firmware->parameters[name] = value;
    const std::vector<std::string> signals = s.signal_names();
    read_waves(c, root, signals);
    read_checks(c, root, signals);
    out.raise_if_any();
    choose_timescale(c, root);
    return s;
}

}  // namespace harness::run
