// Tests of the coefficient container and its decimal printing
// (src/series/integer_series.hpp), against fmpz_get_str.
#include "series/integer_series.hpp"

#include <flint/flint.h>

#include <catch2/catch.hpp>

using namespace circlet;

TEST_CASE("decimal printing agrees with fmpz_get_str around every fast-path boundary", "[series]") {
  std::vector<Fmpz> values;
  for (int bits : {0, 1, 61, 62, 63, 64, 65, 100, 126, 127, 128, 129, 300}) {
    Fmpz p;
    fmpz_one(p.get());
    fmpz_mul_2exp(p.get(), p.get(), static_cast<ulong>(bits));
    for (int d : {-1, 0, 1}) {
      Fmpz v;
      fmpz_add_si(v.get(), p.get(), d);
      values.push_back(v);
      fmpz_neg(v.get(), v.get());
      values.push_back(v);
    }
  }
  values.push_back(Fmpz::from_str("10000000000000000000"));
  values.push_back(Fmpz::from_str("99999999999999999999999999999999999999"));
  for (const auto& v : values) {
    std::string s;
    append_decimal(s, v.get());
    CHECK(s == v.str());
  }
}

TEST_CASE("IntegerSeries owns zero-initialised coefficients and moves", "[series]") {
  IntegerSeries a(5);
  CHECK(a.length() == 5);
  for (long n = 0; n < 5; ++n) CHECK(fmpz_is_zero(a.at(n)));
  fmpz_set_str(a.at(4), "123456789012345678901234567890", 10);
  IntegerSeries b = std::move(a);
  CHECK(b.length() == 5);
  CHECK(b.value(4).str() == "123456789012345678901234567890");
  CHECK(a.length() == 0);
}
