#!/usr/bin/env python3
"""Reference Pipek-Mezey localization from PySCF (PyPI `pyscf`, `pyscf.lo.PM`) for the
Rust localizer in src/localize.rs.

For water and ethylene at fixed geometries (below, Å) it runs STO-3G RHF, takes the
occupied canonical MOs, and localizes them with PySCF's own Pipek-Mezey optimizer using
Mulliken populations (`pop_method='mulliken'`, the original scheme of Pipek and Mezey,
J. Chem. Phys. 90, 4916 (1989)).

The localization function compared is PySCF's `cost_function` with `exponent = 2`:
    P = sum_i sum_A (Q_A^i)^2,   Q_A^i = sum_{mu in A} C_mu,i (S C)_mu,i
(Mulliken gross population of orbital i on atom A, symmetric split of the overlap). The
Rust localizer maximizes exactly this quantity; no extra exponent or normalization.

PySCF is run from several starts (its 'atomic' guess, the canonical orbitals, and a few
seeded random rotations) with tight thresholds; the best value is the reference.

Usage:
  python3 pyscf_pm_reference.py           write tests/reference/pyscf_pm.json
  python3 pyscf_pm_reference.py --check   regenerate in memory and compare with the committed
                                          JSON (exit 1 on a difference beyond 1e-6)

The JSON holds, per molecule: AO labels, the AO->atom map (0-based), the overlap matrix S,
the occupied MO coefficients (columns = orbitals, row-major list of rows), PySCF's
localization-function value of the canonical orbitals and its best Pipek-Mezey value, and
the values from each start. --check compares S, the occupied-space projector C C^T
(independent of the phase and rotation of degenerate orbitals) and the best PM value.
"""

import json
import sys
from pathlib import Path

import numpy
from pyscf import gto, lo, scf

HERE = Path(__file__).resolve().parent
OUTPUT = HERE / "pyscf_pm.json"
TOLERANCE = 1e-6

# name, geometry (Å). Water: O-H 0.9572 Å, H-O-H 104.52 deg; ethylene: C=C 1.339 Å,
# C-H 1.086 Å, H-C-H 117.6 deg (experimental values from memory, NIST CCCBDB).
MOLECULES = [
    ("water", "O 0 0 0.1173; H 0 0.7572 -0.4692; H 0 -0.7572 -0.4692"),
    (
        "ethylene",
        "C 0 0 0.6695; C 0 0 -0.6695; H 0 0.9289 1.2321; H 0 -0.9289 1.2321; "
        "H 0 0.9289 -1.2321; H 0 -0.9289 -1.2321",
    ),
]


def pm_value(mol, orbitals):
    loc = lo.PM(mol, orbitals, pop_method="mulliken")
    return float(loc.cost_function())


def localize(mol, occ, start):
    loc = lo.PM(mol, occ, pop_method="mulliken")
    loc.verbose = 0
    loc.conv_tol = 1e-12
    loc.conv_tol_grad = 1e-8
    loc.max_cycle = 500
    if start == "atomic":
        loc.init_guess = "atomic"
        orbitals = loc.kernel()
    elif start == "canonical":
        loc.init_guess = None
        orbitals = loc.kernel()
    else:
        rng = numpy.random.default_rng(int(start.split(":")[1]))
        a = rng.standard_normal((occ.shape[1], occ.shape[1]))
        q, _ = numpy.linalg.qr(a)
        orbitals = loc.kernel(occ @ q)
    return pm_value(mol, orbitals)


def compute():
    out = {
        "source": "PySCF " + __import__("pyscf").__version__
        + ", STO-3G RHF, pyscf.lo.PM(pop_method='mulliken', exponent=2)",
        "cost_function": "sum_i sum_A (Q_A^i)^2, Q_A^i = sum_{mu in A} C_mu,i (S C)_mu,i",
        "molecules": {},
    }
    for name, geometry in MOLECULES:
        mol = gto.M(atom=geometry, basis="sto-3g", unit="Angstrom", verbose=0)
        mf = scf.RHF(mol)
        mf.conv_tol = 1e-12
        mf.kernel()
        occ = mf.mo_coeff[:, mf.mo_occ > 0]
        s = mol.intor_symmetric("int1e_ovlp")
        atom_of_ao = [0] * mol.nao
        for atom, (_, _, p0, p1) in enumerate(mol.aoslice_by_atom()):
            for mu in range(p0, p1):
                atom_of_ao[mu] = atom
        starts = ["atomic", "canonical", "random:1", "random:2", "random:3"]
        values = {start: localize(mol, occ, start) for start in starts}
        out["molecules"][name] = {
            "geometry_angstrom": geometry,
            "ao_labels": mol.ao_labels(),
            "atom_of_ao": atom_of_ao,
            "overlap": s.tolist(),
            "occupied_coefficients": occ.tolist(),
            "canonical_value": pm_value(mol, occ),
            "pm_values_by_start": values,
            "pm_value": max(values.values()),
        }
    return out


def check(reference, fresh):
    worst = 0.0
    for name, ref in reference["molecules"].items():
        new = fresh["molecules"][name]
        s_ref, s_new = numpy.array(ref["overlap"]), numpy.array(new["overlap"])
        c_ref = numpy.array(ref["occupied_coefficients"])
        c_new = numpy.array(new["occupied_coefficients"])
        diffs = {
            "overlap": numpy.abs(s_ref - s_new).max(),
            "projector": numpy.abs(c_ref @ c_ref.T - c_new @ c_new.T).max(),
            "pm_value": abs(ref["pm_value"] - new["pm_value"]),
            "canonical_value": abs(ref["canonical_value"] - new["canonical_value"]),
        }
        for what, d in diffs.items():
            print(f"{name:10s} {what:16s} max |diff| = {d:.2e}")
            worst = max(worst, d)
        if ref["atom_of_ao"] != new["atom_of_ao"]:
            print(f"{name}: AO->atom map differs")
            worst = float("inf")
    return worst


def main():
    fresh = compute()
    if "--check" in sys.argv[1:]:
        reference = json.loads(OUTPUT.read_text())
        worst = check(reference, fresh)
        if worst > TOLERANCE:
            print(f"FAIL: difference {worst:.2e} > {TOLERANCE:e}")
            sys.exit(1)
        print("pyscf_pm.json agrees with a fresh PySCF run")
        return
    OUTPUT.write_text(json.dumps(fresh, indent=1) + "\n")
    for name, m in fresh["molecules"].items():
        print(name, "canonical", m["canonical_value"], "PM by start", m["pm_values_by_start"])


if __name__ == "__main__":
    main()
