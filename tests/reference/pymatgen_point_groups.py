#!/usr/bin/env python3
"""Point-group reference fixture for Diptych's symmetry engine.

Builds idealized geometries of textbook molecules (bond lengths and angles are rounded
typical values, from memory; a few "model" molecules are built as the orbit of a generic
seed atom under the group's operations so that every family is covered), puts each in two
random orientations with 1e-4 Å Gaussian noise, and records pymatgen's
`PointGroupAnalyzer` answer next to the textbook assignment (Cotton, Chemical Applications
of Group Theory, 3rd ed., ch. 3 examples; assignments from memory).

Usage:
  python3 pymatgen_point_groups.py            # write pymatgen_point_groups.json
  python3 pymatgen_point_groups.py --check    # regenerate in memory, compare, exit 1 on difference
"""
import json
import math
import sys
from pathlib import Path

import numpy as np

FIXTURE = Path(__file__).with_name("pymatgen_point_groups.json")
PHI = (1 + 5 ** 0.5) / 2


def rot(axis, angle):
    a = np.asarray(axis, float)
    a = a / np.linalg.norm(a)
    k = np.array([[0, -a[2], a[1]], [a[2], 0, -a[0]], [-a[1], a[0], 0]])
    return np.eye(3) + math.sin(angle) * k + (1 - math.cos(angle)) * k @ k


def refl(normal):
    n = np.asarray(normal, float)
    n = n / np.linalg.norm(n)
    return np.eye(3) - 2 * np.outer(n, n)


def closure(gens):
    group = [np.eye(3)]
    frontier = list(gens)
    while frontier:
        g = frontier.pop()
        if any(np.allclose(g, h, atol=1e-8) for h in group):
            continue
        group.append(g)
        for h in list(group):
            frontier.append(g @ h)
            frontier.append(h @ g)
        if len(group) > 240:
            raise RuntimeError("group too large")
    return group


Z = [0, 0, 1]
X = [1, 0, 0]
GROUPS = {
    "C3": [rot(Z, 2 * math.pi / 3)],
    "S4": [refl(Z) @ rot(Z, math.pi / 2)],
    "S6": [refl(Z) @ rot(Z, math.pi / 3)],
    "S8": [refl(Z) @ rot(Z, math.pi / 4)],
    "C4h": [rot(Z, math.pi / 2), refl(Z)],
    "C6h": [rot(Z, math.pi / 3), refl(Z)],
    "C5": [rot(Z, 2 * math.pi / 5)],
    "D4": [rot(Z, math.pi / 2), rot(X, math.pi)],
    "T": [rot(Z, math.pi), rot([1, 1, 1], 2 * math.pi / 3)],
    "O": [rot(Z, math.pi / 2), rot([1, 1, 1], 2 * math.pi / 3)],
    "I": [rot(Z, math.pi), rot([1, 1, 1], 2 * math.pi / 3), rot([0, 1, PHI], 2 * math.pi / 5)],
}


def orbit(symbol, seed, ops):
    pts = []
    for g in ops:
        p = g @ np.asarray(seed, float)
        if not any(np.linalg.norm(p - q) < 1e-6 for q in pts):
            pts.append(p)
    return [(symbol, p) for p in pts]


def model(group_key, core, seeds):
    ops = closure(GROUPS[group_key])
    atoms = list(core)
    for sym, seed in seeds:
        atoms += orbit(sym, seed, ops)
    return atoms


def A(sym, x, y, z):
    return (sym, np.array([x, y, z], float))


def ring(sym, n, r, z=0.0, phase=0.0):
    return [A(sym, r * math.cos(phase + 2 * math.pi * k / n), r * math.sin(phase + 2 * math.pi * k / n), z) for k in range(n)]


def pyramid(center, lig, n, d, angle_from_axis_deg, center_z=0.0, phase=0.0):
    t = math.radians(angle_from_axis_deg)
    return [A(center, 0, 0, center_z)] + ring(lig, n, d * math.sin(t), center_z + d * math.cos(t), phase)


def tetra_dirs():
    return [np.array(v, float) / math.sqrt(3) for v in [(1, 1, 1), (1, -1, -1), (-1, 1, -1), (-1, -1, 1)]]


def octa_dirs():
    return [np.array(v, float) for v in [(1, 0, 0), (-1, 0, 0), (0, 1, 0), (0, -1, 0), (0, 0, 1), (0, 0, -1)]]


def ethane_like(c, h, dcc, dch, dihedral_deg, angle=109.47):
    t = math.radians(180 - angle)
    atoms = [A(c, 0, 0, dcc / 2), A(c, 0, 0, -dcc / 2)]
    for k in range(3):
        p1 = 2 * math.pi * k / 3
        p2 = p1 + math.radians(dihedral_deg)
        atoms.append(A(h[0] if isinstance(h, tuple) else h, dch * math.sin(t) * math.cos(p1), dch * math.sin(t) * math.sin(p1), dcc / 2 + dch * math.cos(t)))
        atoms.append(A(h[1] if isinstance(h, tuple) else h, dch * math.sin(t) * math.cos(p2), dch * math.sin(t) * math.sin(p2), -dcc / 2 - dch * math.cos(t)))
    return atoms


def planar_ch2(c_x, h_sym="H", dch=1.09, hch=117.0):
    a = math.radians(hch / 2)
    s = 1 if c_x > 0 else -1
    return [A(h_sym, c_x + s * dch * math.cos(a), dch * math.sin(a), 0), A(h_sym, c_x + s * dch * math.cos(a), -dch * math.sin(a), 0)]


def benzene():
    return ring("C", 6, 1.39) + ring("H", 6, 2.48)


def ferrocene(staggered):
    return [A("Fe", 0, 0, 0)] + ring("C", 5, 1.22, 1.66) + ring("C", 5, 1.22, -1.66, math.pi / 5 if staggered else 0) \
        + ring("H", 5, 2.29, 1.70) + ring("H", 5, 2.29, -1.70, math.pi / 5 if staggered else 0)


def icosahedron(sym, r):
    v = []
    for a in (1, -1):
        for b in (PHI, -PHI):
            v += [(0, a, b), (a, b, 0), (b, 0, a)]
    s = r / math.sqrt(1 + PHI ** 2)
    return [A(sym, *(np.array(p) * s)) for p in v]


def c60():
    pts = set()
    base = [(0, 1, 3 * PHI), (1, 2 + PHI, 2 * PHI), (PHI, 2, PHI ** 3)]
    for x, y, z in base:
        for cyc in [(x, y, z), (y, z, x), (z, x, y)]:
            for sx in (1, -1):
                for sy in (1, -1):
                    for sz in (1, -1):
                        pts.add((round(sx * cyc[0], 9), round(sy * cyc[1], 9), round(sz * cyc[2], 9)))
    scale = 0.7  # ≈1.4 Å bonds for unit edge 2
    return [A("C", *(np.array(p) * scale)) for p in sorted(pts)]


def dodecahedrane():
    pts = []
    for sx in (1, -1):
        for sy in (1, -1):
            for sz in (1, -1):
                pts.append((sx, sy, sz))
    for a in (1, -1):
        for b in (1, -1):
            pts += [(0, a / PHI, b * PHI), (a / PHI, b * PHI, 0), (b * PHI, 0, a / PHI)]
    atoms = []
    for p in pts:
        v = np.array(p, float) * 1.55 / (2 / PHI)  # edge 2/φ → 1.55 Å
        atoms.append(A("C", *v))
        atoms.append(A("H", *(v + 1.1 * v / np.linalg.norm(v))))
    return atoms


def tuned(builder, lo, hi, target):
    """Bisection on a geometry parameter until target(atoms) changes sign."""
    flo = target(builder(lo))
    for _ in range(200):
        mid = (lo + hi) / 2
        fm = target(builder(mid))
        if (fm > 0) == (flo > 0):
            lo, flo = mid, fm
        else:
            hi = mid
    return builder((lo + hi) / 2)


MASS = {"H": 1.008, "B": 10.81, "C": 12.011, "N": 14.007, "O": 15.999, "F": 18.998, "P": 30.974,
        "S": 32.06, "Cl": 35.45, "Br": 79.904, "Xe": 131.29, "Pt": 195.08, "Fe": 55.845, "Co": 58.933,
        "Li": 6.94, "Ga": 69.723, "Cr": 51.996, "Si": 28.085, "Mo": 95.95, "Ni": 58.693}


def moments(atoms):
    m = np.array([MASS[s] for s, _ in atoms])
    x = np.array([p for _, p in atoms])
    x = x - (m[:, None] * x).sum(0) / m.sum()
    t = sum(mi * (np.dot(xi, xi) * np.eye(3) - np.outer(xi, xi)) for mi, xi in zip(m, x))
    return np.sort(np.linalg.eigvalsh(t))


def ammonia_like(h):
    return pyramid("P", "H", 3, 1.42, h)


def c2v_tuned(angle):
    # CH2F2-like: F–C–F fixed, H–C–H angle varied; tuned so that two moments coincide.
    a = math.radians(angle / 2)
    f = math.radians(108.5 / 2)
    return [A("C", 0, 0, 0), A("F", 1.36 * math.sin(f), 0, 1.36 * math.cos(f)), A("F", -1.36 * math.sin(f), 0, 1.36 * math.cos(f)),
            A("H", 0, 1.09 * math.sin(a), -1.09 * math.cos(a)), A("H", 0, -1.09 * math.sin(a), -1.09 * math.cos(a))]


def d2h_tuned(hch):
    # Ethylene-like B2Cl4-free planar X2Y4 with tuned Y–X–Y angle so the in-plane moments coincide.
    return [A("C", 0.67, 0, 0), A("C", -0.67, 0, 0)] + planar_ch2(0.67, "Cl", 1.75, hch) + planar_ch2(-0.67, "Cl", 1.75, hch)


def molecules():
    out = []

    def add(name, group, atoms, note="textbook assignment, from memory"):
        out.append((name, group, atoms, note))

    add("bromochlorofluoromethane", "C1", [A("C", 0, 0, 0), A("H", 0.63, 0.63, 0.63), A("F", -0.78, -0.78, 0.78), A("Cl", -1.02, 1.02, -1.02), A("Br", 1.12, -1.12, -1.12)])
    add("hypochlorous acid", "Cs", [A("O", 0, 0, 0), A("H", 0.96, 0, 0), A("Cl", -0.40, 1.63, 0)])
    add("chlorofluoromethane", "Cs", [A("C", 0, 0, 0), A("F", 1.36, 0, 0), A("Cl", -0.59, 1.67, 0), A("H", -0.36, -0.51, 0.89), A("H", -0.36, -0.51, -0.89)])
    add("meso-CHFCl-CHFCl (anti)", "Ci", [A("C", 0.77, 0, 0), A("C", -0.77, 0, 0), A("F", 1.2, 1.3, 0), A("F", -1.2, -1.3, 0), A("Cl", 1.3, -0.8, 1.4), A("Cl", -1.3, 0.8, -1.4), A("H", 1.15, -0.5, -0.95), A("H", -1.15, 0.5, 0.95)])
    add("hydrogen peroxide", "C2", [A("O", 0.74, 0, 0), A("O", -0.74, 0, 0)] + [A("H", 0.74 + 0.97 * math.cos(math.radians(80)), 0.97 * math.sin(math.radians(80)) * math.cos(math.radians(s * 55.8)), 0.97 * math.sin(math.radians(80)) * math.sin(math.radians(s * 55.8))) for s in (1,)] + [A("H", -0.74 - 0.97 * math.cos(math.radians(80)), 0.97 * math.sin(math.radians(80)) * math.cos(math.radians(-55.8)), 0.97 * math.sin(math.radians(80)) * math.sin(math.radians(-55.8)))])
    add("1,1,1-trichloroethane, twisted 20°", "C3", ethane_like("C", ("H", "Cl"), 1.54, 1.09, 80.0))
    add("tris-arm propeller (model)", "C3", model("C3", [A("B", 0, 0, 0.2)], [("O", [1.36, 0.0, 0.1]), ("H", [1.8, 0.85, -0.3])]), "model built as the orbit of seed atoms under C3")
    add("cyclopentadienyl propeller (model)", "C5", model("C5", [A("Ga", 0, 0, 2.0)], [("C", [1.2, 0, 0]), ("H", [2.2, 0.4, -0.2])]), "model built as the orbit of seed atoms under C5")
    add("water", "C2v", [A("O", 0, 0, 0), A("H", 0.757, 0.586, 0), A("H", -0.757, 0.586, 0)])
    add("dichloromethane", "C2v", [A("C", 0, 0, 0), A("Cl", 1.44, 0, 1.03), A("Cl", -1.44, 0, 1.03), A("H", 0, 0.89, -0.63), A("H", 0, -0.89, -0.63)])
    add("formaldehyde", "C2v", [A("C", 0, 0, 0), A("O", 0, 0, 1.21), A("H", 0.94, 0, -0.59), A("H", -0.94, 0, -0.59)])
    add("ammonia", "C3v", pyramid("N", "H", 3, 1.012, 180 - 68.0))
    add("chloroform", "C3v", [A("Cl", 0, 0, 1.76)] + pyramid("C", "Cl", 3, 1.76, 180 - 108.3)[0:0] + [A("C", 0, 0, 0), A("H", 0, 0, -1.07)] + ring("Cl", 3, 1.76 * math.sin(math.radians(71.7)), 1.76 * math.cos(math.radians(71.7)))[0:0] + ring("Cl", 3, 1.67, 0.55)[0:0] + ring("Cl", 3, 1.67, 0.55))
    add("bromine pentafluoride", "C4v", [A("Br", 0, 0, 0), A("F", 0, 0, 1.69)] + ring("F", 4, 1.77, -0.15))
    add("cyclopentadienyl gallium", "C5v", [A("Ga", 0, 0, 2.1)] + ring("C", 5, 1.21) + ring("H", 5, 2.28, -0.05))
    add("benzene-lithium cation complex", "C6v", [A("Li", 0, 0, 1.9)] + benzene())
    add("trans-difluorodiazene", "C2h", [A("N", 0.61, 0, 0), A("N", -0.61, 0, 0), A("F", 1.2, 1.2, 0), A("F", -1.2, -1.2, 0)])
    add("boric acid", "C3h", [A("B", 0, 0, 0)] + ring("O", 3, 1.36) + ring("H", 3, 1.80, 0, 0.55))
    add("tetrahydroxonickelate (pinwheel model)", "C4h", [A("Ni", 0, 0, 0)] + ring("O", 4, 1.9) + ring("H", 4, 2.45, 0, 0.45))
    add("hexahydroxybenzene (pinwheel)", "C6h", ring("C", 6, 1.40) + ring("O", 6, 2.76) + ring("H", 6, 3.25, 0, 0.28))
    add("ethylene twisted 30°", "D2", [A("C", 0, 0, 0.67), A("C", 0, 0, -0.67)] + [A("H", 0.92 * math.cos(math.radians(p)), 0.92 * math.sin(math.radians(p)), 0.67 + 0.55) for p in (15, 195)] + [A("H", 0.92 * math.cos(math.radians(p)), 0.92 * math.sin(math.radians(p)), -0.67 - 0.55) for p in (-15, 165)])
    add("ethane twisted 30°", "D3", ethane_like("C", "H", 1.54, 1.09, 30.0))
    add("D4 propeller (model)", "D4", model("D4", [A("Ni", 0, 0, 0)], [("C", [1.9, 0.3, 0.4])]), "model built as the orbit of a seed atom under D4")
    add("ethylene", "D2h", [A("C", 0.667, 0, 0), A("C", -0.667, 0, 0)] + planar_ch2(0.667) + planar_ch2(-0.667))
    add("naphthalene", "D2h", [A("C", 0, 0.71, 0), A("C", 0, -0.71, 0), A("C", 1.24, 1.40, 0), A("C", -1.24, 1.40, 0), A("C", 1.24, -1.40, 0), A("C", -1.24, -1.40, 0), A("C", 2.43, 0.70, 0), A("C", -2.43, 0.70, 0), A("C", 2.43, -0.70, 0), A("C", -2.43, -0.70, 0),
                               A("H", 1.24, 2.49, 0), A("H", -1.24, 2.49, 0), A("H", 1.24, -2.49, 0), A("H", -1.24, -2.49, 0), A("H", 3.38, 1.24, 0), A("H", -3.38, 1.24, 0), A("H", 3.38, -1.24, 0), A("H", -3.38, -1.24, 0)])
    add("diborane", "D2h", [A("B", 0.89, 0, 0), A("B", -0.89, 0, 0), A("H", 0, 0, 0.99), A("H", 0, 0, -0.99), A("H", 1.47, 1.03, 0), A("H", 1.47, -1.03, 0), A("H", -1.47, 1.03, 0), A("H", -1.47, -1.03, 0)])
    add("boron trifluoride", "D3h", [A("B", 0, 0, 0)] + ring("F", 3, 1.31))
    add("phosphorus pentachloride", "D3h", [A("P", 0, 0, 0), A("Cl", 0, 0, 2.14), A("Cl", 0, 0, -2.14)] + ring("Cl", 3, 2.02))
    add("eclipsed ethane", "D3h", ethane_like("C", "H", 1.54, 1.09, 0.0))
    add("cyclopropane", "D3h", ring("C", 3, 0.87) + ring("H", 3, 1.44, 0.91) + ring("H", 3, 1.44, -0.91))
    add("tetracyanonickelate", "D4h", [A("Ni", 0, 0, 0)] + ring("C", 4, 1.86) + ring("N", 4, 3.02))
    add("eclipsed ferrocene", "D5h", ferrocene(False))
    add("benzene", "D6h", benzene())
    add("allene", "D2d", [A("C", 0, 0, 0), A("C", 0, 0, 1.31), A("C", 0, 0, -1.31), A("H", 0.93, 0, 1.87), A("H", -0.93, 0, 1.87), A("H", 0, 0.93, -1.87), A("H", 0, -0.93, -1.87)])
    add("staggered ethane", "D3d", ethane_like("C", "H", 1.54, 1.09, 60.0))
    add("cyclohexane chair", "D3d", [A("C", 1.45 * math.cos(math.pi * k / 3), 1.45 * math.sin(math.pi * k / 3), 0.25 * (-1) ** k) for k in range(6)]
        + [A("H", 1.45 * math.cos(math.pi * k / 3), 1.45 * math.sin(math.pi * k / 3), 0.25 * (-1) ** k + 1.09 * (-1) ** k) for k in range(6)]
        + [A("H", 2.47 * math.cos(math.pi * k / 3), 2.47 * math.sin(math.pi * k / 3), 0.25 * (-1) ** k - 0.36 * (-1) ** k) for k in range(6)])
    add("cyclooctasulfur crown", "D4d", [A("S", 1.7 * math.cos(math.pi * k / 4), 1.7 * math.sin(math.pi * k / 4), 0.48 * (-1) ** k) for k in range(8)])
    add("staggered ferrocene", "D5d", ferrocene(True))
    add("orthocarbonic acid (S4 conformer)", "S4", model("S4", [A("C", 0, 0, 0)], [("O", [1.0, 0.0, 0.85]), ("H", [1.2, 0.9, 1.2])]), "S4 conformer built as the orbit of seed atoms under S4")
    add("S6 model (chair with twisted substituents)", "S6", model("S6", [], [("C", [1.45, 0.0, 0.25]), ("Cl", [2.2, 1.1, 1.1])]), "model built as the orbit of seed atoms under S6")
    add("S8 model", "S8", model("S8", [A("Si", 0, 0, 0)], [("C", [2.0, 0.0, 0.6]), ("H", [2.5, 0.9, 1.1])]), "model built as the orbit of seed atoms under S8")
    add("methane", "Td", [A("C", 0, 0, 0)] + [A("H", *(1.09 * d)) for d in tetra_dirs()])
    add("white phosphorus", "Td", [A("P", *(1.35 * d)) for d in tetra_dirs()])
    add("tetrakis-silyl (T model)", "T", model("T", [A("Si", 0, 0, 0)] + [A("C", *(1.9 * d)) for d in tetra_dirs()], [("H", [1.9, 1.0, 0.3])]), "model built as the orbit of seed atoms under T")
    add("hexanitrocobaltate", "Th", [A("Co", 0, 0, 0)] + [A("N", *(1.95 * d)) for d in octa_dirs()]
        + [A("O", *(2.55 * d + 1.07 * np.roll(np.abs(d), 1))) for d in octa_dirs()] + [A("O", *(2.55 * d - 1.07 * np.roll(np.abs(d), 1))) for d in octa_dirs()])
    add("sulfur hexafluoride", "Oh", [A("S", 0, 0, 0)] + [A("F", *(1.56 * d)) for d in octa_dirs()])
    add("cubane", "Oh", [A("C", *(0.78 * np.array(v))) for v in [(1, 1, 1), (1, 1, -1), (1, -1, 1), (1, -1, -1), (-1, 1, 1), (-1, 1, -1), (-1, -1, 1), (-1, -1, -1)]]
        + [A("H", *(1.41 * np.array(v))) for v in [(1, 1, 1), (1, 1, -1), (1, -1, 1), (1, -1, -1), (-1, 1, 1), (-1, 1, -1), (-1, -1, 1), (-1, -1, -1)]])
    add("octahedral propeller (O model)", "O", model("O", [A("Cr", 0, 0, 0)], [("N", [2.0, 0.0, 0.0]), ("C", [2.6, 1.1, 0.5])]), "model built as the orbit of seed atoms under O")
    add("icosahedral propeller (I model)", "I", model("I", [], [("C", [0.3, 1.2, 3.0])]), "model built as the orbit of a seed atom under I")
    add("buckminsterfullerene C60", "Ih", c60())
    add("closo-dodecaborate B12H12", "Ih", icosahedron("B", 1.70) + icosahedron("H", 2.89))
    add("dodecahedrane", "Ih", dodecahedrane())
    add("hydrogen cyanide", "C∞v", [A("H", 0, 0, -1.07), A("C", 0, 0, 0), A("N", 0, 0, 1.16)])
    add("hydrogen chloride", "C∞v", [A("H", 0, 0, 0), A("Cl", 0, 0, 1.27)])
    add("carbon dioxide", "D∞h", [A("C", 0, 0, 0), A("O", 0, 0, 1.16), A("O", 0, 0, -1.16)])
    add("acetylene", "D∞h", [A("C", 0, 0, 0.60), A("C", 0, 0, -0.60), A("H", 0, 0, 1.66), A("H", 0, 0, -1.66)])
    add("dinitrogen", "D∞h", [A("N", 0, 0, 0.55), A("N", 0, 0, -0.55)])
    # Near-degenerate moments of inertia (accidental): the symmetry is lower than the
    # inertia tensor suggests.
    def spherical_gap(atoms):
        m = moments(atoms)
        return m[2] - m[0] if abs(m[1] - m[0]) < abs(m[2] - m[1]) else m[0] - m[2]
    add("PH3-like pyramid tuned to a spherical inertia tensor", "C3v",
        tuned(lambda h: pyramid("P", "H", 3, 1.42, h) + [A("F", 0, 0, -1.6)], 60.0, 150.0, lambda at: moments(at)[1] - moments(at)[0] - (moments(at)[2] - moments(at)[1])),
        "tuned geometry; textbook assignment by construction")
    add("CH2F2-like tuned to two equal moments", "C2v",
        tuned(c2v_tuned, 60.0, 170.0, lambda at: (moments(at)[1] - moments(at)[0]) - (moments(at)[2] - moments(at)[1])),
        "tuned geometry; textbook assignment by construction")
    add("C2Cl4-like planar tuned to equal in-plane moments", "D2h",
        tuned(d2h_tuned, 90.0, 170.0, lambda at: moments(at)[1] - 2 * moments(at)[0]),
        "tuned geometry; textbook assignment by construction")
    return out


def random_rotation(rng):
    q = rng.normal(size=4)
    q /= np.linalg.norm(q)
    w, x, y, z = q
    return np.array([[1 - 2 * (y * y + z * z), 2 * (x * y - z * w), 2 * (x * z + y * w)],
                     [2 * (x * y + z * w), 1 - 2 * (x * x + z * z), 2 * (y * z - x * w)],
                     [2 * (x * z - y * w), 2 * (y * z + x * w), 1 - 2 * (x * x + y * y)]])


def pymatgen_group(symbols, coords, **kwargs):
    from pymatgen.core import Molecule
    from pymatgen.symmetry.analyzer import PointGroupAnalyzer
    mol = Molecule(symbols, coords)
    return PointGroupAnalyzer(mol, **kwargs).sch_symbol


def build():
    rng = np.random.default_rng(20261201)
    entries = []
    for name, group, atoms, note in molecules():
        symbols = [s for s, _ in atoms]
        ideal = np.array([p for _, p in atoms])
        variants = []
        for _ in range(2):
            r = random_rotation(rng)
            shift = rng.uniform(-3, 3, size=3)
            coords = ideal @ r.T + shift + rng.normal(scale=1e-4, size=ideal.shape)
            coords = np.round(coords, 7)
            variants.append({
                "coords": coords.tolist(),
                "pymatgen": pymatgen_group(symbols, coords),
                "pymatgen_tolerance_0.01": pymatgen_group(symbols, coords, tolerance=0.01),
            })
        entries.append({
            "name": name,
            "textbook": group,
            "source": note,
            "symbols": symbols,
            "ideal": np.round(ideal, 7).tolist(),
            "variants": variants,
        })
    import pymatgen.core
    return {
        "generator": "tests/reference/pymatgen_point_groups.py",
        "pymatgen_version": getattr(pymatgen.core, "__version__", "unknown"),
        "note": "pymatgen PointGroupAnalyzer with its default tolerances ('pymatgen') and with tolerance=0.01 ('pymatgen_tolerance_0.01'); 'C*v'/'D*h' are its linear groups",
        "molecules": entries,
    }


def same(a, b):
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(same(a[k], b[k]) for k in a if k != "pymatgen_version")
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(same(x, y) for x, y in zip(a, b))
    if isinstance(a, float) or isinstance(b, float):
        return abs(a - b) < 1e-6
    return a == b


def main():
    data = build()
    if "--check" in sys.argv:
        committed = json.loads(FIXTURE.read_text(encoding="utf-8"))
        if not same(data, committed):
            print("pymatgen_point_groups.json differs from a fresh regeneration", file=sys.stderr)
            sys.exit(1)
        print("pymatgen_point_groups.json matches")
        return
    FIXTURE.write_text(json.dumps(data, indent=1, ensure_ascii=False) + "\n", encoding="utf-8")
    for m in data["molecules"]:
        pm = [v["pymatgen"] for v in m["variants"]] + [v["pymatgen_tolerance_0.01"] for v in m["variants"]]
        flag = "" if all(p == m["textbook"].replace("∞", "*") for p in pm) else "   <-- pymatgen differs"
        print(f"{m['name']:55s} {m['textbook']:5s} {pm}{flag}")
    print(len(data["molecules"]), "molecules")


if __name__ == "__main__":
    main()
