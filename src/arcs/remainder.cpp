#include "arcs/remainder.hpp"

#include <arb.h>
#include <flint/fmpq.h>

#include <cmath>

#include "arcs/certified_bound.hpp"
#include "core/error.hpp"

namespace circlet {

namespace {

// res = x / X^{e} for a rational exponent e, as a ball (X > 0).
void divide_by_power(arb_t res, const arb_t x, const Fmpq& X, const Fmpq& e, slong prec) {
  arb_t p, eb;
  arb_init(p);
  arb_init(eb);
  arb_set_fmpq(p, X.get(), prec);
  arb_set_fmpq(eb, e.get(), prec);
  arb_pow(p, p, eb, prec);  // X > 0, so the power is a ball enclosure
  arb_div(res, x, p, prec);
  arb_clear(p);
  arb_clear(eb);
}

}  // namespace

RemainderTable remainder_table(const QuadraticModel& model, const std::vector<Fmpz>& ns,
                               const std::vector<Fmpz>& counts, const MainTermFunction& main_term,
                               slong prec) {
  CIRCLET_ASSERT(ns.size() == counts.size(), "remainder: one count per n");
  RemainderTable out;
  RemainderSummary& s = out.summary;
  const int r = model.rank;  // 2w
  s.deligne_exponent = (r / 2.0 - 1.0) / 2.0;
  s.hecke_exponent = r / 4.0;
  auto cert = certified_remainder_bound(model.family);
  if (cert) s.certified_statement = cert->statement();

  std::vector<double> xs, abs_e;
  Arb sumsq, sq, absv;
  double best_d = -1, best_h = -1;
  s.identically_zero = true;
  for (size_t i = 0; i < ns.size(); ++i) {
    RemainderRow row;
    row.n = ns[i];
    row.X = model.X(ns[i]);
    if (fmpq_sgn(row.X.get()) <= 0) throw UserError("X = n + Delta must be positive (n = " + ns[i].str() + ")");
    row.count = counts[i];
    row.main = main_term(ns[i]);
    if (row.main.exact) {
      Fmpq e;
      fmpq_set_fmpz_frac(e.get(), row.count.get(), Fmpz(1).get());
      fmpq_sub(e.get(), e.get(), row.main.exact->get());
      arb_set_fmpq(row.remainder.get(), e.get(), prec);
      row.remainder_exact = e;
      if (!e.is_zero()) s.identically_zero = false;
    } else {
      arb_set_fmpz(row.remainder.get(), row.count.get());
      arb_sub(row.remainder.get(), row.remainder.get(), row.main.ball.get(), prec);
      s.identically_zero = false;
    }
    // E/X^{(w−1)/2} = E/X^{(r−2)/4} and E/X^{w/2} = E/X^{r/4}.
    divide_by_power(row.deligne.get(), row.remainder.get(), row.X, Fmpq(r - 2, 4), prec);
    divide_by_power(row.hecke.get(), row.remainder.get(), row.X, Fmpq(r, 4), prec);
    if (cert) {
      row.certified_bound = cert->bound(row.n);
      // Proved only when |E| ≤ B holds for the whole ball.
      arb_abs(absv.get(), row.remainder.get());
      arb_t b;
      arb_init(b);
      arb_set_fmpq(b, row.certified_bound->get(), prec);
      row.within_certified_bound = arb_le(absv.get(), b) != 0;
      arb_clear(b);
      if (!row.within_certified_bound) ++s.certified_violations;
    }
    // Statistics: the max is chosen by midpoints (a display choice), reported as a ball.
    arb_abs(absv.get(), row.deligne.get());
    const double d = arf_get_d(arb_midref(absv.get()), ARF_RND_NEAR);
    if (d > best_d) {
      best_d = d;
      arb_set(s.max_abs_deligne.get(), absv.get());
      s.argmax_deligne = row.n;
    }
    arb_abs(absv.get(), row.hecke.get());
    const double h = arf_get_d(arb_midref(absv.get()), ARF_RND_NEAR);
    if (h > best_h) {
      best_h = h;
      arb_set(s.max_abs_hecke.get(), absv.get());
      s.argmax_hecke = row.n;
    }
    arb_sqr(sq.get(), row.deligne.get(), prec);
    arb_add(sumsq.get(), sumsq.get(), sq.get(), prec);
    xs.push_back(fmpq_get_d(row.X.get()));
    abs_e.push_back(std::fabs(arf_get_d(arb_midref(row.remainder.get()), ARF_RND_NEAR)));
    out.rows.push_back(std::move(row));
  }
  s.rows = out.rows.size();
  if (s.rows) arb_div_ui(s.mean_square_deligne.get(), sumsq.get(), s.rows, prec);
  s.fit = fit_growth_exponent(xs, abs_e);
  return out;
}

}  // namespace circlet
