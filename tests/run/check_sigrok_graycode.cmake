# Runs `tickbench run` on an encoder scenario and checks that sigrok-cli's Gray code decoder, in
# its rotary encoder use, reading the two encoder inputs from the waves.vcd the run wrote, counts
# what the firmware read from the timer counting them (run by CTest, see CMakeLists.txt).
# Variables:
#   EXE       the tickbench binary
#   SCENARIO  the scenario (scenarios/encoder_wrap.toml.in): every edge exact at its timescale
#   SIGNALS   the encoder's A and B inputs of the counting timer, "|"-separated (wheel4.input1|
#             wheel4.input2); their names without the timer's must differ
#   READER    the name in the firmware's readings, "at T us: READER count C, direction up|down"
#             (tests/run/firmware/encoder_firmware.c)
#   MODULUS   the timer's period + 1: its counter is the encoder count modulo this
#   OUT       the output folder (emptied first)
#
# The decoder accumulates one step per edge of A or B, +1 when A leads (A on d0, B on d1) and -1
# when B leads, into a signed count that starts at 0. It prints a count only when the next edge
# ends it, as "<first sample>-<last sample> graycode-1: <count>", so the count after the last edge
# is never printed: the script therefore compares at readings that a later edge follows, and fails
# on a reading after the last edge. What it checks:
#   - the decoder printed one count per edge of A and B in waves.vcd, each one step from the last,
#     spans end to end from the first sample;
#   - at each reading's instant T the firmware's count is the decoder's count there modulo
#     MODULUS, and the direction bit is the direction of the decoder's last step before T.
cmake_minimum_required(VERSION 3.25)
include(${CMAKE_CURRENT_LIST_DIR}/sigrok_support.cmake)

# outside tool: sigrok-cli 0.7 graycode decoder (Debian package sigrok-cli)
find_sigrok()
run_tickbench("${EXE}" "${SCENARIO}" "${OUT}")
vcd_ps_per_sample("${OUT}/waves.vcd" ps_per_sample)

string(REPLACE "|" ";" signals "${SIGNALS}")
list(LENGTH signals n)
if(NOT n EQUAL 2)
  message(FATAL_ERROR "SIGNALS names ${n} signals; it takes the encoder's A and B")
endif()
set(wires "")
foreach(signal IN LISTS signals)
  # sigrok names a VCD signal by its reference without the scope: wheel4.input1 is "input1".
  string(REGEX REPLACE "^.*\\." "" wire "${signal}")
  list(APPEND wires ${wire})
endforeach()

# The edges of A and B in waves.vcd: every change of their levels after the initial values.
file(STRINGS "${OUT}/waves.vcd" vcd)
set(ids "")
foreach(wire IN LISTS wires)
  set(id "")
  foreach(line IN LISTS vcd)
    if(line MATCHES "^\\$var wire 1 ([^ ]+) ${wire} \\$end$")
      set(id "${CMAKE_MATCH_1}")
      break()
    endif()
  endforeach()
  if(id STREQUAL "")
    message(FATAL_ERROR "waves.vcd does not dump ${wire}")
  endif()
  list(APPEND ids "${id}")
endforeach()
set(edges 0)
set(in_initial_values FALSE)
foreach(line IN LISTS vcd)
  if(line STREQUAL "$dumpvars")
    set(in_initial_values TRUE)
  elseif(line STREQUAL "$end" AND in_initial_values)
    set(in_initial_values FALSE)
  elseif(line MATCHES "^([01])(.+)$")
    list(FIND ids "${CMAKE_MATCH_2}" which)
    if(which EQUAL -1)
      continue()
    endif()
    if(NOT in_initial_values AND NOT CMAKE_MATCH_1 STREQUAL "${level_${which}}")
      math(EXPR edges "${edges} + 1")
    endif()
    set(level_${which} "${CMAKE_MATCH_1}")
  endif()
endforeach()

list(GET wires 0 wire_a)
list(GET wires 1 wire_b)
execute_process(COMMAND "${SIGROK}" -I vcd -i "${OUT}/waves.vcd" --protocol-decoder-samplenum
                        -P graycode:d0=${wire_a}:d1=${wire_b} -A graycode=count
                RESULT_VARIABLE code OUTPUT_VARIABLE decoded ERROR_VARIABLE err)
string(STRIP "${err}" err)
if(NOT code EQUAL 0 OR NOT err STREQUAL "")
  # sigrok-cli 0.7.2 with libsigrokdecode 0.5.3 (Debian 12) aborts as Python shuts down after
  # this decoder has run: its has_channel() hands back True or False without the reference it
  # owes, so Python 3.11's final collection finds them released once too often (a copy of the
  # decoder with has_channel() left out exits 0). By then the decoding is done and printed; the
  # checks below prove the output complete. Any other failure fails the test.
  string(FIND "${err}" "Fatal Python error: bool_dealloc: deallocating True or False" known)
  string(FIND "${err}" "Python runtime state: finalizing" finalizing)
  if(NOT known EQUAL 0 OR finalizing EQUAL -1)
    message(FATAL_ERROR "sigrok-cli on waves.vcd: exit ${code}\nstderr:\n${err}")
  endif()
  message(STATUS "sigrok-cli aborted as Python shut down after decoding (has_channel() "
                 "reference count fault of libsigrokdecode 0.5.3); its output is checked whole")
endif()

# The decoder's counts: first and last sample of each, and the count.
string(REGEX MATCHALL "[0-9]+-[0-9]+ graycode-1: -?[0-9]+" annotations "${decoded}")
set(starts "")
set(ends "")
set(counts "")
foreach(a IN LISTS annotations)
  string(REGEX MATCH "^([0-9]+)-([0-9]+) graycode-1: (-?[0-9]+)$" _ "${a}")
  list(APPEND starts ${CMAKE_MATCH_1})
  list(APPEND ends ${CMAKE_MATCH_2})
  list(APPEND counts ${CMAKE_MATCH_3})
endforeach()
list(LENGTH counts printed)
if(NOT printed EQUAL edges)
  message(FATAL_ERROR "waves.vcd has ${edges} edges of ${wire_a} and ${wire_b}; the decoder printed "
                      "${printed} counts, expected one per edge\n${decoded}")
endif()
set(up 0)
set(down 0)
set(previous_end 0)
set(previous_count 0)
math(EXPR last "${printed} - 1")
foreach(i RANGE ${last})
  list(GET starts ${i} s)
  list(GET ends ${i} e)
  list(GET counts ${i} c)
  if(NOT s EQUAL previous_end)
    message(FATAL_ERROR "the decoder's count ${c} starts at sample ${s}, not where the one before "
                        "ended (${previous_end})\n${decoded}")
  endif()
  math(EXPR step "${c} - ${previous_count}")
  if(i EQUAL 0 AND NOT c EQUAL 0)
    message(FATAL_ERROR "the decoder's first count is ${c}, not 0\n${decoded}")
  elseif(step EQUAL 1)
    math(EXPR up "${up} + 1")
  elseif(step EQUAL -1)
    math(EXPR down "${down} + 1")
  elseif(i GREATER 0)
    message(FATAL_ERROR "the decoder's count goes from ${previous_count} to ${c} at sample ${s}: "
                        "not one step\n${decoded}")
  endif()
  set(previous_end ${e})
  set(previous_count ${c})
endforeach()

# The firmware's readings, each compared with the decoder's count at its instant.
file(STRINGS "${OUT}/firmware.log" log)
set(readings 0)
foreach(line IN LISTS log)
  if(NOT line MATCHES "  at ([0-9]+) us: ${READER} count ([0-9]+), direction (up|down)$")
    continue()
  endif()
  set(at_us ${CMAKE_MATCH_1})
  set(ours ${CMAKE_MATCH_2})
  set(our_direction ${CMAKE_MATCH_3})
  math(EXPR sample "${at_us} * 1000000 / ${ps_per_sample}")
  math(EXPR rest "${at_us} * 1000000 % ${ps_per_sample}")
  if(NOT rest EQUAL 0)
    message(FATAL_ERROR "reading at ${at_us} us: not a whole sample of ${ps_per_sample} ps")
  endif()
  set(found -1)
  foreach(i RANGE ${last})
    list(GET starts ${i} s)
    list(GET ends ${i} e)
    if(sample GREATER_EQUAL s AND sample LESS e)
      set(found ${i})
      break()
    endif()
  endforeach()
  if(found EQUAL -1)
    message(FATAL_ERROR "reading at ${at_us} us: after the decoder's last printed count (it prints a "
                        "count when the next edge ends it); read before the encoder's last edge")
  endif()
  if(found EQUAL 0 OR sample EQUAL s)
    message(FATAL_ERROR "reading at ${at_us} us: at an edge or before the first: no direction to "
                        "compare")
  endif()
  list(GET counts ${found} theirs)
  math(EXPR before "${found} - 1")
  list(GET counts ${before} theirs_before)
  if(theirs GREATER theirs_before)
    set(their_direction up)
  else()
    set(their_direction down)
  endif()
  math(EXPR wrapped "((${theirs} % ${MODULUS}) + ${MODULUS}) % ${MODULUS}")
  if(NOT ours EQUAL wrapped OR NOT our_direction STREQUAL their_direction)
    message(FATAL_ERROR "reading at ${at_us} us: the firmware read count ${ours}, direction "
                        "${our_direction}; the decoder counts ${theirs} (${wrapped} modulo "
                        "${MODULUS}), direction ${their_direction}")
  endif()
  message(STATUS "at ${at_us} us: firmware ${ours} ${our_direction}, decoder ${theirs} "
                 "${their_direction}")
  math(EXPR readings "${readings} + 1")
endforeach()
if(readings EQUAL 0)
  message(FATAL_ERROR "firmware.log has no reading \"at T us: ${READER} count C, direction D\"")
endif()
message(STATUS "${edges} edges, ${up} steps up and ${down} down; ${readings} readings of ${READER}: "
               "sigrok's decoder and the firmware agree")
