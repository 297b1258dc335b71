// Internal, for tests: the equations of a solved speciation, so a test can compare the
// analytic Jacobian with finite differences at the solution and near it. Not public API.
#pragma once

#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/speciation.hpp"

namespace deltag::equilibrium::internal {

struct EquationProbe {
    std::size_t n = 0;
    std::vector<std::string> kind;   // per unknown: mass, alkalinity, charge, ionic strength,
                                     // water, mineral, gas, electrons, split electrons
    std::vector<bool> switched;      // per unknown: a component on a switched basis species
    std::size_t closed_gases = 0;    // gases of a closed headspace (they enter the balances)
    std::vector<double> solution;    // the unknowns at the solution
    // f(u) and, when jac is not null, the analytic Jacobian (column-major, n x n).
    std::function<void(const double* u, double* f, double* jac)> evaluate;
};

// Solves `input` as speciate() does and returns the final problem at its solution.
EquationProbe probe_equations(const thermo::Database& db, const SpeciationInput& input,
                              const SolverOptions& options = {});

}  // namespace deltag::equilibrium::internal
