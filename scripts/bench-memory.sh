#!/usr/bin/env bash
# Peak memory of the command line on a generated 10^6-lane transportation
# network (1000 x 1000, complete): the audit alone (--no-solve
# --no-ranges) and the audit with the solver, from CSV and from DIMACS.
# Usage: bash scripts/bench-memory.sh [SCRATCH_DIR]
set -euo pipefail
cd "$(dirname "$0")/.."
dir="${1:-$(mktemp -d)}"
mkdir -p "$dir"
go build -o "$dir/lanecert" ./cmd/lanecert
go build -o "$dir/gennet" ./internal/cmd/gennet
[ -f "$dir/net.min" ] || "$dir/gennet" -kind transport -m 1000 -n 1000 -out "$dir"
lanes=$(($(wc -l < "$dir/lanes.csv") - 1))
run() {
  local name="$1"; shift
  /usr/bin/time -f '%M %e' -o "$dir/time.txt" "$dir/lanecert" "$@" > /dev/null || true
  read -r kib secs < <(tail -n 1 "$dir/time.txt")
  awk -v n="$name" -v k="$kib" -v s="$secs" -v l="$lanes" 'BEGIN { printf "| %s | %.0f | %.0f | %.2f |\n", n, k/1024, k*1024/l, s }'
}
echo "| run ($lanes lanes) | peak MiB | bytes per lane | wall s |"
echo "|---|---:|---:|---:|"
run "audit CSV, check only" audit "$dir/lanes.csv" --nodes "$dir/nodes.csv" --no-solve --no-ranges --format json
run "audit DIMACS, check only" audit "$dir/net.min" "$dir/opt.flow" --no-solve --no-ranges --format json
run "audit DIMACS with solve" audit "$dir/net.min" "$dir/pert.flow" --no-ranges --format json
