// The figures of a lab sheet, from a speciated water: hardness, alkalinity (P and M), the
// calculated dissolved solids and conductance (with the measured ones where the lab gave
// them, and the Standard Methods 1030 E checks of the analysis), the ions in mg/L and meq/L
// with the ion balance, and the indices beside Langelier's (Larson-Skold, Puckorius, the
// Aggressive Index). Each figure follows a published method, named beside it here and in
// src/process/figures.cpp. Plain arithmetic on a result: nothing here solves or throws for a
// water; a figure without an answer carries the reason.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"

namespace deltag::process {

// mg of CaCO3 per milliequivalent: CaCO3 / 2 = 100.087 / 2 (Standard Methods 2320 B, 2340 B).
inline constexpr double mg_caco3_per_meq = 50.04;

// --- the published formulas, each on its own so a test can check it ----------------------

// Standard Methods 2340 B: hardness, mg/L as CaCO3 = 2.497 [Ca, mg/L] + 4.118 [Mg, mg/L].
double hardness_from_ca_mg(double ca_mg_per_l, double mg_mg_per_l);

// Standard Methods 2340 (definitions): carbonate hardness is the part of the total hardness
// equal to the alkalinity (both as CaCO3), all of it when the alkalinity is the larger; the
// rest is non-carbonate hardness. Returns {carbonate, non-carbonate}.
std::pair<double, double> split_hardness(double total_hardness, double total_alkalinity);

// Larson and Skold (1958): (Cl- + SO4^2-) / (HCO3- + CO3^2-), all in equivalents.
double larson_skold(double chloride_meq, double sulfate_meq, double carbonate_alkalinity_meq);

// Puckorius and Brooke (1991): pHeq = 1.465 log10(total alkalinity, mg/L as CaCO3) + 4.54;
// PSI = 2 pHs - pHeq.
double puckorius_ph_eq(double total_alkalinity_mg_caco3);
double puckorius(double ph_s, double total_alkalinity_mg_caco3);

// The Debye-Hueckel-Onsager equation, extended (Onsager 1927; see figures.cpp): the
// equivalent conductance at 25 degC, S cm2/eq, of an ion of limiting conductance lambda0 and
// charge z at ionic strength I; never below 0. B1 and B2: Robinson and Stokes (1959),
// Electrolyte Solutions, written from memory.
inline constexpr double onsager_b1_coefficient = 0.2289;  // (mol/L)^-1/2, water at 25 degC
inline constexpr double onsager_b2_coefficient = 60.20;   // S cm2 mol^-1 (mol/L)^-1/2
double ionic_conductance(double lambda0, int charge, double ionic_strength);

// AWWA C400: AI = pH + log10(A H), A the total alkalinity and H the calcium hardness, both
// mg/L as CaCO3.
double aggressive_index(double ph, double total_alkalinity_mg_caco3, double calcium_hardness_mg_caco3);

// Each index in words, read at the two decimals a report shows (so the words agree with the
// number printed). The classes and their sources are in src/process/figures.cpp.
std::string larson_skold_reading(double index);
std::string puckorius_reading(double index);
std::string aggressive_index_reading(double index);

// The ionic strength past which the Langelier family of indices (Langelier, Ryznar,
// Puckorius, Aggressive Index) stops being meaningful: 0.5 mol/kgw, the upper limit of the
// Davies equation that Standard Methods 2330 uses for its activity coefficients (Davies
// 1962; Standard Methods 2330, written from memory), some 25 000-30 000 mg/L of dissolved solids
// (brackish water and brines, where the Stiff-Davis index of 1952 is used instead).
inline constexpr double langelier_ionic_strength_limit = 0.5;

// Standard Methods 1030 E (checking the correctness of an analysis), the acceptable ratios,
// each inclusive at both ends. Written from memory of the method's text; the wording of
// each criterion is in src/process/figures.cpp beside the check.
inline constexpr double tds_measured_to_calculated_low = 1.0;   // measured TDS / calculated TDS
inline constexpr double tds_measured_to_calculated_high = 1.2;
inline constexpr double conductance_calculated_to_measured_low = 0.9;   // calculated EC / measured EC
inline constexpr double conductance_calculated_to_measured_high = 1.1;
inline constexpr double tds_to_conductance_low = 0.55;   // TDS (mg/L) / EC (uS/cm)
inline constexpr double tds_to_conductance_high = 0.7;
inline constexpr double ion_sum_to_conductance_low = 0.9;   // 100 x ion sum (meq/L) / EC (uS/cm)
inline constexpr double ion_sum_to_conductance_high = 1.1;

// One ion of the analysis (the ions table of a lab sheet).
struct IonFigure {
    std::string ion;         // the species name: "Ca^2+", "HCO3-"
    int charge = 0;
    double mg_per_l = 0.0;   // as the ion itself (NO3- as NO3, not as N)
    double meq_per_l = 0.0;  // mmol/L x |charge|
};

// One Standard Methods 1030 E check of an analysis: a ratio and its acceptable range.
struct AnalysisCheck {
    std::string ratio_name;   // "measured TDS / calculated TDS", as the method writes the ratio
    double ratio = 0.0;
    double low = 0.0, high = 0.0;  // acceptable, inclusive
    bool within = true;
};

// A measured value beside the calculated one.
struct MeasuredBeside {
    bool given = false;             // the case file gave the measured value
    double measured = 0.0;
    double calculated = 0.0;
    bool ratio_available = false;   // false when the calculated value is zero
    double ratio = 0.0;             // measured / calculated
};

// --- the figures of one water ------------------------------------------------------------

struct WaterFigures {
    // Hardness, mg/L as CaCO3 (Standard Methods 2340 B).
    double calcium_mg_per_l = 0.0;
    double magnesium_mg_per_l = 0.0;
    double hardness_calcium = 0.0;
    double hardness_magnesium = 0.0;
    double hardness_total = 0.0;
    double hardness_carbonate = 0.0;
    double hardness_non_carbonate = 0.0;

    // Alkalinity, mg/L as CaCO3 (Standard Methods 2320). M: to the carbonic-acid end point
    // (about pH 4.5), the water's total alkalinity. P: to the bicarbonate end point (about
    // pH 8.3), M less the dissolved inorganic carbon (Stumm and Morgan 1996, the carbonate
    // alkalinity); a water below that end point shows none, and needs base instead: the
    // acidity to pH 8.3 (Standard Methods 2310, phenolphthalein acidity) as CaCO3.
    double alkalinity_total_m = 0.0;
    double alkalinity_phenolphthalein_p = 0.0;
    double acidity_to_ph_8_3 = 0.0;
    double carbonate_alkalinity_meq_per_l = 0.0;  // HCO3- + 2 CO3^2- and their ion pairs

    // Dissolved solids calculated from the analysis, mg/L (Standard Methods 1030 E; Hem 1985):
    // the constituents' masses with the carbonate species counted as carbonate (HCO3- x 0.4917).
    double tds_calculated_mg_per_l = 0.0;

    // Specific conductance at 25 degC, uS/cm (Standard Methods 2510 calculation; Onsager 1927),
    // and the share of the ionic charge held by ions without a limiting conductance (left out).
    double specific_conductance_us_per_cm = 0.0;
    double conductance_charge_left_out_percent = 0.0;
    int conductance_ions_counted = 0;

    // The measured values the lab gave (case keys measured_tds_mg_per_l and
    // measured_conductance_25c_us_per_cm; only for a water as analysed, never for a step's
    // result), each beside the calculated value above, with measured / calculated.
    MeasuredBeside tds_measured;
    MeasuredBeside conductance_measured;

    // The ions table (Standard Methods 1030 E, anion-cation balance): every ion of the
    // analysis, its total in mg/L and meq/L, cations then anions, each list in the database's
    // order. An ion is its component's total counted at the component's charge (ion pairs
    // not split: CaSO4(aq) counts in Ca^2+ and in SO4^2-); the carbonate species are split by
    // the speciation into HCO3- (HCO3- and its pairs) and CO3^2- (CO3^2- and its pairs), whose
    // equivalents sum to the carbonate alkalinity; free OH- is listed once it reaches 0.001
    // meq/L (above about pH 9). H+, the uncharged components (SiO2, B(OH)3, ...) and
    // dissolved gases are not listed. Per litre of solution, as 1030 E sums them.
    std::vector<IonFigure> cations;
    std::vector<IonFigure> anions;
    double cations_meq_per_l = 0.0;   // the sum of the cations' meq/L
    double anions_meq_per_l = 0.0;    // the sum of the anions' meq/L
    // 100 (cations - anions) / (cations + anions) over the table's sums, and whether the
    // balance meets the 1030 E acceptance (equilibrium::charge_balance_acceptable). The
    // solver's own warning about the balance (SpeciationResult::warnings) stands for the water
    // as analysed; this flag adds no note of its own.
    double ion_balance_error_percent = 0.0;
    bool ion_balance_acceptable = true;

    // The Standard Methods 1030 E checks the measured values allow, in this order: measured
    // TDS / calculated TDS; calculated EC / measured EC; measured TDS / EC; calculated TDS /
    // EC; 100 x cation sum / EC; 100 x anion sum / EC (EC the measured conductance). A check is
    // left out when a value it needs is missing or zero. Each outside its range adds a note.
    std::vector<AnalysisCheck> checks;

    // Larson-Skold index; unavailable without carbonate alkalinity.
    bool larson_skold_available = false;
    double larson_skold = 0.0;
    std::string larson_skold_reading;
    std::string larson_skold_why_not;

    // Puckorius index: needs the pHs of the Langelier index and alkalinity.
    bool puckorius_available = false;
    double puckorius_ph_eq = 0.0;
    double puckorius = 0.0;
    std::string puckorius_reading;
    std::string puckorius_why_not;

    // Aggressive Index (AWWA C400): needs calcium and alkalinity.
    bool aggressive_index_available = false;
    double aggressive_index = 0.0;
    std::string aggressive_index_reading;
    std::string aggressive_index_why_not;

    // The warnings beside the figures: an ionic strength past the Langelier family's range,
    // a 1030 E check outside its range, ... Each a sentence naming its source.
    std::vector<std::string> notes;
};

// The figures of a speciated water. `indices` (optional) gives the pHs for Puckorius;
// `measured` (optional) the lab's measured values, for a water as analysed.
WaterFigures water_figures(const thermo::Database& db, const equilibrium::SpeciationResult& r,
                           const Indices* indices = nullptr, const LabMeasurements* measured = nullptr);

}  // namespace deltag::process
