# `cmake --install build --prefix PREFIX` installs the public headers, the static libraries,
# the deltag program and a CMake package, so another project writes
#   find_package(deltag CONFIG REQUIRED)
#   target_link_libraries(app PRIVATE deltag::deltag)
# tests/consumer is such a project; tests/CMakeLists.txt builds it against an install.
include(CMakePackageConfigHelpers)

# deltag_core is deltag::deltag, installed and within a parent project alike.
set_target_properties(deltag_core PROPERTIES EXPORT_NAME deltag)
add_library(deltag::deltag ALIAS deltag_core)
# Every layer library (deltag_layer in CMakeLists.txt records them), so a new layer is
# installed and exported without a change here.
get_property(deltag_layers GLOBAL PROPERTY DELTAG_LAYERS)

set(DELTAG_INSTALL_CMAKEDIR ${CMAKE_INSTALL_LIBDIR}/cmake/deltag)

install(DIRECTORY include/deltag DESTINATION ${CMAKE_INSTALL_INCLUDEDIR})
install(TARGETS ${deltag_layers} deltag_core
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
