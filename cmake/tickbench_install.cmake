# Installing Tickbench for other projects (docs/package.md): `cmake --install build --prefix P`
# puts the command, the libraries the firmware fixture links, the public headers, the shipped
# layouts, a CMake package (find_package(tickbench CONFIG)) and a pkg-config file for C firmware
# under P. Included at the end of the top CMakeLists.txt, once every target exists.

include(GNUInstallDirs)
include(CMakePackageConfigHelpers)

set(tickbench_cmake_dir ${CMAKE_INSTALL_LIBDIR}/cmake/tickbench)
set(tickbench_header_dir ${CMAKE_INSTALL_INCLUDEDIR}/tickbench)
set(tickbench_data_dir ${CMAKE_INSTALL_DATADIR}/tickbench)

# The libraries, exported as tickbench::<name without the tickbench_ prefix>. They are static: a
# static library's private dependencies (toml++, Zydis) become link-only entries of the export,
# which the package's config file finds again.
set(tickbench_exported
  tickbench_sim tickbench_scenario tickbench_models tickbench_trap tickbench_harness
  tickbench_runner tickbench_firmware_api)
set(tickbench_has_fixture OFF)
if(TARGET tickbench_firmware_fixture)
  list(APPEND tickbench_exported tickbench_harness_testing tickbench_firmware_fixture)
  set(tickbench_has_fixture ON)
endif()
foreach(target IN LISTS tickbench_exported)
  string(REGEX REPLACE "^tickbench_" "" name ${target})
  set_target_properties(${target} PROPERTIES EXPORT_NAME ${name})
endforeach()
set_target_properties(tickbench PROPERTIES EXPORT_NAME tickbench)

install(TARGETS ${tickbench_exported} tickbench
  EXPORT tickbench-targets
  RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR}
  LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR}
  ARCHIVE DESTINATION ${CMAKE_INSTALL_LIBDIR})
install(EXPORT tickbench-targets
  NAMESPACE tickbench::
  FILE tickbench-targets.cmake
  DESTINATION ${tickbench_cmake_dir})

# Headers: <tickbench/firmware.h> under include/, and the C++ headers of the layers the fixture
# builds on under include/tickbench/, where their own includes ("harness/cpu.h") find each other.
install(FILES harness/include/tickbench/firmware.h DESTINATION ${tickbench_header_dir})
install(FILES examples/parts/demo_timers.h DESTINATION ${tickbench_header_dir}/parts)
install(DIRECTORY sim DESTINATION ${tickbench_header_dir} FILES_MATCHING PATTERN "*.h")
install(DIRECTORY models DESTINATION ${tickbench_header_dir}
  FILES_MATCHING PATTERN "*.h"
  PATTERN "reference" EXCLUDE
  PATTERN "layouts" EXCLUDE)
install(DIRECTORY harness DESTINATION ${tickbench_header_dir}
  FILES_MATCHING PATTERN "*.h"
  PATTERN "cli" EXCLUDE
  PATTERN "include" EXCLUDE)

# The shipped register layouts and the demo part. Scenarios name layout files by path, relative to
# the scenario file; the fixture finds these by name.
install(DIRECTORY models/layouts/ DESTINATION ${tickbench_data_dir}/layouts
  FILES_MATCHING PATTERN "*.toml")
install(FILES examples/parts/demo_part.toml DESTINATION ${tickbench_data_dir}/parts)

# The CMake package.
set(TICKBENCH_HAS_FIXTURE ${tickbench_has_fixture})
configure_package_config_file(cmake/tickbench-config.cmake.in
  ${PROJECT_BINARY_DIR}/package/tickbench-config.cmake
  INSTALL_DESTINATION ${tickbench_cmake_dir}
  PATH_VARS tickbench_data_dir)
write_basic_package_version_file(${PROJECT_BINARY_DIR}/package/tickbench-config-version.cmake
  VERSION ${PROJECT_VERSION}
  COMPATIBILITY SameMinorVersion)
install(FILES
  ${PROJECT_BINARY_DIR}/package/tickbench-config.cmake
  ${PROJECT_BINARY_DIR}/package/tickbench-config-version.cmake
  cmake/TickbenchFunctions.cmake
  cmake/tickbench_scenario_test.cmake
  DESTINATION ${tickbench_cmake_dir})

# pkg-config for C firmware that needs only the header. Its prefix is found from the file's own
# place (${pcfiledir}), so the install may go to any --prefix.
file(RELATIVE_PATH tickbench_pc_to_prefix
  /prefix/${CMAKE_INSTALL_LIBDIR}/pkgconfig /prefix)
string(REGEX REPLACE "/$" "" tickbench_pc_to_prefix "${tickbench_pc_to_prefix}")
configure_file(cmake/tickbench-firmware.pc.in ${PROJECT_BINARY_DIR}/package/tickbench-firmware.pc
  @ONLY)
install(FILES ${PROJECT_BINARY_DIR}/package/tickbench-firmware.pc
  DESTINATION ${CMAKE_INSTALL_LIBDIR}/pkgconfig)
