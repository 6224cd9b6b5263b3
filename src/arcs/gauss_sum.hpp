#pragma once
// Route (b) to the circle method's arc coefficients (docs/MATH.md §6):
//
//   A_k(n)/k^w = k^{−r} Σ_{a mod k, (a,k)=1} G(a/k) e(−a n/k),
//   G(a/k)     = Σ_{x ∈ Λ/kΛ} e(a P(x)/k),
//
// where Λ is the lattice of the model (Z^vars, or {Σ x_i = 0} for c_t) of
// rank r, and P is the model's polynomial (docs/MATH.md §2). Note that n (not
// X = n + Δ) enters: P(x) ≡ n (mod k) is what is counted.
//
// G is evaluated through one-dimensional quadratic sums
//   R_m(α, β) = Σ_{x mod m} e((α x² + β x)/m),
// as follows. Let D be the least common denominator of the coefficients of P
// (D = 2 for c_t with t odd, else 1) and m = D·k; then D·P is an integer
// polynomial, D·P mod m is well defined on Λ/mΛ, and Λ/mΛ covers Λ/kΛ
// exactly D^r times, so
//   no constraint:  G(a/k) = D^{−vars} Π_i R_m(a·D·quad_i, a·D·lin_i),
//   Σ x_i = 0:      G(a/k) = D^{−(vars−1)} (1/m) Σ_{b mod m} Π_i R_m(a·D·quad_i, a·D·lin_i + b)
// (the constraint removed by an extra additive character b; a lift of x with
// Σ x_i ∈ mZ to Λ changes D·P by a multiple of m, see gauss_sum.cpp).
//
// Exactness: N_d(n) = #{x ∈ Λ/dΛ : P(x) ≡ n (mod d)} is an integer and
// A_k(n)/k^w = Σ_{d | k} μ(k/d) N_d(n)/d^{r−1}, so k^{r−1}·A_k(n)/k^w is an
// integer: the denominator of A_k(n)/k^w divides k^{r−1}. The ball is
// rounded to that lattice when it determines the value uniquely.
#include <acb.h>

#include <optional>
#include <vector>

#include "core/flint_types.hpp"
#include "quadratic/model.hpp"

namespace circlet {

/// R_m(α, β) = Σ_{x mod m} e((α x² + β x)/m) for one modulus m and one α,
/// evaluated for any β from two directly summed base sums and the exact shift
/// identity R(β + 2αc) = R(β)·e(−(αc² + βc)/m) (after removing g = gcd(α, m)).
class QuadraticSum1D {
 public:
  /// `roots` is the table e(j/m), j = 0..m−1 (shared between sums of the same modulus).
  QuadraticSum1D(ulong m, ulong alpha, const std::vector<acb_struct>* roots, slong prec);
  QuadraticSum1D(const QuadraticSum1D&) = delete;
  QuadraticSum1D& operator=(const QuadraticSum1D&) = delete;
  ~QuadraticSum1D();
  /// res = R_m(α, β).
  void value(acb_t res, ulong beta, slong prec) const;

 private:
  ulong m_, g_, mp_, ap_;  // m, g = gcd(α, m), m' = m/g, α' = α/g mod m'
  ulong ap_inv_;           // (2α')^{−1} mod m' when m' is odd; α'^{−1} mod m'/2 when m' is even
  const std::vector<acb_struct>* roots_;
  acb_t base_[2];  // R'_{m'}(α', 0), R'_{m'}(α', 1)
};

/// The Gauss sums G(a/k), (a, k) = 1, of one model and one k, kept so that
/// A_k(n)/k^w can be evaluated for many n.
class GaussSumTable {
 public:
  GaussSumTable(const QuadraticModel& model, ulong k, slong prec);
  GaussSumTable(const GaussSumTable&) = delete;
  GaussSumTable& operator=(const GaussSumTable&) = delete;
  ~GaussSumTable();

  ulong k() const { return k_; }
  /// G(a/k) for the i-th unit a (units listed in increasing order).
  const std::vector<ulong>& units() const { return units_; }
  acb_srcptr gauss_sum(size_t i) const { return &g_[i]; }

  /// res = A_k(n)/k^w = k^{−r} Σ_{(a,k)=1} G(a/k) e(−a n/k) as a ball.
  void arc_coefficient(acb_t res, const Fmpz& n, slong prec) const;

 private:
  ulong k_;
  int rank_;
  std::vector<ulong> units_;
  std::vector<acb_struct> g_;
  std::vector<acb_struct> roots_k_;  // e(j/k)
};

/// A_k(n)/k^w by route (b), as a ball and, when the ball determines it, exactly.
struct GaussArcCoefficient {
  Arb re, im;                 // the ball (im must contain 0)
  std::optional<Fmpq> exact;  // the unique element of k^{−(r−1)}Z in the ball, if unique
};

GaussArcCoefficient arc_coefficient_by_gauss_sums(const QuadraticModel& model, const Fmpz& n, ulong k,
                                                  slong prec);

/// Rounds a ball to k^{−(r−1)}Z: returns the unique v with k^{r−1}v ∈ Z inside
/// the ball, provided the imaginary part contains 0; empty otherwise.
std::optional<Fmpq> arc_coefficient_exact_from_ball(const acb_t ball, ulong k, int rank, slong prec);

}  // namespace circlet
