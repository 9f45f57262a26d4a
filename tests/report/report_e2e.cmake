# A failing run writes report.json and report.html; `tickbench report DIR` writes the same
# report.html again from report.json, byte for byte; bad folders and files are refused with exit
# code 2 (used by CTest, see CMakeLists.txt). Variables:
#   EXE       the tickbench binary
#   SCENARIO  a scenario whose run fails a check (exit code 1)
#   OUT       a scratch folder (emptied first)
cmake_minimum_required(VERSION 3.25)
file(REMOVE_RECURSE "${OUT}")
set(run "${OUT}/run")
execute_process(COMMAND ${EXE} run ${SCENARIO} --out ${run} RESULT_VARIABLE code
  OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT code EQUAL 1)
  message(FATAL_ERROR "run: exit code ${code}, expected 1\n${out}\n${err}")
endif()
string(FIND "${out}" "firmware.log, report.json, report.html" at)
if(at EQUAL -1)
  message(FATAL_ERROR "run: the outputs line does not name report.json and report.html:\n${out}")
endif()
file(READ "${run}/report.html" first)
foreach(want "<!DOCTYPE html>" "channel 1 duty" "pwm.channel1" "first failure at " "<svg"
        "Clock plan" "48000000")
  string(FIND "${first}" "${want}" at)
  if(at EQUAL -1)
    message(FATAL_ERROR "report.html lacks \"${want}\"")
  endif()
endforeach()
foreach(banned "<script" "src=" "<link" "url(")
  string(FIND "${first}" "${banned}" at)
  if(NOT at EQUAL -1)
    message(FATAL_ERROR "report.html is not self-contained: it has \"${banned}\"")
  endif()
endforeach()
file(SIZE "${run}/report.html" html_size)
file(SIZE "${run}/report.json" json_size)
if(html_size GREATER 200000 OR json_size GREATER 200000)
  message(FATAL_ERROR "report too big: report.html ${html_size} bytes, report.json ${json_size}")
endif()

# Rendered again from report.json, with and without the old page in place.
foreach(round 1 2)
  if(round EQUAL 2)
    file(REMOVE "${run}/report.html")
  endif()
  execute_process(COMMAND ${EXE} report ${run} RESULT_VARIABLE code OUTPUT_VARIABLE out
    ERROR_VARIABLE err)
  if(NOT code EQUAL 0)
    message(FATAL_ERROR "report: exit code ${code}, expected 0\n${out}\n${err}")
  endif()
  file(READ "${run}/report.html" again)
  if(NOT again STREQUAL first)
    message(FATAL_ERROR "report DIR wrote a report.html that differs from the run's")
  endif()
endforeach()

# Bad input: a folder that is missing, a folder without report.json, a report.json that is not
# one.
file(MAKE_DIRECTORY "${OUT}/empty" "${OUT}/broken")
file(WRITE "${OUT}/broken/report.json" "{\n  \"format\": \"tickbench-report\",\n  nope\n}\n")
foreach(case "${OUT}/missing|not a folder"
             "${OUT}/empty|report.json: cannot read the file"
             "${OUT}/broken|broken/report.json:3:")
  string(REPLACE "|" ";" parts "${case}")
  list(GET parts 0 dir)
  list(GET parts 1 want)
  execute_process(COMMAND ${EXE} report ${dir} RESULT_VARIABLE code OUTPUT_VARIABLE out
    ERROR_VARIABLE err)
  if(NOT code EQUAL 2)
    message(FATAL_ERROR "report ${dir}: exit code ${code}, expected 2\n${out}\n${err}")
  endif()
  string(FIND "${err}" "tickbench: error: " a)
  string(FIND "${err}" "${want}" b)
  if(a EQUAL -1 OR b EQUAL -1)
    message(FATAL_ERROR "report ${dir}: stderr lacks \"${want}\":\n${err}")
  endif()
endforeach()
