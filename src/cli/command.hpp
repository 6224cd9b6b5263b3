#pragma once
// Subcommand registry: each src/cli/<command>.cpp registers itself with a
// static Registration object, so adding a command touches no shared file.
#include <CLI/CLI.hpp>
#include <functional>
#include <string>
#include <vector>

#include "core/progress_line.hpp"

namespace circlet::cli {

struct CommandSpec {
  std::string name;
  int order;  // position in --help
  /// Adds the subcommand and its options to `app` and sets its callback.
  std::function<void(CLI::App& app)> install;
};

std::vector<CommandSpec>& registry();

struct Registration {
  explicit Registration(CommandSpec spec) { registry().push_back(std::move(spec)); }
};

/// True when stderr is a terminal (progress indications are shown only then).
inline bool stderr_is_terminal() { return circlet::stderr_is_a_terminal(); }

}  // namespace circlet::cli
