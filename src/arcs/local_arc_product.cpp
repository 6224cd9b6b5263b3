#include "arcs/local_arc_product.hpp"

#include <flint/fmpq.h>
#include <flint/ulong_extras.h>

#include "core/error.hpp"
#include "quadratic/local_density.hpp"

namespace circlet {

Fmpq arc_coefficient_from_local_pieces(const QuadraticModel& model, const Fmpz& n, ulong k) {
  CIRCLET_ASSERT(k >= 1, "k must be positive");
  Fmpq result(1);
  n_factor_t fac;
  n_factor_init(&fac);
  n_factor(&fac, k, 1);
  for (int i = 0; i < fac.num; ++i) {
    const Fmpq piece = local_arc_piece(model, n, fac.p[i], static_cast<int>(fac.exp[i]));
    fmpq_mul(result.get(), result.get(), piece.get());
    if (result.is_zero()) break;
  }
  return result;
}

}  // namespace circlet
