#!/bin/sh
# The installed library as another program sees it (CTest install.consumer):
#   tools/install-check.sh BUILD_DIR SCRATCH_DIR
# installs BUILD_DIR into SCRATCH_DIR/prefix, then builds examples/consumer
# against it three ways (find_package with the shared library, with the static
# archive, and pkg-config) and runs each build once.
set -eu
build=$(cd "$1" && pwd)
mkdir -p "$2"
scratch=$(cd "$2" && pwd)
source=$(cd "$(dirname "$0")/.." && pwd)
prefix="$scratch/prefix"
rm -rf "$prefix" "$scratch/shared" "$scratch/static" "$scratch/pkg"

cmake --install "$build" --prefix "$prefix" >/dev/null
for kind in shared static; do
    static=OFF
    [ "$kind" = static ] && static=ON
    cmake -S "$source/examples/consumer" -B "$scratch/$kind" -DCMAKE_PREFIX_PATH="$prefix" \
        -DOVERSHOOT_STATIC=$static -DCMAKE_BUILD_TYPE=Release >/dev/null
    cmake --build "$scratch/$kind" >/dev/null
done
mkdir -p "$scratch/pkg"
libdir=$(dirname "$(find "$prefix" -name overshoot.pc)")
PKG_CONFIG_PATH="$libdir" c++ -o "$scratch/pkg/duel_margin" "$source/examples/consumer/duel_margin.cpp" \
    $(PKG_CONFIG_PATH="$libdir" pkg-config --cflags --libs overshoot)

# The shared builds find the library through the rpath CMake gives them, the
# pkg-config build through LD_LIBRARY_PATH; all three must print the same line.
first=""
for exe in "$scratch/shared/duel_margin" "$scratch/static/duel_margin" "$scratch/pkg/duel_margin"; do
    out=$(LD_LIBRARY_PATH="$libdir/.." "$exe" 1d6 2d6 100)
    echo "$exe: $out"
    case "$out" in
        "1d6 against 2d6 on 100 squares: margin "*) ;;
        *) echo "install-check: unexpected output from $exe" >&2; exit 1 ;;
    esac
    [ -z "$first" ] && first="$out"
    if [ "$out" != "$first" ]; then
        echo "install-check: the builds disagree" >&2
        exit 1
    fi
done
# Bad input is one line and exit 2, as from the command line.
if "$scratch/shared/duel_margin" 1d6 2x6 100 2>/dev/null; then
    echo "install-check: a bad spec was accepted" >&2
    exit 1
fi
# The static build needs no libovershoot.so at run time.
if ldd "$scratch/static/duel_margin" | grep -q libovershoot; then
    echo "install-check: the static build links libovershoot.so" >&2
    exit 1
fi
echo "install-check: the installed library builds and runs (shared, static, pkg-config)"
