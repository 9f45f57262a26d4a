# One helper sets the project's warnings on each target it builds.
function(tickbench_warnings target)
  target_compile_options(${target} PRIVATE -Wall -Wextra -Wpedantic -Wshadow
    $<$<COMPILE_LANGUAGE:CXX>:-Wnon-virtual-dtor>)
  if(TICKBENCH_WERROR)
    target_compile_options(${target} PRIVATE -Werror)
  endif()
endfunction()
