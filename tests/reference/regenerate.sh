#!/bin/sh
# Regenerates the committed reference fixtures in place (deterministic: same files each run):
# Orocos KDL forward kinematics and Jacobians (DH arms and URDF chains), and the numpy/scipy
# analysis references.
# Needs Debian's python3-pykdl, python3-numpy and python3-scipy; run from anywhere.
set -eu
cd "$(dirname "$0")"
/usr/bin/python3 kdl_fixtures.py
/usr/bin/python3 analysis_reference.py
/usr/bin/python3 urdf_kdl.py
