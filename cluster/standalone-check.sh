#!/usr/bin/env bash
# Runs a plan on a real (one-machine) Spark standalone cluster and checks it against a local run.
#
# Starts a Spark master and one worker from the jars the cluster build lists (cluster/target/spark-classpath.txt,
# laid out as a throwaway SPARK_HOME), then runs the plan three ways and compares the replicate files and
# epochs.csv byte for byte:
#   local:  ./settle run PLAN                                   (local threads)
#   spark:  ./settle run PLAN --cluster spark://127.0.0.1:PORT  (executors in the worker's own JVMs)
#   submit: SparkSubmit ... cluster/target/settle-cluster.jar run PLAN   (what spark-submit runs)
# Usage: cluster/standalone-check.sh [PLAN]   (default experiments/plans/demo.yaml; build first with
# mvn -B -q -DskipTests package). Takes a minute or two; it is not part of mvn verify.
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
plan=$(cd "$(dirname "${1:-$root/experiments/plans/demo.yaml}")" && pwd)/$(basename "${1:-demo.yaml}")
jar="$root/cluster/target/settle-cluster.jar"
classpath="$root/cluster/target/spark-classpath.txt"
[ -f "$jar" ] && [ -f "$classpath" ] || { echo "build first: mvn -B -q -DskipTests package" >&2; exit 2; }
port=${SPARK_MASTER_PORT:-7077}
work=$(mktemp -d)
pids=()
cleanup() { for p in "${pids[@]}"; do kill "$p" 2>/dev/null || true; done; }
trap cleanup EXIT
export SPARK_LOCAL_IP=127.0.0.1
mkdir -p "$work/home/jars" "$work/worker"
tr ':' '\n' < "$classpath" | while read -r j; do ln -s "$j" "$work/home/jars/"; done
echo "Spark from Maven Central, for standalone-check.sh" > "$work/home/RELEASE" # marks a binary layout
SPARK_HOME="$work/home" SPARK_SCALA_VERSION=2.13 java -cp "$work/home/jars/*" org.apache.spark.deploy.master.Master \
  --host 127.0.0.1 --port "$port" --webui-port 0 > "$work/master.log" 2>&1 &
pids+=($!)
SPARK_HOME="$work/home" SPARK_SCALA_VERSION=2.13 java -cp "$work/home/jars/*" org.apache.spark.deploy.worker.Worker \
  --host 127.0.0.1 --cores 2 --memory 1g --work-dir "$work/worker" --webui-port 0 "spark://127.0.0.1:$port" \
  > "$work/worker.log" 2>&1 &
pids+=($!)
for _ in $(seq 120); do grep -q "Successfully registered with master" "$work/worker.log" && break; sleep 1; done
grep -q "Successfully registered with master" "$work/worker.log" || { echo "the worker did not register; see $work" >&2; exit 1; }

cd "$work"
"$root/settle" run "$plan" --out local --quiet
"$root/settle" run "$plan" --out spark --cluster "spark://127.0.0.1:$port" --quiet
java -cp "$work/home/jars/*" org.apache.spark.deploy.SparkSubmit --master "spark://127.0.0.1:$port" \
  --deploy-mode client "$jar" run "$plan" --out submit --quiet
for s in spark submit; do
  diff -r local/arms "$s/arms" && cmp local/epochs.csv "$s/epochs.csv"
  echo "$s: $(find "$s/arms" -name '*.json' | wc -l) replicate files and epochs.csv identical to the local run"
done
rm -rf "$work"
