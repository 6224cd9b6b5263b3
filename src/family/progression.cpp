#include "family/progression.hpp"

#include <cerrno>
#include <climits>
#include <cstdlib>

#include "core/error.hpp"

namespace circlet {

Progression Progression::parse(const std::string& text) {
  auto comma = text.find(',');
  if (comma == std::string::npos || text.find(',', comma + 1) != std::string::npos)
    throw UserError("progression '" + text + "' must be A,B (n -> A*n+B), e.g. 5,4");
  std::string a = text.substr(0, comma), b = text.substr(comma + 1);
  Progression p;
  p.A = parse_nonnegative("progression A", a, LONG_MAX);
  if (p.A == 0) throw UserError("progression '" + text + "': A must be at least 1");
  p.B = parse_nonnegative("progression B", b, LONG_MAX);
  return p;
}

RowSelection RowSelection::parse(const std::string& to, const std::string& at, const std::string& ap,
                                 bool allow_at) {
  const bool has_to = !to.empty(), has_at = allow_at && !at.empty(), has_ap = !ap.empty();
  const std::string forms = allow_at ? "give --to N, --at N or --ap A,B --to K" : "give --to N or --ap A,B --to K";
  if (has_to && has_at) throw UserError("give either --to N or --at N, not both");
  if (has_ap && has_at) throw UserError("give either --at N or --ap A,B --to K, not both");
  if (has_ap && !has_to) throw UserError("--ap A,B needs --to K (the progression is A*k+B for k = 0..K)");
  if (!has_to && !has_at) throw UserError(forms);
  RowSelection r;
  if (has_ap) {
    r.progression = true;
    r.prog = Progression::parse(ap);
    const long K = parse_nonnegative("--to", to, LONG_MAX - 1);
    r.n_max = r.prog.at(K);  // UserError on 64-bit overflow of A·K + B
    r.count = K + 1;
  } else if (has_to) {
    r.n_max = parse_nonnegative("--to", to, LONG_MAX - 1);
    r.count = r.n_max + 1;
  } else {
    r.n_max = r.first_n = parse_nonnegative("--at", at, LONG_MAX);
    r.count = 1;
  }
  return r;
}

long Progression::at(long k) const {
  long r;
  if (k < 0 || __builtin_mul_overflow(A, k, &r) || __builtin_add_overflow(r, B, &r))
    throw UserError("progression " + str() + " at k = " + std::to_string(k) + " exceeds 64-bit integers");
  return r;
}

}  // namespace circlet
