// Table-driven check of docs/inputs.md: every bad input listed there, run
// through the real binary, gets its exit status and its message, and prints
// no number on standard output.
#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "cli_run.hpp"

using circlet::testing::run_circlet;

namespace {

struct Row {
  std::string input, bad_value, args, message;
  int status;
};

std::string trim(const std::string& s) {
  const auto a = s.find_first_not_of(' ');
  const auto b = s.find_last_not_of(' ');
  return a == std::string::npos ? "" : s.substr(a, b - a + 1);
}

/// Rows of the table in docs/inputs.md: lines "| input | bad value | `args` | exit | message |".
std::vector<Row> read_table() {
  std::ifstream in(CIRCLET_SOURCE_DIR "/docs/inputs.md");
  std::vector<Row> rows;
  for (std::string line; std::getline(in, line);) {
    if (line.rfind("| ", 0) != 0 || line.find("| `") == std::string::npos) continue;
    std::vector<std::string> cells;
    std::stringstream ss(line.substr(1));
    for (std::string c; std::getline(ss, c, '|');) cells.push_back(trim(c));
    if (cells.size() < 5) continue;
    std::string args = cells[2];
    if (args.size() >= 2 && args.front() == '`' && args.back() == '`') args = args.substr(1, args.size() - 2);
    rows.push_back({cells[0], cells[1], args, cells[4], std::stoi(cells[3])});
  }
  return rows;
}

std::string replace_all(std::string s, const std::string& from, const std::string& to) {
  for (size_t p = s.find(from); p != std::string::npos; p = s.find(from, p + to.size())) s.replace(p, from.size(), to);
  return s;
}

/// The fixture files named in docs/inputs.md, in a fresh scratch directory.
std::string make_fixtures() {
  const std::string dir = "/tmp/circlet_cli_errors_" + std::to_string(::getpid());
  REQUIRE(std::system(("rm -rf " + dir + " && mkdir -p " + dir + "/adir").c_str()) == 0);
  std::ofstream(dir + "/empty.json");
  std::ofstream(dir + "/truncated.json") << "{\"a\":";
  std::ofstream(dir + "/array.json") << "[1,2]";
  const auto cert = run_circlet("certify c6 sc11 --ap 2,1 --ap2 2,1 -o " + dir + "/cert.json");
  REQUIRE(cert.status == 0);
  auto j = nlohmann::json::parse(circlet::testing::slurp_file(dir + "/cert.json"));
  auto old = j;
  old["provenance"]["version"] = "0.0.1";
  std::ofstream(dir + "/oldversion.json") << old.dump(2);
  auto tampered = j;
  tampered["classes"][0]["local_factors"][0]["beta_F"] = "3/4";
  std::ofstream(dir + "/tampered.json") << tampered.dump(2);
  // Malformed certificates (docs/certificate-format.md §1): the reader refuses them before the digest.
  std::string dup = j.dump();
  dup.insert(dup.size() - 1, ",\"Q\":5");
  std::ofstream(dir + "/dupkey.json") << dup;
  auto edit = [&](const std::string& name, auto&& f) {
    auto k = j;
    f(k);
    std::ofstream(dir + "/" + name) << k.dump(2);
  };
  edit("eminus1.json", [](nlohmann::json& k) { k["modulus_factors"][0]["e"] = -1; });
  edit("ebig.json", [](nlohmann::json& k) { k["modulus_factors"][0]["e"] = 1000000000; });
  edit("qhuge.json", [](nlohmann::json& k) { k["Q"] = 1ULL << 62; });
  edit("qmaxhuge.json", [](nlohmann::json& k) { k["Q_max"] = 1ULL << 62; });
  edit("ballexp.json", [](nlohmann::json& k) { k["classes"][0]["limit_interval"]["rad"] = "1*2^1000000000"; });
  edit("unknown.json", [](nlohmann::json& k) { k["reason"] = "x"; });
  edit("float.json", [](nlohmann::json& k) { k["precision_bits"] = 128.5; });
  std::ofstream(dir + "/deep.json") << std::string(100000, '[') << std::string(100000, ']');
  REQUIRE(run_circlet("certify c9 sc17 --ap 34,25 --ap2 102,73 -o " + dir + "/slowcount.json").status == 0);
  REQUIRE(run_circlet("scan --t 6..6 --modulus 2 -o " + dir + "/scan6").status == 0);
  return dir;
}

}  // namespace

TEST_CASE("every bad input of docs/inputs.md gets its exit status and message", "[cli][errors]") {
  const auto rows = read_table();
  REQUIRE(rows.size() >= 40);  // the table is read, not silently empty
  const std::string dir = make_fixtures();
  for (const auto& row : rows) {
    const std::string args = replace_all(row.args, "$T", dir);
    INFO("circlet " << args << "  (" << row.input << ": " << row.bad_value << ")");
    // `timeout` turns a hang into status 124, which no row expects.
    const auto r = run_circlet(args, "timeout 120");
    CHECK(r.status == row.status);
    if (row.status == 2) {
      CHECK_THAT(r.err, Catch::Contains(row.message));
      CHECK(r.out.empty());
      // One clear line: a single line on stderr, prefixed by the program name.
      CHECK(r.err.rfind("circlet: error: ", 0) == 0);
      CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    } else {
      CHECK_THAT(r.out + r.err, Catch::Contains(row.message));
    }
  }
  std::system(("rm -rf " + dir).c_str());
}
