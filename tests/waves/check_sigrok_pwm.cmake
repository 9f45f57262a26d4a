# Checks that sigrok-cli's PWM decoder, reading our VCD files, measures the period and duty cycle
# that we measure from the timer's own edges (run by CTest, see CMakeLists.txt). Variables:
#   TOOL  the waves_tool binary (writes the files and pwm_measured.txt)
#   WORK  a scratch folder, emptied first
# sigrok's VCD input expands a file into samples at the timescale's rate, so the 10 ns file is read
# as it is (100 MHz) and the 1 ps one with the input's downsample option (1 THz / 10000 = 100 MHz).
# outside tool: sigrok-cli 0.7 with libsigrokdecode's pwm decoder, Debian package sigrok-cli
find_program(SIGROK sigrok-cli)
if(NOT SIGROK)
  message(FATAL_ERROR "sigrok-cli not found: install the Debian package sigrok-cli "
                      "(scripts/lib/setup.sh lists it; scripts/test installs it)")
endif()

file(REMOVE_RECURSE "${WORK}")
file(MAKE_DIRECTORY "${WORK}")
execute_process(COMMAND "${TOOL}" pwm "${WORK}" RESULT_VARIABLE code ERROR_VARIABLE err)
if(NOT code EQUAL 0)
  message(FATAL_ERROR "waves_tool pwm failed (${code}): ${err}")
endif()
# Lines "<signal> <period_ps> <period_us with one decimal> <duty percent with six decimals>".
file(STRINGS "${WORK}/pwm_measured.txt" measured)
list(LENGTH measured channels)
if(NOT channels EQUAL 3)
  message(FATAL_ERROR "pwm_measured.txt: expected 3 channels, got:\n${measured}")
endif()

set(ps_per_sample 10000)  # 100 MHz in both runs
foreach(input "pwm_10ns.vcd|vcd" "pwm_1ps.vcd|vcd:downsample=10000")
  string(REPLACE "|" ";" input "${input}")
  list(GET input 0 file)
  list(GET input 1 format)
  # One decoder per channel; sigrok names them pwm-1, pwm-2, pwm-3 in this order.
  set(command "${SIGROK}" -I ${format} -i "${WORK}/${file}" --protocol-decoder-samplenum
      -P pwm:data=channel1 -P pwm:data=channel2 -P pwm:data=channel3)
  execute_process(COMMAND ${command} RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
  string(STRIP "${err}" err)
  if(NOT code EQUAL 0 OR NOT err STREQUAL "")
    message(FATAL_ERROR "sigrok-cli on ${file}: exit ${code}\nstderr:\n${err}")
  endif()
  set(n 0)
  foreach(line IN LISTS measured)
    math(EXPR n "${n} + 1")
    string(REPLACE " " ";" fields "${line}")
    list(GET fields 0 signal)
    list(GET fields 1 period_ps)
    list(GET fields 2 period_us)
    list(GET fields 3 duty)
    # Duty annotations: "<first>-<last> pwm-N: <percent>%", spanning one period in samples.
    string(REGEX MATCHALL "[0-9]+-[0-9]+ pwm-${n}: [0-9.]+%" duties "${out}")
    list(LENGTH duties count)
    if(count LESS 45)
      message(FATAL_ERROR "${file}: ${signal}: ${count} duty cycles decoded, expected at least 45 of 50 periods\n${out}")
    endif()
    foreach(d IN LISTS duties)
      string(REGEX MATCH "^([0-9]+)-([0-9]+) pwm-${n}: ([0-9.]+)%" _ "${d}")
      math(EXPR span_ps "(${CMAKE_MATCH_2} - ${CMAKE_MATCH_1}) * ${ps_per_sample}")
      if(NOT span_ps EQUAL period_ps OR NOT CMAKE_MATCH_3 STREQUAL duty)
        message(FATAL_ERROR "${file}: ${signal}: sigrok measured \"${d}\" (period ${span_ps} ps), "
                            "we measured period ${period_ps} ps and duty ${duty}%")
      endif()
    endforeach()
    # Period annotations in the decoder's own unit text.
    string(REGEX MATCHALL "pwm-${n}: [0-9.]+ [^ \n%]+s" periods "${out}")
    list(REMOVE_DUPLICATES periods)
    if(NOT periods STREQUAL "pwm-${n}: ${period_us} μs")
      message(FATAL_ERROR "${file}: ${signal}: sigrok's periods ${periods}, we measured ${period_us} us")
    endif()
    message(STATUS "${file}: ${signal}: ${count} periods of ${period_us} us at ${duty}% in agreement")
  endforeach()
endforeach()
