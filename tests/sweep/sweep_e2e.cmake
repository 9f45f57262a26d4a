# `tickbench sweep` and `tickbench merge` end to end (docs/cli.md, "sweep"), one MODE per test:
#   same_as_run  every kept point folder equals what `tickbench run` writes for the same point,
#                byte for byte (waveform included), and each point's exit code in sweep.jsonl
#                equals run's; with --jobs 2 and with every point in one process
#   shards       the shards of a sweep, merged, give the unsharded reports byte for byte; merging
#                shards of two different sweeps is refused
#   bad_vary     a bad --vary exits 2 with its message before anything runs
#   fresh_data   points run one after another in one process each start from the firmware's data
#                as loaded (tests/sweep/firmware/fresh_data_firmware.c)
#   outcomes     a failed check gives exit code 1 and the check with its measured values in
#                sweep.jsonl; a crash gives 3 and the failure's first line; a crash at one point
#                and a failed check at another gives 3
# Inputs: TICKBENCH, SCENARIO, FIRMWARE, OUT; for outcomes RUN_SCENARIOS (tests/run's scenarios).

function(tb)
  cmake_parse_arguments(arg "" "CODE;STDOUT;STDERR" "ARGS" ${ARGN})
  execute_process(COMMAND ${TICKBENCH} ${arg_ARGS} RESULT_VARIABLE code OUTPUT_VARIABLE out
    ERROR_VARIABLE err)
  if(NOT code STREQUAL arg_CODE)
    message(FATAL_ERROR "tickbench ${arg_ARGS}: exit ${code}, expected ${arg_CODE}\n${out}\n${err}")
  endif()
  if(arg_STDOUT)
    set(${arg_STDOUT} "${out}" PARENT_SCOPE)
  endif()
  if(arg_STDERR)
    set(${arg_STDERR} "${err}" PARENT_SCOPE)
  endif()
endfunction()

function(same_file a b)
  execute_process(COMMAND ${CMAKE_COMMAND} -E compare_files ${a} ${b} RESULT_VARIABLE differ)
  if(differ)
    message(FATAL_ERROR "${a} and ${b} differ")
  endif()
endfunction()

file(REMOVE_RECURSE ${OUT})
set(common ${SCENARIO} --firmware ${FIRMWARE})

if(MODE STREQUAL "same_as_run")
  # Offsets 2..4 of both variants: the naive read fails at 3 and 4 (expected_sweep.txt).
  tb(CODE 3 ARGS sweep ${common} --vary param.variant=naive,careful --vary start-offset=2..4
     --waves all --jobs 2 --out ${OUT}/sweep)
  file(STRINGS ${OUT}/sweep/sweep.jsonl lines)
  list(LENGTH lines n)
  if(NOT n EQUAL 7)
    message(FATAL_ERROR "sweep.jsonl has ${n} lines, expected a header and 6 points")
  endif()
  set(index 0)
  foreach(variant naive careful)
    foreach(offset 2 3 4)
      execute_process(COMMAND ${TICKBENCH} run ${common} --param variant=${variant}
        --start-offset ${offset} --out ${OUT}/run_${index} RESULT_VARIABLE run_code
        OUTPUT_QUIET ERROR_QUIET)
      math(EXPR line "${index} + 1")
      list(GET lines ${line} record)
      string(JSON sweep_code GET "${record}" exit)
      string(JSON v GET "${record}" values param.variant)
      string(JSON o GET "${record}" values start-offset)
      if(NOT v STREQUAL variant OR NOT o STREQUAL offset)
        message(FATAL_ERROR "point ${index} is ${v}/${o}, expected ${variant}/${offset}")
      endif()
      if(NOT sweep_code EQUAL run_code)
        message(FATAL_ERROR "point ${index}: sweep says exit ${sweep_code}, run exits ${run_code}")
      endif()
      set(files checks.jsonl junit.xml summary.txt firmware.log waves.vcd report.json report.html)
      if(run_code EQUAL 3)
        list(APPEND files failure.txt)
      endif()
      foreach(f ${files})
        same_file(${OUT}/sweep/points/${index}/${f} ${OUT}/run_${index}/${f})
      endforeach()
      math(EXPR index "${index} + 1")
    endforeach()
  endforeach()
  # One process runs every point one after another (the naive read's failed firmware check ends a
  # point, not the process): the same folders again.
  tb(CODE 3 ARGS sweep ${common} --vary param.variant=naive,careful --vary start-offset=2..4
     --waves all --jobs 1 --out ${OUT}/one_process)
  foreach(index RANGE 5)
    file(GLOB files RELATIVE ${OUT}/run_${index} ${OUT}/run_${index}/*)
    foreach(f ${files})
      same_file(${OUT}/one_process/points/${index}/${f} ${OUT}/run_${index}/${f})
    endforeach()
  endforeach()
  same_file(${OUT}/one_process/sweep.jsonl ${OUT}/sweep/sweep.jsonl)
  # The default keeps only the failing points' folders.
  tb(CODE 3 ARGS sweep ${common} --vary param.variant=naive,careful --vary start-offset=2..4
     --jobs 2 --out ${OUT}/failing)
  file(GLOB kept RELATIVE ${OUT}/failing/points ${OUT}/failing/points/*)
  list(SORT kept)
  if(NOT kept STREQUAL "1;2")
    message(FATAL_ERROR "kept folders ${kept}, expected the failing points 1;2")
  endif()
  same_file(${OUT}/failing/points/1/checks.jsonl ${OUT}/run_1/checks.jsonl)
  same_file(${OUT}/failing/points/1/report.html ${OUT}/run_1/report.html)
  same_file(${OUT}/failing/sweep.jsonl ${OUT}/sweep/sweep.jsonl)
elseif(MODE STREQUAL "shards")
  set(axes --vary param.variant=naive,careful --vary start-offset=0..6)
  tb(CODE 3 ARGS sweep ${common} ${axes} --waves none --out ${OUT}/whole STDOUT whole_out)
  set(dirs "")
  foreach(k 1 2 3)
    execute_process(COMMAND ${TICKBENCH} sweep ${common} ${axes} --waves none --shard ${k}/3
      --out ${OUT}/shard${k} OUTPUT_QUIET ERROR_QUIET)
    list(APPEND dirs ${OUT}/shard${k})
  endforeach()
  tb(CODE 3 ARGS merge ${OUT}/shard3 ${OUT}/shard1 ${OUT}/shard2 --out ${OUT}/merged)
  foreach(f sweep.jsonl junit.xml summary.txt)
    same_file(${OUT}/merged/${f} ${OUT}/whole/${f})
  endforeach()
  # Shard 1/3 holds points 0, 3, 6, 9, 12.
  file(STRINGS ${OUT}/shard1/sweep.jsonl shard_lines)
  list(LENGTH shard_lines n)
  if(NOT n EQUAL 6)
    message(FATAL_ERROR "shard 1/3 has ${n} lines, expected a header and 5 points")
  endif()
  list(GET shard_lines 2 second)
  string(JSON p GET "${second}" point)
  if(NOT p EQUAL 3)
    message(FATAL_ERROR "shard 1/3's second point is ${p}, expected 3")
  endif()
  # A shard of another sweep (other axes) is refused.
  tb(CODE 0 ARGS sweep ${common} --vary param.variant=careful --vary start-offset=0..6
     --shard 2/3 --waves none --out ${OUT}/other)
  tb(CODE 2 ARGS merge ${OUT}/shard1 ${OUT}/other ${OUT}/shard3 --out ${OUT}/refused
     STDERR err)
  if(NOT err MATCHES "a shard of a different sweep than .*shard1/sweep.jsonl \\(the axes differ\\)")
    message(FATAL_ERROR "unexpected message: ${err}")
  endif()
elseif(MODE STREQUAL "bad_vary")
  tb(CODE 2 ARGS sweep ${common} --vary start-offset=5..1 --out ${OUT}/a STDERR err)
  if(NOT err MATCHES "tickbench: error: --vary start-offset=5..1: the range starts above its end")
    message(FATAL_ERROR "unexpected message: ${err}")
  endif()
  tb(CODE 2 ARGS sweep ${common} --vary "clocks.xtl.frequency=12 MHz" --out ${OUT}/b STDERR err)
  if(NOT err MATCHES "clocks.xtl.frequency: \\[clocks\\] has no table \"xtl\" .*keys in \\[clocks\\]: sys, xtal")
    message(FATAL_ERROR "unexpected message: ${err}")
  endif()
  # A bad value of a scenario key is the loader's finding, before any point runs.
  tb(CODE 2 ARGS sweep ${common} --vary "cpu.access-cycles=2,zero" --out ${OUT}/c STDERR err)
  if(NOT err MATCHES "cpu.access-cycles")
    message(FATAL_ERROR "unexpected message: ${err}")
  endif()
  foreach(d a b c)
    if(EXISTS ${OUT}/${d})
      message(FATAL_ERROR "${OUT}/${d} was written although the sweep never started")
    endif()
  endforeach()
  # A scenario key axis that is good runs: the crystal moved within its range.
  tb(CODE 0 ARGS sweep ${common} --vary param.variant=careful
     "--vary" "clocks.xtal.frequency=11.9 MHz..12.1 MHz/3" --out ${OUT}/d STDOUT out)
  if(NOT out MATCHES "param.variant=careful: passes at every clocks.xtal.frequency \\(0 of 3 fail\\)")
    message(FATAL_ERROR "unexpected summary: ${out}")
  endif()
  # --vary takes one value each time: the scenario may follow it.
  tb(CODE 0 ARGS sweep --vary param.variant=careful ${common} --vary start-offset=0
     --out ${OUT}/e)
elseif(MODE STREQUAL "outcomes")
  tb(CODE 1 ARGS sweep ${RUN_SCENARIOS}/pwm_failing_check.toml --vary seed=1,2 --waves none
     --out ${OUT}/checks STDOUT out)
  if(NOT out MATCHES "2 ran: 0 passed, 2 failed \\(0 firmware, 2 checks\\)")
    message(FATAL_ERROR "unexpected summary: ${out}")
  endif()
  file(STRINGS ${OUT}/checks/sweep.jsonl lines)
  list(GET lines 1 record)
  string(JSON outcome GET "${record}" outcome)
  string(JSON check GET "${record}" failed 0 check)
  string(JSON mean GET "${record}" failed 0 measured mean)
  if(NOT outcome STREQUAL "checks-failed" OR NOT check STREQUAL "channel 1 duty"
     OR NOT mean EQUAL 25)
    message(FATAL_ERROR "unexpected record: ${record}")
  endif()
  tb(CODE 3 ARGS sweep ${RUN_SCENARIOS}/pwm_crash.toml --vary seed=1 --waves none
     --out ${OUT}/crash)
  file(STRINGS ${OUT}/crash/sweep.jsonl lines)
  list(GET lines 1 record)
  string(JSON outcome GET "${record}" outcome)
  string(JSON message GET "${record}" message)
  if(NOT outcome STREQUAL "crashed" OR NOT message MATCHES "^SIGSEGV")
    message(FATAL_ERROR "unexpected record: ${record}")
  endif()
  # A firmware failure outranks a failed check; the axis is a scenario key (the firmware's ending).
  tb(CODE 3 ARGS sweep ${RUN_SCENARIOS}/pwm_failing_check.toml --waves none --out ${OUT}/both
     "--vary" "firmware.parameters.ending=return,crash")
elseif(MODE STREQUAL "fresh_data")
  # The firmware's check fails when it finds its data changed by an earlier point of its process.
  tb(CODE 0 ARGS sweep ${common} --vary seed=1..6 --jobs 1 --waves none --out ${OUT}/sweep
     STDOUT out)
  if(NOT out MATCHES "6 ran: 6 passed, 0 failed")
    message(FATAL_ERROR "unexpected summary: ${out}")
  endif()
else()
  message(FATAL_ERROR "unknown MODE ${MODE}")
endif()
