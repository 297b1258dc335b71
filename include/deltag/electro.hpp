// Electrochemistry: half-reactions and their standard potentials, the Nernst potential at
// real activities and temperatures, cells (E, n, dG = -nFE, K), reference electrodes, the
// Eh of the redox couples of a speciated water, and Eh-pH (Pourbaix) diagrams.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/error.hpp"
#include "deltag/reference_electrodes.hpp"
#include "deltag/speciation.hpp"

namespace deltag::electro {

// --- half-reactions ------------------------------------------------------------------------

// One term of a half-reaction written as a reduction: ox + n e- = red. Coefficients are
// signed as in chem::Reaction (left negative, right positive); electrons are not listed.
struct HalfTerm {
    std::string name;        // as written
    double coefficient = 0.0;
    enum class Kind { aqueous, water, solid, gas } kind = Kind::aqueous;
};

struct HalfCell {
    std::string text;                // as given
    std::vector<HalfTerm> terms;
    double electrons = 0.0;          // n, electrons taken up by the reduction as written
    double e0_25_v = 0.0;            // E at 25 degC, V vs SHE
    double de0_dt_v_per_k = 0.0;     // temperature coefficient (at 25 degC with a polynomial)
    std::vector<double> e0_polynomial_v;  // E°(t) = sum a_i t^i (t in degC), when the electrode has one
    std::string e0_origin;           // "electrode NAME (source)" or "the log K of the species"
    thermo::LogKFunction log_k;      // of the reduction as written, when derived from species
    bool from_species = false;

    double e0_v(double temperature_c) const;  // E°(T)
};

// Parses a half-reaction such as "Cu^2+ + 2 e- = Cu(s)" (electrons on either side; it is
// stored as a reduction). E° comes from a database electrode with the same reaction, else
// from the log K of the species (E° = RT ln10/(nF) log K). Throws InputError (where, key
// "half-reaction") for an unreadable text, an unbalanced reaction, no electrons, or a
// species the database does not know (nearest name suggested).
HalfCell parse_half_reaction(const thermo::Database& db, const std::string& text, const SourceLocation& where);

// Activities for the Nernst equation: name -> activity (gases: fugacity in atm). Solids and
// liquid water are 1 unless given.
using Activities = std::map<std::string, double>;

// Where an activity of a Nernst quotient came from.
enum class ActivityOrigin {
    water,       // the speciation of a water: a species' activity, a(H2O), or a gas's partial
                 // pressure in equilibrium with the water (10^SI)
    given,       // a value given in the case file or on the command line
    convention,  // the metal-ion convention of ElectrodeActivities::metal_ion_activity
    unit,        // a pure solid, or pure liquid water without a water, at unit activity
};
// "water", "given", "convention", "unit".
std::string_view activity_origin_name(ActivityOrigin o);

// The customary activity of the dissolved ions of an electrode's metal in corrosion work
// (common practice, as in the classic potential-pH atlases): 1e-6.
inline constexpr double customary_metal_ion_activity = 1e-6;

// The activities of one electrode, with where each came from.
struct ElectrodeActivities {
    Activities values;                              // name -> activity (gas: fugacity in atm)
    std::map<std::string, ActivityOrigin> origins;  // per entry of values; an entry not listed is given
    std::string water;                              // the water whose speciation gave the `water` values
    // Every dissolved species of the electrode's metal (electrode_metal: e.g. Fe^2+ for
    // "Fe^2+ + 2 e- = Fe(s)" or "Fe(OH)3(s) + 3 H+ + e- = Fe^2+ + 3 H2O") at this activity instead of
    // the water's; a value given for the species still wins. Unset: the activities as they are.
    std::optional<double> metal_ion_activity;

    ElectrodeActivities() = default;
    // Every value given.
    explicit ElectrodeActivities(Activities given) : values(std::move(given)) {}
    // Sets a value and its origin (replacing any earlier one).
    void set(const std::string& name, double activity, ActivityOrigin origin);
};

// One term of a Nernst quotient and where its activity came from.
struct QuotientTerm {
    std::string species;          // as written in the half-reaction
    double coefficient = 0.0;     // signed, of the reduction (products positive)
    double activity = 1.0;        // gas: fugacity in atm
    ActivityOrigin origin = ActivityOrigin::given;
    std::string detail;           // in words: "speciation of water 'loop'", "pure solid", ...
};

// One electrode at its activities and temperature.
struct ElectrodePotential {
    std::string half_reaction;
    double temperature_c = 25.0;
    double e0_v = 0.0;                     // E°(T)
    double e_v = 0.0;                      // Nernst, at the activities
    std::string e0_origin;
    std::string water;                     // the water the activities came from ("" none)
    std::string metal;                     // the electrode's metal ("" none)
    std::optional<double> metal_ion_activity;  // the convention, when one was asked for
    std::vector<std::string> convention_applied_to;  // the species it set
    std::vector<std::string> convention_given_instead;  // species of the metal whose given value won
    std::vector<QuotientTerm> quotient;    // every term but the electrons, in the half-reaction's order

    // In words: "the speciation of water 'loop'", "values given", "dissolved Fe species at
    // activity 1e-06 (the customary convention of corrosion work, common practice); the
    // others from the speciation of water 'loop'", and why a convention asked for set nothing.
    std::string convention() const;
};

// The electrode's metal: the element of a solid term made of that one metal alone ("Fe(s)"),
// else the one metal of a solid oxide or hydroxide ("Fe(OH)3(s)", "Cu2O(s)"); "" when the
// half-reaction has neither.
std::string electrode_metal(const HalfCell& h);

// The potential of one electrode, with the provenance of every activity. Throws InputError
// (where, key: the species) naming an aqueous species or gas whose activity is missing, or an
// activity that is not a positive number.
ElectrodePotential electrode_potential(const HalfCell& h, double temperature_c, const ElectrodeActivities& a,
                                       const SourceLocation& where);

// Nernst: E = E°(T) - (RT ln10 / nF) log10 Q, Q = prod a^nu (products over reactants).
// Throws InputError naming an aqueous species or gas whose activity is missing.
double nernst_v(const HalfCell& h, double temperature_c, const Activities& a, const SourceLocation& where);

// Activities of every species of a speciated water (and a_w, and the pressures of gases).
Activities activities_of(const thermo::Database& db, const equilibrium::SpeciationResult& r);
// The same, every value marked as coming from the water (labelled `r.label`).
ElectrodeActivities electrode_activities_of(const thermo::Database& db, const equilibrium::SpeciationResult& r);

// --- cells ---------------------------------------------------------------------------------

struct CellResult {
    std::string label;
    std::string cathode, anode;      // the half-reactions as given
    double temperature_c = 25.0;
    double n = 0.0;                  // electrons of the cell reaction: lcm of the two
    double e0_v = 0.0;               // E°cathode - E°anode at T
    double e_v = 0.0;                // at the activities
    double delta_g0_kj_per_mol = 0.0;  // -n F E°
    double delta_g_kj_per_mol = 0.0;   // -n F E
    double log_k = 0.0;              // n F E° / (RT ln10)
    bool spontaneous = false;        // E > 0: runs as written (cathode reduced)
    std::string cathode_origin, anode_origin;
    ElectrodePotential cathode_electrode, anode_electrode;  // each side, with its activities' provenance
    std::vector<std::string> warnings;
};

// Every activity given.
CellResult cell(const HalfCell& cathode, const Activities& cathode_activities, double cathode_temperature_c,
                const HalfCell& anode, const Activities& anode_activities, double anode_temperature_c);

// One side of a cell: the half-reaction, its activities with their provenance, its temperature.
struct CellSide {
    const HalfCell& half;
    const ElectrodeActivities& activities;
    double temperature_c = 25.0;
};
// Warns when a metal-ion convention was asked for and set no activity.
CellResult cell(const CellSide& cathode, const CellSide& anode);

// dG = -n F E and back, kJ/mol and V.
double delta_g_kj(double n, double e_v);
double potential_v(double n, double delta_g_kj_per_mol);

// --- redox couples of a water ------------------------------------------------------------------

struct CoupleEh {
    std::string couple;          // "Fe^3+/Fe^2+"
    double eh_v = 0.0;
    double pe = 0.0;
};

// The Eh each redox couple present in the water implies (from the activities of its two
// species), so that disequilibrium between couples is visible.
std::vector<CoupleEh> couple_potentials(const thermo::Database& db, const equilibrium::SpeciationResult& r);

}  // namespace deltag::electro
