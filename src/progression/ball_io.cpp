#include "progression/ball_io.hpp"

#include <cmath>
#include <cstdio>

#include "core/error.hpp"

namespace circlet {

namespace {
std::string arf_to_text(const arf_t x) {
  if (arf_is_zero(x)) return "0*2^0";
  CIRCLET_ASSERT(arf_is_finite(x), "non-finite arf in a certificate");
  Fmpz m, e;
  arf_get_fmpz_2exp(m, e, x);
  return m.str() + "*2^" + e.str();
}

void arf_from_text(arf_t res, const std::string& s, const std::string& what) {
  auto star = s.find("*2^");
  if (star == std::string::npos) throw UserError(what + ": '" + s + "' is not of the form m*2^e");
  Fmpz m = Fmpz::from_str(s.substr(0, star));
  Fmpz e = Fmpz::from_str(s.substr(star + 3));
  arf_set_fmpz_2exp(res, m, e);
}
}  // namespace

nlohmann::json ball_to_json(const arb_t x) {
  nlohmann::json j;
  j["mid"] = arf_to_text(arb_midref(x));
  arf_t r;
  arf_init(r);
  arf_set_mag(r, arb_radref(x));
  j["rad"] = arf_to_text(r);
  arf_clear(r);
  char* s = arb_get_str(x, 20, 0);
  j["decimal"] = std::string(s);
  flint_free(s);
  return j;
}

void ball_from_json(arb_t res, const nlohmann::json& j, const std::string& what) {
  if (!j.is_object() || !j.contains("mid") || !j.contains("rad") || !j["mid"].is_string() ||
      !j["rad"].is_string())
    throw UserError(what + ": expected a ball {\"mid\": ..., \"rad\": ...}");
  arf_t m, r;
  arf_init(m);
  arf_init(r);
  arf_from_text(m, j["mid"].get<std::string>(), what);
  arf_from_text(r, j["rad"].get<std::string>(), what);
  if (arf_sgn(r) < 0) {
    arf_clear(m);
    arf_clear(r);
    throw UserError(what + ": negative radius");
  }
  arb_set_arf(res, m);
  arb_add_error_arf(res, r);
  arf_clear(m);
  arf_clear(r);
}

void ball_add_margin(arb_t x, slong bits) {
  mag_t m, t;
  mag_init(m);
  mag_init(t);
  arb_get_mag(m, x);             // |x| upper bound
  mag_mul_2exp_si(m, m, -bits);
  mag_one(t);
  mag_mul_2exp_si(t, t, -bits);
  mag_add(m, m, t);
  // Radii are 30-bit mags rounded upward at each operation, so a recomputation
  // may come out a few units of 2^{-30} (relative) wider: add 2^{-26} of the radius.
  mag_mul_2exp_si(t, arb_radref(x), -26);
  mag_add(m, m, t);
  mag_add(arb_radref(x), arb_radref(x), m);
  mag_clear(m);
  mag_clear(t);
}

bool ball_contains_tightly(const arb_t outer, const arb_t inner, slong slack_bits) {
  if (!arb_contains(outer, inner)) return false;
  // rad(outer) ≤ rad(inner)(1 + 2^{-20}) + 2^{-slack}(|inner| + 1)
  mag_t allowed, t;
  mag_init(allowed);
  mag_init(t);
  arb_get_mag(t, inner);
  mag_one(allowed);
  mag_add(t, t, allowed);
  mag_mul_2exp_si(t, t, -slack_bits);
  mag_add(allowed, arb_radref(inner), t);
  // Radii are 30-bit mags rounded upward, so two computations of the same interval
  // differ in the radius by a relative ~2^{-30}, and ball_add_margin adds 2^{-26}: allow 2^{-20}.
  mag_mul_2exp_si(t, arb_radref(inner), -20);
  mag_add(allowed, allowed, t);
  bool ok = mag_cmp(arb_radref(outer), allowed) <= 0;
  mag_clear(allowed);
  mag_clear(t);
  return ok;
}

std::string interval_display(const arb_t x) {
  if (!arb_is_finite(x)) return "[-inf, inf]";
  arf_t lo, hi;
  arf_init(lo);
  arf_init(hi);
  arb_get_lbound_arf(lo, x, 64);
  arb_get_ubound_arf(hi, x, 64);
  double l = arf_get_d(lo, ARF_RND_FLOOR), h = arf_get_d(hi, ARF_RND_CEIL);
  arf_clear(lo);
  arf_clear(hi);
  char buf[96];
  std::snprintf(buf, sizeof buf, "[%.6g, %.6g]", l - std::fabs(l) * 1e-6, h + std::fabs(h) * 1e-6);
  return buf;
}

}  // namespace circlet
