// libFuzzer target: the relation parser behind `circlet prove` (src/modform/relation.hpp).
// Any input must either parse or throw UserError; a parsed relation written back with
// str() must parse again to the same text. Anything else (a crash, another exception,
// a failed round trip) is a bug.
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>

#include "core/error.hpp"
#include "modform/relation.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string s(reinterpret_cast<const char*>(data), size);
  circlet::LinearRelation r;
  try {
    r = circlet::parse_relation(s);
  } catch (const circlet::UserError&) {
    return 0;
  }
  const std::string text = r.str();
  if (circlet::parse_relation(text).str() != text) std::abort();  // round trip
  return 0;
}
