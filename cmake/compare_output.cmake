# cmake -DEXE=program -DEXPECTED=file -P compare_output.cmake
# Runs EXE and fails unless it exits 0 and its standard output equals EXPECTED.
execute_process(COMMAND ${EXE} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
file(READ ${EXPECTED} expected)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "${EXE} exited with ${rc}:\n${err}")
endif()
if(NOT out STREQUAL expected)
  message(FATAL_ERROR "${EXE} printed\n${out}\nbut README.md shows\n${expected}")
endif()
message(STATUS "output matches README.md")
