// Tests of src/modform/eta_product.hpp: the families as eta quotients, their level and
// character (Gordon–Hughes–Newman, θ-division for half-integral weight), Ligozat orders.
// Outside reference: PARI/GP's mffrometaquo / mfparams (via tests/mainterm_gp.hpp).
#include <catch2/catch.hpp>

#include <sstream>

#include "family/family.hpp"
#include "mainterm_gp.hpp"
#include "modform/eta_product.hpp"
#include "series/eta_series.hpp"

using namespace circlet;

namespace {

std::vector<Family> families_up_to_13() {
  std::vector<Family> out;
  for (int t = 2; t <= 13; ++t) {  // t = 1: the constant series 1 (weight 0), no eta factor
    out.push_back(Family{FamilyKind::Core, t});
    out.push_back(Family{FamilyKind::SelfConjugateCore, t});
    out.push_back(Family{FamilyKind::SumOfSquares, t});
  }
  return out;
}

std::string gp_matrix(const EtaProduct& p) {
  std::string s = "[";
  for (size_t i = 0; i < p.factors.size(); ++i)
    s += (i ? ";" : "") + std::to_string(p.factors[i].delta) + "," + std::to_string(p.factors[i].r);
  return s + "]";
}

}  // namespace

TEST_CASE("the eta quotient of a family reproduces its counts at exponents D n + shift", "[modform]") {
  // Definition of η: Π η(δτ)^{r_δ} = q^{Σδr/24} Π(1 − q^{δk})^{r_δ}; the series engine
  // expands Π(1 − q^{δk})^{r_δ}, so a(D n + shift) = F(n) must hold coefficient by coefficient.
  for (const char* name : {"c4", "c7", "sc7", "sc12", "c6"}) {
    Family f = Family::parse(name);
    FamilyForm ff = family_form(f);
    CHECK(ff.eta.order_sum() == 24 * ff.shift);
    EtaQuotient q;
    for (const auto& e : ff.eta.factors) q.push_back({e.delta, e.r});
    const long n = 60;
    IntegerSeries g = compute_series(plan_eta_series(q, ff.D * n));
    IntegerSeries c = family_series(f, n);
    for (long m = 0; m <= ff.D * n; ++m) {
      if (m % ff.D == 0) CHECK(fmpz_equal(g.at(m), c.at(m / ff.D)));
      else CHECK(fmpz_is_zero(g.at(m)));
    }
  }
}

TEST_CASE("level, weight and character of every family with t <= 13 agree with PARI's mffrometaquo", "[modform][gp]") {
  if (!circlet::testing::gp_available()) {
    WARN("gp not found: PARI/GP comparison skipped");
    return;
  }
  std::string script;
  const auto fams = families_up_to_13();
  for (const auto& f : fams) {
    // mfparams(F) = [N, k, CHI, ...]; CHI is the Kronecker discriminant when real (PARI docs, mfparams).
    script += "F=mffrometaquo(" + gp_matrix(family_form(f).eta) +
              "); if(F==0, print(\"none\"), P=mfparams(F); print(P[1],\" \",P[2],\" \",P[3]));\n";
  }
  std::istringstream out(circlet::testing::gp_run(script));
  for (const auto& f : fams) {
    std::string N, k, chi;
    out >> N;
    INFO(f.name() << " PARI: " << N);
    REQUIRE(N != "none");  // PARI finds a holomorphic form
    out >> k >> chi;
    FamilyForm ff = family_form(f);
    EtaModularity m = eta_modularity(ff.eta);
    INFO(f.name() << " PARI: [" << N << ", " << k << ", " << chi << "], ours: [" << m.level << ", " << m.twice_weight
                  << "/2, " << m.character << "]");
    CHECK(m.ok);
    CHECK(std::to_string(m.level) == N);
    std::string ours_k = m.twice_weight % 2 ? std::to_string(m.twice_weight) + "/2" : std::to_string(m.twice_weight / 2);
    CHECK(ours_k == k);
    // PARI prints the discriminant (e.g. 28 for (28/.)); on d coprime to the level it is
    // the character (D/.) of its squarefree part.
    CHECK(squarefree_part(std::stol(chi)) == m.character);
    CHECK(holomorphic_at_cusps(ff.eta, m.level));
  }
}

TEST_CASE("Ligozat orders: theta vanishes to order 1/4 at the cusp 1/2 of Gamma0(4)", "[modform]") {
  // θ(τ) = Σ q^{n²} has weight 1/2 on Γ0(4); cusps ∞, 0, 1/2 with orders 0, 0, 1/4 in the
  // local parameter; total (1/2)/12 · [SL2:Γ0(4)] = (1/24)·6 = 1/4 (valence formula, common practice).
  EtaProduct th = theta_eta_product();
  auto o = ligozat_orders(th, 4);
  REQUIRE(o.size() == 3);
  CHECK(o[0].second == Fmpq(0));      // d = 1: the cusp 0
  CHECK(o[1].second == Fmpq(1, 4));   // d = 2: the cusp 1/2
  CHECK(o[2].second == Fmpq(0));      // d = 4: ∞ (θ = 1 + 2q + …)
  // 1/Δ = η(τ)^{-24} has a pole at ∞; Δ = η(τ)^{24} has a simple zero there.
  CHECK_FALSE(holomorphic_at_cusps(EtaProduct{{{1, -24}}}, 1));
  CHECK(ligozat_order(EtaProduct{{{1, 24}}}, 1, 1) == Fmpq(1));
}

TEST_CASE("Gordon-Hughes-Newman conditions reject a level that is too small", "[modform]") {
  FamilyForm c5 = family_form(Family::parse("c5"));
  CHECK(ghn_conditions_hold(c5.eta, 5));
  CHECK_FALSE(ghn_conditions_hold(c5.eta, 1));  // 5 ∤ 1
  // η(τ)^{12}: Σ δ r_δ = 12 is not ≡ 0 (mod 24) at any level; Δ = η^{24} has level 1.
  CHECK_FALSE(ghn_conditions_hold(EtaProduct{{{1, 12}}}, 1));
  CHECK_FALSE(ghn_conditions_hold(EtaProduct{{{1, 12}}}, 2));
  CHECK(ghn_conditions_hold(EtaProduct{{{1, 24}}}, 1));
  // The character (−1)^k Π δ^{r_δ}: c_7 = η(7τ)^7/η(τ), k = 3: (−7^7/·) = (−7/·).
  CHECK(ghn_character(family_form(Family::parse("c7")).eta) == -7);
}
