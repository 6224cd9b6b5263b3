#pragma once
// Arb's own Dirichlet L-functions as an outside reference for the L-value tests.
#include <acb.h>
#include <acb_dirichlet.h>
#include <arb.h>
#include <dirichlet.h>

#include "mainterm/dirichlet_l.hpp"

namespace circlet::testing {

// L(k, χ_d) from Arb's acb_dirichlet_l (an independent implementation: Hurwitz
// zeta sums), finding the Conrey character whose values equal (d/a).
inline bool arb_reference_l(arb_t res, slong d, ulong k, slong prec) {
  ulong f = (ulong)(d < 0 ? -d : d);
  dirichlet_group_t G;
  dirichlet_group_init(G, f);
  dirichlet_char_t chi;
  dirichlet_char_init(chi, G);
  bool found = false;
  dirichlet_char_one(chi, G);
  do {
    bool ok = true;
    for (ulong a = 1; a <= f && ok; ++a) {
      ulong e = dirichlet_chi(G, chi, a);
      int v = e == DIRICHLET_CHI_NULL ? 0 : (e == 0 ? 1 : (2 * e == G->expo ? -1 : 2));
      ok = (v == kronecker_symbol(d, a));
    }
    if (ok) {
      found = true;
      break;
    }
  } while (dirichlet_char_next(chi, G) >= 0);
  if (found) {
    acb_t s, z;
    acb_init(s);
    acb_init(z);
    acb_set_ui(s, k);
    acb_dirichlet_l(z, s, G, chi, prec);
    arb_set(res, acb_realref(z));
    acb_clear(s);
    acb_clear(z);
  }
  dirichlet_char_clear(chi);
  dirichlet_group_clear(G);
  return found;
}

}  // namespace circlet::testing
