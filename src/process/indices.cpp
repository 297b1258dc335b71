// Water-treatment indices.
//
// Langelier index, LSI = pH - pHs (Standard Methods 2330). pHs is the pH at which the water,
// holding its calcium and its CARBONATE alkalinity, would be saturated with calcite. The
// carbonate alkalinity is the part of the total alkalinity that the carbonate species carry:
// HCO3- + 2 CO3^2- and their ion pairs (CaHCO3+, CaCO3(aq), NaCO3-, ...), each by its
// alkalinity count, at the water's own pH. Hydroxide, silicate and the other non-carbonate
// bases are not held: their share of the total alkalinity belongs to the water's pH, not to
// the pool of carbonate that calcite can draw on. Standard Methods 2330 B says the same in
// its formula pHs = pK2 - pKs + p[Ca2+] + p[HCO3-] + 5 pfm, where [HCO3-] comes from the
// alkalinity less its hydroxide and non-carbonate parts. Holding the carbonate alkalinity
// makes the index consistent with the saturation index: a water at calcite equilibrium
// has pHs = pH (LSI 0) at any pH, with or without silicate, because at its own pH the
// water with its own carbonate alkalinity is itself. (Holding the total alkalinity instead
// gave a lime-softened water at calcite equilibrium LSI +0.9 to +1.5 at pH 10.5.)
// pHs is found from the speciation itself (activities, ion pairs) rather than from the
// simplified formula; at a fixed pH the carbon total that carries the carbonate alkalinity
// is found by a short proportional iteration, and pHs by Brent's method.
//
// Ryznar (1944): RSI = 2 pHs - pH.
//
// Calcium carbonate precipitation potential (Standard Methods 2330): the calcite that
// precipitates (+) or dissolves (-), in mg/L as CaCO3, when the water comes to calcite
// equilibrium as a closed system (no gas exchange), its protons conserved.
//
// Nothing here throws for a water: an index with no answer (no pHs exists, a solve fails)
// is reported as unavailable with the reason, and the run goes on.
#include <algorithm>
#include <cmath>
#include <optional>
#include <sstream>

#include "deltag/process.hpp"
#include "process/root.hpp"

namespace deltag::process {

namespace {

// Lowest and highest pH searched for pHs (common practice: natural and treated waters lie
// well inside; beyond these the activity models are stretched).
constexpr double ph_low_limit = 2.0;
constexpr double ph_high_limit = 13.0;

std::string number(double v, int digits = 3) {
    std::ostringstream o;
    o.precision(digits);
    o << v;
    return o.str();
}

double calcite_si(const equilibrium::SpeciationResult& r) {
    for (const auto& s : r.saturation)
        if (s.phase == "Calcite") return s.si;
    return std::nan("");
}

// Alkalinity carried by the species that hold the carbonate component, eq/kgw.
double carbonate_alkalinity_of(const thermo::Database& db, const equilibrium::SpeciationResult& r, std::size_t carbonate) {
    double a = 0.0;
    for (const auto& sr : r.species) {
        const auto& sp = db.species()[sr.species];
        for (const auto& [k, v] : sp.formation)
            if (k == carbonate && v != 0.0) {
                a += sp.alkalinity * sr.molality;
                break;
            }
    }
    return a;
}

void set_total(equilibrium::SpeciationInput& in, std::size_t j, double value) {
    for (auto& c : in.components)
        if (c.component == j) {
            c = {j, equilibrium::ComponentInput::Kind::total, value};
            return;
        }
    in.components.push_back({j, equilibrium::ComponentInput::Kind::total, value});
}

// The water at a fixed pH with its calcium, its other totals and its carbonate alkalinity.
class FixedCarbonateAlkalinity {
public:
    FixedCarbonateAlkalinity(const thermo::Database& db, const WaterState& w, std::size_t carbonate, double ac,
                             double dic_per_ac)
        : db_(db), carbonate_(carbonate), ac_(ac), dic_per_ac_(dic_per_ac), warm_(w.result) {
        in_ = w.basis;
        in_.minerals.clear();
        in_.gases.clear();
        in_.headspace.reset();
        in_.charge_balance_component.reset();
        in_.label = w.label + " (pHs)";
    }

    // Calcite SI of the water at this pH. Throws what the solver throws.
    double si_at(double ph) {
        in_.ph = ph;
        double dic = dic_per_ac_ * ac_;
        // Carbonate alkalinity is nearly proportional to the carbon total at a fixed pH (exactly
        // so in an ideal solution without ion pairs), so scaling the carbon converges in a few
        // solves.
        for (int k = 0; k < 40; ++k) {
            set_total(in_, carbonate_, dic);
            equilibrium::SpeciationResult r = equilibrium::speciate(db_, in_, {}, &warm_);
            const double got = carbonate_alkalinity_of(db_, r, carbonate_);
            warm_ = std::move(r);
            if (!(got > 0)) break;
            if (std::abs(got / ac_ - 1.0) < 1e-11) {
                dic_per_ac_ = dic / ac_;
                return calcite_si(warm_);
            }
            dic *= ac_ / got;
        }
        throw ConvergenceError(in_.label, 0.0, "the carbon that carries the carbonate alkalinity at pH " + number(ph, 4) +
                                                   " was not found", "");
    }

private:
    const thermo::Database& db_;
    std::size_t carbonate_;
    double ac_;
    double dic_per_ac_;
    equilibrium::SpeciationResult warm_;
    equilibrium::SpeciationInput in_;
};

// pHs, or the reason it has none.
void find_ph_s(const thermo::Database& db, const WaterState& w, std::size_t ca, std::size_t carbonate, Indices& ix) {
    const auto& r = w.result;
    const double ca_total = r.component_present[ca] ? r.component_totals[ca] : 0.0;
    const double dic = r.component_present[carbonate] ? r.component_totals[carbonate] : 0.0;
    if (!(ca_total > 0)) {
        ix.why_not = "the water has no calcium, and pHs (Standard Methods 2330) needs it";
        return;
    }
    if (!(dic > 0)) {
        ix.why_not = "the water has no carbonate, and pHs (Standard Methods 2330) needs it";
        return;
    }
    const double ac = carbonate_alkalinity_of(db, r, carbonate);
    ix.calcium_mol_per_kgw = ca_total;
    ix.carbonate_alkalinity_eq = ac;
    if (!(ac > 0)) {
        ix.why_not = "the water's carbonate carries no alkalinity at its pH, and pHs (Standard Methods 2330) needs it";
        return;
    }
    const double f0 = calcite_si(r);
    if (!std::isfinite(f0)) {
        ix.why_not = "the saturation index of Calcite is not defined for this water";
        return;
    }
    const std::string held = "calcium " + number(ca_total * 1000.0) + " mmol/kgw and carbonate alkalinity " +
                             number(ac * 1000.0) + " meq/kgw";
    FixedCarbonateAlkalinity water(db, w, carbonate, ac, dic / ac);
    const double x0 = r.ph;
    if (std::abs(f0) <= 1e-10) {
        ix.ph_s = r.ph;
        ix.available = true;
        return;
    }
    // SI rises with pH at a fixed carbonate alkalinity, about one unit per pH unit below pK2
    // and more slowly above it, towards a plateau where all of it is carbonate ion; at very
    // high pH it falls again (CaOH+ takes calcium, hydroxide raises the ionic strength). So
    // step from the water's pH towards pHs (secant steps of 0.1 to 0.5 pH), and when SI
    // turns down before reaching 0, look for its maximum: below 0, there is no pHs.
    const double dir = f0 < 0 ? 1.0 : -1.0;
    const double limit = dir > 0 ? ph_high_limit : ph_low_limit;
    double x_prev = x0, x_cur = x0, f_cur = f0, slope = 1.0;
    double last_ph = x0;
    auto si = [&](double ph) {
        last_ph = ph;
        return water.si_at(ph);
    };
    auto refine = [&](double a, double fa, double b, double fb) {
        if (fb == 0.0) return b;
        return brent(si, a, b, fa, fb, 1e-10, 1e-10).x;
    };
    try {
        for (;;) {
            if (std::abs(x_cur - limit) < 1e-12) {
                if (dir > 0)
                    ix.why_not = "calcite saturation cannot be reached at " + held + ": even at pH " +
                                 number(ph_high_limit, 3) + " the water stays undersaturated (SI " + number(f_cur, 3) +
                                 "), so pHs does not exist";
                else
                    ix.why_not = "the water stays supersaturated with calcite down to pH " + number(ph_low_limit, 3) +
                                 " at " + held + " (SI " + number(f_cur, 3) + "), so pHs was not found";
                return;
            }
            const double step = std::clamp(std::abs(f_cur) / slope, 0.1, 0.5);
            const double x_next = dir > 0 ? std::min(x_cur + step, limit) : std::max(x_cur - step, limit);
            const double f_next = si(x_next);
            if ((f_next > 0) != (f0 > 0) || f_next == 0.0) {
                ix.ph_s = refine(x_cur, f_cur, x_next, f_next);
                break;
            }
            if (dir > 0 && f_next < f_cur) {
                // Past the maximum of SI, which lies in [x_prev, x_next]: golden-section search.
                const double g = (std::sqrt(5.0) - 1.0) / 2.0;
                double a = x_prev, b = x_next;
                double c = b - g * (b - a), d = a + g * (b - a);
                double fc = si(c), fd = si(d);
                while (b - a > 1e-3 && fc < 0 && fd < 0) {
                    if (fc > fd) {
                        b = d;
                        d = c;
                        fd = fc;
                        c = b - g * (b - a);
                        fc = si(c);
                    } else {
                        a = c;
                        c = d;
                        fc = fd;
                        d = a + g * (b - a);
                        fd = si(d);
                    }
                }
                const double x_max = fc > fd ? c : d, f_max = std::max(fc, fd);
                if (f_max >= 0) {
                    // The curve crosses 0 before its maximum: pHs lies between the last point
                    // below and the maximum.
                    const double f_prev = x_prev == x0 ? f0 : si(x_prev);
                    ix.ph_s = refine(x_prev, f_prev, x_max, f_max);
                    break;
                }
                ix.why_not = "calcite saturation cannot be reached at " + held + ": the water comes closest at pH " +
                             number(x_max, 3) + " with SI " + number(f_max, 3) + ", so pHs does not exist";
                return;
            }
            slope = std::max(0.05, (f_next - f_cur) / (x_next - x_cur));
            x_prev = x_cur;
            x_cur = x_next;
            f_cur = f_next;
        }
    } catch (const ConvergenceError& e) {
        ix.why_not = "the speciation at pH " + number(last_ph, 4) + " (searching pHs at " + held +
                     ") did not converge: " + e.what();
        return;
    } catch (const InputError& e) {
        ix.why_not = "the water at pH " + number(last_ph, 4) + " (searching pHs at " + held + ") has no solution: " +
                     e.message();
        return;
    }
    ix.available = true;
}

// The Standard Methods 2330 B simplified formula: at saturation a(Ca) a(CO3) = Ks and
// a(CO3) = K2 a(HCO3) / a(H), so pHs = pK2 - pKs - log(gamma_Ca Ca_total) - log(gamma_HCO3 Ac),
// with the water's own activity coefficients (5 pfm in the Davies form of the formula).
void formula_ph_s(const thermo::Database& db, const WaterState& w, std::size_t calcite, std::size_t ca,
                  std::size_t carbonate, Indices& ix) {
    const auto& r = w.result;
    const auto co3 = db.find_species("CO3^2-");
    const double ca_total = r.component_present[ca] ? r.component_totals[ca] : 0.0;
    if (!co3 || !(ca_total > 0) || !r.component_present[carbonate]) return;
    const double ac = carbonate_alkalinity_of(db, r, carbonate);
    const auto* ca_free = r.find("Ca^2+");
    const auto* hco3_free = r.find("HCO3-");
    if (!(ac > 0) || !ca_free || !hco3_free) return;
    const double pk2 = -db.species()[*co3].log_k(r.temperature_c);
    const double pks = -db.minerals()[calcite].log_k_as_written(r.temperature_c);
    const double phs = pk2 - pks - std::log10(ca_total) - ca_free->log_gamma - std::log10(ac) - hco3_free->log_gamma;
    if (!std::isfinite(phs)) return;
    ix.formula_available = true;
    ix.formula_ph_s = phs;
    ix.formula_langelier = r.ph - phs;
}

// CCPP, or the reason it has none.
void find_ccpp(const thermo::Database& db, const WaterState& w, std::size_t calcite, std::size_t ca,
               std::size_t carbonate, Indices& ix) {
    const auto& r = w.result;
    equilibrium::SpeciationInput eq = w.basis;
    eq.minerals = {equilibrium::MineralTarget{calcite, 0.0, std::nullopt}};
    eq.gases.clear();
    eq.headspace.reset();
    eq.charge_balance_component.reset();
    eq.ph.reset();
    eq.label = w.label + " (CCPP)";
    // A water without calcium or carbonate (a condensate, a softened water) can still
    // dissolve calcite. The solver needs both present, so such a water starts from a little
    // calcite already dissolved (x0 = 0.01 mmol/kgw, added to Ca and C; the closed system
    // is the same one), and x0 counts in the amount dissolved.
    const bool has_ca = r.component_present[ca] && r.component_totals[ca] > 0;
    const bool has_c = r.component_present[carbonate] && r.component_totals[carbonate] > 0;
    const double x0 = has_ca && has_c ? 0.0 : 1e-5;
    if (x0 > 0) {
        set_total(eq, ca, x0 + (has_ca ? r.component_totals[ca] : 0.0));
        set_total(eq, carbonate, x0 + (has_c ? r.component_totals[carbonate] : 0.0));
    }
    try {
        const equilibrium::SpeciationResult after = equilibrium::speciate(db, eq, {}, x0 > 0 ? nullptr : &r);
        double xi = x0;  // + dissolved
        for (const auto& t : after.transfers)
            if (t.phase == db.minerals()[calcite].name) xi += t.moles;
        const double mg_per_mol = db.minerals()[calcite].formula.molar_mass() * 1000.0;
        ix.ccpp_mg_per_l = -xi * mg_per_mol * r.kg_water_per_litre;
        if (std::abs(ix.ccpp_mg_per_l) < 1e-9) ix.ccpp_mg_per_l = 0.0;
        if (!std::isfinite(ix.ccpp_mg_per_l)) {
            ix.ccpp_mg_per_l = 0.0;
            ix.ccpp_why_not = "the closed-system equilibrium with calcite gave no finite amount";
            return;
        }
        ix.ccpp_available = true;
    } catch (const ConvergenceError& e) {
        ix.ccpp_why_not = std::string("the closed-system equilibrium with calcite did not converge: ") + e.what();
    } catch (const InputError& e) {
        ix.ccpp_why_not = "the closed-system equilibrium with calcite has no solution: " + e.message();
    }
}

}  // namespace

Indices water_treatment_indices(const thermo::Database& db, const WaterState& w) {
    Indices ix;
    const auto calcite = db.find_mineral("Calcite");
    const auto ca = db.find_species("Ca^2+");
    const auto hco3 = db.find_species("HCO3-");
    if (!calcite || !ca || !hco3) {
        ix.why_not = ix.ccpp_why_not = "the database has no Calcite, Ca^2+ or HCO3-";
        return ix;
    }
    find_ph_s(db, w, *ca, *hco3, ix);
    formula_ph_s(db, w, *calcite, *ca, *hco3, ix);
    if (ix.available) {
        ix.langelier = w.result.ph - ix.ph_s;
        ix.ryznar = 2.0 * ix.ph_s - w.result.ph;
    } else {
        ix.ph_s = ix.langelier = ix.ryznar = 0.0;
    }
    find_ccpp(db, w, *calcite, *ca, *hco3, ix);
    return ix;
}

}  // namespace deltag::process
