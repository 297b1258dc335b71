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

// Nernst: E = E°(T) - (RT ln10 / nF) log10 Q, Q = prod a^nu (products over reactants).
// Throws InputError naming an aqueous species or gas whose activity is missing.
double nernst_v(const HalfCell& h, double temperature_c, const Activities& a, const SourceLocation& where);

// Activities of every species of a speciated water (and a_w, and the pressures of gases).
Activities activities_of(const thermo::Database& db, const equilibrium::SpeciationResult& r);

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
    std::vector<std::string> warnings;
};

CellResult cell(const HalfCell& cathode, const Activities& cathode_activities, double cathode_temperature_c,
                const HalfCell& anode, const Activities& anode_activities, double anode_temperature_c);

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
