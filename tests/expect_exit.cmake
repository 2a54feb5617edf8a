# Runs a command and checks its exit code, its error output, and that a failed run wrote nothing.
#   cmake -DCOMMAND="prog;arg;..." -DEXPECT_CODE=1 -DEXPECT_STDERR=regex -DOUT_DIR=dir -P expect_exit.cmake
if(DEFINED OUT_DIR)
  file(REMOVE_RECURSE "${OUT_DIR}")
endif()
execute_process(COMMAND ${COMMAND} RESULT_VARIABLE code OUTPUT_VARIABLE out ERROR_VARIABLE err TIMEOUT 400)  # generous: the suite must pass on a loaded machine
if(NOT code STREQUAL "${EXPECT_CODE}")
  message(FATAL_ERROR "exit code ${code}, expected ${EXPECT_CODE}\nstdout:\n${out}\nstderr:\n${err}")
endif()
if(DEFINED EXPECT_STDERR AND NOT err MATCHES "${EXPECT_STDERR}")
  message(FATAL_ERROR "stderr does not match '${EXPECT_STDERR}':\n${err}")
endif()
if(DEFINED EXPECT_STDOUT AND NOT out MATCHES "${EXPECT_STDOUT}")
  message(FATAL_ERROR "stdout does not match '${EXPECT_STDOUT}':\n${out}")
endif()
if(DEFINED OUT_DIR AND NOT EXPECT_CODE STREQUAL "0" AND EXISTS "${OUT_DIR}")
  message(FATAL_ERROR "a failed run left ${OUT_DIR} behind")
endif()
message(STATUS "${out}")
