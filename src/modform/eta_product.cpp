#include "modform/eta_product.hpp"

#include <flint/fmpq.h>

#include <map>
#include <numeric>

#include "core/error.hpp"

namespace circlet {

namespace {

EtaProduct normalised(std::map<long, long> m) {
  EtaProduct p;
  for (const auto& [d, r] : m)
    if (r != 0) p.factors.push_back({d, r});
  return p;
}

long lcm_checked(long a, long b) {
  long g = std::gcd(a, b);
  long out;
  CIRCLET_ASSERT(!__builtin_mul_overflow(a / g, b, &out), "level overflow");
  return out;
}

long mod24(long x) { return ((x % 24) + 24) % 24; }

}  // namespace

long EtaProduct::twice_weight() const {
  long s = 0;
  for (const auto& f : factors) s += f.r;
  return s;
}

long EtaProduct::order_sum() const {
  long s = 0;
  for (const auto& f : factors) s += f.delta * f.r;
  return s;
}

std::string EtaProduct::str() const {
  std::string s;
  for (const auto& f : factors) {
    if (!s.empty()) s += " ";
    s += "eta(" + std::to_string(f.delta) + "t)^" + std::to_string(f.r);
  }
  return s.empty() ? "1" : s;
}

EtaProduct EtaProduct::dilate(long D) const {
  std::map<long, long> m;
  for (const auto& f : factors) m[f.delta * D] += f.r;
  return normalised(m);
}

EtaProduct EtaProduct::times(const EtaProduct& o) const {
  std::map<long, long> m;
  for (const auto& f : factors) m[f.delta] += f.r;
  for (const auto& f : o.factors) m[f.delta] += f.r;
  return normalised(m);
}

FamilyForm family_form(const Family& family) {
  FamilyForm out{family, {}, 1, 0};
  std::map<long, long> m;
  long sum = 0;  // Σ d e_d = 24 s
  for (const auto& f : family.eta_quotient()) {
    m[f.d] += f.e;
    sum += f.d * f.e;
  }
  // s = sum/24 = u/D in lowest terms; the q^{s} of Π η(dτ)^{e_d} = q^{s} Π (1 − q^{dk})^{e_d}.
  long g = std::gcd(std::labs(sum), 24L);
  if (sum == 0) g = 24;
  out.D = 24 / g;
  out.shift = sum / g;
  out.eta = normalised(m).dilate(out.D);
  return out;
}

EtaProduct theta_eta_product() { return normalised({{1, -2}, {2, 5}, {4, -2}}); }

bool ghn_conditions_hold(const EtaProduct& f, long N) {
  long a = 0, b = 0;
  for (const auto& e : f.factors) {
    if (N % e.delta != 0) return false;
    a = mod24(a + mod24(e.delta) * mod24(e.r));
    b = mod24(b + mod24(N / e.delta) * mod24(e.r));
  }
  return a == 0 && b == 0;
}

std::vector<long> prime_factors(long n) {
  std::vector<long> ps;
  for (long p = 2; p * p <= n; ++p)
    if (n % p == 0) {
      ps.push_back(p);
      while (n % p == 0) n /= p;
    }
  if (n > 1) ps.push_back(n);
  return ps;
}

std::vector<long> divisors(long n) {
  std::vector<long> lo, hi;
  for (long d = 1; d * d <= n; ++d)
    if (n % d == 0) {
      lo.push_back(d);
      if (d * d != n) hi.push_back(n / d);
    }
  lo.insert(lo.end(), hi.rbegin(), hi.rend());
  return lo;
}

long squarefree_part(long x) {
  CIRCLET_ASSERT(x != 0, "squarefree part of 0");
  long s = x < 0 ? -1 : 1;
  long n = std::labs(x);
  for (long p : prime_factors(n)) {
    int e = 0;
    while (n % p == 0) {
      n /= p;
      ++e;
    }
    if (e % 2) s *= p;
  }
  return s;
}

long ghn_character(const EtaProduct& f) {
  // s = Π δ^{r_δ}: only the parity of each prime's exponent matters for (s/d).
  std::map<long, long> parity;
  for (const auto& e : f.factors) {
    long n = e.delta;
    for (long p : prime_factors(n)) {
      long v = 0;
      while (n % p == 0) {
        n /= p;
        ++v;
      }
      parity[p] = (parity[p] + v * (e.r % 2 != 0 ? 1 : 0)) % 2;
    }
  }
  long D = 1;
  for (const auto& [p, v] : parity)
    if (v) D *= p;
  long k2 = f.twice_weight();
  if (k2 % 2 == 0 && (k2 / 2) % 2 != 0) D = -D;  // (−1)^k
  return D;
}

EtaModularity eta_modularity(const EtaProduct& f) {
  EtaModularity m;
  m.twice_weight = f.twice_weight();
  long L = 1;
  for (const auto& e : f.factors) L = lcm_checked(L, e.delta);
  EtaProduct test = f;
  if (m.twice_weight % 2 != 0) {
    // θ-division: f/θ^{2k} has weight 0 (θ^{2k} has weight k).
    EtaProduct th = theta_eta_product();
    for (auto& e : th.factors) e.r *= -m.twice_weight;
    test = f.times(th);
    m.weight_zero = test;
    L = lcm_checked(L, 4);
  }
  // The conditions are periodic in N/L with period dividing 24: the least N is L·j, j ≤ 24.
  for (long j = 1; j <= 24; ++j) {
    long N = L * j;
    if (ghn_conditions_hold(test, N)) {
      m.ok = true;
      m.level = N;
      break;
    }
  }
  if (!m.ok) return m;
  m.character = ghn_character(test);
  m.rule = m.twice_weight % 2 != 0
               ? "Gordon-Hughes-Newman applied to f/theta^" + std::to_string(m.twice_weight) +
                     " (weight 0); f = (f/theta^" + std::to_string(m.twice_weight) + ")*theta^" +
                     std::to_string(m.twice_weight) + ", Shimura's multiplier"
               : "Gordon-Hughes-Newman";
  return m;
}

Fmpq ligozat_order(const EtaProduct& f, long N, long d) {
  CIRCLET_ASSERT(d > 0 && N % d == 0, "cusp denominator must divide N");
  // (N/24) Σ_δ gcd(d,δ)² r_δ / (gcd(d,N/d) d δ)
  Fmpq sum(0), term;
  long g = std::gcd(d, N / d);
  for (const auto& e : f.factors) {
    long gd = std::gcd(d, e.delta);
    Fmpz num(gd), den(g);
    fmpz_mul_si(num, num, gd);
    fmpz_mul_si(num, num, e.r);
    fmpz_mul_si(num, num, N);
    fmpz_mul_si(den, den, d);
    fmpz_mul_si(den, den, e.delta);
    fmpz_mul_si(den, den, 24);
    fmpq_set_fmpz_frac(term, num, den);
    fmpq_add(sum, sum, term);
  }
  return sum;
}

std::vector<std::pair<long, Fmpq>> ligozat_orders(const EtaProduct& f, long N) {
  std::vector<std::pair<long, Fmpq>> out;
  for (long d : divisors(N)) out.emplace_back(d, ligozat_order(f, N, d));
  return out;
}

bool holomorphic_at_cusps(const EtaProduct& f, long N) {
  for (const auto& [d, o] : ligozat_orders(f, N))
    if (fmpq_sgn(o) < 0) return false;
  return true;
}

}  // namespace circlet
