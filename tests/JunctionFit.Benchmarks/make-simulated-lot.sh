#!/usr/bin/env bash
# Writes N invented I-V files for batch throughput and shared-work runs (sample-data/README.md's invented scenario):
# one noise-free Simmons curve from `junctionfit simulate` (phi = 1.9 eV, d = 1.5 nm, 100 um2, -0.8 ... +0.8 V,
# 81 points), then per file k its own 1 % Gaussian current noise (seed k): every file is another measurement of
# the same junction. Lot/wafer/die headers, 100 files per folder.
# Calling `simulate` once rather than N times keeps 10^4 files to seconds; the content of every file differs, so
# every file has its own result identity.
#
# Usage: tests/JunctionFit.Benchmarks/make-simulated-lot.sh N OUTDIR [LOT]
set -euo pipefail
n="${1:?number of files}"
out="${2:?output folder}"
lot="${3:-KM-S01}"
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
cli="$root/src/JunctionFit.Cli/bin/Release/net10.0/junctionfit"
[ -x "$cli" ] || dotnet build -c Release "$root/src/JunctionFit.Cli" -nologo -v quiet > /dev/null
mkdir -p "$out"
base="$(mktemp)"
"$cli" simulate --model simmons --barrier-height 1.9 --thickness 1.5 --area 100 --from -0.8 --to 0.8 --points 81 > "$base"
python3 - "$base" "$n" "$out" "$lot" <<'PY'
import os, random, sys
base, n, out, lot = sys.argv[1], int(sys.argv[2]), sys.argv[3], sys.argv[4]
lines = [l.rstrip("\n") for l in open(base) if l.strip() and not l.startswith("#")]
header, rows = lines[0], [tuple(map(float, l.split(","))) for l in lines[1:]]
for k in range(n):
    rng = random.Random(k + 1)
    folder = os.path.join(out, f"part{k // 100:03d}")
    os.makedirs(folder, exist_ok=True)
    with open(os.path.join(folder, f"die_{k:05d}.csv"), "w") as f:
        f.write(f"# lot: {lot}\n# wafer: W{k // 400:02d}\n# die: {k % 20},{k // 20 % 20}\n# area: 100 um2\n{header}\n")
        for v, i in rows:
            f.write(f"{v!r},{i * (1 + 0.01 * rng.gauss(0, 1))!r}\n")
PY
rm -f "$base"
echo "wrote $n files under $out"
