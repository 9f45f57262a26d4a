// Reading [clocks] tables into a clock_tree; see clock_tree_loader.h and docs/scenario.md.
//
// Reading goes in two passes. The first checks each table against the schema of its kind and
// collects every finding rather than stopping at the first, so one run shows all the typos. Only
// when the tables are sound is the tree built and its own rules (problems()) checked; those
// findings point at the table of the node they name.

#include "sim/clock_tree_loader.h"
#include "sim/clock_tree_loader_toml.h"
#include "sim/quantity.h"
#include "sim/toml_reader.h"
#include "sim/toml_text.h"

#include <algorithm>
#include <limits>
#include <map>
#include <optional>
#include <vector>

namespace sim {

namespace {

constexpr std::int64_t int64_max = std::numeric_limits<std::int64_t>::max();
// Integer settings are bounded so that products of them cannot overflow 64 bits.
constexpr std::int64_t max_ratio_factor = 1'000'000;       // PLL multiplier and dividers
constexpr std::int64_t max_divide_factor = 1'000'000'000;  // divider nodes
constexpr std::int64_t max_trim = 1'000'000;
constexpr std::int64_t min_celsius = -273;
constexpr std::int64_t max_celsius = 1000;
constexpr std::int64_t max_ratio_ppb = 1'000'000'000;  // 100 %
constexpr std::int64_t max_tempco_ppb = 1'000'000;     // 1000 ppm/C2
// The clock tree treats an RC oscillator trimmed 50 % or more off nominal as stopped (its
// rc_ppb_limit); the loader refuses such a setting instead of letting it pass as a silent 0 Hz.
constexpr std::int64_t rc_offset_limit_ppb = 500'000'000;

const char* const ratio_words = "a ratio such as \"20 ppm\" (units ppb, ppm, %)";
const char* const tempco_words = "a coefficient such as \"-34 ppb/C2\" (units ppb/C2, ppm/C2)";
const char* const range_words =
    "two frequencies [low, high] such as [\"3 MHz\", \"6 MHz\"], \"0 Hz\" leaving a side open";

// An exact signed percentage of a ppb value, e.g. "-10.25 %".
std::string percent_text(std::int64_t ppb) {
    const std::int64_t a = ppb < 0 ? -ppb : ppb;
    std::string frac = std::to_string(a % 10'000'000);
    frac.insert(frac.begin(), 7 - frac.size(), '0');
    while (!frac.empty() && frac.back() == '0') frac.pop_back();
    return (ppb < 0 ? "-" : "") + std::to_string(a / 10'000'000) +
           (frac.empty() ? "" : "." + frac) + " %";
}

// A reference from one node to another by name, kept with its place in the file for messages.
struct clock_ref {
    std::string name;
    const toml::node* where = nullptr;
    std::string key;
};

// Everything read from one [clocks.NAME] table.
struct node_spec {
    std::string name;
    const toml::table* table = nullptr;
    clock_kind kind = clock_kind::external;
    crystal_params crystal;
    rc_params rc;
    frequency external;
    pll_params pll;
    std::uint64_t factor = 1;
    std::vector<clock_ref> inputs;
    std::optional<clock_ref> select;  // mux: the selected input by name
    bool enabled = true;              // gate
};

// A clock name (its existence is checked once every table is read).
std::optional<clock_ref> clock_name(table_reader& r, const std::string& key, bool required) {
    const toml::node* n = r.get(key, required, "the name of a clock");
    if (!n) return std::nullopt;
    if (!n->is_string() || n->as_string()->get().empty()) {
        r.wrong(*n, key, "the name of a clock");
        return std::nullopt;
    }
    return clock_ref{n->as_string()->get(), n, r.key_path(key)};
}

std::optional<std::vector<clock_ref>> clock_names(table_reader& r, const std::string& key) {
    const std::string expected = "a list of one or more clock names such as [\"rc_fast\", \"pll\"]";
    const toml::node* n = r.get(key, true, expected);
    if (!n) return std::nullopt;
    const toml::array* a = n->as_array();
    if (!a || a->empty()) {
        r.wrong(*n, key, expected);
        return std::nullopt;
    }
    std::vector<clock_ref> names;
    bool ok = true;
    for (std::size_t i = 0; i < a->size(); ++i) {
        const toml::node& e = *a->get(i);
        const std::string item = key + "[" + std::to_string(i) + "]";
        if (!e.is_string() || e.as_string()->get().empty()) {
            r.wrong(e, item, "the name of a clock");
            ok = false;
        } else {
            names.push_back({e.as_string()->get(), &e, r.key_path(item)});
        }
    }
    if (!ok) return std::nullopt;
    return names;
}

// A ratio in ppb; `lo` bounds it from below (0 for a tolerance, else -100 %).
std::optional<std::int64_t> ratio(table_reader& r, const std::string& key, std::int64_t lo) {
    return r.signed_quantity(
        key, parse_ppb, lo, max_ratio_ppb,
        std::string(ratio_words) + (lo == 0 ? " from 0 to 100 %" : " from -100 % to 100 %"));
}

std::optional<std::int64_t> tempco(table_reader& r, const std::string& key) {
    return r.signed_quantity(key, parse_ppb_per_c2, -max_tempco_ppb, max_tempco_ppb,
                             std::string(tempco_words) + " from -1000 ppm/C2 to 1000 ppm/C2");
}

// An optional [low, high] frequency range.
std::optional<frequency_range> range(table_reader& r, const std::string& key) {
    const toml::node* n = r.get(key, false, range_words);
    if (!n) return std::nullopt;
    const toml::array* a = n->as_array();
    if (!a || a->size() != 2) {
        r.wrong(*n, key, range_words);
        return std::nullopt;
    }
    const auto lo = r.frequency_of(*a->get(0), key + "[0]");
    const auto hi = r.frequency_of(*a->get(1), key + "[1]");
    if (!lo || !hi) return std::nullopt;
    if (!lo->is_zero() && !hi->is_zero() && *lo > *hi) {
        r.report(*n, key,
                 "low end " + lo->pretty() + " is above high end " + hi->pretty() +
                     "; accepted: " + range_words);
        return std::nullopt;
    }
    return frequency_range{*lo, *hi};
}

// An optional [min, max] pair of whole numbers, each within [lo, hi].
std::optional<std::pair<std::int64_t, std::int64_t>> int_pair(table_reader& r,
                                                              const std::string& key,
                                                              std::int64_t lo, std::int64_t hi) {
    const std::string expected =
        "two whole numbers [min, max] from " + std::to_string(lo) + " to " + std::to_string(hi);
    const toml::node* n = r.get(key, false, expected);
    if (!n) return std::nullopt;
    const toml::array* a = n->as_array();
    const auto in = [&](const toml::node* e) {
        return e->is_integer() && e->as_integer()->get() >= lo && e->as_integer()->get() <= hi;
    };
    if (!a || a->size() != 2 || !in(a->get(0)) || !in(a->get(1))) {
        r.wrong(*n, key, expected);
        return std::nullopt;
    }
    return std::make_pair(a->get(0)->as_integer()->get(), a->get(1)->as_integer()->get());
}

constexpr clock_kind all_kinds[] = {
    clock_kind::crystal, clock_kind::rc_oscillator, clock_kind::external, clock_kind::pll,
    clock_kind::divider, clock_kind::mux,           clock_kind::gate,     clock_kind::boost};

std::vector<std::string> keys_of(clock_kind k) {
    switch (k) {
        case clock_kind::crystal:
            return {"kind",     "frequency",   "offset", "temperature-coefficient",
                    "turnover", "temperature", "jitter", "seed"};
        case clock_kind::rc_oscillator:
            return {"kind",      "frequency",  "tolerance", "deviation",
                    "trim-step", "trim-range", "trim"};
        case clock_kind::external:
            return {"kind", "frequency"};
        case clock_kind::pll:
            return {"kind",      "input",   "input-divider", "multiplier", "output-divider",
                    "lock-time", "enabled", "input-range",   "vco-range",  "output-range"};
        case clock_kind::divider:
            return {"kind", "input", "factor"};
        case clock_kind::mux:
            return {"kind", "inputs", "select"};
        case clock_kind::gate:
            return {"kind", "input", "enabled"};
        case clock_kind::boost:
            return {"kind", "input", "factor"};
    }
    return {};
}

// Reads one node table; false (with findings) when anything is wrong.
bool read_node(table_reader& r, const std::string& name, const toml::table& t, node_spec& spec) {
    spec.name = name;
    spec.table = &t;
    std::vector<std::string> kind_names;
    for (clock_kind k : all_kinds) kind_names.push_back(to_string(k));
    const auto kind_text = r.choice("kind", kind_names, true);
    if (!kind_text) return false;
    spec.kind =
        all_kinds[std::find(kind_names.begin(), kind_names.end(), *kind_text) - kind_names.begin()];
    const std::string what = std::string("a ") + to_string(spec.kind) + " clock";
    r.reject_unknown_keys(keys_of(spec.kind), what);

    // Every key is read even after a mistake, so all findings come out in one run.
    bool ok = true;
    auto need = [&ok](const auto& v) {
        if (!v) ok = false;
        return static_cast<bool>(v);
    };
    auto take = [&ok, &t](const std::string& key, const auto& v, auto& into) {
        if (v)
            into = *v;
        else if (t.get(key))
            ok = false;
    };
    switch (spec.kind) {
        case clock_kind::crystal: {
            auto& c = spec.crystal;
            if (auto f = r.frequency_at("frequency", true); need(f)) c.nominal = *f;
            take("offset", ratio(r, "offset", -max_ratio_ppb), c.offset_ppb);
            take("temperature-coefficient", tempco(r, "temperature-coefficient"),
                 c.tempco_ppb_per_c2);
            take("turnover", r.integer("turnover", min_celsius, max_celsius), c.turnover_c);
            take("temperature", r.integer("temperature", min_celsius, max_celsius),
                 c.temperature_c);
            take("jitter", r.time("jitter"), c.jitter);
            std::int64_t seed = 0;
            take("seed", r.integer("seed", 0, int64_max, false), seed);
            c.seed = static_cast<std::uint64_t>(seed);
            break;
        }
        case clock_kind::rc_oscillator: {
            auto& c = spec.rc;
            if (auto f = r.frequency_at("frequency", true); need(f)) c.nominal = *f;
            take("tolerance", ratio(r, "tolerance", 0), c.tolerance_ppb);
            take("deviation", ratio(r, "deviation", -max_ratio_ppb), c.deviation_ppb);
            take("trim-step", ratio(r, "trim-step", -max_ratio_ppb), c.trim_step_ppb);
            std::pair<std::int64_t, std::int64_t> tr{0, 0};
            take("trim-range", int_pair(r, "trim-range", -max_trim, max_trim), tr);
            c.trim_min = tr.first;
            c.trim_max = tr.second;
            take("trim", r.integer("trim", -max_trim, max_trim, false), c.trim);
            const std::int64_t total = c.deviation_ppb + c.trim * c.trim_step_ppb;
            if (ok && (total >= rc_offset_limit_ppb || total <= -rc_offset_limit_ppb)) {
                r.report(t.get("trim") ? "trim" : "deviation",
                         "deviation plus trim x trim-step puts the oscillator " +
                             percent_text(total) +
                             " off nominal; accepted: less than 50 % either way");
                ok = false;
            }
            break;
        }
        case clock_kind::external:
            take("frequency", r.frequency_at("frequency"), spec.external);
            break;
        case clock_kind::pll: {
            auto& p = spec.pll;
            if (auto in = clock_name(r, "input", true); need(in)) spec.inputs.push_back(*in);
            std::int64_t v = 1;
            take("input-divider", r.integer("input-divider", 1, max_ratio_factor, false), v);
            p.input_divider = static_cast<std::uint64_t>(v);
            if (auto m = r.integer("multiplier", 1, max_ratio_factor, true); need(m))
                p.multiplier = static_cast<std::uint64_t>(*m);
            v = 1;
            take("output-divider", r.integer("output-divider", 1, max_ratio_factor, false), v);
            p.output_divider = static_cast<std::uint64_t>(v);
            take("lock-time", r.time("lock-time"), p.lock_time);
            take("enabled", r.boolean("enabled"), p.enabled);
            take("input-range", range(r, "input-range"), p.input_range);
            take("vco-range", range(r, "vco-range"), p.vco_range);
            take("output-range", range(r, "output-range"), p.output_range);
            break;
        }
        case clock_kind::divider: {
            if (auto in = clock_name(r, "input", true); need(in)) spec.inputs.push_back(*in);
            if (auto f = r.integer("factor", 1, max_divide_factor, true); need(f))
                spec.factor = static_cast<std::uint64_t>(*f);
            break;
        }
        case clock_kind::mux: {
            if (auto ins = clock_names(r, "inputs"); need(ins)) spec.inputs = *ins;
            if (t.get("select"))
                if (auto s = clock_name(r, "select", false); need(s)) spec.select = *s;
            break;
        }
        case clock_kind::gate: {
            if (auto in = clock_name(r, "input", true); need(in)) spec.inputs.push_back(*in);
            take("enabled", r.boolean("enabled"), spec.enabled);
            break;
        }
        case clock_kind::boost: {
            if (auto in = clock_name(r, "input", true); need(in)) spec.inputs.push_back(*in);
            std::int64_t f = 2;
            take("factor", r.integer("factor", 1, max_ratio_factor, false), f);
            spec.factor = static_cast<std::uint64_t>(f);
            break;
        }
    }
    return ok;
}

// The node a problem() line is about: the first quoted name that is one of ours, or the first
// name of a "clock loop: a, b feed each other" line.
const node_spec* problem_subject(const std::string& problem,
                                 const std::map<std::string, const node_spec*>& by_name) {
    for (std::size_t open = problem.find('\''); open != std::string::npos;
         open = problem.find('\'', open + 1)) {
        const std::size_t close = problem.find('\'', open + 1);
        if (close == std::string::npos) break;
        const auto it = by_name.find(problem.substr(open + 1, close - open - 1));
        if (it != by_name.end()) return it->second;
        open = close;
    }
    const std::string loop = "clock loop: ";
    if (problem.compare(0, loop.size(), loop) == 0) {
        const std::size_t end = problem.find_first_of(", ", loop.size());
        const auto it = by_name.find(problem.substr(loop.size(), end - loop.size()));
        if (it != by_name.end()) return it->second;
    }
    return nullptr;
}

}  // namespace

void load_clocks(const toml::table& root, const std::string& file, clock_tree& tree) {
    findings_list out(file);
    table_reader top(out, root, "");
    const char* const accepted = "one table [clocks.NAME] per clock";
    const toml::table* clocks = top.sub_table("clocks", true, accepted);
    if (clocks && clocks->empty())
        top.report("clocks", std::string("expected ") + accepted + ", got an empty table");
    out.raise_if_any();

    // Nodes are added in file order, so the plan lists ties the way the file does.
    table_reader clocks_reader(out, *clocks, "clocks");
    const std::vector<named_table> entries =
        clocks_reader.named_tables("clock", is_plain_name, plain_name_words);
    // Every reader that fails leaves a finding, so the findings alone say whether to go on.
    std::vector<node_spec> specs;
    for (const named_table& e : entries) {
        if (!e.name_ok || !e.table) continue;
        table_reader r(out, *e.table, "clocks." + e.name);
        node_spec spec;
        if (read_node(r, e.name, *e.table, spec)) specs.push_back(std::move(spec));
    }

    // Names used as inputs must be clocks of this file or already in the tree.
    std::vector<std::string> known = tree.node_names();
    for (const named_table& e : entries) known.push_back(e.name);
    std::sort(known.begin(), known.end());
    for (node_spec& s : specs) {
        for (const clock_ref& in : s.inputs) {
            if (std::binary_search(known.begin(), known.end(), in.name)) continue;
            out.add(in.where->source(), in.key, unknown_name("clock", in.name, known));
        }
        if (s.select) {
            std::vector<std::string> names;
            for (const clock_ref& in : s.inputs) names.push_back(in.name);
            if (std::find(names.begin(), names.end(), s.select->name) == names.end()) {
                std::vector<std::string> shown;
                for (const auto& n : names) shown.push_back(in_quotes(n));
                out.add(s.select->where->source(), s.select->key,
                        "expected one of this mux's inputs " + join(shown) + ", got " +
                            in_quotes(s.select->name) + hint(s.select->name, names));
            }
        }
    }
    out.raise_if_any();

    std::map<std::string, const node_spec*> by_name;
    for (const node_spec& s : specs) {
        by_name.emplace(s.name, &s);
        switch (s.kind) {
            case clock_kind::crystal:
                tree.add_crystal(s.name, s.crystal);
                break;
            case clock_kind::rc_oscillator:
                tree.add_rc_oscillator(s.name, s.rc);
                break;
            case clock_kind::external:
                tree.add_external(s.name, s.external);
                break;
            case clock_kind::pll:
                tree.add_pll(s.name, s.inputs[0].name, s.pll);
                break;
            case clock_kind::divider:
                tree.add_divider(s.name, s.inputs[0].name, s.factor);
                break;
            case clock_kind::gate:
                tree.add_gate(s.name, s.inputs[0].name, s.enabled);
                break;
            case clock_kind::boost:
                tree.add_boost(s.name, s.inputs[0].name, s.factor);
                break;
            case clock_kind::mux: {
                std::vector<std::string> names;
                for (const clock_ref& in : s.inputs) names.push_back(in.name);
                // The first input of that name; without `select`, the first input.
                std::size_t selected = 0;
                if (s.select)
                    selected = static_cast<std::size_t>(
                        std::find(names.begin(), names.end(), s.select->name) - names.begin());
                tree.add_mux(s.name, names, selected);
                break;
            }
        }
    }

    std::vector<std::string> problems;
    try {
        problems = tree.problems();
    } catch (const std::exception& e) {
        // Frequencies too large to multiply exactly (arithmetic_error) land here.
        problems.push_back(std::string("the clock frequencies cannot be computed: ") + e.what());
    }
    for (const std::string& p : problems) {
        const node_spec* subject = problem_subject(p, by_name);
        if (!subject) {
            out.add(clocks->source(), "clocks", p);
            continue;
        }
        // "pll 'x': VCO ..." is shown as "clocks.x: VCO ...": the key path already names the node.
        std::string message = p;
        const std::string prefix =
            std::string(to_string(subject->kind)) + " '" + subject->name + "': ";
        if (message.compare(0, prefix.size(), prefix) == 0) message.erase(0, prefix.size());
        out.add(subject->table->source(), "clocks." + subject->name, message);
    }
    out.raise_if_any();
}

void load_clock_tree_text(std::string_view toml_text, const std::string& file, clock_tree& tree) {
    load_clocks(read_toml_text(toml_text, file), file, tree);
}

void load_clock_tree_file(const std::string& path, clock_tree& tree) {
    load_clocks(read_toml_file(path), path, tree);
}

}  // namespace sim
