"""Reachability screen of the seed scenarios against the seed arms (numpy/scipy reference, run with
/usr/bin/python3 from the repo root):

  /usr/bin/python3 tests/seed-data/check_scenarios.py

A crude numerical IK (scipy.optimize.least_squares, bounded by the joint limits, 24 seeded random
starts) per (arm, target) in the target's mode, and IK continuation along each path sampled every
20 mm. TCP = T_cell_base . arm chain . arm tool . tool.tcp (docs/design.md#frames-of-a-cell). Tolerances: the target's own.
It then checks that the seed scenarios stay a useful demo (see EXPECTED): the arms that should reach
everything do, the SCARA reaches only its vertical-axis targets, and so on. Exits 1 on a mismatch.
"""
import os
import sys
import glob
import numpy as np
from scipy.optimize import least_squares
from scipy.spatial.transform import Rotation

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from seedkin import frames, full_jacobian, mat, rpy_matrix, load_json  # noqa: E402

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")
ROT_WEIGHT = 0.3  # m per rad in the residual (only for the solver; acceptance uses the tolerances)


def target_matrix(position, rpy):
    t = np.eye(4)
    t[:3, :3] = rpy_matrix(*rpy)
    t[:3, 3] = position
    return t


def tcp_pose(arm, req, q):
    return mat(req["base"]) @ frames(arm, q)[-1] @ mat(req["tool"]["tcp"])


def errors(arm, req, q, goal, mode):
    t = tcp_pose(arm, req, q)
    pos = t[:3, 3] - goal[:3, 3]
    if mode == "point":
        return pos, np.zeros(3), 0.0
    if mode == "axis":
        za, zb = t[:3, 2], goal[:3, 2]
        ang = float(np.arctan2(np.linalg.norm(np.cross(za, zb)), np.dot(za, zb)))
        return pos, za - zb, ang
    rv = Rotation.from_matrix(goal[:3, :3] @ t[:3, :3].T).as_rotvec()
    return pos, rv, float(np.linalg.norm(rv))


def solve(arm, req, goal, mode, ptol, rtol, rng, starts=24, initial=None, hold=0.0):
    """`hold` > 0 adds hold * (q - initial) to the residual, so that a continued solution does not
    drift along the free spin or the redundancy (its bias on the task error is of order hold^2)."""
    lo = np.array([j["min"] for j in arm["joints"]])
    hi = np.array([j["max"] for j in arm["joints"]])

    def res(q):
        p, r, _ = errors(arm, req, q, goal, mode)
        out = np.concatenate([p, ROT_WEIGHT * r])
        return np.concatenate([out, hold * (q - initial)]) if hold > 0 else out

    def jac(q):
        fs = frames(arm, q)
        t = mat(req["base"])
        tcp = fs[-1] @ mat(req["tool"]["tcp"])
        jb = full_jacobian(arm, fs, tcp[:3, 3])
        rot = t[:3, :3]
        jv, jw = rot @ jb[:3], rot @ jb[3:]
        if mode == "point":
            out = np.vstack([jv, np.zeros_like(jv)])
        elif mode == "axis":
            z = rot @ tcp[:3, 2]
            out = np.vstack([jv, ROT_WEIGHT * np.cross(jw.T, z).T])
        else:
            out = np.vstack([jv, -ROT_WEIGHT * jw])
        return np.vstack([out, hold * np.eye(len(q))]) if hold > 0 else out

    best = None
    seeds = [] if initial is None else [np.clip(initial, lo, hi)]
    seeds += [lo + rng.random(len(lo)) * (hi - lo) for _ in range(starts)]
    for q0 in seeds:
        sol = least_squares(res, q0, jac=jac, bounds=(lo, hi), xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=200)
        p, _, ang = errors(arm, req, sol.x, goal, mode)
        pe = float(np.linalg.norm(p))
        if best is None or pe + ROT_WEIGHT * ang < best[1] + ROT_WEIGHT * best[2]:
            best = (sol.x, pe, ang)
        if pe <= ptol and ang <= rtol:
            return True, sol.x, pe, ang
    return False, best[0], best[1], best[2]


def path_samples(path, step):
    pts = []
    wps = path["waypoints"]
    for a, b in zip(wps[:-1], wps[1:]):
        pa, pb = np.array(a["position"]), np.array(b["position"])
        n = max(1, int(np.ceil(np.linalg.norm(pb - pa) / step)))
        for k in range(n):
            s = k / n
            rpy = a["rpy"]  # the seed paths keep one orientation per path
            pts.append(target_matrix(pa + s * (pb - pa), rpy))
    pts.append(target_matrix(wps[-1]["position"], wps[-1]["rpy"]))
    return pts


def check_path(arm, req, path, rng, step=0.02):
    """Continuation along the samples. Returns (reached, samples, restarts, speed ratio): a restart is
    a sample the previous solution could not be continued to (a configuration change or a gap); the
    speed ratio is the largest |dq/ds| * speed / maxSpeed over continued steps."""
    pts = path_samples(path, step)
    q = None
    reached = restarts = 0
    speed_ratio = 0.0
    max_speed = np.array([j["maxSpeed"] for j in arm["joints"]])
    for k, goal in enumerate(pts):
        ok = False
        if q is not None:
            ok, qn, _, _ = solve(arm, req, goal, path["mode"], 1e-5, 1e-4, rng, starts=0, initial=q, hold=1e-3)
            if ok:
                ds = np.linalg.norm(goal[:3, 3] - pts[k - 1][:3, 3])
                speed_ratio = max(speed_ratio, float(np.max(np.abs(qn - q) / ds * path["speed"] / max_speed)))
        if not ok:
            ok, qn, _, _ = solve(arm, req, goal, path["mode"], 1e-5, 1e-4, rng, starts=24 if k == 0 else 8)
            restarts += 1 if (ok and k > 0) else 0
        if ok:
            reached += 1
            q = qn
        else:
            q = None
    return reached, len(pts), restarts, speed_ratio


# Designed outcome of the demo: targets each arm must reach (True) or must miss (False); absent = free.
EXPECTED = {
    "Bench assembly: sensor housing press-fit": {
        "Helper Seven 7": {"close-in-nest": False, "feeder-pick": True, "press-fit": True, "tray-far-corner": True},
        "Reach Cobot 10": {"*": True},
        "Overhead Six 6": {"*": True},
        "Table SCARA 600": {"feeder-pick": True, "fixture-place": True, "press-fit": True, "tray-far-corner": False,
                            "tilted-screw": False, "side-bore-insert": False, "label-camera": False},
        "Compact Six 3": {"tray-far-corner": False},
    },
    "Deburring cell: cast pump-cover seam": {
        "Foundry Six 12": {"*": True},
        "Table SCARA 600": {"gate-stub": False, "bore-chamfer": False, "back-edge": False, "top-seam": False, "front-edge-chamfer": False},
        "Overhead Six 6": {"top-seam": False},
        "Helper Seven 7": {"top-seam": False},
    },
}


def main():
    arms = [load_json(p) for p in sorted(glob.glob(os.path.join(ROOT, "seed-data", "arms", "*.json")))]
    reqs = [load_json(p) for p in sorted(glob.glob(os.path.join(ROOT, "seed-data", "requirements", "*.json")))]
    ok_all = True
    for req in reqs:
        names = [t["name"] for t in req["targets"]] + [p["name"] for p in req["paths"]]
        print(f"\n{req['name']}")
        print(f"{'arm':20s} " + " ".join(f"{n[:12]:>12s}" for n in names))
        for arm in arms:
            rng = np.random.default_rng(11)
            cells, got = [], {}
            for t in req["targets"]:
                goal = target_matrix(t["position"], t["rpy"])
                ok, _, pe, ang = solve(arm, req, goal, t["mode"], t.get("positionTolerance", 1e-5), t.get("rotationTolerance", 1e-4), rng)
                got[t["name"]] = ok
                cells.append("yes" if ok else f"no {pe * 1000:.0f}mm/{np.degrees(ang):.0f}d")
            for p in req["paths"]:
                k, n, flips, sr = check_path(arm, req, p, rng)
                got[p["name"]] = k == n
                cells.append(f"{k}/{n} r{flips} v{sr:.2f}")
            print(f"{arm['name']:20s} " + " ".join(f"{c:>12s}" for c in cells))
            exp = EXPECTED.get(req["name"], {}).get(arm["name"], {})
            for name, value in got.items():
                want = exp.get(name, exp.get("*"))
                if want is not None and want != value:
                    ok_all = False
                    print(f"  MISMATCH {arm['name']} / {name}: expected {'reached' if want else 'missed'}")
    print("\nrN = restarts along the path (configuration change or gap); v = largest (joint speed needed at the path speed) / maxSpeed over the path samples")
    sys.exit(0 if ok_all else 1)


if __name__ == "__main__":
    main()
