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
