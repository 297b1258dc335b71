// Properties of liquid water: density, relative permittivity, Debye-Hueckel A and B, pKw.
// Each function names its published source; see water_properties.hpp for validity ranges.
#include "deltag/water_properties.hpp"

#include <array>
#include <cmath>
#include <numbers>

#include "deltag/constants.hpp"
#include "deltag/error.hpp"

namespace deltag::thermo {

std::string temperature_problem(double temperature_c) {
    if (accepted_temperature_c.contains(temperature_c)) return "";
    return "expected a temperature from " + message_number(accepted_temperature_c.min_c) + " to " +
           message_number(accepted_temperature_c.max_c) + " °C (the range of the water-property correlations), found " +
           message_number(temperature_c);
}

// Kell (1975) J. Chem. Eng. Data 20, 97: density of air-free water at 1 atm, 0-150 degC,
// as a rational function of t (degC), result in kg/m^3.
double water_density_kg_m3(double temperature_c) {
    const double t = temperature_c;
    const double numerator =
        999.83952 + t * (16.945176 + t * (-7.9870401e-3 +
                    t * (-46.170461e-6 + t * (105.56302e-9 + t * (-280.54253e-12)))));
    return numerator / (1.0 + 16.879850e-3 * t);
}

// IAPWS (1997) Release on the static dielectric constant of ordinary water substance,
// Fernandez, D.P., Goodwin, A.R.H., Lemmon, E.W., Levelt Sengers, J.M.H. & Williams, R.C.
// (1997) J. Phys. Chem. Ref. Data 26, 1125-1166: a Harris-Alder g factor fitted in reduced
// density and temperature, put into the Kirkwood-Froehlich relation. Valid 238-873 K up to
// 1000 MPa given the density at (T, p); here the density is Kell's at about 1 atm, so the
// result is for liquid water at 1 atm (0-100 degC) and on the saturation curve to 150 degC
// within 0.02 (the two densities differ by less than 0.3 kg/m^3 there). The release fixes its
// own values of the constants (k, N_A, eps0 of CODATA 1986, the dipole moment and the mean
// molecular polarizability of the water molecule); they are part of the formulation.
double water_relative_permittivity(double temperature_c) {
    constexpr double boltzmann_1986 = 1.380658e-23;      // J/K
    constexpr double avogadro_1986 = 6.0221367e23;       // 1/mol
    constexpr double eps0 = 8.854187817e-12;             // F/m
    constexpr double dipole = 6.138e-30;                 // C m
    constexpr double polarizability = 1.636e-40;         // C^2 m^2 / J
    constexpr double molar_mass = 0.018015268;           // kg/mol
    constexpr double t_crit = 647.096, rho_crit = 322.0; // K, kg/m^3
    constexpr std::array<double, 11> n = {0.978224486826, -0.957771379375, 0.237511794148, 0.714692244396,
                                          -0.298217036956, -0.108863472196, 0.949327488264e-1,
                                          -0.980469816509e-2, 0.165167634970e-4, 0.937359795772e-4,
                                          -0.12317921872e-9};
    constexpr double n12 = 0.196096504426e-2;
    constexpr std::array<int, 11> i_exp = {1, 1, 1, 2, 3, 3, 4, 5, 6, 7, 10};
    constexpr std::array<double, 11> j_exp = {0.25, 1, 2.5, 1.5, 1.5, 2.5, 2, 2, 5, 0.5, 10};
    const double t = temperature_c + constants::zero_celsius_k;
    const double rho = water_density_kg_m3(temperature_c);
    const double delta = rho / rho_crit;
    const double tau = t_crit / t;
    double g = 1.0 + n12 * delta * std::pow(t / 228.0 - 1.0, -1.2);
    for (std::size_t h = 0; h < n.size(); ++h) g += n[h] * std::pow(delta, i_exp[h]) * std::pow(tau, j_exp[h]);
    const double number_density = avogadro_1986 * rho / molar_mass;  // molecules per m^3
    const double a = number_density * dipole * dipole * g / (eps0 * boltzmann_1986 * t);
    const double b = number_density * polarizability / (3.0 * eps0);
    return (1.0 + a + 5.0 * b + std::sqrt(9.0 + 2.0 * a + 18.0 * b + a * a + 10.0 * a * b + 9.0 * b * b)) /
           (4.0 * (1.0 - b));
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
