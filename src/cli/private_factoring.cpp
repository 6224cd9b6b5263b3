#include "cli/private_factoring.hpp"

#include <dirent.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <flint/fmpz_factor.h>

#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <iostream>
#include <vector>

#include "core/error.hpp"

namespace circlet::cli {


namespace {

void remove_tree_flat(const std::string& dir) {
  if (DIR* d = ::opendir(dir.c_str())) {
    while (dirent* e = ::readdir(d)) {
      const std::string name = e->d_name;
      if (name == "." || name == "..") continue;
      ::unlink((dir + "/" + name).c_str());
    }
    ::closedir(d);
  }
  ::rmdir(dir.c_str());
}

}  // namespace

std::optional<GuardedResult> run_in_private_child(const std::function<std::string()>& body, double timeout) {
  const char* tmp = std::getenv("TMPDIR");
  std::string templ = std::string(tmp && *tmp ? tmp : "/tmp") + "/circlet-factor-XXXXXX";
  std::vector<char> buf(templ.begin(), templ.end());
  buf.push_back('\0');
  if (::mkdtemp(buf.data()) == nullptr)
    throw UserError("cannot create a private temporary directory for factoring under " + templ.substr(0, templ.rfind('/')) +
                    " (set TMPDIR to a writable directory)");
  const std::string dir(buf.data());
  int fds[2];
  if (::pipe(fds) != 0) {
    remove_tree_flat(dir);
    throw UserError("cannot create a pipe for the factoring process");
  }
  std::cout.flush();
  std::cerr.flush();
  const pid_t pid = ::fork();
  if (pid < 0) {
    ::close(fds[0]);
    ::close(fds[1]);
    remove_tree_flat(dir);
    throw UserError("cannot start the factoring process");
  }
  if (pid == 0) {
    ::close(fds[0]);
    std::string out;
    if (::chdir(dir.c_str()) != 0) {
      out = "Ecannot enter the private temporary directory " + dir;
    } else {
      try {
        out = "O" + body();
      } catch (const UserError& e) {
        out = std::string("E") + e.what();
      }
    }
    size_t off = 0;
    while (off < out.size()) {
      const ssize_t w = ::write(fds[1], out.data() + off, out.size() - off);
      if (w <= 0) break;
      off += (size_t)w;
    }
    ::close(fds[1]);
    ::_exit(0);
  }
  ::close(fds[1]);
  std::string data;
  bool timed_out = false;
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(timeout);
  for (;;) {
    const double left = std::chrono::duration<double>(deadline - std::chrono::steady_clock::now()).count();
    if (left <= 0) {
      timed_out = true;
      break;
    }
    pollfd pf{fds[0], POLLIN, 0};
    const int pr = ::poll(&pf, 1, (int)std::min(left * 1000 + 1, 1000.0));
    if (pr < 0 && errno == EINTR) continue;
    if (pr <= 0) continue;
    char chunk[65536];
    const ssize_t got = ::read(fds[0], chunk, sizeof chunk);
    if (got < 0 && errno == EINTR) continue;
    if (got <= 0) break;  // end of file: the child is done
    data.append(chunk, (size_t)got);
  }
  ::close(fds[0]);
  if (timed_out) ::kill(pid, SIGKILL);
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {
  }
  remove_tree_flat(dir);
  if (timed_out) return std::nullopt;
  CIRCLET_ASSERT(!data.empty() && WIFEXITED(status), "the factoring process ended without a result");
  GuardedResult r;
  r.user_error = data[0] == 'E';
  r.text = data.substr(1);
  return r;
}

// X needs FLINT's general factoring (possibly the quadratic sieve) beyond two words.
bool needs_private_factoring(const QuadraticModel& model, const Fmpz& n) {
  Fmpq D;
  Fmpq X = model.X(n);
  fmpq_mul(D.get(), model.det_gram.get(), X.get());
  return fmpz_bits(fmpq_numref(D.get())) + fmpz_bits(fmpq_denref(D.get())) > 100;
}


// The main term factors X = n + Δ (its numerator): trivial when, after trial
// division by the primes below 2^16, what remains is 1, small, or a probable
// prime; a large composite cofactor may take FLINT's factoring unbounded time.
ResourceEstimate factoring_estimate(const QuadraticModel& model, const Fmpz& n, const std::string& what) {
  ResourceEstimate e;
  const Fmpq X = model.X(n);
  Fmpz c;
  fmpz_mul(c.get(), fmpq_numref(X.get()), fmpq_denref(X.get()));
  fmpz_abs(c.get(), c.get());
  const long digits = static_cast<long>(fmpz_sizeinbase(c.get(), 10));
  e.what = what + " at an n whose X has " + std::to_string(digits) + " digits";
  if (digits <= kEasyFactorDigits) return e;
  fmpz_factor_t fac;
  fmpz_factor_init(fac);
  fmpz_factor_trial_range(fac, c.get(), 0, 6542);  // the 6542 primes below 2^16
  for (slong i = 0; i < fac->num; ++i) {
    Fmpz pe;
    fmpz_pow_ui(pe.get(), fac->p + i, fac->exp[i]);
    if (fmpz_divisible(c.get(), pe.get())) fmpz_divexact(c.get(), c.get(), pe.get());
  }
  fmpz_factor_clear(fac);
  const long rest = fmpz_is_one(c.get()) ? 0 : static_cast<long>(fmpz_sizeinbase(c.get(), 10));
  if (rest <= kEasyFactorDigits) return e;
  // BPSW costs about a second at 5000 digits; beyond 20000 digits it is not tried.
  if (rest <= 20000 && fmpz_is_probabprime(c.get())) return e;
  e.seconds = -1;
  e.reason = "X has a composite cofactor of " + std::to_string(rest) +
             " digits without small prime factors, whose factorisation may not finish";
  return e;
}

}  // namespace circlet::cli
