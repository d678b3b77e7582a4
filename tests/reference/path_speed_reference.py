#!/usr/bin/python3
"""Reference values for the exact achievable path speed (lib/analysis/speed.ts), computed with
Orocos KDL (PyKDL) and scipy's linprog (HiGHS), independently of the TypeScript code.

Run with Debian's interpreter, after path_speed_cases.ts has written the cases:
    /usr/bin/python3 tests/reference/path_speed_reference.py
Reads tests/reference/fixtures/path_speed_cases.json (arms, and per sample a configuration q, the
required twist (v, w) in the base frame and the constraint mode) and writes
tests/reference/fixtures/path_speed_reference.json with, per sample, the largest s of

    maximise s  subject to  A qd = s xd,  -vmax_j <= qd_j <= vmax_j (joints with a limit),
                            qd_j >= 0 at a lower position limit, qd_j <= 0 at an upper one,

where (definitions of speed.ts, written again here):
  - J is the geometric Jacobian at the tool point from KDL (ChainJntToJacSolver, chain built as in
    kdl_fixtures.py), rows vx vy vz wx wy wz, base frame;
  - pose: A = J, xd = (v, w); axis: A = [J_v; x^T J_w; y^T J_w], xd = (v, x.w, y.w) with x, y the
    tool's x and y axes from KDL's forward kinematics; point: A = J_v, xd = v;
  - a joint sits at a limit when within 0.5 % of its range of it (atLimitFraction).
linprog returns status 3 when s is unbounded (written as null).
"""
import json
import os

import numpy as np
import PyKDL as kdl
from scipy.optimize import linprog

from kdl_fixtures import build_chain

HERE = os.path.dirname(os.path.abspath(__file__))
CASES = os.path.join(HERE, "fixtures", "path_speed_cases.json")
OUT = os.path.join(HERE, "fixtures", "path_speed_reference.json")


def kinematics(chain, q):
    n = len(q)
    qk = kdl.JntArray(n)
    for i, v in enumerate(q):
        qk[i] = v
    f = kdl.Frame()
    assert kdl.ChainFkSolverPos_recursive(chain).JntToCart(qk, f) >= 0
    jac = kdl.Jacobian(n)
    assert kdl.ChainJntToJacSolver(chain).JntToJac(qk, jac) >= 0
    J = np.array([[jac[r, c] for c in range(n)] for r in range(6)])
    R = np.array([[f.M[i, j] for j in range(3)] for i in range(3)])
    return J, R


def task(J, R, twist, mode):
    v, w = np.array(twist[:3]), np.array(twist[3:])
    if mode == "pose":
        return J, np.concatenate([v, w])
    if mode == "point":
        return J[:3], v
    x, y = R[:, 0], R[:, 1]
    A = np.vstack([J[:3], x @ J[3:], y @ J[3:]])
    return A, np.concatenate([v, [x @ w, y @ w]])


def speed_ratio(A, xd, joints, q, fraction):
    m, n = A.shape
    bounds, at_limit = [], []
    for j, (jt, qj) in enumerate(zip(joints, q)):
        vmax = jt.get("maxSpeed")
        lo, hi = (-vmax, vmax) if vmax else (None, None)
        band = fraction * (jt["max"] - jt["min"])
        if qj <= jt["min"] + band:
            lo = 0.0
            at_limit.append(j + 1)
        if qj >= jt["max"] - band:
            hi = 0.0
            if (j + 1) not in at_limit:
                at_limit.append(j + 1)
        bounds.append((lo, hi))
    bounds.append((0.0, None))  # s >= 0
    c = np.zeros(n + 1)
    c[-1] = -1.0
    A_eq = np.hstack([A, -xd.reshape(-1, 1)])
    res = linprog(c, A_eq=A_eq, b_eq=np.zeros(m), bounds=bounds, method="highs-ds",
                  options={"primal_feasibility_tolerance": 1e-10, "dual_feasibility_tolerance": 1e-10})
    if res.status == 3:
        return None, at_limit
    assert res.status == 0, res.message
    return float(res.x[-1]), at_limit


def main():
    with open(CASES) as f:
        cases = json.load(f)
    chains = [build_chain(arm) for arm in cases["arms"]]
    ratios, limits = [], []
    for s in cases["samples"]:
        arm = cases["arms"][s["arm"]]
        J, R = kinematics(chains[s["arm"]], s["q"])
        A, xd = task(J, R, s["twist"], s["mode"])
        r, at = speed_ratio(A, xd, arm["joints"], s["q"], cases["atLimitFraction"])
        ratios.append(r)
        limits.append(at)
    doc = {"source": "tests/reference/path_speed_reference.py (PyKDL Jacobians, scipy %s linprog HiGHS dual simplex)" % __import__("scipy").__version__,
           "ratios": ratios, "atLimit": limits}
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")
    print("wrote", OUT, len(ratios), "samples")


if __name__ == "__main__":
    main()
