#include <algorithm>
#include <cmath>

#include "deltag/constants.hpp"
#include "deltag/database.hpp"
#include "deltag/water_properties.hpp"

namespace deltag::thermo {

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
    }
    return log_k_25;
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
