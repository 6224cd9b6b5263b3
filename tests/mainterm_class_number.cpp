// Tests for src/mainterm/class_number.hpp.
#include "mainterm/class_number.hpp"

#include <catch2/catch.hpp>
#include <sstream>

#include "mainterm_gp.hpp"

using namespace circlet;

TEST_CASE("class numbers: small classical values", "[mainterm][class_number]") {
  // h(−3) = h(−4) = h(−7) = h(−8) = 1, h(−23) = 3, h(−47) = 5, h(−163) = 1,
  // h(−12) = 1, h(−16) = 1, h(−27) = 1, h(−56) = 4 (from memory; also checked against forms below).
  CHECK(class_number(-3) == Fmpz(1));
  CHECK(class_number(-23) == Fmpz(3));
  CHECK(class_number(-47) == Fmpz(5));
  CHECK(class_number(-163) == Fmpz(1));
  CHECK(class_number(-12) == Fmpz(1));
  CHECK(class_number(-27) == Fmpz(1));
  CHECK(class_number(-56) == Fmpz(4));
  CHECK(hurwitz_class_number(3) == Fmpq(1, 3));
  CHECK(hurwitz_class_number(4) == Fmpq(1, 2));
  CHECK(hurwitz_class_number(12) == Fmpq(4, 3));
  CHECK(hurwitz_class_number(0) == Fmpq(-1, 12));
  CHECK(hurwitz_class_number(5) == Fmpq(0));
}

TEST_CASE("class numbers: L-value route equals reduced-form counting", "[mainterm][class_number]") {
  for (ulong N = 1; N <= 2000; ++N) {
    INFO("N = " << N);
    REQUIRE(hurwitz_class_number(N) == hurwitz_class_number_by_forms(N));
    if (N % 4 == 0 || N % 4 == 3) REQUIRE(class_number(-(slong)N) == class_number_by_forms(-(slong)N));
  }
}

TEST_CASE("Hurwitz class numbers: Kronecker–Hurwitz relation", "[mainterm][class_number]") {
  // Σ_{s ∈ Z} H(4n − s²) = 2σ(n) − Σ_{d|n} min(d, n/d), with H(0) = −1/12
  // (L. Kronecker 1860, A. Hurwitz 1885; in this form e.g. D. Zagier, "Nombres de
  // classes et formes modulaires de poids 3/2", C. R. Acad. Sci. Paris Sér. A 281
  // (1975), 883–886; statement quoted from memory).
  for (ulong n = 1; n <= 400; ++n) {
    Fmpq lhs(0);
    for (slong s = -2 * (slong)n; s <= 2 * (slong)n; ++s) {
      slong m = 4 * (slong)n - s * s;
      if (m < 0) continue;
      fmpq_add(lhs.get(), lhs.get(), hurwitz_class_number((ulong)m).get());
    }
    slong rhs = 0;
    for (ulong d = 1; d <= n; ++d)
      if (n % d == 0) rhs += 2 * (slong)d - (slong)std::min(d, n / d);
    INFO("n = " << n);
    CHECK(lhs == Fmpq(rhs));
  }
}

TEST_CASE("Hurwitz class numbers: r_3(n) = 12(H(4n) − 2H(n))", "[mainterm][class_number]") {
  // Gauss, Disquisitiones Arithmeticae (1801), art. 291–292; in terms of Hurwitz
  // class numbers see e.g. Zagier (1975) above (quoted from memory). r_3 counted directly.
  for (ulong n = 1; n <= 600; ++n) {
    slong r3 = 0;
    for (slong x = -30; x <= 30; ++x)
      for (slong y = -30; y <= 30; ++y) {
        slong rem = (slong)n - x * x - y * y;
        if (rem < 0) continue;
        slong z = (slong)n_sqrt((ulong)rem);
        if (z * z == rem) r3 += z == 0 ? 1 : 2;
      }
    Fmpq rhs;
    fmpq_mul_si(rhs.get(), hurwitz_class_number(n).get(), -2);
    fmpq_add(rhs.get(), rhs.get(), hurwitz_class_number(4 * n).get());
    fmpq_mul_si(rhs.get(), rhs.get(), 12);
    INFO("n = " << n);
    CHECK(rhs == Fmpq(r3));
  }
}

TEST_CASE("Hurwitz class numbers agree with PARI/GP qfbhclassno for N ≤ 2000", "[mainterm][class_number][gp]") {
  if (!testing::gp_available()) {
    WARN("gp not on PATH: PARI/GP comparison skipped");
    return;
  }
  // Script: for N = 1..2000 print qfbhclassno(N) (a rational).
  std::istringstream out(testing::gp_run("for(N=1,2000,print(qfbhclassno(N)))"));
  for (ulong N = 1; N <= 2000; ++N) {
    std::string line;
    REQUIRE(std::getline(out, line));
    INFO("N = " << N << ", gp: " << line);
    CHECK(hurwitz_class_number(N) == Fmpq::from_str(line));
  }
}
