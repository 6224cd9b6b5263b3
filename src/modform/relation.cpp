#include "modform/relation.hpp"

#include <flint/fmpq.h>

#include <cctype>

#include "core/error.hpp"

namespace circlet {

namespace {

constexpr long kMaxA = 1000000;
constexpr long kMaxB = 1000000000;
constexpr long kMaxQ = 1000000;

class Parser {
 public:
  explicit Parser(const std::string& s) : s_(s) {}

  LinearRelation parse() {
    if (s_.size() > 4096) fail("longer than 4096 characters");
    LinearRelation rel;
    side(rel, 1);
    skip();
    if (eat("==") || eat("=") || eat("\xE2\x89\xA1")) {  // ≡
    } else {
      fail("expected '=' or '==' between the two sides");
    }
    side(rel, -1);
    skip();
    bool paren = false;
    size_t save = i_;
    if (eat("(")) {
      skip();
      if (peek_word("mod")) paren = true; else i_ = save;
    }
    if (eat_word("mod")) {
      Fmpz m = integer("the modulus");
      skip();
      if (eat("^")) {
        long e = small_integer("the exponent of the modulus", 64);
        Fmpz base = m;
        fmpz_pow_ui(m, base, static_cast<ulong>(e));
      }
      if (fmpz_cmp_si(m, 2) < 0) fail("the modulus must be at least 2");
      if (fmpz_bits(m) > 62) fail("the modulus must be below 2^62");
      rel.modulus = m;
      skip();
      if (paren && !eat(")")) fail("expected ')' after the modulus");
    }
    skip();
    if (eat_word("for")) {
      skip();
      if (!eat("n")) fail("expected 'n' after 'for'");
      skip();
      if (!eat_word("mod")) fail("expected 'mod' in 'for n mod Q != r'");
      rel.Q = small_integer("Q in 'for n mod Q'", kMaxQ);
      if (rel.Q < 2) fail("Q in 'for n mod Q' must be at least 2");
      skip();
      if (eat("!=") || eat("\xE2\x89\xA0")) rel.complement = true;
      else if (eat("==") || eat("=")) rel.complement = false;
      else fail("expected '=' or '!=' after 'for n mod Q'");
      rel.r = small_integer("r in 'for n mod Q != r'", kMaxQ);
      if (rel.r >= rel.Q) fail("r in 'for n mod Q != r' must be below Q");
      rel.restricted = true;
    }
    skip();
    if (i_ != s_.size()) fail("unexpected text '" + s_.substr(i_, 20) + "'");
    if (rel.terms.empty()) fail("no family term (e.g. c5(5n+4))");
    if (!fmpz_is_zero(rel.modulus))
      for (const auto& t : rel.terms)
        if (!fmpz_is_one(fmpq_denref(t.coeff.get())))
          fail("a congruence needs integer coefficients");
    return rel;
  }

 private:
  [[noreturn]] void fail(const std::string& what) const {
    throw UserError("relation: " + what + " (at character " + std::to_string(i_ + 1) + " of '" + s_ + "')");
  }
  void skip() {
    while (i_ < s_.size() && std::isspace(static_cast<unsigned char>(s_[i_]))) ++i_;
  }
  bool eat(const std::string& t) {
    skip();
    if (s_.compare(i_, t.size(), t) == 0) {
      i_ += t.size();
      return true;
    }
    return false;
  }
  bool peek_word(const std::string& w) {
    skip();
    return s_.compare(i_, w.size(), w) == 0 &&
           (i_ + w.size() == s_.size() || !std::isalnum(static_cast<unsigned char>(s_[i_ + w.size()])));
  }
  // A family name starts here: c<digits>, sc<digits> or sq<digits>.
  bool peek_family() {
    skip();
    size_t j = i_;
    if (s_.compare(j, 2, "sc") == 0 || s_.compare(j, 2, "sq") == 0) j += 2;
    else if (s_.compare(j, 1, "c") == 0) j += 1;
    else return false;
    return j < s_.size() && std::isdigit(static_cast<unsigned char>(s_[j]));
  }
  bool peek_char(char ch) {
    skip();
    return i_ < s_.size() && s_[i_] == ch;
  }
  bool eat_word(const std::string& w) {
    if (!peek_word(w)) return false;
    i_ += w.size();
    return true;
  }
  std::string digits() {
    skip();
    size_t j = i_;
    while (j < s_.size() && std::isdigit(static_cast<unsigned char>(s_[j]))) ++j;
    std::string d = s_.substr(i_, j - i_);
    i_ = j;
    return d;
  }
  Fmpz integer(const std::string& what) {
    std::string d = digits();
    if (d.empty()) fail("expected a non-negative integer for " + what);
    if (d.size() > 30) fail(what + " is too large");
    return Fmpz::from_str(d);
  }
  long small_integer(const std::string& what, long max) {
    std::string d = digits();
    if (d.empty()) fail("expected a non-negative integer for " + what);
    if (d.size() > 12 || std::stol(d) > max) fail(what + " is too large (at most " + std::to_string(max) + ")");
    return std::stol(d);
  }

  void side(LinearRelation& rel, int sign) {
    skip();
    int s = 1;
    if (eat("+")) s = 1;
    else if (eat("-")) s = -1;
    term(rel, sign * s);
    for (;;) {
      skip();
      if (eat("+")) term(rel, sign);
      else if (eat("-")) term(rel, -sign);
      else break;
    }
  }

  void term(LinearRelation& rel, int sign) {
    skip();
    Fmpq c(1);
    bool have_number = false;
    if (i_ < s_.size() && std::isdigit(static_cast<unsigned char>(s_[i_]))) {
      Fmpz num = integer("a coefficient"), den(1);
      skip();
      if (eat("/")) {
        den = integer("a coefficient's denominator");
        if (fmpz_is_zero(den)) fail("a coefficient has denominator 0");
      }
      fmpq_set_fmpz_frac(c, num, den);
      have_number = true;
      skip();
      eat("*");
      skip();
      if (have_number && fmpq_is_zero(c) && !peek_word("c") && !peek_family()) return;  // the term "0"
    }
    size_t j = i_;
    while (j < s_.size() && std::isalnum(static_cast<unsigned char>(s_[j]))) ++j;
    std::string name = s_.substr(i_, j - i_);
    if (name.empty()) fail("expected a family term such as c5(5n+4)");
    Family fam = Family::parse(name);
    i_ = j;
    if (!eat("(")) fail("expected '(' after " + name);
    long A = 1;
    skip();
    if (i_ < s_.size() && std::isdigit(static_cast<unsigned char>(s_[i_]))) {
      A = small_integer("A in " + name + "(A n + B)", kMaxA);
      eat("*");
    }
    // A dilated argument A(n-j)/d + B or A n/d + B, else A n + B.
    const std::string dil = name + "(A(n-j)/d + B)";
    long d = 1, jc = 0;
    bool dilated = false;
    if (eat("(")) {
      if (!eat("n")) fail("expected 'n' after '(' in the argument of " + name + " (e.g. " + name + "((n-4)/7))");
      if (eat("-")) jc = small_integer("j in " + dil, kMaxQ);
      else if (peek_char('+')) fail("the class in " + dil + " is written (n-j)/d with 0 <= j < d");
      if (!eat(")")) fail("expected ')' after n-j in " + dil);
      if (!eat("/")) fail("expected '/d' after (n-j) in " + dil);
      d = small_integer("d in " + dil, kMaxQ);
      dilated = true;
    } else {
      if (!eat("n")) fail("the argument of " + name + " must be A n + B (e.g. 5n+4)");
      if (eat("/")) {
        d = small_integer("d in " + dil, kMaxQ);
        dilated = true;
      }
    }
    if (A < 1) fail("A in " + name + "(A n + B) must be at least 1");
    if (dilated) {
      if (d < 2) fail("d in " + dil + " must be at least 2");
      if (jc >= d) fail("j in " + dil + " must be below d");
    }
    long B = 0;
    skip();
    if (eat("+")) {
      B = small_integer("B in " + name + "(A n + B)", kMaxB);
    } else if (eat("-")) {
      fail("B in " + name + "(A n + B) must be non-negative (shift n instead)");
    }
    if (!eat(")")) fail("expected ')' after the argument of " + name);
    if (fmpq_is_zero(c)) return;
    if (sign < 0) fmpq_neg(c, c);
    rel.terms.push_back({c, fam, A, B, d, jc});
  }

  const std::string& s_;
  size_t i_ = 0;
};

}  // namespace

LinearRelation parse_relation(const std::string& text) { return Parser(text).parse(); }

std::string RelationTerm::str() const {
  const std::string a = A == 1 ? std::string() : std::to_string(A);
  std::string arg;
  if (d == 1) arg = a + "n";
  else if (j == 0) arg = a + "n/" + std::to_string(d);
  else arg = a + "(n-" + std::to_string(j) + ")/" + std::to_string(d);
  return family.name() + "(" + arg + (B ? "+" + std::to_string(B) : std::string()) + ")";
}

std::string LinearRelation::str() const {
  std::string s;
  for (size_t i = 0; i < terms.size(); ++i) {
    const auto& t = terms[i];
    Fmpq c = t.coeff;
    bool neg = fmpq_sgn(c) < 0;
    if (neg) fmpq_neg(c, c);
    if (i == 0) s += neg ? "-" : "";
    else s += neg ? " - " : " + ";
    if (!fmpq_is_one(c)) s += c.str() + "*";
    s += t.str();
  }
  s += fmpz_is_zero(modulus) ? " = 0" : " == 0 mod " + modulus.str();
  if (restricted) s += " for n mod " + std::to_string(Q) + (complement ? " != " : " = ") + std::to_string(r);
  return s;
}

}  // namespace circlet
