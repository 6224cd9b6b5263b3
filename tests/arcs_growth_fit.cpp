// Tests for src/arcs/growth_fit.hpp.
#include "arcs/growth_fit.hpp"

#include <catch2/catch.hpp>
#include <cmath>

using namespace circlet;

TEST_CASE("a pure power law is fitted exactly", "[arcs][fit]") {
  std::vector<double> X, E;
  for (int n = 1; n <= 5000; ++n) {
    X.push_back(n + 0.5);
    E.push_back(3.0 * std::pow(n + 0.5, 1.5));
  }
  GrowthFit f = fit_growth_exponent(X, E);
  REQUIRE(f.ok);
  CHECK(f.exponent == Approx(1.5).margin(1e-9));
  CHECK(f.std_error < 1e-9);
  CHECK(f.points.size() == 8);  // blocks [2^4, 2^5) .. [2^11, 2^12); [2^12, 2^13) is 22% covered: dropped
}

TEST_CASE("an oscillating remainder gives a slope near its envelope with a positive error", "[arcs][fit]") {
  std::vector<double> X, E;
  for (int n = 1; n <= 20000; ++n) {
    X.push_back(n);
    E.push_back(std::pow(n, 2.0) * std::fabs(std::sin(0.37 * n * n)) * (1 + 0.5 * std::sin(std::log(n))));
  }
  GrowthFit f = fit_growth_exponent(X, E);
  REQUIRE(f.ok);
  CHECK(std::fabs(f.exponent - 2.0) < 0.2);
  CHECK(f.std_error > 0);
}

TEST_CASE("too few blocks or an identically zero remainder give no fit", "[arcs][fit]") {
  std::vector<double> X{20, 21, 40}, E{1, 2, 3};
  CHECK_FALSE(fit_growth_exponent(X, E).ok);
  std::vector<double> X2, Z;
  for (int n = 1; n < 3000; ++n) {
    X2.push_back(n);
    Z.push_back(0.0);
  }
  GrowthFit f = fit_growth_exponent(X2, Z);
  CHECK_FALSE(f.ok);
  CHECK(f.note.find("fewer than 3") != std::string::npos);
}
