#!/bin/sh
# Regenerates the committed reference fixtures in place (deterministic: same files each run):
# Orocos KDL forward kinematics and Jacobians, the numpy/scipy analysis references, and the FCL
# distance and collision answers. Needs Debian's python3-pykdl, python3-numpy, python3-scipy,
# libfcl-dev and g++; run from anywhere.
set -eu
cd "$(dirname "$0")"
/usr/bin/python3 kdl_fixtures.py
/usr/bin/python3 analysis_reference.py
/usr/bin/python3 axis_dexterity_reference.py
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
g++ -O2 -std=c++17 fcl_fixtures.cpp -I/usr/include/eigen3 -lfcl -lccd -o "$tmp/fcl_fixtures"
"$tmp/fcl_fixtures" > fixtures/fcl.json
