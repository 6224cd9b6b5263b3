#pragma once
// Balls in certificates: stored exactly, so that reading back gives the very
// same ball (hence a ball containing the value it encloses).
//   {"mid": "<m>*2^<e>", "rad": "<m>*2^<e>", "decimal": "[x +/- y]"}
// The "decimal" field is for people (arb_get_str rounds outward) and is
// ignored when reading.
#include <nlohmann/json.hpp>

#include "core/flint_types.hpp"

namespace circlet {

nlohmann::json ball_to_json(const arb_t x);
/// Throws UserError naming `what` when the object is malformed.
void ball_from_json(arb_t res, const nlohmann::json& j, const std::string& what);

/// Enlarges x by 2^{-bits}(|x| + 1) plus 2^{-26} of its radius:
/// applied to every ball a certificate stores, so that an independent
/// recomputation at another precision lands inside it.
void ball_add_margin(arb_t x, slong bits);

/// Is `inner` contained in `outer`, and is rad(outer) ≤ rad(inner)(1 + 2^{-20}) +
/// 2^{-slack_bits}(|inner| + 1)? (A stored interval must be both correct and tight.)
bool ball_contains_tightly(const arb_t outer, const arb_t inner, slong slack_bits);

/// "[lo, hi]" with 6 significant digits, for display only (doubles, rounded outward
/// by one unit in the last printed digit; the certificate holds the exact ball).
std::string interval_display(const arb_t x);

}  // namespace circlet
