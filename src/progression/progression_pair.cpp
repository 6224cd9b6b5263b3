#include "progression/progression_pair.hpp"


#include "core/error.hpp"

namespace circlet {

Fmpz progression_at(const Progression& ap, const Fmpz& n) {
  Fmpz r;
  fmpz_mul_si(r, n, ap.A);
  fmpz_add_si(r, r, ap.B);
  return r;
}

Fmpq AffineX::at(const Fmpz& n) const {
  Fmpq r;
  fmpz_mul(fmpq_numref(r.get()), a, n);
  fmpz_one(fmpq_denref(r.get()));
  fmpq_add(r, r, b);
  return r;
}

AffineX affine_x(const QuadraticModel& model, const Progression& ap) {
  AffineX x;
  x.a = Fmpz(ap.A);
  fmpq_add_si(x.b, model.delta, ap.B);
  return x;
}

std::string weight_string(int rank) {
  return rank % 2 == 0 ? std::to_string(rank / 2) : std::to_string(rank) + "/2";
}

ProgressionPair::ProgressionPair(const Family& f, const Progression& ap, const Family& g, const Progression& ap2)
    : F(quadratic_model(f)), G(quadratic_model(g)), apF(ap), apG(ap2) {
  if (F.rank != G.rank)
    throw UserError(f.name() + " has weight " + weight_string(F.rank) + " but " + g.name() + " has weight " +
                    weight_string(G.rank) +
                    ": the ratio of main terms has a limit only for families of the same weight");
  xF = affine_x(F, apF);
  xG = affine_x(G, apG);
}

std::string ProgressionPair::weight_str() const { return weight_string(F.rank); }

}  // namespace circlet
