#!/usr/bin/env bash
# The speed comparison of docs/benchmarks.md: settle against Debian's python3-torch (idiomatic and hand-written
# variants), float64, one thread each, interleaved rounds. Installs the peer with apt when it is missing, builds
# the benchmarks jar, and runs. Extra arguments go to the comparison (e.g. --rounds 7, --only logistic-b64).
# With --study (first argument) it runs the study-level comparison instead (settle.benchmarks.StudySpeed: whole
# studies with the arms of a replicate trained together and apart, against the batched peer; e.g.
# --study --rounds 5, --study --only mlp). Not part of the test suite.
set -euo pipefail
main=settle.benchmarks.PeerSpeed
if [ "${1:-}" = "--study" ]; then
  main=settle.benchmarks.StudySpeed
  shift
fi
root=$(cd "$(dirname "$0")/.." && pwd)
cd "$root"
# The peer must multiply with an optimised BLAS: python3-torch alone may pull in Debian's reference BLAS
# (libblas3), which makes its large products about ten times slower and would flatter settle. OpenBLAS is
# installed alongside and selected through Debian's alternatives.
blas=$(readlink -f /usr/lib/x86_64-linux-gnu/libblas.so.3 2>/dev/null || true)
if ! /usr/bin/python3 -c 'import torch' >/dev/null 2>&1 || [[ "$blas" != *openblas* ]]; then
  echo "run-comparison: installing python3-torch and OpenBLAS (Debian) for the peer" >&2
  if [ "$(id -u)" -eq 0 ]; then sudo=""; else sudo="sudo"; fi
  $sudo apt-get update -q
  DEBIAN_FRONTEND=noninteractive $sudo apt-get install -y -q python3-torch libopenblas0-pthread
  blas=$(readlink -f /usr/lib/x86_64-linux-gnu/libblas.so.3 2>/dev/null || true)
  if [[ "$blas" != *openblas* ]]; then
    echo "run-comparison: libblas.so.3 is $blas, not OpenBLAS; select it with" \
      "'update-alternatives --config libblas.so.3-x86_64-linux-gnu'" >&2
    exit 1
  fi
fi
jar="$root/benchmarks/target/benchmarks.jar"
if [ ! -f "$jar" ] || [ -n "$(find "$root" -path '*/src/main/*' -newer "$jar" -print -quit)" ]; then
  mvn -B -q -DskipTests -pl benchmarks -am package
fi
export OMP_NUM_THREADS=1 OPENBLAS_NUM_THREADS=1 MKL_NUM_THREADS=1
exec java --add-modules jdk.incubator.vector -cp "$jar" "$main" \
  --peer "$root/benchmarks/src/main/python/peer.py" --python /usr/bin/python3 "$@" 2> >(grep -v 'Using incubator modules' >&2)
