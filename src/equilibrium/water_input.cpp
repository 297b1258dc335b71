// A water as a lab reports it -> solver input (SpeciationInput): analytes resolved to
// database components, concentrations converted to mol/kgw (eq/kgw for alkalinity), "as"
// applied, pH, pe and the charge-balance choice set.
//
// Units (concentration_unit_table). Each unit has a basis and a measure:
//   per litre of solution:      mg/L, ug/L = µg/L, g/L (mass), mmol/L, umol/L, mol/L (amount), meq/L (equivalents)
//   per kg of solution:         mg/kg = ppm (mass)
// "ppm" is taken as it is defined, parts per million by mass: 1 mg per kg of solution, not
// 1 mg/L. The two differ by the solution density (about 0.3 % for a fresh water at 25 °C,
// more for a brine); a lab that writes ppm for mg/L should be read as mg/L.
//   per kg of water:            mol/kgw, mmol/kgw, umol/kgw (amount), mg/kgw, g/kgw (mass)
// A mass refers to the analyte's mass_formula (SO4, SiO2, HCO3 for alkalinity), or to the
// substance named by "as"; an amount (mol) refers to the same formula unit; equivalents are
// divided by |charge| of the component (for alkalinity they are the result directly).
//
// "as". "CaCO3" means the value is equivalents expressed as CaCO3: one equivalent is
// M(CaCO3)/2 = 50.04 g (100.09/2), so eq = mg / 50.04 and moles of a component of charge z
// are eq / |z| (Ca as CaCO3: mg / 100.09). An element symbol E found in the mass formula
// means the mass is of that element only: moles of formula units = mg / M(E) / (atoms of E
// in the formula) (NO3 as N: mg / 14.007). The mass formula itself is accepted too ("NO3 as
// NO3"), and means the same as no "as".
//
// From per litre and per kg of solution to per kg of water (an approximation, stated):
// the kg of water in a litre of solution is taken as the solution density minus the mass of
// the dissolved solids in that litre, the dissolved solids being the sum of the analytes'
// masses (each as its mass_formula; alkalinity as HCO3); water of hydration, unreported
// solutes and the mass the solver later adds or removes are ignored. The solution density
// is density_kg_per_l when given, otherwise the density of pure water at the water's
// temperature (Kell 1975), which for a dilute water (dissolved solids below about 1 g/L)
// errs by less than about 0.1 % in the kg of water per litre; give density_kg_per_l for a
// brine. Per kg of solution the kg of water per kg is 1 minus the dissolved-solids mass
// fraction. With units of several bases in one water the same balance is solved jointly:
//   rho = W + mL + ws*rho + mw*W,   so   W = (rho*(1 - ws) - mL) / (1 + mw)
// with W the kg of water per litre, rho the solution density in kg/L, mL the dissolved mass
// given per litre (kg/L), ws the mass fraction given per kg of solution, and mw the mass per
// kg of water of the analytes given per kg of water.

#include "deltag/water.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>
#include <sstream>

#include "deltag/chem.hpp"
#include "deltag/reference_electrodes.hpp"
#include "deltag/water_properties.hpp"
#include "chem/names.hpp"

namespace deltag {

namespace {

// The micro prefix as labs type it: "u", the micro sign U+00B5 or the Greek mu U+03BC (the
// same glyph in most fonts); all three mean 1e-6.
std::string plain_micro(std::string_view u) {
    for (std::string_view mu : {"\u00B5", "\u03BC"})
        if (u.substr(0, mu.size()) == mu) {
            std::string plain(1, 'u');
            plain.append(u.substr(mu.size()));
            return plain;
        }
    return std::string(u);
}

}  // namespace

const std::vector<ConcentrationUnit>& concentration_unit_table() {
    using B = ConcentrationUnit::Basis;
    using M = ConcentrationUnit::Measure;
    static const std::vector<ConcentrationUnit> table = {
        {"mg/L", B::per_litre, M::mass, 1e-3},
        {"ug/L", B::per_litre, M::mass, 1e-6},
        {"g/L", B::per_litre, M::mass, 1.0},
        {"mol/L", B::per_litre, M::amount, 1.0},
        {"mmol/L", B::per_litre, M::amount, 1e-3},
        {"umol/L", B::per_litre, M::amount, 1e-6},
        {"meq/L", B::per_litre, M::equivalents, 1e-3},
        {"mg/kg", B::per_kg_solution, M::mass, 1e-3},
        {"ppm", B::per_kg_solution, M::mass, 1e-3},
        {"mol/kgw", B::per_kg_water, M::amount, 1.0},
        {"mmol/kgw", B::per_kg_water, M::amount, 1e-3},
        {"umol/kgw", B::per_kg_water, M::amount, 1e-6},
        {"mg/kgw", B::per_kg_water, M::mass, 1e-3},
        {"g/kgw", B::per_kg_water, M::mass, 1.0},
    };
    return table;
}

const ConcentrationUnit* find_concentration_unit(std::string_view unit) {
    const std::string u = plain_micro(unit);
    for (const auto& e : concentration_unit_table())
        if (e.name == u) return &e;
    return nullptr;
}

const std::vector<std::string>& concentration_units() {
    static const std::vector<std::string> names = [] {
        std::vector<std::string> out;
        for (const auto& e : concentration_unit_table()) {
            out.emplace_back(e.name);
            if (e.name.front() == 'u') out.push_back("\u00B5" + std::string(e.name.substr(1)));
        }
        return out;
    }();
    return names;
}

namespace {

using Basis = ConcentrationUnit::Basis;
using Measure = ConcentrationUnit::Measure;

std::string water_key(const WaterAnalysis& w) {
    // Same quoting as the case reader: bare words stay bare.
    const bool bare = !w.name.empty() && std::all_of(w.name.begin(), w.name.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
    return "water." + (bare ? w.name : "\"" + w.name + "\"");
}

std::string analyte_key(const WaterAnalysis& w, const AnalyteValue& a) {
    if (!a.key.empty()) return a.key;
    const bool bare = !a.name.empty() && std::all_of(a.name.begin(), a.name.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
    return water_key(w) + ".analytes." + (bare ? a.name : "\"" + a.name + "\"");
}

// The analytes a water's table takes as keys: the database's, less the redox states (those are
// keys inside their element's table: Fe = { "+2" = ..., "+3" = ... }).
std::vector<std::string> analyte_keys(const thermo::Database& db) {
    std::vector<std::string> out;
    for (const auto& an : db.analytes())
        if (an.kind != thermo::Analyte::Kind::redox_state) out.push_back(an.name);
    return out;
}

// One analyte after unit conversion, still on its own basis.
struct Converted {
    const AnalyteValue* given = nullptr;
    const thermo::Analyte* analyte = nullptr;
    Basis basis = Basis::per_litre;
    double amount = 0.0;   // mol of component (eq for alkalinity) per L, kg solution or kg water
    double mass_kg = 0.0;  // dissolved mass (as mass_formula) per the same basis, kg
};

// The "as" values an analyte accepts: CaCO3 (alkalinity, or a charged component), the
// elements of its mass formula other than H and O (all of them if it has no other), and the
// mass formula itself.
std::vector<std::string> allowed_as(const thermo::Analyte& an, int charge) {
    std::vector<std::string> out;
    const bool alkalinity = an.kind == thermo::Analyte::Kind::alkalinity;
    if (alkalinity || charge != 0) out.push_back("CaCO3");
    if (!alkalinity) {
        std::vector<std::string> elements;
        for (const auto& [el, n] : an.mass_formula.elements)
            if (el != "H" && el != "O" && n > 0) elements.push_back(el);
        if (elements.empty())
            for (const auto& [el, n] : an.mass_formula.elements)
                if (n > 0) elements.push_back(el);
        out.insert(out.end(), elements.begin(), elements.end());
    }
    if (std::find(out.begin(), out.end(), an.mass_formula.text) == out.end())
        out.push_back(an.mass_formula.text);
    return out;
}

Converted convert(const WaterAnalysis& w, const AnalyteValue& a, const thermo::Analyte& an,
                  const thermo::Database& db) {
    const std::string key = analyte_key(w, a);
    const std::string unit = a.unit.empty() ? w.units : a.unit;
    const ConcentrationUnit* info = find_concentration_unit(unit);
    if (!info)
        throw InputError(a.where, key,
                         "unknown concentration unit '" + unit + "'; expected one of: " +
                             name_list(concentration_units()),
                         nearest_name(unit, concentration_units()));

    const thermo::Species& comp = db.species()[an.component];
    const int z = comp.formula.charge;
    const bool alkalinity = an.kind == thermo::Analyte::Kind::alkalinity;

    // Component moles (or equivalents) per formula unit of the mass formula.
    double per_formula = an.per_component;
    if (alkalinity) {
        per_formula = an.per_component * comp.alkalinity;
        if (!(per_formula > 0.0))
            throw InputError(an.where, "analytes." + an.name,
                             "analyte " + an.name + " is of kind alkalinity but its component " +
                                 comp.name + " carries no alkalinity in the database '" + db.name() +
                                 "'; the database must give the component an alkalinity");
    }

    // The reference substance a mass or an amount refers to: its molar mass and the
    // component moles (or eq) per mole of it.
    double ref_molar_mass = an.mass_formula.molar_mass();
    double per_ref = per_formula;
    if (!a.as.empty()) {
        const auto allowed = allowed_as(an, z);
        if (std::find(allowed.begin(), allowed.end(), a.as) == allowed.end())
            throw InputError(a.where, key + ".as",
                             "analyte " + a.name + " cannot be given as '" + a.as +
                                 "'; expected one of: " + name_list(allowed),
                             nearest_name(a.as, allowed));
        if (info->measure == Measure::equivalents && a.as != "CaCO3")
            throw InputError(a.where, key + ".as",
                             "'as' = '" + a.as + "' does not apply to a value in " + unit +
                                 ": equivalents are counted per charge; leave 'as' out or use a "
                                 "mass or mol unit");
        if (a.as == "CaCO3") {
            // One mole of CaCO3 is two equivalents.
            ref_molar_mass = chem::parse_formula("CaCO3").molar_mass();
            per_ref = alkalinity ? 2.0 : 2.0 / std::abs(z);
        } else if (a.as != an.mass_formula.text) {
            ref_molar_mass = *chem::atomic_weight(a.as);
            per_ref = per_formula / an.mass_formula.atoms(a.as);
        }
    }

    Converted c;
    c.given = &a;
    c.analyte = &an;
    c.basis = info->basis;
    const double v = a.value * info->scale;
    switch (info->measure) {
        case Measure::mass: c.amount = v / ref_molar_mass * per_ref; break;
        case Measure::amount: c.amount = v * per_ref; break;
        case Measure::equivalents:
            if (alkalinity) {
                c.amount = v;
            } else {
                if (z == 0)
                    throw InputError(a.where, key,
                                     "a value in " + unit + " needs a charged component, and " + a.name +
                                         " gives " + comp.name +
                                         ", which has no charge; use a mass or mol unit");
                c.amount = v / std::abs(z);
            }
            break;
    }
    // Dissolved mass, as the mass formula (alkalinity: as HCO3, its mass formula).
    c.mass_kg = c.amount / per_formula * an.mass_formula.molar_mass() * 1e-3;
    return c;
}

// HCO3 and CO3 as a lab reports them (bicarbonate and carbonate, mg/L as the ion), for a
// database without analytes of those names: both are taken as the water's total alkalinity,
// each ion counting its charge in equivalents,
//   alkalinity (eq) = HCO3 (mol) + 2 CO3 (mol),
// which in the trade's units is the Standard Methods 2320 B relation (Standard Methods for
// the Examination of Water and Wastewater, method 2320 B, "Calculation": bicarbonate as
// HCO3 = 1.22 x bicarbonate alkalinity as CaCO3, carbonate as CO3 = 0.60 x carbonate
// alkalinity as CaCO3; from memory)
//   alkalinity as CaCO3 (mg/L) = 50.04 x (HCO3 / 61.02 + 2 CO3 / 60.01),
// 50.04 = M(CaCO3)/2, 61.02 = M(HCO3), 60.01 = M(CO3) (1.22 = 61.02/50.04 and
// 0.60 = 60.01/(2 x 50.04)). Hydroxide and the weak bases other than carbonate are
// neglected, as the relation does. "as CaCO3" means the value is already alkalinity as CaCO3.
bool is_carbonate_ion(const std::string& name, const thermo::Database& db) {
    return (name == "HCO3" || name == "CO3") && !db.find_analyte(name);
}

Converted convert_carbonate_ion(const WaterAnalysis& w, const AnalyteValue& a, const thermo::Analyte& alkalinity) {
    const std::string key = analyte_key(w, a);
    const std::string unit = a.unit.empty() ? w.units : a.unit;
    const ConcentrationUnit* info = find_concentration_unit(unit);
    if (!info)
        throw InputError(a.where, key,
                         "unknown concentration unit '" + unit + "'; expected one of: " + name_list(concentration_units()),
                         nearest_name(unit, concentration_units()));
    const chem::Formula ion = chem::parse_formula(a.name);
    const int z = a.name == "HCO3" ? 1 : 2;
    const std::vector<std::string> allowed = {"CaCO3", a.name};
    if (!a.as.empty() && std::find(allowed.begin(), allowed.end(), a.as) == allowed.end())
        throw InputError(a.where, key + ".as",
                         a.name + " cannot be given as '" + a.as + "'; expected one of: " + name_list(allowed) +
                             " (or leave 'as' out: the mass of the ion " + a.name + ")",
                         nearest_name(a.as, allowed));
    const bool as_caco3 = a.as == "CaCO3";
    if (as_caco3 && info->measure != Measure::mass)
        throw InputError(a.where, key + ".as",
                         "'as' = 'CaCO3' applies to a mass (mg/L as CaCO3), not to a value in " + unit +
                             "; leave 'as' out");
    const double v = a.value * info->scale;
    Converted c;
    c.given = &a;
    c.analyte = &alkalinity;
    c.basis = info->basis;
    switch (info->measure) {
        case Measure::mass:
            c.amount = as_caco3 ? v / (chem::parse_formula("CaCO3").molar_mass() / 2.0) : v / ion.molar_mass() * z;
            break;
        case Measure::amount: c.amount = v * z; break;
        case Measure::equivalents: c.amount = v; break;
    }
    c.mass_kg = c.amount / z * ion.molar_mass() * 1e-3;  // dissolved mass as the ion
    return c;
}

}  // namespace

bool is_concentration_unit(std::string_view unit) { return find_concentration_unit(unit) != nullptr; }

// Values below the detection limit. The default is half the limit: zero would drop a
// substance the lab could not rule out, the limit would count the largest amount it could
// be; half lies between and is the usual substitution when few values of an analysis are
// below detection (US EPA, Guidance for Data Quality Assessment, EPA QA/G-9, 2000, section
// 4.7; from memory; common practice).
const std::vector<std::string>& below_detection_rules() {
    static const std::vector<std::string> rules = {"half", "zero", "limit"};
    return rules;
}

namespace {

double below_detection_factor(const std::string& rule) {
    if (rule == "zero") return 0.0;
    if (rule == "limit") return 1.0;
    return 0.5;
}

// "0.05 mg/L" or "0.05 mg/L as N": a value in the lab's unit, for a note.
std::string with_unit(double v, const WaterAnalysis& w, const AnalyteValue& a) {
    return message_number(v) + " " + (a.unit.empty() ? w.units : a.unit) + (a.as.empty() ? "" : " as " + a.as);
}

}  // namespace

equilibrium::SpeciationInput to_speciation_input(const WaterAnalysis& water, const thermo::Database& db,
                                                 activity::ModelKind model) {
    using equilibrium::ComponentInput;
    const std::string wkey = water_key(water);
    const std::string cb_key = wkey + ".charge_balance";

    equilibrium::SpeciationInput in;

    // Values below the detection limit take the value the water's rule gives them.
    const std::vector<AnalyteValue> analytes = [&] {
        std::vector<AnalyteValue> out = water.analytes;
        const double factor = below_detection_factor(water.below_detection);
        std::string listed;
        for (AnalyteValue& a : out) {
            if (!a.below_detection) continue;
            listed += (listed.empty() ? "" : ", ") + a.name + " <" + with_unit(a.value, water, a) + ": " +
                      with_unit(a.value * factor, water, a);
            a.value *= factor;
        }
        if (!listed.empty()) {
            const std::string rule = water.below_detection == "half"   ? "half the detection limit"
                                     : water.below_detection == "zero" ? "zero"
                                                                       : "the detection limit itself";
            in.notes.push_back("values below the detection limit taken as " + rule + " (below_detection = \"" +
                               water.below_detection + "\"" +
                               (water.below_detection_where.line == 0 ? ", the default" : "") + "): " + listed);
        }
        return out;
    }();

    // Resolve and convert every analyte; one analyte per component.
    std::vector<Converted> converted;
    std::map<std::size_t, const AnalyteValue*> by_component;
    std::vector<const AnalyteValue*> carbonate_ions;  // HCO3, CO3: see convert_carbonate_ion
    for (const AnalyteValue& a : analytes) {
        if (is_carbonate_ion(a.name, db)) {
            carbonate_ions.push_back(&a);
            continue;
        }
        const auto ai = db.find_analyte(a.name);
        if (!ai && !a.oxidation_state.empty()) {
            // Fe = { "+4" = ... }: the states the database knows for the element, if any.
            std::vector<std::string> states;
            for (const auto& an : db.analytes())
                if (an.kind == thermo::Analyte::Kind::redox_state && an.name.starts_with(a.element + " "))
                    states.push_back(an.name.substr(a.element.size() + 1));
            if (states.empty()) {
                std::vector<std::string> elements;
                for (const auto& an : db.analytes())
                    if (an.kind == thermo::Analyte::Kind::redox_state) {
                        const std::string el = an.name.substr(0, an.name.find(' '));
                        if (std::find(elements.begin(), elements.end(), el) == elements.end()) elements.push_back(el);
                    }
                throw InputError(a.where, analyte_key(water, a),
                                 "the database '" + db.name() + "' gives no redox states of " + a.element +
                                     (elements.empty() ? std::string(" (it gives none for any element)")
                                                       : " (it gives them for " + name_list(elements) + ")") +
                                     "; give its total instead: " + a.element + " = ...");
            }
            throw InputError(a.where, analyte_key(water, a),
                             "the database '" + db.name() + "' has no redox state " + a.oxidation_state + " of " +
                                 a.element + "; its states of " + a.element + ": " + name_list(states));
        }
        if (!ai) {
            auto names = analyte_keys(db);
            for (const char* ion : {"HCO3", "CO3"})
                if (is_carbonate_ion(ion, db)) names.push_back(ion);
            throw InputError(a.where, analyte_key(water, a),
                             "unknown analyte '" + a.name + "'; it is not an analyte of the database '" + db.name() +
                                 "' (its analytes: " + name_list(names) + ")",
                             nearest_name(a.name, names));
        }
        const thermo::Analyte& an = db.analytes()[*ai];
        const auto [it, fresh] = by_component.emplace(an.component, &a);
        // Redox states of one element (Fe +2, Fe +3) share a component; anything else doesn't.
        const bool states = an.kind == thermo::Analyte::Kind::redox_state &&
                            db.analytes()[*db.find_analyte(it->second->name)].kind == thermo::Analyte::Kind::redox_state &&
                            it->second->name != a.name;
        if (!fresh && !states) {
            const AnalyteValue& first = *it->second;
            throw InputError(a.where, analyte_key(water, a),
                             first.name + " (line " + std::to_string(first.where.line) + ") and " + a.name +
                                 " both give component " + db.species()[an.component].name +
                                 "; give only one of them");
        }
        converted.push_back(convert(water, a, an, db));
    }
    const std::size_t first_carbonate_ion = converted.size();
    if (!carbonate_ions.empty()) {
        const AnalyteValue& ion = *carbonate_ions.front();
        const auto& all = db.analytes();
        const auto alk = std::find_if(all.begin(), all.end(),
                                      [](const thermo::Analyte& x) { return x.kind == thermo::Analyte::Kind::alkalinity; });
        if (alk == all.end())
            throw InputError(ion.where, analyte_key(water, ion),
                             ion.name + " is taken as alkalinity, and the database '" + db.name() +
                                 "' has no analyte of kind alkalinity to take it");
        if (const auto it = by_component.find(alk->component); it != by_component.end()) {
            const AnalyteValue& other = *it->second;
            const bool is_alkalinity = db.analytes()[*db.find_analyte(other.name)].kind == thermo::Analyte::Kind::alkalinity;
            throw InputError(ion.where, analyte_key(water, ion),
                             ion.name + " is taken as alkalinity (HCO3 and CO3 together give the total alkalinity, "
                                        "Standard Methods 2320 B), and " +
                                 other.name + " (line " + std::to_string(other.where.line) + ") " +
                                 (is_alkalinity ? "gives the alkalinity too; give the alkalinity once: as HCO3 and CO3, "
                                                  "or as " + other.name
                                                : "gives the carbonate as a total; give HCO3 and CO3 (the alkalinity, "
                                                  "with a measured pH) or " + other.name + ", not both"));
        }
        for (const AnalyteValue* a : carbonate_ions) converted.push_back(convert_carbonate_ion(water, *a, *alk));
    }

    // Per litre and per kg of solution to per kg of water (see the comment at the top).
    double mass_per_litre = 0.0, mass_fraction = 0.0, mass_per_kgw = 0.0;
    for (const auto& c : converted) {
        switch (c.basis) {
            case Basis::per_litre: mass_per_litre += c.mass_kg; break;
            case Basis::per_kg_solution: mass_fraction += c.mass_kg; break;
            case Basis::per_kg_water: mass_per_kgw += c.mass_kg; break;
        }
    }
    const double rho = water.density_kg_per_l ? *water.density_kg_per_l
                                              : thermo::water_density_kg_m3(water.temperature_c) / 1000.0;
    const double water_per_litre = (rho * (1.0 - mass_fraction) - mass_per_litre) / (1.0 + mass_per_kgw);
    if (!(water_per_litre > 0.0))
        throw InputError(water.where, wkey,
                         "the analytes add up to more dissolved mass than the solution holds (" +
                             message_number(mass_per_litre * 1000.0) + " g per litre, mass fraction " +
                             message_number(mass_fraction) + ", against a density of " + message_number(rho) +
                             " kg/L); check the units");

    in.label = water.name;
    in.temperature_c = water.temperature_c;
    in.activity_model = model;
    in.ph = water.ph;
    in.pe = water.pe;
    const int redox_levels = (water.pe ? 1 : 0) + (water.eh_mv ? 1 : 0) + (water.dissolved_oxygen_mg_per_l ? 1 : 0);
    if (redox_levels > 1)
        throw InputError(water.eh_mv ? water.eh_where : water.dissolved_oxygen_where, wkey,
                         "give one redox level: pe, eh_mv or dissolved_oxygen_mg_per_l, not several");
    if (water.eh_mv) {
        // An electrode reading: to SHE at the water's temperature, then pe = F Eh/(RT ln10).
        const double eh_she = *water.eh_mv / 1000.0 + electro::reference_v(water.eh_reference, water.temperature_c, water.eh_where);
        in.pe = electro::pe_from_eh(eh_she, water.temperature_c);
    }
    if (water.dissolved_oxygen_mg_per_l) {
        // pe of the O2/H2O couple at the measured pH: from the formation of O2(aq),
        // log a(O2) = log K + 2 log a(H2O) - 4 log a(H+) - 4 log a(e-), with a(H2O) = 1 and
        // gamma(O2) = 1 (both within about 0.01 in pe for fresh waters).
        const std::string key = wkey + ".dissolved_oxygen_mg_per_l";
        if (!water.ph)
            throw InputError(water.dissolved_oxygen_where, key, "dissolved oxygen sets the redox level only with a measured pH");
        const auto o2 = db.find_species("O2(aq)");
        if (!o2 || !db.electron())
            throw InputError(water.dissolved_oxygen_where, key, "the database '" + db.name() + "' has no O2(aq) or no e- to use the dissolved oxygen");
        if (!(*water.dissolved_oxygen_mg_per_l > 0))
            throw InputError(water.dissolved_oxygen_where, key, "dissolved oxygen of 0 gives no redox level: give pe or eh_mv instead");
        const double o2_molar_mass = 2.0 * chem::atomic_weight("O").value();
        const double m_o2 = *water.dissolved_oxygen_mg_per_l / 1000.0 / o2_molar_mass / water_per_litre;
        const double log_k = db.species()[*o2].log_k(water.temperature_c);
        in.pe = (std::log10(m_o2) - log_k) / 4.0 - *water.ph;
    }
    in.kg_water_per_litre = water_per_litre;
    std::map<std::size_t, std::pair<double, double>> states;  // component -> total, electrons
    std::map<std::size_t, int> state_count;
    for (const auto& c : converted) {
        double molality = c.amount;
        if (c.basis == Basis::per_litre) molality = c.amount / water_per_litre;
        if (c.basis == Basis::per_kg_solution) molality = c.amount * rho / water_per_litre;
        if (c.analyte->kind == thermo::Analyte::Kind::redox_state) {
            auto& [tot, el] = states[c.analyte->component];
            tot += molality;
            el += c.analyte->electrons * molality;
            if (molality > 0) state_count[c.analyte->component] += 1;
            continue;
        }
        if (molality > 0.0) {
            const auto kind = c.analyte->kind == thermo::Analyte::Kind::alkalinity
                                  ? ComponentInput::Kind::alkalinity
                                  : ComponentInput::Kind::total;
            // HCO3 and CO3 add up to one alkalinity.
            const auto same = std::find_if(in.components.begin(), in.components.end(), [&](const ComponentInput& ci) {
                return ci.component == c.analyte->component && ci.kind == kind;
            });
            if (same != in.components.end() && kind == ComponentInput::Kind::alkalinity) same->value += molality;
            else in.components.push_back(ComponentInput{c.analyte->component, kind, molality});
        }
    }
    if (!carbonate_ions.empty()) {
        double eq_per_kgw = 0.0;
        std::string given;
        for (std::size_t i = first_carbonate_ion; i < converted.size(); ++i) {
            const Converted& c = converted[i];
            eq_per_kgw += c.basis == Basis::per_litre          ? c.amount / water_per_litre
                          : c.basis == Basis::per_kg_solution ? c.amount * rho / water_per_litre
                                                              : c.amount;
            given += (given.empty() ? "" : " and ") + c.given->name + " " + with_unit(c.given->value, water, *c.given);
        }
        // Back to a litre of solution for the trade's unit: eq/kgw x kgw/L x 50.04 g/eq.
        const double caco3_eq_g = chem::parse_formula("CaCO3").molar_mass() / 2.0;
        in.notes.push_back(given + " taken as total alkalinity, " + message_number(eq_per_kgw * water_per_litre * caco3_eq_g * 1e3) +
                           " mg/L as CaCO3 (" + message_number(eq_per_kgw * 1e3) +
                           " meq/kgw): alkalinity as CaCO3 = 50.04 x (HCO3/61.02 + 2 CO3/60.01) mg/L, Standard Methods "
                           "2320 B; hydroxide and other weak bases neglected");
    }
    // Redox states given apart: the element's total, and its electrons as a split.
    for (const auto& [comp, te] : states) {
        if (state_count[comp] < 2)
            throw InputError(by_component[comp]->where, analyte_key(water, *by_component[comp]),
                             "redox states of one element are given apart only in pairs (for example Fe = { \"+2\" = "
                             "..., \"+3\" = ... }, both above 0); for one state alone, give the element's total "
                             "instead: " + by_component[comp]->element + " = ...");
        in.components.push_back(ComponentInput{comp, ComponentInput::Kind::total, te.first});
        in.redox_splits.push_back({comp, te.second});
    }

    // Charge balance. No choice and no measured pH: balance on pH (as the case reader does).
    const std::string cb = water.charge_balance.empty() && !water.ph ? "pH" : water.charge_balance;
    if (cb == "pH") {
        if (water.ph)
            throw InputError(water.charge_balance_where, cb_key,
                             "charge_balance = \"pH\" contradicts the measured pH = " + message_number(*water.ph) +
                                 "; give the measured pH, or leave it out and balance on pH, not both");
        in.ph.reset();
        // Alkalinity is the charge excess of the conservative ions, so with an alkalinity
        // given, the charge balance no longer depends on pH and cannot fix it.
        for (const auto& c : in.components)
            if (c.kind == ComponentInput::Kind::alkalinity)
                throw InputError(water.charge_balance.empty() ? water.where : water.charge_balance_where,
                                 water.charge_balance.empty() ? wkey : cb_key,
                                 "the pH cannot come from the charge balance when the alkalinity is given (the "
                                 "alkalinity already fixes the charge balance): give the measured pH, or give the "
                                 "carbonate as DIC instead of Alkalinity");
    } else if (!cb.empty()) {
        const auto ai = db.find_analyte(cb);
        if (!ai) {
            auto names = analyte_keys(db);
            names.insert(names.begin(), "pH");
            throw InputError(water.charge_balance_where, cb_key,
                             "cannot balance the charge on '" + cb + "': expected \"pH\" or an analyte of the database '" +
                                 db.name() + "' (" + name_list(analyte_keys(db)) + ")",
                             nearest_name(cb, names));
        }
        const thermo::Analyte& an = db.analytes()[*ai];
        if (an.kind != thermo::Analyte::Kind::total)
            throw InputError(water.charge_balance_where, cb_key,
                             "cannot balance the charge on " + cb +
                                 ": it is an alkalinity, not a total; choose a total such as Cl or Na, or \"pH\"");
        if (db.species()[an.component].formula.charge == 0)
            throw InputError(water.charge_balance_where, cb_key,
                             "cannot balance the charge on " + cb + ": its component " +
                                 db.species()[an.component].name + " has no charge; choose an ion such as Cl or Na, or \"pH\"");
        const bool listed = std::any_of(analytes.begin(), analytes.end(),
                                        [&](const AnalyteValue& a) { return a.name == cb; });
        if (!listed)
            throw InputError(water.charge_balance_where, cb_key,
                             "charge balance on " + cb + ", which is not among the analytes of water " +
                                 water.name + "; list it under [" + wkey + ".analytes], with 0 if it was not measured");
        if (!water.ph)
            throw InputError(water.charge_balance_where, cb_key,
                             "charge balance on " + cb + " needs a measured pH; give pH or set charge_balance = \"pH\"");
        in.charge_balance_component = an.component;
        // What the lab gave, for the report of the adjustment: one unit of it in mol/kgw.
        const AnalyteValue& given = *std::find_if(analytes.begin(), analytes.end(),
                                                  [&](const AnalyteValue& a) { return a.name == cb; });
        AnalyteValue one = given;
        one.value = 1.0;
        const Converted unit = convert(water, one, an, db);
        double per_unit = unit.amount;
        if (unit.basis == Basis::per_litre) per_unit = unit.amount / water_per_litre;
        if (unit.basis == Basis::per_kg_solution) per_unit = unit.amount * rho / water_per_litre;
        in.charge_balance_analyte = equilibrium::SpeciationInput::ChargeBalanceAnalyte{
            given.name, given.unit.empty() ? water.units : given.unit, given.as, given.value, per_unit};
        const bool present = std::any_of(in.components.begin(), in.components.end(),
                                         [&](const ComponentInput& c) { return c.component == an.component; });
        // A starting value for an analyte reported as 0: the solver adjusts it.
        if (!present) in.components.push_back(ComponentInput{an.component, ComponentInput::Kind::total, 1e-4});
    }
    return in;
}

void describe_lab_input(const equilibrium::SpeciationInput& input, equilibrium::SpeciationResult& result,
                        const thermo::Database& db) {
    result.warnings.insert(result.warnings.end(), input.notes.begin(), input.notes.end());
    describe_charge_balance_adjustment(input, result, db);
}

void describe_charge_balance_adjustment(const equilibrium::SpeciationInput& input, equilibrium::SpeciationResult& result,
                                        const thermo::Database& db) {
    if (!input.charge_balance_component || !input.charge_balance_analyte) return;
    const auto& a = *input.charge_balance_analyte;
    const std::size_t j = *input.charge_balance_component;
    if (j >= result.component_totals.size() || !(a.mol_per_kgw_per_unit > 0)) return;
    const int z = db.species()[j].formula.charge;
    equilibrium::ChargeBalanceAdjustment adj;
    adj.analyte = a.analyte;
    adj.unit = a.unit;
    adj.as = a.as;
    adj.given = a.given;
    adj.given_mmol_per_kgw = a.given * a.mol_per_kgw_per_unit * 1000.0;
    adj.adjusted_mmol_per_kgw = result.component_totals[j] * 1000.0;
    adj.adjusted = result.component_totals[j] / a.mol_per_kgw_per_unit;
    adj.change_meq_per_kgw = z * (adj.adjusted_mmol_per_kgw - adj.given_mmol_per_kgw);
    // The sums as given: the balanced sums less the charge the adjustment added (from the
    // speciated molalities, so ion pairs count as the solver speciates them).
    double cations = result.cations_meq, anions = result.anions_meq;
    if (z > 0) cations -= adj.change_meq_per_kgw;
    else anions += adj.change_meq_per_kgw;  // change < 0 for an anion raised
    cations = std::max(cations, 0.0);
    anions = std::max(anions, 0.0);
    adj.error_percent_as_given = equilibrium::charge_balance_error_percent(cations, anions);
    adj.within_acceptance = equilibrium::charge_balance_acceptable(cations, anions);
    if (!adj.within_acceptance) {
        std::ostringstream o;
        o.precision(4);
        o << "the charge balance changed " << a.analyte << " from " << adj.given << " to " << adj.adjusted << " " << a.unit
          << (a.as.empty() ? "" : " as " + a.as) << ": the analysis as given was off by "
          << std::abs(adj.change_meq_per_kgw) << " meq/kgw (" << adj.error_percent_as_given
          << " %), beyond the Standard Methods 1030 E acceptance; check the analysis before trusting the adjusted value";
        result.warnings.push_back(o.str());
    }
    result.charge_balance_adjustment = adj;
}

namespace equilibrium {

bool charge_balance_acceptable(double cations_meq, double anions_meq) {
    const double diff = std::abs(cations_meq - anions_meq);
    if (anions_meq <= 3.0) return diff <= 0.2;
    const double error = std::abs(charge_balance_error_percent(cations_meq, anions_meq));
    if (anions_meq <= 10.0) return error <= 2.0;
    return error <= 5.0;
}

double charge_balance_error_percent(double cations_meq, double anions_meq) {
    const double sum = cations_meq + anions_meq;
    return sum > 0 ? 100.0 * (cations_meq - anions_meq) / sum : 0.0;
}

}  // namespace equilibrium

}  // namespace deltag
