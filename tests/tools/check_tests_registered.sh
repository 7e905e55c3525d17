#!/usr/bin/env bash
# Fails when a *_test.cpp file under tests/ is not named in the CMakeLists.txt of its folder,
# either in full or by its stem in a foreach list (name_test.cpp -> "name"), so a test that
# never builds cannot hide.
set -euo pipefail
tests_dir=${1:?usage: check_tests_registered.sh TESTS_DIR}
missing=0
checked=0
while IFS= read -r file; do
  name=$(basename "$file")
  stem=${name%_test.cpp}
  lists="$(dirname "$file")/CMakeLists.txt"
  checked=$((checked + 1))
  if ! grep -qsw -e "$name" -e "${name%.cpp}" -e "$stem" "$lists"; then
    echo "not registered in its CMakeLists.txt: ${file#"$tests_dir"/}"
    missing=$((missing + 1))
  fi
done < <(find "$tests_dir" -name '*_test.cpp' | sort)
echo "$checked test files checked, $missing not registered"
[[ $checked -gt 0 && $missing -eq 0 ]]
