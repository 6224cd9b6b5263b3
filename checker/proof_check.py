#!/usr/bin/python3
"""proof_check.py -- an independent checker of circlet PROOF certificates.

Usage:  proof_check.py CERT.json [CERT2.json ...] [-v]
Exit 0 "accepted" (every file); exit 1 "rejected: FILE: <JSON pointer>: <reason>";
exit 2 "malformed: FILE: ..." when a file cannot be read as a certificate at all.
Never a traceback.  Format: "circlet-proof-certificate/1", described field by field
in docs/proof-certificate-format.md; the mathematics is docs/MATH.md §1 and §8.

The checker re-derives every field from the relation text alone: it parses the
relation with its own parser, builds each family's eta quotient (§1), finds level,
weight and character (GHN) and the cusp orders (Ligozat), follows the operators
U_d, V_d, sieves, twists and combinations through the rules of §8(c), recomputes
index and Sturm bound (§8(d)), computes the counts with its own integer power
series (Euler's pentagonal theorem, Jacobi's cube identity, theta = sum q^(m^2);
sparse products and a sparse recurrence for division), and regenerates the whole
certificate (texts included).  Any difference is a rejection.

WHAT THIS PROGRAM TRUSTS (and nothing else):
  T1. Python's int, fractions.Fraction, math.gcd, hashlib.sha256, json, re, shlex.
  T2. Generating functions (docs/MATH.md §1): sum c_t(n) q^n = prod (1-q^{tk})^t/(1-q^k)
      [Garvan-Kim-Stanton 1990, quoted from memory]; sc_t as the eta products of §1
      (with prod(1+q^{2k-1}) = prod (1-q^{2k})^2/((1-q^k)(1-q^{4k})), common practice);
      r_S(n): theta(q)^S, theta = sum_{m in Z} q^{m^2} (the definition).
  T3. Euler's pentagonal theorem prod(1-q^k) = sum_k (-1)^k q^{k(3k-1)/2} and Jacobi's
      prod(1-q^k)^3 = sum_{k>=0} (-1)^k (2k+1) q^{k(k+1)/2}, Gauss's prod(1-q^k)^2/(1-q^{2k})
      = sum_{m in Z} (-1)^m q^{m^2} (all common practice; re-tested against enumeration).
  T4. Gordon-Hughes-Newman [K. Ono, The web of modularity, 2004, Thm 1.64; quoted
      from memory]: f = prod_{delta|N} eta(delta tau)^{r_delta}, k = (1/2) sum r in Z,
      sum delta r = 0 and sum (N/delta) r = 0 (mod 24) => f(gamma tau) =
      chi(d) (c tau + d)^k f(tau) on Gamma0(N), chi(d) = ((-1)^k prod delta^{r_delta} / d).
      Half-integral weight: applied to f/theta^{2k} (weight 0), theta =
      eta(2t)^5/(eta(t)^2 eta(4t)^2) [Shimura 1973, quoted from memory].
  T5. Ligozat [Ono 2004, Thm 1.65; quoted from memory]: order at the cusp c/d, d|N,
      (N/24) sum_delta gcd(d,delta)^2 r_delta / (gcd(d,N/d) d delta).
  T6. The operator rules of docs/MATH.md §8(c) [Ono 2004 Props 2.22, 3.7; Koblitz,
      GTM 97, Prop III.3.17; both quoted from memory there], with the bookkeeping of
      support classes and group indices those rules imply.
  T7. Sturm [LNM 1240, 1987; quoted from memory]: a(m) = 0 (mod l) for m <=
      (k/12)[SL2(Z):Gamma] => G = 0 (mod l); the half-integral variants of §8(d)
      (G^2 for 0 or a squarefree modulus, G*theta for a prime power).
  T8. [SL2(Z):Gamma0(N)] = N prod_{p|N}(1+1/p), [SL2(Z):Gamma1(N)] = N^2 prod(1-1/p^2)
      for N >= 3 (1, 3 for N = 1, 2) (common practice).
"""
import hashlib
import json
import math
import re
import shlex
import sys
from fractions import Fraction as Fr
from operator import add, sub

FORMAT = "circlet-proof-certificate/1"
MAX_FILE = 16 << 20
VERSIONS = ("0.1.0",)       # circlet versions whose certificates this checker knows
MAX_T = 1000                 # the program's range of t (family parameter)
MAX_M_PROVE = 4000000        # coefficient limit of `circlet prove` (proof.hpp default)
MAX_M_CONGRUENCES = 400000   # the limit `circlet congruences` passes to the prover
MIN_N = 100                  # the prover compares at least n = 0..100
MAX_SERIES = 5000000         # this checker refuses longer series
LINES = "one per n in the class: n, then F_i(A_i n + B_i) for each term"
LINES_DILATED = ("one per n in the class: n, then the value of each term "
                 "(F_i(A_i(n-j_i)/d_i + B_i), 0 off n = j_i mod d_i)")
ONO22 = "Ono, The web of modularity (2004), Prop. 2.22: "
ONO37 = "Ono, The web of modularity (2004), Prop. 3.7: "
KOB = "Koblitz, GTM 97, Prop. III.3.17: "
THEOREMS = [
    "Gordon-Hughes-Newman: level and character of an eta quotient (Ono, The web of modularity, 2004, Thm 1.64; quoted from memory)",
    "Ligozat: order of an eta quotient at the cusp c/d (Ono, The web of modularity, 2004, Thm 1.65; quoted from memory)",
    "Shimura (1973): half-integral weight on Gamma0(4N) with the multiplier of theta (quoted from memory)",
    "Ono, The web of modularity (2004), Props 2.22 and 3.7: U(d), V(d) (quoted from memory)",
    "Koblitz, Introduction to elliptic curves and modular forms, GTM 97, Prop III.3.17: twists",
    "Sturm, On the congruence of modular forms, LNM 1240 (1987): the bound (k/12)[SL2(Z):Gamma]",
]


class Reject(Exception):
    def __init__(self, ptr, why):
        Exception.__init__(self, "%s: %s" % (ptr or "/", why))


class Malformed(Exception):
    pass


# ------------------------------------------------------------ reading ------
def _pairs(pairs):
    d = {}
    for k, v in pairs:
        if k in d:
            raise Malformed("duplicate key %r" % k)
        d[k] = v
    return d


def _no_float(s):
    raise Malformed("a number that is not an integer: %s" % s)


def _no_const(s):
    raise Malformed("non-standard JSON constant %s" % s)


def read_json(path):
    with open(path, "rb") as fh:
        raw = fh.read(MAX_FILE + 1)
    if len(raw) > MAX_FILE:
        raise Malformed("larger than %d bytes" % MAX_FILE)
    try:
        text = raw.decode("utf-8")
        return json.loads(text, object_pairs_hook=_pairs, parse_float=_no_float,
                          parse_constant=_no_const)
    except Malformed:
        raise
    except (ValueError, RecursionError) as e:
        raise Malformed("not JSON: %s" % e)


def digest_of(cert):
    c = {k: v for k, v in cert.items() if k != "digest"}
    s = json.dumps(c, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return "sha256:" + hashlib.sha256(s.encode("utf-8")).hexdigest()


def same(want, got, ptr):
    """Strict structural equality (types included: 1 != true, "1" != 1)."""
    if type(want) is not type(got):
        raise Reject(ptr, "expected %s %s, found %s %s" % (
            type(want).__name__, json.dumps(want)[:80], type(got).__name__, json.dumps(got)[:80]))
    if isinstance(want, dict):
        for k in sorted(set(want) | set(got)):
            if k not in got:
                raise Reject(ptr, "missing key %r" % k)
            if k not in want:
                raise Reject(ptr, "unknown key %r" % k)
            same(want[k], got[k], ptr + "/" + k.replace("~", "~0").replace("/", "~1"))
    elif isinstance(want, list):
        if len(want) != len(got):
            raise Reject(ptr, "expected %d elements, found %d" % (len(want), len(got)))
        for i, (a, b) in enumerate(zip(want, got)):
            same(a, b, "%s/%d" % (ptr, i))
    elif want != got:
        raise Reject(ptr, "expected %s, found %s" % (json.dumps(want, ensure_ascii=False)[:200],
                                                      json.dumps(got, ensure_ascii=False)[:200]))


# ------------------------------------------------------- arithmetic --------
def primes_of(n):
    out, p = [], 2
    while p * p <= n:
        if n % p == 0:
            out.append(p)
            while n % p == 0:
                n //= p
        p += 1
    if n > 1:
        out.append(n)
    return out


def factor(n):
    out = []
    for p in primes_of(n):
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        out.append((p, e))
    return out


def lcm(a, b):
    return a // math.gcd(a, b) * b


def core(x):
    """Squarefree kernel with sign: x = core(x) * square."""
    s = -1 if x < 0 else 1
    for p, e in factor(abs(x)):
        if e % 2:
            s *= p
    return s


def is_squarefree(m):
    return all(e == 1 for _, e in factor(m))


def index_gamma0(N):
    r = 1
    for p, e in factor(N):
        r *= p ** (e - 1) * (p + 1)     # N prod (1 + 1/p)
    return r


def index_gamma1(N):
    r = 1
    for p, e in factor(N):
        r *= p ** (2 * e - 2) * (p * p - 1)   # N^2 prod (1 - 1/p^2); 1, 3 at N = 1, 2
    return r


def square_roots_of_one(M):
    """#{d mod M : d^2 = 1}: counted directly for small M, else by CRT (2 per odd p^c;
    1, 2, 4 for 2, 4, 8 | 2^c)."""
    if M <= 20000:
        return sum(1 for d in range(M) if (d * d) % M == 1 % M)
    r = 1
    for p, c in factor(M):
        r *= 2 if p != 2 else (1 if c == 1 else 2 if c == 2 else 4)
    return r


def totient(M):
    r = M
    for p in primes_of(M):
        r = r // p * (p - 1)
    return r


def crt_meet(s1, S1, s2, S2):
    """The class s mod lcm(S1,S2) in both classes, or None."""
    g = math.gcd(S1, S2)
    if (s1 - s2) % g:
        return None
    L = lcm(S1, S2)
    m2 = S2 // g
    t = ((s2 - s1) // g) * pow(S1 // g, -1, m2) % m2 if m2 > 1 else 0
    return ((s1 + S1 * t) % L, L)


def frs(x):
    return str(Fr(x))


# ------------------------------------------------------ relation text ------
class Term:
    """coeff * F(A n + B), or for a dilated term (d >= 2) coeff * F(A (n-j)/d + B) when
    n = j mod d and 0 otherwise (the image of V_d, docs/MATH.md §8 (b))."""
    def __init__(self, coeff, kind, t, A, B, d=1, j=0):
        self.coeff, self.kind, self.t, self.A, self.B, self.d, self.j = coeff, kind, t, A, B, d, j
        self.name = kind + str(t)

    def arg(self, n):
        """The argument at n, or -1 where a dilated term is 0."""
        if n % self.d != self.j:
            return -1
        return self.A * ((n - self.j) // self.d) + self.B

    def text(self):
        a = "" if self.A == 1 else str(self.A)
        if self.d == 1:
            x = a + "n"
        elif self.j == 0:
            x = a + "n/%d" % self.d
        else:
            x = a + "(n-%d)/%d" % (self.j, self.d)
        return "%s(%s%s)" % (self.name, x, "+%d" % self.B if self.B else "")


class Relation:
    pass


TOK = re.compile(r"\s*(==|=|\u2261|!=|\u2260|\+|-|\*|/|\(|\)|\^|[A-Za-z][A-Za-z0-9]*|[0-9]+)")


def parse_relation(s):
    if len(s) > 4096:
        raise ValueError("longer than 4096 characters")
    toks, i = [], 0
    while i < len(s):
        if s[i:].strip() == "":
            break
        m = TOK.match(s, i)
        if not m:
            raise ValueError("unexpected character at %d" % (i + 1))
        toks.append(m.group(1))
        i = m.end()
    pos = [0]

    def peek(k=0):
        return toks[pos[0] + k] if pos[0] + k < len(toks) else None

    def take(*want):
        t = peek()
        if t is None or (want and t not in want):
            raise ValueError("expected %s, found %r" % ("/".join(want) or "more", t))
        pos[0] += 1
        return t

    def number(limit=None, what="a number"):
        t = take()
        if not t.isdigit() or len(t) > 30:
            raise ValueError("expected %s, found %r" % (what, t))
        v = int(t)
        if limit is not None and (len(t) > 12 or v > limit):
            raise ValueError("%s too large" % what)
        return v

    def family_word(w):
        m = re.fullmatch(r"(sc|sq|c)([0-9]+)", w or "")
        return m

    R = Relation()
    R.terms, R.modulus, R.restricted, R.Q, R.r, R.complement = [], 0, False, 0, 0, False

    def term(sign):
        c = Fr(1)
        if peek() is not None and peek().isdigit():
            num = number(what="a coefficient")
            den = 1
            if peek() == "/":
                take()
                den = number(what="a denominator")
                if den == 0:
                    raise ValueError("denominator 0")
            c = Fr(num, den)
            if peek() == "*":
                take()
            if c == 0 and not (peek() == "c" or family_word(peek())):
                return
        w = take()
        m = family_word(w)
        if not m:
            raise ValueError("expected a family term, found %r" % w)
        t = int(m.group(2))
        if not 1 <= t <= MAX_T:
            raise ValueError("t out of range")
        take("(")
        A = 1
        nxt = peek()
        if nxt is not None and nxt.isdigit():     # "7n" tokenises as "7", "n"
            A = number(1000000, "A")
            if peek() == "*":
                take()
        d, j = 1, 0
        if peek() == "(":                         # A(n-j)/d
            take("(")
            take("n")
            if peek() == "-":
                take()
                j = number(1000000, "j")
            take(")")
            take("/")
            d = number(1000000, "d")
            if d < 2:
                raise ValueError("d < 2")
        else:
            take("n")
            if peek() == "/":                     # A n/d
                take()
                d = number(1000000, "d")
                if d < 2:
                    raise ValueError("d < 2")
        if j >= d and d > 1:
            raise ValueError("j >= d")
        if A < 1:
            raise ValueError("A < 1")
        B = 0
        if peek() == "+":
            take()
            B = number(1000000000, "B")
        elif peek() == "-":
            raise ValueError("negative B")
        take(")")
        if c != 0:
            R.terms.append(Term(c * sign, m.group(1), t, A, B, d, j))

    def side(sign):
        s = 1
        if peek() in ("+", "-"):
            s = 1 if take() == "+" else -1
        term(sign * s)
        while peek() in ("+", "-"):
            term(sign if take() == "+" else -sign)

    side(1)
    take("==", "=", "\u2261")
    side(-1)
    paren = False
    if peek() == "(" and peek(1) == "mod":
        take()
        paren = True
    if peek() == "mod":
        take()
        m = number(what="the modulus")
        if peek() == "^":
            take()
            m = m ** number(64, "the exponent")
        if m < 2 or m.bit_length() > 62:
            raise ValueError("modulus out of range")
        R.modulus = m
        if paren:
            take(")")
    if peek() == "for":
        take()
        take("n")
        take("mod")
        R.Q = number(1000000, "Q")
        if R.Q < 2:
            raise ValueError("Q < 2")
        op = take("!=", "\u2260", "==", "=")
        R.complement = op in ("!=", "\u2260")
        R.r = number(1000000, "r")
        if R.r >= R.Q:
            raise ValueError("r >= Q")
        R.restricted = True
    if peek() is not None:
        raise ValueError("unexpected text %r" % peek())
    if not R.terms:
        raise ValueError("no family term")
    if R.modulus and any(t.coeff.denominator != 1 for t in R.terms):
        raise ValueError("a congruence needs integer coefficients")
    return R


def relation_text(R):
    s = ""
    for i, t in enumerate(R.terms):
        c = abs(t.coeff)
        s += ("-" if t.coeff < 0 else "") if i == 0 else (" - " if t.coeff < 0 else " + ")
        if c != 1:
            s += str(c) + "*"
        s += t.text()
    s += " = 0" if R.modulus == 0 else " == 0 mod %d" % R.modulus
    if R.restricted:
        s += " for n mod %d %s %d" % (R.Q, "!=" if R.complement else "=", R.r)
    return s


# ------------------------------------------------- families as eta quotients
def family_eta(kind, t):
    """{d: e_d} with F(q) = prod_d prod_k (1 - q^{dk})^{e_d} (docs/MATH.md §1)."""
    e = {}

    def put(d, x):
        e[d] = e.get(d, 0) + x
    if kind == "c":
        put(t, t)
        put(1, -1)
    elif kind == "sc":
        put(2, 2); put(1, -1); put(4, -1)          # prod (1 + q^{2k-1})
        if t % 2 == 0:
            put(2 * t, t // 2)
        else:
            put(2 * t, (t - 1) // 2)
            put(t, 1); put(4 * t, 1); put(2 * t, -2)   # 1/prod(1 + q^{t(2k-1)})
    else:
        put(2, 5 * t); put(1, -2 * t); put(4, -2 * t)  # theta^S
    return {d: x for d, x in sorted(e.items()) if x}


def rank_of(kind, t):
    return {"c": t - 1, "sc": t // 2, "sq": t}[kind]


def eta_text(r):
    return " ".join("eta(%dt)^%d" % (d, x) for d, x in sorted(r.items())) or "1"


def ghn(r):
    """Least level N, twice the weight, character D, rule text; None if no N <= 24 lcm."""
    tw = sum(r.values())
    L = 1
    for d in r:
        L = lcm(L, d)
    test = dict(r)
    if tw % 2:
        for d, x in ((1, -2), (2, 5), (4, -2)):       # divide by theta^tw
            test[d] = test.get(d, 0) - tw * x
        test = {d: x for d, x in test.items() if x}
        L = lcm(L, 4)
    level = None
    for j in range(1, 25):
        N = L * j
        if all(N % d == 0 for d in test) and sum(d * x for d, x in test.items()) % 24 == 0 \
                and sum(N // d * x for d, x in test.items()) % 24 == 0:
            level = N
            break
    if level is None:
        return None
    k2 = sum(test.values())
    s = 1                                             # squarefree class of prod delta^r
    for d, x in test.items():
        if x % 2:
            s = core(s * d)
    if k2 % 2 == 0 and (k2 // 2) % 2:
        s = -s                                         # (-1)^k
    if tw % 2:
        rule = ("Gordon-Hughes-Newman applied to f/theta^%d (weight 0); f = (f/theta^%d)*theta^%d, "
                "Shimura's multiplier" % (tw, tw, tw))
    else:
        rule = "Gordon-Hughes-Newman"
    return level, tw, s, rule


def divisors(n):
    return [d for d in range(1, n + 1) if n % d == 0] if n < 5000 else sorted(
        set(x for d in range(1, math.isqrt(n) + 1) if n % d == 0 for x in (d, n // d)))


def ligozat(r, N):
    out = []
    for c in divisors(N):
        g = math.gcd(c, N // c)
        o = sum(Fr(N * math.gcd(c, d) ** 2 * x, 24 * g * c * d) for d, x in r.items())
        out.append((c, o))
    return out


# ------------------------------------------------------------ form spaces --
class Space:
    def __init__(self, tw=0, level=1, char=1):
        self.tw, self.level, self.char, self.g1 = tw, level, char, False
        self.tmod, self.kern, self.S, self.s, self.zero = 1, 0, 1, 0, False

    def copy(self):
        w = Space()
        w.__dict__.update(self.__dict__)
        return w

    def half(self):
        return self.tw % 2 == 1

    def factor(self):
        """[Gamma0(N) : Gamma] bound: phi(M')/#{d^2 = 1 mod M'} * 2^kernels."""
        return totient(self.tmod) // square_roots_of_one(self.tmod) * 2 ** self.kern

    def index(self):
        return index_gamma1(self.level) if self.g1 else index_gamma0(self.level) * self.factor()

    def text(self):
        k = str(self.tw // 2) if self.tw % 2 == 0 else "%d/2" % self.tw
        if self.zero:
            return "the zero series"
        if self.g1:
            return "M_%s(Gamma1(%d))" % (k, self.level)
        g = "Gamma0(%d)" % self.level
        if self.tmod > 1 and self.factor() != 1:
            g += " with d^2 = 1 mod %d" % self.tmod
        if self.kern:
            g += " in ker of %d quadratic character(s)" % self.kern
        ch = "trivial" if self.char == 1 else "(%d/.)" % self.char
        return "M_%s(%s, %s)" % (k, g, ch)

    def json(self):
        return {"space": self.text(), "group": "Gamma1" if self.g1 else "Gamma0",
                "twist_modulus": self.tmod, "kernels": self.kern, "index_factor": str(self.factor()),
                "level": self.level, "twice_weight": self.tw,
                "character": "none" if self.g1 else str(self.char),
                "support": "%d mod %d" % (self.s, self.S), "zero": "yes" if self.zero else "no"}


def step(chain, op, rule, V):
    if chain is not None:
        chain.append({"op": op, "rule": rule, "after": V.json()})


def apply_V(V, d, chain):
    """V_d: a(m) moves to dm; level Nd; half-integral weight: character times (4d/.)."""
    if d == 1:
        return V
    W = V.copy()
    W.level, W.S, W.s = V.level * d, V.S * d, V.s * d
    if V.half():
        if not W.g1:
            W.char = core(V.char * core(d))
        rule = ONO37 + "V(d) maps (4N, chi) to (4Nd, (4d/.)chi) (quoted from memory)"
    else:
        rule = ONO22 + "V(d) maps level N to Nd, same character (quoted from memory)"
    step(chain, "V_%d" % d, rule, W)
    return W


def apply_U(V, d, chain):
    """U_d: a(dm) at m; level kept once the primes of d divide it (d | N/4 in half-integral)."""
    if d == 1:
        return V
    W = V.copy()
    g = math.gcd(d, V.S)
    if V.zero or V.s % g:
        W.zero = True                     # no exponent dm lies in the support
    else:
        W.S = V.S // g
        W.s = 0 if W.S == 1 else (V.s // g) * pow(d // g, -1, W.S) % W.S
    if V.half():
        n4 = V.level // 4
        if n4 % d:
            W.level = 4 * lcm(n4, d)
            t = V.copy()
            t.level = W.level
            step(chain, "lift to level %d" % W.level,
                 "Gamma0(N') is a subgroup of Gamma0(N) for N | N' (so that d | N'/4)", t)
        if not W.g1:
            W.char = core(V.char * core(d))
        rule = ONO37 + "U(d) for d | N maps (4N, chi) to (4N, (4d/.)chi) (quoted from memory)"
    else:
        N = V.level
        for p in primes_of(d):
            if N % p:
                N *= p
        if N != V.level:
            W.level = N
            t = V.copy()
            t.level = N
            step(chain, "lift to level %d" % N, "Gamma0(N') is a subgroup of Gamma0(N) for N | N' "
                 "(so that every prime of d divides the level)", t)
        rule = ONO22 + ("U(p) for p | N preserves M_k(Gamma0(N), chi); U(d) = product of U(p) "
                        "(quoted from memory)")
    step(chain, "U_%d" % d, rule, W)
    return W


def apply_sieve(V, r, M, chain):
    """Keep the exponents m = r mod M: prime power by prime power (docs/MATH.md §8(c))."""
    r %= M
    W = V.copy()
    meet = None if V.zero else crt_meet(V.s, V.S, r, M)
    if meet is None:
        W.zero = True
        step(chain, "sieve m = %d mod %d" % (r, M), "the class misses the support: zero", W)
        return W
    for p, a in factor(M):
        pa = p ** a
        rp = r % pa
        if V.S % pa == 0 and (V.s - rp) % pa == 0:
            continue                        # the support already lies in the class
        if rp == 0:
            W = apply_V(apply_U(W, pa, chain), pa, chain)
            continue
        pb = 1
        while rp % (pb * p) == 0:
            pb *= p
        pc = pa // pb
        W = apply_U(W, pb, chain)
        W.level *= pc * pc                  # a twist by psi mod pc: level N pc^2
        W.tmod = lcm(W.tmod, pc)
        cls = (rp // pb) % pc
        mt = crt_meet(W.s, W.S, cls, pc)
        if mt is None:
            W.zero = True
        else:
            W.s, W.S = mt
        if pc in (2, 3, 4, 8):              # (Z/pc)^* has exponent 2: every psi^2 = 1
            rule = KOB + ("twist by psi mod M lands in (N M^2, chi psi^2); every psi mod %d has "
                          "psi^2 = 1" % pc)
        else:
            rule = KOB + ("twists by psi mod M land in (N M^2, chi psi^2); every psi^2 is trivial on d "
                          "with d^2 = 1 mod %d, so the sum transforms with chi there" % pc)
        step(chain, "sieve m = %d mod %d (twists)" % (cls, pc), rule, W)
        W = apply_V(W, pb, chain)
    W.s, W.S = meet
    return W


def combine(spaces, chain):
    W, first = None, True
    for t in spaces:
        if t.zero:
            continue
        if first:
            W, first = t.copy(), False
            continue
        W.level, W.tmod = lcm(W.level, t.level), lcm(W.tmod, t.tmod)
        W.kern += t.kern + (1 if t.char != W.char else 0)   # ker(chi chi_t): index <= 2
        W.g1 = W.g1 or t.g1
        g = math.gcd(math.gcd(W.S, t.S), abs(W.s - t.s)) or W.S
        W.S, W.s = g, W.s % g
    if first:
        W = spaces[0].copy() if spaces else Space()
        W.zero = True
    step(chain, "combine %d terms" % len(spaces),
         "characters differ: on the kernel of their quotient (index <= 2 each) all terms share chi"
         if W.kern else "M_k(Gamma, chi) is a vector space; each term lifted to the lcm of the levels", W)
    return W


def complement(V, r, M, chain):
    S = apply_sieve(V, r, M, chain)
    W = combine([V, S], None)
    W.s, W.S = V.s, V.S
    step(chain, "complement: f - (f sieved to m = %d mod %d)" % (r % M, M),
         "a difference of two forms: lcm of the levels, one character if both agree, else Gamma1", W)
    return W


def sturm(V, modulus):
    """floor((k'/12) * index): k' = k, or k + 1/2 for half-integral weight and a
    non-squarefree modulus (G*theta); G^2 gives the same k/12 for 0 or squarefree."""
    sqf = modulus == 0 or is_squarefree(modulus)
    tw = V.tw + (1 if V.half() and not sqf else 0)
    return V.index() * tw // 24


def sturm_text(V, modulus):
    sqf = modulus == 0 or is_squarefree(modulus)
    s = ("Sturm (1987): a(m) for m <= floor((k/12) * [SL2(Z):Gamma]), Gamma = " +
         ("Gamma1(N)" if V.g1 else "the group of the space, index [SL2(Z):Gamma0(N)] * %d" % V.factor()))
    if V.half():
        s += (", applied to f^2 (weight 2k; ord f^2 = 2 ord f)" if sqf else
              ", applied to f*theta (weight k + 1/2; theta a unit of Z[[q]])")
    if modulus and not sqf:
        s += "; prime powers by induction (f = l*g, g in the same space)"
    return s


# ---------------------------------------------------- the certificate ------
def structure(R, max_m):
    """Everything but the counts: (expected dict, plan) with plan for the finite check."""
    exp = {"format": FORMAT, "relation": relation_text(R), "modulus": str(R.modulus)}
    ok, why, tds, jterms = True, "", [], []
    for t in R.terms:
        r = family_eta(t.kind, t.t)
        s24 = sum(d * x for d, x in r.items())
        g = 24 if s24 == 0 else math.gcd(abs(s24), 24)
        D, shift = 24 // g, s24 // g                   # q^{s24/24} = q^{shift/D}
        f = {d * D: x for d, x in r.items()}            # eta(D d tau): integral exponents
        if sum(f.values()) != rank_of(t.kind, t.t):
            raise Reject("/terms", "weight of %s's eta quotient is not its rank" % t.name)
        jt = {"family": t.name, "coefficient": str(t.coeff), "A": t.A, "B": t.B,
              "eta_quotient": eta_text(f),
              "eta_quotient_meaning": "sum_n %s(n) q^(%dn+%d)" % (t.name, D, shift)}
        m = ghn(f)
        sp = None
        if m is None:
            ok, why = False, t.name + ": no level found by Gordon-Hughes-Newman"
        else:
            level, tw, ch, rule = m
            orders = ligozat(f, level)
            holo = all(o >= 0 for _, o in orders)
            jt.update({"level": level, "twice_weight": tw, "character": str(ch), "level_rule": rule,
                       "cusp_orders": [{"cusp_denominator": c, "order": frs(o)} for c, o in orders],
                       "holomorphic": "yes" if holo else "no"})
            if not holo:
                ok, why = False, t.name + ": not holomorphic at every cusp"
            sp = Space(tw, level, ch)
            sp.S, sp.s = D, shift % D                  # exponents D n + shift
        M, Rr = D * t.A, D * t.B + shift               # F(An+B) at q^{Mn+R}
        beta = own = Fr(Rr, M)
        if t.d > 1:
            # F(A k + B) at n = d k + j: L(n + beta) = L d (k + beta') needs beta = d beta' - j
            beta = t.d * own - t.j
            jt["dilation"] = {"d": t.d, "j": t.j, "meaning": "F(A(n-j)/d + B) for n = j mod d, else 0",
                              "beta_of_progression": frs(own)}
        jt["beta"] = frs(beta)
        jterms.append(jt)
        tds.append((sp, m, M, Rr, beta, t))
    if any(b != tds[0][4] for _, _, _, _, b, _ in tds):
        ok = False
        why = ("not aligned: the exponents L(n + beta_i) differ (beta = %s for the first term); "
               "no single modular form carries the relation" % frs(tds[0][4]))
    elif any(rank_of(t.kind, t.t) != rank_of(R.terms[0].kind, R.terms[0].t) for t in R.terms):
        ok, why = False, "the terms have different weights"
    bound = None
    W = None
    L, c = 1, 0
    if ok:
        beta = tds[0][4]
        L, c = beta.denominator, beta.numerator
        exp["alignment"] = {"beta": frs(beta), "L": L, "m_of_n": "m = %dn + %d" % (L, c)}
        spaces = []
        for i, (sp, m, M, Rr, _, t) in enumerate(tds):
            # the progression's own series sum_k F(Ak+B) q^{Lt (k + beta')}; a dilated term then
            # takes V_e, e = L d / Lt, to sum_k F(Ak+B) q^{L (d k + j + beta)}
            Lt = Fr(Rr, M).denominator if t.d > 1 else L
            if (L * t.d) % Lt:
                raise Reject("/terms/%d" % i, "alignment: the progression's denominator does not divide L d")
            g = math.gcd(M, Lt)
            a, b = M // g, Lt // g
            if Rr % a:
                raise Reject("/terms/%d" % i, "alignment: a does not divide R")
            ch = [{"op": "start: " + t.name, "rule": m[3], "after": sp.json()}]
            V = apply_V(apply_sieve(apply_U(sp, a, ch), Rr // a, M // a, ch), b, ch)
            jterms[i]["operators"] = "U_%d, sieve m = %d mod %d, V_%d" % (a, (Rr // a) % (M // a), M // a, b)
            if t.d > 1:
                e = L * t.d // Lt
                V = apply_V(V, e, ch)
                jterms[i]["operators"] += ", V_%d (dilation: n = %dk + %d)" % (e, t.d, t.j)
            jterms[i]["chain"] = ch
            spaces.append(V)
        chain = []
        W = combine(spaces, chain)
        if R.restricted:
            LQ = L * R.Q
            rm = (L * R.r + c) % LQ                     # n = r mod Q <=> m = L r + c mod LQ
            W = complement(W, rm, LQ, chain) if R.complement else apply_sieve(W, rm, LQ, chain)
        exp["combination_chain"] = chain
        exp["space"] = W.json()
        bound = sturm(W, R.modulus)
        exp["index"] = str(W.index())
        exp["sturm_bound"] = str(bound)
        exp["bound_rule"] = sturm_text(W, R.modulus)
    exp["terms"] = jterms
    # which n: m = L n + c <= bound, at least MIN_N, within the coefficient limit
    n_max, bound_ok = -1, False
    if ok:
        if bound <= max_m:
            n_max = (bound - c) // L if bound >= c else -1
            bound_ok = True
        else:
            why = "the Sturm bound %d exceeds the coefficient limit %d" % (bound, max_m)
    n_check = max(n_max, MIN_N)
    for t in R.terms:
        lim = t.d * int(Fr(max_m - t.B, t.A)) + t.j  # C++ division truncates toward 0
        if lim < n_check:
            n_check = max(0, lim)
            if bound_ok and n_check < n_max:
                bound_ok = False
                why = "the coefficients up to the bound are beyond the limit %d" % max_m
    plan = {"n_check": n_check, "ok": ok and bound_ok, "why": why, "bound": bound, "W": W}
    return exp, plan


def finish(R, plan, series):
    """The finite computation of §8(e); returns the fields checked/verdict/reason/counterexample."""
    den = 1
    for t in R.terms:
        den = lcm(den, t.coeff.denominator)
    lam = [int(t.coeff * den) for t in R.terms]
    text, bad = [], None
    for n in range(plan["n_check"] + 1):
        if R.restricted and ((n % R.Q == R.r) == R.complement):
            continue
        vals = [series[t.name][t.arg(n)] if t.arg(n) >= 0 else 0 for t in R.terms]
        text.append(" ".join(map(str, [n] + vals)) + "\n")
        tot = sum(l * v for l, v in zip(lam, vals))
        if (tot if R.modulus == 0 else tot % R.modulus) != 0:
            bad = (n, vals, tot)
            break
    out = {"checked": {"n_from": 0, "n_to": bad[0] if bad else plan["n_check"],
                       "lines": LINES_DILATED if any(t.d > 1 for t in R.terms) else LINES,
                       "coefficient_digest": "sha256:" + hashlib.sha256("".join(text).encode()).hexdigest()}}
    if bad:
        n, vals, tot = bad
        out["verdict"] = "REFUTED"
        out["reason"] = "fails at n = %d: %s; left side = %s" % (
            n, ", ".join("%s(%d) = %d" % (t.name, t.arg(n), v) if t.arg(n) >= 0 else
                         "%s = 0 (n mod %d != %d)" % (t.text(), t.d, t.j) for t, v in zip(R.terms, vals)),
            str(tot) + ("/%d" % den if den != 1 else ""))
        out["counterexample"] = {"n": n, "values": [str(v) for v in vals],
                                 "left_side": str(tot) + ("/%d" % den if den != 1 else "")}
    elif plan["ok"]:
        out["verdict"] = "PROVED"
        out["reason"] = "coefficients m <= %d of a form in %s vanish%s" % (
            plan["bound"], plan["W"].text(), "" if R.modulus == 0 else " mod %d" % R.modulus)
    else:
        out["verdict"] = "UNKNOWN"
        out["reason"] = "%s; no counterexample for n <= %d" % (plan["why"], plan["n_check"])
    out["theorems"] = list(THEOREMS)
    return out


# --------------------------------------------------------- power series ----
def pentagonal(N, d=1):
    """prod_k (1 - x^{dk}) up to x^N: [(offset, sign)] without the constant 1."""
    out, k = [], 1
    while True:
        o1, o2 = d * k * (3 * k - 1) // 2, d * k * (3 * k + 1) // 2
        if o1 > N:
            break
        s = -1 if k % 2 else 1
        out.append((o1, s))
        if o2 <= N:
            out.append((o2, s))
        k += 1
    return out


def jacobi_cube(N, d=1):
    """prod_k (1 - x^{dk})^3 = sum_{k>=0} (-1)^k (2k+1) x^{d k(k+1)/2}, without the 1."""
    out, k = [], 1
    while d * k * (k + 1) // 2 <= N:
        out.append((d * k * (k + 1) // 2, (-1) ** k * (2 * k + 1)))
        k += 1
    return out


def mul_sparse(F, terms):
    """F * (1 + sum c x^o), truncated to len(F)."""
    N = len(F)
    R = list(F)
    for o, c in terms:
        if o >= N:
            continue
        if c == 1:
            R[o:] = map(add, R[o:], F[:N - o])
        elif c == -1:
            R[o:] = map(sub, R[o:], F[:N - o])
        else:
            R[o:] = map(add, R[o:], map(c.__mul__, F[:N - o]))
    return R


def div_pentagonal(G, d):
    """F with F * prod(1 - x^{dk}) = G: F_n = G_n - sum_j s_j F_{n - o_j} (all s_j = +-1).
    Offsets below the block length are done one n at a time; larger ones a block at a time
    (their sources lie in earlier blocks, already final)."""
    N = len(G)
    terms = pentagonal(N - 1, d)
    BL = 1024
    small = [(o, s) for o, s in terms if o < BL]
    large = [(o, s) for o, s in terms if o >= BL]
    sp = [o for o, s in small if s == -1]   # -s_j = +1: added
    sm = [o for o, s in small if s == 1]
    F = list(G)
    for b in range(0, N, BL):
        e = min(b + BL, N)
        for o, s in large:
            lo = max(b, o)
            if lo >= e:
                break
            F[lo:e] = map(sub if s == 1 else add, F[lo:e], F[lo - o:e - o])
        for n in range(b, e):
            v = F[n]
            for o in sp:
                if o > n:
                    break
                v += F[n - o]
            for o in sm:
                if o > n:
                    break
                v -= F[n - o]
            F[n] = v
    return F


def gauss_sparse(N, d):
    """prod (1-q^{2dk})^2/(1-q^{4dk}) = sum_{m in Z} (-1)^m q^{2d m^2} (Gauss; T3), without the 1."""
    return [(2 * d * m * m, 2 * (-1) ** m) for m in range(1, math.isqrt(N // (2 * d)) + 1)]


def family_series(kind, t, N):
    """coefficients 0..N of the family's generating function (exact integers)."""
    if kind == "sq":                        # theta^S, theta = 1 + 2 sum_{m>=1} q^{m^2}
        th = [(m * m, 2) for m in range(1, math.isqrt(N) + 1)]
        F = [1] + [0] * N
        for _ in range(t):
            F = mul_sparse(F, th)
        return F
    e = dict(family_eta(kind, t))
    extra = []
    if kind == "sc":                        # prod(1+q^{2k-1}) = Gauss(q) / prod(1-q^k)
        for d, x in ((2, -2), (4, 1)):
            e[d] = e.get(d, 0) + x
        extra = gauss_sparse(N, 1)
    pos = {d: x for d, x in e.items() if x > 0}
    g = 0
    for d in pos:
        g = math.gcd(g, d)
    g = g or 1
    n = N // g                               # the positive part is a series in y = q^g
    F = [1] + [0] * n
    for d, x in sorted(pos.items()):
        for _ in range(x // 3):
            F = mul_sparse(F, jacobi_cube(n, d // g))
        for _ in range(x % 3):
            F = mul_sparse(F, pentagonal(n, d // g))
    G = [0] * (N + 1)
    G[::g] = F
    if extra:
        G = mul_sparse(G, extra)
    for d, x in sorted(e.items()):
        for _ in range(-x if x < 0 else 0):
            G = div_pentagonal(G, d)
    return G


# ------------------------------------------------------------ a file -------
PROV_KEYS = {"command", "date", "program", "version"}


def check_provenance(p, rel_text):
    if not isinstance(p, dict):
        raise Reject("/provenance", "not an object")
    for k in sorted(set(p) | PROV_KEYS):
        if k not in p:
            raise Reject("/provenance", "missing key %r" % k)
        if k not in PROV_KEYS:
            raise Reject("/provenance", "unknown key %r" % k)
        if not isinstance(p[k], str):
            raise Reject("/provenance/" + k, "not a string")
    if p["program"] != "circlet":
        raise Reject("/provenance/program", "not 'circlet'")
    if p["version"] not in VERSIONS:
        raise Reject("/provenance/version", "not one of %s" % (VERSIONS,))
    if not valid_date(p["date"]):
        raise Reject("/provenance/date", "not a valid UTC date YYYY-MM-DDTHH:MM:SSZ")
    try:
        argv = shlex.split(p["command"])
    except ValueError as e:
        raise Reject("/provenance/command", "not a shell command line: %s" % e)
    if len(argv) < 2 or argv[0] != "circlet" or argv[1] not in ("prove", "congruences"):
        raise Reject("/provenance/command", "neither 'circlet prove' nor 'circlet congruences'")
    opts, pos, i = {}, [], 2
    while i < len(argv):
        a = argv[i]
        name, eq, val = a.partition("=")
        if name.startswith("-"):
            name = "-o" if name == "--output" else name
            if name in opts:
                raise Reject("/provenance/command", "%s given twice" % name)
            if not eq:
                if i + 1 >= len(argv):
                    raise Reject("/provenance/command", "%s without a value" % name)
                i, val = i + 1, argv[i + 1]
            opts[name] = val
        else:
            pos.append(a)
        i += 1
    try:
        rel = parse_relation(rel_text)
    except (ValueError, IndexError) as e:
        raise Reject("/relation", "does not parse: %s" % e)
    if argv[1] == "congruences":
        # t, A and the prime of the modulus within the command's ranges (defaults 2..12, 50, 13)
        if pos or set(opts) - {"--t", "--amax", "--lmax", "--kmax", "--test-n", "-o"} or "-o" not in opts:
            raise Reject("/provenance/command", "not a congruences command: options --t --amax --lmax --kmax --test-n, one -o")
        m = re.fullmatch(r"([0-9]+)(?:\.\.([0-9]+))?", opts.get("--t", "2..12"))
        if not m or not all(re.fullmatch("[0-9]+", opts.get(k, "1")) for k in ("--amax", "--lmax")):
            raise Reject("/provenance/command", "a range or number of the command does not parse")
        tlo, thi = int(m.group(1)), int(m.group(2) or m.group(1))
        if len(rel.terms) != 1 or rel.restricted:
            raise Reject("/provenance/command", "circlet congruences writes one-term relations only")
        t, A = rel.terms[0].t, rel.terms[0].A
        if not tlo <= t <= thi:
            raise Reject("/provenance/command", "t outside the command's --t")
        if A > int(opts.get("--amax", "50")):
            raise Reject("/provenance/command", "A exceeds the command's --amax")
        M = rel.modulus
        if M and not any(M % q == 0 for q in range(2, int(opts.get("--lmax", "13")) + 1)):
            raise Reject("/provenance/command", "the prime of the modulus exceeds the command's --lmax")
        return MAX_M_CONGRUENCES
    if set(opts) - {"-o"} or len(pos) != 1:
        raise Reject("/provenance/command", "circlet prove takes one relation and at most one -o FILE")
    try:
        given = relation_text(parse_relation(pos[0]))
    except (ValueError, IndexError) as e:
        raise Reject("/provenance/command", "the quoted relation does not parse: %s" % e)
    if given != rel_text:
        raise Reject("/provenance/command", "the quoted relation is not the certificate's relation")
    return MAX_M_PROVE


def valid_date(d):
    m = re.fullmatch(r"([0-9]{4})-([0-9]{2})-([0-9]{2})T([0-9]{2}):([0-9]{2}):([0-9]{2})Z", d)
    if not m:
        return False
    y, mo, da, h, mi, se = (int(x) for x in m.groups())
    leap = y % 4 == 0 and (y % 100 != 0 or y % 400 == 0)
    days = [31, 29 if leap else 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]
    return 1 <= mo <= 12 and 1 <= da <= days[mo - 1] and h <= 23 and mi <= 59 and se <= 59


def first_pass(cert):
    if not isinstance(cert, dict):
        raise Malformed("not a JSON object")
    for k in ("format", "relation", "digest"):
        if not isinstance(cert.get(k), str):
            raise Reject("/" + k, "missing or not a string")
    if cert["format"] != FORMAT:
        raise Reject("/format", "not %s" % FORMAT)
    if cert["digest"] != digest_of(cert):
        raise Reject("/digest", "does not match the content (sha256 of the JSON without 'digest')")
    try:
        R = parse_relation(cert["relation"])
    except ValueError as e:
        raise Reject("/relation", "does not parse: %s" % e)
    if relation_text(R) != cert["relation"]:
        raise Reject("/relation", "not in normal form (expected %r)" % relation_text(R))
    max_m = check_provenance(cert.get("provenance"), cert["relation"])
    exp, plan = structure(R, max_m)
    keys = set(exp) | {"checked", "verdict", "reason", "theorems", "digest", "provenance"}
    if cert.get("verdict") == "REFUTED":
        keys.add("counterexample")
    for k in sorted(set(cert) | keys):
        if k not in cert:
            raise Reject("", "missing key %r" % k)
        if k not in keys:
            raise Reject("", "unknown key %r" % k)
    for k in ("modulus", "alignment", "terms", "combination_chain", "space", "index",
              "sturm_bound", "bound_rule"):
        if k in exp:
            same(exp[k], cert[k], "/" + k)
    need = {}
    for t in R.terms:
        need[(t.kind, t.t)] = max(need.get((t.kind, t.t), 0), t.A * (plan["n_check"] // t.d) + t.B)
    if max(need.values()) > MAX_SERIES:
        raise Reject("/checked/n_to", "needs more than %d coefficients (this checker's limit)" % MAX_SERIES)
    return R, plan, need


def second_pass(cert, R, plan, series):
    got = finish(R, plan, series)
    for k in ("checked", "verdict", "reason", "counterexample", "theorems"):
        if k in got or k in cert:
            if k not in cert:
                raise Reject("", "missing key %r" % k)
            if k not in got:
                raise Reject("", "unknown key %r" % k)
            same(got[k], cert[k], "/" + k)
    return got["verdict"]


def main(argv):
    verbose = "-v" in argv
    files = [a for a in argv if a != "-v"]
    if not files:
        print("usage: proof_check.py CERT.json [CERT2.json ...] [-v]")
        return 2
    worst, todo, need = 0, [], {}
    for f in files:
        try:
            cert = read_json(f)
            R, plan, nd = first_pass(cert)
            for k, v in nd.items():
                need[k] = max(need.get(k, 0), v)
            todo.append((f, cert, R, plan))
        except Reject as e:
            print("rejected: %s: %s" % (f, e))
            worst = max(worst, 1)
        except Malformed as e:
            print("malformed: %s: %s" % (f, e))
            worst = 2
        except (OSError, UnicodeError) as e:
            print("malformed: %s: cannot read: %s" % (f, e))
            worst = 2
    series = {}
    for (kind, t), n in sorted(need.items()):
        series[kind + str(t)] = family_series(kind, t, n)
        if verbose:
            print("series %s%d up to q^%d" % (kind, t, n))
    for f, cert, R, plan in todo:
        try:
            v = second_pass(cert, R, plan, series)
            if verbose:
                print("ok: %s: %s %s" % (f, v, cert["relation"]))
        except Reject as e:
            print("rejected: %s: %s" % (f, e))
            worst = max(worst, 1)
    if worst == 0:
        print("accepted")
    return worst


def run(argv):
    """main() with every failure turned into exit 2 (never a traceback)."""
    try:
        return main(argv)
    except Exception as e:
        print("malformed: internal: %s: %s" % (type(e).__name__, e))
        return 2


if __name__ == "__main__":
    sys.exit(run(sys.argv[1:]))
