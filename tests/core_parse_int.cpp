// The one integer parser (src/core/parse_int.hpp): decimal digits or power
// notation (10^12, 2^64-1), no sign, no spaces, no prefixes, leading zeros
// meaning nothing, empty an error.
#include "core/parse_int.hpp"

#include <catch2/catch.hpp>
#include <climits>

#include "core/error.hpp"

using circlet::parse_int_in_range;
using circlet::parse_nonnegative;
using circlet::parse_nonnegative_fmpz;
using circlet::UserError;

TEST_CASE("decimal digits are read as decimal, leading zeros included", "[core][parse_int]") {
  CHECK(parse_nonnegative("--to", "0", 10) == 0);
  CHECK(parse_nonnegative("--to", "010", 100) == 10);  // never octal
  CHECK(parse_nonnegative("--to", "0000000000000000000000000000007", 10) == 7);  // zeros are not "too large"
  CHECK(parse_nonnegative("--to", "9223372036854775807", LONG_MAX) == LONG_MAX);
  CHECK(parse_int_in_range("--digits", "010", 1, 1000) == 10);
  CHECK(parse_nonnegative_fmpz("--at", "0012345678901234567890123").str() == "12345678901234567890123");
}

TEST_CASE("everything else is refused with a message naming the option", "[core][parse_int]") {
  for (const char* bad : {"", " 5", "5 ", "+5", "0x10", "0o7", "1e3", "10^", "^3", "10^^2", "10^-3", "10^3+", "10^3*2", "10 ^3", "+10^3", "1_000", "1,000", "5.0", "abc", "\t5"}) {
    INFO("'" << bad << "'");
    CHECK_THROWS_AS(parse_nonnegative("--to", bad, 100), UserError);
    CHECK_THROWS_WITH(parse_nonnegative("--to", bad, 100), Catch::StartsWith("--to "));
    CHECK_THROWS_AS(parse_int_in_range("--digits", bad, 1, 100), UserError);
    CHECK_THROWS_AS(parse_nonnegative_fmpz("--at", bad), UserError);
  }
  CHECK_THROWS_WITH(parse_nonnegative("--to", "-5", 100), "--to must be non-negative, got -5");
  CHECK_THROWS_WITH(parse_nonnegative("--to", "101", 100), "--to = 101 is too large (at most 100)");
  CHECK_THROWS_WITH(parse_nonnegative("--to", "99999999999999999999999", LONG_MAX), Catch::Contains("is too large"));
  CHECK_THROWS_WITH(parse_int_in_range("--digits", "0", 1, 1000), "--digits must be between 1 and 1000, got 0");
  CHECK_THROWS_WITH(parse_int_in_range("--digits", "-3", 1, 1000), "--digits must be between 1 and 1000, got -3");
  CHECK_THROWS_WITH(parse_int_in_range("--digits", "100000", 1, 1000), "--digits must be between 1 and 1000, got 100000");
  CHECK_THROWS_WITH(parse_nonnegative_fmpz("--at", "12", 1), Catch::Contains("more than the 1 accepted"));
}

TEST_CASE("power notation: B^E joined by + and -, exact, checked against FLINT's own powers", "[core][parse_int]") {
  CHECK(parse_nonnegative("--to", "10^6", 10000000) == 1000000);
  CHECK(parse_nonnegative("--to", "2^10+3-1", 10000) == 1026);
  CHECK(parse_nonnegative("--to", "2^63-1", LONG_MAX) == LONG_MAX);
  CHECK(parse_nonnegative("--to", "0^0", 5) == 1);  // common practice: 0^0 = 1
  CHECK_THROWS_WITH(parse_nonnegative("--to", "2^63", LONG_MAX), Catch::Contains("is too large"));
  CHECK_THROWS_WITH(parse_nonnegative("--to", "10^3+1", 1000), "--to = 10^3+1 is too large (at most 1000)");
  CHECK_THROWS_WITH(parse_nonnegative("--to", "5-10^1", 100), "--to must be non-negative, got 5-10^1 = -5");
  CHECK_THROWS_WITH(parse_nonnegative("--to", "10^99999999999999999999", LONG_MAX), Catch::Contains("is too large"));
  // The arbitrary-size route against fmpz_pow_ui and fmpz_set_str (FLINT).
  circlet::Fmpz ref;
  fmpz_ui_pow_ui(ref.get(), 10, 27);
  fmpz_add_ui(ref.get(), ref.get(), 7);
  CHECK(parse_nonnegative_fmpz("--at", "10^27+7") == ref);
  fmpz_ui_pow_ui(ref.get(), 2, 127);
  fmpz_sub_ui(ref.get(), ref.get(), 1);
  CHECK(parse_nonnegative_fmpz("--at", "2^127-1").str() == "170141183460469231731687303715884105727");
  CHECK(parse_nonnegative_fmpz("--at", "2^127-1") == ref);
  CHECK(parse_nonnegative_fmpz("--at", "10^4999").str().size() == 5000);
  CHECK_THROWS_WITH(parse_nonnegative_fmpz("--at", "10^200", 100), Catch::Contains("more than 100 digits"));
}
