#!/usr/bin/env bash
# Runs every test: installs what is missing (Debian packages), builds brinewatch twice
# (optimised, and with AddressSanitizer + UndefinedBehaviorSanitizer), and runs the whole
# CTest suite in both builds. Reference checks that call R or Python must find them here.
set -euo pipefail
top=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
bash "$top/packaging/install-deps.sh" test
export BRINEWATCH_REQUIRE_REFERENCE_TOOLS=1
jobs=$(nproc)

for kind in release sanitize; do
  echo "== build ($kind)"
  build=$(bash "$top/packaging/build.sh" "$kind" | tail -n 1)
  echo "== tests ($kind)"
  ctest --test-dir "$build" --output-on-failure -j "$jobs"
done
