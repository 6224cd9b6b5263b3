#!/usr/bin/python3
"""circlet_check.py -- an independent checker of circlet certificates.

Usage:  circlet_check.py CERT.json [-v]
Exit 0 "accepted"; exit 1 "rejected: <JSON pointer>: <reason>"; exit 2
"malformed: ..." when the input cannot be read at all.  Never a traceback.

Written from the mathematics (docs/MATH.md) and the certificate format
(docs/certificate-format.md, circlet-certificate/2) alone; it shares no code
with the C++ program.  Every number is an int or a Fraction; every bound on
an irrational number is a pair of rationals with the inequality stated.

WHAT THIS PROGRAM TRUSTS (and nothing else):
  T1. Python's int and fractions.Fraction, math.isqrt, hashlib.sha256, the
      standard json parser, re, datetime.
  T2. docs/MATH.md §2: the quadratic models
        c_t(n)  = #{x in Z^t : sum x = 0, (t/2) sum x_i^2 + sum i x_i = n},
        sc_t(n) = #{y in Z^m : t sum y_i^2 + sum (2i+1-t) y_i = n}, m = t//2,
        sq_t(n) = #{y in Z^t : sum y_i^2 = n},
      their rank r, det S and shift Delta (X = n + Delta).
  T3. docs/MATH.md §3, §7: M(n) = sigma_inf(X) prod_p beta_p(n) with
      sigma_inf = pi^{r/2} X^{r/2-1} / (Gamma(r/2) sqrt(det S)), so for two
      families of the same rank the ratio of the sigma_inf is
      sqrt(det S_G / det S_F) (X_F/X_G)^{w-1}: no pi and no Gamma are needed.
  T4. docs/MATH.md §4 closed forms of beta_q for odd q not dividing t, used
      ONLY for q > Q: to bound |beta_q - 1| in the tail (§7.2), and (§7.4) to
      see that beta_q^F = beta_q^G when X_G = lam X_F, q does not divide
      2 3 t_F t_G lam and the discriminant product is a square.  Every beta_p
      a certificate states is recounted here, never taken from a formula.
  T5. Hensel's lemma (common practice; docs/MATH.md §4, §7.1): a solution
      mod p^j of Q(z) = X whose gradient 2Sz has valuation k, j >= 2k+1, has
      exactly p^{r-1} lifts mod p^{j+1}; and z = 0 mod p forces p^{2k} | X.
      Hence beta_p = N_j/p^{j(r-1)} for j >= v_p(X) + 1 where 2S is unimodular
      at p (odd p not dividing t; c_t at p = 2, t odd) and j >= v_p(X) + 3 at
      p = 2 (gradient 2tz, 2z); for p | t (c_t, sc_t) the model is linear mod
      p with a unit coefficient, so beta_p = N_1/p^{r-1} (= 1).  N_j(n)
      depends only on n mod p^j.  The same splitting gives the recursion of
      beta_by_levels.  (Stability, the recursion and the closed forms are
      re-tested against direct counts by test_circlet_check.py.)
  T6. The published theorems of the catalogue (Siegel, Hecke): main term =
      Eisenstein part; the cusp part is o(main term) for weight w > 2.
"""
import datetime
import hashlib
import json
import math
import re
import sys
from fractions import Fraction as Fr
from functools import lru_cache

# ----------------------------------------------------------------- limits --
# docs/certificate-format.md §1.2, and the checker's own: every loop below is
# bounded by these; an input beyond them is refused.
MAX_FILE = 4 << 20
MAX_PRIME_POWER = 1 << 20   # p^e this checker enumerates (classes, residues)
MAX_COST = 1 << 25          # one count: t p^{3j} for c_t, m p^{2j} otherwise
MAX_WORK = [1 << 28, 0]     # all counts of one certificate: limit, used
Q2 = 20000                  # tail.explicit_primes_up_to
THEOREMS = ["siegel-eisenstein", "cusp-bound", "local-densities"]
FORMAT = "circlet-certificate/2"
VERSIONS = ("0.1.0",)       # circlet versions whose certificates this checker knows


class Reject(Exception):
    """A claim of the certificate is false, unproved or misspelt."""


def need(cond, field, why):
    if not cond:
        raise Reject("%s: %s" % (field or "/", why))


# ------------------------------------------------------------ strict JSON --
def _pairs(pairs):
    d = {}
    for k, v in pairs:
        need(k not in d, "/" + k, "duplicate key")
        d[k] = v
    return d


def _no_float(s):
    raise Reject("number %s: floats are not allowed in a certificate" % s)


def load_strict(text):
    return json.loads(text, object_pairs_hook=_pairs, parse_float=_no_float,
                      parse_constant=_no_float)


def depth(o):
    """Nesting depth of a parsed JSON value (format §1.2: at most 16)."""
    level, todo = -1, [o]
    while todo:
        level, todo = level + 1, [v for x in todo if isinstance(x, (dict, list))
                                  for v in (x.values() if isinstance(x, dict) else x)]
    return level


def digest_of(cert):
    body = {k: v for k, v in cert.items() if k != "digest"}
    canon = json.dumps(body, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return "sha256:" + hashlib.sha256(canon.encode("utf-8")).hexdigest()


# ------------------------------------------------------------------ types --
def keys(obj, field, required):
    need(isinstance(obj, dict), field, "must be an object")
    for k in obj:
        need(k in required, field + "/" + k, "unknown field")
    for k in required:
        need(k in obj, field + "/" + k, "missing field")


def get_int(obj, k, field, lo=0, hi=2 ** 53):
    v = obj[k]
    need(type(v) is int, field, "not an integer")
    need(lo <= v <= hi, field, "out of range [%d, %d]" % (lo, hi))
    return v


def get_nat(obj, k, field, hi):
    v = obj[k]
    need(type(v) is str and re.fullmatch(r"0|[1-9][0-9]{0,19999}", v) is not None,
         field, "not a natural number in canonical spelling")
    need(int(v) <= hi, field, "out of range")
    return int(v)


def get_rat(obj, k, field):
    v = obj[k]
    need(type(v) is str and len(v) <= 20000 and
         re.fullmatch(r"(0|[1-9][0-9]*)(/[1-9][0-9]*)?", v) is not None,
         field, "not a non-negative rational p or p/q")
    x = Fr(v)
    need(str(x) == v, field, "rational not in lowest terms (canonical %s)" % x)
    return x


def is_prime(n):
    return n >= 2 and all(n % d for d in range(2, math.isqrt(n) + 1))


# ------------------------------------------------------------------ balls --
def parse_ball(obj, field, prec):
    """{mid, rad} of dyadics m*2^e -> the exact interval (lo, hi)."""
    keys(obj, field, ("mid", "rad"))
    out = []
    for k in ("mid", "rad"):
        v = obj[k]
        m = re.fullmatch(r"(0|-?[1-9][0-9]{0,1300})\*2\^(0|-?[1-9][0-9]{0,5})",
                         v if type(v) is str else "")
        need(m is not None, field + "/" + k, "not a dyadic m*2^e")
        mm, e = int(m.group(1)), int(m.group(2))
        need(v == "0*2^0" or mm % 2 == 1, field + "/" + k, "not canonical (m odd, or 0*2^0)")
        need(abs(mm) < 2 ** (prec + 64) and -(4 * prec + 1024) <= e <= 1024,
             field + "/" + k, "dyadic beyond the limits")
        out.append(Fr(mm) * Fr(2) ** e)
    mid, rad = out
    need(rad >= 0, field + "/rad", "negative radius")
    return mid - rad, mid + rad


def check_ball(obj, field, prec, truth, near=None):
    """The stored ball B must contain the enclosure `truth` of the exact value
    and be tight (§8): rad(B) <= rad(R)(1 + 2^-20) + 2^-40(|R| + 1), with R =
    `near` (an enclosure of the value the program computes) or `truth`."""
    B = parse_ball(obj, field, prec)
    need(B[0] <= truth[0] and truth[1] <= B[1], field,
         "does not contain the checker's enclosure [%.17g, %.17g]" % tuple(map(float, truth)))
    R = near or truth
    radR, absR = (R[1] - R[0]) / 2, max(abs(R[0]), abs(R[1]))
    need((B[1] - B[0]) / 2 <= radR * (1 + Fr(1, 2 ** 20)) + (absR + 1) / 2 ** 40,
         field, "ball not tight")
    return B


def imul(*ivs):
    """Product of intervals of non-negative numbers: [prod lo, prod hi]."""
    lo, hi = Fr(1), Fr(1)
    for a, b in ivs:
        need(a >= 0, "/classes", "negative factor")
        lo, hi = lo * a, hi * b
    return lo, hi


def bmul(*ivs):
    """The same product in midpoint-radius (ball) arithmetic, as the program
    computes it: (m1 +- r1)(m2 +- r2) = m1 m2 +- (m1 r2 + m2 r1 + r1 r2) for
    m_i >= r_i >= 0, i.e. upper end prod (m_i + r_i) and midpoint prod m_i
    (associative).  Only the tightness test uses it."""
    mid, hi = Fr(1), Fr(1)
    for a, b in ivs:
        mid, hi = mid * (a + b) / 2, hi * b
    return 2 * mid - hi, hi


# ---------------------------------------------- exact bounds for functions --
# All enclosures are rounded outward to multiples of 2^-K, K = KBITS[0]
# (set per certificate to P/2 + 64 or more: certify keeps the exact value at
# least 2^{-P/2}(|x|+1) inside each stored ball, docs/certificate-format.md §8).
KBITS = [320]


def rnd_down(x):
    return Fr(math.floor(x * (1 << KBITS[0])), 1 << KBITS[0])


def rnd_up(x):
    return Fr(math.ceil(x * (1 << KBITS[0])), 1 << KBITS[0])


def sqrt_bounds(x):
    """lo <= sqrt(x) <= hi for rational x >= 0.
    With s = isqrt(a b 4^K) (so s^2 <= a b 4^K < (s+1)^2):
    s/(b 2^K) <= sqrt(a/b) = sqrt(ab)/b < (s+1)/(b 2^K)."""
    a, b = x.numerator, x.denominator
    s = math.isqrt(a * b << (2 * KBITS[0]))
    return Fr(s, b << KBITS[0]), Fr(s + 1, b << KBITS[0])


def exp_bounds(x):
    """lo <= exp(x) <= hi for rational x with |x| <= 64.
    Halve: y = x/2^h with |y| <= 1/2.  Taylor with N terms: for |y| <= 1/2
    |exp(y) - sum_{k<N} y^k/k!| <= 2 |y|^N / N!  (geometric tail, ratio <= 1/2),
    then exp(x) = exp(y)^(2^h), squaring positive lower/upper bounds."""
    need(abs(x) <= 64, "/tail", "exponent too large")
    h = 0
    while abs(x) / 2 ** h > Fr(1, 2):
        h += 1
    y = x / 2 ** h
    s, term, n = Fr(0), Fr(1), 0
    while True:
        s += term
        n += 1
        term = term * y / n
        rem = 2 * abs(term)           # bound on sum_{k>=n} y^k/k!
        if rem < Fr(1, 1 << (KBITS[0] + 8)):
            break
    lo, hi = rnd_down(s - rem), rnd_up(s + rem)
    for _ in range(h):                # exp(2y) = exp(y)^2, all bounds > 0
        lo, hi = rnd_down(lo * lo), rnd_up(hi * hi)
    return lo, hi


def pow_bounds(base, expo):
    """Bounds for base^expo, base > 0 rational, expo >= 0 an integer or a
    half-integer: base^(k/2) = base^floor(k/2) * sqrt(base)^(k mod 2)."""
    need(base > 0 and expo >= 0 and (2 * expo).denominator == 1, "/power_factor",
         "unsupported power")
    k = int(2 * expo)
    p = base ** (k // 2)
    if k % 2 == 0:
        return p, p
    lo, hi = sqrt_bounds(base)
    return p * lo, p * hi


def artanh_up(d):
    """artanh d = sum_k d^{2k+1}/(2k+1) <= d + d^3/3 + d^5/5 + (d^7/7) sum_k d^{2k}
    = d + d^3/3 + d^5/5 + d^7/(7(1-d^2)) for 0 <= d < 1; log((1+d)/(1-d)) = 2 artanh d."""
    d2 = d * d
    return d * (1 + d2 / 3 + d2 * d2 / 5 + d2 ** 3 / (7 * (1 - d2)))


# ---------------------------------------------------------- the families --
def primes_upto(n):
    sieve = bytearray([1]) * (n + 1)
    sieve[0:2] = b"\x00\x00"
    for i in range(2, math.isqrt(n) + 1):
        if sieve[i]:
            sieve[i * i::i] = bytearray(len(range(i * i, n + 1, i)))
    return [i for i in range(n + 1) if sieve[i]]


def vp(x, p):
    """p-adic valuation of a non-zero rational."""
    x = Fr(x)
    need(x != 0 and p >= 2, "/", "valuation of 0")
    v, a, b = 0, x.numerator, x.denominator
    while a % p == 0:
        a //= p
        v += 1
    while b % p == 0:
        b //= p
        v -= 1
    return v


COUNTS = {}                 # (family, p, j, N mod p^j, class) -> beta


class Family:
    """c_t, sc_t or sq_t (sum of t squares) with the data of docs/MATH.md §2 (T2)."""

    def __init__(self, name, field):
        m = re.fullmatch(r"(c|sc|sq)([1-9][0-9]{0,3})", name) if type(name) is str else None
        need(m is not None, field, "not a family c<T>, sc<T> or sq<T>")
        self.kind, self.t = m.group(1), int(m.group(2))
        t = self.t
        need(1 <= t <= 1000, field, "T out of range")
        if self.kind == "c":
            self.r, self.det, self.delta = t - 1, Fr(t, 2) ** (t - 1) * t, Fr(t * t - 1, 24)
        elif self.kind == "sc":
            self.r, self.det = t // 2, Fr(t) ** (t // 2)
            self.delta = Fr(self.r * (self.r + 1), 6) if t % 2 else Fr(t * t - 1, 24)
        else:
            self.r, self.det, self.delta = t, Fr(1), Fr(0)
        need(self.r >= 1, field, "rank 0")

    def X(self, N):
        return N + self.delta

    def count(self, p, j, N, field, odd_class=None):
        """N_j(N) = #{solutions mod p^j of the model = N}; returns
        beta = N_j / p^{j(r-1)} (docs/MATH.md §3, c_t: x in (Z/p^j)^t with
        sum x = 0, normalised by p^{j(t-2)}).  Histogram convolution.
        sc/sq with odd_class = y0: only the y with y = y0 mod 2."""
        M = p ** j
        t = self.t
        need(self.cost(M) <= MAX_COST, field, "counting modulus %d beyond the limit" % M)
        key = (self.kind, t, p, j, N % M, tuple(odd_class or ()))
        if key in COUNTS:
            return COUNTS[key]
        MAX_WORK[1] += self.cost(M)
        need(MAX_WORK[1] <= MAX_WORK[0], field, "total counting work beyond the limit")
        COUNTS[key] = self._count(p, j, N, M, odd_class)
        return COUNTS[key]

    def _count(self, p, j, N, M, odd_class):
        t = self.t
        if self.kind != "c":   # sc_t: t y^2 + (2i+1-t) y per coordinate; sq_t: y^2
            a, b = (t, lambda i: 2 * i + 1 - t) if self.kind == "sc" else (1, lambda i: 0)
            dist = [1] + [0] * (M - 1)
            for i in range(self.r):
                new = [0] * M
                for y in range(M) if odd_class is None else range(odd_class[i], M, 2):
                    v = (a * y * y + b(i) * y) % M
                    new = list(map(int.__add__, new, dist[-v:] + dist[:-v] if v else dist))
                dist = new
            return Fr(dist[N % M], M ** (self.r - 1))
        # c_t: rows indexed by sum x mod M, columns by the value.  For p = 2
        # the value is W = 2P = t sum x^2 + 2 sum i x mod 2M, well defined on
        # (Z/2^j)^t for j >= 1 (x_i -> x_i + 2^j changes W by t 4^j mod 2^{j+1});
        # for odd p it is P mod M with t/2 = t * 2^{-1} mod M.
        if p == 2:
            VM, target = 2 * M, (2 * N) % (2 * M)
            f = lambda i, x: (t * x * x + 2 * i * x) % VM
        else:
            VM, target, h = M, N % M, pow(2, -1, M)
            f = lambda i, x: (h * t * x * x + i * x) % VM
        zero = [0] * VM
        rows = [[1] + [0] * (VM - 1)] + [zero] * (M - 1)
        for i in range(t):
            new = [zero] * M
            for x in range(M):
                v = f(i, x)
                for s in range(M):
                    row = rows[s]
                    if row is zero:
                        continue
                    s2 = (s + x) % M
                    new[s2] = list(map(int.__add__, new[s2], row[-v:] + row[:-v] if v else row))
            rows = new
        return Fr(rows[0][target], M ** (t - 2))

    def cost(self, M):
        return self.t * M ** 3 if self.kind == "c" else self.r * M * M

    def kappa(self, p):
        """Pinning/stability margin (T5; docs/certificate-format.md §3): 0 if
        p | t for c_t, sc_t; 3 at p = 2 (v_2(X) + 3 is stable for every
        family; for c_t with t odd already v_2(X) + 1); 1 at odd p."""
        if self.kind != "sq" and self.t % p == 0:
            return 0
        return 3 if p == 2 else 1


def beta_on_class(fam, p, A, B, res, e, field):
    """beta_p of fam at A n + B, the same for every n = res mod p^e: with
    v = v_p(X(A res + B)) and j = v + kappa, the class moves X by multiples
    of p^{v_p(A)+e}; if j <= v_p(A) + e, then v_p(X) and X mod p^j are
    constant on the class, and beta_p = N_j/p^{j(r-1)} there (T5)."""
    N, k = A * res + B, fam.kappa(p)
    if k == 0:
        return fam.count(p, 1, N, field)
    need(fam.X(N) != 0, field, "not pinned: X = 0 at the representative")
    v = vp(fam.X(N), p)
    need(v >= 0, field, "X is not p-integral")
    need(v + k <= vp(A, p) + e, field,
         "not pinned: needs v_p(A) + e >= %d (docs/MATH.md §7.1)" % (v + k))
    if fam.cost(p ** (v + k)) > MAX_COST:
        return beta_by_levels(fam, p, fam.X(N), field)
    return fam.count(p, v + k, N, field)


def beta_by_levels(fam, p, X, field):
    """beta_p at X (kappa > 0) from counts mod p^k0 only, k0 = 3 for sc/sq at
    p = 2, else 1.  Split the solutions z of Q(z) = X (z the completed
    variable, T5): those with z != 0 mod p have gradient 2Sz of valuation
    k0 // 2 and lift evenly from mod p^k0: density prim(X) = (N_k0 - R)/p^{k0(r-1)},
    R the solutions mod p^k0 in the class z = 0 mod p.  That class is the one
    point x = -c mod p of the model when k0 = 1 (R = [p | X]); for sc_t at 2
    it is y_i = (2i+1-t)/2 mod 2 (c_i = (2i+1-t)/(2t), t odd), for sq_t y = 0.
    Those with z = p z' give Q(z') = X/p^2: density p^{2-r} beta(X/p^2), only
    if p^2 | X.  So beta(X) = sum_i p^{i(2-r)} prim(X/p^{2i}) while p^{2i} | X."""
    k0 = 3 if p == 2 and fam.kind != "c" else 1
    y0 = [((2 * i + 1 - fam.t) // 2) % 2 if fam.kind == "sc" else 0 for i in range(fam.r)]
    total, scale = Fr(0), Fr(1)
    while True:
        y = X - fam.delta        # the model's argument n at this level, mod p^k0
        n = y.numerator * pow(y.denominator, -1, p ** k0) % p ** k0
        R = fam.count(p, 3, n, field, y0) if k0 == 3 else Fr(int(vp(X, p) >= 1), p ** (fam.r - 1))
        total += scale * (fam.count(p, k0, n, field) - R)
        if vp(X, p) < 2:
            return total
        X, scale = X / p ** 2, scale * Fr(p) ** (2 - fam.r)


# --------------------------------------------------------------- the tail --
def per_prime_d(r, q):
    """|beta_q - 1| <= d_q for odd q not dividing t (docs/MATH.md §4, T4):
    r even, w = r/2: beta = (1 - chi q^-w) sum_{i<=v} (chi q^{1-w})^i, so
      |beta - 1| <= sum_{i>=1} q^{i(1-w)} + q^-w sum_{i>=0} q^{i(1-w)}
                  = (q^{1-w} + q^{-w}) / (1 - q^{1-w});
    r odd: beta = 1 + sum_{j=1}^{v+1} a_j, |a_j| <= q^{-j(r-2)/2} for even
      j <= v and |a_{v+1}| <= q^{(v+1)(1-r/2)-1/2} <= q^{(1-r)/2}, so
      |beta - 1| <= q^{(1-r)/2} + q^{2-r} / (1 - q^{2-r})."""
    q = Fr(q)
    if r % 2 == 0:
        w = r // 2
        return (q ** (1 - w) + q ** (-w)) / (1 - q ** (1 - w))
    return q ** ((1 - r) // 2) + q ** (2 - r) / (1 - q ** (2 - r))


@lru_cache(maxsize=64)
def tail_log_bound(r, Q, P, kbits):
    """S >= sum_{q > Q prime} log((1+d_q)/(1-d_q)) >= |log prod_{q>Q} rho_q|
    (rho_q = beta_F/beta_G in [(1-d)/(1+d), (1+d)/(1-d)], same r for F, G).
    Explicit primes Q < q <= P; beyond P a bound by the integral.
    (kbits is KBITS[0], a key of the cache.)"""
    need(r >= 5, "/weight", "the tail converges absolutely only for w > 2")
    S, unit = Fr(0), 1 << (kbits + 8 * r)   # terms ~ q^{1-w}: round finer for large r
    for q in primes_upto(P):
        if q > Q:
            d = per_prime_d(r, q)
            need(d < 1, "/tail", "per-prime bound not below 1 at q = %d" % q)
            S += Fr(math.ceil(2 * artanh_up(d) * unit), unit)
    # Beyond P: for real x >= P, d(x) <= c1 x^-a1 + c2 x^-a2 (the formula of
    # per_prime_d with its denominator bounded at x = P) and
    # log((1+d)/(1-d)) = 2 artanh d <= 2d/(1-d^2) <= 2d/(1-d_P^2) =: g(x),
    # g decreasing.  Primes q > P >= 5 are prime to 6; in each block
    # (P+6k, P+6k+6] there are two integers prime to 6, both >= P+1+6k, so
    # sum_{q>P} g(q) <= 2 sum_{k>=0} g(P+1+6k) <= 2 g(P) + (1/3) int_P^oo g,
    # and int_P^oo x^-a dx = P^{1-a}/(a-1) for a > 1.
    Pf = Fr(P)
    if r % 2 == 0:
        w = r // 2
        c = 1 / (1 - Pf ** (1 - w))
        terms = [(c, w - 1), (c, w)]
    else:
        terms = [(Fr(1), (r - 1) // 2), (1 / (1 - Pf ** (2 - r)), r - 2)]
    dP = sum(cf * Pf ** (-a) for cf, a in terms)
    need(dP < 1, "/tail", "bound at P not below 1")
    scale = 2 / (1 - dP * dP)
    g_P = scale * dP
    integral = scale * sum(cf * Pf ** (1 - a) / (a - 1) for cf, a in terms)
    return rnd_up(S + 2 * g_P + integral / 3)


# ------------------------------------------------------- common top level --
COMMON = ("format", "digest", "provenance", "F", "G", "ap", "ap2", "weight", "verdict",
          "precision_bits", "Q_max", "theorems")


def check_common(c):
    F, G = Family(c["F"], "/F"), Family(c["G"], "/G")
    need(F.r == G.r, "/G", "F and G must have the same rank (weight)")
    w = get_rat(c, "weight", "/weight")
    need(w == Fr(F.r, 2), "/weight", "is not r/2 = %s" % Fr(F.r, 2))
    aps = []
    for k in ("ap", "ap2"):
        keys(c[k], "/" + k, ("A", "B"))
        aps.append((get_int(c[k], "A", "/%s/A" % k, 1, 10 ** 12),
                    get_int(c[k], "B", "/%s/B" % k, 0, 10 ** 12)))
    prec = get_int(c, "precision_bits", "/precision_bits", 64, 4096)
    qmax = get_int(c, "Q_max", "/Q_max", 3, 1000)
    pv = c["provenance"]
    keys(pv, "/provenance", ("program", "version", "command", "date"))
    need(pv["program"] == "circlet", "/provenance/program", "must be circlet")
    need(pv["version"] in VERSIONS, "/provenance/version", "not one of %s" % (VERSIONS,))
    (A, B), (A2, B2) = aps
    cmd = "circlet certify %s %s --ap %d,%d --ap2 %d,%d --qmax %d --prec %d" % (
        c["F"], c["G"], A, B, A2, B2, qmax, prec)
    need(pv["command"] == cmd, "/provenance/command", "expected %r" % cmd)
    d = pv["date"]
    ok = type(d) is str and re.fullmatch(r"[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}Z", d)
    try:
        ok = ok and datetime.datetime.strptime(d, "%Y-%m-%dT%H:%M:%SZ").year >= 1
    except ValueError:
        ok = False
    need(ok, "/provenance/date", "not a date-time YYYY-MM-DDTHH:MM:SSZ")
    KBITS[0] = max(320, prec // 2 + 64)
    return F, G, w, aps, prec


def check_theorems(c, want):
    need(c["theorems"] == want, "/theorems", "must be exactly %s" % want)


def check_lambda(c, F, G, aps, field):
    """X_G(n) = lam X_F(n) for every n: A2 = lam A and B2 + D_G = lam (B + D_F);
    the discriminant product det S_F det S_G (times lam for odd r: the
    character of odd rank involves the unit part of X) must be a square."""
    (A, B), (A2, B2) = aps
    lam = get_rat(c, "lambda", field + "/lambda")
    need(lam == Fr(A2, A) and G.X(B2) == lam * F.X(B), field + "/lambda",
         "X_G is not lambda X_F")
    disc = F.det * G.det * (lam if F.r % 2 else 1)
    need(get_rat(c, "discriminant_product", field + "/discriminant_product") == disc,
         field + "/discriminant_product", "expected %s" % disc)
    root = rat_sqrt(disc)
    need(root is not None, field + "/discriminant_product", "is not a rational square")
    return lam, sorted({2, 3} | prime_factors(F.t) | prime_factors(G.t) |
                       prime_factors(lam.numerator) | prime_factors(lam.denominator))


# ------------------------------------------------------ NON-CONVERGENT --
def check_nonconvergent(c, F, G, w, aps, prec, say):
    keys(c, "", COMMON + ("Q", "distinguishing_prime", "modulus", "modulus_factors",
                          "sigma_constant", "power_factor", "tail", "classes", "disjoint"))
    check_theorems(c, THEOREMS)
    need(w > 2, "/weight", "must exceed 2")
    (A, B), (A2, B2) = aps
    Q = get_int(c, "Q", "/Q", 3, c["Q_max"])
    need(is_prime(Q), "/Q", "not a prime")
    ps = primes_upto(Q)
    # --- sigma constant, power factor (T3)
    sc = c["sigma_constant"]
    keys(sc, "/sigma_constant", ("square", "ball"))
    sq = G.det / F.det
    need(get_rat(sc, "square", "/sigma_constant/square") == sq, "/sigma_constant/square",
         "is not det S_G / det S_F = %s" % sq)
    sig = sqrt_bounds(sq)
    check_ball(sc["ball"], "/sigma_constant/ball", prec, sig)
    pf = c["power_factor"]
    keys(pf, "/power_factor", ("base", "exponent", "n0", "limit", "for_n_ge_n0"))
    base = Fr(A, A2)
    need(get_rat(pf, "base", "/power_factor/base") == base, "/power_factor/base", "is not A/A2")
    need(get_rat(pf, "exponent", "/power_factor/exponent") == w - 1,
         "/power_factor/exponent", "is not w - 1")
    need(pf["n0"] == "1000", "/power_factor/n0", "must be \"1000\"")
    n0 = 1000
    plim = pow_bounds(base, w - 1)
    check_ball(pf["limit"], "/power_factor/limit", prec, plim)
    # y(n) = X_F(An+B)/X_G(A2 n+B2) is a Moebius function of n with its pole
    # at n < 0, hence monotone on n >= 0: for n >= n0 it lies between y(n0)
    # and its limit A/A2, and so does y^{w-1} (w - 1 > 0).
    y0 = F.X(A * n0 + B) / G.X(A2 * n0 + B2)
    prange = (pow_bounds(min(y0, base), w - 1)[0], pow_bounds(max(y0, base), w - 1)[1])
    check_ball(pf["for_n_ge_n0"], "/power_factor/for_n_ge_n0", prec, prange)
    # --- the tail prod_{q > Q} rho_q (docs/MATH.md §7.2, own derivation)
    tl = c["tail"]
    route = tl.get("route") if isinstance(tl, dict) else None
    need(route in ("bound", "proportional"), "/tail/route", "must be bound or proportional")
    extra = ("lambda", "discriminant_product") if route == "proportional" else ()
    keys(tl, "/tail", ("route", "explicit_primes_up_to", "log_bound", "interval") + extra)
    need(get_int(tl, "explicit_primes_up_to", "/tail/explicit_primes_up_to") == Q2,
         "/tail/explicit_primes_up_to", "must be %d" % Q2)
    if route == "proportional":
        # rho_q = 1 for every q > Q when X_G = lam X_F (T4, docs/MATH.md §7.4)
        lam, special = check_lambda(tl, F, G, aps, "/tail")
        need(special[-1] <= Q, "/tail/lambda", "the special primes %s must be <= Q" % special)
        tail = near = (Fr(1), Fr(1))
        check_ball(tl["log_bound"], "/tail/log_bound", prec, (Fr(0), Fr(0)))
    else:
        S = tail_log_bound(F.r, Q, Q2, KBITS[0])
        lb = parse_ball(tl["log_bound"], "/tail/log_bound", prec)
        # The stored S (another derivation, widened by certify) must not lie
        # below the checker's own bound; soundness rests on the containments
        # of [e^-S, e^S] below, computed from the checker's own S.
        need(S <= lb[1], "/tail/log_bound",
             "below the checker's own bound S = %.17g" % float(S))
        need(0 < lb[1] - lb[0] <= (abs(lb[1]) + 1) / 2 ** 39, "/tail/log_bound",
             "ball not tight, or of radius 0 (S, a sum of logarithms, is computed, never exact)")
        say("tail: own S <= %.17g, certificate %.17g" % (float(S), float(lb[0])))
        tail = (exp_bounds(-S)[0], exp_bounds(S)[1])       # contains the truth
        Sm = (lb[0] + lb[1]) / 2                             # the program's S
        near = (exp_bounds(-Sm)[0], exp_bounds(Sm)[1])
    ti = check_ball(tl["interval"], "/tail/interval", prec, tail, near)
    if route != "proportional":  # the interval is that of the stored S: e^-Sm <= e^-Sm hi bound, etc.
        need(ti[0] <= exp_bounds(-Sm)[1] and exp_bounds(Sm)[0] <= ti[1], "/tail/interval",
             "is not [e^-S, e^S] for the stored /tail/log_bound")
    # --- modulus M = prod_{q <= Q} q^e_q (docs/MATH.md §7.1)
    mf, cl = c["modulus_factors"], c["classes"]
    need(isinstance(mf, list) and len(mf) == len(ps), "/modulus_factors",
         "must hold one entry per prime <= Q")
    need(isinstance(cl, list) and len(cl) == 2, "/classes", "must hold two classes")
    M, E = 1, []
    for i, (f, p) in enumerate(zip(mf, ps)):
        fl = "/modulus_factors/%d" % i
        keys(f, fl, ("p", "e"))
        need(get_int(f, "p", fl + "/p") == p, fl + "/p", "expected %d" % p)
        e = get_int(f, "e", fl + "/e", 0, 64)
        need(p ** e <= MAX_PRIME_POWER, fl + "/e", "prime power beyond the checker's limit")
        M *= p ** e
        E.append(e)
    need(get_nat(c, "modulus", "/modulus", 2 ** 64 ** 2) == M, "/modulus",
         "is not prod p^e = %d" % M)
    limits, facs, exps = [], [], []
    for ci, k in enumerate(cl):
        fl = "/classes/%d" % ci
        keys(k, fl, ("residue", "local_factors", "pinned_product", "limit_interval",
                     "interval_n_ge_n0"))
        res = get_nat(k, "residue", fl + "/residue", M - 1)
        lf = k["local_factors"]
        need(isinstance(lf, list) and len(lf) == len(ps), fl + "/local_factors",
             "needs one entry per prime <= Q")
        prod, es = Fr(1), []
        for li, (f, p) in enumerate(zip(lf, ps)):
            g = "%s/local_factors/%d" % (fl, li)
            keys(f, g, ("p", "e", "residue", "beta_F", "beta_G", "rho"))
            need(get_int(f, "p", g + "/p") == p, g + "/p", "expected %d" % p)
            e = get_int(f, "e", g + "/e", 0, E[li])
            es.append(e)
            need(get_nat(f, "residue", g + "/residue", p ** e - 1) == res % p ** E[li],
                 g + "/residue", "is not the class residue mod p^E")
            rf = res % p ** e
            bF = beta_on_class(F, p, A, B, rf, e, g + "/beta_F")
            bG = beta_on_class(G, p, A2, B2, rf, e, g + "/beta_G")
            need(get_rat(f, "beta_F", g + "/beta_F") == bF, g + "/beta_F", "counting gives %s" % bF)
            need(get_rat(f, "beta_G", g + "/beta_G") == bG, g + "/beta_G", "counting gives %s" % bG)
            need(bG != 0, g + "/beta_G", "is zero: no main term for G")
            need(get_rat(f, "rho", g + "/rho") == bF / bG, g + "/rho", "is not beta_F/beta_G")
            prod *= bF / bG
            say("class %d p=%d: beta_F=%s beta_G=%s on n = %d mod %d (pinned, counted)"
                % (ci, p, bF, bG, rf, p ** e))
        need(get_rat(k, "pinned_product", fl + "/pinned_product") == prod,
             fl + "/pinned_product", "is not prod rho_p = %s" % prod)
        # limit on the class (docs/MATH.md §7.3): C_sigma (A/A2)^{w-1} prod rho [e^-S, e^S]
        limits.append(check_ball(k["limit_interval"], fl + "/limit_interval", prec,
                                 imul(sig, plim, (prod, prod), tail),
                                 bmul(sig, plim, (prod, prod), near)))
        check_ball(k["interval_n_ge_n0"], fl + "/interval_n_ge_n0", prec,
                   imul(sig, prange, (prod, prod), tail), bmul(sig, prange, (prod, prod), near))
        facs.append(lf)
        exps.append(es)
    need([max(a, b) for a, b in zip(*exps)] == E, "/modulus_factors",
         "e is not the larger of the classes' exponents")
    need(cl[0]["residue"] != cl[1]["residue"], "/classes/1/residue", "the two residues coincide")
    (a, b), (a2, b2) = limits
    need(c["disjoint"] is True, "/disjoint", "must be true")
    need(b < a2 or b2 < a, "/classes", "the limit intervals overlap")
    diff = [p for p, f0, f1 in zip(ps, facs[0], facs[1]) if f0 != f1]
    dp = get_int(c, "distinguishing_prime", "/distinguishing_prime", 2, 1000)
    need(diff == [dp], "/distinguishing_prime",
         "must be the only prime where the local factors differ (they differ at %s)" % diff)
    i = ps.index(dp)
    need(Fr(facs[0][i]["rho"]) > Fr(facs[1][i]["rho"]), "/classes",
         "canonical order: the class with the larger rho at distinguishing_prime comes first")


# ------------------------------------------------------------- CONSTANT --
def check_constant(c, F, G, w, aps, prec, say):
    route = c.get("constant_route")
    need(route in ("identical", "proportional"), "/constant_route", "unknown route")
    extra = ("lambda", "discriminant_product", "finite_primes") if route == "proportional" else ()
    keys(c, "", COMMON + ("constant_route", "constant") + extra)
    (A, B), (A2, B2) = aps
    if route == "identical":
        check_theorems(c, [])
        need(c["F"] == c["G"] and aps[0] == aps[1], "/constant_route", "F, ap differ from G, ap2")
        square = Fr(1)
    else:
        check_theorems(c, THEOREMS)
        need(w > 2, "/weight", "must exceed 2")
        lam, special = check_lambda(c, F, G, aps, "")
        fp = c["finite_primes"]
        need(isinstance(fp, list) and len(fp) == len(special), "/finite_primes",
             "must list exactly the primes %s" % special)
        total = Fr(1)
        for i, (ent, p) in enumerate(zip(fp, special)):
            fl = "/finite_primes/%d" % i
            keys(ent, fl, ("p", "rho", "classes"))
            need(get_int(ent, "p", fl + "/p") == p, fl + "/p", "expected %d" % p)
            rho = get_rat(ent, "rho", fl + "/rho")
            cls = ent["classes"]
            need(isinstance(cls, list) and 1 <= len(cls) <= 4096, fl + "/classes",
                 "needs 1 to 4096 classes")
            es = []
            for j, k in enumerate(cls):
                g = "%s/classes/%d" % (fl, j)
                keys(k, g, ("e", "residue", "beta_F", "beta_G"))
                e = get_int(k, "e", g + "/e", 0, 64)
                need(p ** e <= MAX_PRIME_POWER, g + "/e", "prime power beyond the checker's limit")
                res = get_nat(k, "residue", g + "/residue", p ** e - 1)
                es.append((e, res))
                bF = beta_on_class(F, p, A, B, res, e, g + "/beta_F")
                bG = beta_on_class(G, p, A2, B2, res, e, g + "/beta_G")
                need(get_rat(k, "beta_F", g + "/beta_F") == bF, g + "/beta_F", "counting gives %s" % bF)
                need(get_rat(k, "beta_G", g + "/beta_G") == bG, g + "/beta_G", "counting gives %s" % bG)
                need(bG != 0 and bF / bG == rho, g, "beta_F/beta_G is not rho = %s" % rho)
            need(es == sorted(es), fl + "/classes", "not in ascending (e, residue) order")
            # the classes partition Z: sum p^-e = 1 and no two overlap
            need(sum(Fr(1, p ** e) for e, _ in es) == 1, fl + "/classes", "do not partition Z")
            Emax = max(e for e, _ in es)
            hit = bytearray(p ** Emax)
            for e, res in es:
                for n in range(res, p ** Emax, p ** e):
                    need(not hit[n], fl + "/classes", "overlap")
                    hit[n] = 1
            total *= rho
            say("p=%d: rho=%s on %d pinned classes (counted)" % (p, rho, len(cls)))
        # M_F/M_G = sqrt(det S_G/det S_F) (A/A2)^{w-1} prod_p rho_p exactly (T3, T4)
        square = G.det / F.det * Fr(A, A2) ** (F.r - 2) * total ** 2
    k = c["constant"]
    keys(k, "/constant", ("square", "value", "interval", "contains_integer", "integer"))
    need(get_rat(k, "square", "/constant/square") == square, "/constant/square",
         "expected %s" % square)
    value = get_rat(k, "value", "/constant/value")
    need(value > 0 and value * value == square, "/constant/value", "value^2 is not square")
    check_ball(k["interval"], "/constant/interval", prec, (value, value))
    is_int = value.denominator == 1
    need(k["contains_integer"] is is_int, "/constant/contains_integer", "expected %s" % is_int)
    if is_int:
        need(get_nat(k, "integer", "/constant/integer", value) == value, "/constant/integer",
             "expected %s" % value)
    else:
        need(k["integer"] is None, "/constant/integer", "must be null")


def rat_sqrt(x):
    ra, rb = math.isqrt(x.numerator), math.isqrt(x.denominator)   # x >= 0 here
    return Fr(ra, rb) if ra * ra == x.numerator and rb * rb == x.denominator else None


def prime_factors(n):
    out, d = set(), 2
    while d * d <= n:
        while n % d == 0:
            out.add(d)
            n //= d
        d += 1
    return out | ({n} if n > 1 else set())


# ------------------------------------------------------------------ main --
def check(cert, say=lambda s: None):
    need(isinstance(cert, dict), "", "must be a JSON object")
    need(depth(cert) <= 16, "", "nesting deeper than 16")
    need(cert.get("format") == FORMAT, "/format", "must be %s" % FORMAT)
    for k in COMMON:
        need(k in cert, "/" + k, "missing field")
    MAX_WORK[1] = 0
    F, G, w, aps, prec = check_common(cert)
    v = cert["verdict"]
    if v == "NON-CONVERGENT":
        check_nonconvergent(cert, F, G, w, aps, prec, say)
    elif v == "CONSTANT":
        check_constant(cert, F, G, w, aps, prec, say)
    elif v == "UNDECIDED":    # claims nothing: only its form and digest are checked
        keys(cert, "", COMMON)
        check_theorems(cert, [])
    else:
        raise Reject("/verdict: unknown verdict %r" % (v,))
    # last, so that an edit that breaks a claim is named by the claim
    need(cert["digest"] == digest_of(cert), "/digest", "does not match the content")
    return v


def main(argv):
    args = [a for a in argv[1:] if a != "-v"]
    say = (lambda s: print("ok: " + s)) if "-v" in argv[1:] else (lambda s: None)
    if len(args) != 1:
        print("usage: circlet_check.py CERT.json [-v]")
        return 2
    try:
        with open(args[0], "rb") as fh:
            raw = fh.read(MAX_FILE + 1)
        need(len(raw) <= MAX_FILE, "", "file larger than 4 MiB")
        try:
            cert = load_strict(raw.decode("utf-8"))
        except ValueError as e:
            print("malformed: %s" % e)
            return 2
        v = check(cert, say)
        print("accepted (%s)" % ("UNDECIDED: claims nothing" if v == "UNDECIDED" else v))
        return 0
    except Reject as e:
        print("rejected: %s" % e)
        return 1
    except Exception as e:   # never a traceback
        print("malformed: %s: %s" % (type(e).__name__, e))
        return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
