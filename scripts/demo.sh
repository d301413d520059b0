#!/bin/sh
# demo.sh - the main job on the demo payload: size the main canopy of the
# invented club rocket for its touchdown-speed limit, check its rate, then
# the staged descent of the revised design with its failure cases.
set -eu
bin=${1:-build/sinkrate}
mission=payloads/desert-club-rocket.yaml
echo "\$ sinkrate size --mission $mission"
"$bin" size --mission "$mission"
echo
echo "\$ sinkrate rate --mission $mission --altitude 1380m,1630m,4280m"
"$bin" rate --mission "$mission" --altitude 1380m,1630m,4280m
echo
# the revised design meets its limits; its failure cases (no canopy, drogue
# only) are what-if results far beyond them that do not change the exit code
revised=payloads/desert-club-rocket-revised.yaml
echo "\$ sinkrate profile $revised"
"$bin" profile "$revised"
