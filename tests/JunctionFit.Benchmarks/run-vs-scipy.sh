#!/usr/bin/env bash
# The whole fit command against a careful general-purpose reference, side by side in one run (issue 13).
#
# 1. Builds the CLI (Release) and publishes it ReadyToRun (framework-dependent, linux-x64) into the work folder.
# 2. Writes 1000 held-out 201-point Simmons curves (reference/make_heldout.py: phi 1.5-3 eV, d 1-2 nm, area 100 um2
#    known, 1 % noise; every 10th with a floor-level point at 1e-16 V), once, and keeps them.
# 3. Times, interleaved in one run (reference/side_by_side.py): `junctionfit fit FOLDER --area 100 --json` as published
#    (ReadyToRun) and as built, and reference/scipy_simmons_fit.py (scipy.optimize.least_squares method='lm', i.e. MINPACK,
#    from a 3x3 start grid, with its own standard errors) when /usr/bin/python3 has scipy (Debian: apt-get install
#    python3-scipy); prints wall and CPU medians and their ratios.
# 4. Checks agreement: every curve's phi and d within 1 SE (the reference's) of the reference (reference/compare.py).
#
# Usage: tests/JunctionFit.Benchmarks/run-vs-scipy.sh [WORKDIR]   (default ${TMPDIR:-/tmp}/junctionfit-vs-scipy)
# Environment: RUNS (interleaved rounds, default 5), N (curves, default 1000).
set -euo pipefail
work="${1:-${TMPDIR:-/tmp}/junctionfit-vs-scipy}"
runs="${RUNS:-5}"
n="${N:-1000}"
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
py=/usr/bin/python3
mkdir -p "$work"

echo "== build and publish (Release; ReadyToRun)"
dotnet build -c Release "$root/src/JunctionFit.Cli" -nologo -v quiet > "$work/build.log" 2>&1 || { cat "$work/build.log"; exit 2; }
dotnet publish "$root/src/JunctionFit.Cli" -c Release -r linux-x64 --self-contained false -p:PublishReadyToRun=true \
  -o "$work/cli-r2r" -nologo -v quiet > "$work/publish.log" 2>&1 || { cat "$work/publish.log"; exit 2; }
built="$root/src/JunctionFit.Cli/bin/Release/net10.0/junctionfit"
r2r="$work/cli-r2r/junctionfit"

data="$work/heldout-$n"
if [ ! -f "$data/truth.csv" ] || [ "$(find "$data/curves" -name '*.csv' | wc -l)" -ne "$n" ]; then
  echo "== writing $n held-out curves to $data"
  rm -rf "$data"
  "$py" "$here/reference/make_heldout.py" "$built" "$data" "$n"
fi
curves="$data/curves"

have_scipy=1
"$py" -c 'import scipy, numpy' 2> /dev/null || have_scipy=0
echo "== machine: $(nproc) cores; $(lscpu | sed -n 's/^Model name: *//p'); load before: $(uptime | sed 's/.*load average: //')"
cat "$curves"/*.csv > /dev/null   # file cache
out="$work/out"
mkdir -p "$out"
cli_cmd() { echo "'$1' fit '$curves' --area 100 --json"; }
if [ "$have_scipy" = 1 ]; then
  echo "== timing, $runs interleaved rounds: CLI (ReadyToRun), CLI (as built), scipy reference; $n curves each"
  SIDE_BY_SIDE_OUT="$out" "$py" "$here/reference/side_by_side.py" "$runs" \
    "cli-readytorun=$(cli_cmd "$r2r")" "cli-built=$(cli_cmd "$built")" \
    "scipy-minpack-3x3=$py '$here/reference/scipy_simmons_fit.py' '$curves' 100"
  echo "== agreement (CLI ReadyToRun against the scipy reference)"
  "$py" "$here/reference/compare.py" "$out/cli-readytorun.out" "$out/scipy-minpack-3x3.out" "$data/truth.csv" || status=$?
else
  echo "== python3-scipy is absent for $py: timing the CLI alone (no ratio, no agreement check); apt-get install python3-scipy"
  SIDE_BY_SIDE_OUT="$out" "$py" "$here/reference/side_by_side.py" "$runs" "cli-readytorun=$(cli_cmd "$r2r")" "cli-built=$(cli_cmd "$built")"
fi
echo "== load after: $(uptime | sed 's/.*load average: //')"
exit "${status:-0}"
