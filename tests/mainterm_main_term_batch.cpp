// Tests for src/mainterm/main_term_batch.hpp.
#include "mainterm/main_term_batch.hpp"

#include <catch2/catch.hpp>

#include "mainterm/main_term.hpp"
#include "quadratic/model.hpp"

using namespace circlet;

TEST_CASE("batched main terms contain the exact rational of every row", "[mainterm][main_term_batch]") {
  // The exact route (generalised Bernoulli numbers) is independent of the batched
  // Euler product; every batched ball must contain it.
  for (const char* name : {"c6", "sc11", "sq5", "c8", "sq7", "sc13", "c5", "sq1"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    if (m.rank < 2) continue;
    for (long step : {1L, 7L}) {
      const long first = 3, count = 100;
      std::vector<Arb> lo = main_term_batch(m, first, step, count, 2000, 64);
      std::vector<Arb> hi = main_term_batch(m, first, step, count, 20000, 128);
      for (long i = 0; i < count; ++i) {
        MainTerm ex = main_term(m, Fmpz(first + step * i), 64);
        REQUIRE(ex.exact.has_value());
        Arb e;
        arb_set_fmpq(e, ex.exact->get(), 200);
        INFO(name << " n = " << first + step * i << " exact " << ex.exact->str() << " batch " << lo[i].str());
        CHECK(arb_contains(lo[i], e));
        CHECK(arb_contains(hi[i], e));
        CHECK(arb_overlaps(lo[i], hi[i]));
      }
    }
  }
}

TEST_CASE("batched main terms reach the accuracy the prime bound promises", "[mainterm][main_term_batch]") {
  QuadraticModel m = quadratic_model(Family::parse("c6"));
  ulong P = main_term_batch_prime_bound(m.rank, 20);  // 2^{−20} ≈ 1e−6
  CHECK(P > 10000);
  std::vector<Arb> v = main_term_batch(m, 100000, 1, 50, P, 64);
  for (const Arb& b : v) CHECK(arb_rel_accuracy_bits(b) >= 19);
}

TEST_CASE("main-term tables: exact rows equal main_term, ball rows contain it, both threads",
          "[mainterm][main_term_batch]") {
  // main_term (single n, exact routes) is the reference for every row of
  // main_term_table; 700 rows use both threads (blocks of 256).
  for (const char* name : {"c4", "sc7", "c6", "sq5", "c8", "c10", "c9", "sq4"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    for (long step : {1L, 5L}) {
      const long first = 2, count = 700;
      std::vector<TableMainTerm> t = main_term_table(m, first, step, count, 40, 500000, 128);
      REQUIRE(t.size() == (size_t)count);
      for (long i = 0; i < count; i += (i < 20 ? 1 : 37)) {
        Fmpz n(first + step * i);
        INFO(name << " n = " << n.str());
        if (fmpq_sgn(m.X(n).get()) <= 0) {
          CHECK(!t[i].valid);
          continue;
        }
        REQUIRE(t[i].valid);
        MainTerm ref = main_term(m, n, 128);
        REQUIRE(ref.exact.has_value());
        if (t[i].exact)
          CHECK(*t[i].exact == *ref.exact);
        else
          CHECK(arb_contains_fmpq(t[i].ball.get(), ref.exact->get()));
      }
    }
  }
  // Weight 3/2 and 5/2 tables are exact in every row (class numbers, divisor sums).
  for (const char* name : {"c4", "c6"}) {
    QuadraticModel m = quadratic_model(Family::parse(name));
    std::vector<TableMainTerm> t = main_term_table(m, 0, 1, 600, 40, 500000, 128);
    for (const auto& row : t) CHECK(row.exact.has_value());
  }
}
