#!/bin/bash
# The replicate-file check of docs/benchmarks.md ("Replicate files"): runs benchmarks/plans/mlp-20000x16-26.yaml with
# a settle of format 3 (built from git revision OLD, by default the last one before format 4) and with this one, then
# prints the bytes of both directories' replicate files and format 2's from the same arrays, and times the report's
# build on each in interleaved rounds.
#   benchmarks/run-replicate-files.sh [--old REV] [--rounds N] [--work DIR]
set -eu
OLD=b4c8781
ROUNDS=7
WORK=/tmp/settle-replicate-files
while [ $# -gt 0 ]; do
  case "$1" in
    --old) OLD=$2; shift 2 ;;
    --rounds) ROUNDS=$2; shift 2 ;;
    --work) WORK=$2; shift 2 ;;
    *) echo "usage: $0 [--old REV] [--rounds N] [--work DIR]" >&2; exit 2 ;;
  esac
done
HERE=$(cd "$(dirname "$0")/.." && pwd)
PLAN=$HERE/benchmarks/plans/mlp-20000x16-26.yaml
mkdir -p "$WORK"
if [ ! -f "$WORK/old/experiments/target/settle.jar" ]; then
  rm -rf "$WORK/old" && mkdir -p "$WORK/old"
  git -C "$HERE" archive "$OLD" | tar -x -C "$WORK/old"
  (cd "$WORK/old" && mvn -B -o -q -DskipTests package -pl datasets,engine,reports,experiments)
fi
(cd "$HERE" && mvn -B -o -q -DskipTests package)
run() { # JAR DIR
  [ -f "$2/report.html" ] || java --add-modules jdk.incubator.vector -jar "$1" run "$PLAN" --out "$2" --quiet --threads 2
}
run "$WORK/old/experiments/target/settle.jar" "$WORK/format3"
run "$HERE/experiments/target/settle.jar" "$WORK/format4"
B="java -cp $HERE/benchmarks/target/benchmarks.jar settle.benchmarks.ReplicateFiles"
$B bytes "$WORK/format3" "$WORK/format4"
echo "summary.csv rows that differ between the two studies (format 3 first):"
diff "$WORK/format3/summary.csv" "$WORK/format4/summary.csv" || true
echo "report.html lines that differ (one element a line):"
diff "$WORK/format3/report.html" "$WORK/format4/report.html" >/dev/null && echo none || \
  diff <(sed 's/></>\n</g' "$WORK/format3/report.html") <(sed 's/></>\n</g' "$WORK/format4/report.html") | grep '^[<>]' || true
$B time "$WORK/old/experiments/target/settle.jar" "$WORK/format3" "$HERE/experiments/target/settle.jar" \
  "$WORK/format4" "$ROUNDS" 2>/dev/null
