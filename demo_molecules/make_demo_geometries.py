#!/usr/bin/env python3
"""Writes the demo XYZ files from experimental internal coordinates.

Bond lengths (Å) and angles (degrees) are experimental values as listed in the NIST
Computational Chemistry Comparison and Benchmark Database (CCCBDB), section
"Experimental geometry data", recalled from memory (not re-checked against the site,
which is not reachable from here). Each file's comment line repeats the values used.
Run: python3 make_demo_geometries.py  (writes *.xyz beside this script)
"""
import math
import os

HERE = os.path.dirname(os.path.abspath(__file__))
SOURCE = "experimental geometry, NIST CCCBDB (from memory)"


def pyramidal(center, ligand, r, angle):
    """AX3 with C3 axis along z, centre above the ligand plane; angle = X-A-X."""
    t = math.radians(angle)
    # For X-A-X = t, the angle between each bond and the axis, b, obeys
    # cos t = cos^2 b + sin^2 b cos 120°.
    cos_b2 = (2 * math.cos(t) + 1) / 3
    b = math.acos(-math.sqrt(cos_b2)) if cos_b2 > 0 else math.pi / 2
    atoms = [(center, 0.0, 0.0, 0.0)]
    for k in range(3):
        phi = 2 * math.pi * k / 3
        atoms.append((ligand, r * math.sin(b) * math.cos(phi), r * math.sin(b) * math.sin(phi), r * math.cos(b)))
    return atoms


def bent(center, ligand, r, angle):
    h = math.radians(angle) / 2
    return [(center, 0.0, 0.0, 0.0), (ligand, 0.0, r * math.sin(h), -r * math.cos(h)), (ligand, 0.0, -r * math.sin(h), -r * math.cos(h))]


def tetrahedral(center, ligand, r):
    s = r / math.sqrt(3)
    return [(center, 0, 0, 0), (ligand, s, s, s), (ligand, -s, -s, s), (ligand, -s, s, -s), (ligand, s, -s, -s)]


def planar_ax3(center, ligand, r):
    return [(center, 0, 0, 0)] + [(ligand, r * math.cos(2 * math.pi * k / 3), r * math.sin(2 * math.pi * k / 3), 0.0) for k in range(3)]


def formaldehyde(rco, rch, hch):
    h = math.radians(hch) / 2
    return [("C", 0, 0, 0), ("O", 0, 0, rco), ("H", 0, rch * math.sin(h), -rch * math.cos(h)), ("H", 0, -rch * math.sin(h), -rch * math.cos(h))]


def ethylene(rcc, rch, hch):
    h = math.radians(hch) / 2
    z = rcc / 2
    atoms = [("C", 0, 0, z), ("C", 0, 0, -z)]
    for sign in (1, -1):
        for side in (1, -1):
            atoms.append(("H", 0, side * rch * math.sin(h), sign * (z + rch * math.cos(h))))
    return atoms


def hcn(rch, rcn):
    return [("H", 0, 0, -rch), ("C", 0, 0, 0), ("N", 0, 0, rcn)]


def cyclopropane(rcc, rch, hch):
    rho = rcc / math.sqrt(3)
    h = math.radians(hch) / 2
    atoms = []
    for k in range(3):
        phi = 2 * math.pi * k / 3
        atoms.append(("C", rho * math.cos(phi), rho * math.sin(phi), 0.0))
    for k in range(3):
        phi = 2 * math.pi * k / 3
        radial = rho + rch * math.cos(h)
        for side in (1, -1):
            atoms.append(("H", radial * math.cos(phi), radial * math.sin(phi), side * rch * math.sin(h)))
    return atoms


def chloromethane(rccl, rch, hch):
    # H-C-H angle hch; C3 axis along z, the H atoms below C and Cl on +z.
    return pyramidal("C", "H", rch, hch) + [("Cl", 0.0, 0.0, rccl)]


def octahedral(center, ligand, r):
    atoms = [(center, 0.0, 0.0, 0.0)]
    for axis in range(3):
        for sign in (1, -1):
            xyz = [0.0, 0.0, 0.0]
            xyz[axis] = sign * r
            atoms.append((ligand, *xyz))
    return atoms


def diatomic(a, b, r):
    # Bond along z, centred on the origin.
    return [(a, 0.0, 0.0, -r / 2), (b, 0.0, 0.0, r / 2)]


def diborane(rbb, rbh_t, rbh_b, hbh_t):
    # D2h: B on the x axis, bridging H on the y axis, terminal H in the xz plane. With
    # B-B 1.763 and B-H(bridge) 1.33 the bridge angle H-B-H follows as 97.0 degrees.
    half = rbb / 2
    y_bridge = math.sqrt(rbh_b**2 - half**2)
    h = math.radians(hbh_t) / 2
    xt, zt = half + rbh_t * math.cos(h), rbh_t * math.sin(h)
    atoms = [("B", half, 0.0, 0.0), ("B", -half, 0.0, 0.0), ("H", 0.0, y_bridge, 0.0), ("H", 0.0, -y_bridge, 0.0)]
    for sx in (1, -1):
        for sz in (1, -1):
            atoms.append(("H", sx * xt, 0.0, sz * zt))
    return atoms


MOLECULES = {
    "ammonia": (pyramidal("N", "H", 1.012, 106.7), "N-H 1.012, H-N-H 106.7"),
    "phosphine": (pyramidal("P", "H", 1.420, 93.3), "P-H 1.420, H-P-H 93.3"),
    "nitrogen_trifluoride": (pyramidal("N", "F", 1.365, 102.4), "N-F 1.365, F-N-F 102.4"),
    "water": (bent("O", "H", 0.9572, 104.52), "O-H 0.9572, H-O-H 104.52"),
    "methane": (tetrahedral("C", "H", 1.087), "C-H 1.087, Td"),
    "boron_trifluoride": (planar_ax3("B", "F", 1.307), "B-F 1.307, D3h"),
    "formaldehyde": (formaldehyde(1.205, 1.111, 116.1), "C=O 1.205, C-H 1.111, H-C-H 116.1"),
    "ethylene": (ethylene(1.339, 1.086, 117.6), "C=C 1.339, C-H 1.086, H-C-H 117.6"),
    "hydrogen_cyanide": (hcn(1.065, 1.153), "C-H 1.065, C-N 1.153, linear"),
    "cyclopropane": (cyclopropane(1.510, 1.089, 115.1), "C-C 1.510, C-H 1.089, H-C-H 115.1"),
    "chloromethane": (chloromethane(1.776, 1.090, 110.5), "C-Cl 1.776, C-H 1.090, H-C-H 110.5"),
    "sulfur_hexafluoride": (octahedral("S", "F", 1.561), "S-F 1.561, Oh"),
    "diborane": (diborane(1.763, 1.19, 1.33, 121.5), "B-B 1.763, B-H terminal 1.19, B-H bridge 1.33, H-B-H terminal 121.5, D2h"),
    "dioxygen": (diatomic("O", "O", 1.2075), "O-O 1.2075, triplet ground state"),
    "carbon_monoxide": (diatomic("C", "O", 1.128), "C-O 1.128"),
}

if __name__ == "__main__":
    for name, (atoms, values) in MOLECULES.items():
        with open(os.path.join(HERE, name + ".xyz"), "w") as handle:
            handle.write(f"{len(atoms)}\n{name}; {SOURCE}: {values}; charge=0\n")
            for element, x, y, z in atoms:
                handle.write(f"{element:<2} {x:13.8f} {y:13.8f} {z:13.8f}\n")
