#include "series/integer_series.hpp"

#include <flint/flint.h>

#include <charconv>
#include <utility>

namespace circlet {

IntegerSeries::IntegerSeries(long length) : length_(length) {
  coeffs_ = length > 0 ? _fmpz_vec_init(length) : nullptr;
}

IntegerSeries::IntegerSeries(IntegerSeries&& o) noexcept
    : coeffs_(std::exchange(o.coeffs_, nullptr)), length_(std::exchange(o.length_, 0)) {}

IntegerSeries& IntegerSeries::operator=(IntegerSeries&& o) noexcept {
  std::swap(coeffs_, o.coeffs_);
  std::swap(length_, o.length_);
  return *this;
}

IntegerSeries::~IntegerSeries() {
  if (coeffs_) _fmpz_vec_clear(coeffs_, length_);
}

Fmpz IntegerSeries::value(long n) const {
  Fmpz r;
  fmpz_set(r.get(), coeffs_ + n);
  return r;
}

namespace {
// Decimal digits of an unsigned 128-bit value, most significant first.
void append_u128(std::string& out, unsigned __int128 v) {
  char buf[40];
  int i = 40;
  // Peel off 19 digits at a time so most divisions are word divisions.
  constexpr uint64_t kTen19 = 10000000000000000000ULL;
  while (v >= kTen19) {
    uint64_t low = static_cast<uint64_t>(v % kTen19);
    v /= kTen19;
    for (int j = 0; j < 19; ++j) {
      buf[--i] = static_cast<char>('0' + low % 10);
      low /= 10;
    }
  }
  uint64_t w = static_cast<uint64_t>(v);
  do {
    buf[--i] = static_cast<char>('0' + w % 10);
    w /= 10;
  } while (w != 0);
  out.append(buf + i, buf + 40);
}
}  // namespace

void append_decimal(std::string& out, const fmpz_t x) {
  if (fmpz_fits_si(x)) {
    char buf[24];
    auto res = std::to_chars(buf, buf + sizeof buf, fmpz_get_si(x));
    out.append(buf, res.ptr);
    return;
  }
  if (fmpz_bits(x) <= 127) {
    fmpz_t a;
    fmpz_init(a);
    fmpz_abs(a, x);
    ulong hi = 0, lo = 0;
    fmpz_get_uiui(&hi, &lo, a);
    fmpz_clear(a);
    if (fmpz_sgn(x) < 0) out.push_back('-');
    append_u128(out, (static_cast<unsigned __int128>(hi) << 64) | lo);
    return;
  }
  char* s = fmpz_get_str(nullptr, 10, x);
  out.append(s);
  flint_free(s);
}

}  // namespace circlet
