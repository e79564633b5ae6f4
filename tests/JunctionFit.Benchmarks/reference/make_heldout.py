#!/usr/bin/env python3
"""Writes N held-out 201-point Simmons curves with `junctionfit simulate` (invented data for benchmarks only).

phi uniform in [1.5, 3.0] eV, d uniform in [1.0, 2.0] nm (seeded, independent of the seeds used anywhere else),
area 100 um2 (known), mass ratio 1, -1.2 V ... +1.2 V, 1 % Gaussian current noise. Every 10th file gets a
floor-level point: the 0 V row becomes "1E-16,1E-13" (a float-stepped sweep's "zero" bias, read at the
instrument's current floor, same sign as the bias). The curves go to OUTDIR/curves/, the true values to
OUTDIR/truth.csv (file, phi_eV, d_nm, floor_point), outside the folder that is fitted.

Usage: make_heldout.py CLI OUTDIR [N]
"""
import os
import random
import subprocess
import sys
from concurrent.futures import ThreadPoolExecutor

cli, top = sys.argv[1], sys.argv[2]
out = os.path.join(top, "curves")
n = int(sys.argv[3]) if len(sys.argv) > 3 else 1000
os.makedirs(out, exist_ok=True)
rng = random.Random(20240613)
rows = []
for k in range(1, n + 1):
    rows.append((f"heldout_{k:04d}.csv", rng.uniform(1.5, 3.0), rng.uniform(1.0, 2.0), k % 10 == 0, 50000 + k))


def write(row):
    name, phi, d, floor, seed = row
    text = subprocess.run(
        [cli, "simulate", "--model", "simmons", "--barrier-height", repr(phi), "--thickness", repr(d), "--area", "100",
         "--from", "-1.2", "--to", "1.2", "--points", "201", "--noise", "0.01", "--seed", str(seed)],
        check=True, capture_output=True, text=True).stdout
    if floor:
        lines = text.splitlines()
        zero = [i for i, line in enumerate(lines) if line.split(",")[0] in ("0", "-0")]
        assert len(zero) == 1, name
        lines[zero[0]] = "1E-16,1E-13"
        text = "\n".join(lines) + "\n"
    tmp = os.path.join(out, name + ".tmp")
    with open(tmp, "w") as f:
        f.write(text)
    os.replace(tmp, os.path.join(out, name))


with ThreadPoolExecutor(max_workers=os.cpu_count() or 2) as pool:
    list(pool.map(write, rows))
with open(os.path.join(top, "truth.csv"), "w") as f:
    f.write("file,phi_eV,d_nm,floor_point\n")
    for name, phi, d, floor, _ in rows:
        f.write(f"{name},{phi!r},{d!r},{int(floor)}\n")
