#pragma once
// Reading a scenario's [stimulus.NAME] and [inputs] tables (docs/scenario.md, "Stimulus" and
// "Inputs"): the described sources, and what drives each timer input. Part of the scenario loader
// (scenario_loader.cpp), kept apart because its rules are many; like the rest of the loader it
// reports every mistake as a finding at file:line:column with the key path and what is accepted.

#include "harness/platform.h"
#include "sim/toml_reader.h"

#include <cstdint>
#include <filesystem>
#include <set>
#include <string>
#include <vector>

namespace harness::run {

// The wirings of [inputs], each stimulus resolved to its described source. `timers` are the timers
// that read correctly, `broken_timers` those that did not (names of these are not reported again);
// relative pulse file paths start at `dir`; `seed` is the run's, the default seed of every source.
std::vector<input_wiring> read_inputs(sim::findings_list& out, const toml::table& root,
                                      const std::filesystem::path& dir,
                                      const std::vector<timer_spec>& timers,
                                      const std::set<std::string>& broken_timers,
                                      std::uint64_t seed);

}  // namespace harness::run
