#!/usr/bin/python3
"""Reference fixtures for URDF chains from Orocos KDL (PyKDL, Debian python3-pykdl), cross-checked
against a plain numpy/scipy reading of the URDF specification.

For each invented URDF file in tests/reference/urdf and a chosen base and tip link, the serial
chain is built the way KDL's own URDF parser (kdl_parser) builds it, one KDL Segment per URDF joint
on the path from base to tip:
- F = Frame(Rotation.RPY(roll, pitch, yaw), Vector(xyz)): the joint origin in the parent link
  (KDL's RPY is about the fixed axes X, Y, Z: Rz(yaw)·Ry(pitch)·Rx(roll), as in URDF);
- a revolute or continuous joint is Joint(name, F.p, F.M·axis, RotAxis), a prismatic one
  Joint(name, F.p, F.M·axis, TransAxis) (the axis through the joint origin, in parent coordinates),
  a fixed one Joint(Fixed); the segment's tip frame is F;
- so Segment.pose(q) = Rot(F.M·axis, q) about the line through F.p, then F, which equals
  F·Rot(axis, q): the URDF joint transform.
ChainFkSolverPos_recursive gives the tip link's pose and ChainJntToJacSolver the Jacobian at the
tip link's origin in the base link's frame (rows vx vy vz wx wy wz).

The numpy reading composes Trans(xyz)·Rz·Ry·Rx per origin and scipy's Rotation.from_rotvec(u·q)
for the joint motion, and forms the geometric Jacobian column by column; KDL and numpy must agree
to 1e-12 before the fixture is written. Configurations are drawn within the limits (continuous
joints in ±π) from a fixed numpy seed, so regenerating gives the same file.

Run with /usr/bin/python3 (the interpreter that can import Debian's PyKDL).
"""
import json
import math
import os
import xml.etree.ElementTree as ET

import numpy as np
import PyKDL as kdl
from scipy.spatial.transform import Rotation

SEED = 20261202
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "fixtures", "urdf_kdl.json")
CONFIGS = 6

# (file, base link, tip link): every case names both; the importer's defaults are tested separately.
CASES = [
    ("slanted-six.urdf", "base_link", "tool0"),
    ("rail-wrist.urdf", "floor_plate", "tip"),
    ("twin-branch.urdf", "pedestal", "right_tool"),
    ("twin-branch.urdf", "torso", "left_tip"),
]

MOVING = {"revolute", "continuous", "prismatic"}


def vec(text, default):
    if text is None:
        return list(default)
    return [float(v) for v in text.split()]


def read_joints(path):
    root = ET.parse(path).getroot()
    joints = {}
    for j in root.findall("joint"):
        o = j.find("origin")
        axis = j.find("axis")
        limit = j.find("limit")
        joints[j.find("child").get("link")] = dict(
            name=j.get("name"),
            type=j.get("type"),
            parent=j.find("parent").get("link"),
            xyz=vec(o.get("xyz") if o is not None else None, (0, 0, 0)),
            rpy=vec(o.get("rpy") if o is not None else None, (0, 0, 0)),
            axis=vec(axis.get("xyz") if axis is not None else None, (1, 0, 0)),
            lower=float(limit.get("lower", 0)) if limit is not None else None,
            upper=float(limit.get("upper", 0)) if limit is not None else None,
        )
    return joints


def path_between(joints, base, tip):
    path = []
    at = tip
    while at != base:
        j = joints[at]
        path.append(j)
        at = j["parent"]
    return list(reversed(path))


def kdl_chain(path):
    chain = kdl.Chain()
    for j in path:
        r, p, y = j["rpy"]
        F = kdl.Frame(kdl.Rotation.RPY(r, p, y), kdl.Vector(*j["xyz"]))
        if j["type"] == "fixed":
            joint = kdl.Joint(j["name"], kdl.Joint.Fixed)
        else:
            a = np.array(j["axis"], dtype=float)
            a = a / np.linalg.norm(a)
            axis = F.M * kdl.Vector(*a)
            kind = kdl.Joint.TransAxis if j["type"] == "prismatic" else kdl.Joint.RotAxis
            joint = kdl.Joint(j["name"], F.p, axis, kind)
        chain.addSegment(kdl.Segment(j["name"], joint, F))
    return chain


def kdl_fk_jac(chain, q):
    n = chain.getNrOfJoints()
    qa = kdl.JntArray(n)
    for i, v in enumerate(q):
        qa[i] = v
    f = kdl.Frame()
    kdl.ChainFkSolverPos_recursive(chain).JntToCart(qa, f)
    J = kdl.Jacobian(n)
    kdl.ChainJntToJacSolver(chain).JntToJac(qa, J)
    pose = [f.M[0, 0], f.M[0, 1], f.M[0, 2], f.p[0], f.M[1, 0], f.M[1, 1], f.M[1, 2], f.p[1], f.M[2, 0], f.M[2, 1], f.M[2, 2], f.p[2], 0.0, 0.0, 0.0, 1.0]
    jac = [[J[r, c] for c in range(n)] for r in range(6)]
    return pose, jac


def origin_np(j):
    T = np.eye(4)
    T[:3, :3] = Rotation.from_euler("xyz", j["rpy"]).as_matrix()  # extrinsic x, y, z = Rz·Ry·Rx
    T[:3, 3] = j["xyz"]
    return T


def numpy_fk_jac(path, q):
    T = np.eye(4)
    axes = []
    k = 0
    for j in path:
        T = T @ origin_np(j)
        if j["type"] in MOVING:
            u = np.array(j["axis"], dtype=float)
            u = u / np.linalg.norm(u)
            M = np.eye(4)
            if j["type"] == "prismatic":
                M[:3, 3] = u * q[k]
            else:
                M[:3, :3] = Rotation.from_rotvec(u * q[k]).as_matrix()
            T = T @ M
            axes.append((j["type"], T[:3, :3] @ u, T[:3, 3].copy()))
            k += 1
    p = T[:3, 3]
    cols = []
    for kind, a, o in axes:
        cols.append(np.concatenate([a, np.zeros(3)]) if kind == "prismatic" else np.concatenate([np.cross(a, p - o), a]))
    J = np.array(cols).T
    return [float(v) for v in T.reshape(-1)], [[float(v) for v in row] for row in J]


def main():
    rng = np.random.default_rng(SEED)
    cases = []
    worst = 0.0
    for file, base, tip in CASES:
        joints = read_joints(os.path.join(HERE, "urdf", file))
        path = path_between(joints, base, tip)
        moving = [j for j in path if j["type"] in MOVING]
        chain = kdl_chain(path)
        assert chain.getNrOfJoints() == len(moving)
        configs, poses, jacs, np_poses, np_jacs = [], [], [], [], []
        for _ in range(CONFIGS):
            q = []
            for j in moving:
                lo, hi = (-math.pi, math.pi) if j["type"] == "continuous" else (j["lower"], j["upper"])
                q.append(float(rng.uniform(lo, hi)))
            pose, jac = kdl_fk_jac(chain, q)
            npose, njac = numpy_fk_jac(path, q)
            worst = max(worst, float(np.max(np.abs(np.array(pose) - np.array(npose)))), float(np.max(np.abs(np.array(jac) - np.array(njac)))))
            configs.append(q)
            poses.append(pose)
            jacs.append(jac)
            np_poses.append(npose)
            np_jacs.append(njac)
        cases.append(dict(file=file, base=base, tip=tip, joints=[j["name"] for j in moving], configs=configs, pose=poses, jacobian=jacs, numpyPose=np_poses, numpyJacobian=np_jacs))
    if worst > 1e-12:
        raise SystemExit(f"KDL and the numpy reading disagree by {worst:.3e} (> 1e-12)")
    doc = dict(
        source="Orocos KDL (PyKDL) ChainFkSolverPos_recursive / ChainJntToJacSolver on chains built from URDF joint origins; numpy/scipy reading of the URDF specification as a cross-check",
        kdlVsNumpyMaxDifference=float(f"{worst:.3e}"),
        cases=cases,
    )
    with open(OUT, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")
    print(f"wrote {OUT}: {len(cases)} chains, KDL vs numpy max difference {worst:.2e}")


if __name__ == "__main__":
    main()
