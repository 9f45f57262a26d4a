# One example sweep: runs `tickbench sweep` over the firmware's variants and the values VALUES of
# the axis AXIS, and compares the summary's per-variant lines with the section [VALUES] of EXPECTED
# (the example's expected_sweep.txt). Inputs: TICKBENCH, SCENARIO, FIRMWARE, VARIANTS (the values
# of param.variant, comma-separated), AXIS, VALUES, EXPECTED, OUT, and optional SWEEP_ARGS (more
# `sweep` options separated by "|", e.g. "--duration|800 us").
string(REPLACE "|" ";" extra_args "${SWEEP_ARGS}")
execute_process(
  COMMAND ${TICKBENCH} sweep ${SCENARIO} --firmware ${FIRMWARE} ${extra_args}
          --vary param.variant=${VARIANTS} --vary ${AXIS}=${VALUES} --out ${OUT}
  RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
# Each example's naive variant fails its firmware check somewhere in every section: exit code 3.
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
    if(CMAKE_MATCH_1 STREQUAL VALUES)
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
  message(FATAL_ERROR "${EXPECTED} has no section [${VALUES}]")
endif()
if(NOT actual STREQUAL expected)
  message(FATAL_ERROR "sweep over ${AXIS}=${VALUES} differs from ${EXPECTED}\nexpected:\n"
                      "${expected}\nactual:\n${actual}")
endif()
