#pragma once
// Test helper: feeds a check_engine hand-made edge sequences and returns its results.
//
// A script declares signals by full name ("pwm.a"), then lists changes in time order; run() plays
// them into a fresh engine and ends the run at the given time.

#include "sim/checks/check_engine.h"

#include <algorithm>

#include <string>
#include <utility>
#include <vector>

namespace tickbench::test_support {

struct edge_script {
    struct step {
        std::string signal;
        bool level;
        sim::time_ps at;
    };
    std::vector<std::pair<std::string, bool>> signals;  // full name, initial level
    std::vector<step> steps;

    // Declares `name` ("scope.name" or "name") with its initial level.
    edge_script& signal(const std::string& name, bool initial = false) {
        signals.emplace_back(name, initial);
        return *this;
    }
    // Adds one change.
    edge_script& set(const std::string& name, bool level, sim::time_ps at) {
        steps.push_back({name, level, at});
        return *this;
    }
    // A square wave on `name`: rising at first_rise + k * period, high for `high` ps, n periods.
    edge_script& square(const std::string& name, sim::time_ps first_rise, sim::time_ps period,
                        sim::time_ps high, unsigned n) {
        for (unsigned k = 0; k < n; ++k) {
            set(name, true, first_rise + k * period);
            set(name, false, first_rise + k * period + high);
        }
        return *this;
    }
    // Plays the script (changes sorted by time, stable) into a new engine for `specs`.
    std::vector<sim::check_result> run(std::vector<sim::check_spec> specs, sim::time_ps end) const;
};

inline std::vector<sim::check_result> edge_script::run(std::vector<sim::check_spec> specs,
                                                       sim::time_ps end) const {
    sim::check_engine engine(std::move(specs));
    for (std::size_t i = 0; i < signals.size(); ++i) {
        const std::string& full = signals[i].first;
        const auto dot = full.rfind('.');
        sim::signal_info info;
        info.scope = dot == std::string::npos ? "" : full.substr(0, dot);
        info.name = dot == std::string::npos ? full : full.substr(dot + 1);
        info.initial = signals[i].second;
        engine.declare(static_cast<sim::signal_id>(i), info);
    }
    engine.begin();
    std::vector<step> sorted = steps;
    std::stable_sort(sorted.begin(), sorted.end(),
                     [](const step& a, const step& b) { return a.at < b.at; });
    for (const step& s : sorted) {
        sim::signal_id id = 0;
        while (signals.at(id).first != s.signal) ++id;
        engine.change(id, s.level, s.at);
    }
    engine.end(end);
    return engine.results();
}

}  // namespace tickbench::test_support
