// The thermodynamic database: components, aqueous species, minerals, gases and the lab
// analytes that map onto components, each entry with its reaction, log K(T) and source.
// The TOML schema is described in databases/README.md.
#pragma once

#include <array>
#include <cstddef>
#include <limits>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "deltag/chem.hpp"
#include "deltag/error.hpp"
#include "deltag/water_properties.hpp"

namespace deltag::thermo {

// How one database entry gives log K as a function of temperature.
struct LogKModel {
    enum class Form { constant, van_t_hoff, analytic, water_ionization, gas_solubility };
    Form form = Form::constant;
    double log_k_25 = 0.0;
    double delta_h_kj_per_mol = 0.0;     // van 't Hoff
    double delta_cp_j_per_mol_k = 0.0;   // optional, with van 't Hoff
    std::array<double, 5> fit{};         // analytic: a + bT + c/T + d log10 T + e/T^2 (T in K)
    std::array<double, 3> henry{};       // gas_solubility: A, B, C of the IAPWS (2004) Henry's
                                         // constant guideline (Fernandez-Prini et al. 2003)
    std::optional<TemperatureRange> range;

    double log_k(double temperature_c) const;
};

// log10 K (mol kg^-1 atm^-1) of X(g) = X(aq) from the IAPWS (2004) Henry's constant guideline
// (Fernandez-Prini, Alvarez & Harvey 2003, J. Phys. Chem. Ref. Data 32, 903) with the gas's
// coefficients A, B, C of its Table 2.
double log_k_gas_solubility(const std::array<double, 3>& abc, double temperature_c);

// log K of a reaction built from several entries: sum of weight * entry log K.
struct LogKFunction {
    std::vector<std::pair<double, LogKModel>> terms;

    double operator()(double temperature_c) const;
    TemperatureRange range() const;          // intersection of the entries' ranges
    bool temperature_dependent() const;      // false if any entry is constant in T
    void add(double weight, const LogKFunction& other);
};

using Stoichiometry = std::vector<std::pair<std::size_t, double>>;  // component index, coefficient

// What every entry has in common.
struct Entry {
    std::string name;        // the key in the database
    chem::Formula formula;
    std::string reaction_text;
    LogKModel own_log_k;     // as written for the entry's own reaction
    std::string source;      // key into sources
    bool from_memory = false;
    std::string note;
    SourceLocation where;
};

enum class ComponentRole { ordinary, water, proton, electron };

struct Species : Entry {
    bool is_component = false;
    ComponentRole role = ComponentRole::ordinary;
    // Formation from components: log a(species) = log K + sum(coef * log a(component)).
    // For a component: itself with coefficient 1 and log K = 0.
    Stoichiometry formation;
    LogKFunction log_k;
    // Activity-model parameters; NaN (the default) where the database gives none.
    double ion_size_angstrom = std::numeric_limits<double>::quiet_NaN();  // a of extended Debye-Hueckel and B-dot (Kielland 1937 style)
    double tj_a_angstrom = std::numeric_limits<double>::quiet_NaN();      // Truesdell-Jones a
    double tj_b = std::numeric_limits<double>::quiet_NaN();               // Truesdell-Jones b, kg/mol
    double salting_out = std::numeric_limits<double>::quiet_NaN();        // neutral species: log10 gamma = k I
    double alkalinity = 0.0;  // equivalents of total alkalinity per mole (see README)
};

// Minerals and gases: the dissolution reaction phase = sum(coef * component), log K(T).
struct PhaseEntry : Entry {
    Stoichiometry dissolution;
    LogKFunction log_k;             // of the dissolution written in components
    LogKFunction log_k_as_written;  // of the dissolution as the database writes it (for reports)
    // Equivalents of total alkalinity one mole brings into the water when it dissolves: from
    // the reaction as written (each species with its own alkalinity), or given (`alkalinity`)
    // for a gas that dissolves as a redox species (O2(g) -> O2(aq): 0).
    double alkalinity = 0.0;
};

// A standard electrode potential: the reduction "ox + n e- = red" with E° at 25 degC.
struct Electrode {
    std::string name;                 // "Cu^2+/Cu"
    std::string reaction_text;
    chem::Reaction reaction;
    double e0_v = 0.0;
    double de0_dt_v_per_k = 0.0;
    // E°(t) = sum a_i t^i, t in degC, when the source publishes a polynomial (e0_polynomial_v);
    // otherwise E° + dE°/dT (t - 25).
    std::vector<double> e0_polynomial_v;
    std::optional<TemperatureRange> range;
    std::string source;
    bool from_memory = false;
    std::string note;
    SourceLocation where;

    double e0_at(double temperature_c) const;  // V vs SHE
};

struct Analyte {
    enum class Kind { total, alkalinity, redox_state };
    std::string name;
    Kind kind = Kind::total;
    double electrons = 0.0;      // redox_state: e- per atom in the species of this state (Fe +3: -1)
    std::size_t component = 0;
    chem::Formula mass_formula;  // what a mass concentration refers to (SO4, SiO2, ...)
    double per_component = 1.0;  // components per formula unit of mass_formula
    SourceLocation where;
};

struct Source {
    std::string key;
    std::string citation;
    SourceLocation where;
};

struct LintFinding {
    enum class Level { error, warning };
    Level level = Level::error;
    SourceLocation where;
    std::string key;
    std::string message;
};

class Database {
public:
    // Reads a database file. Throws InputError (file, line, key) on a malformed file.
    static Database load_file(const std::string& path);
    // The core database compiled into the binary.
    static const Database& embedded();
    // Parses TOML text; origin names it in messages.
    static Database parse(std::string_view toml_text, const std::string& origin);

    const std::string& origin() const { return origin_; }
    const std::string& name() const { return name_; }

    // Components come first in species(), indices 0 .. component_count()-1.
    const std::vector<Species>& species() const { return species_; }
    std::size_t component_count() const { return component_count_; }
    const std::vector<PhaseEntry>& minerals() const { return minerals_; }
    const std::vector<PhaseEntry>& gases() const { return gases_; }
    const std::vector<Analyte>& analytes() const { return analytes_; }
    const std::vector<Source>& sources() const { return sources_; }
    const std::vector<Electrode>& electrodes() const { return electrodes_; }

    std::optional<std::size_t> find_species(std::string_view name) const;
    std::optional<std::size_t> find_mineral(std::string_view name) const;
    std::optional<std::size_t> find_gas(std::string_view name) const;
    std::optional<std::size_t> find_analyte(std::string_view name) const;
    const Source* find_source(std::string_view key) const;

    std::vector<std::string> species_names() const;
    std::vector<std::string> mineral_names() const;
    std::vector<std::string> gas_names() const;
    std::vector<std::string> analyte_names() const;

    std::size_t water() const { return water_; }
    std::size_t proton() const { return proton_; }
    std::optional<std::size_t> electron() const { return electron_; }

    // Checks element and charge balance, sources, temperature ranges, fits against log K at
    // 25 degC, and names used twice. Errors make the database unusable for a run.
    std::vector<LintFinding> lint() const;

private:
    std::string origin_;
    std::string name_;
    std::vector<Species> species_;
    std::size_t component_count_ = 0;
    std::vector<PhaseEntry> minerals_;
    std::vector<PhaseEntry> gases_;
    std::vector<Analyte> analytes_;
    std::vector<Source> sources_;
    std::vector<Electrode> electrodes_;
    std::size_t water_ = 0;
    std::size_t proton_ = 0;
    std::optional<std::size_t> electron_;

    friend class DatabaseLoader;
};

// The embedded core database's TOML text.
std::string_view embedded_core_text();

}  // namespace deltag::thermo
