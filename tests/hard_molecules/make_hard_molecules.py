#!/usr/bin/env python3
"""Writes the "hard" test molecules (open shells, ions, hypervalent and electron-deficient
centres, single atoms, metal and ionic diatomics, plus small Lewis-structure molecules) as
XYZ files from internal coordinates.

Bond lengths (Å) and angles (degrees) are experimental values where an experiment exists,
otherwise well-known computed or typical crystal-structure values. All of them are recalled
from memory (none was re-checked: neither the NIST CCCBDB nor the other references were
consulted while writing this); each file's comment line names the kind of source and repeats the
values used, in the form `NAME; SOURCE: values; charge=N`. Symmetric molecules are built
exactly symmetric: symmetry-equivalent atoms get coordinates that differ only by sign or
by a permutation of the same numbers, so they stay equivalent after rounding to 1e-8 Å.
Only elements with extended Hückel parameters in assets/eht_parameters.ron are used
(H-Ca and Ga-Br except Ar, which has none).
Run: python3 make_hard_molecules.py  (writes *.xyz beside this script)
"""
import math
import os

HERE = os.path.dirname(os.path.abspath(__file__))
CCCBDB = "experimental geometry, NIST CCCBDB (from memory)"
CRYSTAL = "typical crystal-structure value, rounded (from memory)"
COMPUTED = "well-known computed value, approximate (from memory)"
ATOM = "isolated atom, no geometry (origin)"
SQRT3_2 = math.sqrt(3) / 2


# --- helpers: every function returns a list of (symbol, x, y, z) -----------------------


def single(element):
    return [(element, 0.0, 0.0, 0.0)]


def diatomic(a, b, r):
    """A-B along z with the bond centre at the origin."""
    return [(a, 0.0, 0.0, -r / 2), (b, 0.0, 0.0, r / 2)]


def linear_symmetric(center, ligand, r):
    """X-A-X, D∞h, along z."""
    return [(center, 0.0, 0.0, 0.0), (ligand, 0.0, 0.0, r), (ligand, 0.0, 0.0, -r)]


def linear_chain(symbols, bonds):
    """Linear chain along z; bonds[i] joins symbols[i] and symbols[i+1]; centred on its
    middle (exactly symmetric when the chain is a palindrome)."""
    z = [0.0]
    for r in bonds:
        z.append(z[-1] + r)
    mid = (z[0] + z[-1]) / 2
    return [(s, 0.0, 0.0, zi - mid) for s, zi in zip(symbols, z)]


def bent(center, ligand, r, angle):
    """AX2, C2v, axis z, ligands below the centre in the yz plane."""
    h = math.radians(angle) / 2
    y, z = r * math.sin(h), -r * math.cos(h)
    return [(center, 0.0, 0.0, 0.0), (ligand, 0.0, y, z), (ligand, 0.0, -y, z)]


def triangle(ligand, rho, z=0.0):
    """Three atoms at distance rho from the z axis, 120° apart, at height z."""
    return [(ligand, rho, 0.0, z), (ligand, -rho / 2, rho * SQRT3_2, z), (ligand, -rho / 2, -rho * SQRT3_2, z)]


def pyramidal(center, ligand, r, angle):
    """AX3 with the C3 axis along z, centre above the ligand plane; angle = X-A-X."""
    t = math.radians(angle)
    # For X-A-X = t, the angle b between each bond and the axis obeys
    # cos t = cos^2 b + sin^2 b cos 120°.
    cos_b2 = (2 * math.cos(t) + 1) / 3
    b = math.acos(-math.sqrt(cos_b2)) if cos_b2 > 0 else math.pi / 2
    return [(center, 0.0, 0.0, 0.0)] + triangle(ligand, r * math.sin(b), r * math.cos(b))


def planar_ax3(center, ligand, r):
    return [(center, 0.0, 0.0, 0.0)] + triangle(ligand, r)


def tetrahedral(center, ligand, r):
    s = r / math.sqrt(3)
    return [(center, 0.0, 0.0, 0.0), (ligand, s, s, s), (ligand, -s, -s, s), (ligand, -s, s, -s), (ligand, s, -s, -s)]


def octahedral(center, ligand, r):
    atoms = [(center, 0.0, 0.0, 0.0)]
    for axis in range(3):
        for sign in (1, -1):
            xyz = [0.0, 0.0, 0.0]
            xyz[axis] = sign * r
            atoms.append((ligand, *xyz))
    return atoms


def trigonal_bipyramid(center, axial, equatorial, r_ax, r_eq):
    """AX5, D3h: axial ligands on ±z, equatorial ligands in the xy plane."""
    return [(center, 0.0, 0.0, 0.0), (axial, 0.0, 0.0, r_ax), (axial, 0.0, 0.0, -r_ax)] + triangle(equatorial, r_eq)


def seesaw(center, ligand, r_ax, r_eq, ax_angle, eq_angle):
    """AX4E (SF4), C2v along z, lone pair towards +z. Equatorial ligands in the xz plane,
    axial ligands in the yz plane, bent away from the lone pair (towards -z)."""
    e, a = math.radians(eq_angle) / 2, math.radians(ax_angle) / 2
    xe, ze = r_eq * math.sin(e), -r_eq * math.cos(e)
    ya, za = r_ax * math.sin(a), -r_ax * math.cos(a)
    return [(center, 0.0, 0.0, 0.0), (ligand, xe, 0.0, ze), (ligand, -xe, 0.0, ze), (ligand, 0.0, ya, za), (ligand, 0.0, -ya, za)]


def t_shaped(center, ligand, r_eq, r_ax, ax_eq_angle):
    """AX3E2 (ClF3), planar C2v: the equatorial ligand on -z, the two axial ligands in the
    yz plane at ax_eq_angle from it (bent away from the lone pairs)."""
    t = math.radians(ax_eq_angle)
    y, z = r_ax * math.sin(t), -r_ax * math.cos(t)
    return [(center, 0.0, 0.0, 0.0), (ligand, 0.0, 0.0, -r_eq), (ligand, 0.0, y, z), (ligand, 0.0, -y, z)]


def square_pyramid(center, ligand, r_ap, r_bas, ap_bas_angle):
    """AX5E (BrF5), C4v: apical ligand on +z, four basal ligands at ap_bas_angle from it."""
    t = math.radians(ap_bas_angle)
    s, z = r_bas * math.sin(t), r_bas * math.cos(t)
    return [(center, 0.0, 0.0, 0.0), (ligand, 0.0, 0.0, r_ap), (ligand, s, 0.0, z), (ligand, -s, 0.0, z), (ligand, 0.0, s, z), (ligand, 0.0, -s, z)]


def ax2y2(center, x, y, r_x, r_y, xax, yay):
    """AX2Y2 (SO2Cl2), C2v along z: X in the yz plane above, Y in the xz plane below."""
    a, b = math.radians(xax) / 2, math.radians(yay) / 2
    px, pz = r_x * math.sin(a), r_x * math.cos(a)
    qx, qz = r_y * math.sin(b), -r_y * math.cos(b)
    return [(center, 0.0, 0.0, 0.0), (x, 0.0, px, pz), (x, 0.0, -px, pz), (y, qx, 0.0, qz), (y, -qx, 0.0, qz)]


def double_bonded_ax2(center, terminal, ligand, r_double, r_lig, angle):
    """X2A=B (formaldehyde, vinylidene): A at the origin, B on +z, X at X-A-X = angle."""
    h = math.radians(angle) / 2
    y, z = r_lig * math.sin(h), -r_lig * math.cos(h)
    return [(center, 0.0, 0.0, 0.0), (terminal, 0.0, 0.0, r_double), (ligand, 0.0, y, z), (ligand, 0.0, -y, z)]


def ethylene(rcc, rch, hch):
    h = math.radians(hch) / 2
    z0 = rcc / 2
    y, z = rch * math.sin(h), z0 + rch * math.cos(h)
    return [("C", 0.0, 0.0, z0), ("C", 0.0, 0.0, -z0), ("H", 0.0, y, z), ("H", 0.0, -y, z), ("H", 0.0, y, -z), ("H", 0.0, -y, -z)]


def cyclopropane(rcc, rch, hch):
    rho = rcc / math.sqrt(3)
    h = math.radians(hch) / 2
    radial, height = rho + rch * math.cos(h), rch * math.sin(h)
    return triangle("C", rho) + triangle("H", radial, height) + triangle("H", radial, -height)


def hexagon(element, r):
    """Six atoms at distance r from the origin in the xy plane, D6h."""
    return [(element, r, 0.0, 0.0), (element, -r, 0.0, 0.0), (element, r / 2, r * SQRT3_2, 0.0), (element, -r / 2, r * SQRT3_2, 0.0), (element, r / 2, -r * SQRT3_2, 0.0), (element, -r / 2, -r * SQRT3_2, 0.0)]


def benzene(rcc, rch):
    return hexagon("C", rcc) + hexagon("H", rcc + rch)


def bridged_dimer(metal, terminal, bridge, half_mm, y_bridge, r_t, t_angle):
    """M2X4Y2 (diborane, Al2Cl6), D2h: metals on ±x, bridging atoms on ±y, terminal atoms
    in the xz plane at X-M-X = t_angle."""
    h = math.radians(t_angle) / 2
    xt, zt = half_mm + r_t * math.cos(h), r_t * math.sin(h)
    atoms = [(metal, half_mm, 0.0, 0.0), (metal, -half_mm, 0.0, 0.0), (bridge, 0.0, y_bridge, 0.0), (bridge, 0.0, -y_bridge, 0.0)]
    for sx in (1, -1):
        for sz in (1, -1):
            atoms.append((terminal, sx * xt, 0.0, sz * zt))
    return atoms


def diborane(rbb, rbh_t, rbh_b, hbh_t):
    half = rbb / 2
    return bridged_dimer("B", "H", "H", half, math.sqrt(rbh_b**2 - half**2), rbh_t, hbh_t)


def al2cl6(r_t, r_b, t_angle, b_angle):
    h = math.radians(b_angle) / 2
    return bridged_dimer("Al", "Cl", "Cl", r_b * math.cos(h), r_b * math.sin(h), r_t, t_angle)


def icosahedral_cluster(vertex, ligand, edge, r_ligand):
    """closo-X12Y12, Ih: vertices at the cyclic permutations of (0, ±1, ±φ) scaled so the
    edge is `edge`; one ligand radially outward from each vertex."""
    phi = (1 + math.sqrt(5)) / 2
    s = edge / 2  # the edge of the (0, ±1, ±φ) icosahedron is 2
    radius = s * math.sqrt(1 + phi * phi)
    k = (radius + r_ligand) / radius
    base = []
    for a in (1, -1):
        for b in (1, -1):
            base += [(0.0, a * 1.0, b * phi), (a * 1.0, b * phi, 0.0), (b * phi, 0.0, a * 1.0)]
    atoms = [(vertex, s * x, s * y, s * z) for x, y, z in base]
    atoms += [(ligand, k * s * x, k * s * y, k * s * z) for x, y, z in base]
    return atoms


def allyl(rcc, ccc, rch):
    """C3H5 radical, C2v, planar (yz): C-C and C-C-C given; every C-H = rch, the central H
    on +z, the terminal CH2 groups with idealized 120° angles at carbon."""
    h = math.radians(ccc) / 2
    ty, tz = rcc * math.sin(h), -rcc * math.cos(h)
    atoms = [("C", 0.0, 0.0, 0.0), ("C", 0.0, ty, tz), ("C", 0.0, -ty, tz), ("H", 0.0, 0.0, rch)]
    # Terminal H directions: the terminal-to-central bond direction rotated by ±120°.
    uy, uz = -ty / rcc, -tz / rcc
    for turn in (120.0, -120.0):
        c, s = math.cos(math.radians(turn)), math.sin(math.radians(turn))
        dy, dz = c * uy - s * uz, s * uy + c * uz
        y, z = ty + rch * dy, tz + rch * dz
        atoms += [("H", 0.0, y, z), ("H", 0.0, -y, z)]
    return atoms


def hof(r_oh, r_of, angle):
    """HOF, Cs, in the xy plane."""
    t = math.radians(angle)
    return [("O", 0.0, 0.0, 0.0), ("H", r_oh, 0.0, 0.0), ("F", r_of * math.cos(t), r_of * math.sin(t), 0.0)]


# --- the set: name -> (atoms, charge, category, source, values) --------------------------
# category is for README.md only; values go into the comment line (ASCII only).

OPEN = "open shell"
ION = "ion"
HYPER = "hypervalent"
DEFICIENT = "electron-deficient"
LONE = "single atom, open shell"
LEWIS = "clear Lewis structure (reference)"
METAL = "metal / ionic"

MOLECULES = {
    # open shells and radicals
    "dioxygen_triplet": (diatomic("O", "O", 1.2075), 0, OPEN, CCCBDB, "O-O 1.2075, triplet ground state"),
    "nitric_oxide": (diatomic("N", "O", 1.1508), 0, OPEN, CCCBDB, "N-O 1.1508, doublet"),
    "nitrogen_dioxide": (bent("N", "O", 1.193, 134.1), 0, OPEN, CCCBDB, "N-O 1.193, O-N-O 134.1, doublet"),
    "methyl_radical": (planar_ax3("C", "H", 1.079), 0, OPEN, CCCBDB, "C-H 1.079, planar D3h, doublet"),
    "hydroxyl_radical": (diatomic("O", "H", 0.9697), 0, OPEN, CCCBDB, "O-H 0.9697, doublet"),
    "allyl_radical": (allyl(1.387, 124.6, 1.08), 0, OPEN, "C-C and C-C-C gas-phase experimental, C-H and H angles assumed (from memory)", "C-C 1.387, C-C-C 124.6; C-H 1.08 and 120 deg at each C assumed, C2v, doublet"),
    "chlorine_dioxide": (bent("Cl", "O", 1.470, 117.4), 0, OPEN, CCCBDB, "Cl-O 1.470, O-Cl-O 117.4, doublet"),
    "methylene_triplet": (bent("C", "H", 1.075, 133.9), 0, OPEN, "experimental geometry from spectroscopy, Jensen and Bunker (from memory)", "C-H 1.075, H-C-H 133.9, triplet"),
    "hydrogen_atom": (single("H"), 0, LONE, ATOM, "H atom, doublet 2S"),
    "carbon_atom": (single("C"), 0, LONE, ATOM, "C atom, triplet 3P"),
    "nitrogen_atom": (single("N"), 0, LONE, ATOM, "N atom, quartet 4S"),
    "oxygen_atom": (single("O"), 0, LONE, ATOM, "O atom, triplet 3P"),
    "helium_atom": (single("He"), 0, "single atom, closed shell", ATOM, "He atom, singlet 1S"),
    # ions
    "ammonium": (tetrahedral("N", "H", 1.03), 1, ION, COMPUTED, "N-H 1.03, Td"),
    "borohydride": (tetrahedral("B", "H", 1.24), -1, ION, COMPUTED, "B-H 1.24, Td"),
    "hydroxide": (diatomic("O", "H", 0.964), -1, ION, "gas-phase experimental value, Rosenbaum et al. 1986 (from memory)", "O-H 0.964"),
    "hydronium": (pyramidal("O", "H", 0.976, 111.3), 1, ION, COMPUTED, "O-H 0.976, H-O-H 111.3, C3v"),
    "nitrite": (bent("N", "O", 1.25, 116.5), -1, ION, "approximate, between crystal NaNO2 and computed gas-phase values (from memory)", "N-O 1.25, O-N-O 116.5"),
    "nitronium": (linear_symmetric("N", "O", 1.12), 1, ION, "gas-phase spectroscopic value, approximate (from memory)", "N-O 1.12, linear"),
    "nitrosonium": (diatomic("N", "O", 1.063), 1, ION, "experimental r_e, Huber and Herzberg (from memory)", "N-O 1.063"),
    "carbonate": (planar_ax3("C", "O", 1.29), -2, ION, CRYSTAL, "C-O 1.29 (calcite), D3h"),
    "sulfate": (tetrahedral("S", "O", 1.47), -2, ION, CRYSTAL, "S-O 1.47, Td"),
    "perchlorate": (tetrahedral("Cl", "O", 1.44), -1, ION, CRYSTAL, "Cl-O 1.44, Td"),
    "phosphate": (tetrahedral("P", "O", 1.54), -3, ION, CRYSTAL, "P-O 1.54, Td"),
    "tetrafluoroborate": (tetrahedral("B", "F", 1.39), -1, ION, CRYSTAL, "B-F 1.39, Td"),
    "cyanide": (diatomic("C", "N", 1.17), -1, ION, COMPUTED, "C-N 1.17"),
    "trihydrogen_cation": (triangle("H", 0.87 / math.sqrt(3)), 1, ION, COMPUTED, "H-H 0.87, equilateral D3h"),
    "azide": (linear_symmetric("N", "N", 1.18), -1, ION, CRYSTAL, "N-N 1.18 (NaN3), linear"),
    "bifluoride": (linear_symmetric("H", "F", 1.13), -1, ION, CRYSTAL, "F-F 2.26 (KHF2), H centred, H-F 1.13, linear"),
    "hexafluorophosphate": (octahedral("P", "F", 1.58), -1, ION, CRYSTAL, "P-F 1.58, Oh"),
    "hexafluorosilicate": (octahedral("Si", "F", 1.68), -2, ION, CRYSTAL, "Si-F 1.68 (K2SiF6), Oh"),
    # hypervalent centres
    "sulfur_hexafluoride": (octahedral("S", "F", 1.561), 0, HYPER, CCCBDB, "S-F 1.561, Oh"),
    "selenium_hexafluoride": (octahedral("Se", "F", 1.688), 0, HYPER, "experimental geometry, gas-phase electron diffraction (from memory)", "Se-F 1.688, Oh"),
    "phosphorus_pentafluoride": (trigonal_bipyramid("P", "F", "F", 1.577, 1.534), 0, HYPER, CCCBDB, "P-F axial 1.577, equatorial 1.534, D3h"),
    "arsenic_pentafluoride": (trigonal_bipyramid("As", "F", "F", 1.711, 1.656), 0, HYPER, "experimental geometry, gas-phase electron diffraction (from memory)", "As-F axial 1.711, equatorial 1.656, D3h"),
    "phosphorus_pentachloride": (trigonal_bipyramid("P", "Cl", "Cl", 2.14, 2.02), 0, HYPER, "experimental geometry, gas-phase electron diffraction (from memory)", "P-Cl axial 2.14, equatorial 2.02, D3h"),
    "chlorine_trifluoride": (t_shaped("Cl", "F", 1.598, 1.698, 87.5), 0, HYPER, CCCBDB, "Cl-F equatorial 1.598, axial 1.698, F(ax)-Cl-F(eq) 87.5, T-shaped C2v"),
    "sulfur_tetrafluoride": (seesaw("S", "F", 1.646, 1.545, 173.1, 101.6), 0, HYPER, CCCBDB, "S-F axial 1.646, equatorial 1.545, F(ax)-S-F(ax) 173.1, F(eq)-S-F(eq) 101.6, C2v"),
    "bromine_pentafluoride": (square_pyramid("Br", "F", 1.689, 1.774, 84.8), 0, HYPER, CCCBDB, "Br-F apical 1.689, basal 1.774, F(ap)-Br-F(bas) 84.8, C4v"),
    "chlorine_pentafluoride": (square_pyramid("Cl", "F", 1.571, 1.669, 86.0), 0, HYPER, "experimental geometry, microwave, approximate (from memory)", "Cl-F apical 1.571, basal 1.669, F(ap)-Cl-F(bas) 86.0, C4v"),
    "sulfur_trioxide": (planar_ax3("S", "O", 1.4198), 0, HYPER, CCCBDB, "S-O 1.4198, D3h"),
    "sulfur_dioxide": (bent("S", "O", 1.4308, 119.33), 0, HYPER, CCCBDB, "S-O 1.4308, O-S-O 119.33"),
    "sulfuryl_chloride": (ax2y2("S", "O", "Cl", 1.404, 2.011, 123.5, 100.3), 0, HYPER, CCCBDB, "S-O 1.404, S-Cl 2.011, O-S-O 123.5, Cl-S-Cl 100.3, C2v"),
    # electron-deficient
    "diborane": (diborane(1.77, 1.19, 1.33, 121.5), 0, DEFICIENT, "experimental geometry, gas-phase electron diffraction and IR, rounded (from memory)", "B-B 1.77, B-H terminal 1.19, B-H bridge 1.33, H-B-H terminal 121.5, D2h"),
    "borane": (planar_ax3("B", "H", 1.19), 0, DEFICIENT, "experimental geometry, gas-phase IR (from memory)", "B-H 1.19, D3h"),
    "dodecaborate": (icosahedral_cluster("B", "H", 1.78, 1.20), -2, DEFICIENT, CRYSTAL, "closo-B12H12, B-B 1.78 (every edge), B-H 1.20 radial, Ih"),
    "aluminium_trichloride": (planar_ax3("Al", "Cl", 2.06), 0, DEFICIENT, "experimental geometry, gas-phase electron diffraction (from memory)", "Al-Cl 2.06, monomer, D3h"),
    "gallium_trichloride": (planar_ax3("Ga", "Cl", 2.09), 0, DEFICIENT, "experimental geometry, gas-phase electron diffraction, approximate (from memory)", "Ga-Cl 2.09, monomer, D3h"),
    "beryllium_hydride": (linear_symmetric("Be", "H", 1.3264), 0, DEFICIENT, "experimental geometry, gas-phase IR emission, Bernath et al. (from memory)", "Be-H 1.3264, linear"),
    "aluminium_chloride_dimer": (al2cl6(2.065, 2.252, 122.0, 91.0), 0, DEFICIENT, "experimental geometry, gas-phase electron diffraction, approximate (from memory)", "Al-Cl terminal 2.065, bridge 2.252, Cl(t)-Al-Cl(t) 122.0, Cl(b)-Al-Cl(b) 91.0, D2h"),
    # small molecules with clear Lewis structures
    "dihydrogen": (diatomic("H", "H", 0.741), 0, LEWIS, CCCBDB, "H-H 0.741"),
    "difluorine": (diatomic("F", "F", 1.412), 0, LEWIS, CCCBDB, "F-F 1.412"),
    "dinitrogen": (diatomic("N", "N", 1.098), 0, LEWIS, CCCBDB, "N-N 1.098"),
    "carbon_monoxide": (diatomic("C", "O", 1.128), 0, LEWIS, CCCBDB, "C-O 1.128"),
    "carbon_monosulfide": (diatomic("C", "S", 1.535), 0, LEWIS, CCCBDB, "C-S 1.535"),
    "dicarbon": (diatomic("C", "C", 1.2425), 0, LEWIS, CCCBDB, "C-C 1.2425, singlet"),
    "hydrogen_cyanide": (linear_chain(["H", "C", "N"], [1.065, 1.153]), 0, LEWIS, CCCBDB, "C-H 1.065, C-N 1.153, linear"),
    "acetylene": (linear_chain(["H", "C", "C", "H"], [1.063, 1.203, 1.063]), 0, LEWIS, CCCBDB, "C-C 1.203, C-H 1.063, linear"),
    "carbon_dioxide": (linear_symmetric("C", "O", 1.160), 0, LEWIS, CCCBDB, "C-O 1.160, linear"),
    "carbon_disulfide": (linear_symmetric("C", "S", 1.5526), 0, LEWIS, CCCBDB, "C-S 1.5526, linear"),
    "formaldehyde": (double_bonded_ax2("C", "O", "H", 1.205, 1.111, 116.1), 0, LEWIS, CCCBDB, "C=O 1.205, C-H 1.111, H-C-H 116.1"),
    "ethylene": (ethylene(1.339, 1.086, 117.6), 0, LEWIS, CCCBDB, "C=C 1.339, C-H 1.086, H-C-H 117.6"),
    "ozone": (bent("O", "O", 1.272, 116.8), 0, LEWIS, CCCBDB, "O-O 1.272, O-O-O 116.8"),
    "benzene": (benzene(1.397, 1.084), 0, LEWIS, CCCBDB, "C-C 1.397, C-H 1.084, D6h"),
    "cyclopropane": (cyclopropane(1.510, 1.089, 115.1), 0, LEWIS, CCCBDB, "C-C 1.510, C-H 1.089, H-C-H 115.1"),
    "nitrogen_trifluoride": (pyramidal("N", "F", 1.365, 102.4), 0, LEWIS, CCCBDB, "N-F 1.365, F-N-F 102.4"),
    "phosphine": (pyramidal("P", "H", 1.420, 93.3), 0, LEWIS, CCCBDB, "P-H 1.420, H-P-H 93.3"),
    "arsine": (pyramidal("As", "H", 1.511, 92.1), 0, LEWIS, CCCBDB, "As-H 1.511, H-As-H 92.1"),
    "hydrogen_sulfide": (bent("S", "H", 1.336, 92.1), 0, LEWIS, CCCBDB, "S-H 1.336, H-S-H 92.1"),
    "hydrogen_selenide": (bent("Se", "H", 1.460, 90.6), 0, LEWIS, CCCBDB, "Se-H 1.460, H-Se-H 90.6"),
    "hypofluorous_acid": (hof(0.966, 1.442, 97.2), 0, LEWIS, CCCBDB, "O-H 0.966, O-F 1.442, H-O-F 97.2"),
    "vinylidene": (double_bonded_ax2("C", "C", "H", 1.30, 1.09, 120.0), 0, LEWIS, COMPUTED, "C=C 1.30, C-H 1.09, H-C-H 120.0, singlet carbene"),
    "silane": (tetrahedral("Si", "H", 1.480), 0, LEWIS, CCCBDB, "Si-H 1.480, Td"),
    "germane": (tetrahedral("Ge", "H", 1.514), 0, LEWIS, CCCBDB, "Ge-H 1.514, Td"),
    "hydrogen_bromide": (diatomic("H", "Br", 1.4145), 0, LEWIS, CCCBDB, "H-Br 1.4145"),
    "dibromine": (diatomic("Br", "Br", 2.281), 0, LEWIS, CCCBDB, "Br-Br 2.281"),
    # metals and ionic diatomics
    "lithium_hydride": (diatomic("Li", "H", 1.5957), 0, METAL, CCCBDB, "Li-H 1.5957"),
    "lithium_fluoride": (diatomic("Li", "F", 1.5639), 0, METAL, CCCBDB, "Li-F 1.5639"),
    "sodium_chloride": (diatomic("Na", "Cl", 2.3609), 0, METAL, CCCBDB, "Na-Cl 2.3609, gas-phase diatomic"),
    "potassium_fluoride": (diatomic("K", "F", 2.1716), 0, METAL, CCCBDB, "K-F 2.1716, gas-phase diatomic"),
    "potassium_chloride": (diatomic("K", "Cl", 2.6667), 0, METAL, CCCBDB, "K-Cl 2.6667, gas-phase diatomic"),
    "magnesium_oxide": (diatomic("Mg", "O", 1.749), 0, METAL, CCCBDB, "Mg-O 1.749, gas-phase diatomic"),
    "calcium_hydride": (linear_symmetric("Ca", "H", 2.05), 0, METAL, COMPUTED, "Ca-H 2.05, linear as requested (the gas-phase shape is floppy)"),
    "dilithium": (diatomic("Li", "Li", 2.673), 0, METAL, CCCBDB, "Li-Li 2.673"),
    "disodium": (diatomic("Na", "Na", 3.079), 0, METAL, CCCBDB, "Na-Na 3.079"),
}


def number(value):
    """Coordinates rounded to 1e-8 Å, without a '-0.00000000'."""
    value = round(value, 8)
    return 0.0 if value == 0 else value


def comment(name, charge, source, values):
    return f"{name}; {source}: {values}; charge={charge}"


if __name__ == "__main__":
    for name, (atoms, charge, _category, source, values) in MOLECULES.items():
        with open(os.path.join(HERE, name + ".xyz"), "w") as handle:
            handle.write(f"{len(atoms)}\n{comment(name, charge, source, values)}\n")
            for element, x, y, z in atoms:
                handle.write(f"{element:<2} {number(x):13.8f} {number(y):13.8f} {number(z):13.8f}\n")
