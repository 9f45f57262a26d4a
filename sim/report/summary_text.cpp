// The human summary writer; see summary_text.h.

#include "sim/report/summary_text.h"

#include "sim/report/detail/output_file.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>

namespace sim {

namespace {

std::string number_text(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.6g", v);
    return buf;
}

}  // namespace

std::string measured_text(double value, const std::string& unit) {
    if (unit == "s") {
        if (!(value >= 0) || value > 1e7) return number_text(value) + " s";
        return format_time(static_cast<time_ps>(std::llround(value * 1e12)));
    }
    if (unit == "Hz") {
        const double a = std::fabs(value);
        if (a >= 1e9) return number_text(value / 1e9) + " GHz";
        if (a >= 1e6) return number_text(value / 1e6) + " MHz";
        if (a >= 1e3) return number_text(value / 1e3) + " kHz";
        return number_text(value) + " Hz";
    }
    return number_text(value) + " " + unit;
}

std::string summary_text(const std::vector<check_result>& results,
                         const std::vector<std::string>& notes) {
    struct row {
        std::array<std::string, 5> cells;
        const check_result* r;
    };
    std::vector<row> rows;
    rows.push_back({{"verdict", "check", "kind", "signal", "measured"}, nullptr});
    std::size_t failed = 0;
    for (const check_result& r : results) {
        std::string measured;
        if (r.mean) {
            measured =
                "mean " + measured_text(*r.mean, r.unit) + " over " + std::to_string(r.count);
        } else {
            measured = std::to_string(r.count) + " " + r.unit;
        }
        rows.push_back(
            {{r.passed ? "pass" : "FAIL", r.name, r.kind_text(), r.signal, measured}, &r});
        failed += r.passed ? 0 : 1;
    }
    std::array<std::size_t, 5> width{};
    for (const row& w : rows)
        for (std::size_t i = 0; i < width.size(); ++i)
            width[i] = std::max(width[i], w.cells[i].size());
    std::string out;
    for (const row& w : rows) {
        std::string line;
        for (std::size_t i = 0; i < width.size(); ++i) {
            line += w.cells[i];
            if (i + 1 < width.size()) line += std::string(width[i] - w.cells[i].size() + 2, ' ');
        }
        while (!line.empty() && line.back() == ' ') line.pop_back();
        out += line + "\n";
        if (w.r != nullptr && !w.r->passed)
            out += std::string(width[0] + 2, ' ') + "-> " + w.r->detail + "\n";
    }
    out += std::to_string(results.size()) + (results.size() == 1 ? " check: " : " checks: ") +
           std::to_string(results.size() - failed) + " passed, " + std::to_string(failed) +
           " failed\n";
    for (const std::string& n : notes) out += n + "\n";
    return out;
}

void write_summary(const std::string& path, const std::vector<check_result>& results,
                   const std::vector<std::string>& notes) {
    detail::write_output_file(path, summary_text(results, notes));
}

}  // namespace sim
