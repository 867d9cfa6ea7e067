#!/usr/bin/env bash
# The demo: the demo ship's tables, a check of every demo condition, the vessel data approved
# by a demo design office, a sheet for each condition, the sheets signed (prepared, checked)
# with demo identities and verified with the approval checked, and the package of every
# condition, signed and verified the same way. Everything goes to out/.
set -uo pipefail
cd "$(dirname "$0")/.."
RG=.venv/bin/reportgen
mkdir -p out

for hull in conditions/vessels/*-hull.yaml; do
  ship=${hull%-hull.yaml}.yaml
  # the demo cargo ship trims from 2 m by the head to 2.7 m by the stern: tables at trims
  case $(basename "$hull") in
    linnet-demo-hull.yaml) trims=(--trims=-3,-2,-1,0,1,2,3,4) ;;
    *) trims=() ;;
  esac
  echo "== Tables of a demo ship from its offsets ($hull)"
  $RG tables "$hull" -o "out/$(basename "$ship")" "${trims[@]}" --force || exit 1
  if cmp -s "out/$(basename "$ship")" "$ship"; then
    echo "   the tables reproduce the committed $ship byte for byte"
  else
    echo "   WARNING: the tables differ from the committed $ship"; exit 1
  fi
done
ship=conditions/vessels/linnet-demo.yaml  # the demo cargo ship: its package and limits below

echo "== Setting up a ship from a mesh (conditions/setup-example: the README's walk-through)"
ex=conditions/setup-example
$RG hull-from-mesh $ex/tern-hull.obj --vessel $ex/tern-head.yaml -o out/tern-hull.yaml --force \
    2>/dev/null || exit 1
$RG tables out/tern-hull.yaml -o out/tern.yaml --force 2>/dev/null || exit 1
$RG show out/tern.yaml > out/tern-show.txt || exit 1
$RG new out/tern.yaml -o out/tern-new-condition.yaml --force 2>/dev/null || exit 1
$RG check out/tern-new-condition.yaml > out/tern-new-condition.txt; [[ $? -le 1 ]] || exit 1
echo "   out/tern.yaml (offsets, tables, tank tables), out/tern-show.txt, out/tern-new-condition.yaml"

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

echo "== The tables against direct calculation on the hull (MSC.1/Circ.1229 tolerances)"
for c in conditions/*.yaml; do
  name=$(basename "$c" .yaml)
  $RG check "$c" --compare > "out/$name.compare.txt"; rc=$?
  if [[ $rc -eq 2 ]] || grep -q "BEYOND TOLERANCE" "out/$name.compare.txt"; then
    echo "   $name: the tables and the hull differ beyond tolerance (out/$name.compare.txt)"; exit 1
  fi
  printf '   %-40s every quantity within tolerance\n' "$name"
done

echo "== Demo identities (self-signed, invented names, not for real use)"
$RG keygen --name "Invented Design Office, stability section" -o out/ids/design-office --force > /dev/null || exit 1
$RG keygen --name "A. N. Other, chief officer (invented)" -o out/ids/prepared --force > /dev/null || exit 1
$RG keygen --name "B. N. Other, master (invented)" -o out/ids/checked --force > /dev/null || exit 1
echo "   out/ids/design-office, out/ids/prepared, out/ids/checked"

# The approval must lie beside the vessel file that the conditions name, and conditions/ is
# not written at demo time: the conditions and the vessel file are copied to out/work/ (the
# same layout, so every condition still finds its vessel) and the copy is approved there.
echo "== Vessel data approved by the demo design office"
rm -rf out/work && mkdir -p out/work/vessels
cp conditions/*.yaml out/work/
for hull in conditions/vessels/*-hull.yaml; do
  cp "${hull%-hull.yaml}.yaml" out/work/vessels/
done
for vessel in out/work/vessels/*.yaml; do
  $RG approve "$vessel" --key out/ids/design-office/key.pem --cert out/ids/design-office/cert.pem \
      2>/dev/null || exit 1
  echo "   $vessel.p7s (detached CMS signature of the vessel file's bytes)"
done

echo "== Sheets (with the vessel data approval embedded)"
for c in out/work/*.yaml; do
  name=$(basename "$c" .yaml)
  $RG sheet "$c" -o "out/$name.pdf" --force 2>/dev/null; rc=$?
  # status 1: written, the condition fails a criterion (intended only for fails-*)
  if [[ $rc -ne 0 && ! ( $rc -eq 1 && $name == fails-* ) ]]; then
    echo "   $name: sheet failed (exit status $rc)"; exit 1
  fi
  echo "   out/$name.pdf"
done

echo "== Signed sheets (prepared, then checked)"
for c in out/work/*.yaml; do
  name=$(basename "$c" .yaml)
  rm -f "out/$name.prepared.pdf" "out/$name.signed.pdf"
  $RG sign "out/$name.pdf" --role prepared --key out/ids/prepared/key.pem \
      --cert out/ids/prepared/cert.pem -o "out/$name.prepared.pdf" 2>/dev/null || exit 1
  $RG sign "out/$name.prepared.pdf" --role checked --key out/ids/checked/key.pem \
      --cert out/ids/checked/cert.pem -o "out/$name.signed.pdf" 2>/dev/null || exit 1
  rm -f "out/$name.prepared.pdf"
  echo "   out/$name.signed.pdf"
done

echo "== Package of every condition of the demo cargo ship (one document), signed (prepared, then checked)"
pkg=out/$(basename "$ship" .yaml)-package
rm -f "$pkg.pdf" "$pkg.prepared.pdf" "$pkg.signed.pdf"
mapfile -t cargo < <(grep -l "^vessel: vessels/$(basename "$ship")" out/work/*.yaml)
$RG package "${cargo[@]}" -o "$pkg.pdf" --title "Loading conditions of the demo ship (invented)" \
    2>/dev/null; rc=$?
# status 1: written, a condition fails a criterion (the fails-* condition, on purpose)
[[ $rc -le 1 ]] || { echo "   package failed (exit status $rc)"; exit 1; }
$RG sign "$pkg.pdf" --role prepared --key out/ids/prepared/key.pem \
    --cert out/ids/prepared/cert.pem -o "$pkg.prepared.pdf" 2>/dev/null || exit 1
$RG sign "$pkg.prepared.pdf" --role checked --key out/ids/checked/key.pem \
    --cert out/ids/checked/cert.pem -o "$pkg.signed.pdf" 2>/dev/null || exit 1
rm -f "$pkg.prepared.pdf"
echo "   $pkg.signed.pdf"

echo "== Verified: signatures trusted, pages and results recomputed, vessel data approved"
trust=(--trust out/ids/prepared/cert.pem --trust out/ids/checked/cert.pem
       --vessel-trust out/ids/design-office/cert.pem)
for c in out/work/*.yaml; do
  name=$(basename "$c" .yaml)
  vessel="out/work/$(sed -n 's/^vessel: *//p' "$c")"  # the vessel file the condition names
  $RG verify "out/$name.signed.pdf" "${trust[@]}" --vessel "$vessel" > "out/$name.verify.txt" \
    || { echo "   out/$name.signed.pdf: VERIFICATION FAILED (see out/$name.verify.txt)"; exit 1; }
  echo "   out/$name.signed.pdf: $(tail -n 1 "out/$name.verify.txt")"
done
$RG verify "$pkg.signed.pdf" "${trust[@]}" --vessel "out/work/vessels/$(basename "$ship")" \
  > "$pkg.verify.txt" \
  || { echo "   $pkg.signed.pdf: VERIFICATION FAILED (see $pkg.verify.txt)"; exit 1; }
echo "   $pkg.signed.pdf: $(tail -n 1 "$pkg.verify.txt")"
echo "   (full reports: out/*.verify.txt)"

echo "== KG margin of each demo condition (from its check summary)"
for c in conditions/*.yaml; do
  name=$(basename "$c" .yaml)
  printf '   %-40s %s\n' "$name" "$(grep -m1 '^KG margin' "out/$name.txt" | sed 's/^KG margin: //')"
done

echo "== Limiting KG curve of the demo ship (approved data embedded; signed by the demo design office, verified)"
approved_ship=out/work/vessels/$(basename "$ship")  # with its approval beside it
$RG limits "$approved_ship" > out/limits.txt || exit 1
# the booklet curve the demo ship carries (limiting_kg, criteria set booklet.limits) is the
# curve reportgen limits makes from its tables
while IFS= read -r line; do
  grep -qxF -- "$line" "$ship" \
    || { echo "   $ship: its limiting_kg differs from what reportgen limits makes: $line"; exit 1; }
done < <($RG limits "$ship" --booklet-block | grep -E '^  (displacement|kg): ')
$RG limits "$approved_ship" -o out/limits.pdf --force 2>/dev/null || exit 1
rm -f out/limits-signed.pdf
$RG sign out/limits.pdf --role prepared --key out/ids/design-office/key.pem \
    --cert out/ids/design-office/cert.pem -o out/limits-signed.pdf 2>/dev/null || exit 1
$RG verify out/limits-signed.pdf --trust out/ids/design-office/cert.pem \
    --vessel-trust out/ids/design-office/cert.pem --vessel "$ship" > out/limits.verify.txt \
  || { echo "   out/limits-signed.pdf: VERIFICATION FAILED (see out/limits.verify.txt)"; exit 1; }
echo "   out/limits.txt, out/limits.pdf, out/limits-signed.pdf (verified: out/limits.verify.txt);"
echo "   the booklet curve in $ship is the curve reportgen limits makes"
rm -rf out/limits-inputs
$RG extract out/limits-signed.pdf -o out/limits-inputs > /dev/null 2>&1 || exit 1
cmp -s "out/limits-inputs/$(basename "$ship")" "$ship" \
  && cmp -s "out/limits-inputs/$(basename "$ship").p7s" "$approved_ship.p7s" \
  || { echo "   out/limits-inputs: the extracted inputs differ from the vessel file and its approval"; exit 1; }
echo "   out/limits-inputs: the vessel file and its approval extracted from the signed limits"
