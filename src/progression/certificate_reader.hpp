#pragma once
// Strict reading of a certificate (docs/certificate-format.md §1, §3–§6):
// before any claim is checked, the text and the structure are validated, so
// that every later loop is bounded by limits stated in the format and no
// number handed to FLINT/Arb is absurd. Every violation is a UserError whose
// message starts with the JSON pointer of the offending field.
#include <nlohmann/json.hpp>
#include <string>

namespace circlet {

/// Largest certificate file read (bytes).
inline constexpr size_t kCertMaxBytes = 4u << 20;

/// Parses JSON text: at most kCertMaxBytes, nesting depth at most 16, no
/// duplicate key in any object, no floating-point number. Throws UserError
/// ("<pointer>: duplicate key 'k'", "<pointer>: ... is not an integer", or
/// "is not JSON: ...").
nlohmann::json parse_certificate_text(const std::string& text);

/// Checks every key, type, limit and canonical spelling of the format (not the
/// claims, not the digest). Throws UserError "<pointer>: <what>".
void check_certificate_schema(const nlohmann::json& cert);

/// "YYYY-MM-DDTHH:MM:SSZ", a valid calendar date-time (leap years; seconds 00..59):
/// the provenance date of every certificate, progression and proof alike.
bool is_utc_date_time(const std::string& s);

}  // namespace circlet
