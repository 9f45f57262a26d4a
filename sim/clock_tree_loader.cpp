// Reading [clocks] tables into a clock_tree; see clock_tree_loader.h and docs/scenario.md.
//
// Reading goes in two passes. The first checks each table against the schema of its kind and
// collects every finding rather than stopping at the first, so one run shows all the typos. Only
// when the tables are sound is the tree built and its own rules (problems()) checked; those
// findings point at the table of the node they name.

#include "sim/clock_tree_loader.h"
#include "sim/clock_tree_loader_toml.h"
#include "sim/quantity.h"
#include "sim/toml_text.h"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <functional>
#include <iterator>
#include <limits>
#include <map>
#include <optional>
#include <sstream>
#include <tuple>
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
// The clock tree treats an RC oscillator trimmed 10 % or more off nominal as stopped (its
// ppb_limit); the loader refuses such a setting instead of letting it pass as a silent 0 Hz.
constexpr std::int64_t rc_offset_limit_ppb = 100'000'000;

const char* const kind_names = "crystal, rc-oscillator, external, pll, divider, mux, gate";

const char* const frequency_words =
    "a frequency such as \"8 MHz\" (units Hz, kHz, MHz, GHz) or a whole number of hertz";
const char* const time_words = "a time such as \"200 us\" (units ps, ns, us, \xC2\xB5s, ms, s)";
const char* const ratio_words = "a ratio such as \"20 ppm\" (units ppb, ppm, %)";
const char* const tempco_words = "a coefficient such as \"-34 ppb/C2\" (units ppb/C2, ppm/C2)";
const char* const range_words =
    "two frequencies [low, high] such as [\"3 MHz\", \"6 MHz\"], \"0 Hz\" leaving a side open";

std::string range_words_int(std::int64_t lo, std::int64_t hi) {
    return "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi);
}

// An exact signed percentage of a ppb value, e.g. "-10.25 %".
std::string percent_text(std::int64_t ppb) {
    const std::int64_t a = ppb < 0 ? -ppb : ppb;
    std::string frac = std::to_string(a % 10'000'000);
    frac.insert(frac.begin(), 7 - frac.size(), '0');
    while (!frac.empty() && frac.back() == '0') frac.pop_back();
    return (ppb < 0 ? "-" : "") + std::to_string(a / 10'000'000) +
           (frac.empty() ? "" : "." + frac) + " %";
}

bool valid_clock_name(const std::string& n) {
    if (n.empty() || !std::isalpha(static_cast<unsigned char>(n[0]))) return false;
    return std::all_of(n.begin(), n.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
}

// Collects findings for one file.
class findings_list {
public:
    explicit findings_list(std::string file) : file_(std::move(file)) {}
    void add(const toml::source_region& where, std::string key, std::string message) {
        list_.push_back(
            {file_, where.begin.line, where.begin.column, std::move(key), std::move(message)});
    }
    bool empty() const { return list_.empty(); }
    [[noreturn]] void raise() {
        std::stable_sort(list_.begin(), list_.end(),
                         [](const scenario_finding& a, const scenario_finding& b) {
                             return std::tie(a.line, a.column) < std::tie(b.line, b.column);
                         });
        throw scenario_error(list_);
    }

private:
    std::string file_;
    std::vector<scenario_finding> list_;
};

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

// Reads the keys of one node table, each with its type and range, reporting what is wrong.
class table_reader {
public:
    table_reader(findings_list& out, const toml::table& t, std::string path)
        : out_(out), t_(t), path_(std::move(path)) {}

    std::string key_path(const std::string& key) const { return path_ + "." + key; }

    // Reports keys not in `allowed`; `what` names the table's kind for the message.
    void reject_unknown_keys(const std::vector<std::string>& allowed, const std::string& what) {
        for (auto&& [k, v] : t_) {
            (void)v;
            const std::string key(k.str());
            if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
            out_.add(k.source(), key_path(key),
                     "unknown key " + in_quotes(key) + " for " + what + hint(key, allowed) +
                         "; accepted: " + join(allowed));
        }
    }

    // The node under `key`, or null (and, when required, a finding saying what belongs there).
    const toml::node* get(const std::string& key, bool required, const std::string& expected) {
        const toml::node* n = t_.get(key);
        if (!n && required)
            out_.add(t_.source(), path_,
                     "missing key " + in_quotes(key) + "; accepted: " + expected);
        return n;
    }

    void wrong(const toml::node& n, const std::string& key, const std::string& expected) {
        out_.add(n.source(), key_path(key), "expected " + expected + ", got " + got(n));
    }

    std::optional<std::int64_t> integer(const std::string& key, std::int64_t lo, std::int64_t hi,
                                        bool required) {
        const std::string expected = range_words_int(lo, hi);
        const toml::node* n = get(key, required, expected);
        if (!n) return std::nullopt;
        const auto* v = n->as_integer();
        if (!v || v->get() < lo || v->get() > hi) {
            wrong(*n, key, expected);
            return std::nullopt;
        }
        return v->get();
    }

    std::optional<bool> boolean(const std::string& key) {
        const toml::node* n = get(key, false, "true or false");
        if (!n) return std::nullopt;
        if (!n->is_boolean()) {
            wrong(*n, key, "true or false");
            return std::nullopt;
        }
        return n->as_boolean()->get();
    }

    // A quantity string parsed by `parse`; quantity errors are reported with their own message.
    template <typename T>
    std::optional<T> quantity(const toml::node& n, const std::string& key,
                              const std::string& expected,
                              const std::function<T(std::string_view)>& parse) {
        if (!n.is_string()) {
            wrong(n, key, expected);
            return std::nullopt;
        }
        try {
            return parse(n.as_string()->get());
        } catch (const quantity_error& e) {
            out_.add(n.source(), key_path(key), e.what());
            return std::nullopt;
        }
    }

    std::optional<frequency> freq_of(const toml::node& n, const std::string& key) {
        if (const auto* i = n.as_integer()) {
            if (i->get() >= 0) return frequency::hz(static_cast<std::uint64_t>(i->get()));
            wrong(n, key, frequency_words);
            return std::nullopt;
        }
        return quantity<frequency>(n, key, frequency_words, parse_frequency);
    }

    std::optional<frequency> freq(const std::string& key, bool required) {
        const toml::node* n = get(key, required, frequency_words);
        return n ? freq_of(*n, key) : std::nullopt;
    }

    std::optional<time_ps> time(const std::string& key) {
        const toml::node* n = get(key, false, time_words);
        return n ? quantity<time_ps>(*n, key, time_words, parse_time) : std::nullopt;
    }

    // A ratio in ppb; `lo` bounds it from below (0 for a tolerance, else -100 %).
    std::optional<std::int64_t> ratio(const std::string& key, std::int64_t lo) {
        const std::string expected =
            std::string(ratio_words) + (lo == 0 ? " from 0 to 100 %" : " from -100 % to 100 %");
        const toml::node* n = get(key, false, expected);
        if (!n) return std::nullopt;
        const auto v = quantity<std::int64_t>(*n, key, expected, parse_ppb);
        if (v && (*v < lo || *v > max_ratio_ppb)) {
            wrong(*n, key, expected);
            return std::nullopt;
        }
        return v;
    }

    std::optional<std::int64_t> tempco(const std::string& key) {
        const std::string expected =
            std::string(tempco_words) + " from -1000 ppm/C2 to 1000 ppm/C2";
        const toml::node* n = get(key, false, expected);
        if (!n) return std::nullopt;
        const auto v = quantity<std::int64_t>(*n, key, expected, parse_ppb_per_c2);
        if (v && (*v < -max_tempco_ppb || *v > max_tempco_ppb)) {
            wrong(*n, key, expected);
            return std::nullopt;
        }
        return v;
    }

    // A clock name (its existence is checked once every table is read).
    std::optional<clock_ref> clock_name(const std::string& key, bool required) {
        const toml::node* n = get(key, required, "the name of a clock");
        if (!n) return std::nullopt;
        if (!n->is_string() || n->as_string()->get().empty()) {
            wrong(*n, key, "the name of a clock");
            return std::nullopt;
        }
        return clock_ref{n->as_string()->get(), n, key_path(key)};
    }

    std::optional<std::vector<clock_ref>> clock_names(const std::string& key) {
        const std::string expected =
            "a list of one or more clock names such as [\"rc_fast\", \"pll\"]";
        const toml::node* n = get(key, true, expected);
        if (!n) return std::nullopt;
        const toml::array* a = n->as_array();
        if (!a || a->empty()) {
            wrong(*n, key, expected);
            return std::nullopt;
        }
        std::vector<clock_ref> names;
        bool ok = true;
        for (std::size_t i = 0; i < a->size(); ++i) {
            const toml::node& e = *a->get(i);
            const std::string item = key + "[" + std::to_string(i) + "]";
            if (!e.is_string() || e.as_string()->get().empty()) {
                wrong(e, item, "the name of a clock");
                ok = false;
            } else {
                names.push_back({e.as_string()->get(), &e, key_path(item)});
            }
        }
        if (!ok) return std::nullopt;
        return names;
    }

    // An optional [low, high] frequency range.
    std::optional<frequency_range> range(const std::string& key) {
        const toml::node* n = get(key, false, range_words);
        if (!n) return std::nullopt;
        const toml::array* a = n->as_array();
        if (!a || a->size() != 2) {
            wrong(*n, key, range_words);
            return std::nullopt;
        }
        const auto lo = freq_of(*a->get(0), key + "[0]");
        const auto hi = freq_of(*a->get(1), key + "[1]");
        if (!lo || !hi) return std::nullopt;
        if (!lo->is_zero() && !hi->is_zero() && *lo > *hi) {
            out_.add(n->source(), key_path(key),
                     "low end " + lo->pretty() + " is above high end " + hi->pretty() +
                         "; accepted: " + range_words);
            return std::nullopt;
        }
        return frequency_range{*lo, *hi};
    }

    // An optional [min, max] pair of whole numbers, each within [lo, hi].
    std::optional<std::pair<std::int64_t, std::int64_t>> int_pair(const std::string& key,
                                                                  std::int64_t lo,
                                                                  std::int64_t hi) {
        const std::string expected =
            "two whole numbers [min, max] from " + std::to_string(lo) + " to " + std::to_string(hi);
        const toml::node* n = get(key, false, expected);
        if (!n) return std::nullopt;
        const toml::array* a = n->as_array();
        const auto in = [&](const toml::node* e) {
            return e->is_integer() && e->as_integer()->get() >= lo && e->as_integer()->get() <= hi;
        };
        if (!a || a->size() != 2 || !in(a->get(0)) || !in(a->get(1))) {
            wrong(*n, key, expected);
            return std::nullopt;
        }
        return std::make_pair(a->get(0)->as_integer()->get(), a->get(1)->as_integer()->get());
    }

    void report(const std::string& key, const std::string& message) {
        const toml::node* n = t_.get(key);
        out_.add(n ? n->source() : t_.source(), n ? key_path(key) : path_, message);
    }

private:
    findings_list& out_;
    const toml::table& t_;
    std::string path_;
};

const std::map<std::string, clock_kind>& kinds_by_name() {
    static const std::map<std::string, clock_kind> m = {
        {"crystal", clock_kind::crystal},   {"rc-oscillator", clock_kind::rc_oscillator},
        {"external", clock_kind::external}, {"pll", clock_kind::pll},
        {"divider", clock_kind::divider},   {"mux", clock_kind::mux},
        {"gate", clock_kind::gate}};
    return m;
}

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
    }
    return {};
}

// Reads one node table; false (with findings) when anything is wrong.
bool read_node(findings_list& out, const std::string& name, const toml::table& t, node_spec& spec) {
    const std::string path = "clocks." + name;
    table_reader r(out, t, path);
    spec.name = name;
    spec.table = &t;
    const toml::node* kind_node = r.get("kind", true, kind_names);
    if (!kind_node) return false;
    const std::string kind_text = kind_node->is_string() ? kind_node->as_string()->get() : "";
    const auto kind = kinds_by_name().find(kind_text);
    if (kind == kinds_by_name().end()) {
        std::vector<std::string> names;
        for (const auto& [n, k] : kinds_by_name()) names.push_back(n);
        r.wrong(*kind_node, "kind", std::string("one of ") + kind_names + hint(kind_text, names));
        return false;
    }
    spec.kind = kind->second;
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
            if (auto f = r.freq("frequency", true); need(f)) c.nominal = *f;
            take("offset", r.ratio("offset", -max_ratio_ppb), c.offset_ppb);
            take("temperature-coefficient", r.tempco("temperature-coefficient"),
                 c.tempco_ppb_per_c2);
            take("turnover", r.integer("turnover", min_celsius, max_celsius, false), c.turnover_c);
            take("temperature", r.integer("temperature", min_celsius, max_celsius, false),
                 c.temperature_c);
            take("jitter", r.time("jitter"), c.jitter);
            std::int64_t seed = 0;
            take("seed", r.integer("seed", 0, int64_max, false), seed);
            c.seed = static_cast<std::uint64_t>(seed);
            break;
        }
        case clock_kind::rc_oscillator: {
            auto& c = spec.rc;
            if (auto f = r.freq("frequency", true); need(f)) c.nominal = *f;
            take("tolerance", r.ratio("tolerance", 0), c.tolerance_ppb);
            take("deviation", r.ratio("deviation", -max_ratio_ppb), c.deviation_ppb);
            take("trim-step", r.ratio("trim-step", -max_ratio_ppb), c.trim_step_ppb);
            std::pair<std::int64_t, std::int64_t> tr{0, 0};
            take("trim-range", r.int_pair("trim-range", -max_trim, max_trim), tr);
            c.trim_min = tr.first;
            c.trim_max = tr.second;
            take("trim", r.integer("trim", -max_trim, max_trim, false), c.trim);
            const std::int64_t total = c.deviation_ppb + c.trim * c.trim_step_ppb;
            if (ok && (total >= rc_offset_limit_ppb || total <= -rc_offset_limit_ppb)) {
                r.report(t.get("trim") ? "trim" : "deviation",
                         "deviation plus trim x trim-step puts the oscillator " +
                             percent_text(total) +
                             " off nominal; accepted: less than 10 % either way");
                ok = false;
            }
            break;
        }
        case clock_kind::external:
            take("frequency", r.freq("frequency", false), spec.external);
            break;
        case clock_kind::pll: {
            auto& p = spec.pll;
            if (auto in = r.clock_name("input", true); need(in)) spec.inputs.push_back(*in);
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
            take("input-range", r.range("input-range"), p.input_range);
            take("vco-range", r.range("vco-range"), p.vco_range);
            take("output-range", r.range("output-range"), p.output_range);
            break;
        }
        case clock_kind::divider: {
            if (auto in = r.clock_name("input", true); need(in)) spec.inputs.push_back(*in);
            if (auto f = r.integer("factor", 1, max_divide_factor, true); need(f))
                spec.factor = static_cast<std::uint64_t>(*f);
            break;
        }
        case clock_kind::mux: {
            if (auto ins = r.clock_names("inputs"); need(ins)) spec.inputs = *ins;
            if (t.get("select"))
                if (auto s = r.clock_name("select", false); need(s)) spec.select = *s;
            break;
        }
        case clock_kind::gate: {
            if (auto in = r.clock_name("input", true); need(in)) spec.inputs.push_back(*in);
            take("enabled", r.boolean("enabled"), spec.enabled);
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

toml::table read_toml_text(std::string_view text, const std::string& file) {
    try {
        return toml::parse(text, file);
    } catch (const toml::parse_error& e) {
        const auto& b = e.source().begin;
        throw scenario_error(scenario_finding{file, b.line, b.column, "",
                                              "TOML syntax: " + std::string(e.description())});
    }
}

toml::table read_toml_file(const std::string& path) {
    auto fail = [&path](const std::string& why) {
        return scenario_error(scenario_finding{path, 0, 0, "", "cannot read the file: " + why});
    };
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec))
        throw fail("it is a directory; accepted: a TOML file");
    errno = 0;
    std::ifstream in(path, std::ios::binary);
    if (!in) throw fail(errno ? std::strerror(errno) : "cannot open it");
    const std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    if (in.bad()) throw fail(errno ? std::strerror(errno) : "read error");
    return read_toml_text(text, path);
}

void load_clocks(const toml::table& root, const std::string& file, clock_tree& tree) {
    findings_list out(file);
    const toml::node* clocks_node = root.get("clocks");
    if (!clocks_node) {
        out.add(root.source(), "clocks",
                "missing table [clocks]; accepted: one table [clocks.NAME] per clock");
        out.raise();
    }
    const toml::table* clocks = clocks_node->as_table();
    if (!clocks || clocks->empty()) {
        out.add(clocks_node->source(), "clocks",
                "expected one table [clocks.NAME] per clock, got " +
                    (clocks ? std::string("an empty table") : got(*clocks_node)));
        out.raise();
    }

    // Nodes are added in file order, so the plan lists ties the way the file does.
    std::vector<std::pair<const toml::key*, const toml::node*>> entries;
    for (auto&& [k, v] : *clocks) entries.emplace_back(&k, &v);
    std::stable_sort(entries.begin(), entries.end(), [](const auto& a, const auto& b) {
        const auto& pa = a.second->source().begin;
        const auto& pb = b.second->source().begin;
        return std::tie(pa.line, pa.column) < std::tie(pb.line, pb.column);
    });

    std::vector<node_spec> specs;
    bool ok = true;
    for (const auto& [k, v] : entries) {
        const std::string name(k->str());
        if (!valid_clock_name(name)) {
            out.add(k->source(), "clocks.\"" + name + "\"",
                    "clock name " + in_quotes(name) +
                        " is not accepted; accepted: a letter followed by letters, digits, "
                        "\"_\" or \"-\"");
            ok = false;
            continue;
        }
        if (!v->is_table()) {
            out.add(v->source(), "clocks." + name,
                    "expected a table [clocks." + name + "] describing a clock, got " + got(*v));
            ok = false;
            continue;
        }
        node_spec spec;
        if (read_node(out, name, *v->as_table(), spec))
            specs.push_back(std::move(spec));
        else
            ok = false;
    }

    // Names used as inputs must be clocks of this file or already in the tree.
    std::vector<std::string> known = tree.node_names();
    for (const auto& [k, v] : entries) known.emplace_back(k->str());
    std::sort(known.begin(), known.end());
    for (node_spec& s : specs) {
        for (const clock_ref& in : s.inputs) {
            if (std::binary_search(known.begin(), known.end(), in.name)) continue;
            out.add(in.where->source(), in.key,
                    "unknown clock " + in_quotes(in.name) + hint(in.name, known) +
                        "; accepted: one of " + join(known));
            ok = false;
        }
        if (s.select) {
            std::vector<std::string> names;
            for (const clock_ref& in : s.inputs) names.push_back(in.name);
            if (std::find(names.begin(), names.end(), s.select->name) == names.end()) {
                std::vector<std::string> shown;
                for (const auto& n : names) shown.push_back(in_quotes(n));
                out.add(s.select->where->source(), s.select->key,
                        "expected one of this mux's inputs " + join(shown) +
                            hint(s.select->name, names) + ", got " + in_quotes(s.select->name));
                ok = false;
            }
        }
    }
    if (!ok || !out.empty()) out.raise();

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
    if (!out.empty()) out.raise();
}

void load_clock_tree_text(std::string_view toml_text, const std::string& file, clock_tree& tree) {
    load_clocks(read_toml_text(toml_text, file), file, tree);
}

void load_clock_tree_file(const std::string& path, clock_tree& tree) {
    load_clocks(read_toml_file(path), path, tree);
}

}  // namespace sim
