// A water as a lab reports it, and its conversion into solver input (units, "as", density).
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/error.hpp"
#include "deltag/speciation.hpp"

namespace deltag {

struct AnalyteValue {
    // Analyte key as the lab writes it (Ca, SO4, Alkalinity, ...). A redox state of an element
    // given apart, Fe = { "+2" = 2.4, "+3" = 0.3 }, is one analyte per state, named by the
    // element and the state, "Fe +2" (the database's name for it), with both parts below.
    std::string name;
    std::string element;          // redox state: "Fe"; empty otherwise
    std::string oxidation_state;  // redox state: "+2"; empty otherwise
    double value = 0.0;
    std::string unit;   // empty: the water's default unit
    std::string as;     // empty, an element (N, C, Si, ...) or "CaCO3"
    // Written as a lab writes a value below its detection limit ("<0.05"): `value` is then the
    // limit, and the water's below_detection rule says what is used in its place.
    bool below_detection = false;
    SourceLocation where;
    std::string key;    // dotted key for messages: water.NAME.analytes.X
};

// Values a lab measures on the whole sample, beside its analysis, for the Standard Methods
// 1030 E checks of the analysis (process::water_figures compares them with the calculated
// ones). Case keys in the water block: measured_tds_mg_per_l, measured_conductance_25c_us_per_cm.
struct LabMeasurements {
    std::optional<double> tds_mg_per_l;               // dissolved solids, mg/L (dried residue)
    std::optional<double> conductance_25c_us_per_cm;  // specific conductance at 25 degC, uS/cm
};

struct WaterAnalysis {
    std::string name;
    double temperature_c = 25.0;
    std::optional<double> ph;
    std::optional<double> pe;
    // Redox level from an electrode reading: Eh in mV against `eh_reference` (a reference
    // electrode name, default "SHE"), converted to SHE at the water's temperature.
    std::optional<double> eh_mv;
    std::string eh_reference = "SHE";
    SourceLocation eh_where;
    // Redox level from dissolved oxygen (mg/L O2) through the O2/H2O couple at the pH.
    std::optional<double> dissolved_oxygen_mg_per_l;
    SourceLocation dissolved_oxygen_where;
    std::string charge_balance;                  // "", "pH" or an analyte name
    std::string units = "mg/L";                  // default unit of the analytes
    std::optional<double> density_kg_per_l;      // solution density; default from temperature
    std::vector<AnalyteValue> analytes;
    // What a value below the detection limit counts as: "half" the limit (the default),
    // "zero" or the "limit" itself. See below_detection_rules().
    std::string below_detection = "half";
    SourceLocation below_detection_where;
    LabMeasurements measured;                    // empty: none given
    SourceLocation where;                        // the [water.NAME] table
    SourceLocation charge_balance_where;
};

// One unit of concentration: what it is counted per (a litre of solution, a kg of solution, a
// kg of water), what it measures (a mass, an amount, equivalents), and the factor to g, mol or
// eq. The one table of units: the water reader, doses and the case reader all use it.
struct ConcentrationUnit {
    enum class Basis { per_litre, per_kg_solution, per_kg_water };
    enum class Measure { mass, amount, equivalents };
    std::string_view name;
    Basis basis = Basis::per_litre;
    Measure measure = Measure::mass;
    double scale = 1.0;  // to g, mol or eq
};

// Every unit: mg/L, ug/L, g/L, mol/L, mmol/L, umol/L, meq/L (per litre of solution); mg/kg and
// ppm (per kg of solution; "ppm" is parts per million by mass, mg/kg, not mg/L); mol/kgw,
// mmol/kgw, umol/kgw, mg/kgw, g/kgw (per kg of water).
const std::vector<ConcentrationUnit>& concentration_unit_table();
// The entry of a unit as written, nullptr when there is none. The micro prefix may be "u", the
// micro sign "µ" or the Greek mu "μ": "ug/L", "µg/L" and "μg/L" are one unit.
const ConcentrationUnit* find_concentration_unit(std::string_view unit);

// The names a concentration may be given in (the table's, and the µ spelling of each u unit).
const std::vector<std::string>& concentration_units();
bool is_concentration_unit(std::string_view unit);

// The rules for a value below its detection limit: "half", "zero", "limit".
const std::vector<std::string>& below_detection_rules();

// Turns a lab analysis into solver input: resolves analytes to components, converts units
// (per litre of solution and per kg of solution to per kg of water, using the density and
// the dissolved solids), applies "as", sets pH, pe and the charge-balance choice.
// Throws InputError naming the water, the analyte and the nearest valid name.
equilibrium::SpeciationInput to_speciation_input(const WaterAnalysis& water,
                                                 const thermo::Database& db,
                                                 activity::ModelKind model);

// After the solve of a lab water: adds to the result's warnings what reading the lab's values
// assumed (input.notes: values below detection, HCO3 and CO3 taken as alkalinity), then
// describes a charge-balance adjustment (below).
void describe_lab_input(const equilibrium::SpeciationInput& input, equilibrium::SpeciationResult& result,
                        const thermo::Database& db);

// After the solve of a lab water whose charge balance adjusts an analyte: records in the
// result what was given and what the balance needed (in the lab's unit and in mmol/kgw),
// and whether the analysis as given met the Standard Methods 1030 E acceptance; a change
// beyond it also adds a warning. Does nothing for other waters.
void describe_charge_balance_adjustment(const equilibrium::SpeciationInput& input, equilibrium::SpeciationResult& result,
                                        const thermo::Database& db);

}  // namespace deltag
