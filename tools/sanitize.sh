#!/bin/sh
# Runs the whole test suite (unit tests, CLI tests, reference scripts) under
# AddressSanitizer + UndefinedBehaviorSanitizer, in its own build directory.
#   tools/sanitize.sh
#   SANITIZE_SECONDS=600     time budget for the test run (default 600 s)
#   SANITIZE_EXCLUDE=REGEX   ctest -E: tests to leave out (default: none)
# Any sanitizer report aborts the test that made it, so ctest fails.
set -eu
cd "$(dirname "$0")/.."

PACKAGES="build-essential cmake pkg-config libboost-graph-dev libeigen3-dev libgmp-dev \
libglpk-dev libtomlplusplus-dev nlohmann-json3-dev libcli11-dev libfmt-dev catch2 \
python3 python3-networkx python3-scipy libopenmpi-dev openmpi-bin"

. tools/packages.sh

install_missing $PACKAGES
# -O1: a third of -O2's compile time, and sanitizer reports keep their lines.
cmake -S . -B build-asan -DOVERSHOOT_SANITIZE=ON -DCMAKE_BUILD_TYPE=RelWithDebInfo \
    "-DCMAKE_CXX_FLAGS_RELWITHDEBINFO=-O1 -g -DNDEBUG" >/dev/null
cmake --build build-asan -j"$(nproc)"

export ASAN_OPTIONS="detect_leaks=1:abort_on_error=1"
export UBSAN_OPTIONS="halt_on_error=1:print_stacktrace=1"
budget="${SANITIZE_SECONDS:-600}"
set -- --test-dir build-asan --output-on-failure -j"$(nproc)" --timeout 300
[ -n "${SANITIZE_EXCLUDE:-}" ] && set -- "$@" -E "$SANITIZE_EXCLUDE"
within_budget sanitize "$budget" "tests failed under ASan/UBSan (reports above)" ctest "$@"
