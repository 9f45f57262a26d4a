# Runs `tickbench run` on a scenario and checks that sigrok-cli's PWM decoder, reading the
# waves.vcd it wrote, measures the same periods and duty cycles as the run's own checks in
# checks.jsonl, signal by signal: timer outputs or the inputs a source drives (run by CTest, see
# CMakeLists.txt). Variables:
#   EXE       the tickbench binary
#   SCENARIO  the scenario (scenarios/pwm_10ns.toml.in, scenarios/sigrok_inputs.toml.in): a `period`
#             and a `duty_cycle` check without `from`/`until` on each signal named in CHANNELS, and
#             a timescale at which every edge is exact
#   CHANNELS  the signals to compare, separated by "|" (pwm.channel1|pwm.channel2); their names
#             without the timer's (channel1, input1) must differ
#   OUT       the output folder (emptied first)
# sigrok's VCD input turns each unit of the timescale into one sample, so a sample is one unit and
# the decoder's period, in samples between two active edges, is exact. Its duty cycle comes only as
# text with six decimals of a percent, so duty cycles are compared at that precision.
cmake_minimum_required(VERSION 3.25)
include(${CMAKE_CURRENT_LIST_DIR}/sigrok_support.cmake)

# outside tool: sigrok-cli 0.7 pwm decoder (Debian package sigrok-cli)
find_sigrok()

# Sets `out` to `sum` / `count` rounded to the nearest whole number (both positive).
function(rounded_mean sum count out)
  math(EXPR value "(2 * ${sum} + ${count}) / (2 * ${count})")
  set(${out} ${value} PARENT_SCOPE)
endfunction()

run_tickbench("${EXE}" "${SCENARIO}" "${OUT}")
vcd_ps_per_sample("${OUT}/waves.vcd" ps_per_sample)

# The run's measurements: ours_<kind>__<signal> = min;mean;max;count, periods in whole picoseconds and
# duty cycles in millionths of a percent. checks.jsonl holds doubles (CMake reads them back with 17
# digits); the nearest picosecond recovers the exact period.
file(STRINGS "${OUT}/checks.jsonl" lines)
foreach(line IN LISTS lines)
  string(JSON kind GET "${line}" kind)
  if(NOT kind MATCHES "^(period|duty_cycle)$")
    continue()
  endif()
  string(JSON signal GET "${line}" signal)
  string(JSON verdict GET "${line}" verdict)
  if(NOT verdict STREQUAL "pass")
    message(FATAL_ERROR "checks.jsonl: check failed, the scenario must pass: ${line}")
  endif()
  if(kind STREQUAL "period")
    set(shift 12)
  else()
    set(shift 6)
  endif()
  set(values "")
  foreach(what min mean max)
    string(JSON v GET "${line}" measured ${what})
    decimal_to_whole("${v}" ${shift} v)
    list(APPEND values ${v})
  endforeach()
  string(JSON n GET "${line}" measured count)
  list(APPEND values ${n})
  set(ours_${kind}__${signal} "${values}")
endforeach()

# One decoder per channel; sigrok names them pwm-1, pwm-2, ... in this order.
string(REPLACE "|" ";" channels "${CHANNELS}")
set(command "${SIGROK}" -I vcd -i "${OUT}/waves.vcd" --protocol-decoder-samplenum)
foreach(channel IN LISTS channels)
  # sigrok names a VCD signal by its reference without the scope: pwm.channel1 is "channel1".
  string(REGEX REPLACE "^.*\\." "" wire "${channel}")
  list(APPEND command -P pwm:data=${wire})
endforeach()
execute_process(COMMAND ${command} RESULT_VARIABLE code OUTPUT_VARIABLE decoded ERROR_VARIABLE err)
string(STRIP "${err}" err)
if(NOT code EQUAL 0 OR NOT err STREQUAL "")
  message(FATAL_ERROR "sigrok-cli on waves.vcd: exit ${code}\nstderr:\n${err}")
endif()

set(n 0)
foreach(channel IN LISTS channels)
  math(EXPR n "${n} + 1")
  foreach(kind period duty_cycle)
    if(NOT DEFINED ours_${kind}__${channel})
      message(FATAL_ERROR "checks.jsonl has no ${kind} check on ${channel}")
    endif()
  endforeach()
  # Each period gives "<first>-<last> pwm-N: <percent>%" and "<first>-<last> pwm-N: <period> <unit>"
  # over the same samples, from one active edge to the next.
  string(REGEX MATCHALL "[0-9]+-[0-9]+ pwm-${n}: [0-9.]+%" duties "${decoded}")
  string(REGEX MATCHALL "[0-9]+-[0-9]+ pwm-${n}: [0-9.]+ [^ \n%]+s" period_texts "${decoded}")
  list(LENGTH duties count)
  list(LENGTH period_texts period_count)
  if(count EQUAL 0 OR NOT count EQUAL period_count)
    message(FATAL_ERROR "sigrok decoded ${count} duty cycles and ${period_count} periods on ${channel}\n${decoded}")
  endif()
  set(first TRUE)
  set(period_sum 0)
  set(duty_sum 0)
  foreach(d IN LISTS duties)
    string(REGEX MATCH "^([0-9]+)-([0-9]+) pwm-${n}: ([0-9.]+)%" _ "${d}")
    math(EXPR period "(${CMAKE_MATCH_2} - ${CMAKE_MATCH_1}) * ${ps_per_sample}")
    decimal_to_whole("${CMAKE_MATCH_3}" 6 duty)
    math(EXPR period_sum "${period_sum} + ${period}")
    math(EXPR duty_sum "${duty_sum} + ${duty}")
    if(first)
      set(first FALSE)
      set(period_min ${period})
      set(period_max ${period})
      set(duty_min ${duty})
      set(duty_max ${duty})
    endif()
    if(period LESS period_min)
      set(period_min ${period})
    endif()
    if(period GREATER period_max)
      set(period_max ${period})
    endif()
    if(duty LESS duty_min)
      set(duty_min ${duty})
    endif()
    if(duty GREATER duty_max)
      set(duty_max ${duty})
    endif()
  endforeach()
  rounded_mean(${period_sum} ${count} period_mean)
  rounded_mean(${duty_sum} ${count} duty_mean)
  set(theirs_period ${period_min} ${period_mean} ${period_max} ${count})
  set(theirs_duty_cycle ${duty_min} ${duty_mean} ${duty_max} ${count})

  # Periods agree exactly, to the picosecond, as do the counts of whole periods; the means are each
  # side's exact mean rounded to the picosecond.
  set(ours "${ours_period__${channel}}")
  if(NOT theirs_period STREQUAL ours)
    message(FATAL_ERROR "${channel}: period min;mean;max in ps;count: sigrok measured ${theirs_period}, "
                        "checks.jsonl has ${ours}")
  endif()
  # Duty cycles agree to sigrok's printed precision, six decimals of a percent (compared here in
  # millionths of a percent), within one millionth: checks.jsonl holds each duty rounded to seven
  # decimals, so bringing it to six rounds twice (50.18162947 -> 50.1816295 -> 50.181630, where
  # sigrok prints 50.181629), and sigrok's per-period values are rounded before the mean is taken
  # here. The counts agree exactly.
  set(ours "${ours_duty_cycle__${channel}}")
  foreach(i 0 1 2)
    list(GET ours ${i} our_value)
    list(GET theirs_duty_cycle ${i} their_value)
    math(EXPR gap "${their_value} - ${our_value}")
    if(gap LESS -1 OR gap GREATER 1)
      message(FATAL_ERROR "${channel}: duty cycle min;mean;max in millionths of a percent: sigrok "
                          "measured ${theirs_duty_cycle}, checks.jsonl has ${ours}")
    endif()
  endforeach()
  list(GET ours 3 our_count)
  list(GET theirs_duty_cycle 3 their_count)
  if(NOT our_count EQUAL their_count)
    message(FATAL_ERROR "${channel}: sigrok measured ${their_count} duty cycles, checks.jsonl has "
                        "${our_count}")
  endif()

  # The decoder's period text, one decimal in its own unit, for the shortest and the longest period.
  foreach(period ${period_min} ${period_max})
    set(text_found FALSE)
    foreach(t IN LISTS period_texts)
      string(REGEX MATCH "^([0-9]+)-([0-9]+) pwm-${n}: ([0-9.]+) ([^ ]+)$" _ "${t}")
      math(EXPR span "(${CMAKE_MATCH_2} - ${CMAKE_MATCH_1}) * ${ps_per_sample}")
      if(span EQUAL period)
        set(text_found TRUE)
        set(period_text "${t}")
        break()
      endif()
    endforeach()
    if(NOT text_found)
      message(FATAL_ERROR "${channel}: sigrok printed no period text for its period of ${period} ps")
    endif()
    if(NOT CMAKE_MATCH_4 STREQUAL "μs")
      message(FATAL_ERROR "${channel}: sigrok printed \"${period_text}\"; this check expects periods of 1 us to 1 ms")
    endif()
    decimal_to_whole("${CMAKE_MATCH_3}" 1 tenths)
    # Our period in tenths of a microsecond; on an exact half either rounding is sigrok's to make.
    math(EXPR low "${period} / 100000")
    math(EXPR rest "${period} % 100000")
    math(EXPR high "${low} + 1")
    if(NOT (tenths EQUAL low AND rest LESS_EQUAL 50000) AND NOT (tenths EQUAL high AND rest GREATER_EQUAL 50000))
      message(FATAL_ERROR "${channel}: sigrok printed \"${period_text}\" for a period of ${period} ps")
    endif()
  endforeach()
  list(GET theirs_duty_cycle 0 duty_min)
  message(STATUS "${channel}: ${count} periods, ${period_min}..${period_max} ps (mean ${period_mean}), "
                 "duty ${duty_min}..${duty_max} millionths of a percent (mean ${duty_mean}): "
                 "sigrok and checks.jsonl agree")
endforeach()
