#!/bin/sh
# Regenerates the committed reference fixtures in place (deterministic: same files each run):
# Orocos KDL forward kinematics and Jacobians (DH arms and URDF chains), the numpy/scipy analysis
# references (axis-target dexterity, exact path speed by scipy's linprog on KDL Jacobians), and the
# FCL distance and collision answers. Needs Debian's python3-pykdl, python3-numpy, python3-scipy,
# libfcl-dev and g++; run from anywhere.
set -eu
cd "$(dirname "$0")"
/usr/bin/python3 kdl_fixtures.py
/usr/bin/python3 analysis_reference.py
/usr/bin/python3 urdf_kdl.py
/usr/bin/python3 axis_dexterity_reference.py
# Path speed: the product writes the sampled configurations, KDL and HiGHS answer them (needs the
# repository's node_modules; installed from the lockfile when missing, as npm test would).
[ -x ../../node_modules/.bin/tsx ] || (cd ../.. && npm ci --no-audit --no-fund)
(cd ../.. && node_modules/.bin/tsx tests/reference/path_speed_cases.ts)
/usr/bin/python3 path_speed_reference.py
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
g++ -O2 -std=c++17 fcl_fixtures.cpp -I/usr/include/eigen3 -lfcl -lccd -o "$tmp/fcl_fixtures"
"$tmp/fcl_fixtures" > fixtures/fcl.json
"$tmp/fcl_fixtures" cell > fixtures/fcl_cell.json
