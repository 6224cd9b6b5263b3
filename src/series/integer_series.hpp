#pragma once
// An owned array of exact integer coefficients a_0..a_N (FLINT fmpz: values
// below 2^62 are stored inline, larger ones as GMP integers), and fast decimal
// printing for large tables.
#include <flint/fmpz.h>
#include <flint/fmpz_vec.h>

#include <string>

#include "core/flint_types.hpp"

namespace circlet {

class IntegerSeries {
 public:
  IntegerSeries() = default;
  explicit IntegerSeries(long length);
  IntegerSeries(const IntegerSeries&) = delete;
  IntegerSeries& operator=(const IntegerSeries&) = delete;
  IntegerSeries(IntegerSeries&& o) noexcept;
  IntegerSeries& operator=(IntegerSeries&& o) noexcept;
  ~IntegerSeries();

  long length() const { return length_; }
  fmpz* at(long n) { return coeffs_ + n; }
  const fmpz* at(long n) const { return coeffs_ + n; }
  fmpz* data() { return coeffs_; }
  const fmpz* data() const { return coeffs_; }
  Fmpz value(long n) const;

 private:
  fmpz* coeffs_ = nullptr;
  long length_ = 0;
};

/// Appends the decimal text of x to `out`: a word-size path for |x| < 2^63, a
/// two-limb path for |x| < 2^127, and fmpz_get_str otherwise.
void append_decimal(std::string& out, const fmpz_t x);

}  // namespace circlet
