// Process steps. A water between steps is its component totals (mol/kgw) and its charge
// imbalance, with the pH free: the solver's charge balance then conserves the protons, so
// every step changes the element totals by exactly what it adds, removes or transfers.
// The mass of water is held at 1 kg: the water that reactions make or use (gypsum gives
// 2 H2O per mole) and the water of a reagent are not tracked, except where a step removes
// water on purpose (concentrate).
#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>
#include <sstream>

#include "deltag/constants.hpp"
#include "deltag/process.hpp"
#include "deltag/water_properties.hpp"
#include "chem/names.hpp"
#include "process/root.hpp"
#include "util/overloaded.hpp"

namespace deltag::process {

namespace {

// Kg of water per litre of a derived water: the density of pure water at its temperature,
// less the dissolved mass (the same approximation as for a lab analysis without a density).
double kg_water_per_litre(const equilibrium::SpeciationResult& r, const thermo::Database& db) {
    double solutes_kg = 0.0;
    for (const auto& s : r.species) solutes_kg += s.molality * db.species()[s.species].formula.molar_mass() / 1000.0;
    return thermo::water_density_kg_m3(r.temperature_c) / 1000.0 / (1.0 + solutes_kg);
}

equilibrium::SpeciationResult solve(const thermo::Database& db, equilibrium::SpeciationInput& in,
                                    const equilibrium::SpeciationResult* start) {
    equilibrium::SpeciationResult r = equilibrium::speciate(db, in, {}, start);
    r.kg_water_per_litre = kg_water_per_litre(r, db);
    in.kg_water_per_litre = r.kg_water_per_litre;
    return r;
}

// Totals of the result as a new basis (ordinary components that are present).
void take_totals(const thermo::Database& db, const equilibrium::SpeciationResult& r, equilibrium::SpeciationInput& b) {
    b.components.clear();
    for (std::size_t j = 0; j < db.component_count(); ++j)
        if (r.component_present[j] && db.species()[j].role == thermo::ComponentRole::ordinary && r.component_totals[j] > 0)
            b.components.push_back({j, equilibrium::ComponentInput::Kind::total, r.component_totals[j]});
}

void add_total(equilibrium::SpeciationInput& b, std::size_t j, double amount) {
    for (auto& c : b.components)
        if (c.component == j) {
            c.value += amount;
            return;
        }
    b.components.push_back({j, equilibrium::ComponentInput::Kind::total, amount});
}

std::size_t mineral_index(const thermo::Database& db, const std::string& name, const SourceLocation& where,
                          const std::string& key) {
    if (auto i = db.find_mineral(name)) return *i;
    // A formula where a mineral is expected ("CaCO3") leads to the mineral of that formula.
    std::vector<std::pair<std::string, std::string>> phases;
    for (const auto& m : db.minerals()) phases.emplace_back(m.name, m.formula.text);
    // A gas among the solids ("CO2"): it goes in partial_pressures.
    const std::string gas = name.ends_with("(g)") ? name : name + "(g)";
    const std::string as_gas = db.find_gas(gas) ? "; " + gas + " is a gas: give its level in partial_pressures = { " +
                                                      gas.substr(0, gas.size() - 3) + " = { ppmv = ... } }"
                                                : std::string();
    throw InputError(where, key, "'" + name + "' is not a mineral of the database '" + db.name() + "'" + as_gas,
                     nearest_phase(name, phases));
}

// A case file names a gas by its formula ("CO2" for the database's CO2(g)); `name` is the
// database's name, `key` the table the formula is a key of. Messages and suggestions use the
// formula, as the case file writes it.
std::size_t gas_index(const thermo::Database& db, const std::string& name, const SourceLocation& where,
                      const std::string& key) {
    if (auto i = db.find_gas(name)) return *i;
    const auto written = [](const std::string& gas) {
        return gas.ends_with("(g)") ? gas.substr(0, gas.size() - 3) : gas;
    };
    std::vector<std::pair<std::string, std::string>> phases;
    std::vector<std::string> formulas;
    for (const auto& g : db.gases()) {
        phases.emplace_back(written(g.name), g.formula.text);
        formulas.push_back(written(g.name));
    }
    const std::string formula = written(name);
    // A solid among the gases ("Calcite", "CaCO3"): it goes in solids.
    std::string solid;
    for (const auto& m : db.minerals())
        if (solid.empty() && (m.name == formula || m.formula.text == formula)) solid = m.name;
    if (!solid.empty())
        throw InputError(where, key + "." + formula,
                         formula + " is a solid, not a gas: list " + solid + " in solids = [\"" + solid + "\"]");
    const bool bare = std::all_of(formula.begin(), formula.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
    throw InputError(where, key + "." + (bare ? formula : "\"" + formula + "\""),
                     "no gas " + formula + " in the database '" + db.name() + "'; its gases: " + name_list(formulas),
                     nearest_phase(formula, phases));
}

// The element of a component, for messages (Fe for Fe^2+).
std::string element_of(const thermo::Database& db, std::size_t component) {
    for (const auto& [el, n] : db.species()[component].formula.elements)
        if (el != "H" && el != "O") return el;
    return db.species()[component].name;
}

// The electrons held by the species of an element whose redox states are apart: the e- of
// each species' formation times its molality, over the species made of that component.
double split_electrons(const thermo::Database& db, const equilibrium::SpeciationResult& r, std::size_t component) {
    double e = 0.0;
    for (const auto& sp : r.species) {
        const auto& formation = db.species()[sp.species].formation;
        bool of_element = false;
        double nu_e = 0.0;
        for (const auto& [j, v] : formation) {
            if (j == component) of_element = true;
            if (db.electron() && j == *db.electron()) nu_e = v;
        }
        if (of_element) e += nu_e * sp.molality;
    }
    return e;
}

// "Fe given by redox state (Fe +2, Fe +3)": the elements of these components and the redox
// states the database names for them, for the messages of the steps.
std::string given_by_state(const thermo::Database& db, const std::vector<std::size_t>& components) {
    std::vector<std::string> elements, states;
    for (std::size_t comp : components) {
        elements.push_back(element_of(db, comp));
        for (const auto& an : db.analytes())
            if (an.kind == thermo::Analyte::Kind::redox_state && an.component == comp) states.push_back(an.name);
    }
    return name_list(elements) + " given by redox state" + (states.empty() ? "" : " (" + name_list(states) + ")");
}

std::string split_elements(const thermo::Database& db, const equilibrium::SpeciationInput& in) {
    std::vector<std::size_t> components;
    for (const auto& sp : in.redox_splits) components.push_back(sp.component);
    return given_by_state(db, components);
}

// A step that brings the water to one redox level (equilibrate, an oxidant or reductant
// dose, temperature with equilibrate) lets the redox states of an element given apart
// (Fe +2, Fe +3) equilibrate with it: their electrons join the water's electron total and
// the element is one total. With keep_redox_states_apart the states stay apart. Returns
// what the result should say ("" when the water has no states apart).
std::string bring_to_one_redox_level(const thermo::Database& db, const Step& s, equilibrium::SpeciationInput& in) {
    if (in.redox_splits.empty()) return "";
    const std::string elements = split_elements(db, in);
    if (s.keep_redox_states_apart)
        return elements + " kept apart by choice (keep_redox_states_apart = true): its couple keeps "
               "an Eh of its own and does not follow the step's redox level";
    if (!in.pe) {
        double electrons = in.electron_total.value_or(0.0);  // no redox level: the components' states, 0
        for (const auto& sp : in.redox_splits) electrons += sp.electron_total;
        in.electron_total = electrons;
    }
    in.redox_splits.clear();
    return elements + " brought to the step's redox level: one electron balance for the whole "
           "water (keep_redox_states_apart = true keeps the states apart)";
}

// Solids that may form but not dissolve and need a component the water lacks, and that no
// other phase of the step brings in, can never be saturated (their ion activity product is
// 0): they are left out, and the returned warnings say so.
std::vector<std::string> leave_out_absent(const thermo::Database& db, equilibrium::SpeciationInput& in) {
    std::vector<bool> present(db.component_count(), false);
    for (const auto& c : in.components) present[c.component] = present[c.component] || c.value > 0;
    auto bring = [&](const thermo::Stoichiometry& st) {
        for (const auto& [j, v] : st) present[j] = true;
    };
    for (const auto& m : in.minerals)
        if (m.may_dissolve && (!m.on_hand_mol_per_kgw || *m.on_hand_mol_per_kgw > 0))
            bring(db.minerals()[m.mineral].dissolution);
    for (const auto& g : in.gases) bring(db.gases()[g.gas].dissolution);
    if (in.headspace)
        for (const auto& g : in.headspace->gases) bring(db.gases()[g.gas].dissolution);
    std::vector<std::string> warnings;
    std::vector<equilibrium::MineralTarget> kept;
    for (const auto& m : in.minerals) {
        std::vector<std::string> absent;
        if (!m.may_dissolve)
            for (const auto& [j, v] : db.minerals()[m.mineral].dissolution)
                if (db.species()[j].role == thermo::ComponentRole::ordinary && !present[j]) absent.push_back(db.species()[j].name);
        if (absent.empty()) {
            kept.push_back(m);
            continue;
        }
        warnings.push_back(db.minerals()[m.mineral].name + " left out: its components (" + name_list(absent) +
                           ") are absent from the water, so it cannot form");
    }
    in.minerals = std::move(kept);
    return warnings;
}

// Finishes a state after a solve: the new totals, the solids still in contact, the indices.
WaterState finish(const thermo::Database& db, const std::string& label, equilibrium::SpeciationInput in,
                  equilibrium::SpeciationResult r) {
    WaterState w;
    w.label = label;
    r.label = label;
    take_totals(db, r, in);
    // The electrons as they now stand (a gas or a solid may have brought or taken some), the
    // water's and those of each element whose redox states are apart.
    if (in.electron_total && db.electron()) in.electron_total = r.component_totals[*db.electron()];
    std::vector<equilibrium::SpeciationInput::RedoxSplit> splits;
    for (const auto& sp : in.redox_splits) {
        const bool still_there = std::any_of(in.components.begin(), in.components.end(),
                                             [&](const auto& c) { return c.component == sp.component; });
        if (still_there) splits.push_back({sp.component, split_electrons(db, r, sp.component)});
    }
    in.redox_splits = std::move(splits);
    // Solids in contact: those at their target, with what is left of a finite amount.
    for (std::size_t a = 0; a < in.minerals.size(); ++a) {
        equilibrium::MineralTarget m = in.minerals[a];
        const auto& t = r.transfers[a];
        if (t.exhausted) continue;
        if (m.on_hand_mol_per_kgw) m.on_hand_mol_per_kgw = std::max(0.0, *m.on_hand_mol_per_kgw - t.moles);
        w.minerals.push_back(m);
    }
    w.gases = in.gases;
    in.minerals.clear();
    in.gases.clear();
    in.headspace.reset();
    in.label = label;
    w.basis = in;
    w.result = std::move(r);
    w.indices = water_treatment_indices(db, w);
    return w;
}

bool is_amount_unit(const ConcentrationUnit& u) {
    return u.measure != ConcentrationUnit::Measure::equivalents && u.basis != ConcentrationUnit::Basis::per_kg_solution;
}

double amount_in_mol_per_kgw(const Amount& a, double molar_mass_g, double kg_water_per_litre) {
    if (const std::string p = amount_unit_problem(a.unit); !p.empty())
        throw InputError(a.where, "unit", p, amount_unit_suggestion(a.unit));
    const ConcentrationUnit& u = *find_concentration_unit(a.unit);
    double mol = a.value * u.scale;
    if (u.measure == ConcentrationUnit::Measure::mass) mol /= molar_mass_g;
    if (u.basis == ConcentrationUnit::Basis::per_litre) mol /= kg_water_per_litre;
    return mol;
}

// --- the kinds of step --------------------------------------------------------------------

WaterState do_equilibrate(const thermo::Database& db, const Step& s, const EquilibrateStep& e, const WaterState& from) {
    equilibrium::SpeciationInput in = from.basis;
    in.label = s.label;
    in.minerals.clear();
    in.gases.clear();
    for (const auto& m : e.minerals)
        in.minerals.push_back({mineral_index(db, m.name, m.where, "solids." + m.name), m.target_si,
                               m.on_hand_mol_per_kgw, m.may_form, m.may_dissolve});
    for (const auto& g : e.gases)
        in.gases.push_back({gas_index(db, g.name, g.where, "partial_pressures"), g.log_partial_pressure_atm});
    if (e.headspace) {
        equilibrium::Headspace h;
        h.volume_l_per_kgw = e.headspace->volume_l_per_kgw;
        h.temperature_c = e.headspace->temperature_c;
        for (const auto& g : e.headspace->gases)
            h.gases.push_back({gas_index(db, g.name, g.where, "headspace.partial_pressures"), g.log_partial_pressure_atm});
        in.headspace = h;
    }
    std::vector<std::string> notes = leave_out_absent(db, in);
    if (std::string note = bring_to_one_redox_level(db, s, in); !note.empty()) notes.push_back(note);
    try {
        equilibrium::SpeciationResult r = solve(db, in, &from.result);
        WaterState out = finish(db, s.label, in, std::move(r));
        for (auto& n : notes) out.result.warnings.push_back(n);
        return out;
    } catch (const InputError& err) {
        // The solver knows only the step's label; point at the step in the case file.
        if (err.where().line > 0) throw;
        throw InputError(s.where, err.key(), err.message(), err.suggestion());
    }
}

// The quantity a dose aims at, for a water.
double target_quantity(const DoseTarget& t, const WaterState& w) {
    switch (t.kind) {
        case DoseTarget::Kind::ph: return w.result.ph;
        case DoseTarget::Kind::alkalinity: return w.result.alkalinity_eq * 1000.0 * w.result.kg_water_per_litre;
        case DoseTarget::Kind::saturation_index:
            for (const auto& s : w.result.saturation)
                if (s.phase == t.mineral) return s.si;
            throw InputError(t.where, "until.si." + t.mineral,
                             "the saturation of '" + t.mineral + "' is not defined for this water (its components are absent)");
        case DoseTarget::Kind::langelier:
            // Where calcite saturation is out of reach (no pHs), the Standard Methods 2330 B
            // formula value stands in, so a dose can start from a very soft water.
            if (w.indices.available) return w.indices.langelier;
            if (w.indices.formula_available) return w.indices.formula_langelier;
            throw InputError(t.where, "until.langelier", "the Langelier index is not available: " + w.indices.why_not);
    }
    return 0.0;
}

std::string target_name(const DoseTarget& t) {
    switch (t.kind) {
        case DoseTarget::Kind::ph: return "pH";
        case DoseTarget::Kind::alkalinity: return "the alkalinity (meq/L)";
        case DoseTarget::Kind::saturation_index: return "the saturation index of " + t.mineral;
        case DoseTarget::Kind::langelier: return "the Langelier index";
    }
    return "";
}

WaterState dosed(const thermo::Database& db, const Step& s, const WaterState& from, const ReagentSplit& split,
                 double mol_per_kgw) {
    equilibrium::SpeciationInput in = from.basis;
    in.label = s.label;
    for (const auto& [j, k] : split.components) add_total(in, j, k * mol_per_kgw);
    if (split.electrons != 0.0) {
        // The reagent's electrons belong to its element when that element's redox states are
        // kept apart (ferric chloride into a water with Fe +2 and Fe +3 apart), else to the water.
        equilibrium::SpeciationInput::RedoxSplit* own = nullptr;
        for (auto& sp : in.redox_splits)
            for (const auto& [j, k] : split.components)
                if (j == sp.component) own = &sp;
        if (own) own->electron_total += split.electrons * mol_per_kgw;
        else *in.electron_total += split.electrons * mol_per_kgw;
    }
    equilibrium::SpeciationResult r = solve(db, in, &from.result);
    return finish(db, s.label, in, std::move(r));
}

StepOutcome do_dose(const thermo::Database& db, const Step& s, const DoseStep& d, const WaterState& original) {
    const ReagentSplit split = split_reagent(db, d.reagent, d.reagent_where);
    // An oxidant or a reductant brings the water to one redox level.
    WaterState start = original;
    std::string redox_note;
    if (split.electrons != 0.0) redox_note = bring_to_one_redox_level(db, s, start.basis);
    const WaterState& from = start;
    if (split.electrons != 0.0 && !from.basis.electron_total)
        throw InputError(d.reagent_where, "reagent",
                         "'" + d.reagent + "' is " + (split.electrons < 0 ? "an oxidant" : "a reductant") +
                             ": give the water a redox level (pe, eh_mv or dissolved_oxygen_mg_per_l) so its electrons "
                             "can be counted");
    StepOutcome out;
    DoseOutcome dose;
    dose.reagent = d.reagent;
    if (d.amount) {
        const double mol = amount_in_mol_per_kgw(*d.amount, split.molar_mass_g, from.result.kg_water_per_litre);
        out.state = dosed(db, s, from, split, mol);
        dose.mol_per_kgw = mol;
    } else {
        const DoseTarget& t = *d.until;
        if (t.kind == DoseTarget::Kind::saturation_index) (void)mineral_index(db, t.mineral, t.where, "until.si." + t.mineral);
        const double max_mol = d.max_amount ? amount_in_mol_per_kgw(*d.max_amount, split.molar_mass_g,
                                                                    from.result.kg_water_per_litre)
                                            : 1.0;
        const double g0 = target_quantity(t, from) - t.value;
        const double tolerance = 1e-7;  // in the target's own units; the issue asks for 1e-6
        WaterState best = from;
        double dose_mol = 0.0;
        if (std::abs(g0) > tolerance) {
            std::map<double, WaterState> cache;
            auto g = [&](double x) {
                WaterState w = dosed(db, s, from, split, x);
                const double v = target_quantity(t, w) - t.value;
                cache[x] = std::move(w);
                return v;
            };
            // Bracket: doses growing by 4x from 1e-7 mol/kgw up to the largest allowed.
            double lo = 0.0, glo = g0, hi = std::min(1e-7, max_mol), ghi = g(hi);
            while ((ghi > 0) == (g0 > 0) && std::abs(ghi) > tolerance && hi < max_mol) {
                lo = hi;
                glo = ghi;
                hi = std::min(hi * 4.0, max_mol);
                ghi = g(hi);
            }
            if ((ghi > 0) == (g0 > 0) && std::abs(ghi) > tolerance) {
                const double start_value = g0 + t.value, end_value = ghi + t.value;
                const bool wrong_way = std::abs(ghi) >= std::abs(g0);
                std::string msg = "adding " + d.reagent + " moves " + target_name(t) + " from " + message_number(start_value) +
                                  " to " + message_number(end_value) + " at " + message_number(max_mol * 1000.0) + " mmol/kgw; ";
                msg += wrong_way ? "it cannot bring it to " + message_number(t.value)
                                 : "the target " + message_number(t.value) + " is not reached within that dose (raise max_amount)";
                throw InputError(t.where, "until", msg);
            }
            const RootResult root = brent(g, lo, hi, glo, ghi, tolerance, 1e-16);
            dose_mol = root.x;
            auto it = cache.find(root.x);
            best = it != cache.end() ? it->second : dosed(db, s, from, split, dose_mol);
            if (std::abs(target_quantity(t, best) - t.value) > 1e-6)
                throw ConvergenceError("step '" + s.label + "'", std::abs(target_quantity(t, best) - t.value),
                                       "the dose search stopped short of the target",
                                       "try a larger max_amount or another reagent");
        } else {
            best = dosed(db, s, from, split, 0.0);
        }
        out.state = std::move(best);
        dose.mol_per_kgw = dose_mol;
        dose.found_by_target = true;
        dose.target_reached = target_quantity(t, out.state);
    }
    dose.mg_per_l = dose.mol_per_kgw * split.molar_mass_g * 1000.0 * from.result.kg_water_per_litre;
    out.dose = dose;
    if (!redox_note.empty()) out.state.result.warnings.push_back(redox_note);
    // Solids and gases in contact stay in contact (a dose does not equilibrate with them).
    out.state.minerals = from.minerals;
    out.state.gases = from.gases;
    out.state.result.warnings.push_back(
        "dosing: acids, bases and oxidants are hazardous to handle; treatment of drinking water follows local "
        "regulations and licensed practice");
    return out;
}

WaterState do_blend(const thermo::Database& db, const Step& s, const BlendStep& b,
                    const std::vector<const WaterState*>& parts) {
    // Weights in kg of water: by volume, litres times kg of water per litre; by mass, kg of
    // solution times kg of water per kg of solution.
    std::vector<double> w;
    for (std::size_t k = 0; k < parts.size(); ++k) {
        const auto& r = parts[k]->result;
        double kgw = b.parts[k].second;
        if (b.basis == BlendStep::Basis::volume) kgw *= r.kg_water_per_litre;
        else kgw *= r.kg_water_per_litre / (thermo::water_density_kg_m3(r.temperature_c) / 1000.0);
        w.push_back(kgw);
    }
    double sum = 0.0;
    for (double x : w) sum += x;
    equilibrium::SpeciationInput in = parts.front()->basis;
    in.label = s.label;
    in.components.clear();
    in.charge_imbalance_eq = 0.0;
    in.temperature_c = 0.0;
    // Electrons mix like any total; a water without a redox level has its elements in the
    // components' redox states, i.e. an electron total of 0.
    bool any_redox = false;
    double electrons = 0.0;
    for (std::size_t k = 0; k < parts.size(); ++k) {
        const double f = w[k] / sum;
        const auto& pb = parts[k]->basis;
        for (const auto& c : pb.components) add_total(in, c.component, f * c.value);
        in.charge_imbalance_eq += f * pb.charge_imbalance_eq;
        // Heat capacities taken equal: the mixing temperature is the mass-weighted mean.
        in.temperature_c += f * pb.temperature_c;
        if (pb.electron_total) {
            any_redox = true;
            electrons += f * *pb.electron_total;
        }
    }
    // Redox states apart mix as electron totals when every part that holds the element keeps
    // them apart; when one part holds it at the water's redox level, the states cannot stay
    // apart in the blend: they join the water's electrons, and the result says so.
    in.redox_splits.clear();
    std::vector<std::size_t> merged;
    std::vector<std::size_t> split_components;
    for (const auto* part : parts)
        for (const auto& sp : part->basis.redox_splits)
            if (std::find(split_components.begin(), split_components.end(), sp.component) == split_components.end())
                split_components.push_back(sp.component);
    for (std::size_t comp : split_components) {
        bool apart_everywhere = true;
        double split_e = 0.0;
        for (std::size_t k = 0; k < parts.size(); ++k) {
            const auto& pb = parts[k]->basis;
            const auto sp = std::find_if(pb.redox_splits.begin(), pb.redox_splits.end(),
                                         [&](const auto& x) { return x.component == comp; });
            const bool holds = std::any_of(pb.components.begin(), pb.components.end(),
                                           [&](const auto& c) { return c.component == comp && c.value > 0; });
            if (sp != pb.redox_splits.end()) split_e += w[k] / sum * sp->electron_total;
            else if (holds) apart_everywhere = false;
        }
        if (apart_everywhere) {
            in.redox_splits.push_back({comp, split_e});
        } else {
            any_redox = true;
            electrons += split_e;
            merged.push_back(comp);
        }
    }
    in.pe.reset();
    in.electron_total.reset();
    if (any_redox) in.electron_total = electrons;
    equilibrium::SpeciationResult r = solve(db, in, &parts.front()->result);
    WaterState out = finish(db, s.label, in, std::move(r));
    if (!merged.empty())
        out.result.warnings.push_back(given_by_state(db, merged) + " in one water and at the redox level of another: "
                                      "in the blend its states follow one electron balance");
    return out;
}

WaterState do_concentrate(const thermo::Database& db, const Step& s, const ConcentrateStep& c, const WaterState& from) {
    if (const std::string problem = concentration_factor_problem(c.factor); !problem.empty())
        throw InputError(s.where, "factor", problem);
    equilibrium::SpeciationInput in = from.basis;
    in.label = s.label;
    for (auto& comp : in.components) comp.value *= c.factor;
    in.charge_imbalance_eq *= c.factor;
    if (in.electron_total) *in.electron_total *= c.factor;
    for (auto& sp : in.redox_splits) sp.electron_total *= c.factor;
    in.minerals.clear();
    in.gases.clear();
    for (std::size_t k = 0; k < c.precipitate.size(); ++k) {
        const SourceLocation at = k < c.precipitate_where.size() ? c.precipitate_where[k] : s.where;
        in.minerals.push_back({mineral_index(db, c.precipitate[k], at, "precipitate"), 0.0, std::nullopt,
                               /*may_form=*/true, /*may_dissolve=*/false});
    }
    const std::vector<std::string> notes = leave_out_absent(db, in);
    const std::vector<equilibrium::MineralTarget> allowed = in.minerals;
    equilibrium::SpeciationResult r = solve(db, in, &from.result);
    WaterState out = finish(db, s.label, in, std::move(r));
    for (const auto& n : notes) out.result.warnings.push_back(n);
    // The solids the step let precipitate stay in contact with the water: a later step that
    // equilibrates (temperature with equilibrate = true) may precipitate more of them, or
    // dissolve back what precipitated here, but no more.
    out.minerals.clear();
    for (std::size_t a = 0; a < allowed.size(); ++a) {
        const double formed = std::max(0.0, -out.result.transfers[a].moles);
        out.minerals.push_back({allowed[a].mineral, 0.0, formed, true, true});
    }
    return out;
}

WaterState do_temperature(const thermo::Database& db, const Step& s, const TemperatureStep& t, const WaterState& from) {
    equilibrium::SpeciationInput in = from.basis;
    in.label = s.label;
    in.temperature_c = t.temperature_c;
    in.minerals.clear();
    in.gases.clear();
    std::string redox_note;
    if (t.equilibrate) {
        in.minerals = from.minerals;
        in.gases = from.gases;
        redox_note = bring_to_one_redox_level(db, s, in);
    }
    equilibrium::SpeciationResult r = solve(db, in, &from.result);
    WaterState out = finish(db, s.label, in, std::move(r));
    if (!t.equilibrate) {
        // Nothing equilibrates, but what was in contact stays in contact.
        out.minerals = from.minerals;
        out.gases = from.gases;
    }
    if (!redox_note.empty()) out.result.warnings.push_back(redox_note);
    if (t.equilibrate && from.minerals.empty() && from.gases.empty())
        out.result.warnings.push_back("equilibrate = true, but no mineral or gas was in contact with the water: nothing moved");
    return out;
}

const WaterState& find_state(const std::map<std::string, WaterState>& known, const std::string& name,
                             const SourceLocation& where, const std::string& key) {
    auto it = known.find(name);
    if (it != known.end()) return it->second;
    std::vector<std::string> names;
    for (const auto& [n, w] : known) names.push_back(n);
    throw InputError(where, key, "no water or earlier step is called '" + name + "'", nearest_name(name, names));
}

}  // namespace

std::string concentration_factor_problem(double factor) {
    // A recovery of exactly 0.999 gives 1/(1 - 0.999), a hair above 1000 in binary: allowed.
    if (factor >= min_concentration_factor && factor <= max_concentration_factor * (1.0 + 1e-12)) return "";
    return "expected a concentration factor from " + message_number(min_concentration_factor) + " to " +
           message_number(max_concentration_factor) + " (a recovery from 0 to " +
           message_number(1.0 - 1.0 / max_concentration_factor) + "), found " + message_number(factor);
}

std::string recovery_problem(double recovery) {
    const double max_recovery = 1.0 - 1.0 / max_concentration_factor;
    if (recovery >= 0.0 && recovery <= max_recovery) return "";
    return "expected a recovery (the fraction of the water removed) from 0 to " + message_number(max_recovery) +
           " (a concentration factor from " + message_number(min_concentration_factor) + " to " +
           message_number(max_concentration_factor) + "), found " + message_number(recovery);
}

const std::vector<std::string>& amount_units() {
    static const std::vector<std::string> names = [] {
        std::vector<std::string> out;
        for (const auto& u : concentration_unit_table())
            if (is_amount_unit(u)) out.emplace_back(u.name);
        return out;
    }();
    return names;
}

std::string amount_unit_problem(std::string_view unit) {
    const ConcentrationUnit* u = find_concentration_unit(unit);
    if (u && is_amount_unit(*u)) return "";
    const std::string expected = "; expected one of: " + name_list(amount_units());
    if (!u) return "unknown unit of amount '" + std::string(unit) + "'" + expected;
    if (u->measure == ConcentrationUnit::Measure::equivalents)
        return "'" + std::string(unit) + "' counts equivalents, which a neutral reagent does not have; give the dose as a "
               "mass or an amount" + expected;
    return "'" + std::string(unit) + "' is per kg of solution; give a dose per kg of water (mg/kgw) or per litre (mg/L)" +
           expected;
}

std::string amount_unit_suggestion(std::string_view unit) {
    const ConcentrationUnit* u = find_concentration_unit(unit);
    if (!u) return nearest_name(std::string(unit), amount_units());
    if (u->measure == ConcentrationUnit::Measure::equivalents) return "";
    if (u->basis == ConcentrationUnit::Basis::per_kg_solution) return "mg/kgw";
    return "";
}

std::string_view step_kind(const Step& s) {
    return std::visit([](const auto& a) { return std::decay_t<decltype(a)>::kind; }, s.action);
}

WaterState state_from_result(const equilibrium::SpeciationResult& r, const equilibrium::SpeciationInput& input,
                             const thermo::Database& db) {
    WaterState w;
    w.label = r.label;
    w.basis = input;
    w.basis.ph.reset();
    w.basis.charge_balance_component.reset();
    w.basis.minerals.clear();
    w.basis.gases.clear();
    take_totals(db, r, w.basis);
    // The charge imbalance of the analysis, in eq/kgw, is what the steps conserve; and with a
    // redox level, its electrons (oxygen, ferric iron, ...) rather than its pe. A step that
    // held a gas which brings electrons (O2 takes 4 per mole) changed them: count them from
    // the species, as for a water given at a fixed pe.
    w.basis.charge_imbalance_eq = (r.cations_meq - r.anions_meq) / 1000.0;
    if ((input.pe || input.electron_total) && db.electron()) {
        w.basis.pe.reset();
        w.basis.electron_total = r.component_totals[*db.electron()];
    }
    w.basis.kg_water_per_litre = r.kg_water_per_litre;
    w.result = r;
    w.indices = water_treatment_indices(db, w);
    return w;
}

std::vector<StepOutcome> run_steps(const thermo::Database& db, const std::vector<WaterState>& waters,
                                   const std::vector<Step>& steps) {
    std::map<std::string, WaterState> known;
    for (const auto& w : waters) known[w.label] = w;
    std::vector<StepOutcome> out;
    const WaterState* previous = waters.empty() ? nullptr : &waters.back();
    for (const auto& s : steps) {
        const WaterState* from = previous;
        if (!s.water.empty()) from = &find_state(known, s.water, s.water_where, "water");
        if (!from) throw InputError(s.where, "water", "the first step needs a water to start from");
        StepOutcome o;
        o.label = s.label;
        o.kind = std::string(step_kind(s));
        // One lambda per kind: a kind added to StepAction and not handled here does not compile.
        std::visit(Overloaded{
                       [&](const EquilibrateStep& e) { o.state = do_equilibrate(db, s, e, *from); },
                       [&](const DoseStep& d) {
                           StepOutcome r = do_dose(db, s, d, *from);
                           o.state = std::move(r.state);
                           o.dose = r.dose;
                       },
                       [&](const BlendStep& b) {
                           std::vector<const WaterState*> parts;
                           for (std::size_t k = 0; k < b.parts.size(); ++k)
                               parts.push_back(&find_state(known, b.parts[k].first,
                                                           k < b.part_where.size() ? b.part_where[k] : s.where,
                                                           "waters"));
                           o.state = do_blend(db, s, b, parts);
                       },
                       [&](const ConcentrateStep& c) { o.state = do_concentrate(db, s, c, *from); },
                       [&](const TemperatureStep& t) { o.state = do_temperature(db, s, t, *from); },
                   },
                   s.action);
        known[s.label] = o.state;
        out.push_back(std::move(o));
        previous = &known[s.label];
    }
    return out;
}

}  // namespace deltag::process
