// Half-reactions: reading, E° (from a database electrode, or from the log K of the
// species), the Nernst potential, and the activities of a speciated water.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <set>
#include <sstream>
#include <string_view>
#include <utility>

#include "deltag/constants.hpp"
#include "deltag/electro.hpp"
#include "chem/names.hpp"

namespace deltag::electro {

namespace {

bool ends_with(const std::string& s, std::string_view tail) {
    return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

// The term's log K of formation from components, when the database knows the term.
std::optional<thermo::LogKFunction> formation_log_k(const thermo::Database& db, const HalfTerm& t) {
    switch (t.kind) {
        case HalfTerm::Kind::water: {
            thermo::LogKFunction zero;
            zero.terms.emplace_back(0.0, thermo::LogKModel{});
            return zero;
        }
        case HalfTerm::Kind::aqueous:
            if (auto i = db.find_species(t.name)) return db.species()[*i].log_k;
            return std::nullopt;
        case HalfTerm::Kind::solid: {
            const std::string f = chem::ascii_form(t.name.substr(0, t.name.size() - 3));
            for (const auto& m : db.minerals())
                if (chem::ascii_form(m.formula.text) == f || m.name == f) {
                    thermo::LogKFunction out;
                    out.add(-1.0, m.log_k);
                    return out;
                }
            return std::nullopt;
        }
        case HalfTerm::Kind::gas:
            if (auto g = db.find_gas(t.name)) {
                thermo::LogKFunction out;
                out.add(-1.0, db.gases()[*g].log_k);
                return out;
            }
            return std::nullopt;
    }
    return std::nullopt;
}

std::vector<std::string> known_names(const thermo::Database& db) {
    std::vector<std::string> v = db.species_names();
    for (const auto& m : db.minerals()) v.push_back(m.formula.text + "(s)");
    for (const auto& g : db.gases()) v.push_back(g.name);
    return v;
}

// Same terms in the same proportion (electrons included)?
bool same_reaction(const std::map<std::string, double>& a, const std::map<std::string, double>& b) {
    if (a.size() != b.size() || a.empty()) return false;
    const double ratio = b.begin()->second / a.begin()->second;
    for (const auto& [k, v] : a) {
        auto it = b.find(k);
        if (it == b.end() || std::abs(it->second - ratio * v) > 1e-9 * std::max(1.0, std::abs(v))) return false;
    }
    return ratio > 0;
}

std::string canonical_term(const std::string& name) {
    if (name == "H2O(l)") return "H2O";
    if (ends_with(name, "(aq)")) return name.substr(0, name.size() - 4);
    return chem::ascii_form(name);
}

}  // namespace

double HalfCell::e0_v(double temperature_c) const {
    if (from_species)
        return constants::nernst_slope_v(temperature_c + constants::zero_celsius_k) / electrons * log_k(temperature_c);
    if (!e0_polynomial_v.empty()) {
        double e = 0.0;
        for (auto it = e0_polynomial_v.rbegin(); it != e0_polynomial_v.rend(); ++it) e = e * temperature_c + *it;
        return e;
    }
    return e0_25_v + de0_dt_v_per_k * (temperature_c - 25.0);
}

HalfCell parse_half_reaction(const thermo::Database& db, const std::string& text, const SourceLocation& where) {
    const std::string key = "half-reaction";
    chem::Reaction rx;
    try {
        rx = chem::parse_reaction(text);
    } catch (const chem::ParseError& e) {
        throw InputError(where, key, std::string("cannot read the half-reaction: ") + e.what());
    }
    HalfCell h;
    h.text = text;
    double electrons_left = 0.0;
    for (const auto& t : rx.terms)
        if (chem::parse_formula(t.species).is_electron()) electrons_left -= t.coefficient;
    if (electrons_left == 0.0)
        throw InputError(where, key, "'" + text + "' has no electrons: a half-reaction is written like \"Cu^2+ + 2 e- = Cu(s)\"");
    const double sign = electrons_left > 0 ? 1.0 : -1.0;  // store as a reduction
    h.electrons = std::abs(electrons_left);
    const auto bad = chem::imbalance(rx);
    if (!bad.empty()) {
        throw InputError(where, key, "'" + text + "' is not balanced (right minus left: " + chem::imbalance_text(bad) + ")");
    }
    std::map<std::string, double> mine;  // canonical name -> coefficient, electrons included
    std::vector<std::string> unknown;
    for (const auto& t : rx.terms) {
        const chem::Formula f = chem::parse_formula(t.species);
        if (f.is_electron()) {
            mine["e-"] += sign * t.coefficient;
            continue;
        }
        HalfTerm term;
        term.name = t.species;
        term.coefficient = sign * t.coefficient;
        if (canonical_term(t.species) == "H2O") term.kind = HalfTerm::Kind::water;
        else if (f.phase == chem::Phase::solid) term.kind = HalfTerm::Kind::solid;
        else if (f.phase == chem::Phase::gas) term.kind = HalfTerm::Kind::gas;
        else term.kind = HalfTerm::Kind::aqueous;
        h.terms.push_back(term);
        mine[canonical_term(t.species)] += term.coefficient;
    }
    // A database electrode with the same reaction gives E° directly.
    for (const auto& e : db.electrodes()) {
        std::map<std::string, double> theirs;
        for (const auto& t : e.reaction.terms) {
            const chem::Formula f = chem::parse_formula(t.species);
            theirs[f.is_electron() ? std::string("e-") : canonical_term(t.species)] += t.coefficient;
        }
        if (!same_reaction(theirs, mine)) continue;
        h.e0_25_v = e.e0_v;
        h.de0_dt_v_per_k = e.de0_dt_v_per_k;
        h.e0_polynomial_v = e.e0_polynomial_v;
        const thermo::Source* s = db.find_source(e.source);
        h.e0_origin = "electrode " + e.name + (s ? " (" + s->key + ")" : std::string());
        h.from_species = false;
        return h;
    }
    // Otherwise from the species: log K of the reduction = sum of nu * log K of formation.
    thermo::LogKFunction k;
    for (const auto& t : h.terms) {
        auto lk = formation_log_k(db, t);
        if (!lk) {
            unknown.push_back(t.name);
            continue;
        }
        k.add(t.coefficient, *lk);
    }
    if (!unknown.empty())
        throw InputError(where, key,
                         "unknown species '" + unknown.front() + "' in '" + text +
                             "': it is neither a species, a mineral (as its formula with (s)) nor a gas of the database, and no "
                             "electrode of the database has this reaction",
                         nearest_name(unknown.front(), known_names(db)));
    h.log_k = k;
    h.from_species = true;
    h.e0_25_v = h.e0_v(25.0);
    h.de0_dt_v_per_k = (h.e0_v(26.0) - h.e0_v(24.0)) / 2.0;
    h.e0_origin = "the log K of the species";
    return h;
}

std::string_view activity_origin_name(ActivityOrigin o) {
    switch (o) {
        case ActivityOrigin::water: return "water";
        case ActivityOrigin::given: return "given";
        case ActivityOrigin::convention: return "convention";
        case ActivityOrigin::unit: return "unit";
    }
    return "given";
}

void ElectrodeActivities::set(const std::string& name, double activity, ActivityOrigin origin) {
    values[name] = activity;
    origins[name] = origin;
}

namespace {

// A short number for messages: 1e-06, 0.21, 1.
std::string short_number(double v) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%g", v);
    return buf;
}

std::string water_words(const std::string& water) { return water.empty() ? std::string("the water") : "water '" + water + "'"; }

bool is_customary(double a) { return std::abs(a - customary_metal_ion_activity) <= 1e-12 * customary_metal_ion_activity; }

std::string convention_words(const std::string& metal, double a) {
    return "dissolved " + metal + " species at activity " + short_number(a) +
           (is_customary(a) ? " (the customary convention of corrosion work, common practice)" : " (metal_ion_activity)");
}

// The elements that are not metals (metalloids counted with them): a solid of one of these
// alone, such as S(s) or C(s), is not a metal electrode.
bool is_metal(std::string_view element) {
    static const std::set<std::string_view> nonmetals = {"H",  "He", "B",  "C",  "N",  "O",  "F",  "Ne",
                                                         "Si", "P",  "S",  "Cl", "Ar", "As", "Se", "Br",
                                                         "Kr", "Te", "I",  "Xe", "At", "Rn"};
    return nonmetals.count(element) == 0;
}

}  // namespace

std::string electrode_metal(const HalfCell& h) {
    // A metal written as a solid first (Fe(s)); else the one metal of an oxide or hydroxide
    // (Fe(OH)3(s), Cu2O(s)).
    for (const bool oxide : {false, true})
        for (const auto& t : h.terms) {
            if (t.kind != HalfTerm::Kind::solid) continue;
            const chem::Formula f = chem::parse_formula(t.name);
            if (f.charge != 0) continue;
            std::vector<std::string> rest;
            for (const auto& [element, count] : f.elements)
                if (!oxide || (element != "O" && element != "H")) rest.push_back(element);
            if (rest.size() == 1 && is_metal(rest.front()) && (oxide || f.elements.size() == 1)) return rest.front();
        }
    return {};
}

std::string ElectrodePotential::convention() const {
    bool from_water = false, from_given = false;
    for (const auto& q : quotient) {
        from_water = from_water || q.origin == ActivityOrigin::water;
        from_given = from_given || q.origin == ActivityOrigin::given;
    }
    std::string rest;
    if (from_water) rest = "the speciation of water '" + water + "'";
    if (from_given) rest += std::string(rest.empty() ? "" : " and ") + "values given";
    if (metal_ion_activity && !convention_applied_to.empty())
        return convention_words(metal, *metal_ion_activity) +
               (rest.empty() ? std::string("; pure phases at unit activity") : "; the others from " + rest);
    if (rest.empty()) rest = "pure phases at unit activity";
    if (metal_ion_activity && !convention_given_instead.empty()) {
        std::string names;
        for (const auto& n : convention_given_instead) names += (names.empty() ? "" : ", ") + n;
        return rest + " (the value given for " + names + " wins over the metal-ion convention)";
    }
    // A half-reaction with no metal (O2/H2O on the other electrode of a cell) has nothing to
    // say about the convention; a metal without dissolved species (Cu2O/Cu) says so.
    if (metal_ion_activity && !metal.empty())
        return rest + " (a metal-ion activity was asked for, but the half-reaction has no dissolved species of " +
               metal + ")";
    return rest;
}

ElectrodePotential electrode_potential(const HalfCell& h, double temperature_c, const ElectrodeActivities& a,
                                       const SourceLocation& where) {
    ElectrodePotential p;
    p.half_reaction = h.text;
    p.temperature_c = temperature_c;
    p.e0_v = h.e0_v(temperature_c);
    p.e0_origin = h.e0_origin;
    p.water = a.water;
    p.metal = electrode_metal(h);
    p.metal_ion_activity = a.metal_ion_activity;
    if (a.metal_ion_activity && !(*a.metal_ion_activity > 0.0 && *a.metal_ion_activity <= 1.0))
        throw InputError(where, "metal_ion_activity",
                         "expected an activity of the metal's dissolved species above 0 and at most 1, found " +
                             short_number(*a.metal_ion_activity));
    double log_q = 0.0;
    for (const auto& t : h.terms) {
        QuotientTerm q;
        q.species = t.name;
        q.coefficient = t.coefficient;
        auto it = a.values.find(t.name);
        if (it == a.values.end()) it = a.values.find(canonical_term(t.name));
        const bool found = it != a.values.end();
        ActivityOrigin origin = ActivityOrigin::given;
        if (found)
            if (auto o = a.origins.find(it->first); o != a.origins.end()) origin = o->second;
        const bool metal_species = a.metal_ion_activity && !p.metal.empty() && t.kind == HalfTerm::Kind::aqueous &&
                                   chem::parse_formula(t.name).elements.count(p.metal) > 0;
        if (found && origin != ActivityOrigin::water) {
            // Given (or set by the caller): wins over the convention and the water.
            if (metal_species) p.convention_given_instead.push_back(t.name);
            q.activity = it->second;
            q.origin = origin;
            q.detail = origin == ActivityOrigin::given ? std::string("given") : std::string(activity_origin_name(origin));
        } else if (metal_species) {
            q.activity = *a.metal_ion_activity;
            q.origin = ActivityOrigin::convention;
            q.detail = "metal-ion convention (" + short_number(*a.metal_ion_activity) +
                       (is_customary(*a.metal_ion_activity) ? ", customary in corrosion work)" : ", metal_ion_activity)");
            p.convention_applied_to.push_back(t.name);
        } else if (found) {
            q.activity = it->second;
            q.origin = ActivityOrigin::water;
            q.detail = t.kind == HalfTerm::Kind::gas     ? "partial pressure in equilibrium with " + water_words(a.water)
                       : t.kind == HalfTerm::Kind::water ? "water activity of " + water_words(a.water)
                                                         : "speciation of " + water_words(a.water);
        } else if (t.kind == HalfTerm::Kind::solid || t.kind == HalfTerm::Kind::water) {
            q.activity = 1.0;
            q.origin = ActivityOrigin::unit;
            q.detail = t.kind == HalfTerm::Kind::solid ? "pure solid" : "pure liquid water";
        } else {
            throw InputError(where, t.name,
                             "no activity for '" + t.name + "' in '" + h.text + "': give it (--activity " + t.name +
                                 "=VALUE), --ph for H+, or take the activities from a water");
        }
        if (!(q.activity > 0) || !std::isfinite(q.activity))
            throw InputError(where, t.name, "the activity of '" + t.name + "' must be a positive number");
        log_q += t.coefficient * std::log10(q.activity);
        p.quotient.push_back(std::move(q));
    }
    const double slope = constants::nernst_slope_v(temperature_c + constants::zero_celsius_k);
    p.e_v = p.e0_v - slope / h.electrons * log_q;
    return p;
}

double nernst_v(const HalfCell& h, double temperature_c, const Activities& a, const SourceLocation& where) {
    return electrode_potential(h, temperature_c, ElectrodeActivities(a), where).e_v;
}

Activities activities_of(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    Activities a;
    for (const auto& s : r.species) a[s.name] = s.activity;
    a["H2O"] = r.water_activity;
    for (const auto& s : r.saturation)
        if (s.is_gas) a[s.phase] = std::pow(10.0, s.si);
    if (r.pe) a["e-"] = std::pow(10.0, -*r.pe);
    (void)db;
    return a;
}

ElectrodeActivities electrode_activities_of(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    ElectrodeActivities e;
    for (const auto& [name, value] : activities_of(db, r)) e.set(name, value, ActivityOrigin::water);
    e.water = r.label;
    return e;
}

std::vector<CoupleEh> couple_potentials(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::vector<CoupleEh> out;
    const auto e = db.electron();
    if (!e) return out;
    std::vector<std::string> seen;
    for (const auto& s : r.species) {
        const thermo::Species& sp = db.species()[s.species];
        double nu_e = 0.0;
        std::optional<std::size_t> partner;
        int ordinary = 0;
        for (const auto& [j, v] : sp.formation) {
            if (j == *e) nu_e = v;
            else if (db.species()[j].role == thermo::ComponentRole::ordinary) {
                partner = j;
                ++ordinary;
            }
        }
        // One couple per element and direction, from its simplest species (no ligands):
        // Fe^3+/Fe^2+ rather than each ferric complex, which all give the same Eh.
        if (nu_e == 0.0 || ordinary > 1 || !(s.activity > 0)) continue;
        const std::string group = (partner ? db.species()[*partner].name : std::string("H2O")) + (nu_e < 0 ? "+" : "-");
        if (std::find(seen.begin(), seen.end(), group) != seen.end()) continue;
        seen.push_back(group);
        // log a(e) from the species' formation at the water's activities.
        double rest = std::log10(s.activity) - sp.log_k(r.temperature_c);
        bool complete = true;
        for (const auto& [j, v] : sp.formation) {
            if (j == *e) continue;
            const double la = j < r.component_log_activity.size() ? r.component_log_activity[j] : std::nan("");
            if (!std::isfinite(la)) complete = false;
            rest -= v * la;
        }
        if (!complete) continue;
        const double pe = -(rest / nu_e);
        const std::string other = partner ? db.species()[*partner].name : std::string("H2O");
        CoupleEh c;
        c.couple = nu_e < 0 ? s.name + "/" + other : other + "/" + s.name;  // ox/red
        c.pe = pe;
        c.eh_v = eh_from_pe(pe, r.temperature_c);
        out.push_back(c);
    }
    return out;
}

}  // namespace deltag::electro
