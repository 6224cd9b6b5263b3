// libFuzzer target: the parsers of user input (family names, progressions,
// non-negative integers, rationals). Any input must either parse or throw
// UserError; anything else (a crash, another exception) is a bug.
#include <cstddef>
#include <cstdint>
#include <string>

#include "core/error.hpp"
#include "core/flint_types.hpp"
#include "family/family.hpp"
#include "family/progression.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string s(reinterpret_cast<const char*>(data), size);
  using namespace circlet;
  try { (void)Family::parse(s).eta_quotient(); } catch (const UserError&) {}
  try { (void)Progression::parse(s).at(1000); } catch (const UserError&) {}
  try { (void)parse_nonnegative("--to", s, 1000000000000L); } catch (const UserError&) {}
  try { (void)Fmpq::from_str(s).str(); } catch (const UserError&) {}
  return 0;
}
