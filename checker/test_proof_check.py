#!/usr/bin/python3
"""Tests of checker/proof_check.py (stdlib unittest).

Run: python3 -m unittest discover -s checker -p 'test_proof*.py'
Outside references: OEIS A045831 (4-cores) and A068908 (p(n) mod 5), terms read on
oeis.org pages; PARI/GP (numbpart, eta series, mffrometaquo/mfparams), skipped when
`gp` is absent; direct enumeration of partitions with their hook lengths (common
practice) and of lattice points for sums of squares.
"""
import contextlib
import copy
import glob
import io
import json
import os
import shutil
import subprocess
import sys
import tempfile
import time
import unittest

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, HERE)
import proof_check as pc  # noqa: E402

CHECKER = os.path.join(HERE, "proof_check.py")
PROOFS = os.path.join(ROOT, "results", "proofs")
CONGR = os.path.join(ROOT, "results", "congruences", "certificates")
GP = shutil.which("gp")


def load(path):
    with open(path) as fh:
        return json.load(fh)


def run_quiet(argv):
    out = io.StringIO()
    with contextlib.redirect_stdout(out):
        code = pc.run(argv)
    return code, out.getvalue()


def gp(expr):
    r = subprocess.run([GP, "-q", "-f", "--default", "parisizemax=200000000"], input=expr + "\n",
                       capture_output=True, text=True, timeout=120)
    return r.stdout.strip()


def partitions(n, most=None):
    most = n if most is None else most
    if n == 0:
        yield []
        return
    for k in range(min(n, most), 0, -1):
        for rest in partitions(n - k, k):
            yield [k] + rest


def hooks(lam):
    conj = [sum(1 for x in lam if x > j) for j in range(lam[0])] if lam else []
    return [lam[i] - j - 1 + conj[j] - i - 1 + 1 for i in range(len(lam)) for j in range(lam[i])]


def kron(D, n):
    """Kronecker symbol (D/n), n >= 1 (common practice: Jacobi symbol with the 2-part rule)."""
    r = 1
    while n % 2 == 0:
        n //= 2
        if D % 2 == 0:
            return 0
        r *= 1 if D % 8 in (1, 7) else -1
    a, m = D % n if n > 1 else 0, n
    while m > 1:
        if a == 0:
            return 0
        while a % 2 == 0:
            a //= 2
            if m % 8 in (3, 5):
                r = -r
        a, m = m, a
        if a % 4 == 3 and m % 4 == 3:
            r = -r
        a %= m
    return r


def conjugate(lam):
    return [sum(1 for x in lam if x > j) for j in range(lam[0])] if lam else []


class Committed(unittest.TestCase):
    def test_every_committed_certificate_in_one_invocation(self):
        files = sorted(glob.glob(os.path.join(PROOFS, "*.json")) + glob.glob(os.path.join(CONGR, "*.json")))
        self.assertEqual(len(files), 1154)  # 15 proofs + 1139 congruence certificates
        r = subprocess.run([sys.executable, CHECKER] + files, capture_output=True, text=True, timeout=600)
        self.assertEqual(r.returncode, 0, r.stdout[-2000:] + r.stderr[-2000:])
        self.assertEqual(r.stdout.strip(), "accepted")
        self.assertEqual(r.stderr, "")

    def test_small_certificate_fast(self):
        t = time.time()
        r = subprocess.run([sys.executable, CHECKER, os.path.join(PROOFS, "gks_c5.json")],
                           capture_output=True, text=True, timeout=60)
        self.assertEqual((r.returncode, r.stdout.strip()), (0, "accepted"))
        self.assertLess(time.time() - t, 1.0)

    def test_digest_rule_matches_files(self):
        for f in glob.glob(os.path.join(PROOFS, "*.json")):
            c = load(f)
            self.assertEqual(pc.digest_of(c), c["digest"], f)


class Counts(unittest.TestCase):
    def test_cores_vs_hook_lengths(self):
        # an independent route: enumerate partitions, test hook lengths (common practice)
        N = 18
        parts = {n: list(partitions(n)) for n in range(N + 1)}
        for t in range(2, 9):
            c = pc.family_series("c", t, N)
            sc = pc.family_series("sc", t, N)
            for n in range(N + 1):
                cores = [l for l in parts[n] if all(h % t for h in hooks(l))]
                self.assertEqual(c[n], len(cores), (t, n))
                self.assertEqual(sc[n], sum(1 for l in cores if conjugate(l) == l), (t, n))

    def test_four_cores_oeis_A045831(self):
        # OEIS A045831, number of 4-core partitions of n, first terms as shown on oeis.org
        a = [1, 1, 2, 3, 1, 3, 3, 3, 4, 4, 2, 2, 7, 3, 5, 6, 2, 4, 7, 3, 4, 7, 5, 8, 5, 4, 4, 8, 5, 6,
             7, 2, 9, 11, 3, 8, 9, 4, 6, 5, 7, 5, 14, 7, 4, 10, 5, 10, 11, 3, 9, 10, 5, 8, 10, 4, 6, 15]
        self.assertEqual(pc.family_series("c", 4, len(a) - 1), a)

    def test_partitions_mod5_oeis_A068908(self):
        # c_t(n) = p(n) for n < t; OEIS A068908 (p(n) mod 5), terms as shown on oeis.org
        a = [1, 1, 2, 3, 0, 2, 1, 0, 2, 0, 2, 1, 2, 1, 0, 1, 1, 2, 0, 0, 2, 2, 2, 0, 0, 3, 1, 0, 3, 0,
             4, 2, 4, 3, 0, 3, 2, 2, 0, 0, 3, 3, 4, 1, 0, 4, 3, 4, 3, 0]
        c = pc.family_series("c", 200, len(a) - 1)
        self.assertEqual([x % 5 for x in c], a)

    def test_sums_of_squares_direct(self):
        N = 40
        for S in (1, 2, 3, 4, 5):
            want = [0] * (N + 1)
            r = range(-7, 8)
            import itertools
            for v in itertools.product(r, repeat=S):
                q = sum(x * x for x in v)
                if q <= N:
                    want[q] += 1
            self.assertEqual(pc.family_series("sq", S, N), want, S)

    @unittest.skipIf(GP is None, "gp not installed")
    def test_series_vs_pari(self):
        N = 3000
        for kind, t in (("c", 5), ("c", 11), ("sc", 7), ("sc", 10), ("c", 3)):
            e = pc.family_eta(kind, t)
            expr = "*".join("eta(x^%d+O(x^%d))^%d" % (d, N + 1, x) for d, x in e.items())
            out = gp("print(Vec(%s))" % expr)
            want = [int(v) for v in out.strip("[]").split(",")]
            got = pc.family_series(kind, t, N)
            self.assertEqual(got[:len(want)], want[:N + 1], (kind, t))

    @unittest.skipIf(GP is None, "gp not installed")
    def test_partition_numbers_vs_pari(self):
        c = pc.family_series("c", 1000, 999)
        self.assertEqual(c[999], int(gp("print(numbpart(999))")))
        self.assertEqual(c[100], 190569292)    # p(100), from memory; also numbpart(100)


class Modularity(unittest.TestCase):
    @unittest.skipIf(GP is None, "gp not installed")
    def test_ghn_vs_pari_mffrometaquo(self):
        from fractions import Fraction
        compared = 0
        for kind, t in [("c", t) for t in range(2, 12)] + [("sc", t) for t in range(2, 12)] + \
                [("sq", s) for s in (2, 3, 4, 5)]:
            r = pc.family_eta(kind, t)
            s24 = sum(d * x for d, x in r.items())
            g = 24 if s24 == 0 else __import__("math").gcd(abs(s24), 24)
            f = {d * (24 // g): x for d, x in r.items()}
            level, tw, ch, _ = pc.ghn(f)
            mat = ";".join("%d,%d" % (d, x) for d, x in sorted(f.items()))
            out = gp("my(F=mffrometaquo(Mat([%s]))); if(F==0,print(0),my(P=mfparams(F)); "
                     "print([P[1],P[2]]))" % mat)
            if out == "0":
                continue
            compared += 1
            vals = out.strip("[]").split(",")
            self.assertEqual(int(vals[0]), level, (kind, t))
            self.assertEqual(Fraction(vals[1].strip()), Fraction(tw, 2), (kind, t))
        self.assertGreaterEqual(compared, 20)

    @unittest.skipIf(GP is None, "gp not installed")
    def test_character_vs_pari(self):
        # integral weight: PARI's character is the Kronecker symbol (D/.) with D = mfparams[3]
        for kind, t in (("c", 5), ("c", 7), ("c", 9), ("sc", 9), ("sq", 2), ("sq", 6)):
            r = pc.family_eta(kind, t)
            s24 = sum(d * x for d, x in r.items())
            g = 24 if s24 == 0 else __import__("math").gcd(abs(s24), 24)
            f = {d * (24 // g): x for d, x in r.items()}
            level, tw, ch, _ = pc.ghn(f)
            self.assertEqual(tw % 2, 0)
            mat = ";".join("%d,%d" % (d, x) for d, x in sorted(f.items()))
            out = gp("my(P=mfparams(mffrometaquo(Mat([%s])))); "
                     "print(vector(60,n,if(gcd(n,P[1])==1,kronecker(P[3],n),0)))" % mat)
            want = [int(v) for v in out.strip("[]").split(",")]
            got = [(kron(ch, n) if __import__("math").gcd(n, level) == 1 else 0) for n in range(1, 61)]
            self.assertEqual(got, want, (kind, t))

    def test_relation_parser(self):
        R = pc.parse_relation("c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 4")
        self.assertEqual(pc.relation_text(R), "c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4")
        R = pc.parse_relation("c10(25n+24) == 0 mod 5^2")
        self.assertEqual(pc.relation_text(R), "c10(25n+24) == 0 mod 25")
        R = pc.parse_relation("sc5(2n+1) = sc5(n)")
        self.assertEqual(pc.relation_text(R), "sc5(2n+1) - sc5(n) = 0")
        for bad in ("c5(5n-4) = 0", "c5(5n+4) == 0 mod 1", "x5(n) = 0", "c5(5n+4) = 0 junk",
                    "1/2*c5(n) == 0 mod 5", "c5(n) = 0 for n mod 3 != 3", "= 0"):
            self.assertRaises(ValueError, pc.parse_relation, bad)

    def test_dilated_terms(self):
        # docs/MATH.md §8 (b): F(A(n-j)/d + B) is F at that argument for n = j mod d, else 0
        R = pc.parse_relation("c4(7n+2) = 2*sc7(8n+1) + c4((n-4)/7)")
        self.assertEqual(pc.relation_text(R), "c4(7n+2) - 2*sc7(8n+1) - c4((n-4)/7) = 0")
        t = R.terms[2]
        self.assertEqual([t.arg(n) for n in (4, 5, 11, 18)], [0, -1, 1, 2])
        R = pc.parse_relation("c4(7n+2) = c4(49(n-4)/7+30) for n mod 7 = 4")
        self.assertEqual(R.terms[1].arg(11), 49 + 30)
        self.assertEqual(pc.relation_text(pc.parse_relation("sq1(2n) = sq1(n/2)")), "sq1(2n) - sq1(n/2) = 0")
        for bad in ("c4((n-7)/7) = 0", "c4((n+1)/7) = 0", "c4((n-1)/1) = 0", "c4((n-1)) = 0", "c4(n/1) = 0"):
            self.assertRaises(ValueError, pc.parse_relation, bad)
        # the whole c4/sc7 relation: one V_7 more on the dilated term, bound 384 (m = 8n + 3)
        exp, plan = pc.structure(pc.parse_relation("c4(7n+2) = 2*sc7(8n+1) + c4((n-4)/7)"), pc.MAX_M_PROVE)
        self.assertEqual((exp["space"]["level"], exp["sturm_bound"]), (1792, "384"))
        self.assertEqual(exp["terms"][2]["chain"][-1]["op"], "V_7")

    def test_worked_example_of_math_md(self):
        # docs/MATH.md §8 worked example: level 12544, index 21504, bound 2688
        R = pc.parse_relation("c4(7n+2) = 2*sc7(8n+1) for n mod 7 != 4")
        exp, plan = pc.structure(R, pc.MAX_M_PROVE)
        self.assertEqual((exp["space"]["level"], exp["index"], exp["sturm_bound"]), (12544, "21504", "2688"))
        self.assertEqual(plan["n_check"], 335)


def leaves(obj, path=()):
    """(path, value) of every place to mutate, containers included."""
    yield path, obj
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield from leaves(v, path + (k,))
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from leaves(v, path + (i,))


def mutations(cert):
    for path, v in leaves(cert):
        if path in ((), ("digest",)):
            continue
        if isinstance(v, bool):
            yield path, "flip", not v
        elif isinstance(v, int):
            yield path, "+1", v + 1
            yield path, "-1", v - 1
            yield path, "as string", str(v)
        elif isinstance(v, str):
            yield path, "prefix", "x" + v
            if path != ("provenance", "command"):   # its tail is the free output path
                yield path, "dropped last", v[:-1]
        elif isinstance(v, dict):
            yield path, "added key", dict(v, extra_key="1")
            for k in v:
                yield path, "deleted " + k, {a: b for a, b in v.items() if a != k}
        elif isinstance(v, list):
            yield path, "dropped last", v[:-1]
            yield path, "duplicated first", v[:1] + v if v else ["1"]


def put(cert, path, value):
    c = copy.deepcopy(cert)
    o = c
    for p in path[:-1]:
        o = o[p]
    o[path[-1]] = value
    c["digest"] = pc.digest_of(c)
    return c


class Mutations(unittest.TestCase):
    def check_all(self, name):
        cert = load(os.path.join(PROOFS, name))
        with tempfile.TemporaryDirectory() as d:
            f = os.path.join(d, "m.json")
            with open(f, "w") as fh:
                json.dump(cert, fh)
            self.assertEqual(run_quiet([f])[0], 0)
            n = 0
            for path, what, value in mutations(cert):
                m = put(cert, path, value)
                if m == cert:
                    continue
                with open(f, "w") as fh:
                    json.dump(m, fh, ensure_ascii=False)
                code, out = run_quiet([f])
                self.assertIn(code, (1, 2), "%s %s accepted" % ("/".join(map(str, path)), what))
                self.assertNotIn("internal", out, out)
                n += 1
            self.assertGreater(n, 100)

    def test_mutations_gks_c5(self):
        self.check_all("gks_c5.json")

    def test_mutations_c4_sc7_restricted(self):
        self.check_all("c4_sc7_restricted.json")

    def test_mutations_c4_sc7_dilated(self):
        self.check_all("c4_sc7_dilated.json")

    def test_reading_rules(self):
        with open(os.path.join(PROOFS, "gks_c5.json")) as fh:
            text = fh.read()
        with tempfile.TemporaryDirectory() as d:
            f = os.path.join(d, "m.json")
            for bad, code in ((text.replace('"n_from": 0', '"n_from": 0.0'), 2),
                              (text.replace('"n_from": 0', '"n_from": 0, "n_from": 0'), 2),
                              (text[:-5], 2), ("[1]", 2), ("", 2),
                              (text.replace('"digest": "sha256:7', '"digest": "sha256:8'), 1)):
                with open(f, "w") as fh:
                    fh.write(bad)
                r = subprocess.run([sys.executable, CHECKER, f], capture_output=True, text=True, timeout=60)
                self.assertEqual(r.returncode, code, r.stdout)
                self.assertNotIn("Traceback", r.stderr + r.stdout)
            r = subprocess.run([sys.executable, CHECKER, os.path.join(d, "missing.json")],
                               capture_output=True, text=True, timeout=60)
            self.assertEqual(r.returncode, 2)
            self.assertNotIn("Traceback", r.stderr)

    def test_wrong_counts_rejected(self):
        # a forged certificate whose relation is false must not pass: the digest of the
        # lines and the verdict are recomputed
        cert = load(os.path.join(PROOFS, "gks_c5.json"))
        c = copy.deepcopy(cert)
        c["relation"] = "c5(5n+3) == 0 mod 5"
        c["provenance"]["command"] = "circlet prove 'c5(5n+3) == 0 mod 5' -o x.json"
        c["terms"][0]["B"] = 3
        c["digest"] = pc.digest_of(c)
        with tempfile.TemporaryDirectory() as d:
            f = os.path.join(d, "m.json")
            with open(f, "w") as fh:
                json.dump(c, fh)
            code, out = run_quiet([f])
            self.assertEqual(code, 1, out)


if __name__ == "__main__":
    unittest.main()
