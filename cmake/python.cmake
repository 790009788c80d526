# The Python module `import overshoot` (pybind11, Debian's pybind11-dev): the
# package is assembled in build/python/overshoot, so that
#   PYTHONPATH=build/python python3 -c "import overshoot"
# works after the build; `cmake --install` puts it in OVERSHOOT_PYTHON_INSTALL_DIR.
# Off under the sanitizers: a module built with them cannot load into an
# uninstrumented interpreter.
option(OVERSHOOT_PYTHON "Build the Python module when pybind11 is found" ON)
if(NOT OVERSHOOT_PYTHON OR OVERSHOOT_SANITIZE)
  message(STATUS "overshoot: Python module: off")
  return()
endif()
# Debian's interpreter, whose packages (NumPy, pytest) the tests use, before
# any other python3 on the PATH.
if(NOT DEFINED Python3_EXECUTABLE AND EXISTS /usr/bin/python3)
  set(Python3_EXECUTABLE /usr/bin/python3 CACHE FILEPATH "Python interpreter for the module and its tests")
endif()
find_package(Python3 COMPONENTS Interpreter Development.Module)
find_package(pybind11 2.6 CONFIG QUIET)
if(NOT Python3_FOUND OR NOT pybind11_FOUND)
  message(STATUS "overshoot: Python module: off (needs python3-dev and pybind11-dev)")
  return()
endif()
message(STATUS "overshoot: Python module: on (Python ${Python3_VERSION}, pybind11 ${pybind11_VERSION})")

set(OVERSHOOT_PYTHON_DIR ${CMAKE_BINARY_DIR}/python/overshoot)
file(GLOB OVERSHOOT_PYTHON_SOURCES CONFIGURE_DEPENDS ${PROJECT_SOURCE_DIR}/src/python/*.cpp)
pybind11_add_module(overshoot_python MODULE ${OVERSHOOT_PYTHON_SOURCES})
target_compile_options(overshoot_python PRIVATE ${OVERSHOOT_WARNINGS})
target_link_libraries(overshoot_python PRIVATE overshoot_lib)
set_target_properties(overshoot_python PROPERTIES OUTPUT_NAME _core
  LIBRARY_OUTPUT_DIRECTORY ${OVERSHOOT_PYTHON_DIR})
# The pure-Python part of the package and its type stub, copied beside the module.
file(GLOB OVERSHOOT_PYTHON_FILES CONFIGURE_DEPENDS
  ${PROJECT_SOURCE_DIR}/src/python/overshoot/*.py ${PROJECT_SOURCE_DIR}/src/python/overshoot/*.pyi
  ${PROJECT_SOURCE_DIR}/src/python/overshoot/py.typed)
foreach(f ${OVERSHOOT_PYTHON_FILES})
  get_filename_component(name ${f} NAME)
  configure_file(${f} ${OVERSHOOT_PYTHON_DIR}/${name} COPYONLY)
endforeach()

set(OVERSHOOT_PYTHON_INSTALL_DIR
  "lib/python${Python3_VERSION_MAJOR}.${Python3_VERSION_MINOR}/dist-packages"
  CACHE STRING "Where cmake --install puts the overshoot package (relative to the prefix, or absolute)")
install(TARGETS overshoot_python LIBRARY DESTINATION ${OVERSHOOT_PYTHON_INSTALL_DIR}/overshoot)
install(FILES ${OVERSHOOT_PYTHON_FILES} DESTINATION ${OVERSHOOT_PYTHON_INSTALL_DIR}/overshoot)
