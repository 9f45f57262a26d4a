# Writes the fast-model mutant NAME (fast_mutants.cmake): SOURCE (models/timer/timer_core.cpp) with
# the mutant's snippet replaced, its class renamed to timer_core_mutant_NAME, and a factory
# fast_mutants::make_NAME (listed by all_fast_mutants(), fast_mutants.h), into OUTPUT. Run at build time:
#   cmake -DNAME=<mutant> -DSOURCE=<timer_core.cpp> -DOUTPUT=<file.cpp> -P make_fast_mutant.cmake
# Stops with an error naming the mutant if its snippet is not in SOURCE exactly once.
cmake_minimum_required(VERSION 3.25)
include(${CMAKE_CURRENT_LIST_DIR}/fast_mutants.cmake)

if(NOT NAME IN_LIST fast_mutants)
  message(FATAL_ERROR "make_fast_mutant: no mutant '${NAME}' in fast_mutants.cmake; "
    "there are: ${fast_mutants}")
endif()
set(rule "${fast_mutant_${NAME}_rule}")
set(from "${fast_mutant_${NAME}_from}")
set(to "${fast_mutant_${NAME}_to}")

if(from STREQUAL "" OR from STREQUAL to)
  message(FATAL_ERROR "fast-model mutant '${NAME}': its snippet is empty or replaced by itself; "
    "the mutant would be the unchanged model (tests/differential/fast_mutants.cmake)")
endif()

file(READ "${SOURCE}" code)
string(FIND "${code}" "${from}" first)
string(FIND "${code}" "${from}" last REVERSE)
if(first EQUAL -1)
  message(FATAL_ERROR "fast-model mutant '${NAME}' (breaks: ${rule}): the code it replaces is no "
    "longer in ${SOURCE}:\n${from}\n"
    "Rewrite the mutant in tests/differential/fast_mutants.cmake so that it breaks the same rule "
    "in the code as it is now.")
endif()
if(NOT first EQUAL last)
  message(FATAL_ERROR "fast-model mutant '${NAME}' (breaks: ${rule}): the code it replaces "
    "appears more than once in ${SOURCE}:\n${from}\n"
    "Lengthen the snippet in tests/differential/fast_mutants.cmake until it names one place.")
endif()
string(REPLACE "${from}" "${to}" code "${code}")

file(WRITE "${OUTPUT}" "// Generated from ${SOURCE} by tests/differential/make_fast_mutant.cmake:
// the fast-model mutant ${NAME}, which breaks: ${rule}. Do not edit.
#define timer_core timer_core_mutant_${NAME}
${code}
#include <memory>

namespace tickbench::differential::fast_mutants {

std::unique_ptr<models::timer_core_if> make_${NAME}(const models::timer_config& cfg,
                                                   const sim::clock_domain& timer_clock,
                                                   models::timer_observer* observer) {
    return std::make_unique<models::timer_core>(cfg, timer_clock, observer);
}

}  // namespace tickbench::differential::fast_mutants
")
