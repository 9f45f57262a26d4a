# What the scripts comparing sigrok-cli's decoders with a run share (check_sigrok_vs_checks.cmake,
# check_sigrok_graycode.cmake): finding sigrok-cli, running tickbench on a scenario whose edges are
# exact at its waveform's timescale, the length of one sample, and reading decimal numbers exactly.
# Include it from a script run with `cmake -P`.

# Sets SIGROK to sigrok-cli, or fails naming the package: a missing tool fails the test, it is
# never skipped.
macro(find_sigrok)
  find_program(SIGROK sigrok-cli)
  if(NOT SIGROK)
    message(FATAL_ERROR "sigrok-cli not found: install the Debian package sigrok-cli "
                        "(scripts/lib/setup.sh lists it; scripts/test installs it)")
  endif()
endmacro()

# Runs `exe run scenario --out out` (the folder emptied first), which must pass and must not move
# an edge to the waveform's time unit: an edge moved would make the decoder and the run see
# different waveforms.
function(run_tickbench exe scenario out)
  file(REMOVE_RECURSE "${out}")
  execute_process(COMMAND "${exe}" run "${scenario}" --out "${out}"
                  RESULT_VARIABLE code OUTPUT_VARIABLE stdout ERROR_VARIABLE stderr)
  if(NOT code EQUAL 0)
    message(FATAL_ERROR "tickbench run: exit ${code}, expected 0\nstdout:\n${stdout}\nstderr:\n${stderr}")
  endif()
  string(FIND "${stderr}" "changes moved to the nearest" at)
  if(NOT at EQUAL -1)
    message(FATAL_ERROR "the scenario's edges are not exact at its timescale:\n${stderr}")
  endif()
endfunction()

# Sets `var` to the picoseconds of one sample of sigrok's VCD input reading `vcd`: one unit of its
# $timescale, sigrok turning each unit into one sample.
function(vcd_ps_per_sample vcd var)
  file(READ "${vcd}" header LIMIT 4096)
  if(NOT header MATCHES "\\$timescale[ \t\n]+(1|10|100) *(ps|ns|us|ms|s)[ \t\n]+\\$end")
    message(FATAL_ERROR "${vcd}: no \$timescale in its header:\n${header}")
  endif()
  set(ps_ps 1)
  set(ps_ns 1000)
  set(ps_us 1000000)
  set(ps_ms 1000000000)
  set(ps_s 1000000000000)
  math(EXPR value "${CMAKE_MATCH_1} * ${ps_${CMAKE_MATCH_2}}")
  set(${var} ${value} PARENT_SCOPE)
endfunction()

# Sets `out` to `text` (a JSON or printf number: "25.0", "1.92e-05", "19.3") times 10^`shift`,
# rounded to the nearest whole number (halves away from zero).
function(decimal_to_whole text shift out)
  if(NOT text MATCHES "^(-?)([0-9]+)(\\.([0-9]*))?([eE]([-+]?[0-9]+))?$")
    message(FATAL_ERROR "\"${text}\" is not a decimal number")
  endif()
  set(sign "${CMAKE_MATCH_1}")
  set(digits "${CMAKE_MATCH_2}${CMAKE_MATCH_4}")
  string(LENGTH "${CMAKE_MATCH_4}" fraction_digits)
  set(exponent 0)
  if(NOT "${CMAKE_MATCH_6}" STREQUAL "")
    set(exponent "${CMAKE_MATCH_6}")
  endif()
  math(EXPR exponent "${exponent} + ${shift} - ${fraction_digits}")
  if(exponent GREATER_EQUAL 0)
    string(REPEAT "0" ${exponent} zeros)
    set(kept "${digits}${zeros}")
    set(round_up 0)
  else()
    math(EXPR dropped "-(${exponent})")
    string(LENGTH "${digits}" length)
    if(dropped GREATER length)
      set(kept "0")
      set(round_up 0)
    else()
      math(EXPR keep "${length} - ${dropped}")
      string(SUBSTRING "${digits}" 0 ${keep} kept)
      string(SUBSTRING "${digits}" ${keep} 1 first_dropped)
      set(round_up 0)
      if(first_dropped GREATER_EQUAL 5)
        set(round_up 1)
      endif()
    endif()
  endif()
  string(REGEX REPLACE "^0+" "" kept "${kept}")
  string(LENGTH "${kept}" length)
  if(length GREATER 18)
    message(FATAL_ERROR "\"${text}\" x 10^${shift} does not fit 64 bits")
  endif()
  if(kept STREQUAL "")
    set(kept 0)
  endif()
  math(EXPR value "${sign}(${kept} + ${round_up})")
  set(${out} ${value} PARENT_SCOPE)
endfunction()
