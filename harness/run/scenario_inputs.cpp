// Reading [stimulus.NAME] and [inputs]; see scenario_inputs.h and docs/scenario.md.
//
// Sources are read first, each on its own; then glitch sources are tied to the sources they lie
// over (in any file order, a loop refused); then [inputs] maps each input to a source, a timer's
// output pin, another timer's trigger pulses or the firmware, and wiring loops between timers are
// refused at the key that closes them.

#include "harness/run/scenario_inputs.h"

#include "sim/checks/check_spec_text.h"
#include "sim/quantity.h"
#include "sim/stimulus/pulse_csv.h"
#include "sim/toml_text.h"

#include <algorithm>
#include <map>
#include <memory>

namespace harness::run {

namespace {

using sim::in_quotes;
using sim::table_reader;
using sim::unknown_name;
using sim::stimulus::source_spec;
namespace fs = std::filesystem;

const std::vector<std::string> kinds = {"square", "pulses", "encoder", "glitches", "fan"};
const char* const level_words = "\"low\" or \"high\"";

std::optional<bool> level(table_reader& r, const std::string& key) {
    if (auto l = r.choice(key, {"low", "high"})) return *l == "high";
    return std::nullopt;
}

// A time string at `n` (an element of an array), with a finding when it is not one.
std::optional<sim::time_ps> time_at(table_reader& r, const toml::node& n, const std::string& key) {
    return r.time_of(n, key);
}

struct reading {
    sim::findings_list& out;
    const fs::path& dir;
    std::uint64_t seed;
    // Every source read, by name; glitch bases are filled in afterwards.
    std::map<std::string, std::shared_ptr<source_spec>> sources;
    std::map<std::string, const toml::table*> tables;
    struct pending_base {
        std::string glitches;  // the glitch source
        std::string base;      // what it names ("tach", "shaft.a")
    };
    std::vector<pending_base> bases;
    struct pending_pin {
        std::string fan;  // the fan source
        std::string pin;  // the output pin its duty comes from ("fans.channel1")
    };
    std::vector<pending_pin> fan_pins;
    std::set<std::string> incomplete;  // sources whose table has findings of its own
};

void read_square(reading&, table_reader& r, source_spec& spec, std::uint64_t seed) {
    r.reject_unknown_keys({"kind", "frequency", "duty", "phase", "offset", "jitter", "seed",
                           "start", "stop", "idle-level"},
                          "a square wave");
    sim::stimulus::square_settings s;
    s.seed = seed;
    if (auto f = r.frequency_at("frequency", true)) s.freq = *f;
    if (const toml::node* n = r.get("duty", false, "")) {
        bool ok = false;
        if (n->is_string()) {
            try {
                s.duty_ppb = sim::parse_duty(n->as_string()->get());
                ok = s.duty_ppb > 0 && s.duty_ppb < 1'000'000'000;
            } catch (const sim::quantity_error&) {
            }
        }
        if (!ok) r.wrong(*n, "duty", "a duty cycle above 0 % and below 100 % (\"25 %\")");
    }
    if (const toml::node* n = r.get("phase", false, "")) {
        bool ok = false;
        if (n->is_string()) {
            const std::string text = n->as_string()->get();
            try {
                const bool angle = text.find("deg") != std::string::npos;
                if (angle) {
                    s.phase_udeg = sim::parse_angle(text);
                    ok = s.phase_udeg < 360'000'000;
                } else {
                    s.phase_ps = sim::parse_time(text);
                    ok = true;
                }
            } catch (const sim::quantity_error&) {
            }
        }
        if (!ok)
            r.wrong(*n, "phase",
                    "a time (\"250 us\") or an angle below 360 deg (\"90 deg\") by which the "
                    "rising edges come later");
    }
    if (auto o = r.signed_quantity("offset", sim::parse_ppb, -99'999'999, 99'999'999,
                                   "a ratio within +-10 % (\"20 ppm\", \"-0.5 %\")"))
        s.offset_ppb = *o;
    if (auto j = r.time("jitter")) s.jitter = *j;
    if (auto v = r.integer("seed", 0, std::numeric_limits<std::int64_t>::max()))
        s.seed = static_cast<std::uint64_t>(*v);
    if (auto t = r.time("start")) s.start = *t;
    s.stop = r.time("stop");
    if (auto l = level(r, "idle-level")) s.idle_level = *l;
    spec.settings = s;
}

void read_pulses(reading& c, table_reader& r, source_spec& spec) {
    r.reject_unknown_keys({"kind", "edges", "file", "idle-level"}, "a pulse list");
    sim::stimulus::pulses_settings s;
    if (auto l = level(r, "idle-level")) s.idle_level = *l;
    std::vector<sim::stimulus::pulse_point> points;
    const toml::node* edges = r.table().get("edges");
    const toml::node* file = r.table().get("file");
    const std::string edge_words =
        "a list of times [\"1 ms\", \"1.5 ms\"] (each toggles the level) or of [time, level] "
        "pairs [[\"1 ms\", \"high\"]]";
    if (edges && file) {
        r.report("file", "a pulse list takes `edges` or `file`, not both; accepted: one of them");
        return;
    }
    if (!edges && !file) {
        r.report("", "missing key \"edges\" or \"file\"; accepted: edges = " + edge_words +
                         ", or file = \"PATH.csv\"");
        return;
    }
    bool ok = true;
    if (edges) {
        const toml::array* a = edges->as_array();
        if (!a) {
            r.wrong(*edges, "edges", edge_words);
            return;
        }
        for (std::size_t i = 0; i < a->size(); ++i) {
            const toml::node& e = *a->get(i);
            const std::string key = "edges[" + std::to_string(i) + "]";
            sim::stimulus::pulse_point p;
            if (const toml::array* pair = e.as_array()) {
                const toml::node* lv = pair->size() == 2 ? pair->get(1) : nullptr;
                const bool lv_ok =
                    lv && lv->is_string() &&
                    (lv->as_string()->get() == "low" || lv->as_string()->get() == "high");
                if (pair->size() != 2 || !lv_ok) {
                    r.wrong(e, key,
                            "a pair [time, level] with a level " + std::string(level_words));
                    ok = false;
                    continue;
                }
                const auto t = time_at(r, *pair->get(0), key + "[0]");
                if (!t) {
                    ok = false;
                    continue;
                }
                p.at = *t;
                p.level = lv->as_string()->get() == "high";
            } else {
                const auto t = time_at(r, e, key);
                if (!t) {
                    ok = false;
                    continue;
                }
                p.at = *t;
            }
            if (!points.empty() && p.at <= points.back().at) {
                r.report(e, key,
                         "edge at " + sim::format_time(p.at) +
                             " does not come after the one before (" +
                             sim::format_time(points.back().at) +
                             "); accepted: edges in increasing time");
                ok = false;
                continue;
            }
            points.push_back(p);
        }
    } else if (auto f = r.string("file", true, "the path of a CSV file of edges")) {
        const fs::path p = fs::path(*f).is_absolute() || c.dir.empty() ? fs::path(*f) : c.dir / *f;
        try {
            points = sim::stimulus::read_pulse_csv(p.lexically_normal().string(), *f);
        } catch (const sim::scenario_error& e) {
            r.report("file",
                     "pulse file " + in_quotes(*f) + " has mistakes (listed after this file's)");
            c.out.add_foreign(e.findings());
            ok = false;
        }
    } else {
        ok = false;
    }
    if (ok) s.edges = sim::stimulus::edges_from_points(points, s.idle_level);
    spec.settings = s;
}

void read_encoder(reading&, table_reader& r, source_spec& spec) {
    r.reject_unknown_keys({"kind", "lines", "speed"}, "an encoder");
    sim::stimulus::encoder_settings s;
    if (auto l = r.integer("lines", 1, 1'000'000, true)) s.lines = static_cast<std::uint32_t>(*l);
    const std::string words =
        "a list of [time, rpm] points such as [[\"0 ms\", 0], [\"10 ms\", 3000]]: rpm a whole "
        "number within +-1000000, negative backward; times increasing";
    const toml::node* n = r.get("speed", true, words);
    if (!n) return;
    const toml::array* a = n->as_array();
    if (!a || a->empty()) {
        r.wrong(*n, "speed", words);
        return;
    }
    for (std::size_t i = 0; i < a->size(); ++i) {
        const toml::node& e = *a->get(i);
        const std::string key = "speed[" + std::to_string(i) + "]";
        const toml::array* pair = e.as_array();
        const toml::node* rpm = pair && pair->size() == 2 ? pair->get(1) : nullptr;
        if (!rpm || !rpm->is_integer() || rpm->as_integer()->get() < -1'000'000 ||
            rpm->as_integer()->get() > 1'000'000) {
            r.wrong(e, key, "a point [time, rpm] with rpm a whole number within +-1000000");
            continue;
        }
        const auto t = time_at(r, *pair->get(0), key + "[0]");
        if (!t) continue;
        if (!s.speed.empty() && *t <= s.speed.back().at) {
            r.report(e, key,
                     "point at " + sim::format_time(*t) + " does not come after the one before (" +
                         sim::format_time(s.speed.back().at) + "); accepted: " + words);
            continue;
        }
        s.speed.push_back({*t, rpm->as_integer()->get()});
    }
    spec.settings = s;
}

void read_glitches(reading& c, table_reader& r, source_spec& spec, std::uint64_t seed) {
    r.reject_unknown_keys({"kind", "source", "width", "at", "rate", "seed", "start", "stop"},
                          "glitches");
    sim::stimulus::glitch_spec g;
    g.settings.seed = seed;
    if (auto src = r.string("source", true,
                            "the name of the source the glitches lie over (\"tach\", \"shaft.a\")"))
        c.bases.push_back({spec.name, *src});
    if (auto w = r.positive_time("width", true)) g.settings.width = *w;
    if (const toml::node* n = r.table().get("at")) {
        const toml::array* a = n->as_array();
        if (!a || a->empty()) {
            r.wrong(*n, "at", "a list of glitch start times [\"1 ms\", \"2.5 ms\"]");
        } else {
            for (std::size_t i = 0; i < a->size(); ++i)
                if (auto t = time_at(r, *a->get(i), "at[" + std::to_string(i) + "]"))
                    g.settings.at.push_back(*t);
        }
    }
    g.settings.rate = r.frequency_at("rate");
    if (auto v = r.integer("seed", 0, std::numeric_limits<std::int64_t>::max()))
        g.settings.seed = static_cast<std::uint64_t>(*v);
    if (auto t = r.time("start")) g.settings.start = *t;
    g.settings.stop = r.time("stop");
    for (const std::string& p : sim::stimulus::glitch_problems(g.settings)) {
        const std::string key = p.find("rate") != std::string::npos && r.has("rate") ? "rate"
                                : p.find("stop") != std::string::npos                ? "stop"
                                : p.find("width") != std::string::npos               ? "width"
                                : r.has("at")                                        ? "at"
                                                                                     : "";
        r.report(key, p + "; accepted: at = [times] or rate = a frequency, glitches that do not "
                          "overlap");
    }
    spec.settings = g;
}

void read_fan(reading& c, table_reader& r, source_spec& spec) {
    r.reject_unknown_keys(
        {"kind", "duty-from", "max-speed", "time-constant", "pulses-per-revolution", "averaging"},
        "a fan");
    sim::stimulus::fan_spec f;
    if (auto pin = r.string("duty-from", true,
                            "the timer output pin that drives the fan, \"TIMER.channelN\""))
        c.fan_pins.push_back({spec.name, *pin});
    if (auto v = r.integer("max-speed", 1, 1'000'000, true,
                           "a whole number of rpm at 100 % duty, from 1 to 1000000"))
        f.settings.max_rpm = static_cast<std::uint32_t>(*v);
    if (auto t = r.time("time-constant", true)) f.settings.time_constant = *t;
    if (auto v = r.integer("pulses-per-revolution", 1, 1000))
        f.settings.pulses_per_revolution = static_cast<std::uint32_t>(*v);
    if (auto t = r.positive_time("averaging")) f.settings.averaging = *t;
    spec.settings = f;
}

// Ties each fan to the output pin that drives it.
void tie_fans(reading& c, const std::vector<timer_spec>& timers,
              const std::set<std::string>& broken_timers) {
    for (const reading::pending_pin& fp : c.fan_pins) {
        auto& f = std::get<sim::stimulus::fan_spec>(c.sources.at(fp.fan)->settings);
        table_reader r(c.out, *c.tables.at(fp.fan), "stimulus." + fp.fan);
        const auto dot = fp.pin.find('.');
        const std::string timer = fp.pin.substr(0, dot);
        if (broken_timers.count(timer)) continue;
        const auto p = std::find_if(timers.begin(), timers.end(),
                                    [&](const timer_spec& x) { return x.name == timer; });
        std::vector<std::string> pins;
        for (const timer_spec& t : timers)
            for (unsigned ch = 1; ch <= t.layout.instance.channels; ++ch) {
                pins.push_back(t.name + ".channel" + std::to_string(ch));
                if (t.layout.instance.complementary)
                    pins.push_back(t.name + ".channel" + std::to_string(ch) + "_complement");
            }
        const auto pin = std::find(pins.begin(), pins.end(), fp.pin);
        if (p == timers.end() || pin == pins.end()) {
            r.report("duty-from",
                     unknown_name("output pin", fp.pin, pins, "none (the scenario has no timers)"));
            c.incomplete.insert(fp.fan);
            continue;
        }
        const std::string suffix = fp.pin.substr(dot + std::string(".channel").size());
        const unsigned ch = static_cast<unsigned>(std::stoul(suffix)) - 1;
        f.timer = timer;
        f.pin = suffix.find("_complement") != std::string::npos ? models::comp_pin(ch)
                                                                : models::main_pin(ch);
    }
}

// The settings' own rules, met only once the exact period is known: a trial source says.
void try_build(table_reader& r, const std::shared_ptr<source_spec>& spec) {
    if (std::holds_alternative<sim::stimulus::glitch_spec>(spec->settings)) return;
    if (const auto* f = std::get_if<sim::stimulus::fan_spec>(&spec->settings)) {
        for (const std::string& p : sim::stimulus::fan_problems(f->settings)) r.report("", p);
        return;
    }
    try {
        sim::stimulus::make_source({spec, sim::stimulus::encoder_output::a});
    } catch (const std::exception& e) {
        std::string what = e.what();
        const auto colon = what.find(": ");
        if (colon != std::string::npos) what = what.substr(colon + 2);
        // Point at the key the rule is about, when the table has it.
        std::string key;
        for (const char* k : {"jitter", "stop", "duty", "offset", "frequency", "phase"})
            if (what.find(k) != std::string::npos && r.has(k)) {
                key = k;
                break;
            }
        r.report(key, what);
    }
}

void read_sources(reading& c, const toml::table& root, const std::set<std::string>& timer_names) {
    const toml::node* n = root.get("stimulus");
    if (!n) return;
    const toml::table* t = n->as_table();
    if (!t) {
        c.out.add(n->source(), "stimulus",
                  "expected one table [stimulus.NAME] per source, got " + sim::got(*n));
        return;
    }
    for (const sim::named_table& entry :
         table_reader(c.out, *t, "stimulus")
             .named_tables("stimulus source", sim::is_plain_name, sim::plain_name_words)) {
        if (!entry.name_ok || !entry.table) continue;
        table_reader r(c.out, *entry.table, "stimulus." + entry.name);
        if (timer_names.count(entry.name)) {
            c.out.add(entry.key->source(), "stimulus." + entry.name,
                      "a source named like timer " + in_quotes(entry.name) + " would make \"" +
                          entry.name + ".…\" ambiguous in [inputs]; accepted: a name no timer has");
            continue;
        }
        auto kind = r.choice("kind", kinds, true);
        if (!kind) continue;
        auto spec = std::make_shared<source_spec>();
        spec->name = entry.name;
        const std::size_t before = c.out.count();
        if (*kind == "square")
            read_square(c, r, *spec, c.seed);
        else if (*kind == "pulses")
            read_pulses(c, r, *spec);
        else if (*kind == "encoder")
            read_encoder(c, r, *spec);
        else if (*kind == "fan")
            read_fan(c, r, *spec);
        else
            read_glitches(c, r, *spec, c.seed);
        c.sources[entry.name] = spec;
        c.tables[entry.name] = entry.table;
        if (c.out.count() != before) c.incomplete.insert(entry.name);
    }
}

// Splits "shaft.a" into the source and its output; a plain name is output a.
struct source_name {
    std::string name;
    std::optional<std::string> output;
};
source_name split(const std::string& text) {
    const auto dot = text.find('.');
    if (dot == std::string::npos) return {text, std::nullopt};
    return {text.substr(0, dot), text.substr(dot + 1)};
}

std::vector<std::string> names_of(const reading& c) {
    std::vector<std::string> v;
    for (const auto& [name, spec] : c.sources) {
        if (std::holds_alternative<sim::stimulus::encoder_settings>(spec->settings)) {
            v.push_back(name + ".a");
            v.push_back(name + ".b");
        } else {
            v.push_back(name);
        }
    }
    return v;
}

// A reference to a source as [inputs] or `source` writes it; an error text when there is none.
std::optional<sim::stimulus::source_ref> resolve(const reading& c, const std::string& text,
                                                 std::string& error) {
    const source_name n = split(text);
    const auto it = c.sources.find(n.name);
    if (it == c.sources.end()) {
        error = unknown_name("stimulus source", text, names_of(c));
        return std::nullopt;
    }
    const bool encoder =
        std::holds_alternative<sim::stimulus::encoder_settings>(it->second->settings);
    sim::stimulus::source_ref ref{it->second, sim::stimulus::encoder_output::a};
    if (encoder) {
        if (!n.output || (*n.output != "a" && *n.output != "b")) {
            error = "encoder " + in_quotes(n.name) +
                    " has two outputs; accepted: " + in_quotes(n.name + ".a") + " or " +
                    in_quotes(n.name + ".b");
            return std::nullopt;
        }
        if (*n.output == "b") ref.output = sim::stimulus::encoder_output::b;
    } else if (n.output) {
        error = "source " + in_quotes(n.name) + " has one output; accepted: " + in_quotes(n.name);
        return std::nullopt;
    }
    return ref;
}

void tie_glitches(reading& c) {
    for (const reading::pending_base& b : c.bases) {
        const auto& spec = c.sources.at(b.glitches);
        table_reader r(c.out, *c.tables.at(b.glitches), "stimulus." + b.glitches);
        std::string error;
        auto ref = resolve(c, b.base, error);
        if (!ref) {
            r.report("source", error);
            continue;
        }
        // Refuse glitches that lie, through others, over themselves.
        const sim::stimulus::source_spec* at = ref->spec.get();
        bool loop = false;
        for (std::size_t guard = 0; at && guard <= c.sources.size(); ++guard) {
            if (at == spec.get()) {
                loop = true;
                break;
            }
            const auto* g = std::get_if<sim::stimulus::glitch_spec>(&at->settings);
            if (!g) break;
            at = nullptr;
            for (const reading::pending_base& o : c.bases)
                if (g ==
                    std::get_if<sim::stimulus::glitch_spec>(&c.sources.at(o.glitches)->settings)) {
                    std::string ignored;
                    if (auto oref = resolve(c, o.base, ignored)) at = oref->spec.get();
                }
        }
        if (sim::stimulus::is_fan(*ref)) {
            r.report("source", "glitches cannot lie over fan " + in_quotes(b.base) +
                                   ", whose edges follow a timer pin; accepted: a square, pulse "
                                   "list or encoder source, or other glitches");
            continue;
        }
        if (loop) {
            r.report("source", "glitches over " + in_quotes(b.base) +
                                   " lie over themselves; accepted: a source that is not these "
                                   "glitches, directly or through other glitches");
            continue;
        }
        std::get<sim::stimulus::glitch_spec>(spec->settings).base = *ref;
    }
}

struct input_key {
    std::string timer;
    std::string input;
    const toml::node* value;
    const toml::key* key;
};

}  // namespace

std::vector<input_wiring> read_inputs(sim::findings_list& out, const toml::table& root,
                                      const fs::path& dir, const std::vector<timer_spec>& timers,
                                      const std::set<std::string>& broken_timers,
                                      std::uint64_t seed) {
    reading c{out, dir, seed, {}, {}, {}, {}, {}};
    std::set<std::string> timer_names = broken_timers;
    for (const timer_spec& t : timers) timer_names.insert(t.name);
    read_sources(c, root, timer_names);
    tie_glitches(c);
    tie_fans(c, timers, broken_timers);
    for (const auto& [name, spec] : c.sources) {
        if (c.incomplete.count(name)) continue;
        table_reader r(out, *c.tables.at(name), "stimulus." + name);
        try_build(r, spec);
    }

    std::vector<input_wiring> wirings;
    const toml::node* n = root.get("inputs");
    if (!n) return wirings;
    const toml::table* t = n->as_table();
    if (!t) {
        out.add(n->source(), "inputs",
                "expected a table [inputs] of \"TIMER.INPUT\" = \"SOURCE\", got " + sim::got(*n));
        return wirings;
    }
    // Both spellings: "fan.input1" = "tach", and fan.input1 = "tach" (a table per timer).
    std::vector<input_key> keys;
    for (auto&& [k, v] : *t) {
        const std::string key(k.str());
        if (const toml::table* sub = v.as_table()) {
            for (auto&& [k2, v2] : *sub) keys.push_back({key, std::string(k2.str()), &v2, &k2});
            continue;
        }
        const auto dot = key.find('.');
        if (dot == std::string::npos) {
            out.add(k.source(), "inputs." + key,
                    "expected a timer input \"TIMER.INPUT\" as the key (\"fan.input1\", "
                    "\"fan.trigger\", \"fan.fault\", \"fan.chain\"), got " +
                        in_quotes(key));
            continue;
        }
        keys.push_back({key.substr(0, dot), key.substr(dot + 1), &v, &k});
    }
    std::vector<std::string> timer_list;
    for (const timer_spec& ts : timers) timer_list.push_back(ts.name);
    for (const input_key& ik : keys) {
        const std::string path = "inputs." + ik.timer + "." + ik.input;
        const auto report = [&](const toml::node& where, const std::string& m) {
            out.add(where.source(), path, m);
        };
        if (broken_timers.count(ik.timer)) continue;
        const auto ts = std::find_if(timers.begin(), timers.end(),
                                     [&](const timer_spec& x) { return x.name == ik.timer; });
        if (ts == timers.end()) {
            out.add(
                ik.key->source(), path,
                unknown_name("timer", ik.timer, timer_list, "none (the scenario has no timers)"));
            continue;
        }
        const unsigned channels = ts->layout.instance.channels;
        std::vector<std::string> input_names;
        for (unsigned ch = 0; ch < channels; ++ch)
            input_names.push_back(input_name(models::input_of_channel(ch)));
        input_names.push_back("trigger");
        input_names.push_back("fault");
        input_names.push_back("chain");
        const auto in = std::find(input_names.begin(), input_names.end(), ik.input);
        if (in == input_names.end()) {
            out.add(ik.key->source(), path,
                    unknown_name("input", ik.input, input_names) + " (timer " +
                        in_quotes(ik.timer) + " has " + std::to_string(channels) + " channels)");
            continue;
        }
        const std::string source_words =
            ik.input == "chain"
                ? "the name of another timer, whose trigger pulses reach the chained input"
                : "the name of a [stimulus] source (\"NAME.a\"/\"NAME.b\" for an encoder), a "
                  "timer's output pin \"TIMER.channelN\" or \"TIMER.channelN_complement\", or "
                  "\"firmware\"";
        if (!ik.value->is_string()) {
            report(*ik.value, "expected " + source_words + ", got " + sim::got(*ik.value));
            continue;
        }
        const std::string text = ik.value->as_string()->get();
        input_wiring w;
        w.timer = ik.timer;
        if (ik.input == "chain") {
            if (broken_timers.count(text)) continue;
            const auto p = std::find_if(timers.begin(), timers.end(),
                                        [&](const timer_spec& x) { return x.name == text; });
            if (p == timers.end()) {
                report(*ik.value,
                       unknown_name("timer", text, timer_list) + " (" + source_words + ")");
                continue;
            }
            w.kind = input_wiring::source_kind::chain;
            w.producer = text;
            w.label = "timer " + in_quotes(text) + "'s trigger pulses";
        } else {
            w.input = static_cast<unsigned>(in - input_names.begin());
            if (ik.input == "trigger") w.input = models::trigger_pin_input;
            if (ik.input == "fault") w.input = models::fault_input;
            const source_name sn = split(text);
            if (text == "firmware") {
                w.kind = input_wiring::source_kind::firmware;
                w.label = "firmware";
            } else if (timer_names.count(sn.name)) {
                if (broken_timers.count(sn.name)) continue;
                const auto p = std::find_if(timers.begin(), timers.end(),
                                            [&](const timer_spec& x) { return x.name == sn.name; });
                std::vector<std::string> pins;
                for (unsigned ch = 1; ch <= p->layout.instance.channels; ++ch) {
                    pins.push_back(sn.name + ".channel" + std::to_string(ch));
                    if (p->layout.instance.complementary)
                        pins.push_back(sn.name + ".channel" + std::to_string(ch) + "_complement");
                }
                const auto pin = std::find(pins.begin(), pins.end(), text);
                if (pin == pins.end()) {
                    report(*ik.value, unknown_name("output pin", text, pins));
                    continue;
                }
                const unsigned idx = static_cast<unsigned>(pin - pins.begin());
                const unsigned ch = p->layout.instance.complementary ? idx / 2 : idx;
                w.kind = input_wiring::source_kind::loopback;
                w.producer = sn.name;
                w.pin = p->layout.instance.complementary && idx % 2 ? models::comp_pin(ch)
                                                                    : models::main_pin(ch);
                w.label = in_quotes(text);
            } else {
                std::string error;
                auto ref = resolve(c, text, error);
                if (!ref) {
                    report(*ik.value, error + " (or " + source_words + ")");
                    continue;
                }
                w.kind = input_wiring::source_kind::stimulus;
                w.stimulus = *ref;
                w.label = "stimulus " + in_quotes(text);
                if (const auto* fan = std::get_if<sim::stimulus::fan_spec>(&ref->spec->settings)) {
                    if (fan->timer.empty()) continue;  // its pin is reported already
                    w.producer = fan->timer;
                    w.pin = fan->pin;
                    w.label = "fan " + in_quotes(text) + " on " + in_quotes(fan->timer);
                }
            }
        }
        const bool twice = std::any_of(wirings.begin(), wirings.end(), [&](const input_wiring& o) {
            const bool chain = o.kind == input_wiring::source_kind::chain;
            return o.timer == w.timer && chain == (w.kind == input_wiring::source_kind::chain) &&
                   (chain || o.input == w.input);
        });
        if (twice) {
            out.add(ik.key->source(), path,
                    "input " + in_quotes(ik.timer + "." + ik.input) +
                        " is wired twice (both spellings, \"TIMER.INPUT\" and a [inputs.TIMER] "
                        "table, name it); accepted: one source per input");
            continue;
        }
        // A producer must not depend on this timer: follow producers from the producer.
        if (!w.producer.empty()) {
            std::vector<std::string> chain = {w.producer};
            std::vector<std::string> todo = {w.producer};
            bool loop = w.producer == w.timer;
            while (!todo.empty() && !loop) {
                const std::string cur = todo.back();
                todo.pop_back();
                for (const input_wiring& o : wirings)
                    if (o.timer == cur && !o.producer.empty()) {
                        if (o.producer == w.timer) loop = true;
                        if (std::find(chain.begin(), chain.end(), o.producer) == chain.end()) {
                            chain.push_back(o.producer);
                            todo.push_back(o.producer);
                        }
                    }
            }
            if (loop) {
                report(*ik.value,
                       "wiring loop: timer " + in_quotes(w.timer) + " would depend on its own " +
                           "outputs through " + w.label +
                           " (a timer's input would wait for the timer itself); accepted: a source "
                           "that does not depend on timer " +
                           in_quotes(w.timer));
                continue;
            }
        }
        wirings.push_back(std::move(w));
    }
    return wirings;
}

}  // namespace harness::run
