#include "sim/stimulus/pulse_csv.h"

#include "sim/quantity.h"
#include "sim/scenario_error.h"

#include <fstream>
#include <sstream>

namespace sim::stimulus {

namespace {

const char* const header_words =
    "a header time_UNIT or time_UNIT,level with UNIT one of ps, ns, us, ms, s (\"time_us,level\")";
const char* const line_words =
    "a line TIME or TIME,LEVEL: a decimal number of the header's unit, then 0, 1, low or high";

std::string trim(const std::string& s) {
    const auto a = s.find_first_not_of(" \t\r");
    if (a == std::string::npos) return "";
    const auto b = s.find_last_not_of(" \t\r");
    return s.substr(a, b - a + 1);
}

// The fields of a line with the 1-based column each starts at.
std::vector<std::pair<std::string, std::uint32_t>> fields(const std::string& line) {
    std::vector<std::pair<std::string, std::uint32_t>> out;
    std::size_t start = 0;
    for (;;) {
        const auto comma = line.find(',', start);
        const std::string raw =
            line.substr(start, comma == std::string::npos ? comma : comma - start);
        const auto lead = raw.find_first_not_of(" \t");
        out.emplace_back(trim(raw), static_cast<std::uint32_t>(
                                        start + 1 + (lead == std::string::npos ? 0 : lead)));
        if (comma == std::string::npos) break;
        start = comma + 1;
    }
    return out;
}

}  // namespace

std::vector<pulse_point> parse_pulse_csv(const std::string& text, const std::string& shown) {
    std::vector<scenario_finding> findings;
    const auto fail = [&](std::uint32_t line, std::uint32_t column, const std::string& message) {
        findings.push_back({shown, line, column, "", message});
    };
    std::vector<pulse_point> points;
    std::istringstream in(text);
    std::string line;
    std::uint32_t number = 0;
    std::string unit;
    bool with_level = false;
    while (std::getline(in, line)) {
        ++number;
        const std::string t = trim(line);
        if (t.empty() || t[0] == '#') continue;
        const auto f = fields(line);
        if (unit.empty()) {
            const std::string& h = f[0].first;
            const bool ok_unit =
                h.rfind("time_", 0) == 0 && (h == "time_ps" || h == "time_ns" || h == "time_us" ||
                                             h == "time_ms" || h == "time_s");
            if (!ok_unit || f.size() > 2 || (f.size() == 2 && f[1].first != "level")) {
                fail(number, f[0].second,
                     "expected " + std::string(header_words) + ", got \"" + t + "\"");
                break;
            }
            unit = h.substr(5);
            with_level = f.size() == 2;
            continue;
        }
        if (f.size() != (with_level ? 2u : 1u)) {
            fail(number, 1,
                 "expected " + std::to_string(with_level ? 2 : 1) + " field" +
                     (with_level ? "s" : "") + " as the header says, got " +
                     std::to_string(f.size()) + "; accepted: " + line_words);
            continue;
        }
        pulse_point p;
        try {
            if (f[0].first.empty() || f[0].first.find_first_of(" \t") != std::string::npos)
                throw quantity_error(f[0].first);
            p.at = parse_time(f[0].first + " " + unit);
        } catch (const quantity_error&) {
            fail(number, f[0].second,
                 "time: expected a decimal number of " + unit +
                     " that is a whole number of picoseconds, got \"" + f[0].first +
                     "\"; accepted: " + line_words);
            continue;
        }
        if (with_level) {
            const std::string& l = f[1].first;
            if (l == "1" || l == "high")
                p.level = true;
            else if (l == "0" || l == "low")
                p.level = false;
            else {
                fail(number, f[1].second, "level: expected 0, 1, low or high, got \"" + l + "\"");
                continue;
            }
        }
        if (!points.empty() && p.at <= points.back().at) {
            fail(number, f[0].second,
                 "time " + format_time(p.at) + " does not come after the line before's (" +
                     format_time(points.back().at) + "); accepted: times in increasing order");
            continue;
        }
        points.push_back(p);
    }
    if (unit.empty() && findings.empty())
        fail(0, 0, "no header line; accepted: " + std::string(header_words));
    if (!findings.empty()) throw scenario_error(findings);
    return points;
}

std::vector<pulse_point> read_pulse_csv(const std::string& path, const std::string& shown) {
    std::ifstream f(path, std::ios::binary);
    if (!f)
        throw scenario_error(scenario_finding{shown, 0, 0, "",
                                              "cannot read the pulse file (looked for " + path +
                                                  "); accepted: a CSV file of edge times"});
    std::ostringstream s;
    s << f.rdbuf();
    return parse_pulse_csv(s.str(), shown);
}

}  // namespace sim::stimulus
