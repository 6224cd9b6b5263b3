#!/usr/bin/python3
"""Self-test of circlet_check.py against things outside it.

Run:  /usr/bin/python3 -m unittest checker/test_circlet_check.py   (stdlib only)

Outside references used here:
  * the definition of a t-core (no hook length divisible by t) and of a
    self-conjugate partition, by enumerating partitions -- checks the
    quadratic models the checker trusts (docs/MATH.md §2);
  * direct enumeration of (Z/p^j)^t -- checks the histogram counting;
  * Jacobi's four-square theorem, r_4(n) = 8 sum_{d | n, 4 !| d} d
    (C. G. J. Jacobi, Fundamenta nova theoriae functionum ellipticarum, 1829;
    statement from memory): its singular series gives, for odd p, the density
    (1 - p^-2) sum_{i=0}^{v_p(N)} p^-i of x1^2+..+x4^2 = N (common practice);
  * the closed forms of docs/MATH.md §4 (for the tail bound);
  * Python's math.exp / math.sqrt (IEEE double, error < 1 ulp).
"""
import hashlib
import io
import itertools
import json
import math
import os
import sys
import unittest
from contextlib import redirect_stdout
from fractions import Fraction as Fr

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, HERE)
import circlet_check as cc  # noqa: E402


def partitions(n, maxpart=None):
    maxpart = n if maxpart is None else maxpart
    if n == 0:
        yield ()
        return
    for k in range(min(n, maxpart), 0, -1):
        for rest in partitions(n - k, k):
            yield (k,) + rest


def hooks(lam):
    conj = [sum(1 for x in lam if x > j) for j in range(lam[0])] if lam else []
    return [lam[i] - j - 1 + conj[j] - i for i in range(len(lam)) for j in range(lam[i])]


def conjugate(lam):
    return tuple(sum(1 for x in lam if x > j) for j in range(lam[0])) if lam else ()


def model_count(fam, n, box=4):
    """#{integer points of the model of docs/MATH.md §2 with value n} in a box
    large enough for n <= 12 (|x_i| <= box)."""
    t = fam.t
    rng = range(-box, box + 1)
    if fam.kind == "sc":
        return sum(1 for y in itertools.product(rng, repeat=fam.r)
                   if t * sum(v * v for v in y) + sum((2 * i + 1 - t) * v for i, v in enumerate(y)) == n)
    cnt = 0
    for x in itertools.product(rng, repeat=t - 1):
        last = -sum(x)
        xs = x + (last,)
        if 2 * n == t * sum(v * v for v in xs) + 2 * sum(i * v for i, v in enumerate(xs)):
            cnt += 1
    return cnt


def brute_beta(fam, p, j, N):
    """beta by enumerating all of (Z/p^j)^t (c_t: sum = 0 mod p^j)."""
    M = p ** j
    t = fam.t
    if fam.kind == "sc":
        cnt = sum(1 for y in itertools.product(range(M), repeat=fam.r)
                  if (t * sum(v * v for v in y) + sum((2 * i + 1 - t) * v for i, v in enumerate(y)) - N) % M == 0)
        return Fr(cnt, M ** (fam.r - 1))
    cnt = 0
    for x in itertools.product(range(M), repeat=t - 1):
        last = (-sum(x)) % M
        # integer representative with sum exactly 0 (shift last by a multiple of M)
        xs = x + (last - (sum(x) + last),)
        P2 = t * sum(v * v for v in xs) + 2 * sum(i * v for i, v in enumerate(xs))
        if (P2 // 2 - N) % M == 0:
            cnt += 1
    return Fr(cnt, M ** (t - 2))


def closed_form(fam, q, N):
    """docs/MATH.md §4 closed forms, odd q not dividing t."""
    r = fam.r
    X = fam.X(N)
    v = cc.vp(X, q)
    u = X / Fr(q) ** v
    uq = u.numerator * pow(u.denominator, -1, q) % q

    def leg(a):
        a %= q
        return 0 if a == 0 else (1 if pow(a, (q - 1) // 2, q) == 1 else -1)
    det = fam.det.numerator * pow(fam.det.denominator, -1, q)
    if r % 2 == 0:
        chi = leg((-1) ** (r // 2) * det)
        return (1 - chi * Fr(q) ** (-r // 2)) * sum((chi * Fr(q) ** (1 - r // 2)) ** i for i in range(v + 1))
    chi = leg((-1) ** ((r - 1) // 2) * det * uq)
    s = Fr(1)
    for j in range(1, v + 2):
        if j <= v and j % 2 == 0:
            s += (1 - Fr(1, q)) * Fr(q) ** (j * (2 - r) // 2)
        elif j == v + 1 and j % 2 == 0:
            s -= Fr(q) ** (j * (2 - r) // 2 - 1)
        elif j == v + 1:
            s += chi * Fr(q) ** ((j * (2 - r) - 1) // 2)
    return s


def stable_j(fam, p, N):
    """The counting exponent the checker uses (T5): 1 if kappa = 0, else v_p(X) + kappa."""
    k = fam.kappa(p)
    return 1 if k == 0 else cc.vp(fam.X(N), p) + k


def run_main(path):
    buf = io.StringIO()
    with redirect_stdout(buf):
        rc = cc.main(["circlet_check.py", path])
    return rc, buf.getvalue().strip()


REAL = [os.path.join(ROOT, p) for p in (
    "results/default/cert_c6_1_0__sc11_1_0.json",
    "results/default/cert_c7_2_1__sc13_1_0.json",
    "results/default/cert_c8_1_0__sc15_2_1.json",
    "results/scan_t6-10_M8/examples/cert_c10_8_7__sc19_5_2.json",
    "results/scan_t6-10_M8/examples/cert_c9_34_1__sc17_102_1.json")]


def load(path):
    with open(path, encoding="utf-8") as fh:
        return cc.load_strict(fh.read())


class Models(unittest.TestCase):
    def test_models_count_t_cores_by_hook_lengths(self):
        # definition of t-cores / self-conjugate t-cores vs docs/MATH.md §2
        for name in ("c2", "c3", "c4", "sc4", "sc5", "sc6", "sc7"):
            fam = cc.Family(name, "F")
            for n in range(0, 13):
                cores = [lam for lam in partitions(n) if all(h % fam.t for h in hooks(lam))]
                want = len(cores) if fam.kind == "c" else sum(1 for lam in cores if conjugate(lam) == lam)
                self.assertEqual(model_count(fam, n), want, (name, n))

    def test_shift_completes_the_square(self):
        # X = n + Delta is the value of the completed form: for sc_t,
        # t sum (y_i + c_i/(2t))^2 = n + Delta at any integer point of value n
        for t in (5, 6, 7, 8):
            fam = cc.Family("sc%d" % t, "F")
            for y in itertools.product(range(-2, 3), repeat=fam.r):
                n = t * sum(v * v for v in y) + sum((2 * i + 1 - t) * v for i, v in enumerate(y))
                z = sum((v + Fr(2 * i + 1 - t, 2 * t)) ** 2 for i, v in enumerate(y))
                self.assertEqual(t * z, fam.X(n))


class Counting(unittest.TestCase):
    def test_histogram_count_equals_enumeration(self):
        cases = [("c3", 2, 1), ("c3", 2, 2), ("c3", 3, 1), ("c4", 2, 2), ("c4", 3, 1),
                 ("c5", 2, 2), ("c4", 5, 1), ("sc5", 2, 3), ("sc7", 2, 3), ("sc7", 3, 2),
                 ("sc9", 5, 1), ("c3", 2, 3)]
        for name, p, j in cases:
            fam = cc.Family(name, "F")
            for N in range(0, 2 * p ** j):
                self.assertEqual(fam.count(p, j, N, "f"), brute_beta(fam, p, j, N), (name, p, j, N))

    def test_stable_level_is_stable(self):
        # T5: beta_p = N_j/p^{j(r-1)} for every j >= the stable level
        for name in ("c5", "c6", "c7", "sc7", "sc9", "sc11", "sq3", "sq5"):
            fam = cc.Family(name, "F")
            for p in (2, 3, 5):
                tested = 0
                for N in range(1, 40):
                    j = stable_j(fam, p, N)
                    levels = [k for k in (j, j + 1, j + 2) if p ** k <= 64]
                    if len(levels) < 2:
                        continue
                    tested += 1
                    vals = {fam.count(p, k, N, "f") for k in levels}
                    self.assertEqual(len(vals), 1, (name, p, N, levels, vals))
                self.assertGreater(tested, 10, (name, p))

    def test_levels_recursion_equals_direct_count(self):
        # the recursion used for large moduli (counts mod p only) against
        # direct counting mod p^{v+1}, including v = 1, 2, 3
        for name, p in (("c4", 3), ("c5", 3), ("c7", 3), ("sc9", 5), ("sc7", 3), ("sq4", 3), ("sq5", 5),
                        ("c5", 2), ("c7", 2), ("sc7", 2), ("sc9", 2), ("sc11", 2), ("sq4", 2), ("sq5", 2)):
            fam = cc.Family(name, "F")
            seen = set()
            for N in range(1, 130):
                v = cc.vp(fam.X(N), p)
                if fam.cost(p ** (v + fam.kappa(p))) > 1 << 20 or fam.kappa(p) == 0:
                    continue
                seen.add(v)
                self.assertEqual(cc.beta_by_levels(fam, p, fam.X(N), "f"),
                                 fam.count(p, v + fam.kappa(p), N, "f"), (name, p, N))
            self.assertTrue({0, 1, 2} <= seen, (name, seen))

    def test_beta_is_one_at_primes_of_t(self):
        for name, p in (("c6", 2), ("c6", 3), ("c9", 3), ("sc15", 5), ("sc6", 2), ("c10", 5)):
            fam = cc.Family(name, "F")
            for N in range(7):
                self.assertEqual(fam.count(p, 1, N, "f"), 1)

    def test_four_squares_density_from_jacobi(self):
        # sc_9: X = 9 (z1^2+..+z4^2); at odd p != 3 the density at X is that of
        # four squares at X/9, (1 - p^-2) sum_{i<=v} p^-i (Jacobi).
        fam = cc.Family("sc9", "G")
        for p in (5, 7):
            for N in range(0, 60):
                v = cc.vp(fam.X(N) / 9, p)
                want = (1 - Fr(1, p * p)) * sum(Fr(1, p ** i) for i in range(v + 1))
                j = stable_j(fam, p, N)
                if p ** j <= 4096:
                    self.assertEqual(fam.count(p, j, N, "f"), want, (p, N))

    def test_sum_of_four_squares_from_jacobi(self):
        # r_4(n) = 8 sigma(n) (n odd), 24 sigma(odd part of n) (n even) and
        # r_4(n) = pi^2 n prod_p beta_p with prod_{p odd} (1 - p^-2) = 8/pi^2
        # give beta_2 = 1 for odd n and 3 2^{-v_2(n)} for even n.
        fam = cc.Family("sq4", "G")
        for N in range(1, 70):
            v = cc.vp(N, 2)
            want = Fr(1) if v == 0 else Fr(3, 2 ** v)
            if 2 ** stable_j(fam, 2, N) <= 4096:
                self.assertEqual(fam.count(2, stable_j(fam, 2, N), N, "f"), want, N)
            for p in (3, 5):
                w = (1 - Fr(1, p * p)) * sum(Fr(1, p ** i) for i in range(cc.vp(N, p) + 1))
                self.assertEqual(fam.count(p, stable_j(fam, p, N), N, "f"), w, (p, N))

    def test_closed_forms_and_tail_bound_by_counting(self):
        # docs/MATH.md §4 closed forms (trusted by the tail, T4) against counting,
        # and |beta_q - 1| <= d_q, for q = 5..31 including q | X
        for name in ("c6", "sc11", "c7", "sc13", "c8"):
            fam = cc.Family(name, "F")
            cap = 49 if fam.kind == "c" else 4096   # c_t: cost t cap^3
            for q in (5, 7, 11, 13, 17, 19, 23, 29, 31):
                if fam.t % q == 0:
                    continue
                vs = [(N, cc.vp(fam.X(N), q)) for N in range(0, q ** 3 if q ** 3 <= cap else 3 * q)]
                Ns = [N for N, v in vs if v == 0][:q]
                Ns += [N for N, v in vs if v == 1 and q * q <= cap][:2]
                Ns += [N for N, v in vs if v == 2 and q ** 3 <= cap][:2]
                hit_div = False
                for N in Ns:
                    j = stable_j(fam, q, N)
                    b = fam.count(q, j, N, "f")
                    self.assertEqual(b, closed_form(fam, q, N), (name, q, N))
                    self.assertLessEqual(abs(b - 1), cc.per_prime_d(fam.r, q), (name, q, N))
                    hit_div |= cc.vp(fam.X(N), q) > 0
                if q * q <= cap:   # q | X needs the modulus q^2
                    self.assertTrue(hit_div, (name, q))


class Bounds(unittest.TestCase):
    def test_exp_bounds_bracket_math_exp(self):
        for x in (Fr(0), Fr(1, 3), Fr(-1, 7), Fr(2098805933, 10 ** 10), Fr(5), Fr(-63, 2)):
            lo, hi = cc.exp_bounds(x)
            self.assertLess(hi - lo, Fr(1, 2 ** 250) * max(1, hi))
            e = math.exp(x)
            self.assertTrue(lo <= Fr(e) * (1 + Fr(1, 2 ** 50)) and Fr(e) * (1 - Fr(1, 2 ** 50)) <= hi, x)
            lo2, hi2 = cc.exp_bounds(-x)   # exp(x) exp(-x) = 1
            self.assertTrue(lo * lo2 <= 1 <= hi * hi2)

    def test_sqrt_bounds(self):
        for x in (Fr(2), Fr(161051, 1458), Fr(1, 3), Fr(10 ** 40 + 1)):
            lo, hi = cc.sqrt_bounds(x)
            self.assertTrue(lo * lo <= x <= hi * hi)
            self.assertLess(hi - lo, Fr(1, 2 ** 300))
            self.assertAlmostEqual(float(lo), math.sqrt(x), delta=4e-16 * math.sqrt(x))

    def test_tail_bound_exceeds_partial_sums(self):
        # S bounds the whole sum, so it exceeds a long partial sum computed in
        # floating point, by less than the sum's tail beyond 10^5 (a few 1e-5)
        for r in (5, 6, 7, 8):
            S = float(cc.tail_log_bound(r, 3, 20000, 320))
            part = 0.0
            for q in cc.primes_upto(10 ** 5):
                if q > 3:
                    d = float(cc.per_prime_d(r, q))
                    part += math.log((1 + d) / (1 - d))
            self.assertGreater(S, part)
            self.assertLess(S - part, 1e-4)


class Certificates(unittest.TestCase):
    def test_committed_certificates_are_accepted(self):
        for path in REAL:
            self.assertIn(cc.check(load(path)), ("NON-CONVERGENT", "CONSTANT"), path)

    def test_digest_rule(self):
        cert = load(REAL[0])
        cert.pop("digest")
        body = json.dumps(cert, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
        cert["digest"] = "sha256:" + hashlib.sha256(body.encode("utf-8")).hexdigest()
        self.assertEqual(cc.check(cert), "NON-CONVERGENT")
        cert["provenance"]["date"] = "2026-01-01T00:00:00Z"   # no claim: only the digest sees it
        with self.assertRaisesRegex(cc.Reject, "^/digest"):
            cc.check(cert)

    def test_strict_json(self):
        with self.assertRaisesRegex(cc.Reject, "duplicate"):
            cc.load_strict('{"a": 1, "b": {"c": 1, "c": 2}}')
        with self.assertRaisesRegex(cc.Reject, "float"):
            cc.load_strict('{"a": 1.5}')
        with self.assertRaisesRegex(cc.Reject, "float"):
            cc.load_strict('{"a": 1e3}')
        with self.assertRaisesRegex(cc.Reject, "float"):
            cc.load_strict('{"a": NaN}')

    def test_mutations_are_rejected_naming_the_field(self):
        # each edit is followed by a fresh digest, so the claim checks must catch it
        nc, const = REAL[0], REAL[4]

        def setv(path_, value):
            def f(c):
                o = c
                for k in path_[:-1]:
                    o = o[k]
                o[path_[-1]] = value
            return f
        lf0 = ["classes", 0, "local_factors", 0]
        cases = [
            (nc, setv(lf0 + ["beta_G"], "5/7"), "/classes/0/local_factors/0/beta_G"),
            (nc, setv(lf0 + ["rho"], "8/7"), "/classes/0/local_factors/0/rho"),
            (nc, setv(lf0 + ["rho"], "16/10"), "/classes/0/local_factors/0/rho"),
            (nc, setv(lf0 + ["e"], 2), "/classes/0/local_factors/0/residue"),
            (nc, setv(lf0 + ["residue"], "5"), "/classes/0/local_factors/0/residue"),
            (nc, setv(["classes", 0, "pinned_product"], "36/23"), "/classes/0/pinned_product"),
            (nc, setv(["classes", 0, "residue"], "7"), "/classes/0/local_factors/0/residue"),
            (nc, setv(["classes", 1, "residue"], "6"), "/classes/1/local_factors/0/residue"),
            (nc, setv(["modulus"], "48"), "/modulus"),
            (nc, setv(["modulus"], "024"), "/modulus"),
            (nc, setv(["Q"], 5), "/modulus_factors"),
            (nc, setv(["Q"], 4), "/Q"),
            (nc, setv(["modulus_factors", 0, "e"], 4), "/modulus"),
            (nc, setv(["tail", "log_bound", "mid"], "1*2^-3"), "/tail/log_bound"),
            (nc, setv(["tail", "log_bound", "rad"], "1*2^-10"), "/tail/log_bound"),
            (nc, setv(["tail", "log_bound", "rad"], "0"), "/tail/log_bound"),
            # a doubled S is still an upper bound, but the stored interval is not its [e^-S, e^S]
            (nc, lambda c: setv(["tail", "log_bound", "mid"], "%s*2^%d" % (
                c["tail"]["log_bound"]["mid"].split("*2^")[0],
                int(c["tail"]["log_bound"]["mid"].split("*2^")[1]) + 1))(c), "/tail/interval"),
            (nc, setv(["tail", "interval", "rad"], "1*2^-3"), "/tail/interval"),
            (nc, setv(["tail", "route"], "proportional"), "/tail"),
            (nc, setv(["tail", "explicit_primes_up_to"], 19999), "/tail/explicit_primes_up_to"),
            (nc, setv(["classes", 1, "limit_interval", "rad"], "1*2^-20"), "/classes/1/limit_interval"),
            (nc, setv(["classes", 1, "limit_interval", "rad"], "1*2^3"), "/classes/1/limit_interval"),
            (nc, setv(["classes", 0, "interval_n_ge_n0", "mid"], "2*2^3"), "/classes/0/interval_n_ge_n0/mid"),
            (nc, setv(["sigma_constant", "square"], "161051/1457"), "/sigma_constant/square"),
            (nc, setv(["sigma_constant", "ball", "mid"], "21*2^1"), "/sigma_constant/ball"),
            (nc, setv(["power_factor", "exponent"], "5/2"), "/power_factor/exponent"),
            (nc, setv(["power_factor", "base"], "2/2"), "/power_factor/base"),
            (nc, setv(["power_factor", "n0"], "999"), "/power_factor/n0"),
            (nc, setv(["distinguishing_prime"], 3), "/distinguishing_prime"),
            (nc, setv(["disjoint"], False), "/disjoint"),
            (nc, setv(["weight"], "3"), "/weight"),
            (nc, setv(["F"], "c7"), "/G"),
            (nc, setv(["ap", "A"], 2), "/provenance/command"),
            (nc, setv(["precision_bits"], True), "/precision_bits"),
            (nc, setv(["provenance", "date"], "2026-02-30T00:00:00Z"), "/provenance/date"),
            (nc, setv(["provenance", "program"], "other"), "/provenance/program"),
            (nc, setv(["extra"], 1), "/extra"),
            (nc, lambda c: c["theorems"].pop(), "/theorems"),
            (nc, lambda c: c["theorems"].reverse(), "/theorems"),
            (nc, lambda c: c.pop("tail"), "/tail"),
            (nc, lambda c: c["classes"].pop(), "/classes"),
            (nc, lambda c: c["classes"].reverse(), "/classes"),
            (nc, setv(["classes", 0, "limit_interval", "mid"], "1*2^99999"), "/classes/0/limit_interval/mid"),
            (nc, setv(["classes", 0, "limit_interval", "rad"], "-1*2^0"), "/classes/0/limit_interval/rad"),
            (nc, setv(["verdict"], "CONSTANT"), "/constant_route"),
            (const, setv(["lambda"], "2"), "/lambda"),
            (const, setv(["constant", "value"], "580/241"), "/constant/value"),
            (const, setv(["constant", "square"], "336400/59048"), "/constant/square"),
            (const, setv(["constant", "integer"], "2"), "/constant/integer"),
            (const, setv(["finite_primes", 0, "classes", 0, "beta_F"], "7/8"), "/finite_primes/0/classes/0/beta_F"),
            (const, setv(["finite_primes", 0, "rho"], "16/15"), "/finite_primes/0/classes/0"),
            (const, lambda c: c["finite_primes"][0]["classes"].pop(), "/finite_primes/0/classes"),
            (const, lambda c: c["finite_primes"][0]["classes"].reverse(), "/finite_primes/0/classes"),
            (const, lambda c: c["finite_primes"].pop(), "/finite_primes"),
            (const, setv(["constant", "contains_integer"], True), "/constant/contains_integer"),
            (const, setv(["discriminant_product"], "3"), "/discriminant_product"),
            (const, setv(["constant_route"], "identical"), "/discriminant_product"),
        ]
        for path, edit, field in cases:
            with self.subTest(field=field):
                cert = load(path)
                edit(cert)
                cert["digest"] = cc.digest_of(cert)
                with self.assertRaises(cc.Reject) as ctx:
                    cc.check(cert)
                self.assertTrue(str(ctx.exception).startswith(field + ":") or
                                str(ctx.exception).startswith(field + "/"), str(ctx.exception))

    def test_fresh_certificates_of_the_built_program(self):
        # certificates written now by build/circlet certify (format 2 only):
        # every route -- bound and proportional tails, CONSTANT proportional
        # and identical, UNDECIDED, sums of squares -- is accepted
        exe = os.path.join(ROOT, "build", "circlet")
        if not os.access(exe, os.X_OK):
            self.skipTest("build/circlet not built")
        import subprocess
        import tempfile
        pairs = [("c9", "sc17", "34,1", "102,1", "CONSTANT"), ("c9", "sc17", "1,1", "3,1", "NON-CONVERGENT"),
                 ("c6", "c6", "1,0", "1,0", "CONSTANT"), ("c4", "sc7", "7,2", "8,1", "UNDECIDED"),
                 ("sq8", "c9", "1,0", "1,0", "NON-CONVERGENT"), ("c7", "sc13", "2,1", "4,2", "NON-CONVERGENT")]
        with tempfile.TemporaryDirectory() as d:
            for F, G, ap, ap2, verdict in pairs:
                out = os.path.join(d, "cert.json")
                subprocess.run([exe, "certify", F, G, "--ap", ap, "--ap2", ap2, "-o", out],
                               check=True, capture_output=True)
                c = load(out)
                if c.get("format") != cc.FORMAT:
                    self.skipTest("build/circlet writes %s" % c.get("format"))
                self.assertEqual(cc.check(c), verdict, (F, G, ap, ap2))

    def test_pinning_refuses_an_unpinned_class(self):
        # n = 0 mod 2 does not pin beta_2 of sc11 at n (needs n mod 8)
        fam = cc.Family("sc11", "G")
        with self.assertRaisesRegex(cc.Reject, "not pinned"):
            cc.beta_on_class(fam, 2, 1, 0, 0, 1, "x")

    def test_main_never_raises(self):
        import tempfile
        bad = ["", "[", "[]", '{"format": "circlet-certificate/1"}', "\xff\xfe",
               '{"format": 1}', '[' * 100000 + ']' * 100000, '"x"', "1e999999"]
        for text in bad:
            with tempfile.NamedTemporaryFile("w", suffix=".json", delete=False,
                                             encoding="latin-1") as fh:
                fh.write(text)
            rc, out = run_main(fh.name)
            os.unlink(fh.name)
            self.assertIn(rc, (1, 2), (text[:20], out))
            self.assertTrue(out.startswith(("rejected:", "malformed:")), out)


if __name__ == "__main__":
    unittest.main()
