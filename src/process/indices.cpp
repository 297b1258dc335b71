// Water-treatment indices. Standard Methods 2330: the Langelier index LSI = pH - pHs, with
// pHs the pH at which the water, at its calcium and total alkalinity, would be in
// equilibrium with calcite; here pHs comes from the speciation itself (activities, ion
// pairs) rather than from the simplified formula. Ryznar (1944): RSI = 2 pHs - pH. The
// calcium carbonate precipitation potential (CCPP) is the calcite that precipitates (+) or
// dissolves (-), in mg/L as CaCO3, when the water reaches calcite equilibrium as a closed
// system (Standard Methods 2330).
#include <cmath>

#include "deltag/process.hpp"
#include "process/root.hpp"

namespace deltag::process {

Indices water_treatment_indices(const thermo::Database& db, const WaterState& w) {
    Indices ix;
    const auto calcite = db.find_mineral("Calcite");
    const auto ca = db.find_species("Ca^2+");
    const auto hco3 = db.find_species("HCO3-");
    if (!calcite || !ca || !hco3) {
        ix.why_not = "the database has no Calcite, Ca^2+ or HCO3-";
        return ix;
    }
    const auto& r = w.result;
    if (!(r.component_present[*ca] && r.component_totals[*ca] > 0) ||
        !(r.component_present[*hco3] && r.component_totals[*hco3] > 0)) {
        ix.why_not = "needs calcium and carbonate";
        return ix;
    }
    if (!(r.alkalinity_eq > 0)) {
        ix.why_not = "needs a positive alkalinity";
        return ix;
    }
    // pHs: fixed pH, the water's totals with carbonate given as its total alkalinity.
    equilibrium::SpeciationInput in = w.basis;
    in.minerals.clear();
    in.gases.clear();
    in.label = w.label + " (pHs)";
    for (auto& c : in.components)
        if (c.component == *hco3) c = {*hco3, equilibrium::ComponentInput::Kind::alkalinity, r.alkalinity_eq};
    const equilibrium::SpeciationResult* warm = &r;
    equilibrium::SpeciationResult last;
    auto si_at = [&](double ph) {
        in.ph = ph;
        last = equilibrium::speciate(db, in, {}, warm);
        for (const auto& s : last.saturation)
            if (s.phase == "Calcite") return s.si;
        return 0.0;
    };
    // SI rises with pH at a fixed alkalinity. Start from 6.5..9.5 (where pHs of natural and
    // treated waters lies) and widen by half a unit while the sign does not change; a pH at
    // which this alkalinity cannot exist (the carbon it needs runs away) ends the search.
    double lo = 6.5, hi = 9.5;
    double flo = si_at(lo), fhi = si_at(hi);
    auto widen = [&](double& x, double& fx, double step, double limit, bool want_negative) {
        while ((want_negative ? fx >= 0 : fx <= 0) && std::abs(x - limit) > 1e-9) {
            const double next = step < 0 ? std::max(x + step, limit) : std::min(x + step, limit);
            double fn = 0.0;
            try {
                fn = si_at(next);
            } catch (const ConvergenceError&) {
                return;
            } catch (const NoSolutionError&) {  // this alkalinity cannot exist at that pH
                return;
            }
            x = next;
            fx = fn;
        }
    };
    widen(lo, flo, -0.5, 3.0, true);
    widen(hi, fhi, +0.5, 13.0, false);
    if (!(flo < 0 && fhi > 0)) {
        ix.why_not = "no pH where this alkalinity can exist brings the water to calcite saturation";
        return ix;
    }
    const RootResult root = brent(si_at, lo, hi, flo, fhi, 1e-9, 1e-10);
    ix.ph_s = root.x;
    ix.langelier = r.ph - ix.ph_s;
    ix.ryznar = 2.0 * ix.ph_s - r.ph;

    // CCPP: closed-system equilibrium with calcite, both directions.
    equilibrium::SpeciationInput eq = w.basis;
    eq.minerals = {equilibrium::MineralTarget{*calcite, 0.0, std::nullopt, equilibrium::MineralTarget::Direction::both}};
    eq.gases.clear();
    eq.label = w.label + " (CCPP)";
    const equilibrium::SpeciationResult after = equilibrium::speciate(db, eq, {}, &r);
    const double xi = after.transfers.front().moles;  // + dissolved
    const double mg_per_mol = db.minerals()[*calcite].formula.molar_mass() * 1000.0;
    ix.ccpp_mg_per_l = -xi * mg_per_mol * r.kg_water_per_litre;
    if (std::abs(ix.ccpp_mg_per_l) < 1e-9) ix.ccpp_mg_per_l = 0.0;
    ix.available = true;
    return ix;
}

}  // namespace deltag::process
