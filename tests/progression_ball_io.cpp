#include "progression/ball_io.hpp"

#include <catch2/catch.hpp>

#include "core/error.hpp"

using namespace circlet;

// The midpoint reads back exactly; the radius (a 30-bit mag) reads back to itself
// or one unit larger, so the ball read back contains the ball written.
TEST_CASE("balls read back to a containing ball with the same midpoint", "[progression][ball_io]") {
  Arb x, y;
  arb_const_pi(x, 200);
  arb_mul_2exp_si(x, x, -7);
  arb_add_error_2exp_si(x, -150);
  ball_from_json(y, ball_to_json(x), "x");
  CHECK(arf_equal(arb_midref(x.get()), arb_midref(y.get())));
  CHECK(arb_contains(y, x));
  CHECK(ball_contains_tightly(y, x, 100));
  arb_zero(x);
  ball_from_json(y, ball_to_json(x), "x");
  CHECK(arb_equal(x, y));
  CHECK_THROWS_WITH(ball_from_json(y, nlohmann::json{{"mid", "1.5"}, {"rad", "0*2^0"}}, "the ball"),
                    Catch::Contains("the ball: '1.5' is not of the form m*2^e"));
  CHECK_THROWS_WITH(ball_from_json(y, nlohmann::json{{"mid", "1*2^0"}, {"rad", "-1*2^0"}}, "the ball"),
                    Catch::Contains("negative radius"));
}

TEST_CASE("tight containment accepts a recomputation and rejects a widened ball", "[progression][ball_io]") {
  Arb a, b;
  arb_const_e(a, 128);
  arb_const_e(b, 192);
  Arb stored = a;
  ball_add_margin(stored, 64);
  CHECK(ball_contains_tightly(stored, b, 40));
  Arb wide = stored;
  arb_add_error_2exp_si(wide, -30);
  CHECK_FALSE(ball_contains_tightly(wide, b, 40));
  Arb shifted = stored;
  arb_add_ui(shifted, shifted, 1, 128);
  CHECK_FALSE(ball_contains_tightly(shifted, b, 40));
}
