#!/usr/bin/env bash
# Runs the two certificate checkers -- `circlet verify` (C++) and
# checker/circlet_check.py (Python, shares no code) -- over
#   1. every certificate committed under results/ (files cert_*.json),
#   2. every file of fuzz/corpus/certificate/ (cert_*.json must be accepted,
#      every other file there is malformed and must be rejected by both),
#   3. a seeded random sample of certificates from a fresh small scan
#      (`circlet scan` writes verdicts; each sampled pair is re-certified
#      with `circlet certify`);
#   4. every proof certificate committed under results/ (`circlet verify` and
#      checker/proof_check.py), and fresh proofs of a seeded sample of the
#      committed congruences and of their perturbations (B + 1).
# A file fails when the two checkers disagree (accepted vs rejected) or when
# an expectation above is not met.  Closing line: "N passed, M failed".
#
# Environment: CIRCLET (default build/circlet), SEED (default: from the clock,
# printed), SAMPLE (default 20), PYTHON (default /usr/bin/python3).
set -u
cd "$(dirname "$0")/.."
CIRCLET=${CIRCLET:-build/circlet}
PYTHON=${PYTHON:-/usr/bin/python3}
SAMPLE=${SAMPLE:-20}
SEED=${SEED:-$(date +%s)}
CHECK=checker/circlet_check.py
[ -x "$CIRCLET" ] || { echo "independent-check: $CIRCLET not built" >&2; exit 2; }

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
passed=0
failed=0

# one file: $1 = path, $2 = expectation (accept | reject | agree)
check_one() {
  local f=$1 want=$2 c p cout pout
  cout=$("$CIRCLET" verify "$f" 2>&1); c=$?
  pout=$(timeout 300 "$PYTHON" "$CHECK" "$f" 2>&1); p=$?
  local cv=rejected pv=rejected
  [ $c -eq 0 ] && cv=accepted
  [ $p -eq 0 ] && pv=accepted
  if [ $p -gt 2 ]; then pv="crashed($p)"; fi
  local ok=1
  [ "$cv" = "$pv" ] || ok=0
  [ "$want" = accept ] && [ "$pv" != accepted ] && ok=0
  [ "$want" = reject ] && [ "$pv" != rejected ] && ok=0
  if [ $ok -eq 1 ]; then
    passed=$((passed + 1))
    echo "PASS $f: both $cv"
  else
    failed=$((failed + 1))
    echo "FAIL $f (expected $want): circlet verify $cv, circlet_check.py $pv"
    echo "     verify: $(echo "$cout" | tail -n 1)"
    echo "     python: $(echo "$pout" | tail -n 1)"
  fi
}

echo "== certificates committed under results/"
while IFS= read -r f; do check_one "$f" accept; done \
  < <(find results -name 'cert_*.json' | sort)

echo "== fuzz/corpus/certificate/"
for f in fuzz/corpus/certificate/*; do
  case $(basename "$f") in
    cert_*.json) check_one "$f" accept ;;
    *) check_one "$f" reject ;;
  esac
done

echo "== a fresh scan, random sample of $SAMPLE certificates, seed $SEED"
if ! "$CIRCLET" scan --t 6..8 --modulus 3 -o "$tmp/scan" > "$tmp/scan.log" 2>&1; then
  echo "FAIL circlet scan: $(tail -n 1 "$tmp/scan.log")"
  failed=$((failed + 1))
else
  # The scan's results database (DIR/scan.db, table pairs); each certificate is
  # re-derived by `certify` at the precision that decided the row.
  if ! "$PYTHON" - "$tmp/scan/scan.db" "$SEED" "$SAMPLE" > "$tmp/pairs" <<'EOF'
import random, sqlite3, sys
con = sqlite3.connect(sys.argv[1])
rows = con.execute("SELECT F, G, A, B, A2, B2, coalesce(prec, 128) FROM pairs ORDER BY job").fetchall()
if not rows:
    sys.exit("the scan database has no pairs")
rng = random.Random(int(sys.argv[2]))
for F, G, A, B, A2, B2, prec in rng.sample(rows, min(int(sys.argv[3]), len(rows))):
    print(F, G, "%d,%d" % (A, B), "%d,%d" % (A2, B2), prec)
EOF
  then
    echo "FAIL reading the scan database $tmp/scan/scan.db"
    failed=$((failed + 1))
  fi
  i=0
  while read -r F G ap ap2 prec; do
    i=$((i + 1))
    out="$tmp/cert_${F}_${ap/,/_}__${G}_${ap2/,/_}.json"
    if "$CIRCLET" certify "$F" "$G" --ap "$ap" --ap2 "$ap2" --prec "$prec" -o "$out" > "$tmp/certify.log" 2>&1; then
      check_one "$out" agree
    else
      failed=$((failed + 1))
      echo "FAIL circlet certify $F $G --ap $ap --ap2 $ap2 --prec $prec: $(tail -n 1 "$tmp/certify.log")"
    fi
  done < "$tmp/pairs"
fi

echo "== proof certificates (circlet prove, circlet congruences): circlet verify and checker/proof_check.py"
# Every committed proof certificate: verify one by one, the Python checker in one run
# (it computes each family's series once).
proofs=()
for f in results/proofs/*.json results/congruences/certificates/*.json; do
  [ -e "$f" ] && proofs+=("$f")
done
for f in "${proofs[@]}"; do
  if "$CIRCLET" verify "$f" > "$tmp/proof.log" 2>&1; then
    passed=$((passed + 1))
  else
    failed=$((failed + 1))
    echo "FAIL circlet verify $f: $(tail -n 1 "$tmp/proof.log")"
  fi
done
if pout=$(timeout 900 "$PYTHON" checker/proof_check.py "${proofs[@]}" 2>&1); then
  passed=$((passed + 1))
  echo "proof_check.py: ${#proofs[@]} committed proof certificates accepted"
else
  failed=$((failed + 1))
  echo "FAIL proof_check.py over the committed proof certificates: $(echo "$pout" | tail -n 3)"
fi
# Fresh proofs: a seeded sample of the committed congruences, each proved again and with
# its residue B moved by one (usually REFUTED: exercises the counterexample path); both
# checkers must accept each fresh certificate, whatever its verdict.
awk -F, 'NR > 2 { gsub(/"/, "", $6); print $6 }' results/congruences/congruences.csv |
  shuf -n 4 --random-source=<(yes "$SEED") > "$tmp/relations"
i=0
while IFS= read -r rel; do
  moved=$(echo "$rel" | "$PYTHON" -c 'import re,sys; r=sys.stdin.read().strip(); print(re.sub(r"\((\d+)n\+?(\d*)\)", lambda m: "(%sn+%d)" % (m.group(1), int(m.group(2) or 0) + 1), r, count=1))')
  for r in "$rel" "$moved"; do
    i=$((i + 1))
    "$CIRCLET" prove "$r" -o "$tmp/fresh_$i.json" > "$tmp/prove.log" 2>&1
    if [ ! -s "$tmp/fresh_$i.json" ]; then
      failed=$((failed + 1)); echo "FAIL circlet prove '$r' wrote no certificate: $(tail -n 1 "$tmp/prove.log")"; continue
    fi
    verdict=$(grep -oE '^(PROVED|REFUTED|UNKNOWN)' "$tmp/prove.log" | head -n 1)
    c=0; "$CIRCLET" verify "$tmp/fresh_$i.json" > /dev/null 2>&1 || c=$?
    p=0; pout=$(timeout 300 "$PYTHON" checker/proof_check.py "$tmp/fresh_$i.json" 2>&1) || p=$?
    if [ $c -eq 0 ] && [ $p -eq 0 ]; then
      passed=$((passed + 1)); echo "ok   fresh $verdict: $r"
    else
      failed=$((failed + 1)); echo "FAIL fresh $verdict '$r': verify exit $c, proof_check.py exit $p: $pout"
    fi
  done
done < "$tmp/relations"

echo "seed $SEED"
echo "$passed passed, $failed failed"
[ $failed -eq 0 ]
