# cmake -DCXX=... -DSOURCE=file.cpp -DINCLUDES=a;b -P check_compile_fail.cmake
# Passes when SOURCE fails to compile with a message matching its "// expect:"
# line, and compiles cleanly with -DTAUFORGE_CONTROL.
file(STRINGS ${SOURCE} _first LIMIT_COUNT 1)
string(REGEX REPLACE "^// expect: " "" EXPECT "${_first}")
if(EXPECT STREQUAL _first)
  message(FATAL_ERROR "${SOURCE}: first line must be '// expect: REGEX'")
endif()
set(_inc_flags "")
foreach(dir IN LISTS INCLUDES)
  if(dir)
    list(APPEND _inc_flags "-I${dir}")
  endif()
endforeach()
set(_flags -std=c++20 -fsyntax-only ${_inc_flags})

execute_process(COMMAND ${CXX} ${_flags} -DTAUFORGE_CONTROL ${SOURCE}
                RESULT_VARIABLE rc_control ERROR_VARIABLE err_control)
if(NOT rc_control EQUAL 0)
  message(FATAL_ERROR "control build of ${SOURCE} failed, so the check proves nothing:\n${err_control}")
endif()

execute_process(COMMAND ${CXX} ${_flags} ${SOURCE}
                RESULT_VARIABLE rc_fail ERROR_VARIABLE err_fail)
if(rc_fail EQUAL 0)
  message(FATAL_ERROR "${SOURCE} compiled, but it must be rejected")
endif()
if(NOT err_fail MATCHES "${EXPECT}")
  message(FATAL_ERROR "${SOURCE} was rejected, but not for the expected reason '${EXPECT}':\n${err_fail}")
endif()
message(STATUS "rejected as expected: ${EXPECT}")
