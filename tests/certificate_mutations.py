#!/usr/bin/env python3
"""Systematic mutations of real certificates: every one must be rejected.

Loads the committed certificates (results/default, results/scan_t6-10_M8/examples,
fuzz/corpus/certificate; the format is docs/certificate-format.md), checks that each
unedited one is accepted, then applies to each a systematic list of edits:

  * every integer field: +1, -1, -1 as a value, 2^62, 10^30 (beyond 64 bits), as a
    string, as a float, null, true;
  * every string field: rationals with numerator/denominator +-1, non-canonical
    spellings (2p/2q, p/1, leading space, leading zero, decimal point), natural
    numbers +-1, dyadic balls with the exponent +-1 (value doubled/halved), the
    radius widened by 2^30 or set to zero, the mantissa +-2 (one unit: still a true
    claim, so only tried without recomputing the digest), huge exponents
    (2^(+-10^9)), a 30000-digit mantissa, an even mantissa; any string set to "" or
    to an integer; enumerated strings (verdict, route, family, format, weight, command,
    theorem ids) replaced by another value;
  * every object: each key deleted, an unknown key added, a duplicated key (in the
    text), swapped sibling values of the same JSON type;
  * every array: an element deleted, duplicated, two elements swapped, an extra element;
  * whole-text edits: a floating-point number, nesting, truncation, trailing data.

Each edit of the parsed document is tried twice: with the digest left as it was
(so the digest must catch it) and with the digest recomputed by the rule of
docs/certificate-format.md §2 (so a check of the content must catch it). A mutation
that leaves the document unchanged is skipped.

Every run of `circlet verify` must exit 1 (a claim or the digest fails) or 2 (the
file is not a well-formed certificate); an edit of the format (unknown, missing or
duplicate field, wrong type, non-canonical spelling, out-of-range value, float) must
exit exactly 2 and name the field's JSON pointer. Exit 0 (accepted), 3 (internal
error), a signal (abort, segfault) or a run over 10 s fail the test. If
checker/circlet_check.py exists (the independent checker), it is run on every
mutation too and must reject it (non-zero exit, no Python traceback), and accept
every unedited certificate.

With --proofs the same edits are applied to the proof certificates of `circlet prove`
(results/proofs, a sample of results/congruences/certificates): verify must exit 1 or 2
and name the top-level field it found changed, checker/proof_check.py must reject.

Usage: tests/certificate_mutations.py [--circlet BUILD/circlet] [--jobs 2] [--limit N] [--pycheck FILE] [--proofs]
Exit status 0 when every mutation was rejected as required.
Uses the standard library only.
"""
import argparse
import copy
import glob
import hashlib
import json
import os
import subprocess
import sys
import tempfile
from concurrent.futures import ThreadPoolExecutor

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
TIMEOUT = 10.0


def digest(cert):
    body = {k: v for k, v in cert.items() if k != "digest"}
    text = json.dumps(body, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return "sha256:" + hashlib.sha256(text.encode("utf-8")).hexdigest()


def pointer(path):
    return "".join("/" + str(p).replace("~", "~0").replace("/", "~1") for p in path)


def get(doc, path):
    for p in path:
        doc = doc[p]
    return doc


def leaves(doc, path=()):
    """(path, value) for every node, depth first."""
    yield path, doc
    if isinstance(doc, dict):
        for k in sorted(doc):
            yield from leaves(doc[k], path + (k,))
    elif isinstance(doc, list):
        for i, v in enumerate(doc):
            yield from leaves(v, path + (i,))


def is_rat(s):
    if "/" in s:
        p, q = s.split("/", 1)
        return p.isdigit() and q.isdigit()
    return s.isdigit()


def is_dyadic(s):
    return "*2^" in s


def string_edits(s, key, mid=None):
    """(label, new value, is_format_edit) for a string field."""
    # provenance.command is any string as far as the format goes: only its value is checked.
    out = [("empty string", "", key != "command"), ("as an integer", 7, True)]
    if is_dyadic(s):
        m, e = s.split("*2^")
        mi, ei = int(m), int(e)
        if mi != 0 and key == "mid":
            out.append(("exponent + 1 (value doubled)", "%d*2^%d" % (mi, ei + 1), False))
            out.append(("exponent - 1 (value halved)", "%d*2^%d" % (mi, ei - 1), False))
        if mi != 0:
            out.append(("mantissa even", "%d*2^%d" % (mi * 2, ei), True))
            out.append(("mantissa + 2 (one unit)", "%d*2^%d" % (mi + 2, ei), "digest-only"))
        if key == "rad":
            if mi != 0:
                # A radius halved or doubled is still a true and tight claim: certify widens every
                # ball by 2^(-P/2) beyond its computed radius, and verify recomputes at P + 64 bits.
                out.append(("radius doubled", "%d*2^%d" % (mi, ei + 1), "digest-only"))
                out.append(("radius halved", "%d*2^%d" % (mi, ei - 1), "digest-only"))
                out.append(("radius widened 2^30", "%d*2^%d" % (mi, ei + 30), False))
            # {2^e} is a true claim when the exact value is a power of two (1 for identical
            # sequences or A = A2, 4 = 2^{w-1} for A/A2 = 2, w = 3): only the digest can object.
            exact = isinstance(mid, str) and mid.startswith("1*2^")
            out.append(("radius zero", "0*2^0", "digest-only" if exact else False))
            out.append(("radius negative", "-1*2^0", True))
        else:
            out.append(("midpoint negated", "%d*2^%d" % (-mi, ei), False) if mi else ("midpoint 1", "1*2^0", False))
        out.append(("huge exponent", "1*2^1000000000", True))
        out.append(("tiny exponent", "1*2^-1000000000", True))
        out.append(("30000-digit mantissa", "1" * 29999 + "3*2^0", True))
        out.append(("decimal", "1.5", True))
        out.append(("spaces", "1 * 2^0", True))
        return out
    if is_rat(s):
        if "/" in s:
            p, q = (int(x) for x in s.split("/"))
            out.append(("numerator + 1", "%d/%d" % (p + 1, q), False))
            if p > 1:
                out.append(("numerator - 1", "%d/%d" % (p - 1, q), False))
            out.append(("denominator + 1", "%d/%d" % (p, q + 1), False))
            out.append(("not in lowest terms", "%d/%d" % (2 * p, 2 * q), True))
            out.append(("decimal point", "%.6f" % (p / q), True))
        else:
            p = int(s)
            out.append(("+ 1", str(p + 1), False))
            if p > 0:
                out.append(("- 1", str(p - 1), False))
            out.append(("over 1", "%d/1" % p, True))
            out.append(("leading zero", "0" + s, True))
            out.append(("negative", "-" + s, True))
        out.append(("leading space", " " + s, True))
        out.append(("as a JSON number", int(s.split("/")[0]), True))
        return out
    enums = {
        "verdict": ["NON-CONVERGENT", "CONSTANT", "UNDECIDED", "non-convergent"],
        "route": ["bound", "proportional", "exact"],
        "constant_route": ["identical", "proportional", "other"],
        "format": ["circlet-certificate/1", "circlet-certificate/3"],
        "program": ["circlet2"],
        "version": ["0.0.1"],
        "weight": ["5/2", "3", "4", "7/2", "10/4"],
        "F": ["c5", "c6", "sc11", "c06", "C6"],
        "G": ["sc11", "sc13", "c6", "sc011"],
    }
    for v in enums.get(key, []):
        if v != s:
            out.append(("another value " + v, v, False))
    if key == "command":
        out.append(("command edited", s.replace("--prec", "--prec 1 --prec"), False))
        out.append(("command with -o", s + " -o x.json", False))
    if key == "date":
        out.append(("impossible date", "2026-02-30T00:00:00Z", True))
        out.append(("date without Z", s[:-1], True))
        out.append(("date changed", s.replace(s[:4], "1999"), "digest-only"))
    if key == "digest":
        out.append(("upper-case digest", s.upper().replace("SHA256:", "sha256:"), True))
        out.append(("digest of nothing", "sha256:" + "0" * 64, False))
    if s in ("siegel-eisenstein", "cusp-bound", "local-densities"):
        out.append(("unknown theorem", "riemann-hypothesis", True))
        for v in ("siegel-eisenstein", "cusp-bound", "local-densities"):
            if v != s:
                out.append(("another theorem " + v, v, False))
    return out


def int_edits(v):
    out = [("+ 1", v + 1, False), ("as a string", str(v), True), ("as a float", float(v), True),
           ("null", None, True), ("true", True, True), ("2^62", 2 ** 62, True), ("10^30", 10 ** 30, True),
           ("-1", -1, True)]
    if v > 0:
        out.append(("- 1", v - 1, False))
    return out


def mutations(cert):
    """Yield (label, pointer, kind, payload): payload is a document or, for text edits, a string.
    kind: 'claim' (exit 1 or 2), 'format' (exit 2, message names pointer), 'digest-only'."""
    for path, v in list(leaves(cert)):
        ptr = pointer(path)
        key = path[-1] if path else None
        if isinstance(v, bool):
            yield "flip", ptr, "claim", set_at(cert, path, not v)
            yield "as integer", ptr, "format", set_at(cert, path, 1)
        elif isinstance(v, int):
            for label, nv, fmt in int_edits(v):
                yield label, ptr, "format" if fmt else "claim", set_at(cert, path, nv)
        elif isinstance(v, str):
            sibling_mid = get(cert, path[:-1]).get("mid") if key == "rad" else None
            for label, nv, fmt in string_edits(v, key if isinstance(key, str) else "", sibling_mid):
                kind = "digest-only" if fmt == "digest-only" else ("format" if fmt else "claim")
                yield label, ptr, kind, set_at(cert, path, nv)
        elif v is None:
            yield "null to string", ptr, "format", set_at(cert, path, "1")
        elif isinstance(v, dict):
            for k in sorted(v):
                d = copy.deepcopy(cert)
                del get(d, path)[k]
                yield "delete key " + k, ptr, "format", d
            d = copy.deepcopy(cert)
            get(d, path)["zz_unknown"] = 1
            yield "unknown key", ptr, "format", d
            keys = sorted(v)
            for i in range(len(keys)):
                for j in range(i + 1, len(keys)):
                    a, b = v[keys[i]], v[keys[j]]
                    if type(a) == type(b) and a != b:
                        d = copy.deepcopy(cert)
                        get(d, path)[keys[i]], get(d, path)[keys[j]] = b, a
                        yield "swap %s and %s" % (keys[i], keys[j]), ptr, "claim", d
            if path:
                yield "object as string", ptr, "format", set_at(cert, path, "x")
        elif isinstance(v, list):
            if v:
                d = copy.deepcopy(cert)
                del get(d, path)[0]
                yield "delete first element", ptr, "claim", d
                d = copy.deepcopy(cert)
                get(d, path).append(copy.deepcopy(v[-1]))
                yield "duplicate last element", ptr, "claim", d
                if len(v) > 1 and v[0] != v[1]:
                    d = copy.deepcopy(cert)
                    arr = get(d, path)
                    arr[0], arr[1] = arr[1], arr[0]
                    yield "swap first two elements", ptr, "claim", d
            d = copy.deepcopy(cert)
            get(d, path).append("extra")
            yield "extra element", ptr, "claim", d
            yield "array as object", ptr, "format", set_at(cert, path, {})


def set_at(cert, path, value):
    d = copy.deepcopy(cert)
    if not path:
        return value
    get(d, path[:-1])[path[-1]] = value
    return d


def text_mutations(cert):
    """Edits of the text itself: duplicate keys at every object, floats, nesting."""
    out = []
    base = json.dumps(cert, indent=1, sort_keys=True)
    for path, v in leaves(cert):
        if isinstance(v, dict) and v:
            k = sorted(v)[0]
            # The same object with its first key repeated (the first value first: a reader that
            # takes the last would see the same, so only duplicate detection rejects it).
            obj = json.dumps(v, sort_keys=True)
            dup = "{" + json.dumps(k) + ":" + json.dumps(v[k]) + "," + obj[1:]
            d = copy.deepcopy(cert)
            marker = "@@DUP@@"
            if path:
                get(d, path[:-1])[path[-1]] = marker
                text = json.dumps(d, sort_keys=True).replace(json.dumps(marker), dup)
            else:
                text = dup
            out.append(("duplicate key " + k, pointer(path + (k,)), text))
    if "precision_bits" in cert:
        out.append(("float precision_bits", "/precision_bits", base.replace('"precision_bits": %d' % cert["precision_bits"],
                                                                             '"precision_bits": %d.0' % cert["precision_bits"])))
    if "Q_max" in cert:
        out.append(("exponent-notation Q_max", "/Q_max", base.replace('"Q_max": %d' % cert["Q_max"], '"Q_max": 4.7e1')))
    if "checked" in cert:  # a proof certificate
        n_to = cert["checked"]["n_to"]
        out.append(("float n_to", "/checked/n_to", base.replace('"n_to": %d' % n_to, '"n_to": %d.0' % n_to)))
    out.append(("deep nesting", "", "[" * 100000 + "]" * 100000))
    out.append(("truncated", "", base[: len(base) // 2]))
    out.append(("trailing data", "", base + "\n{}"))
    out.append(("empty", "", ""))
    out.append(("not UTF-8", "", base.replace('"format"', '"form\xff"').encode("latin-1", "replace").decode("latin-1")))
    return out


def run(cmd, text, tmpdir, idx):
    path = os.path.join(tmpdir, "m%06d.json" % idx)
    with open(path, "w", encoding="utf-8", errors="surrogateescape") as f:
        f.write(text)
    try:
        p = subprocess.run(cmd + [path], stdout=subprocess.PIPE, stderr=subprocess.PIPE, timeout=TIMEOUT)
        rc, err = p.returncode, (p.stdout + p.stderr).decode("utf-8", "replace")
    except subprocess.TimeoutExpired:
        rc, err = "timeout", ""
    os.remove(path)
    return rc, err


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--circlet", default=os.environ.get("CIRCLET", os.path.join(ROOT, "build", "circlet")))
    ap.add_argument("--jobs", type=int, default=2)
    ap.add_argument("--limit", type=int, default=0, help="at most this many mutations per certificate (0: all)")
    ap.add_argument("--stride", type=int, default=1,
                    help="keep every STRIDE-th mutation of each certificate, spread over all its fields (1: all)")
    ap.add_argument("--pycheck", default=None,
                    help="the independent checker, run too when the file exists (default: checker/circlet_check.py, "
                         "or checker/proof_check.py with --proofs)")
    ap.add_argument("--proofs", action="store_true",
                    help="mutate the proof certificates of `circlet prove` (results/proofs and a sample of "
                         "results/congruences/certificates) instead of the certificates of `circlet certify`")
    args = ap.parse_args()
    if args.pycheck is None:
        args.pycheck = os.path.join(ROOT, "checker", "proof_check.py" if args.proofs else "circlet_check.py")
    if args.proofs:
        # Every committed proof, and from the congruence search one certificate of each kind
        # (a vanishing, a congruence mod a prime, mod a prime power; c_t and sc_t).
        cong = os.path.join(ROOT, "results", "congruences", "certificates")
        files = sorted(glob.glob(os.path.join(ROOT, "results", "proofs", "*.json")) +
                       [os.path.join(cong, f) for f in ("sc3_47n+44_zero.json", "c11_11n+6_mod11^1.json",
                                                        "c10_25n+24_mod5^2.json", "c2_23n+12_zero.json")])
    else:
        files = sorted(set(glob.glob(os.path.join(ROOT, "results", "default", "cert_*.json")) +
                           glob.glob(os.path.join(ROOT, "results", "scan_t6-10_M8", "examples", "cert_*.json")) +
                           glob.glob(os.path.join(ROOT, "fuzz", "corpus", "certificate", "cert_*.json"))))
    # One certificate per distinct content (the same pair certified twice differs only in the date).
    certs, seen = [], set()
    for f in files:
        with open(f, encoding="utf-8") as fh:
            c = json.load(fh)
        key = json.dumps({k: v for k, v in c.items() if k not in ("digest", "provenance")}, sort_keys=True)
        if key not in seen:
            seen.add(key)
            certs.append((os.path.relpath(f, ROOT), c))
    checkers = [("circlet verify", [args.circlet, "verify"])]
    py = args.pycheck
    if os.path.exists(py):
        checkers.append((os.path.relpath(py, ROOT), [sys.executable, py]))
    failures, total = [], 0
    with tempfile.TemporaryDirectory(prefix="circlet_mut_") as tmp:
        jobs = []
        for name, cert in certs:
            text = json.dumps(cert, indent=2, sort_keys=True)
            jobs.append((name, "unedited", "", "accept", text))
            n = 0
            for i, (label, ptr, kind, doc) in enumerate(mutations(cert)):
                if doc == cert or i % max(1, args.stride) != 0:
                    continue
                variants = [("digest kept", doc)]
                if kind != "digest-only" and isinstance(doc, dict) and "digest" in doc and ptr != "/digest":
                    d2 = copy.deepcopy(doc)
                    d2["digest"] = digest(d2)
                    if d2 != cert:
                        variants.append(("digest recomputed", d2))
                for vlabel, d in variants:
                    jobs.append((name, "%s %s (%s)" % (ptr or "/", label, vlabel), ptr,
                                 "claim" if kind == "digest-only" else kind, json.dumps(d, indent=1, sort_keys=True)))
                    n += 1
                if args.limit and n >= args.limit:
                    break
            for label, ptr, text in text_mutations(cert):
                jobs.append((name, "text: " + label, ptr, "format", text))
        with ThreadPoolExecutor(max_workers=max(1, args.jobs)) as pool:
            futures = []
            for i, job in enumerate(jobs):
                for cname, cmd in checkers:
                    futures.append((job, cname, pool.submit(run, cmd, job[4], tmp, len(futures))))
            for (name, label, ptr, kind, _), cname, fut in futures:
                rc, out = fut.result()
                total += 1
                why = None
                if rc == "timeout":
                    why = "no answer within %g s" % TIMEOUT
                elif cname == "circlet verify":
                    if kind == "accept":
                        why = None if rc == 0 else "unedited certificate not accepted (exit %s)" % rc
                    elif rc == 0:
                        why = "ACCEPTED"
                    elif rc not in (1, 2):
                        why = "exit %s (crash or internal error)" % rc
                    elif args.proofs:
                        # A proof certificate's fields are compared whole with a recomputation
                        # (docs/proof-certificate-format.md): the message names the top-level field.
                        top = "/" + ptr.split("/")[1] if ptr.count("/") >= 1 and ptr != "/" else ""
                        named = top in out or ("digest kept" in label and "/digest" in out)
                        if kind == "format" and top and not named and rc != 2:
                            why = "message does not name %s: %s" % (top, out.strip()[:200])
                    elif kind == "format" and rc != 2:
                        why = "a format edit must exit 2, got %s" % rc
                    elif kind == "format" and ptr and ptr not in out:
                        why = "message does not name %s: %s" % (ptr, out.strip()[:200])
                else:
                    if "Traceback" in out:
                        why = "Python traceback"
                    elif kind == "accept":
                        why = None if rc == 0 else "unedited certificate not accepted (exit %s)" % rc
                    elif rc == 0:
                        why = "ACCEPTED"
                if why:
                    failures.append("%s: %s: %s: %s" % (cname, name, label, why))
    for f in failures[:200]:
        print("FAIL", f)
    print("certificate mutations: %d runs over %d certificates (%s), %d failures"
          % (total, len(certs), ", ".join(c for c, _ in checkers), len(failures)))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
