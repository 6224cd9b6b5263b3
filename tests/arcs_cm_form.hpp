#pragma once
// a(m), 0 ≤ m ≤ N, of η(τ)³η(7τ)³ = q Π_{k≥1} (1 − q^k)³(1 − q^{7k})³, by plain
// integer series multiplication (independent of src/series/).
#include <vector>

namespace circlet {

inline std::vector<long> cm_form_7_coefficients(long N) {
  std::vector<long> s(N, 0);  // s[i] = coefficient of q^i in the product, i < N
  s[0] = 1;
  auto times_one_minus = [&](long d) {  // s ← s·(1 − q^d)
    for (long i = N - 1; i >= d; --i) s[i] -= s[i - d];
  };
  for (long k = 1; k < N; ++k)
    for (int e = 0; e < 3; ++e) {
      times_one_minus(k);
      if (7 * k < N) times_one_minus(7 * k);
    }
  std::vector<long> a(N + 1, 0);
  for (long m = 1; m <= N; ++m) a[m] = s[m - 1];
  return a;
}

}  // namespace circlet
