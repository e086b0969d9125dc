#!/usr/bin/env bash
# Instruction counts of the whole process, which repeat exactly on a shared machine where wall
# times move by 10 % or more: valgrind's callgrind on `gonogo check` of a generated field (text
# and JSON reports, one job) and on `gonogo lint` of a 1 MB rulebook. Prints each run's total
# and the top entries of its profile (functions by their own instructions). Compare two
# binaries by running it with each. Not part of `cargo test`.
#
#   tests/benches/field/instructions.sh [BINARY] [N] [TOP]
#     BINARY  the gonogo to measure (default: this checkout's release build, built first with
#             line tables, so the profile names source lines)
#     N       engines in the field (default 200)
#     TOP     profile entries to print per run (default 12)
#
# Needs valgrind (Debian's `valgrind`, which has callgrind_annotate). Under valgrind the CPU
# looks older than it is, so SHA-256 runs its portable code: its share is larger than on the
# machine itself.
set -euo pipefail
cd "$(dirname "$0")/../../.."
binary=${1:-}
engines=${2:-200}
top=${3:-12}
if [ -z "$binary" ]; then
  CARGO_PROFILE_RELEASE_DEBUG=line-tables-only cargo build --release --quiet --bin gonogo
  binary=target/release/gonogo
fi
rules=rulebooks-demo/tamsin-2027.rules
export SOURCE_DATE_EPOCH=1810000000
work=$(mktemp -d "${TMPDIR:-/tmp}/gonogo-instructions.XXXXXX")
trap 'rm -rf "$work"' EXIT
python3 tests/benches/field/make_field.py engines "$engines" "$work/field" >/dev/null
python3 tests/benches/field/make_field.py rulebook 1000000 "$work/big.rules" >/dev/null
# one run under callgrind: the total, then the top entries
count() {
  local name=$1
  shift
  valgrind --tool=callgrind --callgrind-out-file="$work/$name.out" "$@" >/dev/null 2>"$work/$name.err" || true
  local total
  total=$(grep -o 'Collected : [0-9]*' "$work/$name.err" | grep -o '[0-9]*$')
  echo "== $name: $total instructions ($*)"
  callgrind_annotate "$work/$name.out" 2>/dev/null |
    grep -E '^ *[0-9,]+ \( *[0-9.]+%\)  ' | grep -v 'PROGRAM TOTALS' | awk -v n="$top" 'NR <= n' |
    sed -E 's/ \[[^]]*\]$//; s#/rustc/[0-9a-f]+/##; s#/root/\.cargo/registry/src/[^/]+/##'
}
count "check-text" "$binary" check --rules $rules --jobs 1 "$work/field"
count "check-json" "$binary" check --rules $rules --format json --jobs 1 "$work/field"
count "lint-1MB" "$binary" lint "$work/big.rules"
