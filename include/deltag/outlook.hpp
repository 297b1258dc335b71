// What a water will do: for each mineral near saturation, its tendency in words, the free
// energy that drives it and how much would deposit or dissolve to reach equilibrium; and the
// Langelier and Ryznar indices read in words. This is the answer a report gives first.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/speciation.hpp"

namespace deltag::process {

// In order of risk (the outlook sorts by it).
enum class Tendency { scale_forming, balanced, dissolving };
std::string_view tendency_text(Tendency t);
// The tendency of a mineral at saturation index `si`: within `tolerance` of zero it is
// balanced (the uncertainty of log K, equilibrium::default_si_tolerance).
Tendency tendency_of(double si, double tolerance = equilibrium::default_si_tolerance);

struct MineralOutlook {
    std::string mineral;
    std::string formula;
    double si = 0.0;
    double delta_g_kj_per_mol = 0.0;     // RT ln(IAP/K): > 0 drives deposition
    Tendency tendency = Tendency::balanced;
    // The amount that reaches equilibrium with this mineral alone, in a closed system (no
    // gas exchange; the water's pe, where it has one, held): + deposits from the water, -
    // dissolves into it if the solid is there. For calcite this is the CCPP.
    bool amount_available = false;
    double mmol_per_kgw = 0.0;
    double mg_per_l = 0.0;
    std::string why_not;                 // when the amount is not available
    std::string note;                    // a fact a reader needs beside the verdict
};

struct Outlook {
    double si_floor = -1.0;              // minerals below this SI are counted, not listed
    std::vector<MineralOutlook> minerals;  // by risk: see mineral_outlook
    std::size_t far_below = 0;           // minerals with SI below si_floor
};

// The minerals of `w.result` with SI at or above `si_floor`, by risk (scale-forming, balanced,
// dissolving; within each, minerals that form too slowly in water systems after the others,
// then highest SI first), each with the
// amount to equilibrium (one closed-system solve per mineral). Never throws for a water: a
// solve that fails leaves that mineral's amount unavailable with the reason.
Outlook mineral_outlook(const thermo::Database& db, const WaterState& w, double si_floor = -1.0,
                        double tolerance = equilibrium::default_si_tolerance);

// The same list without the amounts (no solve; each amount unavailable, with the reason).
Outlook saturation_outlook(const thermo::Database& db, const equilibrium::SpeciationResult& r, double si_floor = -1.0,
                           double tolerance = equilibrium::default_si_tolerance);

// The Langelier index in words (Langelier 1936) and the Ryznar index in words (Ryznar 1944);
// read at the two decimals a report shows. Classes and sources in src/process/outlook.cpp.
std::string langelier_reading(double lsi);
std::string ryznar_reading(double rsi);

}  // namespace deltag::process
