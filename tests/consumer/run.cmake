# Run by ctest (tests/CMakeLists.txt): installs the build into a fresh prefix, then configures,
# builds and runs tests/consumer against that install alone.
# -D BUILD_DIR= SOURCE_DIR= WORK_DIR= CXX_COMPILER= BUILD_TYPE= [LINK_FLAGS=]
foreach(var BUILD_DIR SOURCE_DIR WORK_DIR CXX_COMPILER BUILD_TYPE)
  if(NOT DEFINED ${var})
    message(FATAL_ERROR "run.cmake: -D${var}= is required")
  endif()
endforeach()

function(step what)
  execute_process(COMMAND ${ARGN} RESULT_VARIABLE rc OUTPUT_VARIABLE out ERROR_VARIABLE err)
  if(NOT rc EQUAL 0)
    message(FATAL_ERROR "consumer test: ${what} failed (${rc})\n${out}\n${err}")
  endif()
  message(STATUS "${what}: done\n${out}")
endfunction()

file(REMOVE_RECURSE ${WORK_DIR})
step("install deltag" ${CMAKE_COMMAND} --install ${BUILD_DIR} --prefix ${WORK_DIR}/prefix)
step("configure the consumer" ${CMAKE_COMMAND} -S ${SOURCE_DIR} -B ${WORK_DIR}/build
     -DCMAKE_PREFIX_PATH=${WORK_DIR}/prefix -DCMAKE_CXX_COMPILER=${CXX_COMPILER}
     -DCMAKE_BUILD_TYPE=${BUILD_TYPE} "-DCMAKE_EXE_LINKER_FLAGS=${LINK_FLAGS}")
step("build the consumer" ${CMAKE_COMMAND} --build ${WORK_DIR}/build)
step("run the consumer" ${WORK_DIR}/build/consumer)
