// Physical constants (CODATA 2018) and the reference temperature.
#pragma once

namespace deltag::constants {

inline constexpr double gas_constant = 8.314462618;     // R, J mol^-1 K^-1 (CODATA 2018)
inline constexpr double faraday = 96485.33212;          // F, C mol^-1 (CODATA 2018)
inline constexpr double avogadro = 6.02214076e23;       // N_A, mol^-1 (SI definition)
inline constexpr double boltzmann = 1.380649e-23;       // k, J K^-1 (SI definition)
inline constexpr double elementary_charge = 1.602176634e-19;  // e, C (SI definition)
inline constexpr double vacuum_permittivity = 8.8541878128e-12;  // eps0, F m^-1 (CODATA 2018)
inline constexpr double zero_celsius_k = 273.15;        // SI definition
inline constexpr double reference_temperature_k = 298.15;  // 25 degC standard state
inline constexpr double ln10 = 2.302585092994045684;
inline constexpr double water_molar_mass_kg = 0.01801528;  // kg/mol, from IUPAC 2021 weights

// RT ln10 in kJ/mol at temperature T (K): multiply a log10 by this to get kJ/mol.
constexpr double rt_ln10_kj(double temperature_k) {
    return gas_constant * temperature_k * ln10 / 1000.0;
}

// Nernst slope RT ln10 / F in volts per decade.
constexpr double nernst_slope_v(double temperature_k) {
    return gas_constant * temperature_k * ln10 / faraday;
}

}  // namespace deltag::constants
