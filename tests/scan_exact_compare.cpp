#include "scan/exact_compare.hpp"

#include <catch2/catch.hpp>

#include "series/eta_series.hpp"

using namespace circlet;

namespace {
IntegerSeries from(const std::vector<long>& v) {
  IntegerSeries s(static_cast<long>(v.size()));
  for (size_t i = 0; i < v.size(); ++i) fmpz_set_si(s.at(static_cast<long>(i)), v[i]);
  return s;
}
}  // namespace

TEST_CASE("exact proportionality, vanishing and failures are told apart", "[scan][compare]") {
  IntegerSeries f = from({2, 4, 6, 8, 10, 12, 14, 16}), g = from({1, 2, 3, 4, 5, 6, 7, 9}), z = from({0, 0, 0, 0, 0, 0, 0, 0});
  ProportionalityResult r = compare_exact(f, Progression{1, 0}, g, Progression{1, 0}, 6);
  CHECK(r.relation == Relation::Proportional);
  CHECK(r.k == Fmpq(2));
  r = compare_exact(f, Progression{1, 0}, g, Progression{1, 0}, 7);
  CHECK(r.relation == Relation::NotProportional);
  CHECK(r.witness == 7);
  CHECK(compare_exact(z, Progression{2, 0}, z, Progression{1, 0}, 3).relation == Relation::BothVanish);
  CHECK(compare_exact(f, Progression{1, 0}, z, Progression{1, 0}, 3).relation == Relation::NotProportional);
  // Proportional only on even n: the sub-progression is reported.
  IntegerSeries h = from({2, 5, 6, 1, 10, 3, 14, 2});
  ExactComparison c = compare_pair_exact(h, Progression{1, 0}, g, Progression{1, 0}, 7, {2});
  CHECK(c.whole.relation == Relation::NotProportional);
  REQUIRE(c.sub.size() == 1);
  CHECK((c.sub[0].p == 2 && c.sub[0].j == 0 && c.sub[0].k == Fmpq(2)));
}

// For t = 5 (weight 2) c_5(An+B) is never an exact multiple of sc_9(A'n+B') on a
// progression pair with A, A' ≤ 6 (tested for n ≤ 400). Published: an equality
// of the shape c_t(An+B) = k·sc_{2t−1}(A'n+B') is proved impossible for
// t ∈ {2, 3, 5} according to the abstract of K. Bringmann, B. Kane, J. Males,
// "On t-core and self-conjugate (2t−1)-core partitions in arithmetic
// progressions", arXiv:2005.07020v3 (2020) (title, authors and abstract read;
// v1 of the same arXiv number has another title, see tests/series_eta_series.cpp;
// docs/MATH.md §9, §11 [BKM20]).
// c_5 never vanishes (c_t(n) > 0 for t ≥ 4: A. Granville, K. Ono, "Defect zero
// p-blocks for finite simple groups", Trans. Amer. Math. Soc. 348 (1996),
// 331–347; abstract read), so no pair vanishes identically.
TEST_CASE("t = 5: no exact proportionality on any pair with M <= 6", "[scan][compare]") {
  const long K = 400, M = 6;
  IntegerSeries c5 = family_series(Family::parse("c5"), M * K + M), sc9 = family_series(Family::parse("sc9"), M * K + M);
  long pairs = 0, vanish = 0;
  for (long A = 1; A <= M; ++A)
    for (long B = 0; B < A; ++B)
      for (long A2 = 1; A2 <= M; ++A2)
        for (long B2 = 0; B2 < A2; ++B2) {
          ProportionalityResult r = compare_exact(c5, Progression{A, B}, sc9, Progression{A2, B2}, K);
          INFO("c5(" << A << "n+" << B << ") vs sc9(" << A2 << "n+" << B2 << ")");
          CHECK(r.relation != Relation::Proportional);
          vanish += r.relation == Relation::BothVanish;
          ++pairs;
        }
  CHECK(pairs == 441);
  CHECK(vanish == 0);
}

// The t = 4 exception (docs/MATH.md §9). The abstract of arXiv:2005.07020v3
// (read) calls 2·sc_7(8n+1) = c_4(7n+2) "the curious equality", with no range
// stated; the theorem in the body was not read here. Our exact counts satisfy it for every n ≢ 4 (mod 7)
// up to n = 2000, but NOT on n ≡ 4 (mod 7): c_4(30) = 7 while sc_7(33) = 3
// (both re-checked by enumerating partitions with the hook-length definition,
// a Python one-off during development). The scan reports exactly this "proportional
// except on a class" shape.
TEST_CASE("t = 4: c_4(7n+2) = 2 sc_7(8n+1) except on n = 4 mod 7", "[scan][compare]") {
  const long K = 2000;
  IntegerSeries c4 = family_series(Family::parse("c4"), 7 * K + 2), sc7 = family_series(Family::parse("sc7"), 8 * K + 1);
  CHECK(fmpz_get_si(c4.at(30)) == 7);
  CHECK(fmpz_get_si(sc7.at(33)) == 3);
  ProportionalityResult whole = compare_exact(c4, Progression{7, 2}, sc7, Progression{8, 1}, K);
  CHECK(whole.relation == Relation::NotProportional);
  CHECK(whole.witness == 4);
  ExactComparison c = compare_pair_exact(c4, Progression{7, 2}, sc7, Progression{8, 1}, K, {2, 3, 5, 7});
  long sevens = 0;
  for (const auto& s : c.sub)
    if (s.p == 7) {
      CHECK(s.k == Fmpq(2));
      CHECK(s.j != 4);
      ++sevens;
    }
  CHECK(sevens == 6);
  CHECK_THAT(c.describe(), Catch::Contains("proportional k=2 on n mod 7 except n = 4"));
}
