#!/usr/bin/env python3
"""Reference extended Hückel results from RDKit (PyPI `rdkit`, `rdkit.Chem.rdEHTTools`,
which embeds YAeHMOP) for the fixed geometries in tests/reference/rdkit_geometries/.

Usage:
  python3 rdkit_eht_reference.py                    write tests/reference/rdkit_eht.json
  python3 rdkit_eht_reference.py --check            regenerate in memory and compare with the
                                                    committed JSON (exit 1 on a difference
                                                    beyond 1e-6)
  python3 rdkit_eht_reference.py --make-geometries  (re)create the XYZ files (ETKDG + MMFF
                                                    from SMILES with a fixed seed; C60 from
                                                    the ideal truncated icosahedron; ammonia
                                                    from its experimental structure). Only
                                                    needed once; the XYZ files are committed.

The JSON holds, per molecule: the XYZ file name, charge, electron count, orbital energies
(eV, ascending), Mulliken charges, the reduced (atom x atom) overlap population matrix and,
for molecules with at most 40 basis functions, the full overlap matrix (RDKit returns its
upper triangle; it is symmetrized here). AO order in RDKit/YAeHMOP for s and p is
s, px, py, pz per atom, as in Diptych.

Note: YAeHMOP converts Å to bohr with 0.5292 Å per bohr (found from RDKit's H2 overlap);
the Rust test accounts for that when it compares at the 1e-6 level.
"""

import json
import math
import sys
from pathlib import Path

from rdkit import Chem
from rdkit.Chem import AllChem, rdEHTTools
from rdkit.Geometry import Point3D

HERE = Path(__file__).resolve().parent
GEOMETRIES = HERE / "rdkit_geometries"
OUTPUT = HERE / "rdkit_eht.json"
TOLERANCE = 1e-6
MAX_OVERLAP_BASIS = 40

# name, SMILES (formal charges give the net charge)
MOLECULES = [
    ("water", "O"),
    ("ammonia", "N"),
    ("methane", "C"),
    ("ethylene", "C=C"),
    ("acetylene", "C#C"),
    ("benzene", "c1ccccc1"),
    ("formaldehyde", "C=O"),
    ("hydrogen_cyanide", "C#N"),
    ("methanol", "CO"),
    ("acetonitrile", "CC#N"),
    ("pyridine", "c1ccncc1"),
    ("boron_trifluoride", "FB(F)F"),
    ("ammonia_borane", "[BH3-][NH3+]"),
    ("borohydride", "[BH4-]"),
    ("fluoromethane", "CF"),
    ("trifluoroacetic_acid", "OC(=O)C(F)(F)F"),
    ("silane", "[SiH4]"),
    ("tetramethylsilane", "C[Si](C)(C)C"),
    ("trichloromethylsilane", "C[Si](Cl)(Cl)Cl"),
    ("phosphine", "P"),
    ("trimethylphosphine", "CP(C)C"),
    ("phosphoric_acid", "OP(=O)(O)O"),
    ("hydrogen_sulfide", "S"),
    ("dimethyl_sulfoxide", "CS(C)=O"),
    ("thiophene", "c1ccsc1"),
    ("chloromethane", "CCl"),
    ("hydrogen_chloride", "Cl"),
    ("bromobenzene", "Brc1ccccc1"),
    ("dibromomethane", "BrCBr"),
    ("ammonium", "[NH4+]"),
    ("acetate", "CC(=O)[O-]"),
    ("glycine", "NCC(=O)O"),
    ("aspirin", "CC(=O)Oc1ccccc1C(=O)O"),
]


def write_xyz(path, symbols, coords, charge, comment):
    lines = [str(len(symbols)), f"{comment} charge={charge}"]
    for s, (x, y, z) in zip(symbols, coords):
        lines.append(f"{s:<2} {x:12.6f} {y:12.6f} {z:12.6f}")
    path.write_text("\n".join(lines) + "\n")


def c60_coordinates(bond=1.42):
    """Ideal truncated icosahedron: the even permutations of (0, ±1, ±3φ),
    (±1, ±(2+φ), ±2φ), (±φ, ±2, ±φ³) have edge length 2 (textbook construction)."""
    phi = (1 + 5 ** 0.5) / 2
    bases = [(0, 1, 3 * phi), (1, 2 + phi, 2 * phi), (phi, 2, phi ** 3)]
    points = set()
    for base in bases:
        for perm in [(0, 1, 2), (1, 2, 0), (2, 0, 1)]:
            v = [base[perm[0]], base[perm[1]], base[perm[2]]]
            for sx in (1, -1):
                for sy in (1, -1):
                    for sz in (1, -1):
                        p = (sx * v[0], sy * v[1], sz * v[2])
                        points.add(tuple(round(c, 9) + 0.0 for c in p))
    points = sorted(points)
    assert len(points) == 60, len(points)
    scale = bond / 2.0
    return [tuple(c * scale for c in p) for p in points]


def make_geometries():
    GEOMETRIES.mkdir(exist_ok=True)
    for name, smiles in MOLECULES:
        mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
        params = AllChem.ETKDGv3()
        params.randomSeed = 20261201
        if AllChem.EmbedMolecule(mol, params) != 0:
            raise RuntimeError(f"embedding failed for {name}")
        if AllChem.MMFFHasAllMoleculeParams(mol):
            AllChem.MMFFOptimizeMolecule(mol, maxIters=2000)
        else:
            AllChem.UFFOptimizeMolecule(mol, maxIters=2000)
        conf = mol.GetConformer()
        symbols = [a.GetSymbol() for a in mol.GetAtoms()]
        coords = [tuple(conf.GetAtomPosition(i)) for i in range(mol.GetNumAtoms())]
        write_xyz(GEOMETRIES / f"{name}.xyz", symbols, coords, Chem.GetFormalCharge(mol),
                  f"{name} from SMILES {smiles}: RDKit ETKDGv3 (seed 20261201) + MMFF94/UFF")
    # Ammonia, experimental: N-H 1.012 Å, H-N-H 106.7° (NIST CCCBDB; from memory).
    r, angle = 1.012, math.radians(106.7)
    # Three H on a cone around z: cos(HNH) = sin²β cos120° + cos²β with β the H-N-z angle.
    cos_beta = math.sqrt((2 * math.cos(angle) + 1) / 3)
    sin_beta = math.sqrt(1 - cos_beta ** 2)
    coords = [(0.0, 0.0, 0.0)]
    for k in range(3):
        phi = 2 * math.pi * k / 3
        coords.append((r * sin_beta * math.cos(phi), r * sin_beta * math.sin(phi), -r * cos_beta))
    write_xyz(GEOMETRIES / "ammonia_experimental.xyz", ["N", "H", "H", "H"], coords, 0,
              "ammonia, experimental N-H 1.012 A, H-N-H 106.7 deg (NIST CCCBDB, from memory)")
    write_xyz(GEOMETRIES / "c60.xyz", ["C"] * 60, c60_coordinates(), 0,
              "C60, ideal truncated icosahedron with all C-C 1.42 A")


def read_xyz(path):
    lines = path.read_text().splitlines()
    count = int(lines[0].split()[0])
    charge = 0
    for token in lines[1].split():
        if token.startswith("charge="):
            charge = int(token.split("=", 1)[1])
    symbols, coords = [], []
    for line in lines[2:2 + count]:
        parts = line.split()
        symbols.append(parts[0])
        coords.append(tuple(float(x) for x in parts[1:4]))
    return symbols, coords, charge


def rdkit_molecule(symbols, coords, charge):
    rw = Chem.RWMol()
    for s in symbols:
        atom = Chem.Atom(s)
        atom.SetNoImplicit(True)
        rw.AddAtom(atom)
    rw.GetAtomWithIdx(0).SetFormalCharge(charge)
    mol = rw.GetMol()
    mol.UpdatePropertyCache(strict=False)
    conf = Chem.Conformer(len(symbols))
    for i, c in enumerate(coords):
        conf.SetAtomPosition(i, Point3D(*c))
    mol.AddConformer(conf, assignId=True)
    return mol


def unpack_lower(packed, n):
    """RDKit's reduced overlap population: packed triangle, row-major (i >= j)."""
    m = [[0.0] * n for _ in range(n)]
    k = 0
    for i in range(n):
        for j in range(i + 1):
            m[i][j] = m[j][i] = float(packed[k])
            k += 1
    return m


def compute():
    out = {
        "source": "RDKit rdEHTTools.RunMol (YAeHMOP), rdkit " + Chem.rdBase.rdkitVersion,
        "bohr_in_angstrom_used_by_rdkit": 0.5292,
        "molecules": [],
    }
    for path in sorted(GEOMETRIES.glob("*.xyz")):
        symbols, coords, charge = read_xyz(path)
        mol = rdkit_molecule(symbols, coords, charge)
        ok, res = rdEHTTools.RunMol(mol, keepOverlapAndHamiltonianMatrices=True)
        if not ok:
            raise RuntimeError(f"RDKit EHT failed for {path.name}")
        n = int(res.numOrbitals)
        entry = {
            "name": path.stem,
            "xyz": f"rdkit_geometries/{path.name}",
            "charge": charge,
            "electrons": int(res.numElectrons),
            "basis_size": n,
            "orbital_energies_ev": [float(e) for e in res.GetOrbitalEnergies()],
            "mulliken_charges": [float(q) for q in res.GetAtomicCharges()],
            "total_energy_ev": float(res.totalEnergy),
            "reduced_overlap_population": unpack_lower(
                res.GetReducedOverlapPopulationMatrix(), len(symbols)),
        }
        if n <= MAX_OVERLAP_BASIS:
            s = res.GetOverlapMatrix()
            entry["overlap"] = [[float(s[min(i, j)][max(i, j)]) for j in range(n)]
                                for i in range(n)]
        out["molecules"].append(entry)
    return out


def compare(a, b, path="$"):
    """Yields the places where two JSON trees differ (numbers beyond TOLERANCE)."""
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        if abs(a - b) > TOLERANCE:
            yield f"{path}: {a} vs {b}"
    elif isinstance(a, dict) and isinstance(b, dict):
        if set(a) != set(b):
            yield f"{path}: keys {sorted(set(a) ^ set(b))} differ"
        for key in set(a) & set(b):
            if key == "source":
                continue
            yield from compare(a[key], b[key], f"{path}.{key}")
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            yield f"{path}: length {len(a)} vs {len(b)}"
        for i, (x, y) in enumerate(zip(a, b)):
            yield from compare(x, y, f"{path}[{i}]")
    elif a != b:
        yield f"{path}: {a!r} vs {b!r}"


def main(argv):
    if "--make-geometries" in argv:
        make_geometries()
        return 0
    data = compute()
    if "--check" in argv:
        committed = json.loads(OUTPUT.read_text())
        differences = list(compare(committed, data))
        for line in differences[:50]:
            print(line)
        if differences:
            print(f"{len(differences)} differences beyond {TOLERANCE}")
            return 1
        print(f"rdkit_eht.json agrees with RDKit {Chem.rdBase.rdkitVersion} "
              f"({len(data['molecules'])} molecules)")
        return 0
    OUTPUT.write_text(json.dumps(data, separators=(",", ":")) + "\n")
    print(f"wrote {OUTPUT} ({len(data['molecules'])} molecules)")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
