#!/usr/bin/env bash
# Shows that tests/layer_rules.cmake catches each rule it checks: the tree as it is passes, then
# each break below, made on a scratch copy, must fail with its own message.
#   bash layer_rules_break.sh SOURCE_DIR SCRATCH_DIR
set -u
source_dir=$1 scratch=$2
fails=0

copy_tree() {
  rm -rf "$scratch"
  mkdir -p "$scratch"
  cp -r "$source_dir"/{mesh,post,solver,tests,cases} "$scratch"/
}

rules() { cmake -DSOURCE_DIR="$scratch" -P "$scratch/tests/layer_rules.cmake" 2>&1; }

copy_tree
if ! out=$(rules); then
  echo "FAIL: the tree as it is breaks a rule:"
  echo "$out"
  exit 1
fi
[[ -z $out ]] || { echo "FAIL: the rules pass but print (a warning in layer_rules.cmake?):"; echo "$out"; exit 1; }

# break WHAT FILE LINE EXPECTED: appends LINE to FILE of a fresh copy; the rules must fail saying EXPECTED.
break_one() {
  local what=$1 file=$2 line=$3 expected=$4
  copy_tree
  printf '%s\n' "$line" >>"$scratch/$file"
  if out=$(rules); then
    echo "FAIL: not caught: $what"
    fails=$((fails + 1))
  elif ! grep -qF -- "$expected" <<<"$out"; then
    echo "FAIL: $what: the message does not say '$expected':"
    echo "$out"
    fails=$((fails + 1))
  else
    echo "caught: $what"
  fi
}

# One break a line: what | file | line appended to it | what the message must say.
while IFS='|' read -r what file line expected; do
  break_one "$what" "$file" "$line" "$expected"
done <<'BREAKS'
the numerics include the case schema|solver/numerics/conduction.hpp|#include "solver/case/case.hpp"|solver/numerics/ may include only
the numerics include post|solver/numerics/simulation.hpp|#include "post/thermal_history.hpp"|solver/numerics/ may include only
physics includes the whole case|solver/physics/heat_source.hpp|#include "solver/case/case.hpp"|solver/physics/ may include only
weldability includes the whole case|solver/weldability/haz_hardness.hpp|#include "solver/case/case.hpp"|solver/weldability/ may include only
the case schema includes the numerics|solver/case/case_reader.cpp|#include "solver/numerics/integrators.hpp"|solver/case/ may include only
a study includes a command|solver/studies/preheat_search.cpp|#include "solver/app/run_command.hpp"|solver/studies/ may include only
post includes the solver|post/summary.cpp|#include "solver/core/units.hpp"|post/ may include only
mesh includes post|mesh/grid.cpp|#include "post/summary.hpp"|mesh/ may include only
a study uses the command-line parser|solver/studies/sweep_plan.cpp|#include <CLI/CLI.hpp>|only solver/app/ uses CLI11 and MPI
the time loop names the thermal history|solver/numerics/simulation.cpp|// kept in post::ThermalHistory|names a thermal history
a command keeps its own caution text|solver/app/check.cpp|const char* const extra_caution = "Advisory only.";|defines a caution text
BREAKS
# Built from two halves so that this script does not itself cite the outside file.
break_one "a test cites a file outside the repository" tests/test_units.cpp \
  "// see REF""ERENCES.md of the design notes" "cites a file outside the repository"

rm -rf "$scratch"
((fails == 0)) || exit 1
