#!/bin/sh
# Regenerates the committed reference fixtures in place (deterministic: same files each run):
# Orocos KDL forward kinematics and Jacobians, and the numpy/scipy analysis references.
# Needs Debian's python3-pykdl, python3-numpy and python3-scipy; run from anywhere.
set -eu
cd "$(dirname "$0")"
/usr/bin/python3 kdl_fixtures.py
/usr/bin/python3 analysis_reference.py
/usr/bin/python3 axis_dexterity_reference.py
