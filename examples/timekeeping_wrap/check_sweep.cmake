# One timekeeping sweep: runs `tickbench sweep` over both expiry tests at the count's starts STARTS
# (milliseconds before the wrap) and compares the summary's per-variant lines with the section
# [STARTS] of EXPECTED (expected_sweep.txt). Inputs: TICKBENCH, SCENARIO, FIRMWARE, STARTS,
# EXPECTED, OUT.
execute_process(
  COMMAND ${TICKBENCH} sweep ${SCENARIO} --firmware ${FIRMWARE} --waves none
          --vary param.variant=naive,wrap_safe --vary param.start_before_wrap=${STARTS} --out ${OUT}
  RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
# The naive test's firmware check fails somewhere in every section: exit code 3.
if(NOT code EQUAL 3)
  message(FATAL_ERROR "tickbench sweep exited ${code}, expected 3:\n${out}\n${err}")
endif()
file(STRINGS ${OUT}/summary.txt lines REGEX "^param\\.variant=")
string(REPLACE ";" "\n" actual "${lines}")
file(STRINGS ${EXPECTED} expected_lines)
set(expected "")
set(inside FALSE)
foreach(line IN LISTS expected_lines)
  if(line MATCHES "^\\[(.*)\\]$")
    if(CMAKE_MATCH_1 STREQUAL STARTS)
      set(inside TRUE)
    else()
      set(inside FALSE)
    endif()
  elseif(inside AND NOT line MATCHES "^#")
    string(APPEND expected "${line}\n")
  endif()
endforeach()
string(STRIP "${expected}" expected)
if(expected STREQUAL "")
  message(FATAL_ERROR "${EXPECTED} has no section [${STARTS}]")
endif()
if(NOT actual STREQUAL expected)
  message(FATAL_ERROR "sweep over ${STARTS} differs from ${EXPECTED}\nexpected:\n${expected}\n"
                      "actual:\n${actual}")
endif()
