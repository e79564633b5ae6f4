#!/usr/bin/env python3
"""Compares `junctionfit fit --json` lines with scipy_simmons_fit.py's CSV, file by file (matched by file name).

A curve agrees when |phi_cli - phi_ref| <= SE_ref(phi) and |d_cli - d_ref| <= SE_ref(d) (the reference's own standard
errors). Also prints the largest difference in units of SE and the largest relative difference between the two
programs' standard errors. Usage: compare.py CLI_JSONL REF_CSV [TRUTH_CSV]; exit code 1 when any curve disagrees.
"""
import csv
import json
import os
import sys

cli = {}
with open(sys.argv[1]) as f:
    for line in f:
        r = json.loads(line)
        p = r["parameters"]
        cli[os.path.basename(r["file"])] = (p["barrier_height_eV"]["value"], p["thickness_nm"]["value"],
                                            p["barrier_height_eV"]["stderr"], p["thickness_nm"]["stderr"], r["status"])
ref = {}
with open(sys.argv[2]) as f:
    for row in csv.DictReader(f):
        ref[os.path.basename(row["file"])] = tuple(float(row[k]) for k in ("phi_eV", "d_nm", "se_phi_eV", "se_d_nm"))
floor = set()
if len(sys.argv) > 3:
    with open(sys.argv[3]) as f:
        floor = {row["file"] for row in csv.DictReader(f) if row["floor_point"] == "1"}

agree = 0
worst = (0.0, "")
worst_se = (0.0, "")
bad = []
statuses = {}
for name, (p, d, sp, sd) in sorted(ref.items()):
    if name not in cli:
        bad.append(f"{name}: no CLI result")
        continue
    cp, cd, csp, csd, status = cli[name]
    statuses[status] = statuses.get(status, 0) + 1
    z = max(abs(cp - p) / sp, abs(cd - d) / sd)
    if z > worst[0]:
        worst = (z, name)
    if csp is not None and csd is not None:
        e = max(abs(csp / sp - 1), abs(csd / sd - 1))
        if e > worst_se[0]:
            worst_se = (e, name)
    else:
        worst_se = (float("inf"), name)
    if z <= 1.0:
        agree += 1
    else:
        bad.append(f"{name}{' (floor point)' if name in floor else ''}: cli phi {cp:.6g} d {cd:.6g}, ref phi {p:.6g} +- {sp:.2g} "
                   f"d {d:.6g} +- {sd:.2g} ({z:.3g} SE)")
n = len(ref)
print(f"agreement within 1 SE: {agree} of {n} curves ({sum(1 for k in ref if k in floor)} with a floor-level point); "
      f"largest difference {worst[0]:.2e} SE ({worst[1]}); largest relative SE difference {worst_se[0]:.2e} ({worst_se[1]}); "
      f"CLI statuses {statuses}")
for line in bad[:20]:
    print("  disagrees: " + line)
sys.exit(0 if agree == n else 1)
