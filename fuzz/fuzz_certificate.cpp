// libFuzzer target: the certificate reader and checker behind `circlet verify`.
// On any byte string, verify_certificate_text either returns a report or throws
// UserError (a malformed certificate, docs/certificate-format.md §1); any other
// exception, an abort or a hang is a bug.
#include <cstddef>
#include <cstdint>
#include <string>

#include "core/error.hpp"
#include "progression/verify.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string s(reinterpret_cast<const char*>(data), size);
  try {
    (void)circlet::verify_certificate_text(s);
  } catch (const circlet::UserError&) {
    // rejected as malformed: the expected answer to most inputs
  }
  return 0;
}
