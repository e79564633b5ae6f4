#!/usr/bin/env bash
# Two `batch` workers share one lot through one PostgreSQL server (issue 13): worker A is killed with SIGKILL once it
# has run 1 s and holds claims, and started again; the script then checks that every file is stored exactly once and
# prints how many files each worker fitted (by the name in fitted_by), how many were taken over, and the wall time.
#
# Usage: tests/JunctionFit.Benchmarks/run-shared-workers.sh [N] [WORKDIR]
#   N        number of files (default 3000), written by make-simulated-lot.sh under a lot name of their own
#   WORKDIR  where files and outputs go (default: ${TMPDIR:-/tmp}/junctionfit-shared-workers)
# Environment: JUNCTIONFIT_TEST_PG (required; `eval "$(.ci/postgres-setup.sh)"` starts a throwaway server),
#              LEASE (default 2s), JOBS (passed as --jobs when set).
set -euo pipefail
n="${1:-3000}"
work="${2:-${TMPDIR:-/tmp}/junctionfit-shared-workers}"
lease="${LEASE:-2s}"
db="${JUNCTIONFIT_TEST_PG:?set JUNCTIONFIT_TEST_PG (eval \"\$(.ci/postgres-setup.sh)\")}"
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
cli="$root/src/JunctionFit.Cli/bin/Release/net10.0/junctionfit"
dotnet build -c Release "$root/src/JunctionFit.Cli" -nologo -v quiet > /dev/null
lot="KM-W$(date +%H%M%S)"
rm -rf "$work"; mkdir -p "$work"
"$here/make-simulated-lot.sh" "$n" "$work/in" "$lot" > /dev/null
jobs_arg=()
[ -n "${JOBS:-}" ] && jobs_arg=(--jobs "$JOBS")
run() { exec "$cli" batch "$work/in" --out "$work/out-$1" --no-plots --area 100 --db "$db" --lease "$lease" --worker-name "$1" "${jobs_arg[@]}"; }

# psql for watching the claims table (from the connection string's Host, Port, Database, Username, Password).
field() { printf '%s' "$db" | tr ';' '\n' | sed -n "s/^$1=//Ip" | head -1; }
claims_of() {
  PGPASSWORD="$(field Password)" psql -h "$(field Host)" -p "$(field Port)" -U "$(field Username)" -d "$(field Database)" -Atqc \
    "SELECT COUNT(*) FROM work_claim WHERE state = 'claimed' AND claimed_by LIKE '$1%'" 2>/dev/null || echo 0
}

echo "== machine: $(nproc) cores; load: $(uptime | sed 's/.*load average: //')"
t0=$(date +%s.%N)
run B > "$work/b.log" 2>&1 & pb=$!
run A > "$work/a1.log" 2>&1 & pa=$!
sleep 1
for _ in $(seq 1 600); do [ "$(claims_of "A@$(hostname):$pa")" -gt 0 ] && break; sleep 0.05; done
held="$(claims_of "A@$(hostname):$pa")"
kill -9 "$pa" || true; wait "$pa" 2>/dev/null || true
echo "killed A (pid $pa) at $(echo "$(date +%s.%N) - $t0" | bc) s holding $held claims"
run A > "$work/a2.log" 2>&1 & pa2=$!
rc=0
wait "$pb" || rc=$?; echo "B finished at $(echo "$(date +%s.%N) - $t0" | bc) s, exit $rc"
wait "$pa2" || rc=$?; echo "A (restarted) finished at $(echo "$(date +%s.%N) - $t0" | bc) s, exit $rc"
grep -h "taken over" "$work/b.log" "$work/a2.log" || true

"$cli" results --db "$db" --lot "$lot" --csv > "$work/results-db.csv" 2>/dev/null
python3 - "$work/results-db.csv" "$n" "$work/out-A/results.csv" "$work/out-B/results.csv" <<'PY'
import csv, sys, collections
rows = list(csv.DictReader(open(sys.argv[1])))
n = int(sys.argv[2])
files = [r["file"] for r in rows]
by = collections.Counter(r["fitted_by"].split("@")[0] for r in rows)
print(f"stored {len(rows)} rows for {len(set(files))} distinct files of {n}")
for w, c in sorted(by.items()):
    print(f"  worker {w}: {c} files ({100.0 * c / n:.1f} %)")
ok = len(rows) == n and len(set(files)) == n and all(c >= 0.2 * n for c in by.values()) and len(by) == 2
for p in sys.argv[3:]:
    local = [r["file"] for r in csv.DictReader(open(p))]
    print(f"  {p}: {len(local)} rows")
    ok = ok and sorted(local) == sorted(files)
print("OK" if ok else "FAILED")
sys.exit(0 if ok else 1)
PY
