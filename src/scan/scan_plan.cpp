#include "scan/scan_plan.hpp"

#include "core/error.hpp"

namespace circlet {

void ScanSpec::parse_t_range(const std::string& text, int* lo, int* hi) {
  auto dots = text.find("..");
  const auto dash = text.find('-');
  if (dots == std::string::npos && dash != std::string::npos && dash > 0 && is_decimal_digits(text.substr(0, dash)) &&
      is_decimal_digits(text.substr(dash + 1)))
    throw UserError("--t expects a range T1..T2, got '" + text + "' (did you mean " + text.substr(0, dash) + ".." +
                    text.substr(dash + 1) + "?)");
  long a, b;
  if (dots == std::string::npos) {
    a = b = parse_nonnegative("--t", text, 1000);
  } else {
    a = parse_nonnegative("--t", text.substr(0, dots), 1000);
    b = parse_nonnegative("--t", text.substr(dots + 2), 1000);
  }
  if (a < 2 || b > 60 || a > b) throw UserError("--t expects a range T1..T2 with 2 <= T1 <= T2 <= 60, got '" + text + "'");
  *lo = static_cast<int>(a);
  *hi = static_cast<int>(b);
}

Progression progression_of_index(long i) {
  long A = 1;
  while (A * (A + 1) / 2 <= i) ++A;
  Progression p;
  p.A = A;
  p.B = i - A * (A - 1) / 2;
  return p;
}

ScanJob scan_job(const ScanSpec& spec, long index) {
  ScanJob j;
  j.index = index;
  const long P = spec.pairs_per_t(), N = spec.progressions();
  j.t = spec.t_lo + static_cast<int>(index / P);
  long r = index % P;
  j.ap = progression_of_index(r / N);
  j.ap2 = progression_of_index(r % N);
  return j;
}

ShardSpec ShardSpec::parse(const std::string& text) {
  auto slash = text.find('/');
  if (slash == std::string::npos) throw UserError("--shard expects i/k (0 <= i < k), got '" + text + "'");
  ShardSpec s;
  s.i = parse_nonnegative("--shard i", text.substr(0, slash), 1000000);
  s.k = parse_nonnegative("--shard k", text.substr(slash + 1), 1000000);
  if (s.k < 1 || s.i >= s.k) throw UserError("--shard expects i/k with 0 <= i < k, got '" + text + "'");
  return s;
}

}  // namespace circlet
