#include "core/parse_int.hpp"

#include <cerrno>
#include <cmath>
#include <cstdlib>

#include "core/error.hpp"

namespace circlet {

bool is_decimal_digits(const std::string& text) {
  if (text.empty()) return false;
  for (char c : text)
    if (c < '0' || c > '9') return false;
  return true;
}

namespace {

// Power notation: text = term (('+' | '-') term)*, term = digits | digits '^' digits,
// e.g. "10^12", "2^64-1", "10^6+3". Returns false when the text has any other
// form (plain digits included: they take the path above). The value is exact;
// a term whose size would exceed max_digits decimal digits is refused before it
// is computed.
bool parse_power_notation(const std::string& what, const std::string& text, long max_digits, Fmpz& out) {
  if (text.find('^') == std::string::npos) return false;
  Fmpz total, term;
  size_t i = 0;
  int sign = 1;
  while (true) {
    size_t j = i;
    while (j < text.size() && text[j] >= '0' && text[j] <= '9') ++j;
    if (j == i) return false;
    const std::string base = text.substr(i, j - i);
    fmpz_set_str(term.get(), base.c_str(), 10);
    if (j < text.size() && text[j] == '^') {
      size_t k = j + 1;
      while (k < text.size() && text[k] >= '0' && text[k] <= '9') ++k;
      if (k == j + 1) return false;
      const std::string exp_text = text.substr(j + 1, k - j - 1);
      // Size check before computing: digits(B^E) ≤ E·digits(B).
      const double log10_base = fmpz_is_zero(term.get()) ? 0.0 : fmpz_dlog(term.get()) / std::log(10.0);
      const double e = exp_text.size() > 12 ? 1e13 : std::strtod(exp_text.c_str(), nullptr);
      if (e * log10_base > static_cast<double>(max_digits))
        throw UserError(what + " = " + text + " is too large (more than " + std::to_string(max_digits) + " digits)");
      fmpz_pow_ui(term.get(), term.get(), static_cast<ulong>(e));
      j = k;
    }
    if (sign > 0)
      fmpz_add(total.get(), total.get(), term.get());
    else
      fmpz_sub(total.get(), total.get(), term.get());
    if (j == text.size()) break;
    if (text[j] != '+' && text[j] != '-') return false;
    sign = text[j] == '+' ? 1 : -1;
    i = j + 1;
  }
  if (fmpz_sgn(total.get()) < 0) throw UserError(what + " must be non-negative, got " + text + " = " + total.str());
  out = total;
  return true;
}

}  // namespace

long parse_nonnegative(const std::string& what, const std::string& text, long max) {
  if (text.empty()) throw UserError(what + " expects a non-negative integer, got an empty string");
  if (text[0] == '-' && is_decimal_digits(text.substr(1)))
    throw UserError(what + " must be non-negative, got " + text);
  Fmpz power;
  if (parse_power_notation(what, text, 40, power)) {
    if (fmpz_cmp_si(power.get(), max) > 0)
      throw UserError(what + " = " + text + " is too large (at most " + std::to_string(max) + ")");
    return fmpz_get_si(power.get());
  }
  if (!is_decimal_digits(text))
    throw UserError(what + " expects a non-negative integer (decimal digits, or powers such as 10^6 joined by + and -), got '" +
                    text + "'");
  // Leading zeros are skipped here so that a long run of them cannot look "too large".
  size_t first = text.find_first_not_of('0');
  const std::string digits = first == std::string::npos ? "0" : text.substr(first);
  errno = 0;
  const unsigned long long v = digits.size() > 20 ? 0 : std::strtoull(digits.c_str(), nullptr, 10);
  if (digits.size() > 20 || errno == ERANGE || v > static_cast<unsigned long long>(max))
    throw UserError(what + " = " + text + " is too large (at most " + std::to_string(max) + ")");
  return static_cast<long>(v);
}

long parse_int_in_range(const std::string& what, const std::string& text, long min, long max) {
  const std::string range = what + " must be between " + std::to_string(min) + " and " + std::to_string(max);
  if (!text.empty() && text[0] == '-' && is_decimal_digits(text.substr(1))) throw UserError(range + ", got " + text);
  long v;
  try {
    v = parse_nonnegative(what, text, max);
  } catch (const UserError&) {
    if (is_decimal_digits(text)) throw UserError(range + ", got " + text);  // too large
    throw;
  }
  if (v < min) throw UserError(range + ", got " + text);
  return v;
}

Fmpz parse_nonnegative_fmpz(const std::string& what, const std::string& text, long max_digits) {
  if (text.empty()) throw UserError(what + " expects a non-negative integer, got an empty string");
  if (text[0] == '-' && is_decimal_digits(text.substr(1)))
    throw UserError(what + " must be a non-negative integer, got " + text);
  Fmpz power;
  if (parse_power_notation(what, text, max_digits, power)) return power;
  if (!is_decimal_digits(text))
    throw UserError(what + ": '" + text + "' is not an integer (decimal digits, or powers such as 10^12 joined by + and -)");
  if (static_cast<long>(text.size()) > max_digits)
    throw UserError(what + " has " + std::to_string(text.size()) + " digits, more than the " +
                    std::to_string(max_digits) + " accepted");
  Fmpz v;
  fmpz_set_str(v.get(), text.c_str(), 10);  // digits only: cannot fail
  return v;
}

}  // namespace circlet
