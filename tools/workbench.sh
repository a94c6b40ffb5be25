#!/usr/bin/env bash
# One entry point for set-up, build, run and test (see README, "Getting started").
#
#   bash tools/workbench.sh run    install what is missing, build, open the workbench on the sample drop
#   bash tools/workbench.sh test   install what is missing, build, run the whole test suite
#
# Idempotent: a second run installs nothing, rebuilds nothing that is current and prints little.
set -euo pipefail

mode="${1:-}"
case "$mode" in
    run|test) ;;
    *) echo "usage: bash tools/workbench.sh run|test" >&2; exit 2 ;;
esac

root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"

# Debian 12 packages the build, the tests and the offscreen screenshots need.
packages=(
    cmake ninja-build g++ pkg-config
    qt6-base-dev qt6-svg-dev libqcustomplot-dev libgl-dev
    libeigen3-dev libboost-date-time-dev libboost-dev nlohmann-json3-dev libssl-dev
    libzip-dev libexpat1-dev
    googletest libgtest-dev libbenchmark-dev
    poppler-utils fonts-dejavu-core python3
)
# The test suite also cross-checks the fitting engine against SciPy's curve_fit (a reference
# library, never a runtime dependency of Siftwave).
# The sanitizer and fuzzing stages need clang's libFuzzer and sanitizer runtimes.
[ "$mode" = test ] && packages+=(python3-scipy clang libclang-rt-14-dev)

missing=()
for p in "${packages[@]}"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
    echo "Installing ${#missing[@]} missing Debian package(s): ${missing[*]}"
    sudo=""
    [ "$(id -u)" -eq 0 ] || sudo="sudo"
    $sudo apt-get update -qq
    DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

jobs=2
werror=OFF
[ "${CI:-}" = "true" ] && werror=ON

# build_tree DIR [cmake options...]: configure once, then build quietly (log kept in DIR/build.log).
build_tree() {
    local dir="$1"; shift
    if [ ! -f "$dir/build.ninja" ]; then
        cmake -S . -B "$dir" -G Ninja -DCMAKE_BUILD_TYPE=Release -DSIFTWAVE_WARNINGS_AS_ERRORS="$werror" "$@" \
            >"$dir.configure.log" 2>&1 || { cat "$dir.configure.log"; exit 1; }
    fi
    if ! cmake --build "$dir" -j "$jobs" >"$dir/build.log" 2>&1; then
        grep -E "error|Error" -A3 "$dir/build.log" | head -60
        echo "Build failed; the full log is $dir/build.log" >&2
        exit 1
    fi
}

build_tree build

if [ "$mode" = run ]; then
    if [ -z "${DISPLAY:-}" ] && [ -z "${WAYLAND_DISPLAY:-}" ] && [ -z "${QT_QPA_PLATFORM:-}" ]; then
        shot="$root/build/siftwave-screenshot.png"
        QT_QPA_PLATFORM=offscreen build/bin/siftwave --screenshot "$shot" >/dev/null
        cat <<MSG
There is no display here, so the workbench cannot open a window.
A picture of it on the sample drop was rendered offscreen to:
  $shot
To run it without a display yourself:
  QT_QPA_PLATFORM=offscreen build/bin/siftwave --screenshot shot.png [DROP.csv]
With a display (or over ssh -X), run:  build/bin/siftwave
MSG
        exit 0
    fi
    exec build/bin/siftwave
fi

# test, in three stages:
# 1. the whole suite (Release, Qt);
# 2. core, CLI and core tests again with no Qt at all, built by clang (so what only GCC accepts
#    shows) with AddressSanitizer and UndefinedBehaviorSanitizer (any report fails the test
#    that triggered it);
# 3. each libFuzzer target (tests/fuzz) for a fixed time from its seed corpus, fixed seed.
ctest --test-dir build --output-on-failure -j "$jobs" --timeout 600
sanitize="-fsanitize=address,undefined -fno-sanitize-recover=all -fno-omit-frame-pointer"
build_tree build-sanitize-clang -DSIFTWAVE_WITH_QT=OFF -DSIFTWAVE_BUILD_BENCHMARKS=OFF \
    -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ \
    -DCMAKE_BUILD_TYPE=RelWithDebInfo "-DCMAKE_CXX_FLAGS=$sanitize" "-DCMAKE_EXE_LINKER_FLAGS=$sanitize"
export ASAN_OPTIONS="detect_leaks=1:abort_on_error=0:halt_on_error=1" UBSAN_OPTIONS="print_stacktrace=1"
ctest --test-dir build-sanitize-clang -j "$jobs" --timeout 900 -Q ||
    ctest --test-dir build-sanitize-clang --rerun-failed --output-on-failure --timeout 900
echo "No-Qt clang build with AddressSanitizer and UndefinedBehaviorSanitizer (core, CLI, core tests): built and passed."
# The stage keeps its time, about 135 s (three targets at 45 s had it): 22 s for each of the six
# targets (drop reader, dates, ledger, project file, spreadsheet reader, transmission).
FUZZ_SEED=20261204 bash tools/fuzz.sh "${SIFTWAVE_FUZZ_SECONDS:-22}"
