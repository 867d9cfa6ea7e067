#!/usr/bin/env bash
# Build reportgen's wheel, install it into a fresh environment and render a demo sheet from a
# folder outside the repository: what a user installing the package gets must work on its own
# (templates, fonts and schemas inside the wheel, nothing read from the checkout).
set -euo pipefail
cd "$(dirname "$0")/.."
repo=$PWD
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
.venv/bin/pip wheel --no-deps -q -w "$tmp/dist" . >/dev/null
python3 -m venv "$tmp/venv"
"$tmp/venv/bin/pip" install -q "$tmp"/dist/reportgen-*.whl > "$tmp/install.log" 2>&1 \
  || { tail -n 20 "$tmp/install.log"; exit 1; }
mkdir -p "$tmp/work/vessels"
cp "$repo"/conditions/*.yaml "$tmp/work/"
cp "$repo"/conditions/vessels/*.yaml "$tmp/work/vessels/"
cd "$tmp/work"
"$tmp/venv/bin/reportgen" -V
"$tmp/venv/bin/reportgen" sheet ballast-departure.yaml -o ballast-departure.pdf
"$tmp/venv/bin/reportgen" schema condition > /dev/null
"$tmp/venv/bin/python" -c "import pypdf, sys; r = pypdf.PdfReader('ballast-departure.pdf'); \
sys.exit(0 if len(r.pages) >= 1 and 'results.json' in r.attachments else 1)"
echo "wheel: installed outside the repository and rendered a sheet"
