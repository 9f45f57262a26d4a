#pragma once
// What drives a timer input from a scenario: a lazy generator of exact edge times.
//
// A source is a level that changes at exact picosecond instants. It computes nothing until asked
// "what is your first edge at or after t?", and then only that edge, so a square wave of a
// gigahertz costs nothing in a run that never looks at it, and a run of hours needs no list of
// edges in memory (docs/architecture.md, "Input stimulus"). Every source is a pure function of its
// settings and seed: the same question always gets the same answer.

#include "sim/clock_domain.h"

#include <optional>

namespace sim::stimulus {

// One level change: the source takes `level` at `at` (and holds it until its next edge).
struct edge {
    time_ps at = 0;
    bool level = false;
    bool operator==(const edge& o) const { return at == o.at && level == o.level; }
};

class edge_source {
public:
    virtual ~edge_source() = default;
    // The level before the first edge: the input's level since before time 0.
    virtual bool initial_level() const = 0;
    // The first edge at or after `from`, or nothing when the level never changes again. Edges come
    // at strictly increasing times and each changes the level. `from` must not decrease from one
    // call to the next (a source may keep a cursor); asking the same `from` again is allowed.
    virtual std::optional<edge> next_edge(time_ps from) = 0;
};

}  // namespace sim::stimulus
