#!/usr/bin/env bash
# Ctrl-C during a preheat search: heatbead stops the runs in flight, exits 2, says so, keeps the
# runs it finished in preheat_runs.csv (whole rows, header first) and writes no answer.
#   bash interrupt_preheat.sh HEATBEAD CASE OUT_DIR [--set key=value ...]
set -u
# shellcheck source=interrupt_helpers.sh
source "$(dirname "$0")/interrupt_helpers.sh"
start_interrupt_test "$@"

"$heatbead" preheat "$case_file" --out "$out" --jobs 2 --threads 1 "${extra_args[@]}" >/dev/null 2>"$err" &
pid=$!

# The first round (two runs) ends with preheat_runs.csv; interrupt during the second.
for _ in $(seq 1200); do
  kill -0 "$pid" 2>/dev/null || fail "heatbead ended before it was interrupted"
  [[ -s $out/preheat_runs.csv ]] && break
  sleep 0.1
done
[[ -s $out/preheat_runs.csv ]] || { kill -KILL "$pid"; fail "no round finished within 120 s"; }
sleep 0.5
interrupt_and_expect_2 "$pid"
[[ ! -e $out/preheat.json ]] || fail "an interrupted search wrote an answer ($out/preheat.json)"
[[ ! -e $out/preheat.html ]] || fail "an interrupted search wrote a report ($out/preheat.html)"
head -1 "$out/preheat_runs.csv" | grep -q '^preheat \[degC\],' || fail "preheat_runs.csv has no header"
rows=$(($(wc -l <"$out/preheat_runs.csv") - 1))
((rows >= 2)) || fail "preheat_runs.csv keeps $rows runs, expected the 2 of the first round"
fields=$(awk -F'"' '{ print NF }' "$out/preheat_runs.csv" | sort -u | tr '\n' ' ')
[[ $fields == "1 3 " ]] || fail "preheat_runs.csv has a broken row (quote fields per line: $fields)"
cat "$err"
