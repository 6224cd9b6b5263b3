#include "family/family.hpp"

#include <algorithm>
#include <map>

#include "core/error.hpp"
#include "core/parse_int.hpp"

namespace circlet {

Family Family::parse(const std::string& name) {
  const std::string expected =
      "expected c<T> (t-cores), sc<T> (self-conjugate t-cores) or sq<S> (sums of S squares), e.g. c7, sc13, sq5";
  FamilyKind kind;
  std::string digits;
  if (name.rfind("sc", 0) == 0) {
    kind = FamilyKind::SelfConjugateCore;
    digits = name.substr(2);
  } else if (name.rfind("sq", 0) == 0) {
    kind = FamilyKind::SumOfSquares;
    digits = name.substr(2);
  } else if (name.rfind("c", 0) == 0) {
    kind = FamilyKind::Core;
    digits = name.substr(1);
  } else {
    throw UserError("unknown family '" + name + "' (" + expected + ")");
  }
  // A letter right after the prefix ("core7", "cx"): not a family name at all.
  if (!digits.empty() && ((digits[0] >= 'a' && digits[0] <= 'z') || (digits[0] >= 'A' && digits[0] <= 'Z')))
    throw UserError("unknown family '" + name + "' (" + expected + ")");
  if (!is_decimal_digits(digits))
    throw UserError("family '" + name + "': " + (digits.empty() ? "T is missing, '' " : "'" + digits + "' ") +
                    "is not a positive integer (" + expected + ")");
  size_t first = digits.find_first_not_of('0');
  const std::string sig = first == std::string::npos ? "0" : digits.substr(first);
  if (sig.size() > 9)
    throw UserError("family '" + name + "': T = " + digits + " is out of range 1.." + std::to_string(kMaxT));
  const long t = std::stol(sig);  // at most 9 decimal digits: fits
  if (t < 1 || t > kMaxT)
    throw UserError("family '" + name + "': T = " + digits + " is out of range 1.." + std::to_string(kMaxT));
  return Family{kind, static_cast<int>(t)};
}

std::string Family::name() const {
  switch (kind) {
    case FamilyKind::Core: return "c" + std::to_string(t);
    case FamilyKind::SelfConjugateCore: return "sc" + std::to_string(t);
    case FamilyKind::SumOfSquares: return "sq" + std::to_string(t);
  }
  return "?";
}

std::string Family::description() const {
  switch (kind) {
    case FamilyKind::Core: return std::to_string(t) + "-core partitions";
    case FamilyKind::SelfConjugateCore: return "self-conjugate " + std::to_string(t) + "-core partitions";
    case FamilyKind::SumOfSquares: return "representations as a sum of " + std::to_string(t) + " squares";
  }
  return "?";
}

int Family::rank() const {
  switch (kind) {
    case FamilyKind::Core: return t - 1;
    case FamilyKind::SelfConjugateCore: return t / 2;
    case FamilyKind::SumOfSquares: return t;
  }
  return 0;
}

EtaQuotient normalise(EtaQuotient q) {
  std::map<long, long> by_d;
  for (const auto& f : q) by_d[f.d] += f.e;
  EtaQuotient out;
  for (const auto& [d, e] : by_d)
    if (e != 0) out.push_back({d, e});
  return out;
}

EtaQuotient Family::eta_quotient() const {
  const long T = t;
  switch (kind) {
    case FamilyKind::Core:
      // Σ c_t(n) q^n = Π (1 − q^{tk})^t / (1 − q^k)
      return normalise({{T, T}, {1, -1}});
    case FamilyKind::SelfConjugateCore: {
      // Π (1 + q^{2k−1}) = Π (1 − q^{2k})^2 / ((1 − q^k)(1 − q^{4k}))
      EtaQuotient q{{2, 2}, {1, -1}, {4, -1}};
      if (T % 2 == 0) {
        q.push_back({2 * T, T / 2});  // Π (1 − q^{2tk})^{t/2}
      } else {
        q.push_back({2 * T, (T - 1) / 2});  // Π (1 − q^{2tk})^{(t−1)/2}
        // 1 / Π (1 + q^{t(2k−1)}) = Π (1 − q^{tk})(1 − q^{4tk}) / (1 − q^{2tk})^2
        q.push_back({T, 1});
        q.push_back({4 * T, 1});
        q.push_back({2 * T, -2});
      }
      return normalise(q);
    }
    case FamilyKind::SumOfSquares:
      // θ(q) = Σ_{n∈Z} q^{n²} = Π (1 − q^{2k})^5 / ((1 − q^k)^2 (1 − q^{4k})^2)  (Jacobi triple product)
      return normalise({{2, 5 * T}, {1, -2 * T}, {4, -2 * T}});
  }
  return {};
}

}  // namespace circlet
