# Included by tests/CMakeLists.txt.

# The installed package: a project of its own (tests/consumer) built against `cmake --install`
# into a temporary prefix. Not with the fuzz build, whose instrumented libraries need libFuzzer.
if(NOT DELTAG_BUILD_FUZZERS)
  set(consumer_link_flags "")
  if(DELTAG_SANITIZE)
    set(consumer_link_flags "-fsanitize=${DELTAG_SANITIZE}")
  endif()
  add_test(NAME test_package_consumer
           COMMAND ${CMAKE_COMMAND} -DBUILD_DIR=${PROJECT_BINARY_DIR} -DSOURCE_DIR=${CMAKE_CURRENT_SOURCE_DIR}/consumer
                   -DWORK_DIR=${CMAKE_CURRENT_BINARY_DIR}/consumer -DCXX_COMPILER=${CMAKE_CXX_COMPILER}
                   -DBUILD_TYPE=${CMAKE_BUILD_TYPE} -DLINK_FLAGS=${consumer_link_flags}
                   -P ${CMAKE_CURRENT_SOURCE_DIR}/consumer/run.cmake)
endif()

# The Python module's tests (tests/python), with the interpreter the module was built for.
if(TARGET deltag_python)
  add_test(NAME test_python
           COMMAND ${Python3_EXECUTABLE} -m pytest -q -p no:cacheprovider ${CMAKE_CURRENT_SOURCE_DIR}/python)
  set_tests_properties(test_python PROPERTIES ENVIRONMENT "PYTHONPATH=${PROJECT_BINARY_DIR}/python;PYTHONDONTWRITEBYTECODE=1;DELTAG_BINARY=$<TARGET_FILE:deltag>")
  add_dependencies(deltag_python deltag)  # the tests compare with the command
endif()
