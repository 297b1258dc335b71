#include <algorithm>
#include <cmath>

#include "deltag/constants.hpp"
#include "deltag/database.hpp"
#include "deltag/water_properties.hpp"

namespace deltag::thermo {

// IAPWS (2004) Guideline on the Henry's constant and vapor-liquid distribution constant for
// gases in H2O and D2O at high temperatures; Fernandez-Prini, R., Alvarez, J.L. & Harvey, A.H.
// (2003) J. Phys. Chem. Ref. Data 32, 903-916:
//   ln(k_H / p_s) = A/Tr + B tau^0.355 / Tr + C Tr^-0.41 exp(tau),  Tr = T/Tc, tau = 1 - Tr,
// with k_H = lim f(gas)/x(gas) in MPa and p_s the vapour pressure of water (the IAPWS
// saturation-pressure equation of Wagner & Pruss 1993, coefficients as the guideline gives
// them). For X(g) = X(aq), K = m/p: x = m M_w at infinite dilution, so K = p0/(M_w k_H) in
// mol/(kg atm) with p0 = 0.101325 MPa.
double log_k_gas_solubility(const std::array<double, 3>& abc, double temperature_c) {
    constexpr double t_crit = 647.096, p_crit_mpa = 22.064;
    constexpr std::array<double, 6> a = {-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502};
    constexpr std::array<double, 6> b = {1.0, 1.5, 3.0, 3.5, 4.0, 7.5};
    constexpr double molar_mass_water_kg = 0.018015268;
    constexpr double atm_mpa = 0.101325;
    const double tr = (temperature_c + constants::zero_celsius_k) / t_crit;
    const double tau = 1.0 - tr;
    double sum = 0.0;
    for (std::size_t i = 0; i < a.size(); ++i) sum += a[i] * std::pow(tau, b[i]);
    const double ln_ps = std::log(p_crit_mpa) + sum / tr;
    const double ln_kh = ln_ps + abc[0] / tr + abc[1] * std::pow(tau, 0.355) / tr + abc[2] * std::pow(tr, -0.41) * std::exp(tau);
    return std::log10(atm_mpa / molar_mass_water_kg) - ln_kh / constants::ln10;
}

double LogKModel::log_k(double temperature_c) const {
    const double t = temperature_c + constants::zero_celsius_k;
    const double t0 = constants::reference_temperature_k;
    switch (form) {
        case Form::constant:
            return log_k_25;
        case Form::van_t_hoff: {
            // ln K(T) = ln K0 - dH0/R (1/T - 1/T0) + dCp/R (ln(T/T0) + T0/T - 1), constant dCp.
            const double r = constants::gas_constant;
            const double dh = delta_h_kj_per_mol * 1000.0;
            const double ln_k = log_k_25 * constants::ln10 - dh / r * (1.0 / t - 1.0 / t0) +
                                delta_cp_j_per_mol_k / r * (std::log(t / t0) + t0 / t - 1.0);
            return ln_k / constants::ln10;
        }
        case Form::analytic:
            return fit[0] + fit[1] * t + fit[2] / t + fit[3] * std::log10(t) + fit[4] / (t * t);
        case Form::water_ionization:
            // For the reaction H2O = H+ + OH-: log K = -pKw (Bandura & Lvov 2006).
            return -water_pkw(temperature_c);
        case Form::gas_solubility:
            return log_k_gas_solubility(henry, temperature_c);
    }
    return log_k_25;
}

double Electrode::e0_at(double temperature_c) const {
    if (e0_polynomial_v.empty()) return e0_v + de0_dt_v_per_k * (temperature_c - 25.0);
    double e = 0.0;
    for (auto it = e0_polynomial_v.rbegin(); it != e0_polynomial_v.rend(); ++it) e = e * temperature_c + *it;
    return e;
}

double LogKFunction::operator()(double temperature_c) const {
    double s = 0.0;
    for (const auto& [w, m] : terms) s += w * m.log_k(temperature_c);
    return s;
}

TemperatureRange LogKFunction::range() const {
    TemperatureRange r{-1e300, 1e300};
    bool any = false;
    for (const auto& [w, m] : terms) {
        if (!m.range) continue;
        r.min_c = std::max(r.min_c, m.range->min_c);
        r.max_c = std::min(r.max_c, m.range->max_c);
        any = true;
    }
    if (!any) return TemperatureRange{25.0, 25.0};
    return r;
}

bool LogKFunction::temperature_dependent() const {
    return std::all_of(terms.begin(), terms.end(),
                       [](const auto& t) { return t.second.form != LogKModel::Form::constant; });
}

void LogKFunction::add(double weight, const LogKFunction& other) {
    for (const auto& [w, m] : other.terms) terms.emplace_back(weight * w, m);
}

}  // namespace deltag::thermo
