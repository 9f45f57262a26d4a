# The layer rule (docs/architecture.md, "Layers"): sim -> models -> harness -> command, and no
# include runs back up. sim/ includes nothing from models/ or harness/; models/ nothing from
# harness/; the firmware side (harness/*, harness/trap/) nothing from the runner (harness/run/) or
# the command (harness/cli/); the runner nothing from the command.
# Run as: cmake -DROOT=<source dir> -P check_layers.cmake
cmake_minimum_required(VERSION 3.25)
set(violations "")
# check_layer(FOLDER REGEX [FLAT]): no source under FOLDER (or directly in it, with FLAT) includes a
# path matching REGEX.
function(check_layer folder forbidden_regex)
  set(glob GLOB_RECURSE)
  if(ARGV2 STREQUAL "FLAT")
    set(glob GLOB)
  endif()
  file(${glob} sources "${ROOT}/${folder}/*.h" "${ROOT}/${folder}/*.cpp" "${ROOT}/${folder}/*.c")
  foreach(src IN LISTS sources)
    file(STRINGS "${src}" lines REGEX "^[ \t]*#[ \t]*include[ \t]*\"(${forbidden_regex})")
    foreach(line IN LISTS lines)
      file(RELATIVE_PATH rel "${ROOT}" "${src}")
      string(STRIP "${line}" line)
      string(APPEND violations "  ${rel}: ${line}\n")
    endforeach()
  endforeach()
  set(violations "${violations}" PARENT_SCOPE)
endfunction()
check_layer(sim "models/|harness/")
check_layer(models "harness/")
check_layer(harness "harness/run/|harness/cli/" FLAT)
check_layer(harness/testing "harness/run/|harness/cli/")
check_layer(harness/run "harness/cli/")
check_layer(harness/trap "harness/run/|harness/cli/")
if(violations)
  message(FATAL_ERROR "includes that run up the layers (sim -> models -> harness -> command):\n${violations}")
endif()
message(STATUS "layers: no include runs back up")
