// The figures of a lab sheet, from a speciated water: hardness, alkalinity (P and M), the
// calculated dissolved solids, and the indices beside Langelier's (Larson-Skold, Puckorius,
// the Aggressive Index). Each figure follows a published method, named beside it here and in
// src/process/figures.cpp. Plain arithmetic on a result: nothing here solves or throws for a
// water; a figure without an answer carries the reason.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/speciation.hpp"

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

    // What a reader must know beside the figures (an index past its range, ...).
    std::vector<std::string> notes;
};

// The figures of a speciated water. `indices` (optional) gives the pHs for Puckorius.
WaterFigures water_figures(const thermo::Database& db, const equilibrium::SpeciationResult& r,
                           const Indices* indices = nullptr);

}  // namespace deltag::process
