"""Reference kinematics for checking the seed data (numpy/scipy, run with /usr/bin/python3).

Independent of the product's TypeScript library: the link transforms are written out from the
definitions of docs/design.md#link-transforms (standard DH: Rz(theta) Tz(d) Tx(a) Rx(alpha),
Denavit & Hartenberg 1955; modified DH: Rx(alpha) Tx(a) Rz(theta) Tz(d), Craig, "Introduction to Robotics", 3rd ed., ch. 3),
and the static relation tau = J^T F (Craig ch. 5; Spong, Hutchinson & Vidyasagar ch. 4).
Gravity is -z of the arm base frame, g = 9.80665 m/s^2.
"""
import json
import numpy as np

G = 9.80665


def rot_x(a):
    c, s = np.cos(a), np.sin(a)
    return np.array([[1, 0, 0, 0], [0, c, -s, 0], [0, s, c, 0], [0, 0, 0, 1.0]])


def rot_z(a):
    c, s = np.cos(a), np.sin(a)
    return np.array([[c, -s, 0, 0], [s, c, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1.0]])


def trans(x, y, z):
    t = np.eye(4)
    t[:3, 3] = [x, y, z]
    return t


def rpy_matrix(r, p, y):
    """R = Rz(yaw) Ry(pitch) Rx(roll), fixed axes (requirement-set convention)."""
    cr, sr, cp, sp, cy, sy = np.cos(r), np.sin(r), np.cos(p), np.sin(p), np.cos(y), np.sin(y)
    rx = np.array([[1, 0, 0], [0, cr, -sr], [0, sr, cr]])
    ry = np.array([[cp, 0, sp], [0, 1, 0], [-sp, 0, cp]])
    rz = np.array([[cy, -sy, 0], [sy, cy, 0], [0, 0, 1]])
    return rz @ ry @ rx


def mat(m16):
    return np.array(m16, dtype=float).reshape(4, 4)


def link_transform(conv, j, q):
    theta = j["theta"] + (q if j["type"] == "revolute" else 0.0)
    d = j["d"] + (q if j["type"] == "prismatic" else 0.0)
    if conv == "dh":
        return rot_z(theta) @ trans(0, 0, d) @ trans(j["a"], 0, 0) @ rot_x(j["alpha"])
    return rot_x(j["alpha"]) @ trans(j["a"], 0, 0) @ rot_z(theta) @ trans(0, 0, d)


def frames(arm, q):
    """[base, frame 1, ..., frame n, tool point] as 4x4 arrays in the arm base frame."""
    t = mat(arm["base"]) if "base" in arm else np.eye(4)
    out = [t]
    for j, qi in zip(arm["joints"], q):
        t = t @ link_transform(arm["convention"], j, qi)
        out.append(t)
    tool = mat(arm["tool"]) if "tool" in arm else np.eye(4)
    out.append(t @ tool)
    return out


def joint_axes(arm, fs):
    """Axis z and origin p of each joint, in the base frame."""
    n = len(arm["joints"])
    axes = []
    for i in range(n):
        # dh: joint i turns about z of frame i-1; mdh: about z of frame i.
        f = fs[i] if arm["convention"] == "dh" else fs[i + 1]
        axes.append((f[:3, 2].copy(), f[:3, 3].copy()))
    return axes


def point_jacobian(arm, fs, link, point):
    """3xn translational Jacobian of a point (base frame) fixed to link `link` (1-based)."""
    n = len(arm["joints"])
    jac = np.zeros((3, n))
    for i, (z, p) in enumerate(joint_axes(arm, fs)):
        if i >= link:
            break
        if arm["joints"][i]["type"] == "revolute":
            jac[:, i] = np.cross(z, point - p)
        else:
            jac[:, i] = z
    return jac


def full_jacobian(arm, fs, point):
    """6xn geometric Jacobian at `point` fixed to the last link."""
    n = len(arm["joints"])
    jac = np.zeros((6, n))
    for i, (z, p) in enumerate(joint_axes(arm, fs)):
        if arm["joints"][i]["type"] == "revolute":
            jac[:3, i] = np.cross(z, point - p)
            jac[3:, i] = z
        else:
            jac[:3, i] = z
    return jac


def hold_torque(arm, q, payload=0.0, payload_point_tool=(0.0, 0.0, 0.0), links=True):
    """tau_hold = sum J_ci^T (0, 0, m_i g) over links (and the payload at a point in the tool frame)."""
    fs = frames(arm, q)
    n = len(arm["joints"])
    tau = np.zeros(n)
    if links:
        for i, j in enumerate(arm["joints"]):
            m = j.get("mass", 0.0)
            if m <= 0:
                continue
            c = fs[i + 1] @ np.array([*j.get("com", [0, 0, 0]), 1.0])
            tau += point_jacobian(arm, fs, i + 1, c[:3]).T @ np.array([0, 0, m * G])
    if payload > 0:
        c = fs[-1] @ np.array([*payload_point_tool, 1.0])
        tau += point_jacobian(arm, fs, n, c[:3]).T @ np.array([0, 0, payload * G])
    return tau


def load_json(path):
    with open(path, encoding="utf-8") as f:
        return json.load(f)
