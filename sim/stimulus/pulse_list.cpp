#include "sim/stimulus/pulse_list.h"

#include <stdexcept>

namespace sim::stimulus {

std::vector<edge> edges_from_points(const std::vector<pulse_point>& points, bool initial_level) {
    std::vector<edge> out;
    bool level = initial_level;
    for (std::size_t i = 0; i < points.size(); ++i) {
        const pulse_point& p = points[i];
        if (i > 0 && p.at <= points[i - 1].at)
            throw std::invalid_argument("point " + std::to_string(i) + " at " + format_time(p.at) +
                                        " does not come after the one before (" +
                                        format_time(points[i - 1].at) + ")");
        const bool next = p.level ? *p.level : !level;
        if (next == level) continue;
        level = next;
        out.push_back({p.at, level});
    }
    return out;
}

pulse_list::pulse_list(std::vector<edge> edges, bool initial_level)
    : edges_(std::move(edges)), initial_(initial_level) {
    bool level = initial_level;
    for (std::size_t i = 0; i < edges_.size(); ++i) {
        if ((i > 0 && edges_[i].at <= edges_[i - 1].at) || edges_[i].level == level)
            throw std::invalid_argument("pulse list: edge " + std::to_string(i) +
                                        " does not change the level or comes out of order");
        level = edges_[i].level;
    }
}

std::optional<edge> pulse_list::next_edge(time_ps from) {
    while (cursor_ < edges_.size() && edges_[cursor_].at < from) ++cursor_;
    if (cursor_ == edges_.size()) return std::nullopt;
    return edges_[cursor_];
}

}  // namespace sim::stimulus
