#pragma once
// The one parser for integers the user types (every option and every number
// inside a family name, progression or range). The rule, the same everywhere:
//   * decimal digits, optionally one leading '-' (which is then refused
//     with "must be non-negative" where the value must be ≥ 0);
//   * or power notation: decimal powers B^E and decimal numbers joined by '+'
//     and '-', e.g. 10^12, 2^64-1, 10^6+3 (exact; a negative total is refused
//     as above, a term beyond the digit limit before it is computed);
//   * no leading sign '+', no spaces before or after, no "0x"/"0o"/"0b"
//     prefixes, no "1e6" exponent, no digit separators; the empty string is an
//     error;
//   * leading zeros are allowed and mean nothing: "010" is ten (never octal).
// Values beyond the option's maximum (or beyond 64 bits) are refused with
// "is too large (at most M)".
#include <string>

#include "core/flint_types.hpp"

namespace circlet {

/// True when `text` is a non-empty string of ASCII digits '0'..'9'.
bool is_decimal_digits(const std::string& text);

/// Parses a non-negative decimal integer ≤ max for the option `what` (e.g. "--to").
/// UserError naming the option on empty, signed, non-numeric or too-large text.
long parse_nonnegative(const std::string& what, const std::string& text, long max);

/// As parse_nonnegative, and also refuses values below `min` with
/// "<what> must be between <min> and <max>".
long parse_int_in_range(const std::string& what, const std::string& text, long min, long max);

/// A non-negative decimal integer of any size (e.g. --at N), by the same rule;
/// at most max_digits digits.
Fmpz parse_nonnegative_fmpz(const std::string& what, const std::string& text, long max_digits = 100000);

}  // namespace circlet
