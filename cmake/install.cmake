# `cmake --install build --prefix PREFIX` installs the public headers, the static libraries,
# the deltag program and a CMake package, so another project writes
#   find_package(deltag CONFIG REQUIRED)
#   target_link_libraries(app PRIVATE deltag::deltag)
# tests/consumer is such a project; tests/CMakeLists.txt builds it against an install.
include(CMakePackageConfigHelpers)

set(DELTAG_INSTALL_CMAKEDIR ${CMAKE_INSTALL_LIBDIR}/cmake/deltag)

install(DIRECTORY include/deltag DESTINATION ${CMAKE_INSTALL_INCLUDEDIR})
install(TARGETS deltag_chem deltag_water deltag_thermo deltag_activity deltag_equilibrium deltag_process
                deltag_electro deltag_io deltag_core
        EXPORT deltagTargets
        ARCHIVE DESTINATION ${CMAKE_INSTALL_LIBDIR}
        LIBRARY DESTINATION ${CMAKE_INSTALL_LIBDIR}
        INCLUDES DESTINATION ${CMAKE_INSTALL_INCLUDEDIR})
install(TARGETS deltag RUNTIME DESTINATION ${CMAKE_INSTALL_BINDIR})
install(EXPORT deltagTargets NAMESPACE deltag:: DESTINATION ${DELTAG_INSTALL_CMAKEDIR})

configure_package_config_file(${CMAKE_CURRENT_LIST_DIR}/deltagConfig.cmake.in
                              ${CMAKE_CURRENT_BINARY_DIR}/deltagConfig.cmake
                              INSTALL_DESTINATION ${DELTAG_INSTALL_CMAKEDIR})
write_basic_package_version_file(${CMAKE_CURRENT_BINARY_DIR}/deltagConfigVersion.cmake
                                 COMPATIBILITY SameMinorVersion)
install(FILES ${CMAKE_CURRENT_BINARY_DIR}/deltagConfig.cmake ${CMAKE_CURRENT_BINARY_DIR}/deltagConfigVersion.cmake
        DESTINATION ${DELTAG_INSTALL_CMAKEDIR})
