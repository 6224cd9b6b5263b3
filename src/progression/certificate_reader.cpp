#include "progression/certificate_reader.hpp"

#include <flint/ulong_extras.h>

#include <algorithm>
#include <set>
#include <vector>

#include "core/error.hpp"
#include "core/flint_types.hpp"
#include "family/family.hpp"
#include "progression/certificate.hpp"

namespace circlet {

using nlohmann::json;

namespace {

constexpr int kMaxDepth = 16;
constexpr size_t kMaxDigits = 20000;
constexpr size_t kMaxFactors = 168;      // primes <= 1000
constexpr size_t kMaxFiniteClasses = 4096;

std::string escape_key(const std::string& k) {
  std::string out;
  for (char c : k) {
    if (c == '~') out += "~0";
    else if (c == '/') out += "~1";
    else out += c;
  }
  return out;
}

[[noreturn]] void bad(const std::string& ptr, const std::string& what) {
  throw UserError("certificate field " + (ptr.empty() ? std::string("/") : ptr) + ": " + what);
}

std::string child(const std::string& ptr, const std::string& key) { return ptr + "/" + escape_key(key); }
std::string child(const std::string& ptr, size_t i) { return ptr + "/" + std::to_string(i); }

// ---- text ------------------------------------------------------------------

struct Frame {
  bool array;
  size_t next = 0;
  std::string key;
  std::set<std::string> keys;
  std::string ptr;
};

}  // namespace

json parse_certificate_text(const std::string& text) {
  if (text.size() > kCertMaxBytes)
    throw UserError("certificate is " + std::to_string(text.size()) + " bytes, more than the limit " +
                    std::to_string(kCertMaxBytes));
  std::vector<Frame> stack;
  auto child_ptr = [&stack]() -> std::string {
    if (stack.empty()) return "";
    Frame& f = stack.back();
    if (f.array) return child(f.ptr, f.next++);
    return child(f.ptr, f.key);
  };
  json::parser_callback_t cb = [&](int depth, json::parse_event_t ev, json& parsed) -> bool {
    switch (ev) {
      case json::parse_event_t::object_start:
      case json::parse_event_t::array_start: {
        std::string p = child_ptr();
        if (depth >= kMaxDepth) bad(p, "nested deeper than " + std::to_string(kMaxDepth) + " levels");
        Frame f;
        f.array = ev == json::parse_event_t::array_start;
        f.ptr = p;
        stack.push_back(std::move(f));
        break;
      }
      case json::parse_event_t::object_end:
      case json::parse_event_t::array_end:
        if (!stack.empty()) stack.pop_back();
        break;
      case json::parse_event_t::key: {
        const std::string k = parsed.get<std::string>();
        Frame& f = stack.back();
        if (!f.keys.insert(k).second) bad(child(f.ptr, k), "duplicate key '" + k + "'");
        f.key = k;
        break;
      }
      case json::parse_event_t::value: {
        std::string p = child_ptr();
        if (parsed.is_number_float())
          bad(p, "the number " + parsed.dump() + " is not an integer (certificates hold no floating-point numbers, and integers fit in 64 bits)");
        break;
      }
    }
    return true;
  };
  try {
    return json::parse(text, cb);
  } catch (const json::exception& e) {
    throw UserError(std::string("is not JSON: ") + e.what());
  }
}

bool is_utc_date_time(const std::string& s) {
  const std::string shape = "dddd-dd-ddTdd:dd:ddZ";
  bool ok = s.size() == shape.size();
  for (size_t i = 0; ok && i < s.size(); ++i)
    ok = shape[i] == 'd' ? (s[i] >= '0' && s[i] <= '9') : s[i] == shape[i];
  if (!ok) return false;
  int y = std::stoi(s.substr(0, 4)), mo = std::stoi(s.substr(5, 2)), d = std::stoi(s.substr(8, 2));
  int h = std::stoi(s.substr(11, 2)), mi = std::stoi(s.substr(14, 2)), se = std::stoi(s.substr(17, 2));
  static const int days[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  bool leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
  return mo >= 1 && mo <= 12 && d >= 1 && d <= days[mo - 1] + (mo == 2 && leap ? 1 : 0) && h <= 23 && mi <= 59 &&
         se <= 59;
}

namespace {

// ---- structure ---------------------------------------------------------------

void keys(const json& j, const std::string& ptr, const std::vector<std::string>& want) {
  if (!j.is_object()) bad(ptr, "expected an object");
  for (const auto& k : want)
    if (!j.contains(k)) bad(ptr, "missing field '" + k + "'");
  for (auto it = j.begin(); it != j.end(); ++it)
    if (std::find(want.begin(), want.end(), it.key()) == want.end()) bad(child(ptr, it.key()), "unknown field");
}

const json& arr(const json& j, const std::string& ptr, size_t lo, size_t hi) {
  if (!j.is_array()) bad(ptr, "expected an array");
  if (j.size() < lo || j.size() > hi)
    bad(ptr, "has " + std::to_string(j.size()) + " entries, expected " +
                 (lo == hi ? std::to_string(lo) : std::to_string(lo) + ".." + std::to_string(hi)));
  return j;
}

unsigned long long integer(const json& j, const std::string& ptr, unsigned long long lo, unsigned long long hi) {
  const std::string range = " is out of range " + std::to_string(lo) + ".." + std::to_string(hi);
  if (!j.is_number_integer()) bad(ptr, "expected a non-negative integer");  // (floats are refused when parsing)
  unsigned long long v;
  if (j.is_number_unsigned()) {
    v = j.get<unsigned long long>();
  } else {
    long long s = j.get<long long>();
    if (s < 0) bad(ptr, std::to_string(s) + " is negative (out of range " + std::to_string(lo) + ".." + std::to_string(hi) + ")");
    v = static_cast<unsigned long long>(s);
  }
  if (v < lo || v > hi) bad(ptr, std::to_string(v) + range);
  return v;
}

const std::string& str(const json& j, const std::string& ptr) {
  if (!j.is_string()) bad(ptr, "expected a string");
  return j.get_ref<const std::string&>();
}

void exact(const json& j, const std::string& ptr, const std::string& want) {
  if (str(j, ptr) != want) bad(ptr, "must be \"" + want + "\"");
}

bool is_nat(const std::string& s) {
  if (s.empty() || s.size() > kMaxDigits) return false;
  if (!std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; })) return false;
  return s == "0" || s[0] != '0';
}

// -?[1-9][0-9]* or 0
bool is_int_text(const std::string& s) {
  if (s == "0") return true;
  size_t i = (!s.empty() && s[0] == '-') ? 1 : 0;
  return s.size() > i && s[i] != '0' && is_nat(s.substr(i));
}

Fmpz natstr(const json& j, const std::string& ptr) {
  const std::string& s = str(j, ptr);
  if (!is_nat(s)) bad(ptr, "'" + s.substr(0, 40) + "' is not a non-negative integer in canonical decimal (at most 20000 digits)");
  return Fmpz::from_str(s);
}

void rat(const json& j, const std::string& ptr) {
  const std::string& s = str(j, ptr);
  auto slash = s.find('/');
  bool ok = s.size() <= kMaxDigits;
  if (ok) {
    if (slash == std::string::npos) {
      ok = is_nat(s);
    } else {
      std::string p = s.substr(0, slash), q = s.substr(slash + 1);
      ok = is_nat(p) && is_nat(q) && q != "0" && q != "1" && p != "0";
      if (ok) ok = Fmpq::from_str(s).str() == s;  // lowest terms
    }
  }
  if (!ok) bad(ptr, "'" + s.substr(0, 40) + "' is not a non-negative rational p or p/q in lowest terms");
}

void dyadic(const json& j, const std::string& ptr, long prec, bool nonneg) {
  const std::string& s = str(j, ptr);
  auto star = s.find("*2^");
  if (star == std::string::npos || s.size() > kMaxDigits) bad(ptr, "'" + s.substr(0, 40) + "' is not of the form m*2^e");
  std::string m = s.substr(0, star), e = s.substr(star + 3);
  if (!is_int_text(m) || !is_int_text(e)) bad(ptr, "'" + s.substr(0, 40) + "' is not of the form m*2^e (decimal integers)");
  if (nonneg && m[0] == '-') bad(ptr, "a radius must be non-negative");
  if (m == "0" && e != "0") bad(ptr, "zero is written 0*2^0");
  if (m != "0" && (m.back() - '0') % 2 == 0) bad(ptr, "the mantissa of m*2^e must be odd (canonical form)");
  const long emin = -(4 * prec + 1024), emax = 1024;
  if (e.size() > 8) bad(ptr, "exponent " + e.substr(0, 20) + "... is out of range " + std::to_string(emin) + ".." + std::to_string(emax));
  long ev = std::stol(e);
  if (ev < emin || ev > emax) bad(ptr, "exponent " + e + " is out of range " + std::to_string(emin) + ".." + std::to_string(emax));
  if (m.size() > static_cast<size_t>((prec + 64) * 0.31 + 2)) bad(ptr, "mantissa has more than precision_bits + 64 bits");
  Fmpz mz = Fmpz::from_str(m);
  if (fmpz_bits(mz.get()) >= static_cast<ulong>(prec + 64)) bad(ptr, "mantissa has more than precision_bits + 64 bits");
}

void ball(const json& j, const std::string& ptr, long prec) {
  keys(j, ptr, {"mid", "rad"});
  dyadic(j["mid"], child(ptr, "mid"), prec, false);
  dyadic(j["rad"], child(ptr, "rad"), prec, true);
}

ulong prime(const json& j, const std::string& ptr, ulong hi) {
  ulong p = integer(j, ptr, 2, hi);
  if (!n_is_prime(p)) bad(ptr, std::to_string(p) + " is not a prime");
  return p;
}

// 0 <= e <= 64 and p^e <= 2^64.
ulong exponent(const json& j, const std::string& ptr, ulong p) {
  ulong e = integer(j, ptr, 0, 64);
  ulong lim = 0;
  unsigned __int128 pe = 1;
  for (ulong i = 0; i < e; ++i) {
    pe *= p;
    if (pe > (static_cast<unsigned __int128>(1) << 64)) bad(ptr, std::to_string(p) + "^" + std::to_string(e) + " exceeds 2^64");
  }
  (void)lim;
  return e;
}

// "r/2" for odd r, "r/2" as an integer for even r: [1-9][0-9]* or an odd [1-9][0-9]* followed by "/2".
void weight_text(const json& j, const std::string& ptr) {
  const std::string& s = str(j, ptr);
  const bool half = s.size() > 2 && s.compare(s.size() - 2, 2, "/2") == 0;
  const std::string num = half ? s.substr(0, s.size() - 2) : s;
  bool ok = num.size() <= 6 && is_nat(num) && num != "0";
  if (ok && half) ok = (num.back() - '0') % 2 == 1;
  if (!ok) bad(ptr, "'" + s.substr(0, 40) + "' is not a weight (an integer, or an odd integer over 2)");
}

int family_rank(const json& j, const std::string& ptr) {
  const std::string& s = str(j, ptr);
  Family f = [&]() {
    try {
      return Family::parse(s);
    } catch (const UserError& e) {
      bad(ptr, e.what());
    }
  }();
  if (f.name() != s) bad(ptr, "'" + s + "' is not the canonical family name " + f.name());
  return f.rank();
}

void date(const json& j, const std::string& ptr) {
  const std::string& s = str(j, ptr);
  if (!is_utc_date_time(s)) bad(ptr, "'" + s.substr(0, 40) + "' is not a UTC date-time YYYY-MM-DDTHH:MM:SSZ");
}

void progression(const json& j, const std::string& ptr) {
  keys(j, ptr, {"A", "B"});
  integer(j["A"], child(ptr, "A"), 1, kCertMaxStep);
  integer(j["B"], child(ptr, "B"), 0, kCertMaxStep);
}

void nonconvergent(const json& j, long prec, ulong Q_max) {
  const ulong Q = prime(j["Q"], "/Q", Q_max);
  if (Q < 3) bad("/Q", "must be at least 3");
  prime(j["distinguishing_prime"], "/distinguishing_prime", Q);
  natstr(j["modulus"], "/modulus");
  const json& mf = arr(j["modulus_factors"], "/modulus_factors", 1, kMaxFactors);
  for (size_t i = 0; i < mf.size(); ++i) {
    std::string p = child("/modulus_factors", i);
    keys(mf[i], p, {"p", "e"});
    ulong q = prime(mf[i]["p"], child(p, "p"), Q);
    exponent(mf[i]["e"], child(p, "e"), q);
  }
  keys(j["sigma_constant"], "/sigma_constant", {"square", "ball"});
  rat(j["sigma_constant"]["square"], "/sigma_constant/square");
  ball(j["sigma_constant"]["ball"], "/sigma_constant/ball", prec);
  const json& pf = j["power_factor"];
  keys(pf, "/power_factor", {"base", "exponent", "limit", "n0", "for_n_ge_n0"});
  rat(pf["base"], "/power_factor/base");
  weight_text(pf["exponent"], "/power_factor/exponent");
  exact(pf["n0"], "/power_factor/n0", std::to_string(kCertN0));
  ball(pf["limit"], "/power_factor/limit", prec);
  ball(pf["for_n_ge_n0"], "/power_factor/for_n_ge_n0", prec);
  const json& t = j["tail"];
  if (!t.is_object()) bad("/tail", "expected an object");
  if (!t.contains("route")) bad("/tail", "missing field 'route'");
  const std::string route = str(t["route"], "/tail/route");
  if (route == "proportional")
    keys(t, "/tail", {"route", "explicit_primes_up_to", "log_bound", "interval", "lambda", "discriminant_product"});
  else if (route == "bound")
    keys(t, "/tail", {"route", "explicit_primes_up_to", "log_bound", "interval"});
  else
    bad("/tail/route", "must be \"bound\" or \"proportional\"");
  integer(t["explicit_primes_up_to"], "/tail/explicit_primes_up_to", kCertTailPrimes, kCertTailPrimes);
  ball(t["log_bound"], "/tail/log_bound", prec);
  ball(t["interval"], "/tail/interval", prec);
  if (route == "proportional") {
    rat(t["lambda"], "/tail/lambda");
    rat(t["discriminant_product"], "/tail/discriminant_product");
  }
  const json& cl = arr(j["classes"], "/classes", 2, 2);
  for (size_t k = 0; k < 2; ++k) {
    std::string p = child("/classes", k);
    keys(cl[k], p, {"residue", "local_factors", "pinned_product", "limit_interval", "interval_n_ge_n0"});
    natstr(cl[k]["residue"], child(p, "residue"));
    const json& lf = arr(cl[k]["local_factors"], child(p, "local_factors"), 1, kMaxFactors);
    for (size_t i = 0; i < lf.size(); ++i) {
      std::string fp = child(child(p, "local_factors"), i);
      keys(lf[i], fp, {"p", "e", "residue", "beta_F", "beta_G", "rho"});
      ulong q = prime(lf[i]["p"], child(fp, "p"), Q);
      exponent(lf[i]["e"], child(fp, "e"), q);
      natstr(lf[i]["residue"], child(fp, "residue"));
      rat(lf[i]["beta_F"], child(fp, "beta_F"));
      rat(lf[i]["beta_G"], child(fp, "beta_G"));
      rat(lf[i]["rho"], child(fp, "rho"));
    }
    rat(cl[k]["pinned_product"], child(p, "pinned_product"));
    ball(cl[k]["limit_interval"], child(p, "limit_interval"), prec);
    ball(cl[k]["interval_n_ge_n0"], child(p, "interval_n_ge_n0"), prec);
  }
  if (!j["disjoint"].is_boolean()) bad("/disjoint", "expected true or false");
}

void constant(const json& j, long prec) {
  const std::string& route = str(j["constant_route"], "/constant_route");
  if (route == "proportional") {
    rat(j["lambda"], "/lambda");
    rat(j["discriminant_product"], "/discriminant_product");
    const json& fin = arr(j["finite_primes"], "/finite_primes", 1, kMaxFactors);
    for (size_t i = 0; i < fin.size(); ++i) {
      std::string p = child("/finite_primes", i);
      keys(fin[i], p, {"p", "rho", "classes"});
      ulong q = prime(fin[i]["p"], child(p, "p"), static_cast<ulong>(kCertMaxQmax));
      rat(fin[i]["rho"], child(p, "rho"));
      const json& cls = arr(fin[i]["classes"], child(p, "classes"), 1, kMaxFiniteClasses);
      for (size_t c = 0; c < cls.size(); ++c) {
        std::string cp = child(child(p, "classes"), c);
        keys(cls[c], cp, {"e", "residue", "beta_F", "beta_G"});
        exponent(cls[c]["e"], child(cp, "e"), q);
        natstr(cls[c]["residue"], child(cp, "residue"));
        rat(cls[c]["beta_F"], child(cp, "beta_F"));
        rat(cls[c]["beta_G"], child(cp, "beta_G"));
      }
    }
  } else if (route != "identical") {
    bad("/constant_route", "must be \"identical\" or \"proportional\"");
  }
  const json& c = j["constant"];
  keys(c, "/constant", {"square", "value", "interval", "contains_integer", "integer"});
  rat(c["square"], "/constant/square");
  rat(c["value"], "/constant/value");
  ball(c["interval"], "/constant/interval", prec);
  if (!c["contains_integer"].is_boolean()) bad("/constant/contains_integer", "expected true or false");
  if (c["contains_integer"].get<bool>())
    natstr(c["integer"], "/constant/integer");
  else if (!c["integer"].is_null())
    bad("/constant/integer", "must be null when contains_integer is false");
}

}  // namespace

void check_certificate_schema(const json& j) {
  if (!j.is_object()) bad("", "not a certificate (a certificate is a JSON object)");
  if (!j.contains("format")) bad("", "not a certificate: missing field 'format'");
  if (j["format"] != kCertificateFormat)
    bad("/format", "not a certificate of this program: the format must be \"" + std::string(kCertificateFormat) + "\"");
  if (!j.contains("verdict")) bad("", "missing field 'verdict'");
  const std::string& v = str(j["verdict"], "/verdict");
  std::vector<std::string> want = {"format", "digest", "provenance", "F", "G", "ap", "ap2", "weight",
                                   "verdict", "precision_bits", "Q_max", "theorems"};
  if (v == "NON-CONVERGENT") {
    for (const char* k : {"Q", "distinguishing_prime", "modulus", "modulus_factors", "sigma_constant", "power_factor",
                          "tail", "classes", "disjoint"})
      want.push_back(k);
  } else if (v == "CONSTANT") {
    want.push_back("constant_route");
    want.push_back("constant");
    if (!j.contains("constant_route")) bad("", "missing field 'constant_route'");
    const std::string& route = str(j["constant_route"], "/constant_route");
    if (route != "identical" && route != "proportional")
      bad("/constant_route", "must be \"identical\" or \"proportional\"");
    if (route == "proportional")
      for (const char* k : {"lambda", "discriminant_product", "finite_primes"}) want.push_back(k);
  } else if (v != "UNDECIDED") {
    bad("/verdict", "must be NON-CONVERGENT, CONSTANT or UNDECIDED");
  }
  keys(j, "", want);

  const std::string& d = str(j["digest"], "/digest");
  bool dig = d.size() == 7 + 64 && d.compare(0, 7, "sha256:") == 0 &&
             std::all_of(d.begin() + 7, d.end(), [](char c) { return (c >= '0' && c <= '9') || (c >= 'a' && c <= 'f'); });
  if (!dig) bad("/digest", "expected \"sha256:\" and 64 lowercase hex digits");

  keys(j["provenance"], "/provenance", {"program", "version", "command", "date"});
  exact(j["provenance"]["program"], "/provenance/program", "circlet");
  str(j["provenance"]["version"], "/provenance/version");
  str(j["provenance"]["command"], "/provenance/command");
  date(j["provenance"]["date"], "/provenance/date");

  int rF = family_rank(j["F"], "/F"), rG = family_rank(j["G"], "/G");
  if (rF != rG) bad("/G", "has rank " + std::to_string(rG) + " but F has rank " + std::to_string(rF) + " (different weights)");
  progression(j["ap"], "/ap");
  progression(j["ap2"], "/ap2");
  weight_text(j["weight"], "/weight");
  const long prec = static_cast<long>(integer(j["precision_bits"], "/precision_bits", 64, kCertMaxPrecision));
  const ulong Q_max = integer(j["Q_max"], "/Q_max", 3, kCertMaxQmax);
  const json& th = arr(j["theorems"], "/theorems", 0, theorem_catalogue().size());
  for (size_t i = 0; i < th.size(); ++i) {
    const std::string& id = str(th[i], child("/theorems", i));
    bool known = false;
    for (const auto& t : theorem_catalogue()) known = known || id == t.id;
    if (!known) bad(child("/theorems", i), "'" + id.substr(0, 40) + "' is not a theorem of the catalogue");
  }
  if (v == "NON-CONVERGENT") nonconvergent(j, prec, Q_max);
  else if (v == "CONSTANT") constant(j, prec);
}

}  // namespace circlet
