#include "core/parse_int.hpp"

#include <cerrno>
#include <cstdlib>

#include "core/error.hpp"

namespace circlet {

bool is_decimal_digits(const std::string& text) {
  if (text.empty()) return false;
  for (char c : text)
    if (c < '0' || c > '9') return false;
  return true;
}

long parse_nonnegative(const std::string& what, const std::string& text, long max) {
  if (text.empty()) throw UserError(what + " expects a non-negative integer, got an empty string");
  if (text[0] == '-' && is_decimal_digits(text.substr(1)))
    throw UserError(what + " must be non-negative, got " + text);
  if (!is_decimal_digits(text))
    throw UserError(what + " expects a non-negative integer (decimal digits only), got '" + text + "'");
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
  if (!is_decimal_digits(text))
    throw UserError(what + ": '" + text + "' is not an integer (decimal digits only)");
  if (static_cast<long>(text.size()) > max_digits)
    throw UserError(what + " has " + std::to_string(text.size()) + " digits, more than the " +
                    std::to_string(max_digits) + " accepted");
  Fmpz v;
  fmpz_set_str(v.get(), text.c_str(), 10);  // digits only: cannot fail
  return v;
}

}  // namespace circlet
