// circlet: the command-line program, a thin layer over the library.
#include <unistd.h>

#include <algorithm>
#include <iostream>

#include "circlet/version.hpp"
#include "cli/command.hpp"
#include "core/atomic_file.hpp"
#include "core/error.hpp"
#include "core/library_errors.hpp"
#include "core/provenance.hpp"
#include "core/resource_guard.hpp"

namespace circlet::cli {

std::vector<CommandSpec>& registry() {
  static std::vector<CommandSpec> r;
  return r;
}

namespace {

// The value names shown in --help (instead of CLI11's "TEXT": every option is
// read as text and parsed by core/parse_int.hpp or the family/progression parsers).
const char* value_name(const std::string& name) {
  static const std::pair<const char*, const char*> names[] = {
      {"--to", "N"},        {"--at", "N"},         {"--ap", "A,B"},        {"--ap2", "A2,B2"},
      {"--prec", "BITS"},   {"--digits", "D"},     {"--qmax", "Q"},        {"--upto", "K"},
      {"--modulus", "M"},   {"--t", "T1..T2"},     {"--shard", "i/k"},     {"--compare-to", "K"},
      {"--output", "FILE"}, {"family", "FAMILY"},  {"F", "FAMILY"},        {"G", "FAMILY"},
      {"certificate", "FILE"}, {"dirs", "DIR"}};
  for (const auto& [n, v] : names)
    if (name == n) return v;
  return nullptr;
}

void name_values(CLI::App& app) {
  for (CLI::App* sub : app.get_subcommands({})) {
    for (CLI::Option* o : sub->get_options()) {
      if (o->get_type_size() == 0) continue;  // flags take no value
      if (const char* v = value_name(o->get_name())) o->type_name(v);
      for (const auto& l : o->get_lnames())
        if (const char* v = value_name("--" + l)) o->type_name(v);
    }
    if (sub->get_name() == "scan") {
      for (CLI::Option* o : sub->get_options())
        if (o->check_lname("output")) o->type_name("DIR");
    }
  }
}

/// An option given with an empty value (`--ap ''`) is an error, never "not given".
void refuse_empty_values(CLI::App& app) {
  for (CLI::App* sub : app.get_subcommands())
    for (const CLI::Option* o : sub->get_options())
      if (o->count() > 0 && o->get_type_size() != 0)
        for (const auto& r : o->results())
          if (r.empty())
            throw UserError((o->get_lnames().empty() ? o->get_name() : "--" + o->get_lnames()[0]) +
                            " was given an empty value");
}

std::string command_list(CLI::App& app) {
  std::string s;
  for (CLI::App* sub : app.get_subcommands({})) s += (s.empty() ? "" : ", ") + sub->get_name();
  return s;
}

}  // namespace

}  // namespace circlet::cli

int main(int argc, char** argv) {
  using namespace circlet;
  set_command_line(argc, argv);
  install_library_error_handlers();
  CLI::App app{"circlet: exact counts, certified circle-method main terms and ratios of t-core partition families"};
  app.set_version_flag("--version", std::string("circlet ") + kVersion);
  app.require_subcommand(1);
  auto& specs = cli::registry();
  std::sort(specs.begin(), specs.end(), [](const auto& a, const auto& b) { return a.order < b.order; });
  for (auto& spec : specs) spec.install(app);
  bool allow = false;
  app.add_flag("--allow-large", allow,
               "run requests whose estimated time is above the limit (default 60 s; CIRCLET_TIME_LIMIT) "
               "instead of refusing them")
      ->group("Global");
  for (CLI::App* sub : app.get_subcommands({})) sub->fallthrough();
  cli::name_values(app);
  // Runs after parsing, before the command's callback.
  app.parse_complete_callback([&app, &allow]() {
    set_allow_large(allow);
    cli::refuse_empty_values(app);
  });
  try {
    if (argc >= 2 && argv[1][0] != '-') {
      bool known = false;
      for (CLI::App* sub : app.get_subcommands({})) known = known || sub->get_name() == argv[1];
      if (!known)
        throw UserError(std::string("unknown command '") + argv[1] + "' (commands: " + cli::command_list(app) +
                        "; circlet --help)");
    }
    app.parse(argc, argv);
    // A write error on standard output (a full disk, /dev/full) is an error, also for
    // commands that print directly.
    flush_standard_output();
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::RequiredError& e) {
    if (app.get_subcommands().empty())
      std::cerr << "circlet: error: give a command: " << cli::command_list(app) << " (circlet --help)\n";
    else
      std::cerr << "circlet: error: " << e.what() << "\n";
    return 2;
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
