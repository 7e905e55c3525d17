#!/usr/bin/env bash
# Quick start: install what is missing, build, and replay the built-in example site
# (an invented disposal facility) through the engine. Extra arguments go to `brinewatch demo`.
set -euo pipefail
top=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
bash "$top/packaging/install-deps.sh" build
build=$(bash "$top/packaging/build.sh" release | tail -n 1)
exec "$build/brinewatch" demo "$@"
