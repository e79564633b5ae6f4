#!/usr/bin/env bash
# Whole-command throughput of `junctionfit fit FOLDER --area 100 --json` (issue 6, item 1), process start included.
#
# 1. Builds the CLI in Release.
# 2. Writes N (default 1000) simulated 201-point files with `junctionfit simulate` (Simmons, phi = 2.0 eV, d = 1.5 nm,
#    100 um2, 1 % noise, -1.2 V ... +1.2 V, seeds 1..N) into a work folder (kept and reused between runs).
# 3. Times the whole fit command with hyperfine (or /usr/bin/time when hyperfine is missing), plus the same command on
#    a folder with one file (the fixed cost: process start, JIT, first file), and prints ms per curve against the
#    target of 0.8 ms per curve. Ratios against scipy come from run-vs-scipy.sh (both measured in one run).
#
# Usage: tests/JunctionFit.Benchmarks/run-cli-throughput.sh [N] [WORKDIR]
#   N        number of files (default 1000)
#   WORKDIR  where the files and results go (default: ${TMPDIR:-/tmp}/junctionfit-cli-throughput)
# Environment: RUNS (timed runs, default 5), JOBS (passed as --jobs when set).
set -euo pipefail

n="${1:-1000}"
work="${2:-${TMPDIR:-/tmp}/junctionfit-cli-throughput}"
runs="${RUNS:-5}"
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
target_ms=0.8

echo "== build (Release)"
dotnet build -c Release "$root/src/JunctionFit.Cli" -nologo -v quiet > "$work.build.log" 2>&1 || { cat "$work.build.log"; exit 2; }
cli="$root/src/JunctionFit.Cli/bin/Release/net10.0/junctionfit"
[ -x "$cli" ] || { echo "no CLI at $cli" >&2; exit 2; }

curves="$work/curves-$n"
one="$work/one"
mkdir -p "$curves" "$one"
have=$(find "$curves" -name 'die_*.csv' | wc -l)
if [ "$have" -ne "$n" ]; then
  echo "== writing $n simulated 201-point files to $curves"
  rm -f "$curves"/die_*.csv
  seq 1 "$n" | xargs -P "$(nproc)" -I{} sh -c \
    "'$cli' simulate --model simmons --barrier-height 2.0 --thickness 1.5 --area 100 --from -1.2 --to 1.2 --points 201 \
       --noise 0.01 --seed {} --header area='100 um2' > '$curves/die_{}.csv'"
fi
cp "$curves/die_1.csv" "$one/die_1.csv"

jobs_arg=""
[ -n "${JOBS:-}" ] && jobs_arg="--jobs $JOBS"
cmd="'$cli' fit '$curves' --area 100 --json $jobs_arg > /dev/null"
cmd_one="'$cli' fit '$one' --area 100 --json $jobs_arg > /dev/null"

echo "== machine: $(nproc) cores; $(lscpu | sed -n 's/^Model name: *//p'); load: $(uptime | sed 's/.*load average: //')"
sh -c "$cmd" || true   # warm the file cache; exit code 1 (some poor fits) is not an error here

if command -v hyperfine > /dev/null; then
  hyperfine --warmup 1 --runs "$runs" -i --export-json "$work/hyperfine.json" \
    -n "fit $n files" "$cmd" -n "fit 1 file" "$cmd_one"
  read -r mean_n sd_n mean_1 < <(python3 - "$work/hyperfine.json" <<'PY'
import json, sys
r = json.load(open(sys.argv[1]))["results"]
print(r[0]["mean"] * 1000, r[0]["stddev"] * 1000, r[1]["mean"] * 1000)
PY
)
else
  t() { local best=""; for _ in $(seq 1 "$runs"); do
          s=$( { /usr/bin/time -f %e sh -c "$1" ; } 2>&1 | tail -1 ); best=$(python3 -c "print(min(float('$s'), float('${best:-1e9}')))"); done; echo "$best"; }
  mean_n=$(python3 -c "print(1000 * $(t "$cmd"))"); sd_n=0; mean_1=$(python3 -c "print(1000 * $(t "$cmd_one"))")
fi

python3 - "$n" "$mean_n" "$sd_n" "$mean_1" "$target_ms" <<'PY'
import sys
n, mean_n, sd_n, mean_1, target = int(sys.argv[1]), *map(float, sys.argv[2:])
per = mean_n / n
marginal = (mean_n - mean_1) / (n - 1) if n > 1 else float("nan")
print(f"== whole command, {n} files: {mean_n:.0f} ms +- {sd_n:.0f} ms  ->  {per:.3f} ms per curve (process start included)")
print(f"   one file (process start, JIT, one fit): {mean_1:.0f} ms;  marginal cost per further curve: {marginal:.3f} ms")
print(f"   target {target} ms per curve: {'met' if per <= target else 'NOT met'} ({target / per:.2f}x the target speed); "
      f"(for a ratio against scipy measured in the same run, use run-vs-scipy.sh; fixed figures from another machine give none)")
PY
