# Runs the tickbench command once and checks its exit code and output (used by CTest, see
# CMakeLists.txt). Variables:
#   EXE            the tickbench binary
#   ARGS           its arguments, separated by "|"
#   EXPECT_CODE    the expected exit code
#   EXPECT_STDOUT  optional "|"-separated fragments that stdout must contain
#   EXPECT_STDERR  optional "|"-separated fragments that stderr must contain
#   EXPECT_JSON    when set, stdout must be a valid JSON document (string(JSON) parses it)
string(REPLACE "|" ";" args "${ARGS}")
execute_process(COMMAND ${EXE} ${args} RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT code STREQUAL EXPECT_CODE)
  message(FATAL_ERROR "exit code ${code}, expected ${EXPECT_CODE}\nstdout:\n${out}\nstderr:\n${err}")
endif()
foreach(stream stdout stderr)
  string(TOUPPER "${stream}" up)
  if(stream STREQUAL "stdout")
    set(text "${out}")
  else()
    set(text "${err}")
  endif()
  if(DEFINED EXPECT_${up})
    string(REPLACE "|" ";" fragments "${EXPECT_${up}}")
    foreach(f IN LISTS fragments)
      string(FIND "${text}" "${f}" at)
      if(at EQUAL -1)
        message(FATAL_ERROR "${stream} lacks \"${f}\"\nstdout:\n${out}\nstderr:\n${err}")
      endif()
    endforeach()
  endif()
endforeach()
if(EXPECT_JSON)
  string(JSON kind ERROR_VARIABLE json_error TYPE "${out}" clocks)
  if(json_error)
    message(FATAL_ERROR "stdout is not the expected JSON: ${json_error}\n${out}")
  endif()
  if(NOT kind STREQUAL "ARRAY")
    message(FATAL_ERROR "\"clocks\" is ${kind}, expected an array")
  endif()
endif()
