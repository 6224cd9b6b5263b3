#include "core/error.hpp"

namespace circlet {

void assertion_failed(const char* expr, const char* file, int line, const std::string& msg) {
  throw InternalError(std::string("internal invariant broken: ") + expr + " at " + file + ":" +
                      std::to_string(line) + (msg.empty() ? "" : " (" + msg + ")"));
}

}  // namespace circlet
