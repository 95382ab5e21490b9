#!/usr/bin/env python3
"""Reference Löwdin Pipek-Mezey orbitals (exponents 2 and 4) and intrinsic bond orbitals
from PySCF (PyPI `pyscf`, `pyscf.lo.PM`, `pyscf.lo.iao.iao`, `pyscf.lo.ibo.ibo`) for the
Rust localization engine.

All molecules: STO-3G RHF (conv_tol 1e-12) at fixed geometries (below, Å).

Canonical orbitals. Eigenvectors of degenerate levels (benzene, CO, CO2) are an arbitrary
rotation that may differ between machines, and the PM value of canonical orbitals and the
seeded starts below depend on it. So within each degenerate block (levels within 1e-6 Eh)
the script rotates to the eigenvectors of C_blk^T S W S C_blk, W = diag(1, 2, 3, ...) (a
fixed, symmetry-breaking AO weight), and fixes every orbital's sign so that
d^T S c_i > 0 for the fixed vector d_mu = 1 / (mu + 1.5). The stored
"occupied_coefficients" are these canonicalized orbitals.

Section "pm_lowdin": water, ethylene, benzene, diborane; ALL occupied MOs (core included).
The localization function is
    F_p = sum_i sum_A (Q_A^i)^p,   Q_A^i = sum_{mu in A} (S^{1/2} c_i)_mu^2,
with S^{1/2} from the eigendecomposition of S (Löwdin populations); p = 2 and p = 4.
F_p is computed by this script itself, not taken from PySCF.

  PySCF's `PipekMezey` (pyscf/lo/pipek.py, 2.14.0): `exponent` (default 2, "any integer
  >= 2") is used literally as the power of the populations: `cost_function` returns
  `(pop**exponent).sum()`, a POSITIVE number to be maximized (`maximize = True`); the
  gradient and Hessian it hands to its CIAH optimizer are those of -cost (`get_grad`
  returns 2 p pack(g - g^T) with g_ij = -sum_A P_A,ij Q_A^j^(p-1)), so the values
  themselves need no sign flip. There is no normalization or 1/p root in the value
  (only `ibo.ibo_loc` prints L^(1/p) in its debug log).

  SURPRISE: PySCF's pop_method='lowdin' is NOT the plain S^{1/2} Löwdin population.
  `get_proj_data` calls `orth.orth_ao(mol, 'lowdin', 'ANO', s=s)` with pre_orth_ao='ANO':
  the AOs are first replaced, atom by atom, by the ANO functions projected onto the
  basis (for STO-3G this mixes each heavy atom's 1s and 2s), and THEN Löwdin
  orthogonalized: C_orth = P (P^T S P)^{-1/2}, projector S C_orth. That equals S^{1/2}
  only if P is orthogonal within each atom, which it is not (for O in water the
  projected "1s" is 0.996 1s - 0.26 2s). PySCF's own 'lowdin' cost therefore differs
  from F_p (water canonical, p = 2: 3.71013 vs F_2 = 3.70867). The script prints both
  and stores PySCF's stock value ("pyscf_stock_lowdin_ano") for information.
  To optimize exactly F_p the script uses `pyscf.lo.PM(mol, occ, pop_method='lowdin')`
  with its projector data replaced by (S^{1/2}, atom offsets), i.e. what orth_ao gives
  with pre_orth_ao=None (class `PlainLowdinPM` below: only `get_proj_data` and the
  fall-back in `atomic_pops` are overridden; the CIAH optimizer, gradient and Hessian
  are PySCF's). Its `cost_function` then agrees with F_p to ~1e-14 (checked, printed).

Starts (all with conv_tol 1e-12, conv_tol_grad 1e-8, max_cycle 500): PySCF's 'atomic'
guess, the canonical orbitals, and seeded random orthogonal rotations of the canonical
orbitals (numpy default_rng(seed), QR of a normal matrix, signs fixed by diag(R) > 0).

PySCF's CIAH optimizer stops wherever the gradient vanishes and does not look at the
Hessian, and it does stop at saddle points: the 'atomic' and 'canonical' starts of these
symmetric molecules are symmetry-adapted, the gradient then never breaks the symmetry,
and they end at the best symmetric stationary point, a saddle point of F_p (negative
Hessian eigenvalues down to -12 here). So for every start the script reports PySCF's value
and the lowest eigenvalue of PySCF's Hessian of -F_p there (built column by column from
its Hessian-vector product; checked against finite differences of F_p: gradient and
Hessian are those of -F_p), and then "polishes" PySCF's result with exact 2x2 Jacobi
sweeps: for each orbital pair F_p(t) = const + A1 cos 4t + B1 sin 4t (+ A2 cos 8t + B2 sin
8t for p = 4), with closed-form coefficients (`pair_series`), is maximized over the whole
angle range, until no pair gains more than 1e-15 or rotates more than 1e-9. At a true
local maximum this changes nothing beyond rounding; from a saddle point it moves on to a
maximum; along very soft modes (ethylene: Hessian eigenvalue 4e-9 for the rotation of the
two C-C orbitals, where CIAH's gradient threshold leaves populations ~1e-5 apart) it
converges properly. The best polished F_p over the starts is the reference; every result
is verified by the gradient norm and the lowest Hessian eigenvalue (>= -1e-14: a local
maximum; exact zeros occur for rotations among orbitals that lie entirely on one atom,
e.g. in water, which change no population).

Uniqueness: for each Hessian eigenvalue < 1e-6 the script steps 0.05 along the mode,
polishes again and compares; together with the spread of the sorted population vectors
over all starts that reach the best value (within 1e-9) this sets
"sorted_population_vectors_unique". For benzene with p = 2 the maximum is a continuous
family: a zero Hessian mode rotates the three pi orbitals into one another at constant
F_2 = 13.003744199978 while their populations change by up to ~0.2, from Kekulé-like
two-centre orbitals (sorted C populations 0.418, 0.412, 0.058, ...) through allyl-like
three-centre ones (0.500, 0.227, 0.217, ...) and on to the other Kekulé set (followed
numerically by repeated steps along the zero mode, each re-polished). The stored vectors
are then one member of the family and --check does not compare them (F_2 itself is
compared). p = 4 removes this degeneracy.

Section "ibo": CO, CO2, formaldehyde, ozone, diborane. IAOs: `iao.iao(mol, occ)` from ALL
occupied MOs (default MINAO reference basis). IBOs: `ibo.ibo(mol, occ_valence,
locmethod='IBO', iaos=iaos, exponent=4, grad_tol=1e-10, max_iter=2000)`; its signature is
ibo(mol, orbocc, locmethod='IBO', iaos=None, s=None, exponent=4, grad_tol=1e-8,
max_iter=200, minao='minao', verbose=NOTE). It runs Knizia's 2x2 Jacobi sweeps
(`ibo_loc`, exponent 2 or 4 only) maximizing
    L = sum_i sum_A (q_A^i)^4,   q_A^i = sum_{k in A} ((I~)^T S c_i)_k^2,
with I~ the symmetrically orthogonalized IAOs (`orth.vec_lowdin(iaos, s)`), starting
from the orbitals it is given, and returns iaos~ @ vec_lowdin(C_IAO) (a final Löwdin
re-orthonormalization, so the result is a maximum only to rounding).
Core freezing: n_core = number of 1s cores (one per atom heavier than He) and the lowest
n_core canonical MOs (all below -5 Eh, checked) are simply left out of `orbocc`; the
IAOs are still built from the full occupied set, so the valence MOs lie in their span.
The IBOs span exactly the valence canonical space (projector checked). Starts: the
canonical valence MOs and seeded random rotations of them; best L kept. Stored
populations: Löwdin (S^{1/2}, as in F_p) and IAO (q above).

Usage:
  python3 pyscf_localized_reference.py          write tests/reference/pyscf_localized.json
  python3 pyscf_localized_reference.py --check  regenerate in memory and compare with the
                                                committed JSON (exit 1 on a difference
                                                beyond 1e-6)

JSON layout ("pm_lowdin" and "ibo" each have "method" text and "molecules": name -> {...}):
  symbols, geometry_angstrom (rows x y z, atom order as in MOLECULES), ao_labels,
  atom_of_ao (0-based), overlap (S, rows), n_core.
  pm_lowdin molecule: occupied_coefficients (rows AOs, columns orbitals, core included,
    canonicalized, energy order), orbital_energies, and "exponents": {"2": .., "4": ..}
    each with canonical_value, localized_value (best F_p), best_start, values_by_start
    (polished), pyscf_values_by_start (PySCF's own result), pyscf_lowest_hessian_
    eigenvalue_by_start, polish_sweeps_by_start, pyscf_cost_canonical /
    pyscf_cost_localized (PlainLowdinPM.cost_function, = F_p), gradient_norm and
    lowest_hessian_eigenvalue (of -F_p, at the best), soft_modes, starts_at_best,
    population_spread_at_best, sorted_population_vectors_unique,
    pyscf_stock_lowdin_ano (stock pop_method='lowdin' cost of the canonical and of the
    stored orbitals, informative), localized_coefficients, lowdin_populations
    (orbitals x atoms), sorted_population_vectors.
  ibo molecule: orbital_energies, valence_canonical_coefficients, ibo_coefficients (rows
    AOs, columns orbitals), iao_function_value (best L), best_start, iao_values_by_start,
    jacobi_polish_gain_by_start (what exact 2x2 sweeps on L would still gain: ~1e-21 or
    less, i.e. PySCF's IBOs are converged), starts_at_best, iao_population_spread_at_best,
    lowdin_function_value_p4, lowdin_populations and iao_populations (orbitals x atoms),
    sorted_lowdin_population_vectors, sorted_iao_population_vectors, orbital_summary (per
    IBO the two largest IAO and Löwdin populations and the third largest),
    orthonormality_error, valence_projector_error.
  sorted_*population_vectors: each orbital's atom populations sorted in descending
  order, and these vectors sorted lexicographically (keys rounded to 1e-8); compare as
  a multiset (orbital order and symmetry-equivalent relabelling drop out, e.g. the two
  Kekulé sets of benzene). --check matches them one-to-one (assignment) before
  comparing.

--check compares S, the occupied projector C C^T, the projector of the valence IBO set,
the canonical and best F_p, the best IBO L, and the sorted population vectors (1e-6; those
flagged not unique are skipped). The script runs single-threaded (OMP_NUM_THREADS=1).
"""

import json
import math
import os
import sys
import time
from pathlib import Path

# One BLAS/OpenMP thread: the optimizer paths (values by start) are then reproducible on
# a given machine; threaded reductions can tip a start near a saddle point either way.
os.environ["OMP_NUM_THREADS"] = "1"
os.environ["OPENBLAS_NUM_THREADS"] = "1"
os.environ["MKL_NUM_THREADS"] = "1"

import numpy  # noqa: E402
import scipy.linalg  # noqa: E402
from pyscf import gto, lo, scf  # noqa: E402
from pyscf.lo import iao, ibo, orth  # noqa: E402
from scipy.optimize import linear_sum_assignment  # noqa: E402

HERE = Path(__file__).resolve().parent
OUTPUT = HERE / "pyscf_localized.json"
TOLERANCE = 1e-6
PM_STARTS = ["atomic", "canonical", "random:1", "random:2", "random:3", "random:4"]
IBO_STARTS = ["canonical", "random:1", "random:2", "random:3"]


def _benzene():
    # C-C 1.397 Å, C-H 1.084 Å, D6h, in the xy plane (experimental, from memory).
    atoms = []
    for k in range(6):
        a = math.radians(60 * k)
        atoms.append(("C", (1.397 * math.cos(a), 1.397 * math.sin(a), 0.0)))
    for k in range(6):
        a = math.radians(60 * k)
        r = 1.397 + 1.084
        atoms.append(("H", (r * math.cos(a), r * math.sin(a), 0.0)))
    return atoms


def _diborane():
    # D2h: B-B 1.763 Å, B-H terminal 1.19 Å, B-H bridge 1.33 Å, H-B-H terminal 121.5 deg
    # (experimental, from memory). B-B along x, bridging H along y, terminal H in xz.
    xb = 1.763 / 2
    yh = math.sqrt(1.33**2 - xb**2)
    half = math.radians(121.5 / 2)
    xt, zt = xb + 1.19 * math.cos(half), 1.19 * math.sin(half)
    return [
        ("B", (xb, 0.0, 0.0)),
        ("B", (-xb, 0.0, 0.0)),
        ("H", (0.0, yh, 0.0)),
        ("H", (0.0, -yh, 0.0)),
        ("H", (xt, 0.0, zt)),
        ("H", (xt, 0.0, -zt)),
        ("H", (-xt, 0.0, zt)),
        ("H", (-xt, 0.0, -zt)),
    ]


def _formaldehyde():
    # C=O 1.205 Å, C-H 1.111 Å, H-C-H 116.1 deg (experimental, from memory; other
    # determinations give r_e 1.203/1.101 Å, 116.3 deg). C at the origin, O along +z.
    half = math.radians(116.1 / 2)
    return [
        ("C", (0.0, 0.0, 0.0)),
        ("O", (0.0, 0.0, 1.205)),
        ("H", (0.0, 1.111 * math.sin(half), -1.111 * math.cos(half))),
        ("H", (0.0, -1.111 * math.sin(half), -1.111 * math.cos(half))),
    ]


def _ozone():
    # O-O 1.278 Å, O-O-O 116.8 deg (experimental, from memory); central O first.
    half = math.radians(116.8 / 2)
    return [
        ("O", (0.0, 0.0, 0.0)),
        ("O", (0.0, 1.278 * math.sin(half), -1.278 * math.cos(half))),
        ("O", (0.0, -1.278 * math.sin(half), -1.278 * math.cos(half))),
    ]


# Water and ethylene exactly as in pyscf_pm_reference.py: water O-H 0.9572 Å, H-O-H
# 104.52 deg; ethylene C=C 1.339 Å, C-H 1.086 Å, H-C-H 117.6 deg (experimental values
# from memory, NIST CCCBDB).
PM_MOLECULES = [
    ("water", "O 0 0 0.1173; H 0 0.7572 -0.4692; H 0 -0.7572 -0.4692"),
    (
        "ethylene",
        "C 0 0 0.6695; C 0 0 -0.6695; H 0 0.9289 1.2321; H 0 -0.9289 1.2321; "
        "H 0 0.9289 -1.2321; H 0 -0.9289 -1.2321",
    ),
    ("benzene", _benzene()),
    ("diborane", _diborane()),
]

# CO: C-O 1.128 Å; CO2: C-O 1.162 Å, linear (experimental, from memory).
IBO_MOLECULES = [
    ("carbon_monoxide", [("C", (0.0, 0.0, 0.0)), ("O", (0.0, 0.0, 1.128))]),
    (
        "carbon_dioxide",
        [("C", (0.0, 0.0, 0.0)), ("O", (0.0, 0.0, 1.162)), ("O", (0.0, 0.0, -1.162))],
    ),
    ("formaldehyde", _formaldehyde()),
    ("ozone", _ozone()),
    ("diborane", _diborane()),
]


class PlainLowdinPM(lo.PM):
    """pyscf.lo.PM(pop_method='lowdin') with the plain Löwdin projector S^{1/2}
    (orth_ao with pre_orth_ao=None) instead of PySCF's ANO-pre-orthogonalized one."""

    def get_proj_data(self, *args, **kwargs):
        s = self.mol.intor_symmetric("int1e_ovlp")
        return (s @ orth.lowdin(s), self.mol.offset_nr_by_atom())

    def atomic_pops(self, mol, mo_coeff, method=None, kpt=None, proj_data=None, mode=None,
                    verbose=None):
        if proj_data is None and self._proj_data is None:
            proj_data = self.get_proj_data()
        return lo.PM.atomic_pops(self, mol, mo_coeff, method, kpt, proj_data, mode, verbose)


# ---------------------------------------------------------------------------------------
# Populations and the localization function


def sqrt_overlap(s):
    e, v = numpy.linalg.eigh(s)
    return (v * numpy.sqrt(e)) @ v.T


def block_starts(blocks):
    starts = [p0 for p0, _ in blocks]
    assert all(b[1] == n[0] for b, n in zip(blocks, blocks[1:])), "non-contiguous blocks"
    return numpy.array(starts)


def populations(x, starts):
    """orbitals x atoms: per-atom sums of x**2 (x: rows orthonormal functions grouped by
    atom starting at rows `starts`, columns orbitals)."""
    return numpy.add.reduceat(x * x, starts, axis=0).T


def atom_blocks(mol):
    return [(p0, p1) for _, _, p0, p1 in mol.aoslice_by_atom()]


def f_value(pops, p):
    return float((pops**p).sum())


def sorted_vectors(pops):
    rows = [sorted(row, reverse=True) for row in pops.tolist()]
    return sorted(rows, key=lambda r: [round(v, 8) for v in r])


def match_vectors(a, b):
    """Largest element difference after a one-to-one matching of two vector lists."""
    a, b = numpy.array(a), numpy.array(b)
    if a.shape != b.shape:
        return float("inf")
    cost = numpy.abs(a[:, None, :] - b[None, :, :]).max(axis=2)
    rows, cols = linear_sum_assignment(cost)
    return float(cost[rows, cols].max())


# ---------------------------------------------------------------------------------------
# Exact 2x2 Jacobi polishing of F_p (after PySCF's optimizer)


def pair_series(xi, xj, starts, p):
    """F_p restricted to the rotation (x_i, x_j) -> (cos t x_i + sin t x_j,
    -sin t x_i + cos t x_j): F(t) = const + A1 cos 4t + B1 sin 4t + A2 cos 8t + B2 sin 8t.
    With a, b, c = the atom's <i|P|i>, <j|P|j>, <i|P|j>, m = (a+b)/2, d = (a-b)/2, the
    populations are m +- (d cos 2t + c sin 2t); expanding (m+u)^p + (m-u)^p gives these
    coefficients (p = 2: 2m^2 + 2u^2; p = 4: 2m^4 + 12 m^2 u^2 + 2 u^4)."""
    a = numpy.add.reduceat(xi * xi, starts)
    b = numpy.add.reduceat(xj * xj, starts)
    c = numpy.add.reduceat(xi * xj, starts)
    m, d = (a + b) / 2, (a - b) / 2
    dc2, dc = d * d - c * c, 2 * d * c
    if p == 2:
        return dc2.sum(), dc.sum(), 0.0, 0.0
    w = 6 * m * m + d * d + c * c
    return (w * dc2).sum(), (w * dc).sum(), ((dc2**2 - dc**2) / 4).sum(), (dc2 * dc / 2).sum()


def best_angle(a1, b1, a2, b2):
    """x = 4t maximizing g(x) - g(0), g = a1 cos x + b1 sin x + a2 cos 2x + b2 sin 2x."""

    def gain(x):
        return a1 * (math.cos(x) - 1) + b1 * math.sin(x) + a2 * (math.cos(2 * x) - 1) \
            + b2 * math.sin(2 * x)

    if a2 == 0.0 and b2 == 0.0:
        x = math.atan2(b1, a1)
    else:
        grid = numpy.linspace(-math.pi, math.pi, 721)
        vals = a1 * numpy.cos(grid) + b1 * numpy.sin(grid) + a2 * numpy.cos(2 * grid) \
            + b2 * numpy.sin(2 * grid)
        x = float(grid[numpy.argmax(vals)])
        for _ in range(50):
            d1 = -a1 * math.sin(x) + b1 * math.cos(x) - 2 * a2 * math.sin(2 * x) \
                + 2 * b2 * math.cos(2 * x)
            d2 = -a1 * math.cos(x) - b1 * math.sin(x) - 4 * a2 * math.cos(2 * x) \
                - 4 * b2 * math.sin(2 * x)
            if d2 >= 0:
                break
            step = -d1 / d2
            x += step
            if abs(step) < 1e-15:
                break
    x = math.remainder(x, 2 * math.pi)
    return x, gain(x)


def jacobi_polish(c, x, starts, p, max_sweeps=1000):
    """Pairwise exact maximization of F_p; c (AO coefficients) and x = S^{1/2} c (or the
    orbitals in any orthonormal atom-blocked basis) are rotated together."""
    c, x = c.copy(), x.copy()
    n = c.shape[1]
    total = 0.0
    for sweep in range(1, max_sweeps + 1):
        largest, gained = 0.0, 0.0
        for i in range(n):
            for j in range(i + 1, n):
                xa, ga = best_angle(*pair_series(x[:, i], x[:, j], starts, p))
                if ga <= 0.0:
                    continue
                t = xa / 4
                cs, sn = math.cos(t), math.sin(t)
                for m in (c, x):
                    mi, mj = m[:, i].copy(), m[:, j].copy()
                    m[:, i] = cs * mi + sn * mj
                    m[:, j] = -sn * mi + cs * mj
                largest, gained = max(largest, abs(t)), gained + ga
        total += gained
        if largest < 1e-9 or gained < 1e-15:
            break
    return c, x, sweep, total


# ---------------------------------------------------------------------------------------
# Molecules, SCF, canonical orbitals


def build(geometry):
    mol = gto.M(atom=geometry, basis="sto-3g", unit="Angstrom", verbose=0)
    mf = scf.RHF(mol)
    mf.conv_tol = 1e-12
    mf.conv_tol_grad = 1e-9
    mf.kernel()
    assert mf.converged, "RHF did not converge"
    occ = mf.mo_coeff[:, mf.mo_occ > 0]
    energies = mf.mo_energy[mf.mo_occ > 0]
    s = mol.intor_symmetric("int1e_ovlp")
    return mol, canonicalize(occ, energies, s), energies, s


def canonicalize(occ, energies, s):
    """Fixed rotation within degenerate blocks and fixed signs (see the docstring)."""
    occ = occ.copy()
    n = occ.shape[0]
    w = numpy.diag(numpy.arange(1.0, n + 1.0))
    i = 0
    while i < occ.shape[1]:
        j = i + 1
        while j < occ.shape[1] and abs(energies[j] - energies[i]) < 1e-6:
            j += 1
        if j - i > 1:
            blk = occ[:, i:j]
            m = blk.T @ s @ w @ s @ blk
            e, v = numpy.linalg.eigh((m + m.T) / 2)
            assert numpy.diff(e).min() > 1e-4, "degenerate block not resolved"
            occ[:, i:j] = blk @ v
        i = j
    d = 1.0 / (numpy.arange(n) + 1.5)
    dots = d @ s @ occ
    assert numpy.abs(dots).min() > 1e-6, "sign rule ambiguous"
    return occ * numpy.sign(dots)


def random_rotation(n, seed):
    rng = numpy.random.default_rng(seed)
    q, r = numpy.linalg.qr(rng.standard_normal((n, n)))
    return q * numpy.sign(numpy.diag(r))


def start_orbitals(occ, start):
    if start == "canonical":
        return occ
    return occ @ random_rotation(occ.shape[1], int(start.split(":")[1]))


def atom_of_ao_list(mol):
    out = [0] * mol.nao
    for atom, (p0, p1) in enumerate(atom_blocks(mol)):
        for mu in range(p0, p1):
            out[mu] = atom
    return out


def n_core_of(mol):
    return sum(1 for a in range(mol.natm) if mol.atom_charge(a) > 2)


def common(mol, s):
    return {
        "symbols": [mol.atom_symbol(a) for a in range(mol.natm)],
        "geometry_angstrom": mol.atom_coords(unit="Angstrom").tolist(),
        "ao_labels": mol.ao_labels(),
        "atom_of_ao": atom_of_ao_list(mol),
        "overlap": s.tolist(),
        "n_core": n_core_of(mol),
    }


def spread_at_best(results, best_value):
    """Largest matched sorted-vector difference among the starts within 1e-9 of the best."""
    at_best = [r for r in results.values() if r["value"] > best_value - 1e-9]
    ref = sorted_vectors(at_best[0]["pops"])
    return len(at_best), max(match_vectors(ref, sorted_vectors(r["pops"])) for r in at_best)


# ---------------------------------------------------------------------------------------
# Section pm_lowdin


def pm_localize(mol, occ, p, start):
    loc = PlainLowdinPM(mol, occ, pop_method="lowdin")
    loc.verbose = 0
    loc.exponent = p
    loc.conv_tol = 1e-12
    loc.conv_tol_grad = 1e-8
    loc.max_cycle = 500
    if start == "atomic":
        loc.init_guess = "atomic"
        return loc.kernel()
    loc.init_guess = None
    return loc.kernel(start_orbitals(occ, start))


def pm_hessian(mol, orbitals, p):
    """PySCF cost, gradient norm, and the Hessian of -F_p (PySCF's packed rotation
    parameters, built column by column from its Hessian-vector product) at `orbitals`."""
    loc = PlainLowdinPM(mol, orbitals, pop_method="lowdin")
    loc.exponent = p
    loc._proj_data = loc.get_proj_data()
    cost = float(loc.cost_function())
    g, h_op, _ = loc.gen_g_hop()
    h = numpy.array([h_op(col) for col in numpy.eye(g.size)])
    return cost, float(numpy.linalg.norm(g)), (h + h.T) / 2, loc


def soft_modes(mol, best, s_half, starts, p, value):
    """Hessian eigenvalues < 1e-6: step 0.05 along each mode, polish again, and see
    whether F_p comes back to the same value with different populations (a continuous
    family of maxima) or to the same populations (an isolated maximum, or rotations that
    leave every population unchanged)."""
    _, grad, h, loc = pm_hessian(mol, best, p)
    e, v = numpy.linalg.eigh(h)
    ref = sorted_vectors(populations(s_half @ best, starts))
    modes = []
    for k in numpy.nonzero(e < 1e-6)[0]:
        kmat = loc.unpack_uniq_var(v[:, k])
        moved = best @ scipy.linalg.expm(0.05 * (kmat - kmat.T) / 2)
        c, x, _, _ = jacobi_polish(moved, s_half @ moved, starts, p)
        pops = populations(x, starts)
        modes.append({
            "hessian_eigenvalue": float(e[k]),
            "value_after_step_and_polish_minus_best": f_value(pops, p) - value,
            "population_change": match_vectors(ref, sorted_vectors(pops)),
        })
    return grad, float(e.min()), modes


def compute_pm(name, geometry):
    mol, occ, energies, s = build(geometry)
    s_half = sqrt_overlap(s)
    starts = block_starts(atom_blocks(mol))
    entry = common(mol, s)
    entry["orbital_energies"] = energies.tolist()
    entry["occupied_coefficients"] = occ.tolist()
    entry["exponents"] = {}
    for p in (2, 4):
        results = {}
        for start in PM_STARTS:
            raw = pm_localize(mol, occ, p, start)
            c, x, sweeps, gain = jacobi_polish(raw, s_half @ raw, starts, p)
            pops = populations(x, starts)
            h_raw = pm_hessian(mol, raw, p)[2]
            results[start] = {
                "pyscf": f_value(populations(s_half @ raw, starts), p),
                "pyscf_lowest": float(numpy.linalg.eigvalsh(h_raw).min()),
                "value": f_value(pops, p),
                "sweeps": sweeps,
                "c": c,
                "pops": pops,
            }
        best_start = max(PM_STARTS, key=lambda k: results[k]["value"])  # first of equal
        best = results[best_start]["c"]
        pops = results[best_start]["pops"]
        value = f_value(pops, p)
        n_best, spread = spread_at_best(results, value)
        grad, lowest, modes = soft_modes(mol, best, s_half, starts, p, value)
        continuous = any(abs(m["value_after_step_and_polish_minus_best"]) < 1e-10
                         and m["population_change"] > 1e-6 for m in modes)
        unique = spread < 1e-6 and not continuous
        cost_can, _, _, _ = pm_hessian(mol, occ, p)
        cost_loc, _, _, _ = pm_hessian(mol, best, p)
        canonical = f_value(populations(s_half @ occ, starts), p)
        assert abs(cost_can - canonical) < 1e-10 and abs(cost_loc - value) < 1e-10, \
            "PySCF's cost function (plain Löwdin projector) disagrees with F_p"
        stock = {}
        for label, orbitals in (("canonical", occ), ("localized", best)):
            loc = lo.PM(mol, orbitals, pop_method="lowdin")
            loc.exponent = p
            stock["cost_" + label] = float(loc.cost_function())
        entry["exponents"][str(p)] = {
            "canonical_value": canonical,
            "localized_value": value,
            "best_start": best_start,
            "values_by_start": {k: r["value"] for k, r in results.items()},
            "pyscf_values_by_start": {k: r["pyscf"] for k, r in results.items()},
            "pyscf_lowest_hessian_eigenvalue_by_start": {
                k: r["pyscf_lowest"] for k, r in results.items()},
            "polish_sweeps_by_start": {k: r["sweeps"] for k, r in results.items()},
            "pyscf_cost_canonical": cost_can,
            "pyscf_cost_localized": cost_loc,
            "gradient_norm": grad,
            "lowest_hessian_eigenvalue": lowest,
            "soft_modes": modes,
            "starts_at_best": n_best,
            "population_spread_at_best": spread,
            "sorted_population_vectors_unique": unique,
            "pyscf_stock_lowdin_ano": stock,
            "localized_coefficients": best.tolist(),
            "lowdin_populations": pops.tolist(),
            "sorted_population_vectors": sorted_vectors(pops),
        }
    return entry


# ---------------------------------------------------------------------------------------
# Section ibo


def compute_ibo(name, geometry):
    mol, occ, energies, s = build(geometry)
    s_half = sqrt_overlap(s)
    starts = block_starts(atom_blocks(mol))
    n_core = n_core_of(mol)
    assert (energies[:n_core] < -5).all() and (energies[n_core:] > -5).all(), energies
    valence = occ[:, n_core:]
    iaos = iao.iao(mol, occ)
    iao_orth = orth.vec_lowdin(iaos, s)
    iao_starts = block_starts(
        [(p0, p1) for _, _, p0, p1 in iao.reference_mol(mol).aoslice_by_atom()])

    results = {}
    for start in IBO_STARTS:
        orbitals = ibo.ibo(mol, start_orbitals(valence, start), locmethod="IBO", iaos=iaos,
                           s=s, exponent=4, grad_tol=1e-10, max_iter=2000, verbose=0)
        x = iao_orth.T @ s @ orbitals
        pops = populations(x, iao_starts)
        # Diagnostic only: what exact pairwise maximization of L would still gain.
        _, _, _, gain = jacobi_polish(orbitals, x, iao_starts, 4)
        results[start] = {"value": f_value(pops, 4), "c": orbitals, "pops": pops,
                          "polish_gain": gain}
    best_start = max(IBO_STARTS, key=lambda k: results[k]["value"])
    best = results[best_start]["c"]
    ipops = results[best_start]["pops"]
    lpops = populations(s_half @ best, starts)
    n_best, spread = spread_at_best(results, f_value(ipops, 4))
    symbols = [mol.atom_symbol(a) for a in range(mol.natm)]

    def top(pops, k, n):
        return [[f"{symbols[a]}{a}", float(pops[k, a])] for a in numpy.argsort(-pops[k])[:n]]

    summary = [{"orbital": k, "iao_top2": top(ipops, k, 2), "lowdin_top2": top(lpops, k, 2),
                "iao_third": top(ipops, k, 3)[2:], "lowdin_third": top(lpops, k, 3)[2:]}
               for k in range(best.shape[1])]
    entry = common(mol, s)
    entry.update({
        "orbital_energies": energies.tolist(),
        "valence_canonical_coefficients": valence.tolist(),
        "ibo_coefficients": best.tolist(),
        "iao_function_value": f_value(ipops, 4),
        "best_start": best_start,
        "iao_values_by_start": {k: r["value"] for k, r in results.items()},
        "jacobi_polish_gain_by_start": {k: r["polish_gain"] for k, r in results.items()},
        "starts_at_best": n_best,
        "iao_population_spread_at_best": spread,
        "lowdin_function_value_p4": f_value(lpops, 4),
        "lowdin_populations": lpops.tolist(),
        "iao_populations": ipops.tolist(),
        "sorted_lowdin_population_vectors": sorted_vectors(lpops),
        "sorted_iao_population_vectors": sorted_vectors(ipops),
        "orbital_summary": summary,
        "orthonormality_error": float(
            numpy.abs(best.T @ s @ best - numpy.eye(best.shape[1])).max()),
        "valence_projector_error": float(numpy.abs(best @ best.T - valence @ valence.T).max()),
    })
    return entry


def compute():
    return {
        "source": "PySCF " + __import__("pyscf").__version__ + ", STO-3G RHF; see "
        "pyscf_localized_reference.py for the conventions",
        "pm_lowdin": {
            "method": "pyscf.lo.PM(pop_method='lowdin') with the plain Löwdin projector "
            "S^{1/2} (not PySCF's ANO pre-orthogonalized one), exponent p in {2, 4}, all "
            "occupied MOs (core included), then exact 2x2 Jacobi polishing",
            "function": "F_p = sum_i sum_A (Q_A^i)^p, Q_A^i = sum_{mu in A} (S^{1/2} c_i)_mu^2",
            "starts": PM_STARTS,
            "molecules": {name: compute_pm(name, g) for name, g in PM_MOLECULES},
        },
        "ibo": {
            "method": "pyscf.lo.ibo.ibo(mol, occ_valence, locmethod='IBO', iaos=iao.iao(mol, "
            "occ_all), exponent=4); 1s core MOs excluded (frozen)",
            "function": "L = sum_i sum_A (q_A^i)^4, q_A^i = sum_{k in A} (I~^T S c_i)_k^2, "
            "I~ = Löwdin-orthogonalized IAOs",
            "starts": IBO_STARTS,
            "molecules": {name: compute_ibo(name, g) for name, g in IBO_MOLECULES},
        },
    }


# ---------------------------------------------------------------------------------------
# --check


def projector_diff(c_ref, c_new):
    c_ref, c_new = numpy.array(c_ref), numpy.array(c_new)
    if c_ref.shape != c_new.shape:
        return float("inf")
    return float(numpy.abs(c_ref @ c_ref.T - c_new @ c_new.T).max())


def check(reference, fresh):
    worst = 0.0

    def report(label, d):
        nonlocal worst
        print(f"{label:60s} max |diff| = {d:.2e}")
        worst = max(worst, d)

    def overlap_diff(ref, new):
        return float(numpy.abs(numpy.array(ref["overlap"]) - numpy.array(new["overlap"])).max())

    for name, ref in reference["pm_lowdin"]["molecules"].items():
        new = fresh["pm_lowdin"]["molecules"][name]
        report(f"pm  {name} overlap", overlap_diff(ref, new))
        report(f"pm  {name} occupied projector",
               projector_diff(ref["occupied_coefficients"], new["occupied_coefficients"]))
        if ref["atom_of_ao"] != new["atom_of_ao"]:
            report(f"pm  {name} AO->atom map", float("inf"))
        for p, r in ref["exponents"].items():
            n = new["exponents"][p]
            for key in ("canonical_value", "localized_value"):
                report(f"pm  {name} p={p} {key}", abs(r[key] - n[key]))
            if r["sorted_population_vectors_unique"] != n["sorted_population_vectors_unique"]:
                report(f"pm  {name} p={p} uniqueness flag changed", float("inf"))
            if r["sorted_population_vectors_unique"]:
                report(f"pm  {name} p={p} sorted population vectors",
                       match_vectors(r["sorted_population_vectors"],
                                     n["sorted_population_vectors"]))
            else:
                print(f"pm  {name} p={p} sorted population vectors: not compared "
                      "(continuous family of maxima)")
    for name, ref in reference["ibo"]["molecules"].items():
        new = fresh["ibo"]["molecules"][name]
        report(f"ibo {name} overlap", overlap_diff(ref, new))
        report(f"ibo {name} valence IBO projector",
               projector_diff(ref["ibo_coefficients"], new["ibo_coefficients"]))
        if ref["atom_of_ao"] != new["atom_of_ao"]:
            report(f"ibo {name} AO->atom map", float("inf"))
        report(f"ibo {name} iao_function_value",
               abs(ref["iao_function_value"] - new["iao_function_value"]))
        for key in ("sorted_lowdin_population_vectors", "sorted_iao_population_vectors"):
            report(f"ibo {name} {key}", match_vectors(ref[key], new[key]))
    return worst


def summarize(out):
    for name, m in out["pm_lowdin"]["molecules"].items():
        for p, e in m["exponents"].items():
            print(f"PM-Löwdin {name} p={p}: canonical F={e['canonical_value']:.10f}  "
                  f"best F={e['localized_value']:.10f} ({e['best_start']}, "
                  f"{e['starts_at_best']} starts at best, population spread "
                  f"{e['population_spread_at_best']:.1e}, unique "
                  f"{e['sorted_population_vectors_unique']})")
            print(f"    PySCF cost (plain Löwdin): canonical {e['pyscf_cost_canonical']:.10f}, "
                  f"localized {e['pyscf_cost_localized']:.10f}")
            stock = e["pyscf_stock_lowdin_ano"]
            print(f"    PySCF stock 'lowdin' (ANO pre-orth) cost: canonical "
                  f"{stock['cost_canonical']:.10f}, localized {stock['cost_localized']:.10f}")
            print(f"    |grad| {e['gradient_norm']:.1e}, lowest Hessian eigenvalue of -F "
                  f"{e['lowest_hessian_eigenvalue']:.2e}")
            for mode in e["soft_modes"]:
                print(f"    soft mode {mode['hessian_eigenvalue']:.1e}: after step+polish "
                      f"dF {mode['value_after_step_and_polish_minus_best']:.1e}, populations "
                      f"moved {mode['population_change']:.1e}")
            print("    by start (polished): " + ", ".join(
                f"{k} {v:.10f}" for k, v in e["values_by_start"].items()))
            print("    by start (PySCF):    " + ", ".join(
                f"{k} {v:.10f}" for k, v in e["pyscf_values_by_start"].items()))
            print("    lowest Hessian eigenvalue of -F at PySCF's result by start: " + ", ".join(
                f"{k} {v:.1e}" for k, v in e["pyscf_lowest_hessian_eigenvalue_by_start"].items()))
    for name, m in out["ibo"]["molecules"].items():
        print(f"IBO {name}: L(IAO, p=4) = {m['iao_function_value']:.10f} ({m['best_start']}, "
              f"{m['starts_at_best']} starts at best, spread "
              f"{m['iao_population_spread_at_best']:.1e}), orthonormality "
              f"{m['orthonormality_error']:.1e}, projector vs valence "
              f"{m['valence_projector_error']:.1e}")
        print("    by start: " + ", ".join(
            f"{k} {v:.10f}" for k, v in m["iao_values_by_start"].items()))
        print("    Jacobi polish gain by start: " + ", ".join(
            f"{k} {v:.1e}" for k, v in m["jacobi_polish_gain_by_start"].items()))
        for o in m["orbital_summary"]:
            iao_s = "  ".join(f"{a:3s} {q:.3f}" for a, q in o["iao_top2"])
            low_s = "  ".join(f"{a:3s} {q:.3f}" for a, q in o["lowdin_top2"])
            third = "  ".join(f"{a:3s} {q:.3f}" for a, q in o["iao_third"])
            print(f"    IBO {o['orbital']}: IAO {iao_s}   | Löwdin {low_s}   | IAO 3rd {third}")


def main():
    t0 = time.perf_counter()
    fresh = compute()
    if "--check" in sys.argv[1:]:
        reference = json.loads(OUTPUT.read_text())
        worst = check(reference, fresh)
        print(f"({time.perf_counter() - t0:.1f} s)")
        if worst > TOLERANCE:
            print(f"FAIL: difference {worst:.2e} > {TOLERANCE:e}")
            sys.exit(1)
        print("pyscf_localized.json agrees with a fresh PySCF run")
        return
    OUTPUT.write_text(json.dumps(fresh, indent=1, ensure_ascii=False) + "\n")
    summarize(fresh)
    print(f"({time.perf_counter() - t0:.1f} s)")


if __name__ == "__main__":
    main()
