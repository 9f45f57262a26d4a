// The failure report's content and report.json; see report_model.h.

#include "sim/report/report_model.h"

#include "sim/report/detail/output_file.h"
#include "sim/report/summary_text.h"
#include "sim/wide_int.h"

#include <nlohmann/json.hpp>

namespace sim {

namespace {

using ojson = nlohmann::ordered_json;

std::string exact_hz(const frequency& f) {
    return f.den() == 1 ? std::to_string(f.num())
                        : std::to_string(f.num()) + "/" + std::to_string(f.den());
}

// "12.5 %" from parts per billion, exact, trailing zeros dropped.
std::string percent_text(std::uint64_t ppb) {
    const std::uint64_t whole = ppb / 10'000'000, frac = ppb % 10'000'000;
    std::string s = std::to_string(whole);
    if (frac != 0) {
        std::string f = std::to_string(frac);
        f.insert(0, 7 - f.size(), '0');
        while (f.back() == '0') f.pop_back();
        s += "." + f;
    }
    return s + " %";
}

// The marks of a check whose failing measurement started at `from` and whose values are times
// measured from there (period, pulse width, gap, delay).
void time_marks(const check_spec& spec, time_ps from, std::vector<report_mark>& marks) {
    if (spec.expected) {
        marks.push_back({from + *spec.expected, "expected " + format_time(*spec.expected)});
        return;
    }
    if (spec.minimum) marks.push_back({from + *spec.minimum, "min " + format_time(*spec.minimum)});
    if (spec.maximum) marks.push_back({from + *spec.maximum, "max " + format_time(*spec.maximum)});
}

// Where a high time of `ppb` of the period [from, to] ends.
time_ps duty_point(time_ps from, time_ps to, std::uint64_t ppb) {
    const u128 t = static_cast<u128>(to - from) * ppb + ppb_per_whole / 2;
    return from + static_cast<time_ps>(t / ppb_per_whole);
}

}  // namespace

bool report_clock::operator==(const report_clock& o) const {
    return name == o.name && kind == o.kind && hz == o.hz && hz_exact == o.hz_exact &&
           settings == o.settings && feeds == o.feeds;
}
bool report_mark::operator==(const report_mark& o) const { return at == o.at && label == o.label; }
bool operator==(const wave_trace& a, const wave_trace& b) {
    return a.name == b.name && a.before == b.before && a.edges == b.edges &&
           a.known_from == b.known_from && a.known_to == b.known_to;
}
bool report_check::operator==(const report_check& o) const {
    return name == o.name && kind == o.kind && signal == o.signal && expected == o.expected &&
           tolerance == o.tolerance && measured == o.measured && passed == o.passed && at == o.at &&
           from == o.from && detail == o.detail && span_label == o.span_label && marks == o.marks &&
           traces == o.traces;
}
bool report_model::operator==(const report_model& o) const {
    return scenario == o.scenario && end == o.end && clocks == o.clocks && checks == o.checks;
}

std::vector<report_clock> report_clocks(const std::vector<clock_plan_row>& rows) {
    std::vector<report_clock> out;
    for (const clock_plan_row& r : rows) {
        report_clock c;
        c.name = r.name;
        c.kind = to_string(r.kind);
        c.hz = r.running ? r.freq.decimal_string() : "stopped";
        c.hz_exact = r.running ? exact_hz(r.freq) : "0";
        c.settings = r.settings;
        for (const std::string& f : r.feeds) c.feeds += (c.feeds.empty() ? "" : ", ") + f;
        if (c.feeds.empty()) c.feeds = "-";
        out.push_back(std::move(c));
    }
    return out;
}

report_check make_report_check(const check_spec* spec, const check_result& result,
                               std::vector<wave_trace> traces) {
    report_check c;
    c.name = result.name;
    c.kind = result.kind_text();
    c.signal = result.signal;
    c.expected = result.expected_text;
    c.tolerance = result.tolerance_text;
    c.measured = result.mean ? "mean " + measured_text(*result.mean, result.unit) + " over " +
                                   std::to_string(result.count)
                             : std::to_string(result.count) + " " + result.unit;
    c.passed = result.passed;
    c.at = result.at;
    c.from = result.fail_from;
    c.detail = result.detail;
    c.traces = std::move(traces);
    if (result.passed || !c.from || spec == nullptr) return c;
    const time_ps from = *c.from, to = result.at;
    switch (spec->kind) {
        case check_kind::period:
        case check_kind::pulse_width:
        case check_kind::dead_time:
        case check_kind::latency:
            c.span_label = "measured " + format_time(to - from);
            time_marks(*spec, from, c.marks);
            break;
        case check_kind::phase:
            c.span_label = "measured " + format_time(to - from);
            if (!spec->phase_as_angle) time_marks(*spec, from, c.marks);
            break;
        case check_kind::frequency:
            c.span_label = "period " + format_time(to - from);
            if (spec->expected_frequency && !spec->expected_frequency->is_zero()) {
                const frequency& f = *spec->expected_frequency;
                const u128 num = static_cast<u128>(ps_per_second) * f.den();
                const time_ps period = static_cast<time_ps>((num + f.num() / 2) / f.num());
                c.marks.push_back({from + period, "expected period " + format_time(period)});
            }
            break;
        case check_kind::duty_cycle:
            c.span_label = "period " + format_time(to - from);
            if (spec->expected) {
                c.marks.push_back({duty_point(from, to, *spec->expected),
                                   "expected fall at " + percent_text(*spec->expected)});
            } else {
                if (spec->minimum)
                    c.marks.push_back({duty_point(from, to, *spec->minimum),
                                       "min " + percent_text(*spec->minimum)});
                if (spec->maximum)
                    c.marks.push_back({duty_point(from, to, *spec->maximum),
                                       "max " + percent_text(*spec->maximum)});
            }
            break;
        default:
            break;
    }
    return c;
}

std::string report_json_text(const report_model& model) {
    ojson j;
    j["format"] = "tickbench-report";
    j["version"] = 1;
    j["scenario"] = model.scenario;
    j["end_ps"] = model.end;
    ojson clocks = ojson::array();
    for (const report_clock& c : model.clocks) {
        clocks.push_back(ojson{{"name", c.name},
                               {"kind", c.kind},
                               {"hz", c.hz},
                               {"hz_exact", c.hz_exact},
                               {"settings", c.settings},
                               {"feeds", c.feeds}});
    }
    j["clocks"] = clocks;
    ojson checks = ojson::array();
    for (const report_check& c : model.checks) {
        ojson k;
        k["check"] = c.name;
        k["kind"] = c.kind;
        k["signal"] = c.signal;
        k["expected"] = c.expected;
        k["tolerance"] = c.tolerance;
        k["measured"] = c.measured;
        k["verdict"] = c.passed ? "pass" : "fail";
        k["at_ps"] = c.at;
        k["from_ps"] = c.from ? ojson(*c.from) : ojson(nullptr);
        k["detail"] = c.detail;
        k["span_label"] = c.span_label;
        ojson marks = ojson::array();
        for (const report_mark& m : c.marks)
            marks.push_back(ojson{{"at_ps", m.at}, {"label", m.label}});
        k["marks"] = marks;
        ojson traces = ojson::array();
        for (const wave_trace& t : c.traces) {
            traces.push_back(ojson{{"signal", t.name},
                                   {"before", t.before ? 1 : 0},
                                   {"known_from_ps", t.known_from},
                                   {"known_to_ps", t.known_to},
                                   {"edges_ps", t.edges}});
        }
        k["traces"] = traces;
        checks.push_back(std::move(k));
    }
    j["checks"] = checks;
    return j.dump(-1, ' ', false, ojson::error_handler_t::replace) + "\n";
}

void write_report_json(const std::string& path, const report_model& model) {
    detail::write_output_file(path, report_json_text(model));
}

namespace {

// Reads one report.json document, naming the key path of whatever is missing or mistyped.
class json_reader {
public:
    explicit json_reader(std::string origin) : origin_(std::move(origin)) {}

    [[noreturn]] void bad(const std::string& path, const std::string& what) const {
        throw report_format_error(origin_ + ": " + path + ": " + what);
    }
    const ojson& get(const ojson& obj, const std::string& path, const char* key) const {
        if (!obj.is_object()) bad(path, "expected an object");
        const auto it = obj.find(key);
        if (it == obj.end()) bad(path + "." + key, "missing");
        return *it;
    }
    std::string str(const ojson& obj, const std::string& path, const char* key) const {
        const ojson& v = get(obj, path, key);
        if (!v.is_string()) bad(path + "." + key, "expected a string");
        return v.get<std::string>();
    }
    time_ps time(const ojson& v, const std::string& path) const {
        if (!v.is_number_unsigned() && !(v.is_number_integer() && v.get<std::int64_t>() >= 0))
            bad(path, "expected a whole number of picoseconds (0 or more)");
        return v.get<time_ps>();
    }
    time_ps time(const ojson& obj, const std::string& path, const char* key) const {
        return time(get(obj, path, key), path + "." + key);
    }
    const ojson& array(const ojson& obj, const std::string& path, const char* key) const {
        const ojson& v = get(obj, path, key);
        if (!v.is_array()) bad(path + "." + key, "expected an array");
        return v;
    }

private:
    std::string origin_;
};

}  // namespace

report_model parse_report_json(const std::string& text, const std::string& origin) {
    ojson j;
    try {
        j = ojson::parse(text);
    } catch (const ojson::parse_error& e) {
        // Line and column of the byte where parsing stopped.
        std::size_t line = 1, col = 1;
        for (std::size_t i = 0; i + 1 < e.byte && i < text.size(); ++i) {
            if (text[i] == '\n') {
                ++line;
                col = 1;
            } else {
                ++col;
            }
        }
        throw report_format_error(origin + ":" + std::to_string(line) + ":" + std::to_string(col) +
                                  ": not valid JSON; expected the report.json a run writes");
    }
    const json_reader r(origin);
    if (!j.is_object() || !j.contains("format") || j["format"] != "tickbench-report")
        r.bad("format", "expected \"tickbench-report\" (is this a run's report.json?)");
    const ojson& version = r.get(j, "", "version");
    if (!version.is_number_integer() || version.get<std::int64_t>() != 1)
        r.bad("version", "expected 1, the only version this tickbench reads");
    report_model m;
    m.scenario = r.str(j, "", "scenario");
    m.end = r.time(j, "", "end_ps");
    const ojson& clocks = r.array(j, "", "clocks");
    for (std::size_t i = 0; i < clocks.size(); ++i) {
        const std::string p = "clocks[" + std::to_string(i) + "]";
        report_clock c;
        c.name = r.str(clocks[i], p, "name");
        c.kind = r.str(clocks[i], p, "kind");
        c.hz = r.str(clocks[i], p, "hz");
        c.hz_exact = r.str(clocks[i], p, "hz_exact");
        c.settings = r.str(clocks[i], p, "settings");
        c.feeds = r.str(clocks[i], p, "feeds");
        m.clocks.push_back(std::move(c));
    }
    const ojson& checks = r.array(j, "", "checks");
    for (std::size_t i = 0; i < checks.size(); ++i) {
        const std::string p = "checks[" + std::to_string(i) + "]";
        const ojson& k = checks[i];
        report_check c;
        c.name = r.str(k, p, "check");
        c.kind = r.str(k, p, "kind");
        c.signal = r.str(k, p, "signal");
        c.expected = r.str(k, p, "expected");
        c.tolerance = r.str(k, p, "tolerance");
        c.measured = r.str(k, p, "measured");
        const std::string verdict = r.str(k, p, "verdict");
        if (verdict != "pass" && verdict != "fail")
            r.bad(p + ".verdict", "expected \"pass\" or \"fail\"");
        c.passed = verdict == "pass";
        c.at = r.time(k, p, "at_ps");
        const ojson& from = r.get(k, p, "from_ps");
        if (!from.is_null()) c.from = r.time(from, p + ".from_ps");
        c.detail = r.str(k, p, "detail");
        c.span_label = r.str(k, p, "span_label");
        const ojson& marks = r.array(k, p, "marks");
        for (std::size_t n = 0; n < marks.size(); ++n) {
            const std::string mp = p + ".marks[" + std::to_string(n) + "]";
            c.marks.push_back({r.time(marks[n], mp, "at_ps"), r.str(marks[n], mp, "label")});
        }
        const ojson& traces = r.array(k, p, "traces");
        for (std::size_t n = 0; n < traces.size(); ++n) {
            const std::string tp = p + ".traces[" + std::to_string(n) + "]";
            wave_trace t;
            t.name = r.str(traces[n], tp, "signal");
            const ojson& before = r.get(traces[n], tp, "before");
            if (before != 0 && before != 1) r.bad(tp + ".before", "expected 0 or 1");
            t.before = before == 1;
            t.known_from = r.time(traces[n], tp, "known_from_ps");
            t.known_to = r.time(traces[n], tp, "known_to_ps");
            const ojson& edges = r.array(traces[n], tp, "edges_ps");
            for (std::size_t e = 0; e < edges.size(); ++e) {
                const time_ps at = r.time(edges[e], tp + ".edges_ps[" + std::to_string(e) + "]");
                if (!t.edges.empty() && at < t.edges.back())
                    r.bad(tp + ".edges_ps[" + std::to_string(e) + "]",
                          "edges must not go back in time");
                t.edges.push_back(at);
            }
            c.traces.push_back(std::move(t));
        }
        m.checks.push_back(std::move(c));
    }
    return m;
}

}  // namespace sim
