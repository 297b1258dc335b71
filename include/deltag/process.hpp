// Process steps on waters: equilibrate with minerals and gases, dose a reagent (a fixed
// amount or until a target), blend, concentrate, change temperature; and sweeps of one
// input over a range. Steps are plain descriptions (read from a case file or built in
// code); run_steps() executes them in order on the speciated waters.
#pragma once

#include <array>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/error.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"

namespace deltag::process {

// --- step descriptions ------------------------------------------------------------------

struct MineralSpec {
    std::string name;                   // database mineral name
    double target_si = 0.0;
    std::optional<double> on_hand_mol_per_kgw;  // solid present, the most that can dissolve; absent: unlimited
    bool may_form = true;
    bool may_dissolve = true;
    SourceLocation where;
};

struct GasSpec {
    std::string name;                   // database gas name, e.g. "CO2(g)"
    double log_partial_pressure_atm = 0.0;
    SourceLocation where;
};

// A closed gas space over the water: volume per kg of water and the gases' starting pressures.
struct HeadspaceSpec {
    double volume_l_per_kgw = 0.0;
    std::optional<double> temperature_c;
    std::vector<GasSpec> gases;
    SourceLocation where;
};

// Each kind of step is a struct whose `kind` is its name in case files, reports and messages.
struct EquilibrateStep {
    static constexpr std::string_view kind = "equilibrate";
    std::vector<MineralSpec> minerals;
    std::vector<GasSpec> gases;
    std::optional<HeadspaceSpec> headspace;
};

// An amount of reagent: value with a unit (mol, mmol, umol, mg or g per kgw or per L).
struct Amount {
    double value = 0.0;
    std::string unit = "mmol/kgw";
    SourceLocation where;
};

// The units an amount of reagent takes: the units of concentration_unit_table() that give a
// mass or an amount per kg of water or per litre (not equivalents, which need a charge, nor
// per kg of solution, which a dose does not know).
const std::vector<std::string>& amount_units();
// "" when `unit` is one of them; otherwise what was expected (and, for a concentration unit
// that is no unit of an amount, why).
std::string amount_unit_problem(std::string_view unit);
// The unit to suggest instead: mg/kgw for a mass per kg of solution, none for equivalents (the
// reagent's own conversion is needed), otherwise the nearest name.
std::string amount_unit_suggestion(std::string_view unit);

struct DoseTarget {
    enum class Kind { ph, saturation_index, alkalinity, langelier };
    Kind kind = Kind::ph;
    double value = 0.0;              // pH; SI; alkalinity in meq/L; Langelier index
    std::string mineral;             // for saturation_index
    SourceLocation where;
};

struct DoseStep {
    static constexpr std::string_view kind = "dose";
    std::string reagent;             // formula, e.g. "H2SO4", "Ca(OH)2", "CO2"
    SourceLocation reagent_where;
    std::optional<Amount> amount;    // a fixed dose ...
    std::optional<DoseTarget> until; // ... or the dose that reaches a target
    std::optional<Amount> max_amount;  // with until: the largest dose to consider (default 1 mol/kgw)
};

struct BlendStep {
    static constexpr std::string_view kind = "blend";
    enum class Basis { volume, mass };
    Basis basis = Basis::volume;
    std::vector<std::pair<std::string, double>> parts;  // water (or step label) -> fraction
    std::vector<SourceLocation> part_where;
};

// The concentration factors a concentrate step accepts: 1 (nothing removed) to 1000 (a
// recovery of 99.9 %). Cooling towers run at a few cycles and evaporators and brine
// concentrators at tens to a few hundred (common practice); beyond 1000 a fresh water is a
// brine far past the activity models, and such a factor is a slip of the pen.
inline constexpr double min_concentration_factor = 1.0;
inline constexpr double max_concentration_factor = 1000.0;
// "" when the factor is within that range, otherwise what was expected and what was found.
std::string concentration_factor_problem(double factor);
// The same range as a recovery (the fraction of the water removed), for a recovery given.
std::string recovery_problem(double recovery);

struct ConcentrateStep {
    static constexpr std::string_view kind = "concentrate";
    double factor = 1.0;             // cycles of concentration, or 1/(1 - recovery)
    std::vector<std::string> precipitate;  // minerals allowed to precipitate (to SI 0)
    std::vector<SourceLocation> precipitate_where;
};

struct TemperatureStep {
    static constexpr std::string_view kind = "temperature";
    double temperature_c = 25.0;
    bool equilibrate = false;        // re-equilibrate the minerals and gases present
};

// The kinds of step. Code that acts on a step dispatches with std::visit over an overload set
// of every alternative, so that a kind added here fails to compile wherever it is not handled.
using StepAction = std::variant<EquilibrateStep, DoseStep, BlendStep, ConcentrateStep, TemperatureStep>;

namespace detail {
template <class V>
struct KindNames;
template <class... T>
struct KindNames<std::variant<T...>> {
    static constexpr std::array<std::string_view, sizeof...(T)> value{T::kind...};
};
}  // namespace detail

// The names of the kinds, in the order of StepAction's alternatives.
inline constexpr auto step_kinds = detail::KindNames<StepAction>::value;

struct Step {
    std::string label;               // default: "step N (KIND)"
    std::string water;               // start from this water or step label; empty: the previous result
    SourceLocation where;
    SourceLocation water_where;
    // Steps that bring the water to one redox level (equilibrate, a dose of an oxidant or a
    // reductant, temperature with equilibrate) merge the redox states of an element given
    // apart (Fe(2), Fe(3)) into the element's total and the water's electrons. True keeps
    // them apart through this step; the result says so.
    bool keep_redox_states_apart = false;
    StepAction action;
};

std::string_view step_kind(const Step& s);  // the `kind` of its action: "equilibrate", "dose", ...

// One input varied over a range, many solves.
struct Sweep {
    enum class Variable { temperature_c, dose, factor, fraction };
    std::string label;
    std::string step;                // label of the step whose input is varied
    Variable variable = Variable::temperature_c;
    double from = 0.0, to = 0.0;     // for dose: in the unit of the dose step's amount
    int points = 11;
    std::string fraction_of;         // for fraction: the water whose fraction is varied (blend)
    std::string at;                  // label of the step whose result is recorded; empty: `step`
    SourceLocation at_where;
    std::vector<std::string> outputs;  // "pH", "si:Calcite", "transfer:Calcite", "langelier", ...
    std::string csv_path, svg_path;    // where to write (relative to the case file)
    SourceLocation where;
    SourceLocation step_where, variable_where;
    std::vector<SourceLocation> output_where;  // one per output
};

// --- execution ------------------------------------------------------------------------

// Water-treatment indices of one water (Standard Methods 2330; Ryznar 1944). The Langelier
// and Ryznar indices need a pHs; the CCPP does not, so each has its own availability. An
// index without an answer carries the reason and never fails a run.
struct Indices {
    bool available = false;        // LSI and RSI: a pHs exists
    std::string why_not;           // when not available: the reason
    double ph_s = 0.0;             // pH of calcite saturation at the water's Ca and carbonate alkalinity
    double langelier = 0.0;        // LSI = pH - pHs
    double ryznar = 0.0;           // RSI = 2 pHs - pH
    double calcium_mol_per_kgw = 0.0;       // held for pHs: the water's calcium total
    double carbonate_alkalinity_eq = 0.0;   // held for pHs: HCO3- + 2 CO3^2- and their ion pairs, eq/kgw
    // The Standard Methods 2330 B simplified formula, pHs = pK2 - pKs - log a(Ca) - log a(HCO3)
    // with all of the calcium and all of the carbonate alkalinity taken as free Ca2+ and HCO3-
    // (activity coefficients of the water): a cross-check, and the only number there is when
    // calcite saturation is out of reach. It is off by several tenths once pHs nears pK2.
    bool formula_available = false;
    double formula_ph_s = 0.0;
    double formula_langelier = 0.0;
    bool ccpp_available = false;
    std::string ccpp_why_not;      // when the CCPP is not available: the reason
    double ccpp_mg_per_l = 0.0;    // mg/L as CaCO3 that would precipitate (+) or dissolve (-)
};

// A water as it stands between steps.
struct WaterState {
    std::string label;
    equilibrium::SpeciationInput basis;   // totals (mol/kgw), charge imbalance, T, model, pe
    equilibrium::SpeciationResult result;
    std::vector<equilibrium::MineralTarget> minerals;  // solids in contact, with what is left
    std::vector<equilibrium::GasTarget> gases;         // gases held
    Indices indices;
};

struct DoseOutcome {
    std::string reagent;
    double mol_per_kgw = 0.0;
    double mg_per_l = 0.0;
    bool found_by_target = false;
    double target_reached = 0.0;   // the target quantity at the dose found
};

struct StepOutcome {
    std::string label;
    std::string kind;
    WaterState state;
    std::optional<DoseOutcome> dose;
};

// The basis of a speciated water: its totals and its charge imbalance, with pH free.
WaterState state_from_result(const equilibrium::SpeciationResult& r, const equilibrium::SpeciationInput& input,
                             const thermo::Database& db);

// Langelier (pHs from the speciation: the pH at which the water, with its calcium and its
// carbonate alkalinity, is saturated with calcite), Ryznar and the CCPP (closed-system
// equilibrium with calcite). Never throws for a water: see Indices.
Indices water_treatment_indices(const thermo::Database& db, const WaterState& w);

// How a reagent formula splits into database components (per mole of reagent), plus the
// protons, water and electrons it brings. Throws InputError when it cannot (unknown
// element, a charged formula, nothing but water).
struct ReagentSplit {
    std::vector<std::pair<std::size_t, double>> components;
    double protons = 0.0;
    double water = 0.0;
    double electrons = 0.0;   // e- per mole: < 0 an oxidant, > 0 a reductant
    double molar_mass_g = 0.0;
};
ReagentSplit split_reagent(const thermo::Database& db, const std::string& formula, const SourceLocation& where);

// Runs the steps in order. `waters` are the speciated lab waters by name.
std::vector<StepOutcome> run_steps(const thermo::Database& db, const std::vector<WaterState>& waters,
                                   const std::vector<Step>& steps);

struct SweepOutcome {
    std::string label;
    std::string x_label;
    std::vector<double> x;
    // output -> values, one per x. NaN marks a point without a value (an index with no
    // answer there); writers print it as null (JSON), an empty cell (CSV), "n/a" (text) or a
    // gap (SVG), never as a number.
    std::vector<std::pair<std::string, std::vector<double>>> series;
    std::vector<std::string> notes;  // one per point without a value: which output, where, why
};

SweepOutcome run_sweep(const thermo::Database& db, const std::vector<WaterState>& waters,
                       const std::vector<Step>& steps, const Sweep& sweep);

}  // namespace deltag::process
