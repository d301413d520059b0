#!/bin/sh
# demo.sh - the main job on the demo payload: size the main canopy of the
# invented club rocket for its touchdown-speed limit, then check its rate.
set -eu
bin=${1:-build/sinkrate}
mission=payloads/desert-club-rocket.yaml
echo "\$ sinkrate size --mission $mission"
"$bin" size --mission "$mission"
echo
echo "\$ sinkrate rate --mission $mission --altitude 1380m,1630m,4280m"
"$bin" rate --mission "$mission" --altitude 1380m,1630m,4280m
