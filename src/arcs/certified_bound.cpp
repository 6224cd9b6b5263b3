#include "arcs/certified_bound.hpp"

#include <flint/fmpz_factor.h>

#include "core/error.hpp"

namespace circlet {

Fmpz divisor_count(const Fmpz& m) {
  CIRCLET_ASSERT(fmpz_sgn(m.get()) > 0, "divisor_count: m must be positive");
  fmpz_factor_t f;
  fmpz_factor_init(f);
  fmpz_factor(f, m.get());
  Fmpz d(1);
  for (slong i = 0; i < f->num; ++i) fmpz_mul_ui(d.get(), d.get(), f->exp[i] + 1);
  fmpz_factor_clear(f);
  return d;
}

namespace {

class C7CmBound : public CertifiedRemainderBound {
 public:
  std::string statement() const override { return "|E(n)| <= d(n+2)(n+2)/8"; }
  std::string source() const override {
    return "E(n) = -a(n+2)/8 with sum a(m) q^m = eta(tau)^3 eta(7 tau)^3, a CM form of weight 3; "
           "|a(m)| <= d(m) m (Deligne's bound, elementary for CM forms)";
  }
  Fmpq bound(const Fmpz& n) const override {
    Fmpz m;
    fmpz_add_ui(m.get(), n.get(), 2);
    CIRCLET_ASSERT(fmpz_sgn(m.get()) > 0, "c7 bound: n must be >= 0");
    Fmpz num = divisor_count(m);
    fmpz_mul(num.get(), num.get(), m.get());
    Fmpq b;
    fmpq_set_fmpz_frac(b.get(), num.get(), Fmpz(8).get());
    return b;
  }
};

}  // namespace

std::unique_ptr<CertifiedRemainderBound> certified_remainder_bound(const Family& family) {
  if (family.kind == FamilyKind::Core && family.t == 7) return std::make_unique<C7CmBound>();
  return nullptr;
}

}  // namespace circlet
