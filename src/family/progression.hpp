#pragma once
// Arithmetic progressions n ↦ A·n + B as given on the command line ("A,B"),
// and the parsing of the non-negative integers the user types (N, K, digits).
#include <string>

namespace circlet {

struct Progression {
  long A = 1;  // ≥ 1
  long B = 0;  // ≥ 0

  /// Parses "A,B" (e.g. "5,4"); UserError on malformed text, A ≤ 0, B < 0 or overflow.
  static Progression parse(const std::string& text);
  /// A·k + B; UserError if it does not fit in a signed 64-bit integer.
  long at(long k) const;
  std::string str() const { return std::to_string(A) + "," + std::to_string(B); }
  bool operator==(const Progression& o) const { return A == o.A && B == o.B; }
};

/// Parses a non-negative decimal integer ≤ max for the option `what` (e.g. "--to");
/// UserError naming the option on empty, signed, non-numeric or too-large text.
long parse_nonnegative(const std::string& what, const std::string& text, long max);

}  // namespace circlet
