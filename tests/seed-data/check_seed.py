"""Independent check of the seed arms (numpy/scipy reference, run with /usr/bin/python3 from the repo root):

  /usr/bin/python3 tests/seed-data/check_seed.py

The arms are seed-data/arms/*.json and the URDF-authored arms of seed-data/urdf (read from the
URDF file with numpy by seedkin.load_urdf_seed, not by the product's importer).

1. Reach: the datasheet `specs.reach` must lie within 5 % of the largest horizontal distance from
   the joint-1 axis to the arm's tool point (DH chain plus the arm's own `tool` transform = the
   flange centre), maximised over the joint range. This definition is the one seed-data/README.md
   states (common practice, no source: datasheets quote the reach to the wrist centre or to the
   flange; these seed arms use the flange).
2. Holding torque: tau = sum J_ci^T m_i g + J_p^T m_p g (Craig, ch. 5; Spong et al., ch. 4) with the
   rated payload at the flange, at the reach-maximising (stretched, horizontal) pose, must stay
   below maxTorque on every joint with a margin (ratio 0.3 .. 0.9 on the joints that carry it), and
   below maxTorque over random poses.
Exits with status 1 and prints the failing arm on any violation.
"""
import os
import sys
import glob
import numpy as np
from scipy.optimize import minimize

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from seedkin import frames, hold_torque, load_json, load_urdf_seed  # noqa: E402

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")


def horizontal_radius(arm, q):
    fs = frames(arm, q)
    axis_z = fs[0][:3, 2]
    axis_p = fs[0][:3, 3]
    v = fs[-1][:3, 3] - axis_p
    return float(np.linalg.norm(v - np.dot(v, axis_z) * axis_z))


def max_reach(arm, rng, starts=40):
    lo = np.array([j["min"] for j in arm["joints"]])
    hi = np.array([j["max"] for j in arm["joints"]])
    best_r, best_q = -1.0, None
    for _ in range(starts):
        q0 = lo + rng.random(len(lo)) * (hi - lo)
        res = minimize(lambda q: -horizontal_radius(arm, q), q0, bounds=list(zip(lo, hi)), method="L-BFGS-B")
        if -res.fun > best_r:
            best_r, best_q = -res.fun, res.x
    return best_r, best_q


def main():
    rng = np.random.default_rng(7)
    ok = True
    files = sorted(glob.glob(os.path.join(ROOT, "seed-data", "arms", "*.json")))
    # URDF-authored arms: read from the URDF file by seedkin's own numpy reader (side file = specs).
    files += sorted(glob.glob(os.path.join(ROOT, "seed-data", "urdf", "*.json")))
    print(f"{'arm':22s} {'reach':>6s} {'FK max':>7s} {'dev %':>6s}  torque ratios at stretched pose (rated payload)   max ratio over random poses")
    for path in files:
        arm = load_urdf_seed(path) if os.sep + "urdf" + os.sep in path else load_json(path)
        spec = arm["specs"]
        r_fk, q_star = max_reach(arm, rng)
        dev = (spec["reach"] - r_fk) / r_fk * 100
        if abs(dev) > 5:
            ok = False
            print(f"FAIL {os.path.basename(path)}: reach {spec['reach']} vs FK {r_fk:.4f}")
        tmax = np.array([j.get("maxTorque", np.nan) for j in arm["joints"]])
        tau = hold_torque(arm, q_star, payload=spec["ratedPayload"])
        ratios = np.abs(tau) / tmax
        worst = 0.0
        lo = np.array([j["min"] for j in arm["joints"]])
        hi = np.array([j["max"] for j in arm["joints"]])
        for _ in range(2000):
            q = lo + rng.random(len(lo)) * (hi - lo)
            worst = max(worst, float(np.max(np.abs(hold_torque(arm, q, payload=spec["ratedPayload"])) / tmax)))
        carried = ratios[ratios > 0.05]
        if worst > 1.0 or (carried.size and (carried.max() > 0.9 or carried.max() < 0.3)):
            ok = False
            print(f"FAIL {os.path.basename(path)}: torque ratios {np.round(ratios, 3)} worst {worst:.3f}")
        link_mass = sum(j.get("mass", 0.0) for j in arm["joints"])
        if link_mass >= spec["armMass"]:
            ok = False
            print(f"FAIL {os.path.basename(path)}: link masses {link_mass} exceed armMass {spec['armMass']}")
        print(f"{arm['name']:22s} {spec['reach']:6.3f} {r_fk:7.4f} {dev:6.2f}  {' '.join(f'{x:.2f}' for x in ratios):48s} {worst:.2f}")
        print(f"{'':22s} stretched q (deg) = {np.round(np.degrees(q_star), 1)}  tau = {np.round(tau, 1)}")
    sys.exit(0 if ok else 1)


if __name__ == "__main__":
    main()
