cmake_minimum_required(VERSION 3.21)
# The C header hand-off: tauforge writes the header, a C compiler builds a small C
# program against it, the program checks the constants (test_header.c).
#   -DEXE=tauforge -DCC=cc -DSOURCE=test_header.c -DWORK=dir
file(MAKE_DIRECTORY ${WORK})
execute_process(COMMAND ${EXE} check timer_monostable --part R=100k,1% --part C=10n,10% --samples 0
                        --c-header ${WORK}/one_shot_timing.h --c-prefix ONE_SHOT
                RESULT_VARIABLE rc OUTPUT_QUIET ERROR_VARIABLE err)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "tauforge check --c-header exited with ${rc}: ${err}")
endif()
execute_process(COMMAND ${CC} -std=c99 -Wall -Wextra -pedantic -Werror -I${WORK} ${SOURCE} -o ${WORK}/test_header -lm
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT rc EQUAL 0)
  file(READ ${WORK}/one_shot_timing.h header)
  message(FATAL_ERROR "the generated header does not compile as C99:\n${out}${err}\n${header}")
endif()
execute_process(COMMAND ${WORK}/test_header RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "the header's constants are wrong:\n${out}${err}")
endif()
message(STATUS "${out}")
