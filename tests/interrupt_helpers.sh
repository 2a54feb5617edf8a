# shellcheck shell=bash
# Shared by the interrupt tests (sourced).

# start_interrupt_test HEATBEAD CASE OUT_DIR [ARG ...]: the set-up every interrupt test starts with.
# Names the arguments ($heatbead, $case_file, $out, and the rest in the array extra_args), removes
# OUT_DIR so nothing of an earlier run counts, and gives heatbead's stderr a file, $err, removed
# when the script ends.
start_interrupt_test() {
  # shellcheck disable=SC2034  # heatbead, case_file and extra_args are the sourcing script's
  heatbead=$1 case_file=$2 out=$3 extra_args=("${@:4}")
  rm -rf "$out"
  err=$(mktemp)
  trap 'rm -f "$err"' EXIT
}

# fail MESSAGE: ends the test with the message and heatbead's stderr.
fail() {
  echo "FAIL: $*"
  echo "stderr of heatbead:"
  cat "$err"
  exit 1
}

# interrupt_and_expect_2 PID: sends SIGINT, waits up to 30 s for the process to end, and fails
# unless it ended with exit code 2 and said "interrupted" on the stderr file in $err.
interrupt_and_expect_2() {
  local pid=$1
  kill -INT "$pid"
  for _ in $(seq 300); do
    kill -0 "$pid" 2>/dev/null || break
    sleep 0.1
  done
  kill -0 "$pid" 2>/dev/null && { kill -KILL "$pid"; fail "heatbead still running 30 s after SIGINT"; }
  wait "$pid"
  local code=$?
  [[ $code -eq 2 ]] || fail "exit code $code, expected 2"
  grep -q "interrupted" "$err" || fail "stderr does not say 'interrupted'"
}
