"""Writes the XYZ geometries of the lone-pair switch checks that are not elsewhere in the
tests (methylamine, phosphorus trifluoride, hypochlorous acid, oxygen difluoride).

Bond lengths and angles are experimental gas-phase values recalled from memory (as
tabulated in the NIST Computational Chemistry Comparison and Benchmark Database, CCCBDB);
they only need to be near the real molecules: the checks are about symmetry and electron
counts, not about these numbers. Run: python3 make_switch_molecules.py
"""

import math


def place(a, b, c, length, angle, dihedral):
    """The point at `length` from a, with angle (deg) a-b... as a Z-matrix row: bonded to a,
    angle with b, dihedral with c."""
    def sub(u, v):
        return [u[i] - v[i] for i in range(3)]

    def cross(u, v):
        return [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]]

    def unit(u):
        n = math.sqrt(sum(x * x for x in u))
        return [x / n for x in u]

    bc = unit(sub(a, b))
    n = unit(cross(sub(b, c), bc))
    m = cross(n, bc)
    th, ph = math.radians(angle), math.radians(dihedral)
    d = [-length * math.cos(th), length * math.sin(th) * math.cos(ph), length * math.sin(th) * math.sin(ph)]
    return [a[i] + d[0] * bc[i] + d[1] * m[i] + d[2] * n[i] for i in range(3)]


def write(name, comment, atoms):
    with open(f"{name}.xyz", "w") as f:
        f.write(f"{len(atoms)}\n{comment}\n")
        for symbol, (x, y, z) in atoms:
            f.write(f"{symbol:2} {x:12.6f} {y:12.6f} {z:12.6f}\n")


def main():
    ref = [0.0, 1.0, 0.0]
    c, n = [0.0, 0.0, 0.0], [1.471, 0.0, 0.0]
    atoms = [("C", c), ("N", n)]
    for dihedral in (57.9, -57.9):
        atoms.append(("H", place(n, c, ref, 1.010, 110.3, dihedral)))
    for dihedral in (180.0, 60.0, -60.0):
        atoms.append(("H", place(c, n, ref, 1.093, 110.0, dihedral)))
    write("methylamine", "methylamine, C-N 1.471 A (experimental, from memory)", atoms)

    p = [0.0, 0.0, 0.0]
    # C3v: three F at polar angle t from the axis with F-P-F 97.8 deg.
    half = math.radians(97.8)
    t = math.acos(math.sqrt((1 + 2 * math.cos(half)) / 3))
    pf = 1.561
    atoms = [("P", p)]
    for k in range(3):
        phi = 2 * math.pi * k / 3
        atoms.append(("F", [pf * math.sin(t) * math.cos(phi), pf * math.sin(t) * math.sin(phi), -pf * math.cos(t)]))
    write("phosphorus_trifluoride", "PF3, P-F 1.561 A, F-P-F 97.8 deg (experimental, from memory)", atoms)

    o = [0.0, 0.0, 0.0]
    atoms = [("O", o), ("H", [0.964, 0.0, 0.0]), ("Cl", place(o, [0.964, 0.0, 0.0], ref, 1.690, 102.5, 0.0))]
    write("hypochlorous_acid", "HOCl, O-H 0.964 A, O-Cl 1.690 A, H-O-Cl 102.5 deg (experimental, from memory)", atoms)

    a = math.radians(103.1 / 2)
    of = 1.405
    atoms = [("O", o), ("F", [of * math.sin(a), 0.0, of * math.cos(a)]), ("F", [-of * math.sin(a), 0.0, of * math.cos(a)])]
    write("oxygen_difluoride", "OF2, O-F 1.405 A, F-O-F 103.1 deg (experimental, from memory)", atoms)


if __name__ == "__main__":
    main()
