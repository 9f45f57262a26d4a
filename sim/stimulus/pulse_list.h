#pragma once
// A pulse list source: edges listed by hand in a scenario, or read from a CSV file (pulse_csv.h),
// for one-off events (a fault, a trigger burst, a recorded capture).

#include "sim/stimulus/edge_source.h"

#include <optional>
#include <string>
#include <vector>

namespace sim::stimulus {

// One listed point: a time, and the level the source takes there, or none to toggle the level.
struct pulse_point {
    time_ps at = 0;
    std::optional<bool> level;
};

// The edges `points` describe from `initial_level`: each point toggles the level or sets it; a
// point that sets the level the source already has is no edge and is left out. Throws
// std::invalid_argument naming the point (0-based) whose time does not come after the one before.
std::vector<edge> edges_from_points(const std::vector<pulse_point>& points, bool initial_level);

class pulse_list final : public edge_source {
public:
    // `edges` as edges_from_points() makes them: strictly increasing, each changing the level.
    pulse_list(std::vector<edge> edges, bool initial_level);

    bool initial_level() const override { return initial_; }
    std::optional<edge> next_edge(time_ps from) override;

private:
    std::vector<edge> edges_;
    bool initial_;
    std::size_t cursor_ = 0;  // no edge before it lies at or after the last `from`
};

}  // namespace sim::stimulus
