// Properties of liquid water at 0-100 degC and about 1 atm (saturation pressure above 100 degC
// is not covered): density, relative permittivity, Debye-Hueckel A and B.
#pragma once

#include <string>

namespace deltag::thermo {

// A range of temperatures in degC, ends included (to 1e-9 degC, so that a value printed and
// read back stays inside). contains() is false for NaN.
struct TemperatureRange {
    double min_c = 0.0;
    double max_c = 0.0;
    constexpr bool contains(double t_c) const { return t_c >= min_c - 1e-9 && t_c <= max_c + 1e-9; }
};

// The temperatures deltag accepts for a water, a step, a headspace, a cell or a diagram: liquid
// water at about 1 atm, where the water-property correlations below are used (0-100 degC).
// This is the one place of the limit; every check and message takes it from here.
inline constexpr TemperatureRange accepted_temperature_c{0.0, 100.0};

// "" when the temperature is within accepted_temperature_c; otherwise what was expected and
// what was found: "expected a temperature from 0 to 100 °C (the range of the water-property
// correlations), found 120".
std::string temperature_problem(double temperature_c);

// Density of air-free water at 1 atm, kg/m^3. Kell (1975) J. Chem. Eng. Data 20, 97,
// valid 0-150 degC.
double water_density_kg_m3(double temperature_c);

// Relative permittivity (dielectric constant) of liquid water at about 1 atm: the IAPWS (1997)
// formulation (Fernandez et al. 1997, J. Phys. Chem. Ref. Data 26, 1125) with the density above;
// 0-150 degC (above 100 degC: liquid on the saturation curve).
double water_relative_permittivity(double temperature_c);

struct DebyeHuckelParameters {
    double a = 0.0;  // A, kg^1/2 mol^-1/2 (log10 basis)
    double b = 0.0;  // B, kg^1/2 mol^-1/2 per angstrom
};

// A and B of Debye-Hueckel theory from the density and permittivity above and CODATA 2018
// constants: A = (2 pi N_A rho)^(1/2) (e^2 / (4 pi eps0 eps k T))^(3/2) / ln 10 and
// B = (2 N_A rho e^2 / (eps0 eps k T))^(1/2), converted to per angstrom.
DebyeHuckelParameters debye_huckel_parameters(double temperature_c);

// pKw = -log10 Kw (molal) of water on the saturation curve, from the formulation of
// Bandura & Lvov (2006) J. Phys. Chem. Ref. Data 35, 15, using the density above.
double water_pkw(double temperature_c);

}  // namespace deltag::thermo
