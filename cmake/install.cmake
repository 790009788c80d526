# The library for other programs: `cmake --install build [--prefix DIR]` puts
#   include/overshoot/...            the public headers (src/ minus the CLI)
#   lib/libovershoot.a, .so          static and shared library
#   lib/cmake/overshoot/             find_package(overshoot) -> overshoot::overshoot
#                                    (shared) and overshoot::overshoot_static
#   lib/pkgconfig/overshoot.pc       pkg-config --cflags --libs overshoot
# and the overshoot program. examples/consumer builds against the installed copy
# (CTest `install.consumer`).
include(GNUInstallDirs)
include(CMakePackageConfigHelpers)

# The static archive under its public name; the shared library holds the whole
# archive, so nothing is compiled twice. Its dependencies stay private: a
# program linking the shared library needs none of them.
set_target_properties(overshoot_lib PROPERTIES OUTPUT_NAME overshoot)
file(WRITE ${CMAKE_CURRENT_BINARY_DIR}/overshoot_shared.cpp "// The shared library is the whole static archive.\n")
add_library(overshoot_shared SHARED ${CMAKE_CURRENT_BINARY_DIR}/overshoot_shared.cpp)
target_link_libraries(overshoot_shared PRIVATE "$<LINK_LIBRARY:WHOLE_ARCHIVE,overshoot_lib>")
set_target_properties(overshoot_shared PROPERTIES OUTPUT_NAME overshoot
  VERSION ${PROJECT_VERSION} SOVERSION ${PROJECT_VERSION_MAJOR}.${PROJECT_VERSION_MINOR})

install(TARGETS overshoot RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
install(TARGETS overshoot_lib ARCHIVE DESTINATION ${CMAKE_INSTALL_LIBDIR})
install(TARGETS overshoot_shared LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR})
# Every header but the command line's, in the layout of src/ (they include each
# other as "core/board.hpp"). Headers that need a dependency's headers say so
# in docs/library.md; overshoot/overshoot.hpp needs only the standard library.
install(DIRECTORY src/ DESTINATION ${CMAKE_INSTALL_INCLUDEDIR}/overshoot
  FILES_MATCHING PATTERN "*.hpp" PATTERN "cli" EXCLUDE PATTERN "python" EXCLUDE)

# What a program linking the static archive needs besides it.
set(OVERSHOOT_STATIC_LIBS gmpxx gmp glpk fmt tomlplusplus)
set(OVERSHOOT_WITH_MPI OFF)
if(TARGET MPI::MPI_CXX)
  set(OVERSHOOT_WITH_MPI ON)
endif()
configure_package_config_file(cmake/overshootConfig.cmake.in
  ${CMAKE_CURRENT_BINARY_DIR}/overshootConfig.cmake
  INSTALL_DESTINATION ${CMAKE_INSTALL_LIBDIR}/cmake/overshoot
  PATH_VARS CMAKE_INSTALL_INCLUDEDIR CMAKE_INSTALL_LIBDIR)
write_basic_package_version_file(${CMAKE_CURRENT_BINARY_DIR}/overshootConfigVersion.cmake
  COMPATIBILITY SameMinorVersion)
install(FILES ${CMAKE_CURRENT_BINARY_DIR}/overshootConfig.cmake
  ${CMAKE_CURRENT_BINARY_DIR}/overshootConfigVersion.cmake
  DESTINATION ${CMAKE_INSTALL_LIBDIR}/cmake/overshoot)

list(JOIN OVERSHOOT_STATIC_LIBS " -l" OVERSHOOT_PC_PRIVATE)
set(OVERSHOOT_PC_PRIVATE "-l${OVERSHOOT_PC_PRIVATE} -pthread")
# Relocatable: the prefix is found from the .pc file's own directory.
file(RELATIVE_PATH OVERSHOOT_PC_UP "/p/${CMAKE_INSTALL_LIBDIR}/pkgconfig" "/p")
configure_file(cmake/overshoot.pc.in ${CMAKE_CURRENT_BINARY_DIR}/overshoot.pc @ONLY)
install(FILES ${CMAKE_CURRENT_BINARY_DIR}/overshoot.pc DESTINATION ${CMAKE_INSTALL_LIBDIR}/pkgconfig)
