#pragma once
// Small RAII wrappers over FLINT/Arb value types. They own the C object and
// hide nothing else: call the C API on `.get()` (or the implicit conversion).
// Precision stays an explicit argument of every numerical function.
#include <arb.h>
#include <arf.h>
#include <mag.h>
#include <flint/fmpq.h>
#include <flint/fmpz.h>

#include <string>
#include <utility>

namespace circlet {

class Fmpz {
 public:
  Fmpz() { fmpz_init(v_); }
  Fmpz(slong x) { fmpz_init_set_si(v_, x); }  // NOLINT(implicit)
  static Fmpz from_ui(ulong x) { Fmpz r; fmpz_set_ui(r.v_, x); return r; }
  static Fmpz from_str(const std::string& s);  // throws UserError on malformed input
  Fmpz(const Fmpz& o) { fmpz_init_set(v_, o.v_); }
  Fmpz(Fmpz&& o) noexcept { fmpz_init(v_); fmpz_swap(v_, o.v_); }
  Fmpz& operator=(const Fmpz& o) { fmpz_set(v_, o.v_); return *this; }
  Fmpz& operator=(Fmpz&& o) noexcept { fmpz_swap(v_, o.v_); return *this; }
  ~Fmpz() { fmpz_clear(v_); }
  fmpz* get() { return v_; }
  const fmpz* get() const { return v_; }
  operator fmpz*() { return v_; }              // NOLINT
  operator const fmpz*() const { return v_; }  // NOLINT
  std::string str() const;
  bool operator==(const Fmpz& o) const { return fmpz_equal(v_, o.v_); }
  bool operator!=(const Fmpz& o) const { return !fmpz_equal(v_, o.v_); }
  bool operator<(const Fmpz& o) const { return fmpz_cmp(v_, o.v_) < 0; }

 private:
  fmpz_t v_;
};

class Fmpq {
 public:
  Fmpq() { fmpq_init(v_); }
  Fmpq(slong num, ulong den = 1) { fmpq_init(v_); fmpq_set_si(v_, num, den); }  // NOLINT
  explicit Fmpq(const Fmpz& n) { fmpq_init(v_); fmpq_set_fmpz_frac(v_, n.get(), Fmpz(1).get()); }
  static Fmpq from_str(const std::string& s);  // "p/q" or "p"; throws UserError
  Fmpq(const Fmpq& o) { fmpq_init(v_); fmpq_set(v_, o.v_); }
  Fmpq(Fmpq&& o) noexcept { fmpq_init(v_); fmpq_swap(v_, o.v_); }
  Fmpq& operator=(const Fmpq& o) { fmpq_set(v_, o.v_); return *this; }
  Fmpq& operator=(Fmpq&& o) noexcept { fmpq_swap(v_, o.v_); return *this; }
  ~Fmpq() { fmpq_clear(v_); }
  fmpq* get() { return v_; }
  const fmpq* get() const { return v_; }
  operator fmpq*() { return v_; }              // NOLINT
  operator const fmpq*() const { return v_; }  // NOLINT
  std::string str() const;
  bool operator==(const Fmpq& o) const { return fmpq_equal(v_, o.v_); }
  bool operator!=(const Fmpq& o) const { return !fmpq_equal(v_, o.v_); }
  bool is_zero() const { return fmpq_is_zero(v_); }

 private:
  fmpq_t v_;
};

class Arb {
 public:
  Arb() { arb_init(v_); }
  Arb(const Arb& o) { arb_init(v_); arb_set(v_, o.v_); }
  Arb(Arb&& o) noexcept { arb_init(v_); arb_swap(v_, o.v_); }
  Arb& operator=(const Arb& o) { arb_set(v_, o.v_); return *this; }
  Arb& operator=(Arb&& o) noexcept { arb_swap(v_, o.v_); return *this; }
  ~Arb() { arb_clear(v_); }
  arb_ptr get() { return v_; }
  arb_srcptr get() const { return v_; }
  operator arb_ptr() { return v_; }        // NOLINT
  operator arb_srcptr() const { return v_; }  // NOLINT
  /// Decimal text "[mid +/- rad]" that reads back (arb_set_str) to a ball containing this one.
  /// `flags` as for arb_get_str (e.g. ARB_STR_MORE: all `digits` of the midpoint).
  std::string str(slong digits = 20, ulong flags = 0) const;

 private:
  arb_t v_;
};

}  // namespace circlet
