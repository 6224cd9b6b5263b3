// Tests of prove_exact_comparison (src/scan/exact_compare.hpp): what the t <= 5 scan
// found on exact counts is handed to the prover and comes back PROVED or REFUTED.
#include <catch2/catch.hpp>

#include "scan/exact_compare.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

TEST_CASE("the c4/sc7 exception class becomes a proved relation off n = 4 mod 7", "[scan][compare][modform]") {
  const long K = 400;
  IntegerSeries c4 = family_series(Family::parse("c4"), 7 * K + 2), sc7 = family_series(Family::parse("sc7"), 8 * K + 1);
  ExactComparison c = compare_pair_exact(c4, Progression{7, 2}, sc7, Progression{8, 1}, K, {2, 3, 5, 7});
  auto rs = prove_exact_comparison(c, Family::parse("c4"), Progression{7, 2}, Family::parse("sc7"), Progression{8, 1});
  bool found = false;
  for (const auto& r : rs) {
    INFO(r.relation << ": " << r.verdict << " " << r.reason);
    CHECK(r.verdict != "UNKNOWN");
    if (r.relation == "c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4") {
      CHECK(r.verdict == "PROVED");
      found = true;
    }
  }
  CHECK(found);
  CHECK_THAT(describe_proved(rs), Catch::Contains("PROVED: c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4"));
}

TEST_CASE("a whole proportional pair is proved: sc5(2n+1) = sc5(n)", "[scan][compare][modform]") {
  // Garvan–Kim–Stanton, "Cranks and t-cores" (1990).
  const long K = 200;
  IntegerSeries s = family_series(Family::parse("sc5"), 2 * K + 1);
  ExactComparison c = compare_pair_exact(s, Progression{2, 1}, s, Progression{1, 0}, K, {2, 3});
  REQUIRE(c.whole.relation == Relation::Proportional);
  auto rs = prove_exact_comparison(c, Family::parse("sc5"), Progression{2, 1}, Family::parse("sc5"), Progression{1, 0});
  REQUIRE(rs.size() == 1);
  CHECK(rs[0].verdict == "PROVED");
  CHECK(rs[0].relation == "sc5(2n+1) - sc5(n) = 0");
}

TEST_CASE("on the c4/sc7 exception class the scan finds and proves the extra term c4((n-4)/7)", "[scan][compare][modform]") {
  const long K = 400;
  IntegerSeries c4 = family_series(Family::parse("c4"), 7 * K + 2), sc7 = family_series(Family::parse("sc7"), 8 * K + 1);
  ExactComparison c = compare_pair_exact(c4, Progression{7, 2}, sc7, Progression{8, 1}, K, {2, 3, 5, 7});
  REQUIRE(c.counts != nullptr);  // a lone exception class keeps the counts
  auto fit = find_dilated_term(c, Family::parse("c4"), Progression{7, 2}, Family::parse("sc7"), Progression{8, 1}, 7, 4, Fmpq(2));
  REQUIRE(fit.has_value());
  CHECK(fit->K.name() == "c4");
  CHECK(fit->A2 == 1);
  CHECK(fit->B2 == 0);
  CHECK(fit->mu == Fmpq(1));
  CHECK(fit->tested == 57);  // k = 0..56: n = 7k + 4 <= 400
  CHECK(fit->relation == "c4(7n+2) = 2*sc7(8n+1) + c4((n-4)/7)");
  // Another class or constant gives no fit (the differences there are not one aligned term).
  CHECK_FALSE(find_dilated_term(c, Family::parse("c4"), Progression{7, 2}, Family::parse("sc7"), Progression{8, 1}, 7, 3, Fmpq(2)));
  CHECK_FALSE(find_dilated_term(c, Family::parse("c4"), Progression{7, 2}, Family::parse("sc7"), Progression{8, 1}, 7, 4, Fmpq(3)));

  auto rs = prove_exact_comparison(c, Family::parse("c4"), Progression{7, 2}, Family::parse("sc7"), Progression{8, 1});
  CHECK_THAT(describe_proved(rs), Catch::Contains("PROVED: c4(7n+2) - 2*sc7(8n+1) = 0 for n mod 7 != 4; "
                                                  "PROVED: c4(7n+2) - 2*sc7(8n+1) - c4((n-4)/7) = 0"));
}

TEST_CASE("without a lone exception class no counts are kept and no dilated term is searched", "[scan][compare][modform]") {
  const long K = 200;
  IntegerSeries s = family_series(Family::parse("sc5"), 2 * K + 1);
  ExactComparison c = compare_pair_exact(s, Progression{2, 1}, s, Progression{1, 0}, K, {2, 3});
  CHECK(c.counts == nullptr);
  CHECK_FALSE(find_dilated_term(c, Family::parse("sc5"), Progression{2, 1}, Family::parse("sc5"), Progression{1, 0}, 2, 0, Fmpq(1)));
}
