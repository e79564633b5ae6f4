#!/usr/bin/env python3
"""Times commands side by side in one run, interleaved (A, B, C, A, B, C, ...), so that a change of machine load hits
all of them alike. Wall time per run, CPU time (user + system of the child) per run; prints medians and the ratios of
the first command's medians to every other's. Usage: side_by_side.py RUNS NAME=COMMAND [NAME=COMMAND ...]
(each COMMAND is run with sh -c; its standard output is kept in $SIDE_BY_SIDE_OUT/NAME.out when that is set)."""
import os
import resource
import statistics
import subprocess
import sys
import time

runs = int(sys.argv[1])
cmds = [a.split("=", 1) for a in sys.argv[2:]]
outdir = os.environ.get("SIDE_BY_SIDE_OUT")
wall = {n: [] for n, _ in cmds}
cpu = {n: [] for n, _ in cmds}
for r in range(runs):
    for name, cmd in cmds:
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        t0 = time.perf_counter()
        out = open(os.path.join(outdir, name + ".out"), "wb") if outdir else subprocess.DEVNULL
        subprocess.run(["sh", "-c", cmd], stdout=out)
        if outdir:
            out.close()
        wall[name].append(time.perf_counter() - t0)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        cpu[name].append(after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime)
    print(f"   run {r + 1}/{runs}: " + ", ".join(f"{n} {wall[n][-1]:.3f} s" for n, _ in cmds), flush=True)
med = {n: (statistics.median(wall[n]), statistics.median(cpu[n])) for n, _ in cmds}
for n, _ in cmds:
    print(f"   {n:24s} wall median {med[n][0]:8.3f} s (min {min(wall[n]):.3f}, max {max(wall[n]):.3f});  CPU median {med[n][1]:8.3f} s")
ref = cmds[-1][0]
for n, _ in cmds[:-1]:
    print(f"   {ref} / {n}: wall {med[ref][0] / med[n][0]:.1f}x, CPU {med[ref][1] / med[n][1]:.1f}x")
