#!/bin/sh
# A bounded fuzzing run of every target (see DEVELOPERS.md, "Fuzzing").
#
#   fuzz/run.sh [SECONDS] [TARGET...]
#
# runs each TARGET (default: scene mesh check) for SECONDS (default 120) of wall time,
# starting from a corpus seeded with the project's own scenes and meshes. Needs
# cargo-fuzz (`cargo install cargo-fuzz --locked`) and a C++ compiler; on a stable
# toolchain RUSTC_BOOTSTRAP=1 lets cargo-fuzz use the sanitizer flags it needs.
# A finding is written to fuzz/artifacts/TARGET/ and stops that target with exit 1.
set -eu
cd "$(dirname "$0")"
secs="${1:-120}"
[ $# -gt 0 ] && shift
targets="${*:-scene mesh check}"

mkdir -p corpus/scene corpus/mesh corpus/check
cp ../scenes/*.ron ../tests/data/*.ron corpus/scene/
# mesh inputs: the first byte picks the format (even = STL, odd = OBJ)
printf '\001' | cat - ../scenes/meshes/bell-pepper.obj > corpus/mesh/bell-pepper-obj
printf '\001v 0 0 0\nv 20 0 0\nv 0 20 0\nv 0 0 20\nf 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n' > corpus/mesh/tetra-obj
printf '\000solid t\nfacet normal 0 0 0\nouter loop\nvertex 0 0 0\nvertex 0 20 0\nvertex 20 0 0\nendloop\nendfacet\nendsolid t\n' > corpus/mesh/triangle-stl
if [ -d ../tests/data/fuzz-regressions ]; then
    for t in scene mesh check; do
        [ -d "../tests/data/fuzz-regressions/$t" ] && cp ../tests/data/fuzz-regressions/"$t"/* "corpus/$t/" 2>/dev/null || true
    done
fi

for t in $targets; do
    dict=""
    case "$t" in
        scene) len=16384; dict="-dict=scene.dict" ;;
        mesh) len=65536 ;;
        *) len=256 ;;
    esac
    echo "== fuzzing $t for $secs s"
    RUSTC_BOOTSTRAP=1 cargo fuzz run "$t" "corpus/$t" -- \
        -max_total_time="$secs" -max_len="$len" -timeout=60 -rss_limit_mb=4096 -print_final_stats=1 $dict
done
