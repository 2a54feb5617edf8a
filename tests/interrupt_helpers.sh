# Shared by the interrupt tests (sourced): the script's own `fail` reports problems.
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
