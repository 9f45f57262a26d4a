# One helper sets the project's warnings on each target it builds.
function(tickbench_warnings target)
  target_compile_options(${target} PRIVATE -Wall -Wextra -Wpedantic -Wshadow
    $<$<COMPILE_LANGUAGE:CXX>:-Wnon-virtual-dtor>)
  if(TICKBENCH_WERROR)
    target_compile_options(${target} PRIVATE -Werror)
  endif()
endfunction()

# Firmware under test is the user's code, built as they build it: never instrumented by our
# sanitizer build (its crashes are what the harness reports, not what a sanitizer stops).
function(tickbench_firmware target)
  if(TICKBENCH_SANITIZE)
    target_compile_options(${target} PRIVATE -fno-sanitize=all)
  endif()
endfunction()

# Test sources that crash on purpose (a null write, a division by zero) to check crash reports:
# the undefined-behaviour sanitizer would stop them first. Call from the folder that builds them.
function(tickbench_crashes_on_purpose)
  if(TICKBENCH_SANITIZE)
    set_source_files_properties(${ARGN} PROPERTIES COMPILE_OPTIONS -fno-sanitize=undefined)
  endif()
endfunction()
