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


def axis_rotation(u, q):
    """Rotation by q about the unit axis u (Rodrigues' formula), 4x4."""
    u = np.asarray(u, dtype=float) / np.linalg.norm(u)
    k = np.array([[0, -u[2], u[1]], [u[2], 0, -u[0]], [-u[1], u[0], 0]])
    t = np.eye(4)
    t[:3, :3] = np.eye(3) + np.sin(q) * k + (1 - np.cos(q)) * (k @ k)
    return t


def link_transform(conv, j, q):
    if conv == "chain":
        # URDF joint: T(origin) then Rot(axis, q) or Trans(axis q), in the joint frame.
        o = np.array(j["T"], dtype=float) if "T" in j else trans(*j["origin"]["xyz"]) @ np.pad(rpy_matrix(*j["origin"]["rpy"]), ((0, 1), (0, 1)))
        if "T" not in j:
            o[3, 3] = 1.0
        u = np.asarray(j["axis"], dtype=float) / np.linalg.norm(j["axis"])
        return o @ (trans(*(u * q)) if j["type"] == "prismatic" else axis_rotation(u, q))
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
        # dh: joint i turns about z of frame i-1; mdh: about z of frame i; chain: about its axis in frame i.
        f = fs[i] if arm["convention"] == "dh" else fs[i + 1]
        if arm["convention"] == "chain":
            u = np.asarray(arm["joints"][i]["axis"], dtype=float)
            axes.append((f[:3, :3] @ (u / np.linalg.norm(u)), f[:3, 3].copy()))
        else:
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


def load_urdf_seed(side_path):
    """A URDF-authored seed arm read with numpy only (not the product's importer), for the screens.

    The seed URDF files are single chains (one child joint per link). Following the URDF
    specification: a moving joint's origin is multiplied by the fixed joints before it; fixed
    joints after the last moving joint form the tool; a link fixed to moving link i adds its mass
    to link i at its inertial origin carried through the fixed joints (mass-weighted centre);
    a continuous joint gets the range -360 .. +360 degrees. Specs come from the side file.
    """
    import os
    import xml.etree.ElementTree as ET

    side = load_json(side_path)
    root = ET.parse(os.path.join(os.path.dirname(side_path), side["file"])).getroot()

    def pose(el):
        o = el.find("origin") if el is not None else None
        xyz = [float(v) for v in (o.get("xyz", "0 0 0") if o is not None else "0 0 0").split()]
        rpy = [float(v) for v in (o.get("rpy", "0 0 0") if o is not None else "0 0 0").split()]
        t = np.eye(4)
        t[:3, :3] = rpy_matrix(*rpy)
        t[:3, 3] = xyz
        return t

    links = {l.get("name"): l for l in root.findall("link")}
    child_joint = {j.find("parent").get("link"): j for j in root.findall("joint")}
    parents = {j.find("child").get("link") for j in root.findall("joint")}
    at = next(n for n in links if n not in parents)
    joints, pending, owner_t, bodies = [], np.eye(4), np.eye(4), [[]]

    def add_mass(link_name, t_owner_link):
        inertial = links[link_name].find("inertial")
        if inertial is not None:
            m = float(inertial.find("mass").get("value"))
            c = (t_owner_link @ pose(inertial))[:3, 3]
            bodies[-1].append((m, c))

    add_mass(at, np.eye(4))
    while at in child_joint:
        j = child_joint[at]
        child = j.find("child").get("link")
        if j.get("type") == "fixed":
            pending = pending @ pose(j)
            owner_t = owner_t @ pose(j)
        else:
            lim = j.find("limit")
            lo, hi = (-2 * np.pi, 2 * np.pi) if j.get("type") == "continuous" else (float(lim.get("lower")), float(lim.get("upper")))
            axis = [float(v) for v in j.find("axis").get("xyz").split()]
            spec = {"type": "prismatic" if j.get("type") == "prismatic" else "revolute", "T": (pending @ pose(j)).tolist(), "axis": axis, "min": lo, "max": hi}
            if lim is not None and lim.get("effort"):
                spec["maxTorque"] = float(lim.get("effort"))
            joints.append(spec)
            bodies.append([])
            pending, owner_t = np.eye(4), np.eye(4)
        add_mass(child, owner_t)
        at = child
    for spec, parts in zip(joints, bodies[1:]):
        m = sum(p[0] for p in parts)
        if m > 0:
            spec["mass"] = m
            spec["com"] = (sum(p[0] * p[1] for p in parts) / m).tolist()
    arm = {"name": root.get("name"), "convention": "chain", "joints": joints, "specs": side["specs"]}
    if len(joints) and not np.allclose(pending, np.eye(4)):
        arm["tool"] = pending.reshape(-1).tolist()
    return arm
