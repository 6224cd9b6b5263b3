#include "scan/scan_plan.hpp"

#include "core/error.hpp"
#include "progression/progression_pair.hpp"

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

namespace {
const char* prefix_of(FamilyKind k) {
  switch (k) {
    case FamilyKind::Core: return "c";
    case FamilyKind::SelfConjugateCore: return "sc";
    case FamilyKind::SumOfSquares: return "sq";
  }
  return "?";
}
}  // namespace

FamilyTemplate FamilyTemplate::parse(const std::string& text) {
  const std::string bad = "--pair expects F:G with each side a family prefix (c, sc, sq) followed by a number or "
                          "an expression a*t+b such as t, 2t-1, t+1 (e.g. ct:sc2t-1, c6:sq5), got '";
  FamilyTemplate f;
  std::string rest;
  if (text.rfind("sc", 0) == 0) f.kind = FamilyKind::SelfConjugateCore, rest = text.substr(2);
  else if (text.rfind("sq", 0) == 0) f.kind = FamilyKind::SumOfSquares, rest = text.substr(2);
  else if (text.rfind("c", 0) == 0) f.kind = FamilyKind::Core, rest = text.substr(1);
  else throw UserError(bad + text + "'");
  if (rest.empty()) throw UserError(bad + text + "'");
  auto tpos = rest.find('t');
  if (tpos == std::string::npos) {
    f.a = 0;
    f.b = parse_nonnegative("--pair", rest, Family::kMaxT);
    return f;
  }
  f.a = tpos == 0 ? 1 : parse_nonnegative("--pair", rest.substr(0, tpos), 100);
  if (f.a < 1) throw UserError(bad + text + "'");
  std::string tail = rest.substr(tpos + 1);
  f.b = 0;
  if (!tail.empty()) {
    if (tail[0] != '+' && tail[0] != '-') throw UserError(bad + text + "'");
    long v = parse_nonnegative("--pair", tail.substr(1), Family::kMaxT);
    f.b = tail[0] == '-' ? -v : v;
  }
  return f;
}

Family FamilyTemplate::at(int t) const {
  const long v = a * t + b;
  if (v < 1 || v > Family::kMaxT)
    throw UserError("--pair: " + str() + " at t = " + std::to_string(t) + " gives the parameter " + std::to_string(v) +
                    ", outside 1.." + std::to_string(Family::kMaxT));
  return Family{kind, static_cast<int>(v)};
}

std::string FamilyTemplate::str() const {
  std::string s = prefix_of(kind);
  if (a == 0) return s + std::to_string(b);
  if (a != 1) s += std::to_string(a);
  s += "t";
  if (b > 0) s += "+" + std::to_string(b);
  if (b < 0) s += std::to_string(b);
  return s;
}

FamilyPair FamilyPair::parse(const std::string& text) {
  auto colon = text.find(':');
  if (colon == std::string::npos)
    throw UserError("--pair expects F:G (e.g. ct:sc2t-1, the default, or c6:sq5), got '" + text + "'");
  FamilyPair p;
  p.F = FamilyTemplate::parse(text.substr(0, colon));
  p.G = FamilyTemplate::parse(text.substr(colon + 1));
  return p;
}

void ScanSpec::validate() const {
  if (!pair.depends_on_t() && t_lo != t_hi)
    throw UserError("--pair " + pair.str() + " does not depend on t: give a single --t (got " + std::to_string(t_lo) +
                    ".." + std::to_string(t_hi) + ")");
  for (int t = t_lo; t <= t_hi; ++t) {
    Family F = pair.F.at(t), G = pair.G.at(t);
    if (F.rank() != G.rank())
      throw UserError("--pair " + pair.str() + ": at t = " + std::to_string(t) + " " + F.name() + " has weight " +
                      weight_string(F.rank()) + " but " + G.name() + " has weight " + weight_string(G.rank()) +
                      " (the families of a scan must have equal weight)");
  }
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
  j.F = spec.pair.F.at(j.t);
  j.G = spec.pair.G.at(j.t);
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
