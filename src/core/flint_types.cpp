#include "core/flint_types.hpp"

#include <flint/flint.h>

#include "core/error.hpp"

namespace circlet {

namespace {
std::string take_string(char* s) {
  std::string out(s);
  flint_free(s);
  return out;
}

bool is_integer_text(const std::string& s) {
  if (s.empty()) return false;
  size_t i = (s[0] == '-' || s[0] == '+') ? 1 : 0;
  if (i == s.size()) return false;
  for (; i < s.size(); ++i)
    if (s[i] < '0' || s[i] > '9') return false;
  return true;
}
}  // namespace

Fmpz Fmpz::from_str(const std::string& s) {
  if (!is_integer_text(s)) throw UserError("'" + s + "' is not an integer");
  Fmpz r;
  std::string t = (s[0] == '+') ? s.substr(1) : s;
  if (fmpz_set_str(r.v_, t.c_str(), 10) != 0) throw UserError("'" + s + "' is not an integer");
  return r;
}

std::string Fmpz::str() const { return take_string(fmpz_get_str(nullptr, 10, v_)); }

Fmpq Fmpq::from_str(const std::string& s) {
  auto slash = s.find('/');
  Fmpq r;
  if (slash == std::string::npos) {
    Fmpz n = Fmpz::from_str(s);
    fmpq_set_fmpz_frac(r.v_, n.get(), Fmpz(1).get());
    return r;
  }
  Fmpz n = Fmpz::from_str(s.substr(0, slash));
  std::string ds = s.substr(slash + 1);
  if (!is_integer_text(ds) || ds[0] == '-' || ds[0] == '+') throw UserError("'" + s + "' is not a rational p/q");
  Fmpz d = Fmpz::from_str(ds);
  if (fmpz_is_zero(d.get())) throw UserError("'" + s + "' has a zero denominator");
  fmpq_set_fmpz_frac(r.v_, n.get(), d.get());
  return r;
}

std::string Fmpq::str() const { return take_string(fmpq_get_str(nullptr, 10, v_)); }

std::string Arb::str(slong digits, ulong flags) const {
  // arb_get_str rounds outward: the printed ball contains this ball.
  return take_string(arb_get_str(v_, digits, flags));
}

}  // namespace circlet
