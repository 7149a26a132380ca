#!/usr/bin/env bash
# Builds a libFuzzer harness with clang (-fsanitize=fuzzer,address,undefined)
# from the same sources as the psikappa_lang library, then fuzzes for SECONDS
# (default 60). TARGET (default script) chooses the harness:
#   script  tests/fuzz/fuzz_script.c: the input is a script run by the interpreter
#   store   tests/fuzz/fuzz_store.c: the input is a store file and a list of
#           reads and writes of keys and answers
#   cli     tests/fuzz/fuzz_cli.c: the input is the command line (one argument a line)
#
#   tests/fuzz/run.sh [TARGET] [SECONDS] [extra libFuzzer options...]
#
# Environment:
#   PSIKAPPA_FUZZ_DIR   work folder (default build/fuzz): the binary, the
#                       corpus it grows (corpus/) and reproducers (artifacts/)
#   PSIKAPPA_FUZZ_JOBS  parallel fuzzing processes (default 1)
#   PSIKAPPA_SRC_ROOT   tree whose src/ and grammar/ are built (default: this checkout)
#
# Seeds are the .pk scripts of tests/golden, samples and tests/hostile (linked
# from $PSIKAPPA_FUZZ_DIR/seeds/, nothing is copied) minus the known open bugs
# listed in tests/fuzz/skip-seeds.txt.
#
# Exit status: 0 when the campaign ended without a finding; nonzero after a
# crash, sanitizer report, leak, timeout or out-of-memory, with the reproducer
# left in $PSIKAPPA_FUZZ_DIR/artifacts/ and its path printed.
set -euo pipefail
root=$(cd "$(dirname "$0")/../.." && pwd)
src=${PSIKAPPA_SRC_ROOT:-$root}   # sources to build (e.g. a snapshot); seeds come from $root
target=script
case ${1:-} in script|store|cli) target=$1; shift ;; esac
seconds=${1:-60}
[ $# -gt 0 ] && shift
work=${PSIKAPPA_FUZZ_DIR:-$root/build/fuzz}
[ "$target" = script ] || work=$work-$target
jobs=${PSIKAPPA_FUZZ_JOBS:-1}
case $seconds in ''|*[!0-9]*) echo "usage: $0 [SECONDS] [libFuzzer options...]" >&2; exit 2;; esac

# --- tools
need=""
command -v clang >/dev/null || need="$need clang"
command -v bison >/dev/null || need="$need bison"
command -v flex >/dev/null || need="$need flex"
if [ -n "$need" ] || ! echo 'int LLVMFuzzerTestOneInput(const char *d, unsigned long n) { (void)d; (void)n; return 0; }' \
     | clang -x c - -fsanitize=fuzzer -o /dev/null 2>/dev/null; then
  SUDO=""; [ "$(id -u)" -eq 0 ] || SUDO="sudo"
  $SUDO apt-get update -q
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -q clang libclang-rt-14-dev bison flex \
    libflint-dev libflint-arb-dev libgmp-dev libmpfr-dev libsqlite3-dev libedit-dev
fi

# --- build: generated front end in a temp folder, every library source compiled directly
mkdir -p "$work/obj" "$work/corpus" "$work/artifacts"
gen=$(mktemp -d)
trap 'rm -rf "$gen"' EXIT
bison -Wall -o "$gen/parser.c" --defines="$gen/parser.h" "$src/grammar/parser.y"
flex -o "$gen/lexer.c" "$src/grammar/lexer.l"

# Mirror the compile definitions and libraries of CMakeLists.txt.
defs=""
for d in $(sed -n 's/^add_compile_definitions(\(.*\))$/\1/p' "$src/CMakeLists.txt"); do
  defs="$defs -D$d"
done
defs="$defs -DPSIKAPPA_STDLIB_DIR=\"$src/lib\" -DPSIKAPPA_INSTALLED_LIB_DIR=\"/usr/local/share/psikappa/lib\""
libs="-lflint -lmpfr -lgmp -lpthread -lm"
grep -q 'find_library(SQLITE3_LIBRARY' "$src/CMakeLists.txt" && libs="$libs -lsqlite3"
grep -q 'find_library(EDIT_LIBRARY' "$src/CMakeLists.txt" && libs="$libs -ledit"
incdirs="-I$gen"
for layer in support engines syntax values format store lang cli; do incdirs="$incdirs -I$src/src/$layer"; done
if [ -f /usr/include/flint/arb.h ] || [ -f /usr/local/include/flint/arb.h ]; then
  defs="$defs -DPSIKAPPA_FLINT3_ARB"
else
  libs="-lflint-arb $libs"
fi
cflags="-std=c11 -g -O1 -fno-omit-frame-pointer -fsanitize=address,undefined -fno-sanitize-recover=undefined $defs $incdirs"

# Every C file of the layers under src/ except the command line's main.c and the optional MPI
# program (a program of its own, built only where MPI is).
sources=$(cd "$src" && find src -name '*.c' ! -path src/cli/main.c ! -path 'src/mpi/*' | sort)
rm -f "$work"/obj/*.o
{
  for s in $sources; do echo "$src/$s"; done
  echo "$gen/parser.c"
  echo "$gen/lexer.c"
} | xargs -P "$(nproc 2>/dev/null || echo 2)" -I{} sh -c \
    'o="$1/obj/$(echo "$2" | tr / _ ).o"; clang $3 -fsanitize=fuzzer-no-link -w -c "$2" -o "$o"' \
    _ "$work" {} "$cflags"
harness=fuzz_$target
extra=()
if [ "$target" = cli ]; then   # main.c itself, its main renamed for the harness to call
  clang $cflags -fsanitize=fuzzer-no-link -w -Dmain=psikappa_main -c "$src/src/cli/main.c" -o "$work/main.o"
  extra=("$work/main.o")
fi
clang $cflags -fsanitize=fuzzer -Wall -Wextra -c "$root/tests/fuzz/$harness.c" -o "$work/$harness.o"
clang -fsanitize=fuzzer,address,undefined "$work/$harness.o" ${extra[@]+"${extra[@]}"} "$work"/obj/*.o $libs \
  -o "$work/$harness"
echo "built $work/$harness"

# --- run
# Seeds: the .pk scripts of tests/golden, samples and tests/hostile, read in
# place through symbolic links (nothing is copied), except the known open bugs
# of skip-seeds.txt and the scripts that only end because of a --time-limit in
# their .args (the harness has no time limit: they would time out at once).
skip=$(sed 's/#.*//' "$root/tests/fuzz/skip-seeds.txt")
rm -rf "$work/seeds"
mkdir -p "$work/seeds"
for d in tests/golden samples tests/hostile; do
  [ "$target" = script ] || break   # the other harnesses get seeds of their own below
  for f in "$root/$d"/*.pk; do
    [ -f "$f" ] || continue
    base=$(basename "$f")
    for p in $skip; do
      case $base in $p) continue 2 ;; esac
    done
    [ -f "${f%.pk}.args" ] && grep -q -- --time-limit "${f%.pk}.args" && continue
    ln -s "$f" "$work/seeds/$(basename "$d")-$base"
  done
done
if [ "$target" = cli ]; then
  # command lines: the option lists of the golden tests with a short -e, and every option alone
  i=0
  for f in "$root"/tests/golden/*.args "$root"/tests/hostile/*.args; do
    [ -f "$f" ] || continue
    i=$((i + 1))
    { tr ' ' '\n' < "$f"; printf -- '-e\nint_{1,1} psi_1'; } > "$work/seeds/args-$i"
  done
  for o in --explain --verify --volume-engine --no-store --help --version "--format\njson" "--digits\n5" "--precision\n40" \
           "--store\nx.sqlite" "--lib\n." "--time-limit\n1" "--max-terms\n10" "--max-table\n10"; do
    i=$((i + 1))
    printf -- "$o\n-e\n<tau_4>_2" > "$work/seeds/opt-$i"
  done
elif [ "$target" = store ]; then
  printf '\0\0\0\0\0\5hello\1\2\1\3' > "$work/seeds/fresh"
  printf '\1\0\0\0\3\3' > "$work/seeds/healthy"
  printf '\2\020\0\100%064d\3\2\3' 0 > "$work/seeds/damaged"
  printf '\3\0\0\20SQLite format 3\0\3' > "$work/seeds/foreign"
fi
# The harness works in a scratch folder (files a script names land there).
scratch=$(mktemp -d "${TMPDIR:-/tmp}/psikappa-fuzz-XXXXXX")
trap 'rm -rf "$gen" "$scratch"' EXIT
export PSIKAPPA_FUZZ_SCRATCH=$scratch
cd "$work"
parallel=()
[ "$jobs" -gt 1 ] && parallel=(-jobs="$jobs" -workers="$jobs")   # each job logs to fuzz-N.log
status=0
ASAN_OPTIONS=${ASAN_OPTIONS:-detect_leaks=1:allocator_may_return_null=0} \
UBSAN_OPTIONS=${UBSAN_OPTIONS:-print_stacktrace=1:halt_on_error=1} \
  "$work/$harness" -max_total_time="$seconds" -max_len=4096 -timeout=10 -rss_limit_mb=2048 \
    -close_fd_mask=3 -print_final_stats=1 -dict="$root/tests/fuzz/psikappa.dict" -artifact_prefix="$work/artifacts/" \
    ${parallel[@]+"${parallel[@]}"} "$@" "$work/corpus" "$work/seeds" < /dev/null || status=$?
if [ "$status" -ne 0 ]; then
  echo "fuzzing found a problem (status $status); reproducers:" >&2
  ls -1 "$work"/artifacts/ >&2 || true
  echo "replay one with: $work/$harness $work/artifacts/FILE" >&2
fi
exit "$status"
