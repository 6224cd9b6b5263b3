// libFuzzer target: the parsers of user input (family names, progressions,
// row selections (--to/--at/--ap), scan t ranges, non-negative integers of any
// size, rationals). Any input must either parse or throw
// UserError; anything else (a crash, another exception) is a bug.
#include <cstddef>
#include <cstdint>
#include <string>

#include "core/error.hpp"
#include "core/flint_types.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"
#include "scan/scan_plan.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string s(reinterpret_cast<const char*>(data), size);
  using namespace circlet;
  try { (void)Family::parse(s).eta_quotient(); } catch (const UserError&) {}
  try { (void)Progression::parse(s).at(1000); } catch (const UserError&) {}
  try { (void)parse_nonnegative("--to", s, 1000000000000L); } catch (const UserError&) {}
  try { (void)parse_int_in_range("--digits", s, 1, 1000); } catch (const UserError&) {}
  try { (void)parse_nonnegative_fmpz("--at", s, 1000).str(); } catch (const UserError&) {}
  try { (void)Fmpq::from_str(s).str(); } catch (const UserError&) {}
  // Split at the first '|' into --to and --ap (the row selection of table commands).
  const auto bar = s.find('|');
  if (bar != std::string::npos) {
    try { (void)RowSelection::parse(s.substr(0, bar), "", s.substr(bar + 1)); } catch (const UserError&) {}
  }
  int lo = 0, hi = 0;
  try { ScanSpec::parse_t_range(s, &lo, &hi); } catch (const UserError&) {}
  return 0;
}
