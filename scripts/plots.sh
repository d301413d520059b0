#!/bin/sh
# plots.sh - the README's figures from the invented demo scenario, made by
# `sinkrate sweep --plot` and the other commands and rendered by gnuplot:
# scripts and data go to OUT (build/plots/), the PNGs to IMG (plots/).
# usage: plots.sh [SINKRATE [OUT [IMG]]]   (tests/figures.py renders them all in a temporary directory)
set -eu
bin=${1:-build/sinkrate}
mission=payloads/desert-club-rocket.yaml
out=${2:-build/plots}
img=${3:-plots}
mkdir -p "$out" "$img"
command -v gnuplot >/dev/null 2>&1 || { echo "plots: gnuplot is not on PATH (Debian: gnuplot-nox)"; exit 1; }

fig() {
  name=$1; shift
  "$bin" sweep --mission "$mission" --plot "$out/$name" "$@" > "$out/$name.txt"
  cp "$out/$name.png" "$img/$name.png"
}

# drogue and main of the demo rocket over its descent, touchdown limit and main deployment marked
fig descent-vs-altitude --figure rate
# time to the ground from each altitude under each canopy alone
fig time-vs-altitude --figure time
# three candidate mains over payload mass at the hot, high site
fig rate-vs-mass --vary mass --from 2kg --to 10kg --step 0.1kg \
  --family conical --nominal-diameter 2.2m --family annular --nominal-diameter 2.0m \
  --family flat-circular --nominal-diameter 2.4m
# the nominal diameter each family needs for a target speed, 5.3 kg at the site
fig diameter-vs-speed --vary speed --from 3m/s --to 10m/s --step 0.05m/s \
  --family conical --family annular --family flat-circular --family cross
# the main canopy's touchdown rate on a cold, a standard and a hot day at sites of different elevation
fig rate-vs-site --vary site-elevation --from 0 --to 3000m --step 50m \
  --family conical --nominal-diameter 2.2m --by temp-offset=-20C,0C,20C,32C
# other commands' figures: exit 1 (a limit broken) still draws the figure
other() {
  name=$1; shift
  "$bin" "$@" --plot "$out/$name" > "$out/$name.txt" || [ $? -eq 1 ]
}
# the revised demo flown down: height, rates and airspeed over time; the ground track
other profile profile payloads/desert-club-rocket-revised.yaml
cp "$out/profile.png" "$img"/profile.png
cp "$out/profile-track.png" "$img"/profile-track.png
# the design search on the first demo rocket: the Pareto front of drift against touchdown speed
other design-front design "$mission"
cp "$out/design-front.png" "$img"/design-front.png
# the landing scatter of the original demo under its uncertainty block
other scatter dispersion "$mission" -n 100000 --seed 1
cp "$out/scatter.png" "$img"/scatter.png
# opening load of the demo main, the ODE force against time and the closed-form peaks
other loads loads --mission payloads/desert-club-rocket-revised.yaml --stage main
cp "$out/loads-main.png" "$img"/loads-main.png 2>/dev/null || cp "$out/loads.png" "$img"/loads-main.png
# a 1 kg, 0.2 m cylinder through the drag crisis: three equilibria
other freefall freefall --body cylinder --diameter 0.2m --length 1m --mass 9kg --altitude 0,5km,10km
cp "$out/freefall.png" "$img"/freefall.png

# the invented demo flight log fitted: the fit over time with residuals, the drag area over height
other fit fit payloads/demo-flight.csv --mission payloads/desert-club-rocket.yaml --pressure-altitude
cp "$out/fit.png" "$img"/fit.png
cp "$out/fit-drag.png" "$img"/fit-drag.png
echo "plots: wrote $(ls "$img"/*.png | tr '\n' ' ')"
