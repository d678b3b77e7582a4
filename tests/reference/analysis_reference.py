#!/usr/bin/python3
"""Reference values for the capability analysis (lib/analysis), computed with numpy/scipy.

Run with Debian's interpreter (it has python3-numpy and python3-scipy):
    /usr/bin/python3 tests/reference/analysis_reference.py
Writes tests/reference/fixtures/analysis_reference.json. Every value here is computed from the
published formula named beside it, independently of the TypeScript code:
  - 2R Jacobian J = [[-l1 s1 - l2 s12, -l2 s12], [l1 c1 + l2 c12, l2 c12]]
    (docs/references.md#2r-dexterity-check-values; Craig ch. 5; Spong ch. 4), singular values by
    numpy.linalg.svd, Yoshikawa w = sqrt(det J Jt).
  - tau = J^T F (Craig ch. 5).
  - Gravity torque of a 2R arm in a vertical plane (Spong, planar elbow arm):
    g1 = (m1 lc1 + m2 l1) g c1 + m2 lc2 g c12, g2 = m2 lc2 g c12; payload capacity by the
    per-joint headroom ratio (docs/references.md#2r-gravity-and-payload-check-values), for
    g = 9.81 (the check values listed there) and g = 9.80665 (what the product uses).
  - SPD distances: affine-invariant via scipy.linalg.eigh(B, A) (generalised eigenvalues) and via
    logm(A^-1/2 B A^-1/2); log-Euclidean via scipy.linalg.logm (Pennec et al. 2006; Arsigny et
    al. 2006).
  - Force capability: scipy.optimize.linprog on max s s.t. -T <= tau_hold + b s <= T, s >= 0.
  - An end-to-end arm: a 6-joint standard-DH arm built here with numpy (own forward kinematics and
    geometric Jacobian), link masses, a tool load, torque limits; gravity torque, capability (LP)
    and payload capacity.
"""
import json
import math
import os

import numpy as np
from scipy.linalg import eigh, logm, sqrtm
from scipy.optimize import linprog

rng = np.random.default_rng(20240611)
OUT = os.path.join(os.path.dirname(__file__), "fixtures", "analysis_reference.json")


def write_fixture(path, data):
    """Writes a fixture as the tests read it: JSON, keys sorted, one-space indent, final newline."""
    with open(path, "w") as f:
        json.dump(data, f, indent=1, sort_keys=True)
        f.write("\n")
    print("wrote", path)


def jac2r(l1, l2, q1, q2):
    s1, c1 = math.sin(q1), math.cos(q1)
    s12, c12 = math.sin(q1 + q2), math.cos(q1 + q2)
    return np.array([[-l1 * s1 - l2 * s12, -l2 * s12], [l1 * c1 + l2 * c12, l2 * c12]])


def two_r_cases():
    cases = []
    for (l1, l2, q1d, q2d) in [(1, 1, 0, 90), (1, 1, 30, 60), (math.sqrt(2), 1, 0, 135), (math.sqrt(2), 1, 40, 135),
                               (1, 1, 0, 45), (1, 1, 0, 10), (1, 1, 0, 1), (1, 1, 20, -90), (0.7, 0.4, 15, 70)]:
        J = jac2r(l1, l2, math.radians(q1d), math.radians(q2d))
        s = np.linalg.svd(J, compute_uv=False)
        M = J @ J.T
        w = math.sqrt(np.linalg.det(M))
        lam = np.linalg.eigvalsh(M)
        d_ai_identity = float(np.sqrt(np.sum(np.log(lam) ** 2)))
        ls = np.log(s ** 2)
        scale_free = float(np.sqrt(np.sum((ls - ls.mean()) ** 2)))
        cases.append({
            "l1": l1, "l2": l2, "q": [math.radians(q1d), math.radians(q2d)],
            "sigma": s.tolist(), "w": w, "wClosedForm": l1 * l2 * abs(math.sin(math.radians(q2d))),
            "kappa": float(s[0] / s[1]), "forceSemiAxes": (1 / s).tolist(),
            "dAiIdentity": d_ai_identity, "isotropyDistance": scale_free,
        })
    return cases


def tau_example():
    l1, l2 = 1.0, 0.8
    q = [math.radians(30), math.radians(45)]
    J = jac2r(l1, l2, *q)
    F = np.array([10.0, -20.0])
    return {"l1": l1, "l2": l2, "q": q, "force": F.tolist(), "jacobian": J.tolist(), "tau": (J.T @ F).tolist()}


def gravity_2r(g):
    m1 = m2 = 1.0
    l1 = l2 = 1.0
    lc1 = lc2 = 0.5
    tmax = np.array([50.0, 20.0])
    rows = []
    for q1d, q2d in [(0, 0), (45, -45), (90, 0), (30, 60), (-20, 75)]:
        q1, q2 = math.radians(q1d), math.radians(q2d)
        g1 = (m1 * lc1 + m2 * l1) * g * math.cos(q1) + m2 * lc2 * g * math.cos(q1 + q2)
        g2 = m2 * lc2 * g * math.cos(q1 + q2)
        tau = np.array([g1, g2])
        # d tau / d m at the tip: J_v^T (0, g) with the vertical as the plane's second axis.
        dm = np.array([(l1 * math.cos(q1) + l2 * math.cos(q1 + q2)) * g, l2 * math.cos(q1 + q2) * g])
        caps = []
        for i in range(2):
            if abs(dm[i]) < 1e-12:
                caps.append(None)
            elif dm[i] > 0:
                caps.append((tmax[i] - tau[i]) / dm[i])
            else:
                caps.append((tmax[i] + tau[i]) / -dm[i])
        finite = [(c, i) for i, c in enumerate(caps) if c is not None]
        cap, joint = min(finite) if finite else (None, None)
        rows.append({"q": [q1, q2], "tau": tau.tolist(), "perJoint": caps, "capacity": cap,
                     "limitingJoint": None if joint is None else joint + 1})
    return {"g": g, "m": [m1, m2], "l": [l1, l2], "lc": [lc1, lc2], "maxTorque": tmax.tolist(), "rows": rows}


def random_spd(k):
    A = rng.normal(size=(k, k))
    return A @ A.T + 0.1 * np.eye(k)


def d_ai(A, B):
    lam = eigh(B, A, eigvals_only=True)
    return float(np.sqrt(np.sum(np.log(lam) ** 2)))


def d_ai_logm(A, B):
    Ais = np.linalg.inv(sqrtm(A))
    return float(np.linalg.norm(np.real(logm(Ais @ B @ Ais)), "fro"))


def d_le(A, B):
    return float(np.linalg.norm(np.real(logm(A) - logm(B)), "fro"))


def spd_cases():
    cases = []
    fixed = [
        (np.eye(2), np.diag([4.0, 0.25]), None),
        (np.array([[2.0, 1.0], [1.0, 2.0]]), np.diag([1.0, 3.0]), np.array([[1.0, 2.0], [0.5, 3.0]])),
    ]
    for k in [2, 3, 3, 3, 6]:
        fixed.append((random_spd(k), random_spd(k), rng.normal(size=(k, k))))
    for A, B, G in fixed:
        k = A.shape[0]
        case = {"k": k, "a": A.flatten().tolist(), "b": B.flatten().tolist(), "dAi": d_ai(A, B),
                "dAiLogm": d_ai_logm(A, B), "dLe": d_le(A, B)}
        if G is not None:
            GA, GB = G @ A @ G.T, G @ B @ G.T
            case.update({"g": G.flatten().tolist(), "dAiTransformed": d_ai(GA, GB), "dLeTransformed": d_le(GA, GB)})
        cases.append(case)
    return cases


def lp_capacity(a, b, T):
    idx = [i for i in range(len(a)) if not math.isnan(T[i])]
    if not idx:
        return {"status": "no-limits", "capacity": None}
    if any(abs(a[i]) > T[i] for i in idx):
        return {"status": "overloaded", "capacity": 0.0}
    A_ub, b_ub = [], []
    for i in idx:
        A_ub.append([b[i]]); b_ub.append(T[i] - a[i])
        A_ub.append([-b[i]]); b_ub.append(T[i] + a[i])
    res = linprog(c=[-1.0], A_ub=A_ub, b_ub=b_ub, bounds=[(0, None)], method="highs")
    if res.status == 3:
        return {"status": "unbounded", "capacity": None}
    assert res.status == 0, res.message
    return {"status": "bounded", "capacity": float(res.x[0])}


def capacity_cases():
    cases = []
    for t in range(60):
        n = int(rng.integers(2, 8))
        rows = 6 if t % 3 == 0 else 3
        J = rng.normal(scale=0.6, size=(6, n))
        T = rng.uniform(20, 200, size=n)
        if t % 5 == 1:
            T[int(rng.integers(0, n))] = float("nan")
        frac = 1.3 if t % 11 == 4 else 0.8
        a = rng.uniform(-frac, frac, size=n) * np.nan_to_num(T, nan=100.0)
        u = rng.normal(size=rows)
        u /= np.linalg.norm(u)
        if t % 13 == 7:
            # A direction that a joint does not feel: zero one column of J^T u by construction.
            J[:rows, 0] = 0.0
        if t == 9:
            # Unbounded: a force direction no joint feels (normal to both columns of a 2-joint arm).
            n, rows = 2, 3
            J = rng.normal(scale=0.6, size=(6, n)); T = T[:2]; a = a[:2]
            u = np.cross(J[:3, 0], J[:3, 1]); u /= np.linalg.norm(u)
        if t == 10:
            T = np.full(n, float("nan"))  # no joint has a torque limit
        b = J[:rows, :].T @ u
        lp = lp_capacity(a.tolist(), b.tolist(), T.tolist())
        lim = [i for i in range(n) if not math.isnan(T[i])]
        # Unbounded (no limited joint feels the direction): the estimate is infinite, written null
        # (1/|rounding noise| would be a different huge number on every machine).
        ell = 1.0 / math.sqrt(sum((b[i] / T[i]) ** 2 for i in lim)) if lim and lp["status"] != "unbounded" else None
        cases.append({
            "n": n, "rows": rows, "jacobian": J.flatten().tolist(), "tauHold": a.tolist(),
            "maxTorque": [None if math.isnan(x) else float(x) for x in T], "direction": u.tolist(),
            "lp": lp, "ellipsoidEstimate": ell,
        })
    return cases


def svd_cases():
    cases = []
    for m, n in [(3, 6), (3, 4), (6, 6), (6, 7), (3, 2), (6, 5)]:
        A = rng.normal(size=(m, n))
        if n >= 4 and m == 3:
            A[2] = A[0] * 0.5 + A[1] * 1e-7  # nearly rank deficient
        s = np.linalg.svd(A, compute_uv=False)
        s = np.concatenate([s, np.zeros(max(0, m - len(s)))])
        cases.append({"m": m, "n": n, "a": A.flatten().tolist(), "sigma": s.tolist()})
    for k in [3, 5]:
        S = random_spd(k) - 0.5 * np.eye(k)
        cases.append({"symmetric": True, "k": k, "a": S.flatten().tolist(), "eigenvalues": sorted(np.linalg.eigvalsh(S).tolist(), reverse=True)})
    return cases


# ---- an end-to-end arm (standard DH), own numpy kinematics ----
ARM = {
    "name": "Reference six-axis arm", "convention": "dh",
    "joints": [
        {"type": "revolute", "a": 0.15, "alpha": -math.pi / 2, "d": 0.45, "theta": 0.0, "min": -3.0, "max": 3.0, "maxTorque": 900.0, "mass": 18.0, "com": [0.0, 0.05, 0.0]},
        {"type": "revolute", "a": 0.6, "alpha": 0.0, "d": 0.0, "theta": -math.pi / 2, "min": -2.0, "max": 2.5, "maxTorque": 700.0, "mass": 12.0, "com": [-0.3, 0.0, 0.08]},
        {"type": "revolute", "a": 0.12, "alpha": -math.pi / 2, "d": 0.0, "theta": 0.0, "min": -2.5, "max": 2.5, "maxTorque": 300.0, "mass": 7.0, "com": [0.0, 0.0, 0.05]},
        {"type": "revolute", "a": 0.0, "alpha": math.pi / 2, "d": 0.55, "theta": 0.0, "min": -3.0, "max": 3.0, "maxTorque": 60.0, "mass": 3.0, "com": [0.0, -0.1, 0.0]},
        {"type": "revolute", "a": 0.0, "alpha": -math.pi / 2, "d": 0.0, "theta": 0.0, "min": -2.1, "max": 2.1, "maxTorque": 50.0, "mass": 1.5, "com": [0.0, 0.0, 0.0]},
        {"type": "revolute", "a": 0.0, "alpha": 0.0, "d": 0.1, "theta": 0.0, "min": -6.0, "max": 6.0, "maxTorque": 30.0, "mass": 0.4, "com": [0.0, 0.0, -0.02]},
    ],
    "base": [0.0, -1.0, 0.0, 0.2, 1.0, 0.0, 0.0, -0.1, 0.0, 0.0, 1.0, 0.3, 0.0, 0.0, 0.0, 1.0],
    "tool": [1.0, 0.0, 0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 0.0, 0.0, 1.0, 0.12, 0.0, 0.0, 0.0, 1.0],
}


def dh(a, alpha, d, theta):
    ct, st, ca, sa = math.cos(theta), math.sin(theta), math.cos(alpha), math.sin(alpha)
    return np.array([[ct, -st * ca, st * sa, a * ct], [st, ct * ca, -ct * sa, a * st], [0, sa, ca, d], [0, 0, 0, 1.0]])


def frames(arm, q):
    T = np.array(arm["base"]).reshape(4, 4)
    out = [T]
    for j, qi in zip(arm["joints"], q):
        T = T @ dh(j["a"], j["alpha"], j["d"], j["theta"] + qi)
        out.append(T)
    return out


def point_jacobian(fr, p, upto):
    n = len(fr) - 1
    J = np.zeros((6, n))
    for j in range(upto):
        z, o = fr[j][:3, 2], fr[j][:3, 3]
        J[:3, j] = np.cross(z, p - o)
        J[3:, j] = z
    return J


def end_to_end():
    g = 9.80665
    arm = ARM
    n = len(arm["joints"])
    tool = np.array(arm["tool"]).reshape(4, 4)
    T_max = np.array([j["maxTorque"] for j in arm["joints"]])
    load_mass, load_point = 4.0, np.array([0.03, 0.0, 0.05])  # in the tool frame
    out = []
    for q in [[0.1, -0.4, 0.5, 0.3, 0.8, -0.2], [0.7, 0.2, -0.3, -1.0, 0.5, 0.4], [-0.5, 0.9, 0.6, 0.2, -1.2, 1.0]]:
        fr = frames(arm, q)
        tau = np.zeros(n)
        for i, j in enumerate(arm["joints"]):
            c = fr[i + 1] @ np.array(j["com"] + [1.0])
            tau += point_jacobian(fr, c[:3], i + 1)[:3].T @ np.array([0, 0, j["mass"] * g])
        toolpose = fr[-1] @ tool
        p_load = (toolpose @ np.append(load_point, 1.0))[:3]
        J_load = point_jacobian(fr, p_load, n)
        tau_links = tau.copy()
        tau += J_load[:3].T @ np.array([0, 0, load_mass * g])
        d = np.array([0.3, -0.5, -0.8]); d /= np.linalg.norm(d)
        lp = lp_capacity(tau.tolist(), (J_load[:3].T @ d).tolist(), T_max.tolist())
        wrench = np.array([20.0, 0.0, -60.0, 0.0, 3.0, 1.0])
        lp6 = lp_capacity(tau.tolist(), (J_load.T @ wrench).tolist(), T_max.tolist())
        pay = lp_capacity(tau_links.tolist(), (J_load[:3].T @ np.array([0, 0, g])).tolist(), T_max.tolist())
        out.append({"q": q, "tauLinks": tau_links.tolist(), "tauHold": tau.tolist(), "jacobianAtLoad": J_load.flatten().tolist(),
                    "direction": d.tolist(), "forceCapacity": lp, "wrench": wrench.tolist(), "wrenchCapacity": lp6,
                    "payloadCapacity": pay})
    return {"arm": arm, "loadMass": load_mass, "loadPoint": load_point.tolist(), "g": g, "cases": out}


def main():
    data = {
        "source": "tests/reference/analysis_reference.py (numpy %s)" % np.__version__,
        "twoR": two_r_cases(),
        "tauExample": tau_example(),
        "gravity2r": [gravity_2r(9.81), gravity_2r(9.80665)],
        "spd": spd_cases(),
        "capacity": capacity_cases(),
        "linalg": svd_cases(),
        "endToEnd": end_to_end(),
    }
    write_fixture(OUT, data)


if __name__ == "__main__":
    main()
