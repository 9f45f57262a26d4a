#pragma once
// Collects the edges a stimulus source gives up to a time, asking as a timer's inputs do: the
// first edge from 0, then the first from one picosecond after each edge.

#include "sim/stimulus/edge_source.h"

#include <vector>

namespace tickbench_test {

inline std::vector<sim::stimulus::edge> edges_until(sim::stimulus::edge_source& s,
                                                    sim::time_ps until) {
    std::vector<sim::stimulus::edge> out;
    sim::time_ps from = 0;
    while (auto e = s.next_edge(from)) {
        if (e->at > until) break;
        out.push_back(*e);
        from = e->at + 1;
    }
    return out;
}

}  // namespace tickbench_test
