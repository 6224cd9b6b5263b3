#include "arcs/growth_fit.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <map>

#include "core/error.hpp"

namespace circlet {

GrowthFit fit_growth_exponent(const std::vector<double>& X, const std::vector<double>& abs_remainder,
                              double min_x) {
  CIRCLET_ASSERT(X.size() == abs_remainder.size(), "fit: sizes differ");
  GrowthFit fit;
  if (X.empty()) {
    fit.note = "no data";
    return fit;
  }
  const double xmin = *std::min_element(X.begin(), X.end());
  const double xmax = *std::max_element(X.begin(), X.end());
  struct Block {
    double best_abs = 0, best_x = 0;
  };
  std::map<int, Block> blocks;
  for (size_t i = 0; i < X.size(); ++i) {
    if (X[i] < min_x || X[i] <= 0) continue;
    const int j = static_cast<int>(std::floor(std::log2(X[i])));
    Block& b = blocks[j];
    if (abs_remainder[i] > b.best_abs) {
      b.best_abs = abs_remainder[i];
      b.best_x = X[i];
    }
  }
  for (const auto& [j, b] : blocks) {
    const double lo = std::ldexp(1.0, j), hi = std::ldexp(1.0, j + 1);
    const double covered = std::min(hi, xmax) - std::max(lo, xmin);
    if (covered < 0.5 * (hi - lo) || b.best_abs <= 0) continue;
    fit.points.push_back({std::log(b.best_x), std::log(b.best_abs)});
  }
  const Eigen::Index N = static_cast<Eigen::Index>(fit.points.size());
  if (N < 3) {
    fit.note = "fewer than 3 dyadic blocks with non-zero remainder";
    return fit;
  }
  Eigen::MatrixXd A(N, 2);
  Eigen::VectorXd y(N);
  for (Eigen::Index i = 0; i < N; ++i) {
    A(i, 0) = 1.0;
    A(i, 1) = fit.points[i].log_x;
    y(i) = fit.points[i].log_abs;
  }
  const Eigen::VectorXd coef = A.colPivHouseholderQr().solve(y);
  const Eigen::VectorXd resid = y - A * coef;
  const double sigma2 = resid.squaredNorm() / static_cast<double>(N - 2);
  const double xbar = A.col(1).mean();
  const double sxx = (A.col(1).array() - xbar).square().sum();
  fit.ok = true;
  fit.intercept = coef(0);
  fit.exponent = coef(1);
  fit.std_error = std::sqrt(sigma2 / sxx);
  fit.note = "empirical: least squares of log max|E| over " + std::to_string(N) + " dyadic blocks of X";
  return fit;
}

}  // namespace circlet
