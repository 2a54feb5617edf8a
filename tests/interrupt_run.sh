#!/usr/bin/env bash
# Ctrl-C during a run: heatbead stops at the next step, exits 2, says so, and writes nothing.
#   bash interrupt_run.sh HEATBEAD CASE OUT_DIR
set -u
# shellcheck source=interrupt_helpers.sh
source "$(dirname "$0")/interrupt_helpers.sh"
start_interrupt_test "$@"

"$heatbead" run "$case_file" --out "$out" >/dev/null 2>"$err" &
pid=$!

# Wait until heatbead catches SIGINT (bit 2 of SigCgt in /proc/PID/status) before sending it: a
# background job of a script starts with SIGINT ignored, and on a busy machine the set-up before
# the handler can take longer than any fixed delay.
caught=0
for _ in $(seq 300); do
  kill -0 "$pid" 2>/dev/null || fail "heatbead ended before it was interrupted"
  mask=$(awk '/^SigCgt:/ { print $2 }' "/proc/$pid/status" 2>/dev/null)
  if [[ -n $mask ]] && (( 16#$mask & 2 )); then caught=1; break; fi
  sleep 0.1
done
((caught)) || { kill -KILL "$pid"; fail "heatbead did not install a SIGINT handler within 30 s"; }

sleep 1  # let it step for a while: the interrupt should land mid-run, not before the first step
interrupt_and_expect_2 "$pid"
grep -q "nothing was written" "$err" || fail "stderr does not say 'nothing was written'"
[[ ! -e $out/results.h5 ]] || fail "an interrupted run wrote $out/results.h5"
[[ ! -e $out ]] || fail "an interrupted run left $out behind"
cat "$err"
