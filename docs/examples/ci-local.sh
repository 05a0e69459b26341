#!/usr/bin/env bash
# The CI pipeline of docs/examples/ci-pipeline.yml run on one machine: sweep in N shards, merge,
# then check against a baseline (made first if it does not exist yet). Useful to try the gate
# before wiring it into CI, or to reproduce a CI failure.
#
#   docs/examples/ci-local.sh [BASELINE] [SHARDS]
#
# STEPGAUGE overrides the command (default: npx stepgauge); SWEEP_ARGS overrides the sweep.
set -euo pipefail
BASELINE=${1:-ci/stepgauge-baseline.json}
SHARDS=${2:-3}
STEPGAUGE=${STEPGAUGE:-npx stepgauge}
SWEEP_ARGS=${SWEEP_ARGS:---problem harmonic-oscillator,kepler-eccentric --tolerances 1e-3..1e-8 --steps 100,200,400 --no-report --no-timing --quiet}
WORK=$(mktemp -d)
trap 'rm -rf "$WORK"' EXIT

for k in $(seq 1 "$SHARDS"); do
  # shellcheck disable=SC2086 # SWEEP_ARGS is a list of flags
  # Exit 3 only says some runs ended not ok; the check below judges that against the baseline.
  $STEPGAUGE run $SWEEP_ARGS --shard "$k/$SHARDS" --out "$WORK/shard-$k" >/dev/null || [ $? -eq 3 ]
done
$STEPGAUGE merge "$WORK"/shard-*/results.json --out "$WORK/merged.json"

if [ ! -f "$BASELINE" ]; then
  mkdir -p "$(dirname "$BASELINE")"
  $STEPGAUGE baseline "$WORK/merged.json" --out "$BASELINE"
  echo "made $BASELINE; review and commit it"
fi
status=0
$STEPGAUGE check --baseline "$BASELINE" "$WORK/merged.json" --junit stepgauge-junit.xml || status=$?
echo "check exit code: $status (JUnit in stepgauge-junit.xml)"
exit "$status"
