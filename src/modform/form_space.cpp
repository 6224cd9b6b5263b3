#include "modform/form_space.hpp"

#include <flint/fmpz.h>

#include <numeric>

#include "core/error.hpp"
#include "modform/eta_product.hpp"

namespace circlet {

namespace {

long mul_checked(long a, long b) {
  long out;
  if (__builtin_mul_overflow(a, b, &out)) throw UserError("the level of the form exceeds 64-bit integers");
  return out;
}

long lcm_checked(long a, long b) { return mul_checked(a / std::gcd(a, b), b); }

long pmod(long a, long m) { return ((a % m) + m) % m; }

// Inverse of a modulo m (gcd(a, m) = 1), m ≥ 1.
long inv_mod(long a, long m) {
  if (m == 1) return 0;
  long t = 0, nt = 1, r = m, nr = pmod(a, m);
  while (nr != 0) {
    long q = r / nr;
    long tmp = t - q * nt; t = nt; nt = tmp;
    tmp = r - q * nr; r = nr; nr = tmp;
  }
  CIRCLET_ASSERT(r == 1, "inverse of a non-unit");
  return pmod(t, m);
}

// Intersection of the classes s1 mod S1 and s2 mod S2; false when empty.
bool crt_intersect(long s1, long S1, long s2, long S2, long* s, long* S) {
  long g = std::gcd(S1, S2);
  if (pmod(s1 - s2, g) != 0) return false;
  long L = lcm_checked(S1, S2);
  // s = s1 + S1 * t, S1 t ≡ s2 − s1 (mod S2): t ≡ ((s2−s1)/g)·inv(S1/g) mod S2/g
  long m2 = S2 / g;
  __int128 t = static_cast<__int128>(pmod((s2 - s1) / g, m2)) * inv_mod(S1 / g, m2) % (m2 == 0 ? 1 : m2);
  __int128 v = (static_cast<__int128>(s1) + static_cast<__int128>(S1) * t) % L;
  if (v < 0) v += L;
  *s = static_cast<long>(v);
  *S = L;
  return true;
}

long mul_character(long D, long d) { return squarefree_part(D * squarefree_part(d)); }

void record(std::vector<ChainStep>* chain, const std::string& op, const std::string& rule, const FormSpace& V) {
  if (chain) chain->push_back({op, rule, V});
}

}  // namespace

std::string FormSpace::character_str() const {
  if (gamma1) return "any (Gamma1)";
  if (character == 1) return "trivial";
  return "(" + std::to_string(character) + "/.)";
}

std::string FormSpace::str() const {
  std::string k = twice_weight % 2 == 0 ? std::to_string(twice_weight / 2) : std::to_string(twice_weight) + "/2";
  if (zero) return "the zero series";
  if (gamma1) return "M_" + k + "(Gamma1(" + std::to_string(level) + "))";
  std::string g = "Gamma0(" + std::to_string(level) + ")";
  if (twist_mod > 1 && !fmpz_is_one(group_index_factor(*this)))
    g += " with d^2 = 1 mod " + std::to_string(twist_mod);
  if (kernels) g += " in ker of " + std::to_string(kernels) + " quadratic character(s)";
  return "M_" + k + "(" + g + ", " + character_str() + ")";
}

namespace {
// Π_{p^e || N} first(p) · p^{later·(e−1)}: the indices of Γ0(N) and Γ1(N) are both of this form.
Fmpz multiplicative_index(long N, long (*first)(long), int later) {
  CIRCLET_ASSERT(N >= 1, "level must be positive");
  Fmpz r(1);
  long n = N;
  for (long p : prime_factors(N)) {
    long e = 0;
    while (n % p == 0) { n /= p; ++e; }
    fmpz_mul_si(r, r, first(p));
    for (long i = 0; i < later * (e - 1); ++i) fmpz_mul_si(r, r, p);
  }
  return r;
}
}  // namespace

// [SL2(Z):Γ0(N)] = N Π_{p|N} (1 + 1/p) = Π p^{e−1}(p + 1).
Fmpz index_gamma0(long N) {
  return multiplicative_index(N, [](long p) { return p + 1; }, 1);
}

// N² Π_{p|N} (1 − 1/p²) = Π p^{2(e−1)}(p² − 1) (the values of form_space.hpp, also at N = 1, 2).
Fmpz index_gamma1(long N) {
  return multiplicative_index(N, [](long p) { return p * p - 1; }, 2);
}

Fmpz group_index_factor(const FormSpace& V) {
  // φ(M') / #{d : d² ≡ 1 mod M'}: per prime power p^c, φ(p^c) over 2 (p odd), 1, 2, 4 (p = 2, c = 1, 2, ≥ 3).
  Fmpz f(1);
  long n = V.twist_mod;
  for (long p : prime_factors(n)) {
    long pc = 1, c = 0;
    while (n % p == 0) { n /= p; pc *= p; ++c; }
    long phi = pc / p * (p - 1);
    long sq = p != 2 ? 2 : (c == 1 ? 1 : (c == 2 ? 2 : 4));
    fmpz_mul_si(f, f, phi / sq);
  }
  for (int i = 0; i < V.kernels; ++i) fmpz_mul_si(f, f, 2);
  return f;
}

Fmpz space_index(const FormSpace& V) {
  if (V.gamma1) return index_gamma1(V.level);
  Fmpz i = index_gamma0(V.level);
  fmpz_mul(i, i, group_index_factor(V));
  return i;
}

namespace {
bool squarefree_modulus(const Fmpz& m) {
  if (fmpz_is_zero(m)) return true;
  return fmpz_is_square(m) ? fmpz_is_one(m) : [&] {
    fmpz_factor_t f;
    fmpz_factor_init(f);
    fmpz_factor(f, m);
    bool sq = true;
    for (slong i = 0; i < f->num; ++i)
      if (f->exp[i] > 1) sq = false;
    fmpz_factor_clear(f);
    return sq;
  }();
}
}  // namespace

Fmpz sturm_bound(const FormSpace& V, const Fmpz& modulus) {
  long twice_k = V.twice_weight;
  if (V.half_integral() && !squarefree_modulus(modulus)) twice_k += 1;  // f·θ
  Fmpz b = space_index(V);
  fmpz_mul_si(b, b, twice_k);
  fmpz_fdiv_q_ui(b, b, 24);  // ⌊(k'/12)·index⌋ = ⌊2k'·index/24⌋
  return b;
}

std::string sturm_rule(const FormSpace& V, const Fmpz& modulus) {
  std::string s = "Sturm (1987): a(m) for m <= floor((k/12) * [SL2(Z):Gamma]), Gamma = " +
                  std::string(V.gamma1 ? "Gamma1(N)" : "the group of the space, index [SL2(Z):Gamma0(N)] * " + group_index_factor(V).str());
  if (V.half_integral())
    s += squarefree_modulus(modulus) ? ", applied to f^2 (weight 2k; ord f^2 = 2 ord f)"
                                     : ", applied to f*theta (weight k + 1/2; theta a unit of Z[[q]])";
  if (!fmpz_is_zero(modulus) && !squarefree_modulus(modulus)) s += "; prime powers by induction (f = l*g, g in the same space)";
  return s;
}

FormSpace op_lift(const FormSpace& V, long N, std::vector<ChainStep>* chain) {
  CIRCLET_ASSERT(N % V.level == 0, "lift to a level that is not a multiple");
  FormSpace W = V;
  W.level = N;
  if (N != V.level) record(chain, "lift to level " + std::to_string(N), "Gamma0(N') is a subgroup of Gamma0(N) for N | N'", W);
  return W;
}

FormSpace op_V(const FormSpace& V, long d, std::vector<ChainStep>* chain) {
  CIRCLET_ASSERT(d >= 1, "V_d needs d >= 1");
  if (d == 1) return V;
  FormSpace W = V;
  W.level = mul_checked(V.level, d);
  W.support_mod = mul_checked(V.support_mod, d);
  W.support_res = mul_checked(V.support_res, d);
  std::string rule;
  if (V.half_integral()) {
    if (!W.gamma1) W.character = mul_character(V.character, d);
    rule = "Ono, The web of modularity (2004), Prop. 3.7: V(d) maps (4N, chi) to (4Nd, (4d/.)chi) (quoted from memory)";
  } else {
    rule = "Ono, The web of modularity (2004), Prop. 2.22: V(d) maps level N to Nd, same character (quoted from memory)";
  }
  record(chain, "V_" + std::to_string(d), rule, W);
  return W;
}

FormSpace op_U(const FormSpace& V, long d, std::vector<ChainStep>* chain) {
  CIRCLET_ASSERT(d >= 1, "U_d needs d >= 1");
  if (d == 1) return V;
  FormSpace W = V;
  // Support: a(d m') ≠ 0 needs d m' ≡ s (mod S).
  long g = std::gcd(d, V.support_mod);
  if (V.zero || V.support_res % g != 0) {
    W.zero = true;
  } else {
    long S2 = V.support_mod / g;
    W.support_mod = S2;
    W.support_res = S2 == 1 ? 0 : static_cast<long>(static_cast<__int128>(V.support_res / g) * inv_mod(d / g, S2) % S2);
  }
  std::string rule;
  if (V.half_integral()) {
    long Np = V.level / 4;
    if (Np % d != 0) {
      W.level = mul_checked(4, lcm_checked(Np, d));
      record(chain, "lift to level " + std::to_string(W.level), "Gamma0(N') is a subgroup of Gamma0(N) for N | N' (so that d | N'/4)", [&] { FormSpace t = V; t.level = W.level; return t; }());
    }
    if (!W.gamma1) W.character = mul_character(V.character, d);
    rule = "Ono, The web of modularity (2004), Prop. 3.7: U(d) for d | N maps (4N, chi) to (4N, (4d/.)chi) (quoted from memory)";
  } else {
    long N = V.level;
    for (long p : prime_factors(d))
      if (N % p != 0) N = mul_checked(N, p);
    if (N != V.level) {
      W.level = N;
      record(chain, "lift to level " + std::to_string(N), "Gamma0(N') is a subgroup of Gamma0(N) for N | N' (so that every prime of d divides the level)", [&] { FormSpace t = V; t.level = N; return t; }());
    }
    rule = "Ono, The web of modularity (2004), Prop. 2.22: U(p) for p | N preserves M_k(Gamma0(N), chi); U(d) = product of U(p) (quoted from memory)";
  }
  record(chain, "U_" + std::to_string(d), rule, W);
  return W;
}

FormSpace op_sieve(const FormSpace& V, long r, long M, std::vector<ChainStep>* chain) {
  CIRCLET_ASSERT(M >= 1, "sieve modulus must be positive");
  r = pmod(r, M);
  FormSpace W = V;
  long fs = 0, fS = 1;
  if (V.zero || !crt_intersect(V.support_res, V.support_mod, r, M, &fs, &fS)) {
    W.zero = true;
    record(chain, "sieve m = " + std::to_string(r) + " mod " + std::to_string(M), "the class misses the support: zero", W);
    return W;
  }
  long n = M;
  for (long p : prime_factors(M)) {
    long pa = 1, a = 0;
    while (n % p == 0) { n /= p; pa *= p; ++a; }
    long rp = r % pa;
    if (V.support_mod % pa == 0 && pmod(V.support_res - rp, pa) == 0) continue;  // implied by the support
    if (rp == 0) {
      W = op_U(W, pa, chain);
      W = op_V(W, pa, chain);
      continue;
    }
    long pb = 1;
    while (rp % (pb * p) == 0) pb *= p;
    long pc = pa / pb;
    W = op_U(W, pb, chain);
    // Coprime class rp/pb mod pc: a combination of twists by all ψ mod pc.
    W.level = mul_checked(W.level, mul_checked(pc, pc));
    bool all_quadratic = pc == 2 || pc == 3 || pc == 4 || pc == 8;
    W.twist_mod = lcm_checked(W.twist_mod, pc);
    long s2, S2;
    if (!crt_intersect(W.support_res, W.support_mod, (rp / pb) % pc, pc, &s2, &S2)) {
      W.zero = true;
    } else {
      W.support_res = s2;
      W.support_mod = S2;
    }
    record(chain, "sieve m = " + std::to_string((rp / pb) % pc) + " mod " + std::to_string(pc) + " (twists)",
           all_quadratic ? "Koblitz, GTM 97, Prop. III.3.17: twist by psi mod M lands in (N M^2, chi psi^2); every psi mod " +
                               std::to_string(pc) + " has psi^2 = 1"
                         : "Koblitz, GTM 97, Prop. III.3.17: twists by psi mod M land in (N M^2, chi psi^2); every psi^2 is "
                           "trivial on d with d^2 = 1 mod " + std::to_string(pc) + ", so the sum transforms with chi there",
           W);
    W = op_V(W, pb, chain);
  }
  W.support_res = fs;
  W.support_mod = fS;
  return W;
}

FormSpace op_complement(const FormSpace& V, long r, long M, std::vector<ChainStep>* chain) {
  FormSpace S = op_sieve(V, r, M, chain);
  FormSpace W = op_combine({V, S}, nullptr);
  W.support_res = V.support_res;
  W.support_mod = V.support_mod;
  record(chain, "complement: f - (f sieved to m = " + std::to_string(pmod(r, M)) + " mod " + std::to_string(M) + ")",
         "a difference of two forms: lcm of the levels, one character if both agree, else Gamma1", W);
  return W;
}

FormSpace op_combine(const std::vector<FormSpace>& terms, std::vector<ChainStep>* chain) {
  FormSpace W;
  bool first = true;
  for (const auto& t : terms) {
    if (t.zero) continue;
    if (first) {
      W = t;
      first = false;
      continue;
    }
    CIRCLET_ASSERT(t.twice_weight == W.twice_weight, "combination of forms of different weights");
    W.level = lcm_checked(W.level, t.level);
    W.twist_mod = lcm_checked(W.twist_mod, t.twist_mod);
    W.kernels += t.kernels;
    if (t.gamma1) W.gamma1 = true;
    if (t.character != W.character) W.kernels += 1;  // restrict to ker(χ χ_t): index at most 2
    long g = std::gcd(W.support_mod, t.support_mod);
    g = std::gcd(g, std::labs(W.support_res - t.support_res));
    if (g == 0) g = W.support_mod;
    W.support_mod = g;
    W.support_res = pmod(W.support_res, g);
  }
  if (first) {
    W = terms.empty() ? FormSpace{} : terms.front();
    W.zero = true;
  }
  record(chain, "combine " + std::to_string(terms.size()) + " terms",
         W.kernels ? "characters differ: on the kernel of their quotient (index <= 2 each) all terms share chi"
                   : "M_k(Gamma, chi) is a vector space; each term lifted to the lcm of the levels",
         W);
  return W;
}

nlohmann::json space_to_json(const FormSpace& V) {
  return {{"space", V.str()},
          {"group", V.gamma1 ? "Gamma1" : "Gamma0"},
          {"twist_modulus", V.twist_mod},
          {"kernels", V.kernels},
          {"index_factor", group_index_factor(V).str()},
          {"level", V.level},
          {"twice_weight", V.twice_weight},
          {"character", V.gamma1 ? std::string("none") : std::to_string(V.character)},
          {"support", std::to_string(V.support_res) + " mod " + std::to_string(V.support_mod)},
          {"zero", V.zero ? "yes" : "no"}};
}

nlohmann::json chain_to_json(const std::vector<ChainStep>& chain) {
  nlohmann::json a = nlohmann::json::array();
  for (const auto& s : chain) a.push_back({{"op", s.op}, {"rule", s.rule}, {"after", space_to_json(s.after)}});
  return a;
}

}  // namespace circlet
