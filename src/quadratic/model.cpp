#include "quadratic/model.hpp"

#include "core/error.hpp"

namespace circlet {

Fmpq QuadraticModel::X(const Fmpz& n) const {
  Fmpq x(n);
  fmpq_add(x.get(), x.get(), delta.get());
  return x;
}

Fmpq QuadraticModel::evaluate(const std::vector<long>& x) const {
  CIRCLET_ASSERT(static_cast<int>(x.size()) == vars, "evaluate: vector length differs from the number of variables");
  Fmpq acc, term;
  for (int i = 0; i < vars; ++i) {
    // quad[i]·x_i² + lin[i]·x_i
    Fmpz xi(x[i]);
    Fmpz sq;
    fmpz_mul(sq.get(), xi.get(), xi.get());
    fmpq_mul_fmpz(term.get(), quad[i].get(), sq.get());
    fmpq_add(acc.get(), acc.get(), term.get());
    fmpq_mul_fmpz(term.get(), lin[i].get(), xi.get());
    fmpq_add(acc.get(), acc.get(), term.get());
  }
  return acc;
}

namespace {

// q^e for a rational q and e ≥ 0.
Fmpq power(const Fmpq& q, ulong e) {
  Fmpq r(1);
  fmpz_pow_ui(fmpq_numref(r.get()), fmpq_numref(q.get()), e);
  fmpz_pow_ui(fmpq_denref(r.get()), fmpq_denref(q.get()), e);
  fmpq_canonicalise(r.get());
  return r;
}

std::vector<std::vector<Fmpq>> zero_matrix(int r) {
  return std::vector<std::vector<Fmpq>>(r, std::vector<Fmpq>(r, Fmpq(0)));
}

}  // namespace

QuadraticModel quadratic_model(const Family& family) {
  QuadraticModel m;
  m.family = family;
  m.rank = family.rank();
  const long t = family.t;
  switch (family.kind) {
    case FamilyKind::Core: {
      // docs/MATH.md §2: c_t(n) = #{x ∈ Z^t : Σx_i = 0, (t/2)Σx_i² + Σ i·x_i = n}.
      m.vars = static_cast<int>(t);
      m.sum_zero = true;
      m.quad.assign(t, Fmpq(t, 2));
      for (long i = 0; i < t; ++i) m.lin.emplace_back(i);
      // Free coordinates x_0..x_{t−2}, x_{t−1} = −Σ: Σ_{all} x_i² = xᵀ(I + J)x, so S = (t/2)(I + J).
      const int r = m.rank;
      m.gram = zero_matrix(r);
      for (int i = 0; i < r; ++i)
        for (int k = 0; k < r; ++k) m.gram[i][k] = (i == k) ? Fmpq(t) : Fmpq(t, 2);
      // det(I + J) = 1 + r = t (eigenvalues 1 (r−1 times) and 1 + r), so det S = (t/2)^{t−1}·t.
      m.det_gram = power(Fmpq(t, 2), static_cast<ulong>(t - 1));
      fmpq_mul_si(m.det_gram.get(), m.det_gram.get(), t);
      // Δ = (t² − 1)/24 (docs/MATH.md §2 table; checked in tests against S⁻¹ and P).
      m.delta = Fmpq(t * t - 1, 24);
      break;
    }
    case FamilyKind::SelfConjugateCore: {
      // docs/MATH.md §2: sc_t(n) = #{y ∈ Z^m : tΣy_i² + Σ(2i+1−t)y_i = n}, m = ⌊t/2⌋.
      const long mm = t / 2;
      m.vars = static_cast<int>(mm);
      m.quad.assign(mm, Fmpq(t));
      for (long i = 0; i < mm; ++i) m.lin.emplace_back(2 * i + 1 - t);
      m.gram = zero_matrix(static_cast<int>(mm));
      for (long i = 0; i < mm; ++i) m.gram[i][i] = Fmpq(t);
      m.det_gram = power(Fmpq(t), static_cast<ulong>(mm));
      // Δ = Σ(2i+1−t)²/(4t): for t odd Σ_{k=1}^{m}(2k)²/(4(2m+1)) = m(m+1)/6; for t even
      // Σ of the odd squares 1..(t−1)², m(4m²−1)/3, over 8m = (t²−1)/24.
      if (t % 2 == 1) m.delta = Fmpq(mm * (mm + 1), 6);
      else m.delta = Fmpq(t * t - 1, 24);
      break;
    }
    case FamilyKind::SumOfSquares: {
      m.vars = static_cast<int>(t);
      m.quad.assign(t, Fmpq(1));
      m.lin.assign(t, Fmpq(0));
      m.gram = zero_matrix(static_cast<int>(t));
      for (long i = 0; i < t; ++i) m.gram[i][i] = Fmpq(1);
      m.det_gram = Fmpq(1);
      m.delta = Fmpq(0);
      break;
    }
  }
  return m;
}

}  // namespace circlet
