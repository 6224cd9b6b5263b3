// scripts/plot.py (the standard pictures) run on real output of the circlet
// binary: each plot kind renders a PNG of exactly plot.py's FIGSIZE × DPI =
// 800 × 600 pixels, and its SVG variant carries the expected axis labels.
// Skipped with a visible WARN when /usr/bin/python3 cannot import matplotlib
// (Debian package python3-matplotlib).
#include <sys/stat.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>

namespace {

const std::string kPython = "/usr/bin/python3";
const std::string kPlot = std::string(CIRCLET_SOURCE_DIR) + "/scripts/plot.py";
const std::string kCirclet = CIRCLET_BINARY;
constexpr unsigned kWidth = 800, kHeight = 600;  // plot.py: FIGSIZE (8, 6) in at DPI 100

int run(const std::string& cmd) {
  int rc = std::system(cmd.c_str());
  return WIFEXITED(rc) ? WEXITSTATUS(rc) : -1;
}

bool have_matplotlib() {
  static const bool ok = run(kPython + " -c 'import matplotlib, matplotlib.pyplot' >/dev/null 2>&1") == 0;
  return ok;
}

/// Is `name` a subcommand of the built binary? (Commands land one by one.)
bool have_command(const std::string& name) {
  // `circlet NAME --help` exits 0 even for an unknown NAME (the top-level help), so read the list.
  return run(kCirclet + " --help 2>/dev/null | grep -qE '^  " + name + " '") == 0;
}

std::string slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

/// A fresh directory for one test case's files, removed at the end of the case.
struct TempDir {
  std::string path;
  TempDir() {
    char tmpl[] = "/tmp/circlet-plots-XXXXXX";
    char* d = ::mkdtemp(tmpl);
    if (d) path = d;
  }
  ~TempDir() {
    if (!path.empty()) run("rm -rf '" + path + "'");
  }
  operator const std::string&() const { return path; }
};

struct PngSize {
  unsigned width = 0, height = 0;
};

/// Width and height from the IHDR chunk (PNG spec: 8-byte signature, then
/// length, "IHDR", width and height as big-endian 32-bit integers).
PngSize png_size(const std::string& bytes) {
  PngSize s;
  if (bytes.size() < 24 || bytes.compare(1, 3, "PNG") != 0 || bytes.compare(12, 4, "IHDR") != 0) return s;
  auto be32 = [&](size_t i) {
    return (unsigned(static_cast<unsigned char>(bytes[i])) << 24) |
           (unsigned(static_cast<unsigned char>(bytes[i + 1])) << 16) |
           (unsigned(static_cast<unsigned char>(bytes[i + 2])) << 8) | unsigned(static_cast<unsigned char>(bytes[i + 3]));
  };
  s.width = be32(16);
  s.height = be32(20);
  return s;
}

/// Runs plot.py KIND INPUT [extra] -o dir/name.png -o dir/name.svg and checks both files.
/// Returns the SVG text.
std::string render_both(const std::string& kind, const std::string& input, const std::string& extra,
                        const std::string& dir, const std::string& name) {
  const std::string png = dir + "/" + name + ".png", svg = dir + "/" + name + ".svg";
  const std::string cmd = kPython + " " + kPlot + " " + kind + " " + input + " " + extra + " -o " + png + " -o " +
                          svg + " >" + dir + "/plot.log 2>&1";
  INFO(cmd);
  INFO(slurp(dir + "/plot.log"));
  REQUIRE(run(cmd) == 0);
  const std::string bytes = slurp(png);
  CHECK(bytes.size() > 10000);  // a real picture, not an empty canvas (an empty 800×600 PNG is ~3 kB)
  PngSize s = png_size(bytes);
  CHECK(s.width == kWidth);
  CHECK(s.height == kHeight);
  std::string text = slurp(svg);
  REQUIRE(text.find("<svg") != std::string::npos);
  CHECK(text.find("width=\"576pt\"") != std::string::npos);  // 8 in × 72 pt
  return text;
}

/// plot.py keeps text as text (svg.fonttype none), and matplotlib writes each
/// text's source string as an XML comment before it.
bool svg_has_label(const std::string& svg, const std::string& label) {
  return svg.find("<!-- " + label + " -->") != std::string::npos;
}

#define CIRCLET_NEED_PYTHON()                                                                          \
  if (!have_matplotlib()) {                                                                            \
    WARN("SKIPPED: /usr/bin/python3 cannot import matplotlib (install python3-matplotlib)");           \
    return;                                                                                            \
  }

#define CIRCLET_NEED_COMMAND(name)                                                                     \
  if (!have_command(name)) {                                                                           \
    WARN("SKIPPED: the circlet binary has no '" name "' command yet");                                 \
    return;                                                                                            \
  }

}  // namespace

TEST_CASE("plot.py ratio: exact ratio points and the certificate's bands, PNG size and SVG labels", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("ratio");
  CIRCLET_NEED_COMMAND("certify");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " ratio c6 sc11 --ap 1,0 --ap2 1,0 --to 60 -o " + d + "/ratio.csv >/dev/null 2>&1") == 0);
  REQUIRE(run(kCirclet + " certify c6 sc11 --ap 1,0 --ap2 1,0 -o " + d + "/cert.json >/dev/null 2>&1") == 0);
  std::string svg = render_both("ratio", d + "/ratio.csv", "--cert " + d + "/cert.json", d, "ratio");
  CHECK(svg_has_label(svg, "$n$"));
  CHECK(svg_has_label(svg, "$R(n) = c_{6}(n)\\,/\\,\\mathrm{sc}_{11}(n)$"));
  CHECK(svg.find("circlet ratio c6 sc11") != std::string::npos);  // caption: the command
  CHECK(svg.find("certificate: ") != std::string::npos);           // legend title: the verdict
  // Only the certificate's intervals are called certified; their midpoints are labelled as midpoints.
  CHECK(svg_has_label(svg, "certified limit interval, $n \\equiv 6\\ (\\mathrm{mod}\\ 24)$"));
  CHECK(svg.find("midpoint of a certified interval") != std::string::npos);
  CHECK(svg.find("limit on $n") == std::string::npos);  // the old "limit ... (certified)" dashed-line label
}

TEST_CASE("plot.py ratio --over: exact ratios formed from two `circlet count --ap` outputs, with a certificate", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("certify");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " count c7 --ap 2,1 --to 80 -o " + d + "/f.csv >/dev/null 2>&1") == 0);
  REQUIRE(run(kCirclet + " count sc13 --ap 1,0 --to 80 -o " + d + "/g.csv >/dev/null 2>&1") == 0);
  REQUIRE(run(kCirclet + " certify c7 sc13 --ap 2,1 --ap2 1,0 -o " + d + "/cert.json >/dev/null 2>&1") == 0);
  std::string svg = render_both("ratio", d + "/f.csv", "--over " + d + "/g.csv --cert " + d + "/cert.json", d, "ratio");
  CHECK(svg_has_label(svg, "$n$"));
  CHECK(svg_has_label(svg, "$R(n) = c_{7}(2n+1)\\,/\\,\\mathrm{sc}_{13}(n)$"));
  CHECK(svg.find("n = 0,\\dots,80") != std::string::npos);  // the title states the range
  CHECK(svg.find("circlet count c7 --ap 2,1 --to 80") != std::string::npos);
  CHECK(svg.find("circlet certify c7 sc13") != std::string::npos);
}

TEST_CASE("plot.py remainder: normalised E(n) with the Deligne and Hecke scales", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("remainder");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " remainder c6 --to 400 -o " + d + "/rem.csv >/dev/null 2>&1") == 0);
  std::string svg = render_both("remainder", d + "/rem.csv", "", d, "remainder");
  CHECK(svg_has_label(svg, "$n$"));
  CHECK(svg_has_label(svg, "$E(n)\\,/\\,X^{(w-1)/2}$,  $X = n + \\Delta$"));
  // On the axis normalised by X^{(w-1)/2} the two scales are the lines ±1 and the curves ±X^{1/2}.
  CHECK(svg.find("Deligne scale $|E| = X^{(w-1)/2}$:") != std::string::npos);
  CHECK(svg.find("the lines $\\pm 1$ here") != std::string::npos);
  CHECK(svg.find("Hecke scale $|E| = X^{w/2}$:") != std::string::npos);
  CHECK(svg.find("the curves $\\pm X^{1/2}$ here") != std::string::npos);
  CHECK(svg.find("weight $w = 5/2$") != std::string::npos);  // c6: rank 5
  CHECK(svg.find("circlet remainder c6") != std::string::npos);
}

TEST_CASE("plot.py remainder from a `circlet main --to` table (n, count, main, remainder)", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("main");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  // c9: weight 4 (exact main terms, fast), rank 8, X = n + 10/3 (docs/MATH.md §2).
  // Along the progression 2n+1: the table has k (the progression variable) and n = 2k+1.
  REQUIRE(run(kCirclet + " main c9 --ap 2,1 --to 150 -o " + d + "/main.csv >/dev/null 2>&1") == 0);
  std::string svg = render_both("remainder", d + "/main.csv", "", d, "remainder");
  CHECK(svg_has_label(svg, "$E(n)\\,/\\,X^{(w-1)/2}$,  $X = 2n+1 + \\Delta$"));
  CHECK(svg.find("Normalised remainder of $c_{9}(2n+1)$ (weight $w = 4$), $n = 0,\\dots,150$") != std::string::npos);
  CHECK(svg.find("circlet main c9 --ap 2,1 --to 150") != std::string::npos);
}

TEST_CASE("plot.py arcs: partial sums against K with the main-term ball and the tail bound", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("arcs");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " arcs c9 --at 1000 --upto 30 -o " + d + "/arcs.csv >/dev/null 2>&1") == 0);
  std::string extra;
  if (have_command("main")) {
    REQUIRE(run(kCirclet + " main c9 --at 1000 --json >" + d + "/main.json 2>/dev/null") == 0);
    extra = "--main " + d + "/main.json";
  }
  std::string svg = render_both("arcs", d + "/arcs.csv", extra, d, "arcs");
  CHECK(svg_has_label(svg, "$S_K$"));
  CHECK(svg_has_label(svg, "$K$ (largest denominator $k$ of the major arcs)"));
  CHECK(svg.find("main term $M(n)$ = 382910528/27") != std::string::npos);
  CHECK(svg.find("circlet arcs c9") != std::string::npos);
  if (have_command("main")) {  // the exact count comes from `circlet main --json`
    CHECK(svg.find("exact count $c_{9}(1000)$ = 14,180,606") != std::string::npos);
    CHECK(svg.find("|E(n)| = |c_{9}(1000) - M(n)|") != std::string::npos);
  }
  // No offset text ("1e7", "+1.418e7") on the axes: tick labels are the values themselves.
  // (Compared as whole text elements: the caption's temporary path may contain "1e7" by chance.)
  CHECK(svg.find(">1e7</text>") == std::string::npos);
  CHECK(svg.find(">+1.418") == std::string::npos);
  CHECK(svg.find("14,000,000") != std::string::npos);
  // Every partial sum is in the frame, including K = 1 (S_1 = 13329462.99...), so the axis reaches
  // below 13.4 million (the old zoom showed only 14.1755..14.1888 million and hid K = 1..6).
  CHECK(svg.find(">13,400,000</text>") != std::string::npos);
}

TEST_CASE("plot.py arcs: weight 3/2 (sc7), where the tail bound is infinite, still renders and says so", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("arcs");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " arcs sc7 --at 100 --upto 10 -o " + d + "/arcs.csv >/dev/null 2>&1") == 0);
  REQUIRE(slurp(d + "/arcs.csv").find(",inf,") != std::string::npos);  // the case this test is about
  std::string svg = render_both("arcs", d + "/arcs.csv", "", d, "arcs");
  CHECK(svg.find("no finite tail bound") != std::string::npos);
  CHECK(svg_has_label(svg, "$S_K$"));
}

TEST_CASE("plot.py reads the provenance line and exact numbers of circlet output", "[plots]") {
  CIRCLET_NEED_PYTHON();
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " count c7 --to 30 -o " + d + "/c7.csv >/dev/null 2>&1") == 0);
  // The library half of plot.py: provenance, balls "[m +/- r]", exact "m*2^e", rationals.
  const std::string py =
      "import sys; sys.path.insert(0, '" + std::string(CIRCLET_SOURCE_DIR) + "/scripts'); import plot\n"
      "t = plot.load_table('" + d + "/c7.csv')\n"
      "assert t.columns == ['n', 'count'], t.columns\n"
      "assert t.provenance['program'] == 'circlet' and t.provenance['command'].startswith('circlet count c7'), t.provenance\n"
      "assert [int(x) for x in t.col('count')[:8]] == [1, 1, 2, 3, 5, 7, 11, 8]\n"
      "assert plot.parse_ball('[1.5 +/- 0.25]') == (1.5, 0.25)\n"
      "assert plot.parse_ball({'mid': '3*2^-1', 'rad': '1*2^-3'}) == (1.5, 0.125)\n"
      "assert plot.to_float('7/4') == 1.75 and plot.to_float('undefined') is None\n"
      "assert plot.family_tex('sc11', '2n+1') == r'\\mathrm{sc}_{11}(2n+1)'\n"
      "assert plot.family_shift('c7') == 2 and plot.family_rank('sc13') == 6\n";
  {
    std::ofstream f(d + "/check.py");
    f << py;
  }
  INFO(slurp(d + "/check.py"));
  CHECK(run(kPython + " " + d + "/check.py 2>" + d + "/check.log") == 0);
  INFO(slurp(d + "/check.log"));
}

TEST_CASE("plot.py refuses a wrong output type and a table without the kind's columns", "[plots]") {
  CIRCLET_NEED_PYTHON();
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " count c7 --to 10 -o " + d + "/c7.csv >/dev/null 2>&1") == 0);
  CHECK(run(kPython + " " + kPlot + " ratio " + d + "/c7.csv -o " + d + "/x.txt 2>" + d + "/e1") == 2);
  CHECK(slurp(d + "/e1").find("output must end in .png, .svg or .pdf") != std::string::npos);
  // A `circlet count` table is not arcs output: refused by its recorded command, before any drawing.
  CHECK(run(kPython + " " + kPlot + " arcs " + d + "/c7.csv -o " + d + "/x.png 2>" + d + "/e2") == 2);
  CHECK(slurp(d + "/e2").find("is `circlet count` output; the arcs plot reads `circlet arcs` output") !=
        std::string::npos);
  struct stat st;
  CHECK(::stat((d + "/x.png").c_str(), &st) != 0);  // nothing written on failure
}

TEST_CASE("plot.py refuses the wrong input kind with one line and exit status 2", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("remainder");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " remainder c6 --to 50 -o " + d + "/rem.csv >/dev/null 2>&1") == 0);
  // `plot.py ratio remainder.csv` once drew an empty plot and exited 0.
  CHECK(run(kPython + " " + kPlot + " ratio " + d + "/rem.csv -o " + d + "/x.png 2>" + d + "/e") == 2);
  const std::string e = slurp(d + "/e");
  CHECK(e.rfind("plot.py: error: ", 0) == 0);
  CHECK(e.find("is `circlet remainder` output; the ratio plot reads `circlet ratio` output") != std::string::npos);
  CHECK(std::count(e.begin(), e.end(), '\n') == 1);
  CHECK(run(kPython + " " + kPlot + " scan " + d + "/rem.csv -o " + d + "/x.png 2>/dev/null") == 2);
  struct stat st;
  CHECK(::stat((d + "/x.png").c_str(), &st) != 0);
  // Bad --size / --dpi are refused by the option parser (exit 2).
  CHECK(run(kPython + " " + kPlot + " remainder " + d + "/rem.csv --size 8 -o " + d + "/y.png 2>/dev/null") == 2);
  CHECK(run(kPython + " " + kPlot + " remainder " + d + "/rem.csv --dpi 5 -o " + d + "/y.png 2>/dev/null") == 2);
}

TEST_CASE("plot.py ratio says when a certified class has no plotted n", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("ratio");
  CIRCLET_NEED_COMMAND("certify");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  // c6 vs sc11: the certificate's classes are n = 6 and n = 0 (mod 24); n = 0..5 reaches only n = 0.
  REQUIRE(run(kCirclet + " ratio c6 sc11 --ap 1,0 --ap2 1,0 --to 5 -o " + d + "/ratio.csv >/dev/null 2>&1") == 0);
  REQUIRE(run(kCirclet + " certify c6 sc11 --ap 1,0 --ap2 1,0 -o " + d + "/cert.json >/dev/null 2>&1") == 0);
  REQUIRE(slurp(d + "/cert.json").find("\"modulus\": \"24\"") != std::string::npos);
  const std::string svg = render_both("ratio", d + "/ratio.csv", "--cert " + d + "/cert.json", d, "ratio");
  CHECK(svg.find("no plotted $n$ lies in the class") != std::string::npos);
  CHECK(svg.find("its first $n$ is 6") != std::string::npos);
}

TEST_CASE("plot.py relerr: |count/M - 1| against X on log-log axes with reference slopes", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("remainder");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  // Standard output redirected to a file (not -o): its provenance line keeps the family in the title.
  REQUIRE(run(kCirclet + " remainder c9 --to 600 >" + d + "/rem.csv 2>/dev/null") == 0);
  const std::string svg = render_both("relerr", d + "/rem.csv", "", d, "relerr");
  CHECK(svg_has_label(svg, "$X = n + \\Delta$"));
  CHECK(svg_has_label(svg, "$|c_{9}(n)\\,/\\,M(n) - 1|$"));
  // c9: w = 4, so the Hecke slope is 1 - w/2 = -1 and the Deligne slope -(w-1)/2 = -3/2.
  CHECK(svg.find("slope $-1$: Hecke scale $X^{w/2}/M$") != std::string::npos);
  CHECK(svg.find("slope $-3/2$: Deligne scale $X^{(w-1)/2}/M$") != std::string::npos);
  CHECK(svg.find("a reference slope, not a bound") != std::string::npos);
  CHECK(svg.find("Relative error of the main term for $c_{9}(n)$ (weight $w = 4$)") != std::string::npos);
  // c5 has no cusp part: every row has count = M, and the plot says so instead of drawing nothing silently.
  REQUIRE(run(kCirclet + " remainder c5 --to 100 -o " + d + "/rem5.csv >/dev/null 2>&1") == 0);
  const std::string svg5 = render_both("relerr", d + "/rem5.csv", "", d, "relerr5");
  CHECK(svg5.find("101 rows with count = M exactly") != std::string::npos);
}

TEST_CASE("plot.py scan: heat maps of the largest pinning prime with a discrete colour bar", "[plots]") {
  CIRCLET_NEED_PYTHON();
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  const std::string scan = std::string(CIRCLET_SOURCE_DIR) + "/results/scan_t6-10_M8/scan.csv";
  const std::string svg = render_both("scan", scan, "", d, "scan");
  for (const char* t : {"$t = 6$", "$t = 7$", "$t = 10$"}) CHECK(svg_has_label(svg, t));
  CHECK(svg_has_label(svg, "$A'$ (progression of $\\mathrm{sc}_{13}$)"));
  CHECK(svg_has_label(svg, "largest prime $Q$ pinned (NON-CONVERGENT pairs)"));
  // The colour bar has one tick per prime up to the largest Q of the committed scan (23) and none in
  // between (the axes' own ticks stop at A = 8): a discrete scale, not a continuous one.
  for (const char* q : {">11</text>", ">13</text>", ">17</text>", ">19</text>", ">23</text>"})
    CHECK(svg.find(q) != std::string::npos);
  for (const char* q : {">9</text>", ">10</text>", ">15</text>", ">21</text>", ">22</text>"})
    CHECK(svg.find(q) == std::string::npos);
  CHECK(svg.find("6480 NON-CONVERGENT") != std::string::npos);
}

TEST_CASE("plot.py writes PDF, and --size/--dpi set the PNG's pixels", "[plots]") {
  CIRCLET_NEED_PYTHON();
  CIRCLET_NEED_COMMAND("remainder");
  const TempDir tmp;
  REQUIRE(!tmp.path.empty());
  const std::string& d = tmp.path;
  REQUIRE(run(kCirclet + " remainder c7 --to 100 -o " + d + "/rem.csv >/dev/null 2>&1") == 0);
  REQUIRE(run(kPython + " " + kPlot + " remainder " + d + "/rem.csv --size 6,4 --dpi 150 -o " + d + "/r.png -o " + d +
              "/r.pdf >/dev/null 2>&1") == 0);
  const PngSize s = png_size(slurp(d + "/r.png"));
  CHECK(s.width == 900);  // 6 in × 150 dpi
  CHECK(s.height == 600);
  const std::string pdf = slurp(d + "/r.pdf");
  CHECK(pdf.rfind("%PDF-", 0) == 0);
  CHECK(pdf.size() > 5000);
}
