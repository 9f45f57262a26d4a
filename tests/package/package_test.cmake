# The package test (tests/package/CMakeLists.txt). Variables: BUILD_DIR (this tree's build),
# CONSUMER (the consumer project's source), WORK (a folder of the test's own, emptied first),
# GENERATOR, C_COMPILER, CXX_COMPILER, LAUNCHER (a compiler launcher or empty).
cmake_minimum_required(VERSION 3.25)

# Runs a command; stops with its output when its exit code is not 0.
function(step what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT code EQUAL 0)
    message(FATAL_ERROR "${what}: exit code ${code}\ncommand: ${ARGN}\nstdout:\n${out}\nstderr:\n${err}")
  endif()
  set(step_output "${out}" PARENT_SCOPE)
endfunction()

file(REMOVE_RECURSE "${WORK}")
set(prefix "${WORK}/prefix")
step("cmake --install" ${CMAKE_COMMAND} --install "${BUILD_DIR}" --prefix "${prefix}")

# What docs/package.md says the installation holds.
include(GNUInstallDirs)
foreach(f bin/tickbench include/tickbench/firmware.h include/tickbench/parts/demo_timers.h
    include/tickbench/harness/testing/firmware_fixture.h include/tickbench/harness/cpu.h
    include/tickbench/sim/clock_domain.h share/tickbench/layouts/timer16_quad.toml
    share/tickbench/parts/demo_part.toml)
  if(NOT EXISTS "${prefix}/${f}")
    message(FATAL_ERROR "the installation lacks ${f}")
  endif()
endforeach()
file(GLOB_RECURSE config "${prefix}/*/tickbench-config.cmake")
file(GLOB_RECURSE version "${prefix}/*/tickbench-config-version.cmake")
file(GLOB_RECURSE pc "${prefix}/*/tickbench-firmware.pc")
if(NOT config OR NOT version OR NOT pc)
  message(FATAL_ERROR "the installation lacks its CMake package or pkg-config file:\n${config}\n${version}\n${pc}")
endif()
# Nothing of the test side: the reference model and the command's sources stay in the tree.
foreach(f include/tickbench/models/reference include/tickbench/harness/cli)
  if(EXISTS "${prefix}/${f}")
    message(FATAL_ERROR "the installation holds ${f}")
  endif()
endforeach()

# The consumer: configured with the installation alone on CMAKE_PREFIX_PATH, built, tested.
set(build "${WORK}/consumer")
set(configure_args -S "${CONSUMER}" -B "${build}" -G "${GENERATOR}" "-DCMAKE_PREFIX_PATH=${prefix}"
  "-DCMAKE_C_COMPILER=${C_COMPILER}" "-DCMAKE_CXX_COMPILER=${CXX_COMPILER}")
if(LAUNCHER)
  list(APPEND configure_args "-DCMAKE_C_COMPILER_LAUNCHER=${LAUNCHER}"
    "-DCMAKE_CXX_COMPILER_LAUNCHER=${LAUNCHER}")
endif()
step("configuring the consumer" ${CMAKE_COMMAND} ${configure_args})
step("building the consumer" ${CMAKE_COMMAND} --build "${build}" -j 2)
step("the consumer's tests" ${CMAKE_CTEST_COMMAND} --test-dir "${build}" --output-on-failure)
# ctest's closing line: every test the consumer registers ran and passed.
if(NOT step_output MATCHES "100% tests passed, 0 tests failed out of 3\n")
  message(FATAL_ERROR "the consumer's ctest did not run and pass its 3 tests:\n${step_output}")
endif()
message(STATUS "consumer:\n${step_output}")

# C firmware that needs only the header, compiled with pkg-config's flags, then run by the
# installed command on the scenario the consumer configured.
find_program(PKG_CONFIG pkg-config)
if(NOT PKG_CONFIG)
  message(FATAL_ERROR "pkg-config not found: install the Debian package pkg-config")
endif()
get_filename_component(pc_dir "${pc}" DIRECTORY)
set(ENV{PKG_CONFIG_PATH} "${pc_dir}")
step("pkg-config --cflags tickbench-firmware" ${PKG_CONFIG} --cflags tickbench-firmware)
string(STRIP "${step_output}" cflags)
if(NOT cflags MATCHES "^-I.*include$")
  message(FATAL_ERROR "pkg-config --cflags tickbench-firmware gives \"${cflags}\", expected -I<prefix>/include")
endif()
separate_arguments(cflags UNIX_COMMAND "${cflags}")
step("compiling firmware with pkg-config's flags" ${C_COMPILER} ${cflags} -fPIC -shared
  "${CONSUMER}/pwm_firmware.c" -o "${WORK}/libpwm_pc.so")
step("the installed tickbench running it" "${prefix}/bin/tickbench" run "${build}/pwm.toml"
  --firmware "${WORK}/libpwm_pc.so" --out "${WORK}/pc_run")
if(NOT step_output MATCHES "3 checks: 3 passed, 0 failed")
  message(FATAL_ERROR "the run of the pkg-config firmware did not pass its 3 checks (2 of the scenario, 1 of the firmware):\n${step_output}")
endif()
