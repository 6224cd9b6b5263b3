#pragma once
// Empirical growth exponent of the remainder (labelled empirical wherever it
// is shown): a least-squares fit of log max_{block} |E| against log X over the
// dyadic blocks 2^j ≤ X < 2^{j+1}, with the standard error of the slope.
// Doubles are adequate here: the fit is a statistic, not a bound.
#include <string>
#include <vector>

namespace circlet {

struct GrowthPoint {
  double log_x;    // log X at the block's maximum
  double log_abs;  // log max |E| over the block
};

struct GrowthFit {
  bool ok = false;         // false when fewer than 3 usable blocks
  double exponent = 0;     // fitted slope e in log|E| ≈ c + e·log X
  double std_error = 0;    // standard error of e (residual variance / Σ(x − x̄)²)
  double intercept = 0;
  std::vector<GrowthPoint> points;
  std::string note;
};

/// Fits over dyadic blocks of X. A block is used when X reaches at least
/// min_x in it, it is at least half covered by the data, and max |E| > 0.
GrowthFit fit_growth_exponent(const std::vector<double>& X, const std::vector<double>& abs_remainder,
                              double min_x = 16.0);

}  // namespace circlet
