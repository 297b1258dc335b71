// Aqueous speciation: from component totals (and pH, pe) to the molality, activity and
// activity coefficient of every species, solved with KINSOL (Newton with line search) on
// log-space unknowns with an analytic Jacobian.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "deltag/activity.hpp"
#include "deltag/database.hpp"

namespace deltag::equilibrium {

// Every knob of the solver. The defaults are what deltag runs with.
struct SolverOptions {
    int max_iterations = 200;          // Newton iterations of the last leg of an attempt (see first_leg_iterations)
    double tolerance = 1e-12;          // KINSOL's target for the max |scaled residual| (mass balances relative)
    double accept_factor = 10.0;       // a result is accepted when its max |scaled residual| <= accept_factor * tolerance
    double step_tolerance = 1e-16;     // smallest scaled step before KINSOL gives up
    double max_step_log10 = 3.0;       // largest Newton step, in log10 units of any unknown
    // An attempt runs legs of first_leg_iterations, twice that, ... (the last one up to
    // max_iterations), each from the point the last reached with the basis chosen afresh.
    int first_leg_iterations = 25;
    int max_legs = 6;
    bool allow_fallback = true;        // retry from ideal-solution starts when the first attempt fails
    std::vector<double> fallback_ph_starts = {7.0, 4.0, 10.0, 2.0, 12.5};  // the fallback's pH guesses (pH free)
    double fallback_max_step_log10 = 1.0;  // the fallback's step cap, log10 units
    int max_active_set_rounds = 30;    // rounds of releasing and taking back minerals before giving up
    // A mineral released from its target is taken back when its SI passes the target by more
    // than this, in the direction it may move (log units).
    double take_back_si = 1e-9;
};

// What the solver did.
struct SolveSummary {
    bool converged = false;
    int iterations = 0;            // Newton iterations over all attempts
    int residual_evaluations = 0;
    int attempts = 0;              // 1 = the first start worked
    double residual_norm = 0.0;    // max |scaled residual| at the end
    std::string stop_reason;       // why the last attempt stopped
    std::string method;            // "KINSOL Newton, line search"; with the fallback named
    std::string kinsol_message;    // KINSOL's own message from the last attempt that gave one; "" if none
    double seconds = 0.0;

    std::string brief() const;     // one line
    std::string full() const;      // several lines
};

// What is known about one component (not H2O, H+ or e-).
struct ComponentInput {
    enum class Kind { total, alkalinity };
    std::size_t component = 0;  // index into Database::species()
    Kind kind = Kind::total;
    double value = 0.0;         // mol/kgw (total) or eq/kgw (total alkalinity)
};

// A solid held at a saturation index while it forms or dissolves.
struct MineralTarget {
    std::size_t mineral = 0;                 // index into Database::minerals()
    double target_si = 0.0;
    std::optional<double> on_hand_mol_per_kgw;  // solid present, the most that can dissolve; absent: unlimited
    bool may_form = true;                    // it may leave the water as solid
    bool may_dissolve = true;                // it may enter the water (not both false)
};

// A gas held at a partial pressure (an open system: unlimited supply and sink).
struct GasTarget {
    std::size_t gas = 0;                     // index into Database::gases()
    double log_partial_pressure_atm = 0.0;
};

// A closed gas space over the water (a sealed vessel, a pipe's air pocket): its gases start
// at the given partial pressures and exchange with the water until both are at
// equilibrium; the moles in the gas are p V / (R T) (ideal gas).
struct Headspace {
    double volume_l_per_kgw = 0.0;           // litres of gas per kg of water
    std::optional<double> temperature_c;     // default: the water's
    std::vector<GasTarget> gases;            // initial log10 partial pressures (atm)
};

struct SpeciationInput {
    std::string label;                       // for messages: the water's or step's name
    double temperature_c = 25.0;
    activity::ModelKind activity_model = activity::ModelKind::davies;
    std::vector<ComponentInput> components;  // one per component present
    std::optional<double> ph;                // fixed pH; absent: pH from charge balance
    std::optional<double> pe;                // fixed pe; absent: redox species left out ...
    // ... unless the electrons are conserved instead: sum over species of (e- in its formation
    // x molality) = electron_total, with the pe free. Process steps carry a water with a pe
    // this way, so a change of pH does not create oxygen out of nothing.
    std::optional<double> electron_total;
    // Redox states of one element given apart (a lab's Fe(2) and Fe(3)): the species of the
    // element that carry e- use an electron activity of their own, fixed by this total (the
    // e- of their formations x molality; -Fe(3) for iron), so the element need not be in
    // redox equilibrium with the rest of the water.
    struct RedoxSplit {
        std::size_t component = 0;
        double electron_total = 0.0;
    };
    std::vector<RedoxSplit> redox_splits;
    // With a fixed pH, close the charge balance by adjusting this component's total.
    std::optional<std::size_t> charge_balance_component;
    // The charge balance reads sum(z m) = charge_imbalance_eq (eq/kgw). A lab analysis is
    // balanced (0); a water carried through process steps keeps the imbalance its analysis
    // had, which is the same as conserving its protons.
    double charge_imbalance_eq = 0.0;
    std::vector<MineralTarget> minerals;     // phases in equilibrium (equilibrate)
    std::vector<GasTarget> gases;
    std::optional<Headspace> headspace;      // closed gas space (with gases fixed: not both for one gas)
    // Not used by the solver: kg of water per litre of solution, carried into the result so
    // reports can give mg/L.
    double kg_water_per_litre = 1.0;
    // Not used by the solver: the analyte a lab water's charge balance adjusts, as the lab
    // gave it (filled by to_speciation_input), so the report can say what was changed.
    struct ChargeBalanceAnalyte {
        std::string analyte;               // as the lab wrote it: "Cl"
        std::string unit;                  // the lab's unit: "mg/L"
        std::string as;                    // "CaCO3", an element, or empty
        double given = 0.0;                // in that unit
        double mol_per_kgw_per_unit = 0.0; // one unit of it, in mol/kgw of the component
    };
    std::optional<ChargeBalanceAnalyte> charge_balance_analyte;
    // Not used by the solver: what reading a lab's values assumed, in words for the report
    // (filled by to_speciation_input, passed on by deltag::describe_lab_input).
    std::vector<std::string> notes;
};

// A lab analyte adjusted to close the charge balance: what was given, what the balance
// needed, and whether the analysis as given met the Standard Methods 1030 E acceptance.
struct ChargeBalanceAdjustment {
    std::string analyte;
    std::string unit;                     // the lab's unit
    std::string as;                       // "CaCO3", an element, or empty
    double given = 0.0;                   // in the lab's unit
    double adjusted = 0.0;                // in the lab's unit
    double given_mmol_per_kgw = 0.0;
    double adjusted_mmol_per_kgw = 0.0;
    double change_meq_per_kgw = 0.0;      // charge added: z x (adjusted - given), meq/kgw
    double error_percent_as_given = 0.0;  // Standard Methods 1030 E, before the adjustment
    bool within_acceptance = true;        // the analysis as given met 1030 E
};

// Standard Methods 1030 E acceptance of an anion-cation balance: |cations - anions| <= 0.2
// meq for anion sums up to 3 meq, |error| <= 2 % for 3-10 meq, 5 % above (per kg of water
// here). The one place this criterion lives.
bool charge_balance_acceptable(double cations_meq, double anions_meq);

// 100 (cations - anions) / (cations + anions), Standard Methods 1030 E; 0 for no ions.
double charge_balance_error_percent(double cations_meq, double anions_meq);

// What moved between the water and a phase during a solve.
struct PhaseTransfer {
    std::string phase;
    bool is_gas = false;
    double moles = 0.0;        // mol/kgw into the water (+ dissolved, - precipitated)
    bool at_target = false;    // the phase ended at its target SI / partial pressure
    bool exhausted = false;    // a finite mineral dissolved completely
    bool blocked = false;      // the allowed direction stopped it short of its target
    double gas_moles_per_kgw = 0.0;  // closed headspace: moles left in the gas space at the end
    bool headspace = false;
};

struct SpeciesResult {
    std::size_t species = 0;  // index into Database::species()
    std::string name;
    double molality = 0.0;
    double activity = 0.0;
    double log_gamma = 0.0;
};

enum class Verdict { precipitation_favoured, dissolution_favoured, at_equilibrium };
std::string_view verdict_text(Verdict v);

struct SaturationResult {
    std::string phase;
    bool is_gas = false;
    double log_iap = 0.0;
    double log_k = 0.0;
    double si = 0.0;                  // log IAP - log K
    double delta_g_kj_per_mol = 0.0;  // RT ln(IAP/K) of the dissolution reaction
    Verdict verdict = Verdict::at_equilibrium;
};

// The saturation tolerance: |SI| within this counts as at equilibrium. 0.05 log units is
// about the uncertainty of log K of the common minerals at 25 degC (common practice).
inline constexpr double default_si_tolerance = 0.05;

struct SpeciationResult {
    std::string label;
    double temperature_c = 25.0;
    double ph = 7.0;
    std::optional<double> pe;
    double ionic_strength = 0.0;
    double water_activity = 1.0;
    double kg_water_per_litre = 1.0;          // from the input; converts mol/kgw to mol/L
    activity::ModelKind activity_model = activity::ModelKind::davies;
    std::vector<SpeciesResult> species;       // every species in the system, database order
    std::vector<double> component_totals;     // indexed like Database::species(); 0 if absent
    std::vector<bool> component_present;
    std::vector<double> component_log_activity;   // log10 a of each component species (NaN if absent)
    // Elements with their own electron activity (redox states given apart): component ->
    // log10 a(e-) of its species, and their electron total.
    std::vector<std::pair<std::size_t, double>> split_electron_log_activity;
    std::map<std::string, double> element_totals;  // mol/kgw, by element (not H, O)
    double alkalinity_eq = 0.0;               // total alkalinity, eq/kgw
    double cations_meq = 0.0;                 // sum of z*m over cations, meq/kgw
    double anions_meq = 0.0;                  // sum of |z|*m over anions, meq/kgw
    double charge_balance_error_percent = 0.0;  // Standard Methods 1030 E
    std::vector<SaturationResult> saturation;
    std::vector<PhaseTransfer> transfers;
    std::vector<std::string> warnings;
    SolveSummary summary;
    // A lab water whose charge balance adjusted an analyte: what changed (filled by
    // deltag::describe_charge_balance_adjustment, not by the solver).
    std::optional<ChargeBalanceAdjustment> charge_balance_adjustment;

    const SpeciesResult* find(std::string_view name) const;
};

// Solves one speciation. Throws InputError for an input that cannot be set up and
// ConvergenceError when every attempt fails. `start` (a previous result of the same
// components) gives a warm start.
SpeciationResult speciate(const thermo::Database& db, const SpeciationInput& input,
                          const SolverOptions& options = {},
                          const SpeciationResult* start = nullptr);

// How many times speciate() has run in this process, on all threads: benchmarks and tests
// count with it what a step, an index or a sweep point costs in solves.
std::uint64_t speciation_count();

// Saturation of every mineral and gas whose components are all present in the result.
std::vector<SaturationResult> saturation_indices(const thermo::Database& db,
                                                 const SpeciationResult& result,
                                                 double si_tolerance = default_si_tolerance);

}  // namespace deltag::equilibrium
