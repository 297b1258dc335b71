// The figures of a lab sheet from a speciated water. Sources, by figure:
//
// Hardness: Standard Methods for the Examination of Water and Wastewater, 2340 B (hardness by
//   calculation): mg equivalent CaCO3/L = 2.497 [Ca, mg/L] + 4.118 [Mg, mg/L]; the factors
//   are CaCO3/Ca = 100.087/40.078 and CaCO3/Mg = 100.087/24.305. Carbonate and non-carbonate
//   hardness: Standard Methods 2340 A (definitions).
// Alkalinity: Standard Methods 2320 (titration to pH 4.5, total or M, and to pH 8.3,
//   phenolphthalein or P). From the speciation the two are taken at their equivalence points
//   (Stumm and Morgan 1996, Aquatic Chemistry, 3rd ed., ch. 4): M is the water's total
//   alkalinity (reference CO2(aq)), P = M - C_T, the alkalinity with HCO3- as the reference
//   of the carbonate species ([CO3^2-] + [OH-] - [CO2(aq)] - [H+] in a plain carbonate water).
//   A titration to the fixed pH of 8.3 can differ from the equivalence point by a little.
//   A negative P is no alkalinity to pH 8.3 but acidity: Standard Methods 2310 (acidity to
//   pH 8.3, phenolphthalein acidity) reports it as CaCO3.
// Dissolved solids by calculation: Standard Methods 1030 E (checking analyses' correctness:
//   calculated TDS = 0.6 x alkalinity as CaCO3 + Na + K + Ca + Mg + Cl + SO4 + SiO3 + NO3 + F;
//   written from memory) and Hem (1985), USGS Water-Supply Paper 2254, p. 156-157: the sum of
//   the constituents with bicarbonate converted to carbonate (HCO3- x 0.4917), as after
//   evaporation. Both count the carbonate species as carbonate ion, 30.00 mg per meq of
//   carbonate alkalinity. Here every dissolved constituent counts, each by the mass its lab
//   analyte is reported as (SiO2, NO3, SO4, ...), the carbonate species by their carbonate
//   alkalinity as CO3^2-; H+, OH-, CO2(aq) and dissolved gases (O2, H2) do not count.
// Larson-Skold index: Larson, T. E. and Skold, R. V. (1958), Laboratory studies relating
//   mineral quality of water to corrosion of steel and cast iron, Corrosion 14, 285t-288t:
//   (Cl- + SO4^2-) / (HCO3- + CO3^2-) in equivalents.
// Puckorius index: Puckorius, P. R. and Brooke, J. M. (1991), A new practical index for calcium
//   carbonate scale prediction in cooling tower systems, Corrosion 47, 280-284:
//   PSI = 2 pHs - pHeq, pHeq = 1.465 log10(total alkalinity, mg/L as CaCO3) + 4.54.
// Specific conductance at 25 degC, by the ionic-conductivity method (the calculation of
//   Standard Methods 2510 and 1030 E): the sum over the ions of |z| c lambda, each ion's
//   equivalent conductance lambda lowered from its limiting value lambda0 by the
//   Debye-Hueckel-Onsager equation (Onsager 1927) in its extended form,
//     lambda_i = lambda0_i - (B1 z_i^2 lambda0_i + B2 |z_i| / 2) sqrt(I) / (1 + sqrt(I)),
//   B1 = 0.2289 (mol/L)^-1/2 and B2 = 60.20 S cm2 mol^-1 (mol/L)^-1/2 for water at 25 degC
//   (Robinson and Stokes 1959, Electrolyte Solutions; written from memory), the 1 + sqrt(I)
//   being the ion-size term with a distance of closest approach near 3 Angstrom. Exact in
//   form for a 1:1 salt; for multivalent ions the charge terms are taken as for a symmetric
//   salt, an approximation of a few per cent. lambda0 at 25 degC: CRC Handbook of Chemistry
//   and Physics, "Ionic conductivity and diffusion at infinite dilution" (written from
//   memory). The species come from the water's own speciation (at its own temperature); the
//   conductance is that of those species at 25 degC. Charged ion pairs have no lambda0 in
//   the table and are left out; the share of the ionic charge they hold is reported.
// Aggressive Index: AWWA C400 (asbestos-cement pipe): AI = pH + log10(A H), A total
//   alkalinity and H calcium hardness, mg/L as CaCO3.
// The ions table and the checks of an analysis: Standard Methods 1030 E, "Checking analyses'
//   correctness" (written from memory of its text; the criteria below are quoted as
//   remembered, not copied from the page):
//   1. Anion-cation balance, the sums in meq/L: |cations - anions| <= 0.2 meq/L for an anion
//      sum up to 3 meq/L, a difference of at most 2 % for 3 to 10, 5 % above.
//      equilibrium::charge_balance_acceptable holds that rule; it is used, not repeated.
//   2. Measured TDS = calculated TDS: 1.0 < measured TDS / calculated TDS < 1.2. A measured
//      value below the calculated one makes the higher ion sum and the measured value
//      suspect; one more than 20 % above it makes the lower ion sum suspect.
//   3. Measured EC and ion sums: 100 x anion (or cation) sum, meq/L = (0.9 to 1.1) EC; a sum
//      outside it is suspect.
//   4. Calculated TDS to EC ratio: 0.55 to 0.7. Below 0.55 the lower ion sum is suspect, above
//      0.7 the higher one; poorly dissociated calcium and sulfate can raise it to about 0.8.
//   5. Measured TDS to EC ratio: 0.55 to 0.7; outside it the measured TDS or EC is suspect.
//   6. Calculated EC to measured EC: 0.9 to 1.1 (the calculated EC by the ionic-conductivity
//      method of 1030 E and 2510; here the calculation above). Above, the higher ion sum is
//      suspect; below, the lower one.
//   EC is the specific conductance at 25 degC in uS/cm, TDS in mg/L. The method states its
//   ranges with "<" and "to"; here the ends count as within.
#include "deltag/figures.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>
#include <string_view>

#include "deltag/chem.hpp"

namespace deltag::process {

double hardness_from_ca_mg(double ca_mg_per_l, double mg_mg_per_l) { return 2.497 * ca_mg_per_l + 4.118 * mg_mg_per_l; }

std::pair<double, double> split_hardness(double total_hardness, double total_alkalinity) {
    const double carbonate = std::clamp(total_alkalinity, 0.0, std::max(total_hardness, 0.0));
    return {carbonate, std::max(total_hardness - carbonate, 0.0)};
}

double larson_skold(double chloride_meq, double sulfate_meq, double carbonate_alkalinity_meq) {
    return (chloride_meq + sulfate_meq) / carbonate_alkalinity_meq;
}

double puckorius_ph_eq(double total_alkalinity_mg_caco3) { return 1.465 * std::log10(total_alkalinity_mg_caco3) + 4.54; }

double puckorius(double ph_s, double total_alkalinity_mg_caco3) {
    return 2.0 * ph_s - puckorius_ph_eq(total_alkalinity_mg_caco3);
}

double ionic_conductance(double lambda0, int charge, double ionic_strength) {
    const double root_i = std::sqrt(std::max(ionic_strength, 0.0));
    const double z = std::abs(static_cast<double>(charge));
    const double lambda = lambda0 - (onsager_b1_coefficient * z * z * lambda0 + onsager_b2_coefficient * z / 2.0) * root_i /
                                        (1.0 + root_i);
    return std::max(lambda, 0.0);
}

double aggressive_index(double ph, double total_alkalinity_mg_caco3, double calcium_hardness_mg_caco3) {
    return ph + std::log10(total_alkalinity_mg_caco3 * calcium_hardness_mg_caco3);
}

namespace {
// An index is read at the two decimals it is shown with, so the words never contradict the
// number printed beside them (11.9995 shows as 12.00 and reads as 12.00 does).
double as_shown(double v) { return std::round(v * 100.0) / 100.0; }
}  // namespace

// Readings as commonly quoted for the 1958 study (Great Lakes waters, mild steel; written
// from memory): below 0.8 chloride and sulfate are unlikely to upset the protective film;
// 0.8 to 1.2 they may; above 1.2 high local corrosion rates are likely. Not meant for waters
// of low alkalinity or brines.
std::string larson_skold_reading(double index) {
    const double v = as_shown(index);
    return v < 0.8 ? "chloride and sulfate unlikely to upset protective films"
           : v <= 1.2 ? "chloride and sulfate may upset protective films"
                      : "high local corrosion rates of steel likely";
}

// Read as the Ryznar index is (Puckorius and Brooke 1991; written from memory): below about
// 6 scale-forming, above about 7 corrosive. For cooling waters.
std::string puckorius_reading(double index) {
    const double v = as_shown(index);
    return v < 6.0 ? "scale-forming" : v <= 7.0 ? "near balance" : "corrosive";
}

// AWWA C400 classes (written from memory): 12 and above non-aggressive, 10 to 12 moderately
// aggressive, below 10 highly aggressive. Meant for asbestos-cement pipe.
std::string aggressive_index_reading(double index) {
    const double v = as_shown(index);
    return v >= 12.0 ? "non-aggressive" : v >= 10.0 ? "moderately aggressive" : "highly aggressive";
}

namespace {

// Limiting equivalent conductances at 25 degC, S cm2 per equivalent (per mole of charge):
// CRC Handbook of Chemistry and Physics, "Ionic conductivity and diffusion at infinite
// dilution"; written from memory.
struct LimitingConductance {
    std::string_view species;
    double lambda0;
};
constexpr LimitingConductance limiting_conductances[] = {
    {"H+", 349.65},    {"OH-", 198.0},    {"Na+", 50.08},     {"K+", 73.48},      {"Li+", 38.66},
    {"NH4+", 73.5},    {"Ca^2+", 59.47},  {"Mg^2+", 53.0},    {"Sr^2+", 59.4},    {"Ba^2+", 63.6},
    {"Fe^2+", 54.0},   {"Mn^2+", 53.5},   {"Cu^2+", 53.6},    {"Zn^2+", 52.8},    {"Cl-", 76.31},
    {"F-", 55.4},      {"Br-", 78.1},     {"NO3-", 71.42},    {"NO2-", 71.8},     {"HCO3-", 44.5},
    {"CO3^2-", 69.3},  {"SO4^2-", 80.0},  {"HSO4-", 52.0},    {"HS-", 65.0},
};

std::optional<double> limiting_conductance(std::string_view name) {
    for (const auto& l : limiting_conductances)
        if (l.species == name) return l.lambda0;
    return std::nullopt;
}

double element_total(const equilibrium::SpeciationResult& r, const std::string& el) {
    const auto it = r.element_totals.find(el);
    return it == r.element_totals.end() ? 0.0 : it->second;
}

double component_total(const thermo::Database& db, const equilibrium::SpeciationResult& r, std::string_view name) {
    const auto j = db.find_species(name);
    if (!j || *j >= r.component_totals.size() || !r.component_present[*j]) return 0.0;
    return r.component_totals[*j];
}

bool holds(const thermo::Species& sp, std::size_t component) {
    for (const auto& [k, v] : sp.formation)
        if (k == component && v != 0.0) return true;
    return false;
}

// mg of what a lab reports per mol of the component (the first total analyte of it, else
// the component's own formula).
double reported_mass_g_per_mol(const thermo::Database& db, std::size_t component) {
    for (const auto& a : db.analytes())
        if (a.component == component && a.kind == thermo::Analyte::Kind::total && a.per_component > 0)
            return a.mass_formula.molar_mass() / a.per_component;
    return db.species()[component].formula.molar_mass();
}

std::string fmt_number(double v) {
    std::ostringstream o;
    o.precision(3);
    o << v;
    return o.str();
}

bool only_h_and_o(const chem::Formula& f) {
    for (const auto& [el, n] : f.elements)
        if (el != "H" && el != "O") return false;
    return true;
}

constexpr double min_hydroxide_meq_per_l = 1e-3;

double coefficient(const thermo::Species& sp, std::size_t component) {
    for (const auto& [k, v] : sp.formation)
        if (k == component) return v;
    return 0.0;
}

// The ions table (see WaterFigures): cations and anions in mg/L and meq/L, and their sums.
void ions_table(const thermo::Database& db, const equilibrium::SpeciationResult& r, std::optional<std::size_t> carbonate,
                double per_l, WaterFigures& f) {
    auto add = [&](const std::string& ion, int z, double mmol_per_l, double g_per_mol) {
        if (!(mmol_per_l > 0.0)) return;
        IonFigure row{ion, z, mmol_per_l * g_per_mol, mmol_per_l * std::abs(z)};
        (z > 0 ? f.cations : f.anions).push_back(row);
    };
    for (std::size_t j = 0; j < db.species().size() && j < r.component_present.size(); ++j) {
        const auto& sp = db.species()[j];
        if (!sp.is_component || sp.role != thermo::ComponentRole::ordinary || !r.component_present[j]) continue;
        if (sp.formula.charge == 0) continue;
        if (carbonate && j == *carbonate) {
            // Split by the speciation: per mole of carbonate, a species bringing 1 equivalent of
            // alkalinity holds it as HCO3-, one bringing 2 as CO3^2-; CO2(aq) (0) is not an ion.
            double hco3 = 0.0, co3 = 0.0;
            for (const auto& s : r.species) {
                const auto& ss = db.species()[s.species];
                const double c = coefficient(ss, j);
                if (!(c > 0.0)) continue;
                const double per_carbonate = ss.alkalinity / c;
                if (per_carbonate >= 1.5) co3 += c * s.molality;
                else if (per_carbonate >= 0.5) hco3 += c * s.molality;
            }
            add("HCO3-", -1, hco3 * per_l, chem::parse_formula("HCO3").molar_mass());
            add("CO3^2-", -2, co3 * per_l, chem::parse_formula("CO3").molar_mass());
            continue;
        }
        add(sp.name, sp.formula.charge, r.component_totals[j] * per_l, sp.formula.molar_mass());
    }
    // Hydroxide, the third form of alkalinity (Standard Methods 2320), once it reaches the
    // 0.001 meq/L a lab sheet shows (above about pH 9); free OH- only.
    for (const auto& s : r.species)
        if (s.name == "OH-" && s.molality * per_l >= min_hydroxide_meq_per_l)
            add("OH-", -1, s.molality * per_l, chem::parse_formula("OH").molar_mass());
    for (const auto& c : f.cations) f.cations_meq_per_l += c.meq_per_l;
    for (const auto& a : f.anions) f.anions_meq_per_l += a.meq_per_l;
    f.ion_balance_error_percent = equilibrium::charge_balance_error_percent(f.cations_meq_per_l, f.anions_meq_per_l);
    f.ion_balance_acceptable = equilibrium::charge_balance_acceptable(f.cations_meq_per_l, f.anions_meq_per_l);
}

// A ratio of 1030 E against its range; outside it, a note saying what the method suspects.
void check(WaterFigures& f, const std::string& name, double ratio, double low, double high, const std::string& if_low,
           const std::string& if_high) {
    AnalysisCheck c{name, ratio, low, high, ratio >= low && ratio <= high};
    f.checks.push_back(c);
    if (c.within) return;
    f.notes.push_back(name + " is " + fmt_number(ratio) + ", outside " + fmt_number(low) + " to " + fmt_number(high) +
                      " (Standard Methods 1030 E): " + (ratio < low ? if_low : if_high));
}

// The 1030 E checks the measured values allow (criteria and their wording: the head of this file).
void analysis_checks(const LabMeasurements& m, WaterFigures& f) {
    const bool tds = m.tds_mg_per_l && *m.tds_mg_per_l > 0.0;
    const bool ec = m.conductance_25c_us_per_cm && *m.conductance_25c_us_per_cm > 0.0;
    auto beside = [](double measured, double calculated) {
        MeasuredBeside b;
        b.given = true;
        b.measured = measured;
        b.calculated = calculated;
        b.ratio_available = calculated > 0.0;
        b.ratio = b.ratio_available ? measured / calculated : 0.0;
        return b;
    };
    if (tds) f.tds_measured = beside(*m.tds_mg_per_l, f.tds_calculated_mg_per_l);
    if (ec) f.conductance_measured = beside(*m.conductance_25c_us_per_cm, f.specific_conductance_us_per_cm);

    if (tds && f.tds_measured.ratio_available)
        check(f, "measured TDS / calculated TDS", f.tds_measured.ratio, tds_measured_to_calculated_low,
              tds_measured_to_calculated_high, "the higher ion sum and the measured TDS are suspect",
              "the lower ion sum is suspect: a constituent may be missing from the analysis");
    if (!ec) return;
    const double e = *m.conductance_25c_us_per_cm;
    if (f.specific_conductance_us_per_cm > 0.0)
        check(f, "calculated EC / measured EC", f.specific_conductance_us_per_cm / e,
              conductance_calculated_to_measured_low, conductance_calculated_to_measured_high,
              "the lower ion sum is suspect", "the higher ion sum is suspect");
    if (tds)
        check(f, "measured TDS / EC", *m.tds_mg_per_l / e, tds_to_conductance_low, tds_to_conductance_high,
              "the measured TDS or EC is suspect", "the measured TDS or EC is suspect");
    if (f.tds_calculated_mg_per_l > 0.0)
        check(f, "calculated TDS / EC", f.tds_calculated_mg_per_l / e, tds_to_conductance_low, tds_to_conductance_high,
              "the lower ion sum is suspect",
              "the higher ion sum is suspect (poorly dissociated calcium and sulfate can raise it to about 0.8)");
    if (f.cations_meq_per_l > 0.0)
        check(f, "100 x cation sum / EC", 100.0 * f.cations_meq_per_l / e, ion_sum_to_conductance_low,
              ion_sum_to_conductance_high, "the cation sum is suspect", "the cation sum is suspect");
    if (f.anions_meq_per_l > 0.0)
        check(f, "100 x anion sum / EC", 100.0 * f.anions_meq_per_l / e, ion_sum_to_conductance_low,
              ion_sum_to_conductance_high, "the anion sum is suspect", "the anion sum is suspect");
}

}  // namespace

WaterFigures water_figures(const thermo::Database& db, const equilibrium::SpeciationResult& r, const Indices* indices,
                           const LabMeasurements* measured) {
    WaterFigures f;
    const double per_l = 1000.0 * r.kg_water_per_litre;  // mol/kgw -> mmol/L

    // Hardness (Standard Methods 2340 B).
    f.calcium_mg_per_l = element_total(r, "Ca") * per_l * chem::parse_formula("Ca").molar_mass();
    f.magnesium_mg_per_l = element_total(r, "Mg") * per_l * chem::parse_formula("Mg").molar_mass();
    f.hardness_calcium = hardness_from_ca_mg(f.calcium_mg_per_l, 0.0);
    f.hardness_magnesium = hardness_from_ca_mg(0.0, f.magnesium_mg_per_l);
    f.hardness_total = f.hardness_calcium + f.hardness_magnesium;

    // Alkalinity (Standard Methods 2320; Stumm and Morgan 1996).
    const auto carbonate = db.find_species("HCO3-");
    double dic = 0.0, carbonate_alk = 0.0;
    if (carbonate && *carbonate < r.component_present.size() && r.component_present[*carbonate]) {
        dic = r.component_totals[*carbonate];
        for (const auto& s : r.species)
            if (holds(db.species()[s.species], *carbonate)) carbonate_alk += db.species()[s.species].alkalinity * s.molality;
    }
    f.alkalinity_total_m = std::max(r.alkalinity_eq, 0.0) * per_l * mg_caco3_per_meq;
    const double p_eq = r.alkalinity_eq - dic;
    f.alkalinity_phenolphthalein_p = std::max(p_eq, 0.0) * per_l * mg_caco3_per_meq;
    f.acidity_to_ph_8_3 = std::max(-p_eq, 0.0) * per_l * mg_caco3_per_meq;
    f.carbonate_alkalinity_meq_per_l = std::max(carbonate_alk, 0.0) * per_l;
    const auto [ch, nch] = split_hardness(f.hardness_total, f.alkalinity_total_m);
    f.hardness_carbonate = ch;
    f.hardness_non_carbonate = nch;

    // Dissolved solids by calculation (Standard Methods 1030 E; Hem 1985).
    double tds = 0.0;
    for (std::size_t j = 0; j < db.species().size() && j < r.component_present.size(); ++j) {
        const auto& sp = db.species()[j];
        if (!sp.is_component || sp.role != thermo::ComponentRole::ordinary || !r.component_present[j]) continue;
        if (carbonate && j == *carbonate) continue;
        if (only_h_and_o(sp.formula)) continue;
        tds += r.component_totals[j] * per_l * reported_mass_g_per_mol(db, j);
    }
    // Carbonate species as CO3^2-: 60.009 / 2 mg per meq (HCO3- x 0.4917 in Hem's form).
    tds += f.carbonate_alkalinity_meq_per_l * chem::parse_formula("CO3").molar_mass() / 2.0;
    f.tds_calculated_mg_per_l = tds;

    // Specific conductance at 25 degC (Standard Methods 2510; Onsager 1927).
    {
        double kappa = 0.0, charge_all = 0.0, charge_left_out = 0.0;
        for (const auto& s : r.species) {
            const int z = db.species()[s.species].formula.charge;
            if (z == 0 || db.species()[s.species].role == thermo::ComponentRole::electron) continue;
            const double c_eq = std::abs(z) * s.molality * r.kg_water_per_litre;  // eq/L
            charge_all += c_eq;
            const auto l0 = limiting_conductance(s.name);
            if (!l0) {
                charge_left_out += c_eq;
                continue;
            }
            f.conductance_ions_counted += 1;
            kappa += c_eq * ionic_conductance(*l0, z, r.ionic_strength);
        }
        f.specific_conductance_us_per_cm = std::max(kappa, 0.0) * 1000.0;  // S cm2/eq x eq/L -> uS/cm
        f.conductance_charge_left_out_percent = charge_all > 0 ? 100.0 * charge_left_out / charge_all : 0.0;
    }

    // The ions and their balance, then the checks of the analysis (Standard Methods 1030 E).
    ions_table(db, r, carbonate, per_l, f);
    if (measured) analysis_checks(*measured, f);

    // Larson-Skold (1958).
    if (f.carbonate_alkalinity_meq_per_l > 0) {
        const double cl = component_total(db, r, "Cl-") * per_l;
        const double so4 = 2.0 * component_total(db, r, "SO4^2-") * per_l;
        f.larson_skold = larson_skold(cl, so4, f.carbonate_alkalinity_meq_per_l);
        f.larson_skold_available = std::isfinite(f.larson_skold);
        f.larson_skold_reading = larson_skold_reading(f.larson_skold);
    }
    if (!f.larson_skold_available) {
        f.larson_skold = 0.0;
        f.larson_skold_reading.clear();
        f.larson_skold_why_not = "the water has no carbonate alkalinity, the index's denominator";
    }

    // Puckorius (1991): needs pHs.
    if (!indices || !indices->available) {
        f.puckorius_why_not = indices ? "it needs the pHs of the Langelier index, which is unavailable"
                                      : "it needs the pHs of the Langelier index, not computed here";
    } else if (!(f.alkalinity_total_m > 0)) {
        f.puckorius_why_not = "the water has no total alkalinity";
    } else {
        f.puckorius_ph_eq = puckorius_ph_eq(f.alkalinity_total_m);
        f.puckorius = puckorius(indices->ph_s, f.alkalinity_total_m);
        f.puckorius_available = std::isfinite(f.puckorius);
        f.puckorius_reading = puckorius_reading(f.puckorius);
        if (!f.puckorius_available) {
            f.puckorius = f.puckorius_ph_eq = 0.0;
            f.puckorius_reading.clear();
            f.puckorius_why_not = "the index is not finite for this water";
        }
    }

    // Aggressive Index (AWWA C400).
    if (!(f.alkalinity_total_m > 0) || !(f.hardness_calcium > 0)) {
        f.aggressive_index_why_not = "it needs both calcium and total alkalinity";
    } else {
        f.aggressive_index = aggressive_index(r.ph, f.alkalinity_total_m, f.hardness_calcium);
        f.aggressive_index_available = std::isfinite(f.aggressive_index);
        f.aggressive_index_reading = aggressive_index_reading(f.aggressive_index);
        if (!f.aggressive_index_available) {
            f.aggressive_index = 0.0;
            f.aggressive_index_reading.clear();
            f.aggressive_index_why_not = "the index is not finite for this water";
        }
    }
    // Past the Davies range the Langelier family says little (Standard Methods 2330).
    if (r.ionic_strength > langelier_ionic_strength_limit)
        f.notes.push_back(fmt_number(r.ionic_strength) + " mol/kgw of ionic strength is past the " +
                          fmt_number(langelier_ionic_strength_limit) +
                          " mol/kgw where the Langelier, Ryznar, Puckorius and Aggressive indices stop being "
                          "meaningful (Standard Methods 2330); for a brine read the calcite saturation index, and "
                          "the Stiff-Davis index (not computed here) is the one the trade uses");
    return f;
}

}  // namespace deltag::process
