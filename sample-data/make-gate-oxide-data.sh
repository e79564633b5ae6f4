#!/usr/bin/env bash
# Regenerates the invented gate-oxide demo lot with the project's own simulator (see README.md in this folder).
# Usage: sample-data/make-gate-oxide-data.sh   (from the project root; needs the .NET 10 SDK). Deterministic.
set -euo pipefail
cd "$(dirname "$0")/.."
dotnet build src/JunctionFit.Cli -c Release -v quiet -nologo > /dev/null
jf() { dotnet src/JunctionFit.Cli/bin/Release/net10.0/junctionfit.dll "$@"; }
out=sample-data/gate-oxide
rm -rf "$out/lots" "$out/cv"
mkdir -p "$out"

# Die parameters: lot oxide thickness, a radial gradient across the wafer and a seeded die-to-die scatter (awk's
# generator). KM-G02 carries a planted +0.10 nm thicker oxide. Die (2,2) is the wafer centre; 13 dies on a 5 x 5 grid.
awk 'BEGIN {
  srand(20261212);
  split("KM-G01 KM-G02", lots, " ");
  t0["KM-G01"] = 2.00; t0["KM-G02"] = 2.10;
  seed = 5000;
  for (l = 1; l <= 2; l++) for (w = 1; w <= 2; w++) for (x = 0; x <= 4; x++) for (y = 0; y <= 4; y++) {
    r2 = (x - 2) ^ 2 + (y - 2) ^ 2;
    if ((x - 2 < 0 ? 2 - x : x - 2) + (y - 2 < 0 ? 2 - y : y - 2) > 2) continue;
    lot = lots[l]; wafer = sprintf("W%02d", w);
    t = t0[lot] + 0.005 * r2 + 0.010 * (rand() - 0.5) * 2;
    vfb = -0.90 + 0.010 * (rand() - 0.5) * 2;
    printf "%s %s %d %d %.4f %.4f %d\n", lot, wafer, x, y, t, vfb, ++seed;
  } }' > /tmp/jf-gate-oxide-table.txt

while read -r lot wafer x y t vfb seed; do
  dir="$out/lots/$lot/$wafer"
  mkdir -p "$dir"
  jf simulate --model mos --barrier-height 3.1 --thickness "$t" --area 100 --set "flatband-voltage=$vfb" \
     --from -0.5 --to 1.5 --points 41 --noise 0.01 --noise-floor 2e-13 --seed "$seed" --temperature 300 \
     --header "lab=Kestrel Microsystems, device characterisation (invented)" \
     --header "product=KM-GX2 gate-oxide test chip, n-channel W = L = 10 um (invented)" \
     --header "lot=$lot" --header "wafer=$wafer" --header "die=$x,$y" \
     --header "area=100 um2" --header "temperature=300 K" \
     --header "note=simulated: mos p substrate 1e17 cm^-3 n+ poly t_ox=$t nm V_fb=$vfb V area=100 um2 T=300 K noise=1% floor=2e-13 A seed=$seed" \
     > "$dir/die_${x}_${y}.csv"
done < /tmp/jf-gate-oxide-table.txt

# One C-V capacitor (100 um x 100 um) per wafer: an invented smooth accumulation-depletion-inversion shape whose largest
# capacitance gives CET = mean t_ox of the wafer + 0.55 nm, except KM-G02 W02 with a planted CET - t_ox = 1.50 nm
# (an invented under-doped poly gate). 0.1 % uniform noise, seeded. eps0 = 8.8541878188e-12 F/m (CODATA 2018).
awk -v out="$out" 'BEGIN { srand(20261213) }
  { key = $1 " " $2; sum[key] += $5; n[key]++; if (!(key in seen)) { seen[key] = 1; keys[++k] = key } }
  END {
    eps = 3.9 * 8.8541878188e-12; area = 1e-8;
    for (i = 1; i <= k; i++) {
      split(keys[i], p, " "); lot = p[1]; wafer = p[2];
      tox = sum[keys[i]] / n[keys[i]];
      extra = (lot == "KM-G02" && wafer == "W02") ? 1.50 : 0.55;
      cet = tox + extra; cmax = eps * area / (cet * 1e-9);
      dir = out "/cv/" lot "/" wafer; system("mkdir -p " dir); f = dir "/cap_cv.csv";
      print "# lab: Kestrel Microsystems, device characterisation (invented)" > f;
      print "# product: KM-GX2 gate-oxide capacitor 100 um x 100 um (invented)" > f;
      print "# lot: " lot > f; print "# wafer: " wafer > f;
      print "# area: 10000 um2" > f; print "# temperature: 300 K" > f;
      printf "# note: simulated (invented shape): CET = %.4f nm (t_ox %.4f nm + %.2f nm)\n", cet, tox, extra > f;
      print "vg,c (pF)" > f;
      for (j = 0; j <= 60; j++) {
        v = -1.5 + 0.05 * j;
        acc = 1 / (1 + exp((v + 0.90) / 0.12)); inv = 1 / (1 + exp(-(v - 0.45) / 0.12));
        c = cmax * (0.25 + 0.75 * (acc + inv)) * (1 + 0.001 * (rand() - 0.5) * 2);
        printf "%.2f,%.6f\n", v, c * 1e12 > f;
      }
      close(f);
      printf "%s,%s,%.4f,%.4f\n", lot, wafer, tox, cet > "/tmp/jf-gate-oxide-cet.txt";
    }
  }' /tmp/jf-gate-oxide-table.txt

# Ellipsometry per wafer: the mean simulated t_ox of the wafer's dies, to 0.01 nm (nothing planted).
awk 'BEGIN { print "lot,wafer,thickness_nm" }
     { key = $1 "," $2; sum[key] += $5; n[key]++; if (!(key in order)) { order[key] = ++k; keys[k] = key } }
     END { for (i = 1; i <= k; i++) printf "%s,%.2f\n", keys[i], sum[keys[i]] / n[keys[i]] }' \
  /tmp/jf-gate-oxide-table.txt > "$out/ellipsometry.csv"
{ echo "# lot wafer die_x die_y thickness_nm flatband_voltage_V seed (the simulated truth)"; cat /tmp/jf-gate-oxide-table.txt; } > "$out/die-parameters.table"
echo "sample-data: regenerated $(wc -l < /tmp/jf-gate-oxide-table.txt) gate-oxide files, $(find "$out/cv" -name '*.csv' | wc -l) C-V files and ellipsometry.csv"
