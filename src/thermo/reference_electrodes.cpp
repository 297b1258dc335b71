// Reference electrodes (common practice values, check-values.md) and Eh <-> pe.
#include "deltag/constants.hpp"
#include "deltag/reference_electrodes.hpp"
#include "chem/names.hpp"

namespace deltag::electro {

double silver_chloride_e0_v(double temperature_c) {
    const double t = temperature_c;
    return 0.23659 + t * (-4.8564e-4 + t * (-3.4205e-6 + t * 5.869e-9));
}

namespace {
// 25 degC slope of an Ag/AgCl electrode in KCl of fixed chloride activity (see the header).
double fixed_chloride_slope(double e_25_v) {
    const double t0 = constants::reference_temperature_k;
    return (silver_chloride_e0_v(26.0) - silver_chloride_e0_v(24.0)) / 2.0 + (e_25_v - silver_chloride_e0_v(25.0)) / t0;
}
}  // namespace

const std::vector<ReferenceElectrode>& reference_electrodes() {
    // Potentials at 25 degC: common practice, no single source (check-values.md); they vary by
    // a few mV between suppliers and tables. The Ag/AgCl electrodes in 1, 3 and 3.5 mol/L KCl
    // follow E°(T) of Bates & Bower (1954) with their chloride activity fixed; their 25 degC
    // slopes (-0.60, -0.69, -0.70 mV/K) agree with the common-practice coefficients (-0.6,
    // -0.7, -0.7 mV/K; tests/test_electro.cpp). Saturated KCl (whose chloride activity rises
    // with temperature), calomel, seawater and copper sulfate keep a straight line; the
    // seawater electrode has no coefficient listed, 0 is used.
    static const std::vector<ReferenceElectrode> table = {
        {"SHE", 0.0, 0.0, "definition"},
        {"SCE", 0.241, -0.66e-3, "common practice"},
        {"Ag/AgCl(sat KCl)", 0.197, -1.0e-3, "common practice"},
        {"Ag/AgCl(3.5 M KCl)", 0.205, fixed_chloride_slope(0.205),
         "common practice at 25 degC; E°(T) of Bates & Bower (1954)", true},
        {"Ag/AgCl(3 M KCl)", 0.210, fixed_chloride_slope(0.210),
         "common practice at 25 degC; E°(T) of Bates & Bower (1954)", true},
        {"Ag/AgCl(1 M KCl)", 0.235, fixed_chloride_slope(0.235),
         "common practice at 25 degC; E°(T) of Bates & Bower (1954)", true},
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
    for (const auto& r : reference_electrodes()) {
        if (r.name != name) continue;
        if (r.silver_chloride_fixed_chloride) {
            const double t = temperature_c + constants::zero_celsius_k;
            return silver_chloride_e0_v(temperature_c) +
                   (r.e_25_v - silver_chloride_e0_v(25.0)) * t / constants::reference_temperature_k;
        }
        return r.e_25_v + r.de_dt_v_per_k * (temperature_c - 25.0);
    }
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
