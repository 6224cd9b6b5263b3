// Tests for src/arcs/local_arc_product.hpp: route (a) = route (b).
#include "arcs/local_arc_product.hpp"

#include <catch2/catch.hpp>

#include "arcs/gauss_sum.hpp"
#include "quadratic/model.hpp"

using namespace circlet;

namespace {

void check_routes_agree(const char* family, ulong kmax, std::initializer_list<long> ns, ulong kstep = 1) {
  const auto model = quadratic_model(Family::parse(family));
  for (ulong k = 1; k <= kmax; k += kstep) {
    GaussSumTable table(model, k, 128);  // the Gauss sums do not depend on n
    acb_t z;
    acb_init(z);
    for (long n : ns) {
      table.arc_coefficient(z, Fmpz(n), 128);
      auto exact = arc_coefficient_exact_from_ball(z, k, model.rank, 128);
      INFO(family << " k=" << k << " n=" << n);
      REQUIRE(exact.has_value());
      CHECK(exact->str() == arc_coefficient_from_local_pieces(model, Fmpz(n), k).str());
    }
    acb_clear(z);
  }
}

}  // namespace

TEST_CASE("route (a) = route (b) for k <= 60", "[arcs][routes]") {
  check_routes_agree("c5", 60, {0, 1, 7, 100});
  check_routes_agree("c6", 60, {0, 3, 101});
  check_routes_agree("c7", 40, {0, 5, 98});
  check_routes_agree("sc9", 60, {0, 2, 40, 1000});
  check_routes_agree("sq5", 60, {1, 4, 12, 1000});
}

TEST_CASE("route (a) = route (b) for every k <= 200", "[arcs][routes][slow]") {
  check_routes_agree("c5", 200, {0, 1, 7, 100, 12345});
  check_routes_agree("c6", 200, {0, 3, 101, 5000});
  check_routes_agree("c7", 200, {0, 5, 98, 4321});
  check_routes_agree("sc9", 200, {0, 2, 40, 1000});
  check_routes_agree("sq5", 200, {1, 4, 12, 1000, 4096});
}
