#!/usr/bin/python3
"""Reference fixtures from Orocos KDL (PyKDL, Debian python3-pykdl).

Builds random invented arms (3, 6 and 7 joints; standard `dh` and modified `mdh` DH; some
prismatic joints; with base and tool transforms) as KDL chains, evaluates forward kinematics and
the geometric Jacobian at the tool point for several configurations, and writes
fixtures/kdl.json. Deterministic: fixed numpy seed, so regenerating gives the same file.

Chain construction (facts about KDL, see its segment.hpp / joint.hpp):
- A KDL Segment applies its joint at the segment's ROOT, then the tip frame.
- `dh`:  Segment(Joint(RotZ | TransZ), Frame.DH(a, alpha, d, theta)), since
  Rz(q)·Rz(θ)Tz(d)Tx(a)Rx(α) = Rz(θ+q)Tz(d)Tx(a)Rx(α) (and Tz(q) commutes with Rz(θ)).
- `mdh`: the joint axis is z AFTER Rx(α)Tx(a), so the joint goes at origin (a, 0, 0) with axis
  Rx(α)·z, and the tip is Frame.DH_Craig1989(a, alpha, d, theta) = Rx(α)Tx(a)Rz(θ)Tz(d).
- base and tool are fixed segments before and after the joints.
- ChainJntToJacSolver gives the Jacobian at the chain tip, in the base frame, rows vx vy vz wx wy wz.

Run with /usr/bin/python3 (the interpreter that can import Debian's PyKDL).
"""
import json
import math
import os
import sys

import numpy as np
import PyKDL as kdl

SEED = 20240611
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "fixtures", "kdl.json")


def rpy_matrix(rng, reach):
    r, p, y = rng.uniform(-math.pi, math.pi), rng.uniform(-math.pi / 2, math.pi / 2), rng.uniform(-math.pi, math.pi)
    rot = kdl.Rotation.RPY(r, p, y)  # KDL RPY: fixed axes X, Y, Z -> Rz(y)Ry(p)Rx(r)
    pos = rng.uniform(-reach, reach, 3)
    m = [[rot[i, j] for j in range(3)] + [float(pos[i])] for i in range(3)] + [[0.0, 0.0, 0.0, 1.0]]
    return [float(v) for row in m for v in row]


def to_frame(m):
    rot = kdl.Rotation(m[0], m[1], m[2], m[4], m[5], m[6], m[8], m[9], m[10])
    return kdl.Frame(rot, kdl.Vector(m[3], m[7], m[11]))


def frame_to_list(f):
    out = []
    for i in range(3):
        out += [f.M[i, 0], f.M[i, 1], f.M[i, 2], f.p[i]]
    return out + [0.0, 0.0, 0.0, 1.0]


def random_arm(rng, n, convention, name):
    joints = []
    for i in range(n):
        prismatic = i > 0 and rng.uniform() < 0.25
        if rng.uniform() < 0.6:
            alpha = float(rng.choice([0.0, math.pi / 2, -math.pi / 2, math.pi]))
        else:
            alpha = float(rng.uniform(-math.pi, math.pi))
        a = 0.0 if rng.uniform() < 0.25 else float(rng.uniform(0.05, 0.5))
        d = 0.0 if rng.uniform() < 0.3 else float(rng.uniform(-0.5, 0.5))
        theta = float(rng.uniform(-math.pi, math.pi))
        if prismatic:
            joints.append(dict(type="prismatic", a=a, alpha=alpha, d=d, theta=theta, min=0.0, max=float(rng.uniform(0.1, 0.3))))
        else:
            lim = float(rng.uniform(math.pi / 2, math.pi))
            joints.append(dict(type="revolute", a=a, alpha=alpha, d=d, theta=theta, min=-lim, max=lim))
    return dict(name=name, convention=convention, joints=joints, base=rpy_matrix(rng, 0.3), tool=rpy_matrix(rng, 0.15))


def build_chain(arm):
    chain = kdl.Chain()
    if arm.get("base") is not None:
        chain.addSegment(kdl.Segment(kdl.Joint(kdl.Joint.Fixed), to_frame(arm["base"])))
    for j in arm["joints"]:
        a, alpha, d, theta = j["a"], j["alpha"], j["d"], j["theta"]
        prismatic = j["type"] == "prismatic"
        if arm["convention"] == "dh":
            joint = kdl.Joint(kdl.Joint.TransZ if prismatic else kdl.Joint.RotZ)
            chain.addSegment(kdl.Segment(joint, kdl.Frame.DH(a, alpha, d, theta)))
        else:
            axis = kdl.Rotation.RotX(alpha) * kdl.Vector(0, 0, 1)
            jtype = kdl.Joint.TransAxis if prismatic else kdl.Joint.RotAxis
            joint = kdl.Joint(kdl.Vector(a, 0, 0), axis, jtype)
            chain.addSegment(kdl.Segment(joint, kdl.Frame.DH_Craig1989(a, alpha, d, theta)))
    if arm.get("tool") is not None:
        chain.addSegment(kdl.Segment(kdl.Joint(kdl.Joint.Fixed), to_frame(arm["tool"])))
    return chain


def main():
    rng = np.random.default_rng(SEED)
    cases = []
    for n in (3, 6, 7):
        for convention in ("dh", "mdh"):
            for k in range(2):
                arm = random_arm(rng, n, convention, f"kdl-random-{convention}-{n}-{k + 1}")
                chain = build_chain(arm)
                fk = kdl.ChainFkSolverPos_recursive(chain)
                jac_solver = kdl.ChainJntToJacSolver(chain)
                configs, poses, jacobians = [], [], []
                for _ in range(5):
                    q = [float(rng.uniform(j["min"], j["max"])) for j in arm["joints"]]
                    qk = kdl.JntArray(n)
                    for i, v in enumerate(q):
                        qk[i] = v
                    f = kdl.Frame()
                    assert fk.JntToCart(qk, f) >= 0
                    jac = kdl.Jacobian(n)
                    assert jac_solver.JntToJac(qk, jac) >= 0
                    configs.append(q)
                    poses.append(frame_to_list(f))
                    jacobians.append([[jac[r, c] for c in range(n)] for r in range(6)])
                cases.append(dict(arm=arm, configs=configs, toolPose=poses, jacobian=jacobians))
    doc = dict(
        source="Orocos KDL via PyKDL (ChainFkSolverPos_recursive, ChainJntToJacSolver); tests/reference/kdl_fixtures.py",
        seed=SEED,
        note="poses row-major 4x4; jacobian 6xn rows vx vy vz wx wy wz, base frame, at the tool point",
        cases=cases,
    )
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")
    print(f"wrote {OUT}: {len(cases)} arms", file=sys.stderr)


if __name__ == "__main__":
    main()
