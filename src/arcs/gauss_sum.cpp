#include "arcs/gauss_sum.hpp"

#include <arb.h>
#include <flint/fmpq.h>
#include <flint/ulong_extras.h>

#include <map>
#include <memory>

#include "core/error.hpp"

namespace circlet {

namespace {

// e(j/m) for j = 0..m−1, through sin/cos of the exact rational 2j/m.
void fill_roots(std::vector<acb_struct>& v, ulong m, slong prec) {
  v.resize(m);
  fmpq_t q;
  fmpq_init(q);
  for (ulong j = 0; j < m; ++j) {
    acb_init(&v[j]);
    fmpq_set_si(q, static_cast<slong>(2 * j), m);
    arb_sin_cos_pi_fmpq(acb_imagref(&v[j]), acb_realref(&v[j]), q, prec);
  }
  fmpq_clear(q);
}

void clear_vec(std::vector<acb_struct>& v) {
  for (auto& z : v) acb_clear(&z);
  v.clear();
}

ulong mod_fmpz(const Fmpz& x, ulong m) { return fmpz_fdiv_ui(x.get(), m); }

}  // namespace

// ---- one-dimensional sums ------------------------------------------------
//
// R_m(α, β) = Σ_{x mod m} e((αx² + βx)/m). With g = gcd(α, m), m' = m/g,
// α' = α/g: writing x = y + m'z (y mod m', z mod g),
//   R_m(α, β) = [g | β] · g · R_{m'}(α', β/g),
// and (α', m') = 1. For any integer c the substitution x → x + c gives
//   R_{m'}(α', β' + 2α'c) = R_{m'}(α', β') · e(−(α'c² + β'c)/m').
// If m' is odd, 2α' is invertible and every β' is 0 + 2α'c; if m' is even,
// α' is odd and every β' is β₀ + 2α'c with β₀ = β' mod 2 ∈ {0, 1}. So two
// directly summed base sums and one exact phase give every R.

QuadraticSum1D::QuadraticSum1D(ulong m, ulong alpha, const std::vector<acb_struct>* roots, slong prec)
    : m_(m), roots_(roots) {
  CIRCLET_ASSERT(m >= 1 && m < (1UL << 31), "modulus out of range");
  CIRCLET_ASSERT(roots->size() == m, "root table of the wrong size");
  alpha %= m;
  g_ = n_gcd(alpha, m);  // n_gcd(0, m) = m
  mp_ = m / g_;
  ap_ = (alpha / g_) % mp_;
  ap_inv_ = 0;
  if (mp_ > 1) {
    if (mp_ % 2 == 1) {
      ap_inv_ = n_invmod((2 * ap_) % mp_, mp_);  // (2α')^{−1} mod m'
    } else if (mp_ / 2 > 1) {
      ap_inv_ = n_invmod(ap_ % (mp_ / 2), mp_ / 2);  // α'^{−1} mod m'/2
    }
  }
  for (int b0 = 0; b0 < 2; ++b0) {
    acb_init(base_[b0]);
    if (b0 == 1 && mp_ % 2 == 1) continue;
    // Direct summation of R_{m'}(α', β₀); e(j/m') = e(j g/m) from the table.
    for (ulong x = 0; x < mp_; ++x) {
      ulong j = ((ap_ * x % mp_) * x + static_cast<ulong>(b0) * x) % mp_;
      acb_add(base_[b0], base_[b0], &(*roots_)[j * g_], prec);
    }
  }
}

QuadraticSum1D::~QuadraticSum1D() {
  acb_clear(base_[0]);
  acb_clear(base_[1]);
}

void QuadraticSum1D::value(acb_t res, ulong beta, slong prec) const {
  beta %= m_;
  if (beta % g_ != 0) {
    acb_zero(res);
    return;
  }
  if (mp_ == 1) {
    acb_set_ui(res, g_);
    return;
  }
  const ulong bp = (beta / g_) % mp_;
  ulong b0, c;
  if (mp_ % 2 == 1) {
    b0 = 0;
    c = bp * ap_inv_ % mp_;  // 2α'c ≡ β'
  } else {
    b0 = bp & 1;
    const ulong half = mp_ / 2;
    c = (half == 1) ? 0 : ((bp - b0) / 2) % half * ap_inv_ % half;  // α'c ≡ (β' − β₀)/2 (mod m'/2)
  }
  // phase −(α'c² + β₀c) mod m'
  const ulong e = ((ap_ * c % mp_) * c + b0 * c) % mp_;
  const ulong j = (mp_ - e) % mp_;
  acb_mul(res, base_[b0], &(*roots_)[j * g_], prec);
  acb_mul_ui(res, res, g_, prec);
}

// ---- the Gauss sums of a model ---------------------------------------------
//
// Why D·P mod m = D·k is well defined on Λ/mΛ and why a representative x of a
// class of {x ∈ (Z/m)^t : Σ x_i ≡ 0} may be used although Σ x_i = m·s ≠ 0:
// D·P(x) = Σ α_i x_i² + β_i x_i with integers α_i, β_i, and for y ∈ Z^t
//   D·P(x + m y) − D·P(x) = Σ α_i(2 m x_i y_i + m² y_i²) + β_i m y_i ≡ 0 (mod m),
// so D·P mod m depends on x mod m only; the lift x − m s e_0 ∈ Λ therefore
// has the same value. Λ/mΛ → Λ/kΛ is D^r-to-one and e(a D P/m) = e(a P/k).

GaussSumTable::GaussSumTable(const QuadraticModel& model, ulong k, slong prec) : k_(k), rank_(model.rank) {
  CIRCLET_ASSERT(k >= 1, "k must be positive");
  CIRCLET_ASSERT(model.quad.size() == static_cast<size_t>(model.vars) &&
                     model.lin.size() == static_cast<size_t>(model.vars),
                 "model coefficients do not match the number of variables");
  // D = lcm of the denominators of the coefficients of P.
  Fmpz D(1);
  for (const auto* coeffs : {&model.quad, &model.lin})
    for (const auto& q : *coeffs) fmpz_lcm(D.get(), D.get(), fmpq_denref(q.get()));
  CIRCLET_ASSERT(fmpz_fits_si(D.get()) && fmpz_get_si(D.get()) <= 64, "unexpected coefficient denominators");
  const ulong d = fmpz_get_ui(D.get());
  const ulong m = d * k;

  // Integer coefficients of D·P.
  std::vector<Fmpz> qa(model.vars), la(model.vars);
  for (int i = 0; i < model.vars; ++i) {
    Fmpq t;
    fmpq_mul_fmpz(t.get(), model.quad[i].get(), D.get());
    fmpz_set(qa[i].get(), fmpq_numref(t.get()));
    fmpq_mul_fmpz(t.get(), model.lin[i].get(), D.get());
    fmpz_set(la[i].get(), fmpq_numref(t.get()));
  }

  std::vector<acb_struct> roots_m;
  fill_roots(roots_m, m, prec);
  fill_roots(roots_k_, k, prec);

  for (ulong a = 1; a <= k; ++a)
    if (n_gcd(a % k, k) == 1) units_.push_back(a % k == 0 ? 0 : a);  // k = 1: the unit 0 ≡ 1

  // Normalising factor D^{−vars} (no constraint) or D^{−(vars−1)}/m (constraint).
  acb_t norm;
  acb_init(norm);
  acb_one(norm);
  {
    arb_t den;
    arb_init(den);
    arb_ui_pow_ui(den, d, model.sum_zero ? model.vars - 1 : model.vars, prec);
    if (model.sum_zero) arb_mul_ui(den, den, m, prec);
    arb_inv(acb_realref(norm), den, prec);
    arb_clear(den);
  }

  g_.resize(units_.size());
  acb_t prod, term;
  acb_init(prod);
  acb_init(term);
  for (size_t u = 0; u < units_.size(); ++u) {
    acb_init(&g_[u]);
    const ulong a = units_[u];
    std::vector<ulong> alpha(model.vars), beta(model.vars);
    for (int i = 0; i < model.vars; ++i) {
      alpha[i] = (mod_fmpz(qa[i], m) * (a % m)) % m;
      beta[i] = (mod_fmpz(la[i], m) * (a % m)) % m;
    }
    // One 1-D sum object per distinct α.
    std::map<ulong, std::unique_ptr<QuadraticSum1D>> sums;
    for (ulong al : alpha)
      if (!sums.count(al)) sums[al] = std::make_unique<QuadraticSum1D>(m, al, &roots_m, prec);

    if (!model.sum_zero) {
      acb_one(prod);
      for (int i = 0; i < model.vars; ++i) {
        sums.at(alpha[i])->value(term, beta[i], prec);
        acb_mul(prod, prod, term, prec);
      }
      acb_set(&g_[u], prod);
    } else {
      // Tabulate R(α, β) for every β once per distinct α, then Σ_b Π_i.
      std::map<ulong, std::vector<acb_struct>> table;
      for (auto& [al, s] : sums) {
        auto& v = table[al];
        v.resize(m);
        for (ulong b = 0; b < m; ++b) {
          acb_init(&v[b]);
          s->value(&v[b], b, prec);
        }
      }
      for (ulong b = 0; b < m; ++b) {
        acb_one(prod);
        for (int i = 0; i < model.vars; ++i) {
          const auto& v = table.at(alpha[i]);
          acb_mul(prod, prod, &v[(beta[i] + b) % m], prec);
          if (acb_is_zero(prod)) break;
        }
        acb_add(&g_[u], &g_[u], prod, prec);
      }
      for (auto& [al, v] : table) clear_vec(v);
    }
    acb_mul(&g_[u], &g_[u], norm, prec);
  }
  acb_clear(prod);
  acb_clear(term);
  acb_clear(norm);
  clear_vec(roots_m);
}

GaussSumTable::~GaussSumTable() {
  clear_vec(g_);
  clear_vec(roots_k_);
}

void GaussSumTable::arc_coefficient(acb_t res, const Fmpz& n, slong prec) const {
  const ulong nk = mod_fmpz(n, k_);
  acb_t term;
  acb_init(term);
  acb_zero(res);
  for (size_t u = 0; u < units_.size(); ++u) {
    const ulong j = (k_ - (units_[u] % k_) * nk % k_) % k_;  // e(−a n/k)
    acb_mul(term, &g_[u], &roots_k_[j], prec);
    acb_add(res, res, term, prec);
  }
  // × k^{−r}
  arb_t kr;
  arb_init(kr);
  arb_ui_pow_ui(kr, k_, static_cast<ulong>(rank_), prec);
  acb_div_arb(res, res, kr, prec);
  arb_clear(kr);
  acb_clear(term);
}

std::optional<Fmpq> arc_coefficient_exact_from_ball(const acb_t ball, ulong k, int rank, slong prec) {
  if (!arb_contains_zero(acb_imagref(ball))) return std::nullopt;
  arb_t scaled;
  arb_init(scaled);
  Fmpz scale;
  fmpz_set_ui(scale.get(), k);
  fmpz_pow_ui(scale.get(), scale.get(), static_cast<ulong>(rank > 1 ? rank - 1 : 0));
  arb_mul_fmpz(scaled, acb_realref(ball), scale.get(), prec);
  Fmpz num;
  const bool unique = arb_get_unique_fmpz(num.get(), scaled) != 0;
  arb_clear(scaled);
  if (!unique) return std::nullopt;
  Fmpq v;
  fmpq_set_fmpz_frac(v.get(), num.get(), scale.get());
  return v;
}

GaussArcCoefficient arc_coefficient_by_gauss_sums(const QuadraticModel& model, const Fmpz& n, ulong k,
                                                  slong prec) {
  GaussSumTable table(model, k, prec);
  acb_t z;
  acb_init(z);
  table.arc_coefficient(z, n, prec);
  GaussArcCoefficient out;
  arb_set(out.re.get(), acb_realref(z));
  arb_set(out.im.get(), acb_imagref(z));
  out.exact = arc_coefficient_exact_from_ball(z, k, model.rank, prec);
  acb_clear(z);
  return out;
}

}  // namespace circlet
