#!/usr/bin/env bash
# Times RDKit's extended Hückel (rdEHTTools.RunMol, PyPI `rdkit`) against Diptych's full EHT
# (criterion bench `eht_full/*` in benches/eht.rs) on the same fixed geometries (C60 and the
# 21-atom aspirin from tests/reference/rdkit_geometries/) and prints the ratio.
#
# Usage: tests/reference/bench_vs_rdkit.sh   (from anywhere; needs python3 with rdkit, cargo)
# Environment: CARGO_TARGET_DIR is honoured; CARGO_BENCH_FLAGS adds cargo flags
# (default: --no-default-features).
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
flags="${CARGO_BENCH_FLAGS:---no-default-features}"

rdkit_ms() {
    python3 - "$here/rdkit_geometries/$1.xyz" <<'PY'
import sys, timeit
sys.path.insert(0, __import__("os").path.dirname(sys.argv[1]) + "/..")
from rdkit_eht_reference import read_xyz, rdkit_molecule
from pathlib import Path
from rdkit.Chem import rdEHTTools
mol = rdkit_molecule(*read_xyz(Path(sys.argv[1])))
number = 1
while True:
    t = timeit.timeit(lambda: rdEHTTools.RunMol(mol), number=number)
    if t > 0.5:
        break
    number *= 2
runs = [timeit.timeit(lambda: rdEHTTools.RunMol(mol), number=number) / number for _ in range(7)]
runs.sort()
print(f"{runs[len(runs) // 2] * 1e3:.6f}")
PY
}

# Criterion prints "time:   [low median high]" with units; convert the median to ms.
diptych_ms() {
    local out
    out="$(cd "$root" && cargo bench $flags --bench eht -- --warm-up-time 1 --measurement-time 3 "eht_full/$1\$" 2>/dev/null)"
    echo "$out" | awk '/time:/ {
        gsub(/\[|\]/, "");
        for (i = 1; i <= NF; i++) if ($i == "time:") { v = $(i + 3); u = $(i + 4) }
        if (u == "ns") v /= 1e6; else if (u == "µs" || u == "us") v /= 1e3; else if (u == "s") v *= 1e3;
        printf "%.6f\n", v; exit }'
}

printf "%-10s %14s %14s %10s\n" molecule "RDKit (ms)" "Diptych (ms)" "ratio"
for name in aspirin c60; do
    r="$(rdkit_ms "$name" 2>/dev/null)"
    d="$(diptych_ms "$name")"
    ratio="$(awk -v r="$r" -v d="$d" 'BEGIN { printf "%.1f", r / d }')"
    printf "%-10s %14.3f %14.3f %9sx\n" "$name" "$r" "$d" "$ratio"
done
echo "ratio = RDKit time / Diptych time (above 1: Diptych is faster)"
