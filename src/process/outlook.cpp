// What a water will do, mineral by mineral, and the Langelier and Ryznar readings.
#include "deltag/outlook.hpp"

#include <algorithm>
#include <cmath>

#include "deltag/error.hpp"

namespace deltag::process {

std::string_view tendency_text(Tendency t) {
    switch (t) {
        case Tendency::scale_forming: return "scale-forming";
        case Tendency::dissolving: return "dissolving";
        case Tendency::balanced: break;
    }
    return "balanced";
}

Tendency tendency_of(double si, double tolerance) {
    if (si > tolerance) return Tendency::scale_forming;
    if (si < -tolerance) return Tendency::dissolving;
    return Tendency::balanced;
}

namespace {

// Minerals whose supersaturation a reader should not take as scale in a water system: they
// form far too slowly at these temperatures, and a faster-forming relative deposits instead.
// Common practice of water treatment (silica scale is amorphous; dolomite does not grow from
// water near room temperature; fresh iron deposits are ferrihydrite, which ages to goethite
// and hematite), stated here, not taken from one source.
struct SlowMineral {
    std::string_view name, note;
};
constexpr SlowMineral slow_minerals[] = {
    {"Quartz", "forms far too slowly to scale below about 150 °C; the silica that deposits is amorphous silica "
               "(common practice)"},
    {"Dolomite", "does not grow from water at these temperatures; calcite deposits instead (common practice)"},
    {"Magnetite", "grows as a film on steel in hot, oxygen-poor water (boilers); not a scale from the bulk water "
                  "(common practice)"},
    {"Hematite", "an aged iron oxide: fresh iron deposits are ferrihydrite (common practice)"},
    {"Goethite", "an aged iron oxide: fresh iron deposits are ferrihydrite (common practice)"},
};

std::string slow_note(std::string_view mineral) {
    for (const auto& s : slow_minerals)
        if (s.name == mineral) return std::string(s.note);
    return {};
}

// The closed-system equilibrium of the water with one mineral: mol/kgw that leave the water
// as the solid (+) or enter it (-).
void amount_to_equilibrium(const thermo::Database& db, const WaterState& w, std::size_t mineral, MineralOutlook& o) {
    equilibrium::SpeciationInput eq = w.basis;
    equilibrium::MineralTarget target;
    target.mineral = mineral;
    target.target_si = 0.0;
    eq.minerals = {target};
    eq.gases.clear();
    eq.headspace.reset();
    eq.charge_balance_component.reset();
    eq.ph.reset();
    eq.label = w.label + " (to equilibrium with " + db.minerals()[mineral].name + ")";
    try {
        const equilibrium::SpeciationResult after = equilibrium::speciate(db, eq, {}, &w.result);
        double dissolved = 0.0;
        for (const auto& t : after.transfers)
            if (!t.is_gas && t.phase == db.minerals()[mineral].name) dissolved += t.moles;
        const double mg = -dissolved * db.minerals()[mineral].formula.molar_mass() * 1000.0 * w.result.kg_water_per_litre;
        if (!std::isfinite(mg)) {
            o.why_not = "the closed-system equilibrium gave no finite amount";
            return;
        }
        o.amount_available = true;
        o.mmol_per_kgw = std::abs(dissolved) < 1e-15 ? 0.0 : -dissolved * 1000.0;
        o.mg_per_l = std::abs(mg) < 1e-9 ? 0.0 : mg;
    } catch (const ConvergenceError& e) {
        o.why_not = std::string("the closed-system equilibrium did not converge: ") + e.what();
    } catch (const InputError& e) {
        o.why_not = "the closed-system equilibrium has no solution: " + e.message();
    }
}

}  // namespace

Outlook saturation_outlook(const thermo::Database& db, const equilibrium::SpeciationResult& r, double si_floor,
                           double tolerance) {
    Outlook out;
    out.si_floor = si_floor;
    for (const auto& s : r.saturation) {
        if (s.is_gas) continue;
        if (s.si < si_floor) {
            ++out.far_below;
            continue;
        }
        MineralOutlook o;
        o.mineral = s.phase;
        if (const auto m = db.find_mineral(s.phase)) o.formula = db.minerals()[*m].formula.text;
        o.si = s.si;
        o.delta_g_kj_per_mol = s.delta_g_kj_per_mol;
        o.tendency = tendency_of(s.si, tolerance);
        o.note = slow_note(s.phase);
        o.why_not = "not worked out (no closed-system solve was asked for)";
        out.minerals.push_back(std::move(o));
    }
    // By risk: scale-forming before balanced before dissolving; within each, the minerals that
    // do form in water systems before those that form too slowly (noted); then highest SI first.
    auto rank = [](const MineralOutlook& m) { return std::pair{static_cast<int>(m.tendency), m.note.empty() ? 0 : 1}; };
    std::stable_sort(out.minerals.begin(), out.minerals.end(), [&](const MineralOutlook& a, const MineralOutlook& b) {
        return rank(a) != rank(b) ? rank(a) < rank(b) : a.si > b.si;
    });
    return out;
}

Outlook mineral_outlook(const thermo::Database& db, const WaterState& w, double si_floor, double tolerance) {
    Outlook out = saturation_outlook(db, w.result, si_floor, tolerance);
    for (auto& o : out.minerals) {
        o.why_not.clear();
        if (const auto m = db.find_mineral(o.mineral)) amount_to_equilibrium(db, w, *m, o);
        else o.why_not = "not in the database";
    }
    return out;
}

// Langelier (1936), J. AWWA 28:1500: a positive index means the water is supersaturated with
// calcium carbonate and tends to deposit it, a negative one that it tends to dissolve it
// (Standard Methods 2330 A). Within +-0.05 of zero (the uncertainty of log K of calcite,
// equilibrium::default_si_tolerance) the water counts as balanced.
std::string langelier_reading(double lsi) {
    const double v = std::round(lsi * 100.0) / 100.0;
    if (v > equilibrium::default_si_tolerance) return "scale-forming: calcium carbonate tends to deposit";
    if (v < -equilibrium::default_si_tolerance) return "dissolves calcium carbonate: no protective scale forms";
    return "balanced: neither deposits nor dissolves calcium carbonate";
}

// Ryznar (1944), J. AWWA 36:472, his classes of the stability index RSI = 2 pHs - pH (written
// from memory, as they are reproduced in the water-treatment handbooks): below 5 heavy scale,
// 5 to 6 light scale, 6 to 7 little scale or corrosion, 7 to 7.5 significant corrosion, 7.5 to
// 9 heavy corrosion, above 9 intolerable corrosion. A class boundary belongs to the lower class.
std::string ryznar_reading(double rsi) {
    const double v = std::round(rsi * 100.0) / 100.0;
    if (v <= 5.0) return "heavy scale";
    if (v <= 6.0) return "light scale";
    if (v <= 7.0) return "little scale or corrosion";
    if (v <= 7.5) return "significant corrosion";
    if (v <= 9.0) return "heavy corrosion";
    return "intolerable corrosion";
}

}  // namespace deltag::process
