# cmake -DBUILD_DIR=.. -DWORK_DIR=.. -DPYTHON=.. -DMODULE_DIR=lib/python3.11/dist-packages
#       -DPREFIX=/usr/local -P check_python_install.cmake
# Installs the build to a temporary prefix and imports the module from
# <prefix>/<MODULE_DIR>; then checks that PREFIX/MODULE_DIR, where an install to the
# configured prefix puts it, is on the interpreter's own path (for /usr/local and /usr).
file(REMOVE_RECURSE ${WORK_DIR})
execute_process(COMMAND ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${WORK_DIR}/prefix
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE out)
if(NOT rc EQUAL 0)
  message(FATAL_ERROR "install to a temporary prefix failed:\n${out}")
endif()
set(dir ${WORK_DIR}/prefix/${MODULE_DIR})
execute_process(COMMAND ${CMAKE_COMMAND} -E env PYTHONPATH=${dir}
                ${PYTHON} -c "import tauforge; print(tauforge.__file__); print(tauforge.crossing_time(0, 5, 2.5, 1.0))"
                RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
if(NOT rc EQUAL 0 OR NOT out MATCHES "^${dir}/tauforge[^\n]*\\.so\n0\\.693147")
  message(FATAL_ERROR "the installed module does not import from ${dir}:\n${out}${err}")
endif()
if(PREFIX MATCHES "^/usr(/local)?$" AND NOT IS_ABSOLUTE "${MODULE_DIR}")
  execute_process(COMMAND ${PYTHON} -c "import sys; print('${PREFIX}/${MODULE_DIR}' in sys.path)"
                  OUTPUT_VARIABLE on_path OUTPUT_STRIP_TRAILING_WHITESPACE)
  if(NOT on_path STREQUAL "True")
    message(FATAL_ERROR "${PREFIX}/${MODULE_DIR} is not on ${PYTHON}'s path (sys.path); "
                        "set TAUFORGE_PYTHON_INSTALL_DIR to a directory it reads")
  endif()
endif()
message(STATUS "installed module: ok (${dir})")
