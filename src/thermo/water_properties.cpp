// Properties of liquid water: density, relative permittivity, Debye-Hueckel A and B, pKw.
// Each function names its published source; see water_properties.hpp for validity ranges.
#include "deltag/water_properties.hpp"

#include <array>
#include <cmath>
#include <numbers>

#include "deltag/constants.hpp"

namespace deltag::thermo {

// Kell (1975) J. Chem. Eng. Data 20, 97: density of air-free water at 1 atm, 0-150 degC,
// as a rational function of t (degC), result in kg/m^3.
double water_density_kg_m3(double temperature_c) {
    const double t = temperature_c;
    const double numerator =
        999.83952 + t * (16.945176 + t * (-7.9870401e-3 +
                    t * (-46.170461e-6 + t * (105.56302e-9 + t * (-280.54253e-12)))));
    return numerator / (1.0 + 16.879850e-3 * t);
}

// Malmberg & Maryott (1956) J. Res. Natl. Bur. Stand. 56, 1, 0-100 degC.
double water_relative_permittivity(double temperature_c) {
    const double t = temperature_c;
    return 87.740 + t * (-0.40008 + t * (9.398e-4 + t * (-1.410e-6)));
}

// Debye-Hueckel limiting-law constant A and size-term constant B from first principles
// (CODATA 2018 / SI constants), with molality converted to number density by N_A * rho:
//   l_B = e^2 / (4 pi eps0 eps k T)                       (Bjerrum length, m)
//   A   = (2 pi N_A rho)^(1/2) l_B^(3/2) / ln 10          (kg^1/2 mol^-1/2)
//   B   = (2 N_A rho e^2 / (eps0 eps k T))^(1/2)          (m^-1 kg^1/2 mol^-1/2) * 1e-10 -> per angstrom
DebyeHuckelParameters debye_huckel_parameters(double temperature_c) {
    using namespace deltag::constants;
    constexpr double pi = std::numbers::pi;
    const double temperature_k = temperature_c + zero_celsius_k;
    const double rho = water_density_kg_m3(temperature_c);
    const double eps = water_relative_permittivity(temperature_c);
    const double e2 = elementary_charge * elementary_charge;
    const double kt = boltzmann * temperature_k;
    const double bjerrum = e2 / (4.0 * pi * vacuum_permittivity * eps * kt);
    const double a = std::sqrt(2.0 * pi * avogadro * rho) * std::pow(bjerrum, 1.5) / ln10;
    const double b = std::sqrt(2.0 * avogadro * rho * e2 / (vacuum_permittivity * eps * kt)) * 1e-10;
    return {a, b};
}

// pKw on the saturation curve: Bandura & Lvov (2006) J. Phys. Chem. Ref. Data 35, 15,
//   pKw = -2n[log10(1+Q) - Q/(Q+1) rho (b0 + b1/T + b2 rho)] + pKw^G + 2 log10(M_w),
//   Q = rho exp(a0 + a1/T + a2 rho^(2/3)/T^2),
//   pKw^G = g0 + g1/T + g2/T^2 + g3/T^3 (the ideal-gas ionization),
// with rho in g/cm^3 (Kell 1975 here), T in K and M_w = 0.018015268 kg/mol (so the last term
// is negative: it converts from mole fractions to molalities). Coefficients written from
// memory of the paper; with them the formula reproduces the paper's table (14.946, 13.995,
// 13.264, 12.696, 12.252 at 0, 25, 50, 75, 100 degC) within 0.001, which the tests check.
double water_pkw(double temperature_c) {
    constexpr double n = 6.0;
    constexpr double a0 = -0.864671, a1 = 8659.19, a2 = -22786.2;
    constexpr double b0 = 0.642044, b1 = -56.8534, b2 = -0.375754;
    constexpr double g0 = 0.61415, g1 = 48251.33, g2 = -67707.93, g3 = 10102100.0;
    constexpr double molar_mass_water_kg = 0.018015268;
    const double t = temperature_c + constants::zero_celsius_k;
    const double rho = water_density_kg_m3(temperature_c) / 1000.0;
    const double q = rho * std::exp(a0 + a1 / t + a2 * std::pow(rho, 2.0 / 3.0) / (t * t));
    const double pkw_gas = g0 + g1 / t + g2 / (t * t) + g3 / (t * t * t);
    return -2.0 * n * (std::log10(1.0 + q) - q / (q + 1.0) * rho * (b0 + b1 / t + b2 * rho)) + pkw_gas +
           2.0 * std::log10(molar_mass_water_kg);
}

}  // namespace deltag::thermo
