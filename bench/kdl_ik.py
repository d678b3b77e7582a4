#!/usr/bin/python3
"""Orocos KDL baseline for the IK benchmark (run by bench/kinematics.ts when PyKDL imports).

Reads {"sets": [{"name", "arms": [arm JSON], "targets": [{"arm": index, "pose": [16]}]}]} from the
file given as argv[1] and prints one JSON line per run: for each set, the number of targets
reached and the per-target solve times (ms). Protocol: ChainIkSolverPos_LMA with equal task
weights (1,1,1,1,1,1), eps 1e-5, maxiter 500, eps_joints 1e-15; first start at the neutral
configuration (0, or mid-range where 0 is outside the limits), then up to 10 random in-limit
restarts (numpy seed fixed); each answer wrapped into the limits (revolute ±2π) and accepted when
position error ≤ 1e-5 m, rotation error ≤ 1e-4 rad and every joint within its limits (the same
test as Armsift's "reached"). KDL's LMA ignores joint limits, hence the wrap-and-check.
"""
import json
import math
import os
import sys
import time

import numpy as np
import PyKDL as kdl

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests", "reference"))
from kdl_fixtures import build_chain, to_frame  # noqa: E402

TWO_PI = 2 * math.pi


def wrap(arm, q):
    out = []
    ok = True
    for j, v in zip(arm["joints"], q):
        lo, hi = j["min"], j["max"]
        if j["type"] == "revolute" and (v < lo or v > hi):
            w = lo + ((v - lo) % TWO_PI)
            if w <= hi:
                v = w
        out.append(v)
        if v < lo - 1e-12 or v > hi + 1e-12:
            ok = False
    return out, ok


def errors(fk, n, q, target):
    qk = kdl.JntArray(n)
    for i, v in enumerate(q):
        qk[i] = v
    f = kdl.Frame()
    fk.JntToCart(qk, f)
    dp = (f.p - target.p).Norm()
    rot = (target.M * f.M.Inverse()).GetRotAngle()[0]
    return dp, abs(rot)


def main():
    doc = json.load(open(sys.argv[1]))
    rng = np.random.default_rng(12345)
    out = []
    for s in doc["sets"]:
        solvers = []
        for arm in s["arms"]:
            chain = build_chain(arm)
            n = len(arm["joints"])
            # hold the chain: PyKDL solvers keep only a C++ reference to it
            solvers.append((chain, kdl.ChainIkSolverPos_LMA(chain, np.ones(6), 1e-5, 500, 1e-15), kdl.ChainFkSolverPos_recursive(chain), n))
        reached = 0
        times = []
        for t in s["targets"]:
            arm = s["arms"][t["arm"]]
            chain, ik, fk, n = solvers[t["arm"]]
            target = to_frame(t["pose"])
            lo = np.array([j["min"] for j in arm["joints"]])
            hi = np.array([j["max"] for j in arm["joints"]])
            start = time.perf_counter()
            ok = False
            for attempt in range(11):
                if attempt == 0:
                    seed = [0.0 if l <= 0 <= h else 0.5 * (l + h) for l, h in zip(lo, hi)]
                else:
                    seed = list(lo + rng.uniform(size=n) * (hi - lo))
                q0 = kdl.JntArray(n)
                for i, v in enumerate(seed):
                    q0[i] = v
                q = kdl.JntArray(n)
                ik.CartToJnt(q0, target, q)
                qw, inlim = wrap(arm, [q[i] for i in range(n)])
                if inlim:
                    dp, dr = errors(fk, n, qw, target)
                    if dp <= 1e-5 and dr <= 1e-4:
                        ok = True
                        break
            times.append((time.perf_counter() - start) * 1000)
            reached += ok
        out.append(dict(name=s["name"], reached=reached, total=len(s["targets"]), timesMs=times))
    print(json.dumps(dict(sets=out)))


if __name__ == "__main__":
    main()
