#!/usr/bin/python3
"""Reference values for the orientation factor of `axis` targets (lib/analysis/dexterity.ts),
computed with numpy's SVD, independently of the TypeScript code.

Run with Debian's interpreter: /usr/bin/python3 tests/reference/axis_dexterity_reference.py
Writes tests/reference/fixtures/axis_dexterity_reference.json (deterministic: fixed seed).

Definition checked (docs of dexterityAt): J_t, J_r the translational and rotational 3xn blocks of
the geometric Jacobian at the tool point; P = I - V V^T the projector onto the null space of J_t
(V its right singular vectors with sigma > 1e-6 sigma_1); J_o = J_r P, the rotations that keep the
tool point still; for an axis target only the rotations about the tool's x and y axes are
constrained, so the block is the 2xn matrix A = [x^T J_o; y^T J_o] and the factor is
sigma_2(A) / sigma_1(A). The full three-direction block J_o is reported beside it.
Cases: random 6xn matrices with random tool frames (some with a joint that only spins the tool
about its own z axis, which must not count), and a 6-axis DH arm at a few configurations with its
own numpy forward kinematics and Jacobian (analysis_reference.py).
"""
import math
import os

import numpy as np

from analysis_reference import ARM, frames, point_jacobian, write_fixture

OUT = os.path.join(os.path.dirname(__file__), "fixtures", "axis_dexterity_reference.json")
rng = np.random.default_rng(20241202)
RANK_TOLERANCE = 1e-6
NOISE_FLOOR = 1e-12


def random_rotation():
    q, r = np.linalg.qr(rng.normal(size=(3, 3)))
    q = q @ np.diag(np.sign(np.diag(r)))
    if np.linalg.det(q) < 0:
        q[:, 0] = -q[:, 0]
    return q


def blocks(J, R):
    Jt, Jr = J[:3], J[3:]
    _, s, vt = np.linalg.svd(Jt)
    keep = s > RANK_TOLERANCE * s[0]
    V = vt[: len(s)][keep].T
    P = np.eye(J.shape[1]) - V @ V.T
    Jo = Jr @ P
    x, y = R[:, 0], R[:, 1]
    A = np.vstack([x @ Jo, y @ Jo])
    sa = np.linalg.svd(A, compute_uv=False)
    so = np.linalg.svd(Jo, compute_uv=False)
    so = np.concatenate([so, np.zeros(3 - len(so))])
    sa = np.concatenate([sa, np.zeros(2 - len(sa))])
    # Singular values at the rounding-noise level (a direction the block cannot move) are exact
    # zeros: their digits, and ratios of two of them, depend on the machine's LAPACK kernels.
    so[so < NOISE_FLOOR] = 0.0
    sa[sa < NOISE_FLOOR] = 0.0
    return sa, so


def random_cases():
    cases = []
    for t in range(40):
        n = int(rng.integers(4, 9))
        J = np.vstack([rng.normal(scale=0.4, size=(3, n)), rng.normal(size=(3, n))])
        R = random_rotation()
        spin = t % 4 == 3
        if spin:
            # Joint n spins the tool about its own z axis through the tool point: (v, w) = (0, z).
            J[:3, n - 1] = 0.0
            J[3:, n - 1] = R[:, 2]
        sa, so = blocks(J, R)
        cases.append({"n": n, "jacobian": J.flatten().tolist(), "toolRotation": R.flatten().tolist(), "spinJoint": spin,
                      "sigmaAxis": sa.tolist(), "sigmaOrientation": so.tolist(),
                      "inverseConditionAxis": float(sa[1] / sa[0]) if sa[0] > 0 else 0.0})
    return cases


def arm_cases():
    tool = np.array(ARM["tool"]).reshape(4, 4)
    out = []
    for q in [[0.1, -0.4, 0.5, 0.3, 0.8, -0.2], [0.7, 0.2, -0.3, -1.0, 0.5, 0.4], [-0.5, 0.9, 0.6, 0.2, -1.2, 1.0], [0.0, 0.3, -0.2, 0.0, 0.05, 0.0]]:
        fr = frames(ARM, q)
        T = fr[-1] @ tool
        J = point_jacobian(fr, T[:3, 3], len(q))
        R = T[:3, :3]
        sa, so = blocks(J, R)
        out.append({"q": q, "jacobian": J.flatten().tolist(), "toolRotation": R.flatten().tolist(),
                    "sigmaAxis": sa.tolist(), "sigmaOrientation": so.tolist(), "inverseConditionAxis": float(sa[1] / sa[0])})
    return {"arm": ARM, "cases": out}


def main():
    data = {"source": "tests/reference/axis_dexterity_reference.py (numpy %s)" % np.__version__,
            "random": random_cases(), "arm": arm_cases()}
    write_fixture(OUT, data)


if __name__ == "__main__":
    main()
