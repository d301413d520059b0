#!/bin/sh
# valgrind.sh - run the CLI examples under valgrind: any memory error or a
# definite/indirect leak fails. Each line below is "EXPECTED-EXIT ARGS..."; the
# error paths are here too, since leaks hide on them. Add a line per new example.
set -u
bin=${1:-build/sinkrate}
root=$(cd "$(dirname "$0")/.." && pwd)
tmp=$(mktemp -d /tmp/sinkrate-vg-XXXXXX)
trap 'rm -rf "$tmp"' EXIT INT TERM
export SINKRATE_DATA="$root"
M="$root/payloads/desert-club-rocket.yaml"
printf 'mission: x\nsections: [\n' > "$tmp/bad.yaml"
printf 'altitude [m],temperature [C],pressure [hPa]\n0,15,1013.25\n1000,8.5,898.7\n3000,-4.5,701.1\n' > "$tmp/sounding.csv"
printf 'Re,Cd\n1e3,0.47\n1e2,0.40\n' > "$tmp/bad-drag.csv"
printf 'mission: x\nsite:\n\televation: 10 m\n\ttemperature: 3 C\n' > "$tmp/tabs.yaml"
mkdir "$tmp/mine" && sed 's/^name: .*/name: "Conical, mine"/' "$root/canopies/conical.yaml" > "$tmp/mine/conical.yaml"
printf 'mission: x\nsite: {elevation: &e 100 m}\nsections:\n  - {name: a, mass: *e}\n' > "$tmp/alias.yaml"
printf 'mission: "x\\e[31m"\nsections: []\n' > "$tmp/escape.yaml"
ln -s "$tmp/target.txt" "$tmp/dangling.txt"
printf 'mission: w\nsite: {wind: {model: power-law, speed: 5 m/s, from: 250 deg, gradient-height: 300 m}}\nsections: [{name: a, mass: 0.35 kg}]\nstages: [{name: m, family: conical, nominal-diameter: 7 m}]\nstart: {height: 3000 m}\n' > "$tmp/windy.yaml"
printf 'mission: d\nsections: [{name: a, mass: 2 kg}]\nstages: [{name: m, family: conical, nominal-diameter: 2 m}]\nstart: {height: 300 m}\nlimits: {touchdown-speed: 1 m/s}\ndesign: {stages: {m: {families: [conical, annular], nominal-diameter: {min: 1 m, max: 3 m}, bay-volume: 0.2 L}}}\n' > "$tmp/nodesign.yaml"
# valgrind's own failure code, distinct from the program's 0/1/2
VG=97
fail=0; n=0
while read -r want args; do
  [ -z "$want" ] && continue
  case $want in \#*) continue ;; esac
  n=$((n + 1))
  # shellcheck disable=SC2086
  eval "set -- $args"
  valgrind -q --leak-check=full --errors-for-leak-kinds=definite,indirect --error-exitcode=$VG \
    "$bin" "$@" > "$tmp/out" 2> "$tmp/err"
  rc=$?
  if [ $rc -eq $VG ] || [ $rc -ne "$want" ]; then
    echo "valgrind: FAIL (exit $rc, expected $want): sinkrate $args"
    sed 's/^/  /' "$tmp/err" | head -40
    fail=1
  fi
done <<EOF_LIST
0 --version
0 --help
0 size --mass 5.3kg --speed 6.1m/s --family conical --site-elevation 1380m --surface-temp 38C --surface-pressure 858hPa
0 size --mission "$M" --format json
0 size --mass 2kg --speed 5m/s --family cross --cluster 3 --areal-mass 40g/m2 --format csv --units us
0 rate --mass 5.3kg --family conical --projected-diameter 1.5m --altitude 1380m,2000m,4000m --site-elevation 1380m --surface-temp 38C
0 rate --mission "$M" --altitude 1380m,1630m,4280m --format json
0 rate --mass 10kg --family flat-circular --nominal-diameter 2m --drag-coefficient 1.4 --drag-reference projected -o "$tmp/rate.txt"
0 air --from 0 --to 30km --step 5km
0 air --sounding "$tmp/sounding.csv" --format csv
0 air --temp-offset 15C --altitude 0,1km,11km --units us --format json
0 canopies
0 canopies cross
0 canopies --models --format json
0 check "$M" "$root/canopies/conical.yaml"
2 check "$root/payloads/four-mistakes.yaml" "$tmp/sounding.csv" "$tmp/bad-drag.csv" "$root/payloads/demo-flight.csv" "$root/payloads/balloon-winds.csv"
2 check "$tmp/tabs.yaml"
0 --completion bash
0 sweep --help
2 air --temp-offset 5C --temp-offset 6C
2 size --mass 2kg --speed 5m/s --famly cross
2 profile "$M" --fast=1
0 canopies --data "$tmp/mine" --data "$root" --format csv
0 rate --mass 2kg --family conical --nominal-diameter 1.5m --data "$tmp/mine"
0 sweep --mass 2kg --family conical --nominal-diameter 1.5m --from 0 --to 3km --step 1km --by temp-offset=-20C,25C --plot "$tmp/sweep"
1 profile "$M" --plot "$tmp/profile"
0 design "$M" --families main=annular --heights main=150m..300m/4 --top 2 --plot "$tmp/design"
0 design "$root/payloads/drone-cargo-drop.yaml" --format json --risk-samples 100 --write "$tmp/design.yaml"
0 profile "$tmp/design.yaml" --format csv
0 design "$M" --optional drogue --families drogue=conical --families main=annular --heights main=150m..300m/3 --objective drift --units us --threads 1
1 design "$tmp/nodesign.yaml" --write "$tmp/never.yaml"
2 design "$M" --diameters drogue=3m..1m
0 loads --mission "$M" --plot "$tmp/loads"
0 loads --mission "$root/payloads/desert-club-rocket-revised.yaml" --stage main --limits-at typical --format json
0 profile "$root/payloads/desert-club-rocket-revised.yaml" --limits-at typical --format csv
1 profile "$root/payloads/desert-club-rocket-revised.yaml" --fail drogue --fast
0 freefall --body cylinder --diameter 10cm --length 80cm --mass 3kg --trace --altitude 0:4km:2km --plot "$tmp/ff"
1 dispersion "$M" -n 200 --seed 3 --threads 2 --samples "$tmp/samples.csv" --plot "$tmp/disp"
1 size --mass 0.1kg --speed 0.5m/s --family conical --areal-mass 1500g/m2
2 size --mass 2kg --speed 5 --family conicle
2 size --mission "$tmp/bad.yaml" --speed 5
2 rate --mass 2kg --family conical
2 air --altitude 90km
2 air -o "$tmp/missing/dir/out.txt"
2 check "$tmp/bad.yaml" "$tmp/nonexistent.yaml"
2 frobnicate
2 sweep --mass 2kg --family conical --nominal-diameter 1.5m --from 0 --to 1km --step 0
0 air -o "$tmp/dangling.txt"
0 freefall --mass 1kg --diameter 10cm --plot "$tmp/n1/n2/n3/ff"
2 dispersion "$M" -n 10 -o "$tmp/x.txt" --samples "$tmp/x.txt"
2 profile "$M" -o "$M"
2 dispersion "$M" -n 0 --plot "$tmp/d1/d2/d3/fig" --samples "$tmp/s2.csv"
2 size --mass 2kg --mass 3kg --speed 5m/s --family conical
2 rate -n 5
2 size --mission "$tmp/alias.yaml" --speed 5m/s
2 check "$tmp/escape.yaml"
2 profile "$tmp/bad.yaml"
2 freefall --cd-table "$tmp/bad-drag.csv" --diameter 10cm --mass 1kg
2 dispersion "$M" -n 200 --samples "$tmp/missing/dir/s.csv"
0 fit "$root/payloads/demo-flight.csv" --mission "$M" --pressure-altitude --write-canopy "$tmp/main.yaml" --write-wind "$tmp/wind.csv" --plot "$tmp/fit"
0 fit "$root/payloads/demo-flight.csv" "$root/payloads/demo-flight.csv" --mass 5.3kg --format json
2 fit "$tmp/bad-drag.csv" --mass 2kg
0 rate --mass 50kg --nominal-diameter 30cm --altitude 30km --family conical --units us
0 sweep --mass 50kg --family conical --vary speed --values 0.8m/s,200m/s --altitude 20km
1 sweep --mass 2kg --family conical --vary speed --values 0.01m/s
0 check "$tmp/windy.yaml"
2 rate --mass 2.65 --flat-diameter 36 --family flat-circular --units us
0 profile "$root/payloads/desert-club-rocket-revised.yaml" --trajectory "$tmp/traj.csv" --geojson "$tmp/map.geojson" --band-ends --units us
0 profile "$root/payloads/desert-club-rocket-revised.yaml" --trajectory "$tmp/traj.json" --format csv --table touchdown
1 dispersion "$M" -n 200 --seed 3 --geojson "$tmp/disp.geojson" --geojson-samples 50 --table percentiles
2 profile "$root/payloads/drone-cargo-drop.yaml" --geojson "$tmp/none.geojson"
2 profile "$M" --table failure_case --format csv
0 size --mass 12lbs --speed 23m/s --family cross --site-elevation 1380m --altitude 1580m --units us --table values
EOF_LIST
[ $fail -eq 0 ] && echo "valgrind: $n CLI examples clean (no memory errors, no definite or indirect leaks)"
exit $fail
