#include "sim/toml_text.h"

#include <algorithm>
#include <sstream>

namespace sim {

std::string in_quotes(std::string_view text) { return "\"" + std::string(text) + "\""; }

std::string got(const toml::node& n) {
    std::ostringstream s;
    switch (n.type()) {
        case toml::node_type::string:
            return in_quotes(n.as_string()->get());
        case toml::node_type::integer:
            return std::to_string(n.as_integer()->get());
        case toml::node_type::boolean:
            return n.as_boolean()->get() ? "true" : "false";
        case toml::node_type::floating_point:
            s << *n.as_floating_point();
            return s.str() + " (a floating-point number)";
        case toml::node_type::array:
            return n.as_array()->empty() ? "an empty array" : "an array";
        case toml::node_type::table:
            return "a table";
        case toml::node_type::date:
            s << *n.as_date();
            return "the date " + s.str();
        case toml::node_type::time:
            s << *n.as_time();
            return "the time of day " + s.str();
        case toml::node_type::date_time:
            s << *n.as_date_time();
            return "the date-time " + s.str();
        case toml::node_type::none:
            break;
    }
    return "nothing";
}

std::size_t edit_distance(const std::string& a, const std::string& b) {
    std::vector<std::size_t> row(b.size() + 1);
    for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
    for (std::size_t i = 1; i <= a.size(); ++i) {
        std::size_t diag = row[0];
        row[0] = i;
        for (std::size_t j = 1; j <= b.size(); ++j) {
            const std::size_t up = row[j];
            row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] == b[j - 1] ? 0 : 1)});
            diag = up;
        }
    }
    return row[b.size()];
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
