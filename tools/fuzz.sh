#!/bin/sh
# Fuzzes every parser with libFuzzer (clang, ASan + UBSan) for a fixed time.
#   tools/fuzz.sh [TARGET...]      targets: option_spec scenario certificate matrix_csv checkpoint arguments family
#   FUZZ_SECONDS=60                time per target (default 60)
# Builds tests/fuzz (a separate CMake project, so the main build never needs
# clang) in build-fuzz, replays the kept regression inputs, then fuzzes each
# target from its seed corpus. Fails on any crash, hang (-timeout=10), leak,
# out-of-memory or sanitizer report; the input that did it is left in
# build-fuzz/artifacts/<target>/ (copy it to tests/fuzz/regressions/<target>/
# once fixed).
set -eu
cd "$(dirname "$0")/.."

PACKAGES="build-essential cmake pkg-config libboost-graph-dev libeigen3-dev libgmp-dev \
libglpk-dev libtomlplusplus-dev nlohmann-json3-dev libcli11-dev libfmt-dev \
clang libclang-rt-14-dev llvm"

. tools/packages.sh

SECONDS_EACH="${FUZZ_SECONDS:-60}"
TARGETS="${*:-option_spec scenario certificate matrix_csv checkpoint arguments family}"

install_missing $PACKAGES
CC=clang CXX=clang++ cmake -S tests/fuzz -B build-fuzz >/dev/null
cmake --build build-fuzz -j"$(nproc)"

# Reports from the sanitizers end the run (libFuzzer then keeps the input).
export ASAN_OPTIONS="detect_leaks=1:abort_on_error=1:symbolize=1"
export UBSAN_OPTIONS="halt_on_error=1:print_stacktrace=1"

status=0
for t in $TARGETS; do
    bin="build-fuzz/fuzz_$t"
    if [ ! -x "$bin" ]; then
        echo "fuzz $t: NOT BUILT (see the cmake warning above)" >&2
        status=1
        continue
    fi
    work="build-fuzz/corpus/$t"
    art="build-fuzz/artifacts/$t"
    log="build-fuzz/fuzz_$t.log"
    mkdir -p "$work" "$art"
    # Crashes fixed earlier must stay fixed: replay every kept input first.
    regs=$(find "tests/fuzz/regressions/$t" -type f ! -name README.md 2>/dev/null | sort)
    if [ -n "$regs" ]; then
        # shellcheck disable=SC2086
        if ! "$bin" -timeout=10 -rss_limit_mb=2048 $regs >"$log.regressions" 2>&1; then
            echo "fuzz $t: a kept regression input fails again (see $log.regressions)" >&2
            status=1
            continue
        fi
    fi
    # Specs are typed by hand (the target ignores more than 4096 bytes); files can be longer.
    maxlen=65536
    [ "$t" = option_spec ] && maxlen=4096
    # The first corpus directory collects new inputs; the seeds are only read.
    if "$bin" -max_total_time="$SECONDS_EACH" -timeout=10 -rss_limit_mb=2048 -max_len="$maxlen" \
        -print_final_stats=1 -artifact_prefix="$art/" "$work" "tests/fuzz/corpus/$t" >"$log" 2>&1; then
        runs=$(grep -o 'stat::number_of_executed_units: *[0-9]*' "$log" | grep -o '[0-9]*$' || echo "?")
        echo "fuzz $t: ${SECONDS_EACH} s, $runs inputs, no findings"
    else
        echo "fuzz $t: FAILED (log $log, input in $art/):" >&2
        grep -E 'ERROR|SUMMARY|runtime error|Test unit written' "$log" | head -5 >&2
        status=1
    fi
done
exit $status
