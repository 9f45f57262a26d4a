#pragma once
// Mutants of the fast timer model, to prove that the differential test catches real fast-model
// bugs: a dropped clock change, skipping arithmetic off by one, a forgotten shadow load.
//
// Each is a copy of models/timer/timer_core.cpp with one snippet replaced, generated at build time
// (tests/differential/fast_mutants.cmake lists them, their snippets and the rule each breaks), so
// the production code needs no hook, virtual call or #ifdef for them. The list below is generated
// from the same file.

#include "tests/differential/program_runner.h"

#include <string>
#include <vector>

namespace tickbench::differential {

struct fast_mutant {
    std::string name;  // as in fast_mutants.cmake
    std::string rule;  // the rule of docs/timer-model.md it breaks
    model_factory make;
};

// Every mutant of fast_mutants.cmake, in its order.
const std::vector<fast_mutant>& all_fast_mutants();

}  // namespace tickbench::differential
