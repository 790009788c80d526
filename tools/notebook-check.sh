#!/bin/sh
# Runs docs/notebooks/first-look.ipynb top to bottom as a newcomer would, with
# Jupyter's nbconvert (Debian's jupyter-nbconvert, python3-ipykernel,
# python3-matplotlib, installed with apt-get when missing, as tools/dev installs
# its packages); any error in a cell fails the check. The executed copy is kept
# at build/notebooks/first-look.ipynb.
#   NOTEBOOK_SECONDS=300   time budget (default 300 s)
set -eu
cd "$(dirname "$0")/.."

. tools/packages.sh
install_missing jupyter-nbconvert python3-ipykernel python3-matplotlib

cmake -S . -B build -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build build -j"$(nproc)"
mkdir -p build/notebooks
budget="${NOTEBOOK_SECONDS:-300}"
within_budget notebook "$budget" "a cell failed (the error is above)" \
    env PYTHONPATH="$PWD/build/python" jupyter nbconvert --to notebook --execute \
    --ExecutePreprocessor.timeout="$budget" --output-dir build/notebooks docs/notebooks/first-look.ipynb
