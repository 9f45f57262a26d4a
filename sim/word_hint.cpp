#include "sim/word_hint.h"

#include <algorithm>

namespace sim {

std::string in_quotes(std::string_view text) { return "\"" + std::string(text) + "\""; }

std::size_t edit_distance(const std::string& a, const std::string& b) {
    // d[i][j]: edits from a's first i letters to b's first j; three rows suffice.
    const std::size_t n = b.size();
    std::vector<std::size_t> before(n + 1), prev(n + 1), row(n + 1);
    for (std::size_t j = 0; j <= n; ++j) prev[j] = j;
    for (std::size_t i = 1; i <= a.size(); ++i) {
        row[0] = i;
        for (std::size_t j = 1; j <= n; ++j) {
            row[j] = std::min(
                {prev[j] + 1, row[j - 1] + 1, prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1)});
            if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1])
                row[j] = std::min(row[j], before[j - 2] + 1);  // two letters swapped
        }
        before.swap(prev);
        prev.swap(row);
    }
    return prev[n];
}

std::string hint(const std::string& s, const std::vector<std::string>& candidates) {
    std::string best;
    std::size_t best_d = 4;
    for (const std::string& c : candidates) {
        const std::size_t d = edit_distance(s, c);
        // "pll" is not a typo of "pin"; a long signal name may carry three slips.
        const std::size_t shorter = std::min(s.size(), c.size());
        const std::size_t allowed = shorter <= 4 ? 1 : shorter <= 12 ? 2 : 3;
        if (d <= allowed && d < best_d) {
            best_d = d;
            best = c;
        }
    }
    return best.empty() ? "" : " (did you mean " + in_quotes(best) + "?)";
}

std::string join(const std::vector<std::string>& words, const std::string& separator) {
    std::string s;
    for (const auto& w : words) s += (s.empty() ? "" : separator) + w;
    return s;
}

}  // namespace sim
