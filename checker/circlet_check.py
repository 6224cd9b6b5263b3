#!/usr/bin/python3
"""circlet_check.py -- an independent checker of circlet certificates.

Usage:  circlet_check.py CERT.json [-v]
Exit 0 and "accepted"; exit 1 and "rejected: <field>: <reason>"; exit 2 and
"malformed: ..." when the input cannot be read at all.  Never a traceback.

Written from the mathematics (docs/MATH.md) and the certificate format
(docs/certificate-format.md) alone; it shares no code with the C++ program.

WHAT THIS PROGRAM TRUSTS (and nothing else):
  T1. Python's int and fractions.Fraction (exact integer/rational arithmetic),
      math.isqrt, hashlib.sha256, the json parser of the standard library.
  T2. docs/MATH.md §2: the quadratic models
        c_t(n)  = #{x in Z^t : sum x = 0, (t/2) sum x_i^2 + sum i x_i = n},
        sc_t(n) = #{y in Z^m : t sum y_i^2 + sum (2i+1-t) y_i = n}, m = t//2,
      their rank r, det S and shift Delta (X = n + Delta).
  T3. docs/MATH.md §3, §7: M(n) = sigma_inf(X) prod_p beta_p(n) with
      sigma_inf = pi^{r/2} X^{r/2-1} / (Gamma(r/2) sqrt(det S)), so for two
      families of the same rank the ratio of the sigma_inf is
      sqrt(det S_G / det S_F) (X_F/X_G)^{w-1}: no pi and no Gamma are needed.
  T4. docs/MATH.md §4 closed forms of beta_q for odd q not dividing t, used
      ONLY to bound |beta_q - 1| in the tail (q > Q); every beta_p that a
      certificate states is recounted here, never taken from a formula.
  T5. Hensel's lemma (common practice; docs/MATH.md §4, §7.1): for the
      completed form Q(z) = X, a solution mod p^j whose gradient has valuation
      k with j >= 2k+1 has exactly p^{r-1} lifts mod p^{j+1}.  With the
      gradient 2Sz this gives: beta_p = N_j / p^{j(r-1)} for every
      j >= v_p(X) + 1 (p odd, p not dividing t; also c_t at p = 2, t odd,
      where 2S = t(I+J) is unimodular) and j >= v_p(X) + 3 (sc_t at p = 2,
      t odd, gradient 2tz); for p | t the model is linear mod p with a unit
      coefficient, so beta_p = N_1 / p^{r-1} (= 1).  N_j(n) depends only on n
      mod p^j.  (Stability is re-tested by test_circlet_check.py.)
  T6. The published theorems cited in the certificate (Siegel, Hecke,
      Deligne): main term = Eisenstein part, cusp part o(main term) for w > 2.
"""
import hashlib
import json
import math
import re
import sys
from fractions import Fraction as Fr
from functools import lru_cache

# ----------------------------------------------------------------- limits --
# Every loop below is bounded by these; an input beyond them is refused.
MAX_T = 64             # family parameter t
MAX_Q = 1000           # pinned primes q <= Q
MAX_PRIME_POWER = 1 << 20
MAX_COUNT_MOD_SC = 4096   # counting modulus p^j for sc_t (cost m p^{2j})
MAX_COUNT_MOD_C = 128     # counting modulus p^j for c_t (cost t p^{3j})
MAX_EXPLICIT = 10 ** 6    # explicit primes in the tail sum
MAX_INT = 10 ** 30        # A, B, n0, residues, mantissas
MAX_BIN_EXP = 4096        # |e| in m*2^e
KBITS = 320               # working precision of the outward rounding (2^-K)


class Reject(Exception):
    """A claim of the certificate is false or unproved: names the field."""


def need(cond, field, why):
    if not cond:
        raise Reject("%s: %s" % (field, why))


# ------------------------------------------------------------ strict JSON --
def _pairs(pairs):
    d = {}
    for k, v in pairs:
        need(k not in d, k, "duplicate key")
        d[k] = v
    return d


def _no_float(s):
    raise Reject("number %s: floats are not allowed in a certificate" % s)


def load_strict(text):
    return json.loads(text, object_pairs_hook=_pairs, parse_float=_no_float,
                      parse_constant=_no_float)


def digest_of(cert):
    body = {k: v for k, v in cert.items() if k != "digest"}
    canon = json.dumps(body, sort_keys=True, separators=(",", ":"),
                       ensure_ascii=False)
    return "sha256:" + hashlib.sha256(canon.encode("utf-8")).hexdigest()


def keys(obj, field, required, optional=()):
    need(isinstance(obj, dict), field, "must be an object")
    for k in obj:
        need(k in required or k in optional, field + "." + k, "unknown field")
    for k in required:
        need(k in obj, field + "." + k, "missing field")


def get_int(obj, k, field, lo=0, hi=MAX_INT):
    v = obj[k]
    if type(v) is str:        # integers may be written as decimal strings
        need(re.fullmatch(r"-?(0|[1-9][0-9]{0,40})", v) is not None,
             field, "not an integer")
        v = int(v)
    need(type(v) is int, field, "not an integer")
    need(lo <= v <= hi, field, "out of range [%d, %d]" % (lo, hi))
    return v


def get_rat(obj, k, field):
    v = obj[k]
    need(type(v) is str and re.fullmatch(r"-?(0|[1-9][0-9]{0,2000})(/[1-9][0-9]{0,2000})?", v)
         is not None, field, "not a rational p/q")
    x = Fr(v)
    need(str(x) == v, field, "rational not in lowest terms")
    return x


def get_str(obj, k, field):
    need(type(obj[k]) is str, field, "not a string")
    return obj[k]


# ------------------------------------------------------------------ balls --
def parse_ball(obj, field):
    """A ball {mid, rad[, decimal]} -> exact interval (lo, hi)."""
    keys(obj, field, ("mid", "rad"), ("decimal",))
    out = []
    for k in ("mid", "rad"):
        m = re.fullmatch(r"(-?[0-9]{1,2000})\*2\^(-?[0-9]{1,6})", str(obj[k]))
        need(type(obj[k]) is str and m is not None, field + "." + k, "not m*2^e")
        e = int(m.group(2))
        need(abs(e) <= MAX_BIN_EXP, field + "." + k, "exponent too large")
        out.append(Fr(int(m.group(1))) * Fr(2) ** e)
    mid, rad = out
    need(rad >= 0, field + ".rad", "negative radius")
    lo, hi = mid - rad, mid + rad
    if "decimal" in obj:   # display text: reading it back must enclose the ball
        s = get_str(obj, "decimal", field + ".decimal")
        m = re.fullmatch(r"\[(?:([-+0-9.e]{1,60}) )?\+/- ([-+0-9.e]{1,60})\]", s)
        need(m is not None, field + ".decimal", "not [m +/- r]")
        try:
            dm, dr = Fr(m.group(1) or "0"), Fr(m.group(2))
        except (ValueError, ZeroDivisionError):
            raise Reject(field + ".decimal: not a decimal number")
        need(dm - dr <= lo and hi <= dm + dr, field + ".decimal",
             "does not enclose the exact ball")
    return lo, hi


def contains(ball, inner, field, what):
    need(ball[0] <= inner[0] and inner[1] <= ball[1], field,
         "does not contain the checker's enclosure of %s" % what)


def imul(a, b):
    """Product of two intervals of non-negative numbers."""
    need(a[0] >= 0 and b[0] >= 0, "interval", "negative factor")
    return a[0] * b[0], a[1] * b[1]


# ---------------------------------------------- exact bounds for functions --
def rnd_down(x):
    return Fr(math.floor(x * (1 << KBITS)), 1 << KBITS)


def rnd_up(x):
    return Fr(math.ceil(x * (1 << KBITS)), 1 << KBITS)


def sqrt_bounds(x):
    """lo <= sqrt(x) <= hi for rational x >= 0.
    With s = isqrt(a b 4^K) (so s^2 <= a b 4^K < (s+1)^2):
    s/(b 2^K) <= sqrt(a/b) = sqrt(ab)/b < (s+1)/(b 2^K)."""
    a, b = x.numerator, x.denominator
    s = math.isqrt(a * b << (2 * KBITS))
    return Fr(s, b << KBITS), Fr(s + 1, b << KBITS)


def exp_bounds(x):
    """lo <= exp(x) <= hi for rational x with |x| <= 64.
    Halve: y = x/2^h with |y| <= 1/2.  Taylor with N terms: for |y| <= 1/2
    |exp(y) - sum_{k<N} y^k/k!| <= 2 |y|^N / N!  (geometric tail, ratio <= 1/2),
    then exp(x) = exp(y)^(2^h), squaring positive lower/upper bounds."""
    need(abs(x) <= 64, "exp", "argument too large")
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
        if rem < Fr(1, 1 << (KBITS + 8)):
            break
    lo, hi = rnd_down(s - rem), rnd_up(s + rem)
    for _ in range(h):                # exp(2y) = exp(y)^2, all bounds > 0
        lo, hi = rnd_down(lo * lo), rnd_up(hi * hi)
    return lo, hi


def pow_bounds(base, expo):
    """Bounds for base^expo, base > 0 rational, expo >= 0 an integer or a
    half-integer: base^(k/2) = base^floor(k/2) * sqrt(base)^(k mod 2)."""
    need(base > 0 and expo >= 0 and (2 * expo).denominator == 1, "power",
         "unsupported power")
    k = int(2 * expo)
    p = base ** (k // 2)
    if k % 2 == 0:
        return p, p
    lo, hi = sqrt_bounds(base)
    return p * lo, p * hi


def artanh_up(d):
    """artanh d = sum_k d^{2k+1}/(2k+1) <= d + (d^3/3) sum_k d^{2k}
    = d + d^3/(3(1-d^2)) for 0 <= d < 1; so log((1+d)/(1-d)) <= 2 times it."""
    return d + d ** 3 / (3 * (1 - d * d))


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
    v, a, b = 0, x.numerator, x.denominator
    while a % p == 0:
        a //= p
        v += 1
    while b % p == 0:
        b //= p
        v -= 1
    return v


class Family:
    """c_t or sc_t with the data of docs/MATH.md §2 (trusted, T2)."""

    def __init__(self, name, field):
        m = re.fullmatch(r"(c|sc)([1-9][0-9]{0,2})", str(name))
        need(m is not None, field, "not a family c<t> or sc<t>")
        self.kind, self.t = m.group(1), int(m.group(2))
        need(2 <= self.t <= MAX_T, field, "t out of range")
        t = self.t
        if self.kind == "c":
            self.r = t - 1
            self.det = Fr(t, 2) ** (t - 1) * t
            self.delta = Fr(t * t - 1, 24)
        else:
            self.r = t // 2
            self.det = Fr(t) ** self.r
            self.delta = Fr(self.r * (self.r + 1), 6) if t % 2 else Fr(t * t - 1, 24)

    def X(self, N):
        return N + self.delta

    def count(self, p, j, N, field):
        """N_j(N) = #{solutions mod p^j of the model = N}; returns
        beta = N_j / p^{j(r-1)} (docs/MATH.md §3, c_t: x in (Z/p^j)^t with
        sum x = 0, normalised by p^{j(t-2)}).  Histogram convolution."""
        M = p ** j
        t = self.t
        if self.kind == "sc":
            need(M <= MAX_COUNT_MOD_SC, field, "counting modulus %d beyond limit" % M)
            dist = [1] + [0] * (M - 1)
            for i in range(self.r):
                new = [0] * M
                for y in range(M):
                    v = (t * y * y + (2 * i + 1 - t) * y) % M
                    new = list(map(int.__add__, new, dist[-v:] + dist[:-v] if v else dist))
                dist = new
            return Fr(dist[N % M], M ** (self.r - 1))
        need(M <= MAX_COUNT_MOD_C, field, "counting modulus %d beyond limit" % M)
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

    def stable_level(self, p, N, step_val, field):
        """(j, pinned): beta_p(n) = N_j(.)/p^{j(r-1)} for all n in the class,
        whose arguments are N + (multiples of p^step_val) (T5)."""
        if self.t % p == 0:
            return 1, True
        X = self.X(N)
        v = vp(X, p)
        need(v >= 0, field, "X not p-integral (model data inconsistent)")
        j = v + (3 if (p == 2 and self.kind == "sc") else 1)
        # the class moves X by multiples of p^step_val: v_p(X) and X mod p^j
        # are constant on the class iff step_val >= j.
        return j, step_val >= j


def beta_on_class(fam, p, A, B, res, e, field):
    """beta_p of fam at A n + B for every n = res mod p^e, or Reject."""
    j, ok = fam.stable_level(p, A * res + B, vp(A, p) + e, field)
    need(ok, field, "beta_p is not pinned by n mod p^e (needs v_p(A) + e >= %d)" % j)
    return fam.count(p, j, A * res + B, field)


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
def tail_log_bound(r, Q, P):
    """S >= sum_{q > Q prime} log((1+d_q)/(1-d_q)) >= |log prod_{q>Q} rho_q|
    (rho_q = beta_F/beta_G in [(1-d)/(1+d), (1+d)/(1-d)], same r for F, G).
    Explicit primes Q < q <= P; beyond P a bound by the integral."""
    need(r >= 5, "weight", "the tail converges absolutely only for w > 2")
    S = Fr(0)
    for q in primes_upto(P):
        if q > Q:
            d = per_prime_d(r, q)
            need(d < 1, "tail", "per-prime bound not below 1 at q = %d" % q)
            S += rnd_up(2 * artanh_up(d))
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
    need(dP < 1, "tail", "bound at P not below 1")
    scale = 2 / (1 - dP * dP)
    g_P = scale * dP
    integral = scale * sum(cf * Pf ** (1 - a) / (a - 1) for cf, a in terms)
    return rnd_up(S + 2 * g_P + integral / 3)


# ------------------------------------------------------- common top level --
TOP_COMMON = ("F", "G", "ap", "ap2", "format", "precision_bits", "provenance",
              "reason", "theorems", "verdict", "weight")
OPTIONAL_TOP = ("digest",)


def check_common(c):
    F, G = Family(c["F"], "F"), Family(c["G"], "G")
    need(F.r == G.r, "G", "F and G must have the same rank")
    w = get_rat(c, "weight", "weight")
    need(w == Fr(F.r, 2), "weight", "is not r/2 = %s" % Fr(F.r, 2))
    aps = []
    for k in ("ap", "ap2"):
        keys(c[k], k, ("A", "B"))
        A = get_int(c[k], "A", k + ".A", 1)
        B = get_int(c[k], "B", k + ".B", 0)
        aps.append((A, B))
    prec = get_int(c, "precision_bits", "precision_bits", 2, 1 << 20)
    pv = c["provenance"]
    keys(pv, "provenance", ("command", "date", "precision_bits", "program", "version"))
    for k in ("command", "date", "program", "version"):
        get_str(pv, k, "provenance." + k)
    need(get_int(pv, "precision_bits", "provenance.precision_bits", 2, 1 << 20) == prec,
         "provenance.precision_bits", "differs from precision_bits")
    get_str(c, "reason", "reason")
    check_theorems(c["theorems"])
    return F, G, w, aps


THEOREM_NAMES = ("main term = Eisenstein part (Siegel)",
                 "cusp part is o(main term) for weight w > 2",
                 "local densities")


def check_theorems(th):
    need(isinstance(th, list) and len(th) == len(THEOREM_NAMES), "theorems",
         "must list exactly the %d theorems used" % len(THEOREM_NAMES))
    for i, (t, name) in enumerate(zip(th, THEOREM_NAMES)):
        f = "theorems[%d]" % i
        keys(t, f, ("citation", "name", "statement"))
        for k in ("citation", "name", "statement"):
            get_str(t, k, f + "." + k)
        need(t["name"] == name, f + ".name", "expected %r" % name)


def sigma_ratio(F, G):
    """sqrt(det S_G / det S_F) (T3): returns (square, (lo, hi))."""
    sq = G.det / F.det
    return sq, sqrt_bounds(sq)


# ------------------------------------------------------ NON-CONVERGENT --
def check_nonconvergent(c, F, G, w, aps, say):
    keys(c, "certificate", TOP_COMMON + ("Q", "Q_max", "classes", "disjoint",
         "distinguishing_prime", "modulus", "modulus_factors", "power_factor",
         "sigma_constant", "tail"), OPTIONAL_TOP)
    (A, B), (A2, B2) = aps
    Q = get_int(c, "Q", "Q", 2, MAX_Q)
    need(Q <= get_int(c, "Q_max", "Q_max", 2, MAX_Q), "Q", "exceeds Q_max")
    # --- modulus M = prod_{q <= Q} q^e_q (docs/MATH.md §7.1)
    mf = c["modulus_factors"]
    ps = primes_upto(Q)
    need(isinstance(mf, list) and len(mf) == len(ps), "modulus_factors",
         "must list every prime <= Q once, in order")
    M, pe = 1, []
    for i, (f, p) in enumerate(zip(mf, ps)):
        fl = "modulus_factors[%d]" % i
        keys(f, fl, ("e", "p"))
        need(get_int(f, "p", fl + ".p") == p, fl + ".p", "expected %d" % p)
        e = get_int(f, "e", fl + ".e", 0, 64)
        need(p ** e <= MAX_PRIME_POWER, fl + ".e", "prime power too large")
        M *= p ** e
        pe.append((p, e))
    need(get_int(c, "modulus", "modulus", 1) == M, "modulus", "is not prod p^e = %d" % M)
    # --- sigma constant and power factor (T3)
    sq, sig = sigma_ratio(F, G)
    sc = c["sigma_constant"]
    keys(sc, "sigma_constant", ("ball", "note", "square"))
    get_str(sc, "note", "sigma_constant.note")
    need(get_rat(sc, "square", "sigma_constant.square") == sq, "sigma_constant.square",
         "is not det S_G / det S_F = %s" % sq)
    contains(parse_ball(sc["ball"], "sigma_constant.ball"), sig, "sigma_constant.ball",
             "sqrt(det S_G/det S_F)")
    pf = c["power_factor"]
    keys(pf, "power_factor", ("base", "exponent", "for_n_ge_n0", "limit", "n0", "note"))
    get_str(pf, "note", "power_factor.note")
    base = Fr(A, A2)
    need(get_rat(pf, "base", "power_factor.base") == base, "power_factor.base", "is not A/A'")
    need(get_rat(pf, "exponent", "power_factor.exponent") == w - 1,
         "power_factor.exponent", "is not w - 1")
    n0 = get_int(pf, "n0", "power_factor.n0", 0)
    plim = pow_bounds(base, w - 1)
    contains(parse_ball(pf["limit"], "power_factor.limit"), plim, "power_factor.limit",
             "(A/A')^{w-1}")
    # x(n) = X_F(An+B)/X_G(A'n+B') is a Moebius function of n with its pole
    # at n < 0, hence monotone on n >= n0: it lies between x(n0) and A/A'.
    x0 = F.X(A * n0 + B) / G.X(A2 * n0 + B2)
    lo_b, hi_b = min(x0, base), max(x0, base)
    prange = (pow_bounds(lo_b, w - 1)[0], pow_bounds(hi_b, w - 1)[1])
    contains(parse_ball(pf["for_n_ge_n0"], "power_factor.for_n_ge_n0"), prange,
             "power_factor.for_n_ge_n0", "(X_F/X_G)^{w-1} for n >= n0")
    # --- tail over q > Q (docs/MATH.md §7.2, own derivation)
    tl = c["tail"]
    keys(tl, "tail", ("Q", "explicit_primes_up_to", "interval", "log_bound", "note",
                      "per_prime_bound"))
    for k in ("note", "per_prime_bound"):
        get_str(tl, k, "tail." + k)
    need(get_int(tl, "Q", "tail.Q") == Q, "tail.Q", "differs from Q")
    P = get_int(tl, "explicit_primes_up_to", "tail.explicit_primes_up_to", 0, MAX_EXPLICIT)
    P = max(P, 20000, Q)
    S = tail_log_bound(F.r, Q, P)
    lb = parse_ball(tl["log_bound"], "tail.log_bound")
    need(S <= lb[0], "tail.log_bound", "below the checker's own bound %.12g" % float(S))
    tail = (exp_bounds(-S)[0], exp_bounds(S)[1])
    contains(parse_ball(tl["interval"], "tail.interval"), tail, "tail.interval",
             "[exp(-S), exp(S)]")
    say("tail: S <= %.15g (own), certificate %.15g" % (float(S), float(lb[0])))
    # --- the two classes (docs/MATH.md §7.1, §7.3)
    cl = c["classes"]
    need(isinstance(cl, list) and len(cl) == 2, "classes", "must hold two classes")
    limits, rhos = [], []
    for ci, k in enumerate(cl):
        fl = "classes[%d]" % ci
        keys(k, fl, ("interval_n_ge_n0", "limit_interval", "limit_interval_display",
                     "local_factors", "pinned_product", "residue"))
        res = get_int(k, "residue", fl + ".residue", 0, M - 1)
        lf = k["local_factors"]
        need(isinstance(lf, list) and len(lf) == len(pe), fl + ".local_factors",
             "needs one entry per prime <= Q")
        prod, rho_c = Fr(1), {}
        for li, (f, (p, e)) in enumerate(zip(lf, pe)):
            g = "%s.local_factors[%d]" % (fl, li)
            keys(f, g, ("beta_F", "beta_G", "e", "p", "residue", "rho"))
            need(get_int(f, "p", g + ".p") == p, g + ".p", "expected %d" % p)
            e = get_int(f, "e", g + ".e", 0, e)   # pinned with n mod p^e, e <= e_p of M
            need(get_int(f, "residue", g + ".residue") == res % p ** e, g + ".residue",
                 "is not the class residue mod p^e")
            bF = beta_on_class(F, p, A, B, res, e, g + ".beta_F")
            bG = beta_on_class(G, p, A2, B2, res, e, g + ".beta_G")
            need(get_rat(f, "beta_F", g + ".beta_F") == bF, g + ".beta_F",
                 "counting gives %s" % bF)
            need(get_rat(f, "beta_G", g + ".beta_G") == bG, g + ".beta_G",
                 "counting gives %s" % bG)
            need(bG != 0, g + ".beta_G", "is zero: no main term for G")
            need(get_rat(f, "rho", g + ".rho") == bF / bG, g + ".rho", "is not beta_F/beta_G")
            prod *= bF / bG
            rho_c[p] = bF / bG
            say("%s p=%d: beta_F=%s beta_G=%s (counted)" % (fl, p, bF, bG))
        need(get_rat(k, "pinned_product", fl + ".pinned_product") == prod,
             fl + ".pinned_product", "is not prod rho_p = %s" % prod)
        own = imul(imul(imul(sig, plim), (prod, prod)), tail)
        li = parse_ball(k["limit_interval"], fl + ".limit_interval")
        contains(li, own, fl + ".limit_interval", "the limit")
        own_n0 = imul(imul(imul(sig, prange), (prod, prod)), tail)
        contains(parse_ball(k["interval_n_ge_n0"], fl + ".interval_n_ge_n0"), own_n0,
                 fl + ".interval_n_ge_n0", "the ratio for n >= n0")
        check_display(k, fl + ".limit_interval_display", li)
        limits.append(li)
        rhos.append(rho_c)
    need(cl[0]["residue"] != cl[1]["residue"], "classes", "the two residues coincide")
    (a, b), (c2, d2) = limits
    dis = b < c2 or d2 < a
    need(c["disjoint"] is True, "disjoint", "must be true in a NON-CONVERGENT certificate")
    need(dis, "classes", "limit intervals are not disjoint")
    diff = [p for p, _ in pe if rhos[0][p] != rhos[1][p]]
    dp = get_int(c, "distinguishing_prime", "distinguishing_prime", 2)
    need(dp in diff, "distinguishing_prime", "rho_p agrees on the two classes at p = %d" % dp)


def check_display(k, field, li):
    """"[a, b]": a display of the ball; each end within 2 units of its last
    digit of the exact end (the program's rounding is not nearest)."""
    s = get_str(k, "limit_interval_display", field)
    m = re.fullmatch(r"\[(-?[0-9]{1,30}(?:\.[0-9]{1,30})?), (-?[0-9]{1,30}(?:\.[0-9]{1,30})?)\]", s)
    need(m is not None, field, "not [a, b]")
    for txt, x in zip(m.groups(), li):
        ulp = Fr(1, 10 ** len(txt.partition(".")[2]))
        need(abs(Fr(txt) - x) <= 2 * ulp, field, "does not match the exact ball")


# ------------------------------------------------------------- CONSTANT --
def check_constant(c, F, G, w, aps, say):
    keys(c, "certificate", TOP_COMMON + ("constant", "constant_argument", "constant_route",
         "discriminant_product", "finite_primes", "lambda"), OPTIONAL_TOP)
    (A, B), (A2, B2) = aps
    get_str(c, "constant_argument", "constant_argument")
    need(c["constant_route"] == "proportional", "constant_route", "unknown route")
    # X_G(A'n+B') = lam X_F(An+B) for all n  <=>  A' = lam A, B'+D_G = lam (B+D_F)
    lam = get_rat(c, "lambda", "lambda")
    need(lam > 0 and A2 == lam * A and G.X(B2) == lam * F.X(B), "lambda",
         "X_G is not lambda X_F")
    # Outside the finite primes both beta_p are the closed form of the same
    # rank in (v_p(X), chi); v_p(X_G) = v_p(X_F) when p does not divide lam,
    # and the characters agree when det S_F det S_G (times lam for odd r,
    # where chi involves the unit part of X) is a square (docs/MATH.md §4, §7.4).
    disc = F.det * G.det * (lam if F.r % 2 else 1)
    need(get_rat(c, "discriminant_product", "discriminant_product") == disc,
         "discriminant_product", "expected %s" % disc)
    need(is_square(disc), "discriminant_product", "is not a rational square")
    fp = c["finite_primes"]
    need(isinstance(fp, list) and fp, "finite_primes", "must be a non-empty list")
    seen, total = [], Fr(1)
    for i, ent in enumerate(fp):
        fl = "finite_primes[%d]" % i
        keys(ent, fl, ("classes", "p", "rho"))
        p = get_int(ent, "p", fl + ".p", 2, MAX_Q)
        need(p in primes_upto(p)[-1:] and (not seen or p > seen[-1]), fl + ".p",
             "not a prime in increasing order")
        seen.append(p)
        rho = get_rat(ent, "rho", fl + ".rho")
        cls = ent["classes"]
        need(isinstance(cls, list) and cls, fl + ".classes", "empty")
        es = []
        for j, k in enumerate(cls):
            g = "%s.classes[%d]" % (fl, j)
            keys(k, g, ("beta_F", "beta_G", "e", "residue"))
            e = get_int(k, "e", g + ".e", 0, 64)
            need(p ** e <= MAX_PRIME_POWER, g + ".e", "prime power too large")
            res = get_int(k, "residue", g + ".residue", 0, p ** e - 1)
            es.append((res, e))
            bF = beta_on_class(F, p, A, B, res, e, g + ".beta_F")
            bG = beta_on_class(G, p, A2, B2, res, e, g + ".beta_G")
            need(get_rat(k, "beta_F", g + ".beta_F") == bF, g + ".beta_F",
                 "counting gives %s" % bF)
            need(get_rat(k, "beta_G", g + ".beta_G") == bG, g + ".beta_G",
                 "counting gives %s" % bG)
            need(bG != 0, g + ".beta_G", "is zero: no main term for G")
            need(bF / bG == rho, g, "beta_F/beta_G differs from rho of p = %d" % p)
        # the classes n = res mod p^e must partition Z
        E = max(e for _, e in es)
        need(p ** E <= MAX_PRIME_POWER, fl + ".classes", "prime power too large")
        hit = [0] * p ** E
        for res, e in es:
            for n in range(res, p ** E, p ** e):
                hit[n] += 1
        need(all(h == 1 for h in hit), fl + ".classes", "do not partition Z")
        total *= rho
        say("p=%d: rho=%s on %d pinned classes (counted)" % (p, rho, len(cls)))
    must = {2, 3} | prime_factors(F.t * G.t * lam.numerator * lam.denominator)
    need(must <= set(seen), "finite_primes", "must contain %s" % sorted(must))
    # M_F/M_G = sqrt(det S_G/det S_F) (A/A')^{w-1} prod_{p finite} rho_p, exactly.
    square = G.det / F.det * Fr(A, A2) ** (2 * (w - 1)) * total ** 2
    k = c["constant"]
    keys(k, "constant", ("contains_integer", "integer", "interval", "square", "value"))
    need(get_rat(k, "square", "constant.square") == square, "constant.square",
         "expected %s" % square)
    root = rat_sqrt(square)
    if root is None:
        need(k["value"] is None, "constant.value", "the constant is irrational")
        enc = sqrt_bounds(square)
    else:
        need(k["value"] is not None and get_rat(k, "value", "constant.value") == root,
             "constant.value", "expected %s" % root)
        enc = (root, root)
    contains(parse_ball(k["interval"], "constant.interval"), enc, "constant.interval",
             "the constant")
    is_int = root is not None and root.denominator == 1
    need(k["contains_integer"] is is_int, "constant.contains_integer", "expected %s" % is_int)
    if is_int:
        need(type(k["integer"]) in (int, str) and get_int(k, "integer", "constant.integer")
             == root, "constant.integer", "expected %s" % root)
    else:
        need(k["integer"] is None, "constant.integer", "must be null")


def rat_sqrt(x):
    a, b = x.numerator, x.denominator
    ra, rb = math.isqrt(a), math.isqrt(b)
    return Fr(ra, rb) if ra * ra == a and rb * rb == b else None


def is_square(x):
    return x > 0 and rat_sqrt(x) is not None


def prime_factors(n):
    out, d = set(), 2
    while d * d <= n:
        while n % d == 0:
            out.add(d)
            n //= d
        d += 1
    if n > 1:
        out.add(n)
    return out


# ------------------------------------------------------------------ main --
FORMATS = ("circlet-certificate/1",)


def check(cert, say=lambda s: None):
    need(isinstance(cert, dict), "certificate", "must be a JSON object")
    need("format" in cert, "format", "missing field")
    need(cert["format"] in FORMATS, "format", "unknown format %r" % (cert["format"],))
    if "digest" in cert:
        need(cert["digest"] == digest_of(cert), "digest", "does not match the content")
    for k in TOP_COMMON:
        need(k in cert, k, "missing field")
    F, G, w, aps = check_common(cert)
    v = cert["verdict"]
    if v == "NON-CONVERGENT":
        check_nonconvergent(cert, F, G, w, aps, say)
    elif v == "CONSTANT":
        check_constant(cert, F, G, w, aps, say)
    elif v == "UNDECIDED":    # claims nothing: only its shape is checked
        keys(cert, "certificate", TOP_COMMON + ("Q_max",), OPTIONAL_TOP)
        get_int(cert, "Q_max", "Q_max", 2, MAX_Q)
    else:
        raise Reject("verdict: unknown verdict %r" % (v,))
    return v


def main(argv):
    args = [a for a in argv[1:] if a != "-v"]
    verbose = "-v" in argv[1:]
    if len(args) != 1:
        print("usage: circlet_check.py CERT.json [-v]")
        return 2
    try:
        with open(args[0], "rb") as fh:
            raw = fh.read(1 << 24)
        text = raw.decode("utf-8")
        try:
            cert = load_strict(text)
        except ValueError as e:
            print("malformed: %s" % e)
            return 2
        v = check(cert, say=(lambda s: print("ok: " + s)) if verbose else (lambda s: None))
        print("accepted (%s)" % v)
        return 0
    except Reject as e:
        print("rejected: %s" % e)
        return 1
    except RecursionError:
        print("malformed: nesting too deep")
        return 2
    except Exception as e:   # never a traceback
        print("malformed: %s: %s" % (type(e).__name__, e))
        return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
