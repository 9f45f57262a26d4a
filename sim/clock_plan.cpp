#include "sim/clock_plan.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <sstream>

namespace sim {

namespace {
std::string join(const std::vector<std::string>& v) {
    std::string s;
    for (const auto& x : v) s += (s.empty() ? "" : ", ") + x;
    return s.empty() ? "-" : s;
}
std::string exact_hz(const frequency& f) {
    return f.den() == 1 ? std::to_string(f.num())
                        : std::to_string(f.num()) + "/" + std::to_string(f.den());
}
}  // namespace

std::string clock_plan_text(const std::vector<clock_plan_row>& rows) {
    const std::vector<std::string> head = {"clock",      "kind",     "frequency (Hz)",
                                           "exact (Hz)", "settings", "feeds"};
    std::vector<std::vector<std::string>> cells;
    for (const auto& r : rows)
        cells.push_back({r.name, to_string(r.kind), r.running ? r.freq.decimal_string() : "stopped",
                         r.running ? exact_hz(r.freq) : "0", r.settings, join(r.feeds)});
    std::vector<std::size_t> w(head.size());
    for (std::size_t c = 0; c < head.size(); ++c) {
        w[c] = head[c].size();
        for (const auto& row : cells) w[c] = std::max(w[c], row[c].size());
    }
    std::ostringstream out;
    auto line = [&](const std::vector<std::string>& row) {
        std::string l;
        for (std::size_t c = 0; c < row.size(); ++c) {
            std::string cell = row[c];
            // Right-align the numbers, left-align the words; the last column is not padded.
            if (c == 2 || c == 3)
                cell.insert(cell.begin(), w[c] - cell.size(), ' ');
            else if (c + 1 < row.size())
                cell.append(w[c] - cell.size(), ' ');
            l += (c ? "  " : "") + cell;
        }
        out << l << '\n';
    };
    line(head);
    for (const auto& row : cells) line(row);
    return out.str();
}

std::string clock_plan_json(const std::vector<clock_plan_row>& rows) {
    nlohmann::json clocks = nlohmann::json::array();
    for (const auto& r : rows) {
        clocks.push_back({{"name", r.name},
                          {"kind", to_string(r.kind)},
                          {"settings", r.settings},
                          {"hz_exact", r.running ? exact_hz(r.freq) : "0"},
                          {"hz", r.running ? r.freq.decimal_string() : "0"},
                          {"running", r.running},
                          {"inputs", r.inputs},
                          {"feeds", r.feeds}});
    }
    return nlohmann::json{{"clocks", clocks}}.dump(2) + "\n";
}

}  // namespace sim
