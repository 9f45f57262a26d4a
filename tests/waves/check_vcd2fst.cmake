# Checks that gtkwave's converter reads our VCD files without complaint and that the value changes
# survive a round trip VCD -> FST -> VCD (run by CTest, see CMakeLists.txt). Variables:
#   TOOL  the waves_tool binary (writes the files and compares two VCDs)
#   WORK  a scratch folder, emptied first
# outside tool: vcd2fst and fst2vcd of gtkwave 3.3, Debian package gtkwave
find_program(VCD2FST vcd2fst)
find_program(FST2VCD fst2vcd)
if(NOT VCD2FST OR NOT FST2VCD)
  message(FATAL_ERROR "vcd2fst/fst2vcd not found: install the Debian package gtkwave "
                      "(scripts/lib/setup.sh lists it; scripts/test installs it)")
endif()

file(REMOVE_RECURSE "${WORK}")
file(MAKE_DIRECTORY "${WORK}")
foreach(what pwm features)
  execute_process(COMMAND "${TOOL}" ${what} "${WORK}" RESULT_VARIABLE code ERROR_VARIABLE err)
  if(NOT code EQUAL 0)
    message(FATAL_ERROR "waves_tool ${what} failed (${code}): ${err}")
  endif()
endforeach()

foreach(name pwm_1ps pwm_10ns features)
  set(vcd "${WORK}/${name}.vcd")
  execute_process(COMMAND "${VCD2FST}" -v "${vcd}" -f "${WORK}/${name}.fst"
                  RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
  string(STRIP "${err}" err)
  if(NOT code EQUAL 0 OR NOT err STREQUAL "")
    message(FATAL_ERROR "vcd2fst on ${vcd}: exit ${code}\nstderr:\n${err}\nstdout:\n${out}")
  endif()
  execute_process(COMMAND "${FST2VCD}" -f "${WORK}/${name}.fst" -o "${WORK}/${name}_back.vcd"
                  RESULT_VARIABLE code ERROR_VARIABLE err)
  string(STRIP "${err}" err)
  if(NOT code EQUAL 0 OR NOT err STREQUAL "")
    message(FATAL_ERROR "fst2vcd on ${name}.fst: exit ${code}\nstderr:\n${err}")
  endif()
  # Every value change, glitches included, in order per signal.
  execute_process(COMMAND "${TOOL}" compare "${vcd}" "${WORK}/${name}_back.vcd"
                  RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT code EQUAL 0)
    message(FATAL_ERROR "${name}: value changes differ after vcd2fst and fst2vcd\n${out}${err}")
  endif()
  message(STATUS "${name}: ${out}")
endforeach()
