#!/usr/bin/env bash
# Builds brinewatch into build/<kind> (kind: release, or sanitize for ASan+UBSan, unoptimised,
# with assertions).
# Prints the path of the build folder on its last line.
set -euo pipefail
top=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
kind=${1:-release}
case "$kind" in
  release) extra=(-DCMAKE_BUILD_TYPE=RelWithDebInfo) ;;
  # Unoptimised with assertions on: the invariants are checked, and it compiles in a third of
  # the time an optimised sanitizer build takes.
  sanitize) extra=(-DCMAKE_BUILD_TYPE=Debug -DBRINEWATCH_SANITIZE=ON -DBRINEWATCH_BENCH=OFF) ;;
  *) echo "build.sh: unknown build kind '$kind' (expected release or sanitize)" >&2; exit 2 ;;
esac
cmake -S "$top" -B "$top/build/$kind" -G Ninja "${extra[@]}" >/dev/null
cmake --build "$top/build/$kind" -j "$(nproc)"
echo "$top/build/$kind"
