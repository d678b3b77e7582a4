#!/bin/sh
# Regenerates the committed KDL reference fixtures in place (deterministic: same file each run).
# Needs Debian's python3-pykdl and python3-numpy; run from anywhere.
set -eu
cd "$(dirname "$0")"
/usr/bin/python3 kdl_fixtures.py
