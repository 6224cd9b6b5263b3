// libFuzzer target: the certificate reader and checker behind `circlet verify`.
// verify_certificate must never throw or crash on any JSON document: malformed
// or edited data is a failure in its report.
#include <cstddef>
#include <cstdint>
#include <string>

#include <nlohmann/json.hpp>

#include "progression/verify.hpp"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string s(reinterpret_cast<const char*>(data), size);
  const nlohmann::json j = nlohmann::json::parse(s, nullptr, /*allow_exceptions=*/false);
  if (j.is_discarded()) return 0;
  (void)circlet::verify_certificate(j);  // an exception escaping here is a bug
  return 0;
}
