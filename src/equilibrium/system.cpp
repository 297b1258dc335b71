#include "equilibrium/system.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>

namespace deltag::equilibrium {

int ChemicalSystem::column_of(std::size_t component) const {
    for (std::size_t c = 0; c < columns.size(); ++c)
        if (columns[c].component == component && columns[c].role != ComponentColumn::Role::split_electron)
            return static_cast<int>(c);
    return -1;
}

int ChemicalSystem::column_for(std::size_t j, const thermo::Stoichiometry& st) const {
    if (db->electron() && j == *db->electron())
        for (std::size_t c = 0; c < columns.size(); ++c)
            if (columns[c].role == ComponentColumn::Role::split_electron)
                for (const auto& [k, v] : st)
                    if (k == columns[c].split_of) return static_cast<int>(c);
    return column_of(j);
}

namespace {

std::string join_names(const std::vector<std::string>& names, std::size_t max_listed = 6) {
    std::string s;
    for (std::size_t i = 0; i < names.size() && i < max_listed; ++i) s += (i ? ", " : "") + names[i];
    if (names.size() > max_listed) s += " and " + std::to_string(names.size() - max_listed) + " more";
    return s;
}

}  // namespace

std::vector<ComponentColumn> system_columns(const thermo::Database& db, const SpeciationInput& input) {
    std::vector<ComponentColumn> columns;
    const std::size_t nc = db.component_count();
    std::vector<int> column(nc, -1);
    auto add_column = [&](std::size_t comp, ComponentColumn::Role role) {
        column[comp] = static_cast<int>(columns.size());
        columns.push_back({comp, role, -1});
    };
    add_column(db.water(), ComponentColumn::Role::water);
    add_column(db.proton(), input.ph ? ComponentColumn::Role::proton_fixed : ComponentColumn::Role::proton_unknown);
    if (input.pe && db.electron()) add_column(*db.electron(), ComponentColumn::Role::electron_fixed);
    else if (input.electron_total && db.electron()) add_column(*db.electron(), ComponentColumn::Role::electron_unknown);
    for (const auto& ci : input.components)
        if (column[ci.component] < 0) add_column(ci.component, ComponentColumn::Role::unknown);
    std::vector<int> split_column(nc, -1);  // per split component: its electron column
    for (const auto& sp : input.redox_splits) {
        split_column[sp.component] = static_cast<int>(columns.size());
        columns.push_back({*db.electron(), ComponentColumn::Role::split_electron, -1, sp.component});
    }
    if (input.charge_balance_component && column[*input.charge_balance_component] < 0)
        add_column(*input.charge_balance_component, ComponentColumn::Role::unknown);
    // Components that only a mineral or a gas brings in (calcite into pure water).
    auto add_phase_columns = [&](const thermo::PhaseEntry& p) {
        for (const auto& [j, v] : p.dissolution) {
            if (column[j] >= 0) continue;
            const auto role = db.species()[j].role;
            bool split = false;
            for (const auto& [k, w] : p.dissolution) split = split || split_column[k] >= 0;
            if (role == thermo::ComponentRole::electron && split) continue;
            if (role == thermo::ComponentRole::electron)
                throw InputError(SourceLocation{input.label, 0, 0}, p.name,
                                 "'" + p.name + "' takes part in redox (its reaction needs e-): give the water a pe");
            add_column(j, ComponentColumn::Role::unknown);
        }
    };
    for (const auto& m : input.minerals) add_phase_columns(db.minerals()[m.mineral]);
    for (const auto& g : input.gases) add_phase_columns(db.gases()[g.gas]);
    if (input.headspace)
        for (const auto& g : input.headspace->gases) add_phase_columns(db.gases()[g.gas]);
    return columns;
}

ChemicalSystem build_system(const thermo::Database& db, const SpeciationInput& input,
                            std::vector<ComponentColumn> columns) {
    ChemicalSystem sys;
    sys.db = &db;
    sys.temperature_c = input.temperature_c;
    sys.columns = std::move(columns);
    const std::size_t nc = db.component_count();
    std::vector<int> column(nc, -1), split_column(nc, -1);
    for (std::size_t c = 0; c < sys.columns.size(); ++c) {
        if (sys.columns[c].role == ComponentColumn::Role::split_electron) split_column[sys.columns[c].split_of] = static_cast<int>(c);
        else column[sys.columns[c].component] = static_cast<int>(c);
    }

    // Species in play: every species whose formation uses only columns present.
    std::vector<std::string> redox_left_out, outside_range, constant_in_t;
    const bool away_from_25 = std::abs(input.temperature_c - 25.0) > 0.5;
    for (std::size_t i = 0; i < db.species().size(); ++i) {
        const thermo::Species& s = db.species()[i];
        if (s.role == thermo::ComponentRole::water || s.role == thermo::ComponentRole::electron) continue;
        bool ok = true, needs_electron = false, touches_present_element = false;
        int own_electrons = -1;
        for (const auto& [j, v] : s.formation)
            if (split_column[j] >= 0) own_electrons = split_column[j];
        for (const auto& [j, v] : s.formation) {
            if (own_electrons >= 0 && db.species()[j].role == thermo::ComponentRole::electron) continue;
            if (column[j] < 0) {
                ok = false;
                if (db.species()[j].role == thermo::ComponentRole::electron) needs_electron = true;
            } else if (db.species()[j].role == thermo::ComponentRole::ordinary) {
                touches_present_element = true;
            }
        }
        if (!ok) {
            // Tell the user only when the species belongs to an element they gave.
            bool others_present = true;
            for (const auto& [j, v] : s.formation)
                if (column[j] < 0 && db.species()[j].role != thermo::ComponentRole::electron) others_present = false;
            if (needs_electron && others_present && touches_present_element) redox_left_out.push_back(s.name);
            continue;
        }
        sys.species.push_back(i);
        if (!s.is_component) {
            const auto range = s.log_k.range();
            if (!range.contains(input.temperature_c)) outside_range.push_back(s.name);
            if (away_from_25 && !s.log_k.temperature_dependent()) constant_in_t.push_back(s.name);
        }
    }

    const std::size_t ns = sys.species.size(), ncol = sys.columns.size();
    sys.nu = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(ns), static_cast<Eigen::Index>(ncol));
    sys.log_k.resize(static_cast<Eigen::Index>(ns));
    sys.charge.resize(static_cast<Eigen::Index>(ns));
    sys.alkalinity.resize(static_cast<Eigen::Index>(ns));
    sys.params.reserve(ns);
    for (std::size_t k = 0; k < ns; ++k) {
        const thermo::Species& s = db.species()[sys.species[k]];
        const auto r = static_cast<Eigen::Index>(k);
        for (const auto& [j, v] : s.formation) sys.nu(r, sys.column_for(j, s.formation)) = v;
        sys.log_k(r) = s.is_component ? 0.0 : s.log_k(input.temperature_c);
        sys.charge(r) = s.formula.charge;
        sys.alkalinity(r) = s.alkalinity;
        activity::SpeciesParameters p = activity::no_parameters(s.formula.charge);
        p.ion_size_angstrom = s.ion_size_angstrom;
        p.tj_a_angstrom = s.tj_a_angstrom;
        p.tj_b = s.tj_b;
        p.salting_out = s.salting_out;
        sys.params.push_back(p);
    }
    sys.model = activity::make_model(input.activity_model, input.temperature_c);

    if (!redox_left_out.empty())
        sys.warnings.push_back("no pe given: redox species left out (" + join_names(redox_left_out) + ")");
    if (!outside_range.empty()) {
        std::ostringstream o;
        o << "temperature " << input.temperature_c << " degC is outside the stated range of log K for "
          << join_names(outside_range) << "; values are extrapolated";
        sys.warnings.push_back(o.str());
    }
    if (!constant_in_t.empty())
        sys.warnings.push_back("log K taken as constant (the database gives no temperature dependence) for " +
                               join_names(constant_in_t));
    return sys;
}

ChemicalSystem build_system(const thermo::Database& db, const SpeciationInput& input) {
    return build_system(db, input, system_columns(db, input));
}

}  // namespace deltag::equilibrium
