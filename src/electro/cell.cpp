// Cells: two half-reactions, E = E(cathode) - E(anode), n = lcm of their electrons,
// dG = -nFE, K = exp(nFE°/RT); and reference electrodes (common practice values).
#include <cmath>
#include <numeric>

#include "deltag/constants.hpp"
#include "deltag/electro.hpp"

namespace deltag::electro {

double delta_g_kj(double n, double e_v) { return -n * constants::faraday * e_v / 1000.0; }
double potential_v(double n, double delta_g_kj_per_mol) { return -delta_g_kj_per_mol * 1000.0 / (n * constants::faraday); }

namespace {
// Least common multiple of two electron counts (whole numbers in practice; otherwise their product).
double electron_lcm(double a, double b) {
    const double ra = std::round(a), rb = std::round(b);
    if (std::abs(a - ra) < 1e-9 && std::abs(b - rb) < 1e-9 && ra > 0 && rb > 0)
        return static_cast<double>(std::lcm(static_cast<long>(ra), static_cast<long>(rb)));
    return a * b;
}
}  // namespace

CellResult cell(const CellSide& cathode, const CellSide& anode) {
    CellResult c;
    c.cathode = cathode.half.text;
    c.anode = anode.half.text;
    c.cathode_origin = cathode.half.e0_origin;
    c.anode_origin = anode.half.e0_origin;
    c.temperature_c = cathode.temperature_c;
    c.n = electron_lcm(cathode.half.electrons, anode.half.electrons);
    const SourceLocation cmd{"cell", 0, 0};
    c.cathode_electrode = electrode_potential(cathode.half, cathode.temperature_c, cathode.activities, cmd);
    c.anode_electrode = electrode_potential(anode.half, anode.temperature_c, anode.activities, cmd);
    c.e0_v = c.cathode_electrode.e0_v - c.anode_electrode.e0_v;
    c.e_v = c.cathode_electrode.e_v - c.anode_electrode.e_v;
    c.delta_g0_kj_per_mol = delta_g_kj(c.n, c.e0_v);
    c.delta_g_kj_per_mol = delta_g_kj(c.n, c.e_v);
    c.log_k = c.e0_v * c.n / constants::nernst_slope_v(cathode.temperature_c + constants::zero_celsius_k);
    c.spontaneous = c.e_v > 0;
    if (std::abs(cathode.temperature_c - anode.temperature_c) > 1e-9)
        c.warnings.push_back("the electrodes are at different temperatures: each potential is taken at its own "
                             "temperature, E° and K at the cathode's; thermal junction potentials are not included");
    const bool asked = cathode.activities.metal_ion_activity || anode.activities.metal_ion_activity;
    if (asked && c.cathode_electrode.convention_applied_to.empty() && c.anode_electrode.convention_applied_to.empty())
        c.warnings.push_back("a metal-ion activity was asked for, but neither half-reaction has a dissolved species of "
                             "its electrode's metal (a metal, oxide or hydroxide written as a solid, such as Fe(s)): no activity "
                             "was set by it");
    return c;
}

CellResult cell(const HalfCell& cathode, const Activities& cathode_activities, double cathode_temperature_c,
                const HalfCell& anode, const Activities& anode_activities, double anode_temperature_c) {
    const ElectrodeActivities ca(cathode_activities), aa(anode_activities);
    return cell(CellSide{cathode, ca, cathode_temperature_c}, CellSide{anode, aa, anode_temperature_c});
}

}  // namespace deltag::electro
