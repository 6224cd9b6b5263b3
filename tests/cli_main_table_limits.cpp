// `main --ap A,B --to K` beyond the batched pass's 62-bit discriminants
// (src/mainterm/main_term_batch.hpp): such rows take the single-value route, so
// the table row and `main --at` of the same n must be overlapping balls.
#include <arb.h>

#include <catch2/catch.hpp>
#include <sstream>
#include <string>

#include "cli_run.hpp"

using circlet::testing::run_circlet;

namespace {
// The ball in "[mid +/- rad]" form at the start of `text`.
std::string first_ball(const std::string& text) {
  const auto a = text.find('['), b = text.find(']', a);
  REQUIRE(a != std::string::npos);
  REQUIRE(b != std::string::npos);
  return text.substr(a, b - a + 1);
}
}  // namespace

TEST_CASE("a table row with a discriminant beyond 62 bits agrees with the single value", "[cli][mainterm]") {
  const auto table = run_circlet("main c6 --ap 4611686018427387903,1 --to 1 --no-count");
  REQUIRE(table.status == 0);
  // Row k = 1: n = 4611686018427387904.
  const auto row = table.out.find("\n1,4611686018427387904,");
  REQUIRE(row != std::string::npos);
  const auto single = run_circlet("main c6 --at 4611686018427387904 --no-count --digits 6");
  REQUIRE(single.status == 0);
  const auto line = single.out.find("main term");
  REQUIRE(line != std::string::npos);
  arb_t x, y;
  arb_init(x);
  arb_init(y);
  REQUIRE(arb_set_str(x, first_ball(table.out.substr(row)).c_str(), 128) == 0);
  REQUIRE(arb_set_str(y, first_ball(single.out.substr(line)).c_str(), 128) == 0);
  CHECK(arb_is_finite(x));
  CHECK(arb_overlaps(x, y));
  arb_clear(x);
  arb_clear(y);
}
