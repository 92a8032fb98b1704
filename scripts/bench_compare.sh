#!/usr/bin/env bash
# Side-by-side speed of cyclorb (benches/arith.rs) and python-flint (scripts/bench_flint.py).
#
# Both run pinned to one core, workload by workload and alternately, for BENCH_ROUNDS rounds;
# the table shows the best rate of each and their ratio against the targets of the README.
# Rates are per second of the measuring thread's CPU time on both sides, so that other load on
# a shared machine does not distort the ratio.
#
#   scripts/bench_compare.sh                 # needs python-flint importable by $PYTHON
#   PYTHON=/tmp/venv/bin/python BENCH_ROUNDS=5 CYCLORB_BENCH_SECONDS=2 scripts/bench_compare.sh
#
# Environment: PYTHON (default python3), BENCH_ROUNDS (default 3), CYCLORB_BENCH_SECONDS
# (time per workload and run, default 1), BENCH_CPU (core to pin to, default 0),
# RUST_BENCH (command printing the Rust rates; default: cargo bench -q --bench arith --).
set -euo pipefail
cd "$(dirname "$0")/.."

PYTHON=${PYTHON:-python3}
ROUNDS=${BENCH_ROUNDS:-3}
CPU=${BENCH_CPU:-0}
export CYCLORB_BENCH_SECONDS=${CYCLORB_BENCH_SECONDS:-1}
read -r -a RUST_BENCH <<<"${RUST_BENCH:-cargo bench -q --bench arith --}"

pin() {
  if command -v taskset >/dev/null 2>&1; then taskset -c "$CPU" "$@"; else "$@"; fi
}

"$PYTHON" -c "import flint" 2>/dev/null || {
  echo "python-flint is not importable by $PYTHON (pip install python-flint)" >&2
  exit 1
}
# build first, so that compiling is not timed
"${RUST_BENCH[@]}" no-such-workload >/dev/null

workloads=(mul_q16 mul_q60 inv_q16 inv_q60 matvec36_q16)
declare -A rust flint
for ((round = 1; round <= ROUNDS; round++)); do
  for w in "${workloads[@]}"; do
    r=$(pin "${RUST_BENCH[@]}" "$w" | awk -v w="$w" '$1 == w { print $2 }')
    f=$(pin "$PYTHON" scripts/bench_flint.py --only "$w" | awk -v w="$w" '$1 == w { print $2 }')
    if [[ -z ${rust[$w]:-} || $r -gt ${rust[$w]} ]]; then rust[$w]=$r; fi
    if [[ -z ${flint[$w]:-} || $f -gt ${flint[$w]} ]]; then flint[$w]=$f; fi
  done
done

declare -A target=([mul_q16]=15 [mul_q60]=10 [inv_q16]=1 [inv_q60]=1 [matvec36_q16]=30)
flint_version=$("$PYTHON" -c "import flint; print(flint.__version__)")
echo "# best of $ROUNDS rounds, ${CYCLORB_BENCH_SECONDS}s per run, pinned to core $CPU," \
  "rates per CPU second; python-flint $flint_version"
printf '%-14s %14s %14s %9s %8s\n' workload cyclorb/s python-flint/s ratio target
for w in "${workloads[@]}"; do
  awk -v w="$w" -v r="${rust[$w]}" -v f="${flint[$w]}" -v t="${target[$w]}" 'BEGIN {
    ratio = r / f
    printf "%-14s %14d %14d %8.1fx %7s %s\n", w, r, f, ratio, ">=" t "x", (ratio >= t ? "ok" : "MISSED")
  }'
done
