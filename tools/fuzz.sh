#!/usr/bin/env bash
# Builds the libFuzzer targets (tests/fuzz/fuzz_*.cpp) with clang, AddressSanitizer and
# UndefinedBehaviorSanitizer in build-fuzz/, then runs each one for a set time from its seed
# corpus (tests/fuzz/corpus/<name>/) with its dictionary (tests/fuzz/<name>.dict) when there is
# one. A crash leaves its input in the scratch folder printed at the end: add it to the seed
# corpus and write a regression test for it.
#
#   bash tools/fuzz.sh [SECONDS_PER_TARGET] [TARGET ...]     (default: 60 s, every target)
#
# FUZZ_SEED=N fixes libFuzzer's random seed (CI does, so that a run can be repeated).
# FUZZ_FAST=1 builds and runs the targets without sanitizers, in build-fuzz-fast/ (5-7 times
# more executions a second: for long runs; replay the grown corpus under the sanitizers after).
# FUZZ_CORPUS=DIR keeps each target's corpus in DIR/corpus-<name> (seeded from tests/fuzz), so
# that long runs add up instead of starting from the seeds each time.
# FUZZ_TIMEOUT=S: the seconds (wall clock) one input may take before it counts as a hang
# (default 10; raise it for runs at low priority on a busy machine).
#
# Needs Debian's clang and libclang-rt-14-dev (libFuzzer and the sanitizer runtimes).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
seconds="${1:-60}"
shift || true

build=build-fuzz
flags="-fsanitize=fuzzer-no-link,address,undefined -fno-sanitize-recover=undefined"
if [ "${FUZZ_FAST:-0}" = 1 ]; then
    build=build-fuzz-fast
    flags="-fsanitize=fuzzer-no-link"
fi
if [ ! -f "$build/build.ninja" ]; then
    cmake -S . -B "$build" -G Ninja -DCMAKE_BUILD_TYPE=RelWithDebInfo \
        -DCMAKE_C_COMPILER=clang -DCMAKE_CXX_COMPILER=clang++ \
        -DSIFTWAVE_WITH_QT=OFF -DSIFTWAVE_BUILD_TESTS=OFF -DSIFTWAVE_BUILD_BENCHMARKS=OFF \
        -DSIFTWAVE_BUILD_FUZZERS=ON "-DCMAKE_CXX_FLAGS=$flags" \
        >"$build.configure.log" 2>&1 || { cat "$build.configure.log"; exit 1; }
fi
cmake --build "$build" -j2 >"$build/build.log" 2>&1 || {
    grep -E "error" -A3 "$build/build.log" | head -40
    exit 1
}

targets=("$@")
if [ ${#targets[@]} -eq 0 ]; then
    for f in tests/fuzz/fuzz_*.cpp; do
        name="$(basename "$f" .cpp)"
        targets+=("${name#fuzz_}")
    done
fi

scratch="$(mktemp -d "${TMPDIR:-/tmp}/siftwave-fuzz.XXXXXX")"
status=0
for t in "${targets[@]}"; do
    corpus="${FUZZ_CORPUS:-$scratch}/corpus-$t"
    mkdir -p "$corpus"
    [ -d "tests/fuzz/corpus/$t" ] && cp -n tests/fuzz/corpus/"$t"/* "$corpus"/
    dict=()
    [ -f "tests/fuzz/$t.dict" ] && dict=("-dict=tests/fuzz/$t.dict")
    echo "== fuzz_$t for ${seconds}s"
    if ! (cd "$scratch" && "$root/$build/fuzz/fuzz_$t" "$corpus" "${dict[@]/#-dict=/-dict=$root/}" \
        -max_total_time="$seconds" -max_len=16384 -rss_limit_mb=2048 -timeout="${FUZZ_TIMEOUT:-10}" \
        ${FUZZ_SEED:+-seed=$FUZZ_SEED} -print_final_stats=1 2>"$scratch/fuzz_$t.log"); then
        status=1
        echo "fuzz_$t FAILED; its log and the crashing input are in $scratch"
        tail -40 "$scratch/fuzz_$t.log"
    fi
    grep -E "^stat::number_of_executed_units|^stat::peak_rss_mb|cov: " "$scratch/fuzz_$t.log" | tail -3
done
[ "$status" -eq 0 ] && echo "all fuzz targets ran clean ($scratch)"
exit "$status"
