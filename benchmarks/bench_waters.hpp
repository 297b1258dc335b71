// The waters the benchmarks and scripts/bench measure on. INVENTED waters, not real sites:
// a 10-component water (Ca, Mg, Na, K, Cl, SO4, carbonate, silica, F, NO3, pH from the charge
// balance), and an invented cooling tower: its circulating water at 45 degC dosed with
// sulfuric acid until the Langelier index is +0.5, and its make-up concentrated over a sweep
// of cycles with the calcite SI and the Langelier index at each point.
#pragma once

#include "deltag/speciation.hpp"

namespace deltag::bench {

inline equilibrium::SpeciationInput ten_component_water(double temperature_c) {
    const thermo::Database& db = thermo::Database::embedded();
    auto total = [&](const char* n, double v) {
        return equilibrium::ComponentInput{*db.find_species(n), equilibrium::ComponentInput::Kind::total, v};
    };
    equilibrium::SpeciationInput in;
    in.label = "bench";
    in.temperature_c = temperature_c;
    in.activity_model = activity::ModelKind::truesdell_jones;
    in.components = {total("Ca^2+", 2.5e-3), total("Mg^2+", 1.0e-3), total("Na+", 1.2e-3), total("K+", 1e-4),
                     total("Cl-", 1.5e-3),   total("SO4^2-", 1.1e-3), total("HCO3-", 4.8e-3),
                     total("H4SiO4", 2e-4),  total("F-", 1e-5),       total("NO3-", 1e-4)};
    return in;  // pH from the charge balance
}

// The circulating water and its acid dose (one water, one step).
inline const char* tower_dose_case_text() {
    return R"toml(title = "Bench tower, acid dose (invented)"
activity_model = "truesdell-jones"
[water.circulating]
temperature_c = 45.0
pH = 8.6
units = "mg/L"
[water.circulating.analytes]
Ca = 192.0
Mg = 46.0
Na = 108.0
K = 12.4
Cl = 124.0
SO4 = 168.0
Alkalinity = { value = 420, as = "CaCO3" }
SiO2 = 48.0
[[step]]
label = "acid to LSI +0.5"
kind = "dose"
reagent = "H2SO4"
until = { langelier = 0.5 }
)toml";
}

// The make-up, concentrated and heated, over a sweep of cycles (11 points).
inline const char* tower_sweep_case_text() {
    return R"toml(title = "Bench tower, cycles sweep (invented)"
activity_model = "truesdell-jones"
[water.makeup]
temperature_c = 18.0
pH = 7.85
units = "mg/L"
[water.makeup.analytes]
Ca = 48.0
Mg = 11.5
Na = 27.0
K = 3.1
Cl = 31.0
SO4 = 42.0
Alkalinity = { value = 135, as = "CaCO3" }
SiO2 = 12.0
[[step]]
label = "cycles"
kind = "concentrate"
factor = 4.0
[[step]]
label = "condenser outlet"
kind = "temperature"
temperature_c = 45.0
[[sweep]]
label = "cycles"
step = "cycles"
at = "condenser outlet"
variable = "factor"
from = 1.0
to = 6.0
points = 11
outputs = ["si:Calcite", "langelier"]
)toml";
}

}  // namespace deltag::bench
