#!/usr/bin/env bash
# Installs what tests/test_pyodide.py needs; safe to run again (it skips what is already there).
#
#   bash tests/pyodide/setup.sh            (PYTHON=... to use another Python than python3)
#
# 1. node_modules/: the npm package pyodide at the version package-lock.json pins (npm ci).
# 2. wheels/: the pure-Python wheels of cellchem's core dependencies (pint, pyparsing and what
#    they need) as pip resolves them for Pyodide's Python (3.13 in 0.29.3), within the floors pyproject.toml
#    sets; the test unpacks them into Pyodide's site-packages. cellchem itself is not downloaded:
#    the test builds its wheel from the checkout.
# 3. wheels/build/: the build backend (setuptools, from pyproject.toml's [build-system]), so the
#    test can build cellchem's wheel offline where the running Python's setuptools cannot.
# Needs the npm registry and a Python package index once; the test itself needs no network.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(cd "$here/../.." && pwd)"
python="${PYTHON:-python3}"

command -v node >/dev/null 2>&1 || { echo "setup.sh: node (Node.js 18 or later) is needed" >&2; exit 1; }
command -v npm >/dev/null 2>&1 || { echo "setup.sh: npm is needed" >&2; exit 1; }

pinned="$(node -e 'const l=require(process.argv[1]);console.log(l.packages["node_modules/pyodide"].version)' \
    "$here/package-lock.json")"
installed="$(node -e 'try{console.log(require(process.argv[1]).version)}catch(e){console.log("")}' \
    "$here/node_modules/pyodide/package.json")"
if [ "$installed" = "$pinned" ] && [ -f "$here/node_modules/pyodide/pyodide.asm.wasm" ]; then
    echo "pyodide $pinned: already installed"
else
    npm ci --prefix "$here" --no-audit --no-fund
fi

# the Python inside the pinned Pyodide, as its pyodide-lock.json states it (3.13 for 0.29.3)
pyodide_python="$(node -e \
    'console.log(require(process.argv[1]).info.python.split(".").slice(0, 2).join("."))' \
    "$here/node_modules/pyodide/pyodide-lock.json")"

# the dependency specifiers of pint and pyparsing, as pyproject.toml states them
mapfile -t requirements < <("$python" - "$root/pyproject.toml" <<'EOF'
import re
import sys
import tomllib

with open(sys.argv[1], "rb") as fh:
    project = tomllib.load(fh)
for spec in project["project"]["dependencies"]:
    if re.match(r"(pint|pyparsing)\b", spec, re.IGNORECASE):
        print(spec)
for spec in project["build-system"]["requires"]:
    print("build:" + spec)
EOF
)
runtime=()
backend=()
for r in "${requirements[@]}"; do
    case "$r" in
        build:*) backend+=("${r#build:}") ;;
        *) runtime+=("$r") ;;
    esac
done

download() {  # download DIR REQUIREMENT... : into a fresh directory, then swap it in
    local dir="$1"
    shift
    local fresh
    fresh="$(mktemp -d)"
    "$python" -m pip download --quiet --disable-pip-version-check --dest "$fresh" "$@"
    mkdir -p "$dir"
    find "$dir" -maxdepth 1 -name '*.whl' -delete
    mv "$fresh"/*.whl "$dir"/
    rmdir "$fresh"
}

if ls "$here"/wheels/pint-*.whl "$here"/wheels/pyparsing-*.whl >/dev/null 2>&1; then
    echo "wheels: already downloaded ($(cd "$here/wheels" && ls ./*.whl | wc -l) files); delete tests/pyodide/wheels to refresh"
else
    download "$here/wheels" --only-binary=:all: --platform any --implementation py --abi none \
        --python-version "$pyodide_python" "${runtime[@]}"
fi
if ls "$here"/wheels/build/setuptools-*.whl >/dev/null 2>&1; then
    echo "build backend: already downloaded"
else
    # setuptools 70.1 and later build wheels without the separate 'wheel' package
    download "$here/wheels/build" --only-binary=:all: --no-deps "${backend[@]}" "setuptools>=70.1"
fi
echo "ready: $(cd "$here/wheels" && ls ./*.whl | tr '\n' ' ')"
