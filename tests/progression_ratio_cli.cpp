// `circlet ratio` end to end (src/cli/ratio.cpp).
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>

#include "cli_run.hpp"
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

namespace {
std::string run(const std::string& args, int* rc, std::string* err = nullptr) {
  const auto r = circlet::testing::run_circlet(args);
  *rc = r.status;
  if (err) *err = r.err;
  return r.out;
}
}  // namespace

TEST_CASE("ratio prints exact counts, exact ratios, local factors and the verdict", "[progression][ratio][cli]") {
  int rc = 0;
  std::string csv = circlet::testing::csv_body(run("ratio c7 sc13 --ap 2,1 --ap2 3,2 --to 30", &rc));
  REQUIRE(rc == 0);
  std::istringstream in(csv);
  std::string line;
  std::getline(in, line);
  CHECK(line.rfind("n,F_arg,G_arg,F_count,G_count,ratio,", 0) == 0);
  long rows = 0;
  while (std::getline(in, line)) ++rows;
  CHECK(rows == 31);
  std::string js = run("ratio c7 sc13 --ap 2,1 --ap2 3,2 --to 30 --json", &rc);
  REQUIRE(rc == 0);
  auto j = nlohmann::json::parse(js);
  CHECK(j["rows"].size() == 31);
  CHECK(j["summary"]["verdict"] == "NON-CONVERGENT");
  // c_7 and sc_13 have integral weight 3: both main terms are exact rationals.
  for (const auto& r : j["rows"]) {
    CHECK(r["main_term_ratio"].get<std::string>().find('[') == std::string::npos);
    // The exact ratio is F_count/G_count.
    if (r["G_count"] != "0") {
      long a = std::stol(r["F_count"].get<std::string>()), b = std::stol(r["G_count"].get<std::string>());
      std::string q = r["ratio"];
      auto slash = q.find('/');
      long num = std::stol(q.substr(0, slash)), den = slash == std::string::npos ? 1 : std::stol(q.substr(slash + 1));
      CHECK(a * den == b * num);
    }
  }
  CHECK(j["summary"]["rho_varies_at"].size() >= 1);
}

TEST_CASE("ratio refuses families of different weight", "[progression][ratio][cli][errors]") {
  int rc = 0;
  std::string err;
  run("ratio c6 sc13 --to 5", &rc, &err);
  CHECK(rc == 2);
  CHECK_THAT(err, Catch::Contains("c6 has weight 5/2 but sc13 has weight 3"));
}
