#!/usr/bin/env bash
# The whole-process benchmark: times `gonogo check` on a generated field against the floor
# (parsing the same YAML into serde_yaml `Value`s on one thread, tests/benches/yaml_floor.rs),
# one after the other under hyperfine, several runs each, and prints the median ratios and
# the peak memory (/usr/bin/time -v) of every row of the table in the README's Performance
# section. Not part of `cargo test`.
#
#   tests/benches/field/run.sh [N]          N engines (10000 by default)
#   tests/benches/field/run.sh --scale [N]  only the scale test: N engines (1000000 by
#                                           default), `check --jobs 2`, its time and peak
#
# Needs hyperfine (`apt-get install hyperfine`), GNU time (/usr/bin/time) and, for the Python
# row, PyYAML with its C loader (`pip install pyyaml`). Fields are made in a temporary folder
# and removed at the end.
set -euo pipefail
cd "$(dirname "$0")/../../.."
here=tests/benches/field
runs=${RUNS:-5}
scale=no
if [ "${1:-}" = "--scale" ]; then scale=yes; shift; fi
engines=${1:-$([ $scale = yes ] && echo 1000000 || echo 10000)}
for tool in hyperfine /usr/bin/time python3; do
  command -v "$tool" >/dev/null || { echo "error: $tool is needed (see the comment at the top)" >&2; exit 2; }
done
cargo build --release --quiet --bin gonogo --example yaml-floor
bin=target/release/gonogo
floor=target/release/examples/yaml-floor
rules=rulebooks-demo/tamsin-2027.rules
work=$(mktemp -d "${TMPDIR:-/tmp}/gonogo-bench.XXXXXX")
trap 'rm -rf "$work"' EXIT
echo "making a field of $engines engines in $work"
python3 $here/make_field.py engines "$engines" "$work/field"

# peak resident memory of a command, in MiB
peak() { /usr/bin/time -v "$@" >/dev/null 2>"$work/time" || true
  awk -F': ' '/Maximum resident/ {printf "%.0f", $2/1024}' "$work/time"; }

if [ $scale = yes ]; then
  /usr/bin/time -v $bin check --rules $rules --jobs 2 "$work/field" >/dev/null 2>"$work/time" || true
  grep -E "Elapsed|Maximum resident" "$work/time"
  exit 0
fi

# median seconds of each command, run one after the other
hyperfine --style basic --warmup 1 --runs "$runs" -N -i --export-json "$work/times.json" \
  -n floor "$floor $work/field" \
  -n text-1 "$bin check --rules $rules --jobs 1 $work/field" \
  -n text-2 "$bin check --rules $rules --jobs 2 $work/field" \
  -n json-1 "$bin check --rules $rules --format json --jobs 1 $work/field" \
  -n python "python3 $here/three_checks.py $work/field" >/dev/null
python3 $here/make_field.py rulebook 1000000 "$work/big.rules"
mkdir -p "$work/one" && cp engines-demo/limited2-legal.yaml "$work/one/"
hyperfine --style basic --warmup 2 --runs $((runs * 4)) -N -i --export-json "$work/small.json" \
  -n lint-1mb "$bin lint $work/big.rules" \
  -n one-engine "$bin check --rules $rules $work/one/limited2-legal.yaml" >/dev/null

text_peak=$(peak $bin check --rules $rules --jobs 1 "$work/field")
json_peak=$(peak $bin check --rules $rules --format json --jobs 1 "$work/field")
python3 - "$work/times.json" "$work/small.json" "$engines" "$text_peak" "$json_peak" <<'PY'
import json, sys
m = {r["command"]: r["median"] for f in sys.argv[1:3] for r in json.load(open(f))["results"]}
n, text_peak, json_peak = sys.argv[3:6]
f = m["floor"]
print(f"field of {n} engines, median of the runs (floor {f:.3f} s)")
print(f"check --jobs 1, text / floor        {m['text-1'] / f:.2f}x")
print(f"check --jobs 2, text / floor        {m['text-2'] / f:.2f}x")
print(f"check --format json --jobs 1 / floor {m['json-1'] / f:.2f}x")
print(f"peak memory, text / json            {text_peak} MiB / {json_peak} MiB")
print(f"Python three checks / check --jobs 1 {m['python'] / m['text-1']:.2f}x (gonogo faster above 1)")
print(f"lint of a 1 MB rulebook             {m['lint-1mb'] * 1000:.0f} ms")
print(f"one engine, whole process           {m['one-engine'] * 1000:.1f} ms")
PY
