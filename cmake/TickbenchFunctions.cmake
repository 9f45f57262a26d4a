# CMake functions for projects that test firmware with Tickbench (docs/package.md). The installed
# package includes this file; Tickbench's own tree includes it too.
#
#   tickbench_add_firmware(<target> <source>...)
#       Builds firmware sources as a module library that `tickbench run` loads: the header
#       <tickbench/firmware.h> on the include path, nothing linked (the tick_* calls resolve
#       against the tickbench executable when it loads the library), its symbols visible.
#
#   tickbench_add_scenario_test(NAME <name> SCENARIO <file> FIRMWARE <target or source>...
#                               [PARAMS NAME=VALUE...] [EXPECT pass|fail] [RUN_ARGS <arg>...])
#       Registers a CTest test running `tickbench run <file> --firmware <library>`, with each
#       PARAMS entry as a --param and RUN_ARGS (--duration, --seed, --start-offset ...) added. FIRMWARE
#       names a library target (such as one tickbench_add_firmware() made), or source files, which
#       are then built into the target <name>_firmware. The test passes when the run's exit code is
#       0 and EXPECT is pass (the default), or 1 (a check failed) and EXPECT is fail; exit codes 2
#       (bad input), 3 (firmware failure), 4 (internal error) and 5 (watchdog reset) always fail
#       it. The outputs go to <current binary dir>/tickbench/<name>.

include_guard(GLOBAL)

set(_tickbench_functions_dir "${CMAKE_CURRENT_LIST_DIR}")

function(tickbench_add_firmware target)
  if(ARGC LESS 2)
    message(FATAL_ERROR "tickbench_add_firmware(${target}): no source files given")
  endif()
  add_library(${target} MODULE ${ARGN})
  target_link_libraries(${target} PRIVATE tickbench::firmware_api)
  set_target_properties(${target} PROPERTIES
    C_VISIBILITY_PRESET default
    CXX_VISIBILITY_PRESET default)
  # Tickbench's own tree: firmware is never built with its sanitizer flags (cmake/tickbench_warnings.cmake).
  if(COMMAND tickbench_firmware)
    tickbench_firmware(${target})
  endif()
endfunction()

function(tickbench_add_scenario_test)
  cmake_parse_arguments(PARSE_ARGV 0 arg "" "NAME;SCENARIO;EXPECT" "FIRMWARE;PARAMS;RUN_ARGS")
  if(arg_UNPARSED_ARGUMENTS)
    message(FATAL_ERROR "tickbench_add_scenario_test: unexpected arguments ${arg_UNPARSED_ARGUMENTS}; "
      "accepted: NAME, SCENARIO, FIRMWARE, PARAMS, EXPECT, RUN_ARGS")
  endif()
  foreach(required NAME SCENARIO FIRMWARE)
    if(NOT arg_${required})
      message(FATAL_ERROR "tickbench_add_scenario_test: ${required} is required")
    endif()
  endforeach()
  if(NOT arg_EXPECT)
    set(arg_EXPECT pass)
  endif()
  if(NOT arg_EXPECT MATCHES "^(pass|fail)$")
    message(FATAL_ERROR "tickbench_add_scenario_test(${arg_NAME}): EXPECT ${arg_EXPECT}; expected pass or fail")
  endif()
  if(NOT TARGET tickbench::tickbench)
    message(FATAL_ERROR "tickbench_add_scenario_test(${arg_NAME}): no target tickbench::tickbench; "
      "call find_package(tickbench CONFIG) first")
  endif()
  list(LENGTH arg_FIRMWARE n)
  if(n EQUAL 1 AND TARGET ${arg_FIRMWARE})
    set(firmware ${arg_FIRMWARE})
  else()
    string(MAKE_C_IDENTIFIER "${arg_NAME}_firmware" firmware)
    tickbench_add_firmware(${firmware} ${arg_FIRMWARE})
  endif()
  get_filename_component(scenario "${arg_SCENARIO}" ABSOLUTE)
  set(run_args run "${scenario}" --firmware "$<TARGET_FILE:${firmware}>"
    --out "${CMAKE_CURRENT_BINARY_DIR}/tickbench/${arg_NAME}")
  foreach(p IN LISTS arg_PARAMS)
    list(APPEND run_args --param "${p}")
  endforeach()
  list(APPEND run_args ${arg_RUN_ARGS})
  # The script receives the arguments as one "|"-separated text.
  string(REPLACE ";" "|" run_args "${run_args}")
  add_test(NAME ${arg_NAME}
    COMMAND ${CMAKE_COMMAND} -DTICKBENCH=$<TARGET_FILE:tickbench::tickbench> "-DARGS=${run_args}"
      -DEXPECT=${arg_EXPECT} -P "${_tickbench_functions_dir}/tickbench_scenario_test.cmake")
endfunction()
