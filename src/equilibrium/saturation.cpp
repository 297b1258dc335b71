// Saturation indices: SI = log IAP - log K(T), and the Gibbs energy of the dissolution
// reaction at the water's activities, dG = RT ln(IAP/K) = RT ln10 SI.
#include <cmath>

#include "deltag/constants.hpp"
#include "deltag/speciation.hpp"

namespace deltag::equilibrium {

std::vector<SaturationResult> saturation_indices(const thermo::Database& db, const SpeciationResult& r,
                                                 double si_tolerance) {
    std::vector<SaturationResult> out;
    const double t_k = r.temperature_c + constants::zero_celsius_k;
    auto one = [&](const thermo::PhaseEntry& p, bool gas) {
        double log_iap = 0.0;
        // The electrons of a phase of an element whose redox states are apart are its own.
        std::optional<double> own_electrons;
        for (const auto& [k, la] : r.split_electron_log_activity)
            for (const auto& [j, v] : p.dissolution)
                if (j == k) own_electrons = la;
        for (const auto& [j, v] : p.dissolution) {
            if (own_electrons && db.electron() && j == *db.electron()) {
                log_iap += v * *own_electrons;
                continue;
            }
            if (j >= r.component_present.size() || !r.component_present[j]) return;
            const double la = r.component_log_activity[j];
            if (!std::isfinite(la)) return;
            log_iap += v * la;
        }
        SaturationResult s;
        s.phase = p.name;
        s.is_gas = gas;
        // SI is the same whichever way the reaction is written; log IAP and log K are reported
        // for the dissolution as the database writes it (Ca^2+ + CO3^2- for calcite).
        s.si = log_iap - p.log_k(r.temperature_c);
        s.log_k = p.log_k_as_written(r.temperature_c);
        s.log_iap = s.si + s.log_k;
        s.delta_g_kj_per_mol = constants::rt_ln10_kj(t_k) * s.si;
        if (s.si > si_tolerance) s.verdict = Verdict::precipitation_favoured;
        else if (s.si < -si_tolerance) s.verdict = Verdict::dissolution_favoured;
        else s.verdict = Verdict::at_equilibrium;
        if (std::isfinite(s.si)) out.push_back(s);
    };
    for (const auto& m : db.minerals()) one(m, false);
    for (const auto& g : db.gases()) one(g, true);
    return out;
}

}  // namespace deltag::equilibrium
