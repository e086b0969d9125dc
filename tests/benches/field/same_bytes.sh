#!/usr/bin/env bash
# Same bytes before and after: runs an older gonogo binary and this checkout's release build
# on every demo engine (one run each) and on a generated field of N engines, in every format,
# at --jobs 1 and --jobs 2, in file order and --sort result, and compares standard output and
# the exit status. Prints one line per difference and exits 1 when there is any. Used to show
# that an optimisation changes no byte of any output. Not part of `cargo test`.
#
#   tests/benches/field/same_bytes.sh OLD_BINARY [N]   (N = 10000 by default)
#
# Make OLD_BINARY from the revision before the change, e.g.
#   git worktree add /tmp/old REV && (cd /tmp/old && cargo build --release) && cp ...
# GONOGO_TEMPLATES=DIR makes the field from DIR's declarations (ones the old binary reads).
set -euo pipefail
cd "$(dirname "$0")/../../.."
old=${1:?usage: same_bytes.sh OLD_BINARY [N]}
engines=${2:-10000}
cargo build --release --quiet --bin gonogo
new=target/release/gonogo
rules=rulebooks-demo/tamsin-2027.rules
export SOURCE_DATE_EPOCH=1810000000
work=$(mktemp -d "${TMPDIR:-/tmp}/gonogo-same.XXXXXX")
trap 'rm -rf "$work"' EXIT
python3 tests/benches/field/make_field.py engines "$engines" "$work/field"
differences=0
# runs both binaries with the same arguments; compares stdout and the exit status
same() {
  local a b
  "$old" "$@" >"$work/old.out" 2>/dev/null && a=0 || a=$?
  "$new" "$@" >"$work/new.out" 2>/dev/null && b=0 || b=$?
  if [ "$a" != "$b" ] || ! cmp -s "$work/old.out" "$work/new.out"; then
    echo "differs (exit $a vs $b): $*"
    differences=$((differences + 1))
  fi
}
demo=${GONOGO_TEMPLATES:-engines-demo}
for format in text json markdown html; do
  for engine in "$demo"/*.yaml; do
    same check --rules $rules --format $format "$engine"
  done
  for jobs in 1 2; do
    for sort in file result; do
      same check --rules $rules --format $format --jobs $jobs --sort $sort "$work/field"
      same check --rules $rules --format $format --jobs $jobs --sort $sort "$demo"
    done
  done
done
echo "$differences difference(s) over $engines generated engines and every demo engine"
[ "$differences" = 0 ]
