#!/usr/bin/env bash
# The demo: the demo ship's tables, a check of every demo condition, a sheet for each, and the
# sheets signed (prepared, checked) with demo identities and verified. Everything goes to out/.
set -uo pipefail
cd "$(dirname "$0")/.."
RG=.venv/bin/reportgen
mkdir -p out

hull=$(ls conditions/vessels/*-hull.yaml | head -n 1)
ship=${hull%-hull.yaml}.yaml
echo "== Tables of the demo ship from its offsets ($hull)"
$RG tables "$hull" -o "out/$(basename "$ship")" --force || exit 1
if cmp -s "out/$(basename "$ship")" "$ship"; then
  echo "   the tables reproduce the committed $ship byte for byte"
else
  echo "   WARNING: the tables differ from the committed $ship"; exit 1
fi

echo "== Check of each demo condition"
for c in conditions/*.yaml; do
  name=$(basename "$c" .yaml)
  $RG check "$c" > "out/$name.txt"; rc=$?
  case $rc in
    0) verdict="meets every criterion" ;;
    1) verdict="FAILS a criterion$( [[ $name == fails-* ]] && echo ' (as intended)')" ;;
    *) echo "   $name: bad input"; exit 1 ;;
  esac
  printf '   %-40s %s\n' "$name" "$verdict"
done

echo "== Sheets"
for c in conditions/*.yaml; do
  name=$(basename "$c" .yaml)
  $RG sheet "$c" -o "out/$name.pdf" --force 2>/dev/null || { echo "   $name: sheet failed"; exit 1; }
  echo "   out/$name.pdf"
done

echo "== Demo identities (self-signed, not for real use)"
$RG keygen --name "A. N. Other, chief officer (invented)" --out out/ids/prepared --force > /dev/null || exit 1
$RG keygen --name "B. N. Other, master (invented)" --out out/ids/checked --force > /dev/null || exit 1
echo "   out/ids/prepared, out/ids/checked"

echo "== Signed and verified sheets"
for c in conditions/*.yaml; do
  name=$(basename "$c" .yaml)
  $RG sign "out/$name.pdf" --role prepared --key out/ids/prepared/key.pem \
      --cert out/ids/prepared/cert.pem -o "out/$name.prepared.pdf" --force 2>/dev/null || exit 1
  $RG sign "out/$name.prepared.pdf" --role checked --key out/ids/checked/key.pem \
      --cert out/ids/checked/cert.pem -o "out/$name.signed.pdf" --force 2>/dev/null || exit 1
  rm -f "out/$name.prepared.pdf"
  if $RG verify "out/$name.signed.pdf" --pages --trust out/ids/prepared/cert.pem \
        --trust out/ids/checked/cert.pem > "out/$name.verify.txt"; then
    echo "   out/$name.signed.pdf: signatures intact and trusted; results and printed pages agree with a recomputation"
  else
    echo "   out/$name.signed.pdf: VERIFICATION FAILED (see out/$name.verify.txt)"; exit 1
  fi
done
