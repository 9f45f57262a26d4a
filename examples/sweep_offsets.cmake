# The counter-extension sweep: runs the scenario at every firmware start offset from 0 to 63 CPU
# cycles for both read variants, and compares the offsets at which each variant's firmware check
# failed (exit code 3) with the expectation file: lines "naive: <offsets>" and "careful: <offsets>".
set(result "")
foreach(variant naive careful)
  set(failed "")
  foreach(offset RANGE 0 63)
    # The variant is a firmware parameter, overridden on the command line.
    execute_process(
      COMMAND ${TICKBENCH} run ${SCENARIO} --firmware ${FIRMWARE} --out ${OUT}/${variant}_${offset}
              --start-offset ${offset} --param variant=${variant}
      RESULT_VARIABLE code OUTPUT_QUIET ERROR_VARIABLE err)
    if(code EQUAL 3)
      list(APPEND failed ${offset})
    elseif(NOT code EQUAL 0)
      message(FATAL_ERROR "${variant} at offset ${offset}: tickbench exited ${code}:\n${err}")
    endif()
  endforeach()
  string(REPLACE ";" " " failed "${failed}")
  string(APPEND result "${variant}: ${failed}\n")
endforeach()
message("${result}")
file(READ ${EXPECTED} expected)
string(REGEX REPLACE "#[^\n]*\n" "" expected "${expected}")
if(NOT result STREQUAL expected)
  message(FATAL_ERROR "sweep differs from ${EXPECTED}\nexpected:\n${expected}\nactual:\n${result}")
endif()
