// Internal: the chemical system of one solve (the species that can form from the components
// present, their log K at the temperature, stoichiometry, charges and activity parameters)
// and the residual/Jacobian of the speciation equations.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "deltag/activity.hpp"
#include "deltag/database.hpp"
#include "deltag/speciation.hpp"

namespace deltag::equilibrium {

// Columns of the stoichiometry: the components in play.
struct ComponentColumn {
    std::size_t component;  // database index
    // unknown: log10 molality of the component's species is an unknown; proton_unknown: the
    // same for H+ (pH from the charge balance); electron_unknown: log10 a(e-) is an unknown
    // (the electrons are conserved instead of the pe being fixed).
    // split_electron: the electrons of one element's species, with their own activity.
    enum class Role { unknown, proton_unknown, proton_fixed, water, electron_fixed, electron_unknown, split_electron } role;
    int unknown = -1;       // index into the unknown vector, if any
    std::size_t split_of = static_cast<std::size_t>(-1);  // split_electron: the element's component
    bool free() const {
        return role == Role::unknown || role == Role::proton_unknown || role == Role::electron_unknown ||
               role == Role::split_electron;
    }
};

struct ChemicalSystem {
    const thermo::Database* db = nullptr;
    double temperature_c = 25.0;
    std::vector<ComponentColumn> columns;
    std::vector<std::size_t> species;        // database indices of the species in play (no H2O, no e-)
    Eigen::MatrixXd nu;                      // species x columns, formation coefficients
    Eigen::VectorXd log_k;                   // formation log K at the temperature
    Eigen::VectorXd charge;
    Eigen::VectorXd alkalinity;
    std::vector<activity::SpeciesParameters> params;
    std::unique_ptr<activity::ActivityModel> model;
    std::vector<std::string> warnings;       // from the build (T ranges, redox species left out)

    int column_of(std::size_t component) const;
    // The column of component j within a reaction with stoichiometry st: e- of a reaction
    // that involves a split element goes to that element's electron column.
    int column_for(std::size_t j, const thermo::Stoichiometry& st) const;
};

// The columns a solve of `input` needs, in order: water, H+, e- (when a pe is given or the
// electrons are conserved), the components given, each split element's electrons, the
// charge-balance component, and components only a mineral or gas brings in. Throws
// InputError for a phase that needs e- when no pe is given.
std::vector<ComponentColumn> system_columns(const thermo::Database& db, const SpeciationInput& input);

// Builds the system for the components present in `input` (on the given columns).
ChemicalSystem build_system(const thermo::Database& db, const SpeciationInput& input,
                            std::vector<ComponentColumn> columns);
ChemicalSystem build_system(const thermo::Database& db, const SpeciationInput& input);

}  // namespace deltag::equilibrium
