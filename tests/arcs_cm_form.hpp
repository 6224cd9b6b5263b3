#pragma once
// a(m), 0 ≤ m ≤ N, of η(τ)³η(7τ)³ = q Π_{k≥1} (1 − q^k)³(1 − q^{7k})³, by plain
// integer series multiplication (independent of src/series/).
//
// Partial products Π_{k≤K}(1 − q^k)³ have huge coefficients, so each of the
// two complete factors E(q)³ and E(q⁷)³ is expanded modulo 2^64 (unsigned:
// wrapping is defined). Each complete factor has coefficients of size at most
// 2N + 1 (Jacobi: E(q)³ = Σ (−1)^k (2k+1) q^{k(k+1)/2}), so the residues are
// the integers themselves, and their product has coefficients below
// N·(2N+1)² < 2^63: the final residues are exact.
#include <vector>

namespace circlet {

inline std::vector<long> cm_form_7_coefficients(long N) {
  auto cube_of_euler = [N](long d) {  // Π_{k≥1} (1 − q^{dk})³ mod q^N, as signed integers
    std::vector<unsigned long> s(N, 0);
    s[0] = 1;
    for (long k = d; k < N; k += d)
      for (int e = 0; e < 3; ++e)
        for (long i = N - 1; i >= k; --i) s[i] -= s[i - k];
    return std::vector<long>(s.begin(), s.end());  // two's complement: each |value| ≤ 2N + 1
  };
  const std::vector<long> e1 = cube_of_euler(1), e7 = cube_of_euler(7);
  std::vector<long> a(N + 1, 0);  // a[m] = coefficient of q^{m−1} in E(q)³E(q⁷)³
  for (long i = 0; i < N; ++i)
    if (e1[i] != 0)
      for (long j = 0; i + j < N; j += 7) a[i + j + 1] += e1[i] * e7[j];
  return a;
}

}  // namespace circlet
