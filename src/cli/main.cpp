// circlet: the command-line program, a thin layer over the library.
#include <unistd.h>

#include <algorithm>
#include <iostream>

#include "circlet/version.hpp"
#include "cli/command.hpp"
#include "core/error.hpp"
#include "core/provenance.hpp"

namespace circlet::cli {

std::vector<CommandSpec>& registry() {
  static std::vector<CommandSpec> r;
  return r;
}

bool stderr_is_terminal() { return ::isatty(STDERR_FILENO) == 1; }

}  // namespace circlet::cli

int main(int argc, char** argv) {
  using namespace circlet;
  set_command_line(argc, argv);
  CLI::App app{"circlet: exact counts, certified circle-method main terms and ratios of t-core partition families"};
  app.set_version_flag("--version", std::string("circlet ") + kVersion);
  app.require_subcommand(1);
  auto& specs = cli::registry();
  std::sort(specs.begin(), specs.end(), [](const auto& a, const auto& b) { return a.order < b.order; });
  for (auto& spec : specs) spec.install(app);
  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    std::cerr << "circlet: error: " << e.what() << "\n";
    return 2;
  } catch (const UserError& e) {
    std::cerr << "circlet: error: " << e.what() << "\n";
    return 2;
  } catch (const InternalError& e) {
    std::cerr << "circlet: internal error: " << e.what() << "\n";
    return 3;
  } catch (const std::bad_alloc&) {
    std::cerr << "circlet: error: out of memory\n";
    return 2;
  } catch (const std::exception& e) {
    std::cerr << "circlet: internal error: " << e.what() << "\n";
    return 3;
  }
  return 0;
}
