// Reference electrodes (common practice values, check-values.md) and Eh <-> pe.
#include "deltag/constants.hpp"
#include "deltag/reference_electrodes.hpp"

namespace deltag::electro {

const std::vector<ReferenceElectrode>& reference_electrodes() {
    // Common practice, no single source (check-values.md): values vary by a few mV between
    // suppliers and tables. The seawater electrode has no coefficient listed; 0 is used.
    static const std::vector<ReferenceElectrode> table = {
        {"SHE", 0.0, 0.0, "definition"},
        {"SCE", 0.241, -0.66e-3, "common practice"},
        {"Ag/AgCl(sat KCl)", 0.197, -1.0e-3, "common practice"},
        {"Ag/AgCl(3.5 M KCl)", 0.205, -0.7e-3, "common practice"},
        {"Ag/AgCl(3 M KCl)", 0.210, -0.7e-3, "common practice"},
        {"Ag/AgCl(1 M KCl)", 0.235, -0.6e-3, "common practice"},
        {"Ag/AgCl(seawater)", 0.25, 0.0, "common practice (no temperature coefficient listed)"},
        {"Cu/CuSO4(sat)", 0.316, 0.9e-3, "common practice"},
    };
    return table;
}

std::vector<std::string> reference_names() {
    std::vector<std::string> v;
    for (const auto& r : reference_electrodes()) v.push_back(r.name);
    return v;
}

double reference_v(const std::string& name, double temperature_c, const SourceLocation& where) {
    for (const auto& r : reference_electrodes())
        if (r.name == name) return r.e_25_v + r.de_dt_v_per_k * (temperature_c - 25.0);
    const std::string list = name_list(reference_names());
    throw InputError(where, "reference electrode", "unknown reference electrode '" + name + "'; expected one of: " + list,
                     nearest_name(name, reference_names()));
}

double convert_v(double value_v, const std::string& from, const std::string& to, double temperature_c,
                 const SourceLocation& where) {
    return value_v + reference_v(from, temperature_c, where) - reference_v(to, temperature_c, where);
}

double pe_from_eh(double eh_v, double temperature_c) {
    return eh_v / constants::nernst_slope_v(temperature_c + constants::zero_celsius_k);
}

double eh_from_pe(double pe, double temperature_c) {
    return pe * constants::nernst_slope_v(temperature_c + constants::zero_celsius_k);
}

}  // namespace deltag::electro
