#!/usr/bin/env bash
# Regenerates every reference fixture in test/reference/fixtures/ (what `npm run refs` runs).
#
# Order: every test/reference/gen_*.R with Rscript first (gen_core.R writes core_inputs.json, the
# shared inputs the Python generators read), then every test/reference/gen_*.py with Debian's
# /usr/bin/python3 (which has scikit-learn, SciPy, NumPy and cvxopt; the `python3` on PATH may be a
# different interpreter without them). Within each language the generators run in name order.
# The generators are deterministic: re-running reproduces the committed fixtures byte for byte
# (check with `git diff --exit-code test/reference/fixtures`).
set -euo pipefail

here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
root="$(cd "$here/../.." && pwd)"
cd "$root" # generators write paths relative to the repository root

PYTHON=/usr/bin/python3
RSCRIPT="$(command -v Rscript || true)"
[ -z "$RSCRIPT" ] && [ -x /usr/bin/Rscript ] && RSCRIPT=/usr/bin/Rscript

missing=0
if [ ! -x "$PYTHON" ]; then
  echo "generate.sh: $PYTHON not found (install Debian's python3 with python3-sklearn python3-scipy)" >&2
  missing=1
elif ! "$PYTHON" -c 'import numpy, scipy, sklearn' 2>/dev/null; then
  echo "generate.sh: $PYTHON lacks numpy/scipy/sklearn (apt-get install python3-numpy python3-scipy python3-sklearn)" >&2
  missing=1
fi
if [ -z "$RSCRIPT" ]; then
  echo "generate.sh: Rscript not found (apt-get install r-base-core r-cran-iso r-cran-quadprog)" >&2
  missing=1
elif ! "$RSCRIPT" -e 'stopifnot(requireNamespace("Iso", quietly = TRUE), requireNamespace("quadprog", quietly = TRUE))' >/dev/null 2>&1; then
  echo "generate.sh: R lacks the Iso or quadprog package (apt-get install r-cran-iso r-cran-quadprog)" >&2
  missing=1
fi
[ "$missing" -eq 0 ] || exit 1

mkdir -p test/reference/fixtures
export LC_ALL=C.UTF-8 # fixed number formatting and sort order in both languages
export PYTHONHASHSEED=0

shopt -s nullglob
r_gens=(test/reference/gen_*.R)
py_gens=(test/reference/gen_*.py)
for g in "${r_gens[@]}"; do
  echo "== Rscript $g"
  "$RSCRIPT" --vanilla "$g"
done
for g in "${py_gens[@]}"; do
  echo "== $PYTHON $g"
  "$PYTHON" "$g"
done
echo "generate.sh: ran ${#r_gens[@]} R and ${#py_gens[@]} Python generators"
