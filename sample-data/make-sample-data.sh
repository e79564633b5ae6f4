#!/usr/bin/env bash
# Regenerates the invented demo lot with the project's own simulator (see README.md in this folder).
# Usage: sample-data/make-sample-data.sh   (from the project root; needs the .NET 10 SDK)
set -euo pipefail
cd "$(dirname "$0")/.."
dotnet build src/JunctionFit.Cli -c Release -v quiet -nologo > /dev/null
jf() { dotnet src/JunctionFit.Cli/bin/Release/net10.0/junctionfit.dll "$@"; }

# lot wafer die_x die_y phi_eV d_nm area_um2 seed
while read -r lot wafer x y phi d area seed; do
  [[ -z "$lot" || "$lot" == \#* ]] && continue
  dir="sample-data/$lot/$wafer"
  mkdir -p "$dir"
  jf simulate --model simmons --barrier-height "$phi" --thickness "$d" --area "$area" \
     --from -0.8 --to 0.8 --points 161 --noise 0.01 --seed "$seed" --temperature 295 \
     --header "lab=Kestrel Microsystems, thin-film characterisation (invented)" \
     --header "product=KM-TJ4 aluminium-oxide tunnel junction test chip (invented)" \
     --header "lot=$lot" --header "wafer=$wafer" --header "die=$x,$y" \
     --header "area=$area um2" --header "temperature=295 K" \
     --header "note=simulated: simmons phi=$phi eV d=$d nm area=$area um2 T=295 K noise=1% seed=$seed" \
     > "$dir/die_${x}_${y}.csv"
done <<'TABLE'
# lot    wafer x y phi  d     area seed
KM-A01   W01   0 0 2.02 1.50  100  101
KM-A01   W01   1 0 1.98 1.52  100  102
KM-A01   W01   0 1 2.05 1.48  100  103
KM-A01   W01   1 1 2.00 1.51  100  104
KM-A01   W02   0 0 1.97 1.53  100  105
KM-A01   W02   1 0 2.03 1.49  100  106
KM-A01   W02   0 1 2.01 1.50  25   107
KM-A01   W02   1 1 1.99 1.52  25   108
KM-A02   W01   0 0 2.16 1.50  100  201
KM-A02   W01   1 0 2.14 1.52  100  202
KM-A02   W01   0 1 2.18 1.49  100  203
KM-A02   W01   1 1 2.15 1.51  100  204
KM-A02   W02   0 0 2.12 1.53  100  205
KM-A02   W02   1 0 2.17 1.50  100  206
KM-A02   W02   0 1 2.15 1.48  25   207
KM-A02   W02   1 1 2.13 1.51  25   208
TABLE
echo "sample-data: regenerated"
