# One scenario test of tickbench_add_scenario_test() (TickbenchFunctions.cmake): runs
# `tickbench run` and judges its exit code. Variables:
#   TICKBENCH  the tickbench command
#   ARGS       its arguments, separated by "|"
#   EXPECT     pass: exit code 0 passes; fail: exit code 1 (a check failed) passes
# Every other exit code fails the test, whatever EXPECT says.
cmake_minimum_required(VERSION 3.20)
string(REPLACE "|" ";" args "${ARGS}")
execute_process(COMMAND "${TICKBENCH}" ${args} RESULT_VARIABLE code)
# The exit codes of `tickbench run` (docs/cli.md, "Exit codes").
set(meaning_0 "every check passed")
set(meaning_1 "a check failed")
set(meaning_2 "bad input (a usage error, an unreadable file, a mistake in the scenario, a firmware library that cannot be loaded)")
set(meaning_3 "the firmware crashed, aborted, hung or failed one of its own checks (see failure.txt)")
set(meaning_4 "an internal error in tickbench")
set(meaning_5 "a watchdog reset the part unexpectedly (see failure.txt)")
if(DEFINED meaning_${code})
  set(meaning "${meaning_${code}}")
else()
  set(meaning "not an exit code of tickbench run")
endif()
if((EXPECT STREQUAL "pass" AND code STREQUAL "0") OR (EXPECT STREQUAL "fail" AND code STREQUAL "1"))
  message(STATUS "tickbench run: exit code ${code}, ${meaning}, as expected")
  return()
endif()
if(EXPECT STREQUAL "fail" AND code STREQUAL "0")
  message(FATAL_ERROR "tickbench run: exit code 0, every check passed, but the test expects a check to fail")
endif()
message(FATAL_ERROR "tickbench run: exit code ${code}: ${meaning}")
