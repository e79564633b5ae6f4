#!/usr/bin/env bash
# Regenerates the invented demo data with the project's own simulator (see README.md in this folder).
# Usage: sample-data/make-sample-data.sh   (from the project root; needs the .NET 10 SDK). Deterministic.
set -euo pipefail
cd "$(dirname "$0")/.."
dotnet build src/JunctionFit.Cli -c Release -v quiet -nologo > /dev/null
jf() { dotnet src/JunctionFit.Cli/bin/Release/net10.0/junctionfit.dll "$@"; }
rm -rf sample-data/lots

# Die parameters: lot barrier height and thickness, a radial gradient across the wafer and a seeded die-to-die
# scatter (awk's generator). KM-A02 carries a planted +0.15 eV barrier shift. Die (2,2) is the wafer centre.
awk 'BEGIN {
  srand(20261202);
  split("KM-A01 KM-A02 KM-A03", lots, " ");
  phi0["KM-A01"] = 2.00; phi0["KM-A02"] = 2.15; phi0["KM-A03"] = 2.00;
  d0["KM-A01"] = 1.50;  d0["KM-A02"] = 1.50;  d0["KM-A03"] = 1.50;
  seed = 1000;
  for (l = 1; l <= 3; l++) for (w = 1; w <= 2; w++) for (x = 0; x <= 4; x++) for (y = 0; y <= 4; y++) {
    r2 = (x - 2) ^ 2 + (y - 2) ^ 2;
    if ((x - 2 < 0 ? 2 - x : x - 2) + (y - 2 < 0 ? 2 - y : y - 2) > 2) continue;   # a round-ish wafer: 13 dies
    lot = lots[l]; wafer = sprintf("W%02d", w);
    phi = phi0[lot] - 0.006 * r2 + 0.012 * (rand() - 0.5) * 2;
    d = d0[lot] + 0.004 * r2 + 0.006 * (rand() - 0.5) * 2;
    area = (x + y) % 4 == 1 ? 25 : 100;
    extra = (lot == "KM-A03" && wafer == "W01" && x == 3 && y == 3) ? "leakage-conductance=2e-7" : "";
    printf "%s %s %d %d %.4f %.4f %d %d %s\n", lot, wafer, x, y, phi, d, area, ++seed, extra;
  } }' > /tmp/jf-sample-table.txt

while read -r lot wafer x y phi d area seed extra; do
  dir="sample-data/lots/$lot/$wafer"
  mkdir -p "$dir"
  set_args=()
  note="simulated: simmons phi=$phi eV d=$d nm area=$area um2 T=295 K noise=1% seed=$seed"
  if [[ -n "${extra:-}" ]]; then set_args=(--set "$extra"); note="$note, with a parallel leak $extra (a deliberately bad die)"; fi
  jf simulate --model simmons --barrier-height "$phi" --thickness "$d" --area "$area" \
     --from -0.8 --to 0.8 --points 161 --noise 0.01 --seed "$seed" --temperature 295 "${set_args[@]}" \
     --header "lab=Kestrel Microsystems, thin-film characterisation (invented)" \
     --header "product=KM-TJ4 aluminium-oxide tunnel junction test chip (invented)" \
     --header "lot=$lot" --header "wafer=$wafer" --header "die=$x,$y" \
     --header "area=$area um2" --header "temperature=295 K" --header "note=$note" \
     > "$dir/die_${x}_${y}.csv"
done < /tmp/jf-sample-table.txt

# Ellipsometry per wafer: the mean simulated thickness of the wafer's dies, to 0.01 nm, except KM-A03 W02,
# where the table carries a planted +0.25 nm offset (a mis-calibrated ellipsometer recipe, invented).
awk 'BEGIN { print "lot,wafer,thickness_nm" }
     { key = $1 "," $2; sum[key] += $6; n[key]++; if (!(key in order)) { order[key] = ++k; keys[k] = key } }
     END { for (i = 1; i <= k; i++) { key = keys[i]; t = sum[key] / n[key]; if (key == "KM-A03,W02") t += 0.25; printf "%s,%.2f\n", key, t } }' \
  /tmp/jf-sample-table.txt > sample-data/ellipsometry.csv
{ echo "# lot wafer die_x die_y barrier_height_eV thickness_nm area_um2 seed extra (the simulated truth)"; cat /tmp/jf-sample-table.txt; } > sample-data/die-parameters.table
echo "sample-data: regenerated $(wc -l < /tmp/jf-sample-table.txt) files and ellipsometry.csv"
