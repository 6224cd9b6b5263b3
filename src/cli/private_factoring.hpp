#pragma once
// Factoring a large X = n + Δ without surprises, for the commands that take an
// arbitrary n (`main --at`, `arcs --at`): an estimate checked before the work
// (a refusal naming --allow-large), and a child process that works in a private
// temporary directory with a time limit.
//
// Factoring a large X (FLINT's quadratic sieve writes work files into the current
// directory and may run for hours) happens in a child process whose working
// directory is a private temporary directory (mkdtemp), removed afterwards; the
// parent never changes its own directory. The child writes its whole output (or
// "E" and a user-error message) into a pipe; after `timeout` seconds the child is
// killed and the caller gets nullopt.
#include <functional>
#include <optional>
#include <string>

#include "core/flint_types.hpp"
#include "core/resource_guard.hpp"
#include "quadratic/model.hpp"

namespace circlet::cli {

/// X with at most this many decimal digits is factored in well under a second.
constexpr long kEasyFactorDigits = 40;

struct GuardedResult {
  bool user_error = false;  // the body threw a UserError; text is its message
  std::string text;         // the body's output
};

/// Runs body() in a forked child whose working directory is a fresh mkdtemp
/// directory under TMPDIR (default /tmp), removed afterwards; nullopt when the
/// child is still running after `timeout` seconds (it is then killed).
std::optional<GuardedResult> run_in_private_child(const std::function<std::string()>& body, double timeout);

/// X needs FLINT's general factoring (possibly the quadratic sieve) beyond two words.
bool needs_private_factoring(const QuadraticModel& model, const Fmpz& n);

/// The cost of factoring X: trivial when, after trial division by the primes
/// below 2^16, what remains is 1, small, or a probable prime; otherwise
/// "unbounded" (a large composite cofactor). `what` names the computation.
ResourceEstimate factoring_estimate(const QuadraticModel& model, const Fmpz& n, const std::string& what);

}  // namespace circlet::cli
