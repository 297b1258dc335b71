// A generator of plausible lab analyses, for tests that every realistic water solves.
//
// The waters are random but chemically sensible: concentrations drawn log-uniformly from
// ranges found in natural and treated waters (fresh, soft/permeate, brackish, acid mine,
// lime-softened/caustic, hot, reduced groundwater), temperatures 0-100 degC, pH 2-12.5 or from
// the charge balance, ionic strength about 1e-5 to 0.5 mol/kg. Every water is either
//   - balanced within 5 % by construction (Na or Cl raised to close the nominal balance, then
//     a random error within +-5 % of the ion sum),
//   - balanced on pH (carbonate given as DIC, the nominal balance closed at a target pH, so
//     the solved pH lands near it), or
//   - balanced on an analyte (a raw analysis off by 6-20 %, balanced on an ion of the
//     charge that needs adding).
// About a third carry a redox level (pe, an Eh reading against a reference electrode, or
// dissolved oxygen); the reduced-groundwater kind puts nitrate and sulfate at low pe; iron is
// sometimes reported as ferrous and ferric iron apart (Fe +2, Fe +3). Soft waters go down to 0.005 meq/L alkalinity.
//
// The random numbers come from splitmix64 and are turned into doubles by hand, so the corpus
// is the same with every compiler and standard library (std:: distributions are not). The
// seed is fixed by the caller. The waters are invented; no sample of a real place.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <string>
#include <vector>

#include "deltag/water.hpp"
#include "deltag/water_properties.hpp"

namespace corpus {

class Random {
public:
    explicit Random(std::uint64_t seed) : state_(seed) {}
    std::uint64_t next() {
        std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ULL);
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
        return z ^ (z >> 31);
    }
    double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }  // [0, 1)
    double uniform(double lo, double hi) { return lo + (hi - lo) * uniform(); }
    double log_uniform(double lo, double hi) { return std::exp(uniform(std::log(lo), std::log(hi))); }
    bool chance(double p) { return uniform() < p; }
    std::size_t pick(std::size_t n) { return static_cast<std::size_t>(uniform() * static_cast<double>(n)) % n; }

private:
    std::uint64_t state_;
};

enum class Kind { fresh, soft, permeate, brackish, acid, caustic, hot, reduced };

inline const char* kind_name(Kind k) {
    switch (k) {
        case Kind::fresh: return "fresh";
        case Kind::soft: return "soft";
        case Kind::permeate: return "permeate";
        case Kind::brackish: return "brackish";
        case Kind::acid: return "acid";
        case Kind::caustic: return "caustic";
        case Kind::hot: return "hot";
        case Kind::reduced: return "reduced";
    }
    return "";
}

enum class Balance { within_5_percent, on_ph, on_analyte };
enum class Redox { none, pe, eh, oxygen };

struct Generated {
    deltag::WaterAnalysis water;
    Kind kind = Kind::fresh;
    Balance balance = Balance::within_5_percent;
    Redox redox = Redox::none;
    double target_ph = 7.0;  // the measured pH, or the pH the balance was built around
};

namespace detail {

struct Ion {
    const char* name;
    double mg_per_l;
    double molar_mass;  // of the mass formula
    int charge;         // nominal, for the construction of the balance
};

// Carbonate charge per mole of DIC at a pH (25 degC constants, Plummer & Busenberg 1982:
// pK1 6.35, pK2 10.33): only to place the construction near a target pH.
// Alkalinity per mole of dissolved aluminium at a pH (Al^3+ the reference level: Al(OH)n
// counts n): hydrolysis log K -4.99, -10.1, -16.9, -22.7 for n = 1..4 (Nordstrom et al.
// 1990, 25 degC, ideal; from memory, for the generator only).
inline double aluminium_bases_per_mol(double ph) {
    const double log_k[] = {0.0, -4.99, -10.1, -16.9, -22.7};
    double sum = 0.0, count = 0.0;
    for (int n = 0; n <= 4; ++n) {
        const double w = std::pow(10.0, log_k[n] + n * ph);
        sum += w;
        count += n * w;
    }
    return count / sum;
}

// The same for ferric iron, counted from Fe(OH)2+ (Fe^3+ -2, FeOH^2+ -1, Fe(OH)3 +1,
// Fe(OH)4- +2): log K -2.19, -5.67, -12.56, -21.6 (Nordstrom et al. 1990, from memory).
inline double ferric_bases_per_mol(double ph) {
    const double log_k[] = {0.0, -2.19, -5.67, -12.56, -21.6};
    double sum = 0.0, count = 0.0;
    for (int n = 0; n <= 4; ++n) {
        const double w = std::pow(10.0, log_k[n] + n * ph);
        sum += w;
        count += (n - 2) * w;
    }
    return count / sum;
}

inline double carbonate_charge_per_dic(double ph) {
    const double h = std::pow(10.0, -ph), k1 = std::pow(10.0, -6.35), k2 = std::pow(10.0, -10.33);
    const double d = h * h + k1 * h + k1 * k2;
    return (k1 * h + 2.0 * k1 * k2) / d;
}

}  // namespace detail

// n waters from a seed.
inline std::vector<Generated> generate(std::size_t n, std::uint64_t seed) {
    using detail::Ion;
    Random r(seed);
    std::vector<Generated> out;
    out.reserve(n);
    for (std::size_t i = 0; i < n; ++i) {
        Generated g;
        const double u = r.uniform();
        g.kind = u < 0.30   ? Kind::fresh
                 : u < 0.40 ? Kind::soft
                 : u < 0.47 ? Kind::permeate
                 : u < 0.57 ? Kind::brackish
                 : u < 0.67 ? Kind::acid
                 : u < 0.79 ? Kind::caustic
                 : u < 0.89 ? Kind::hot
                            : Kind::reduced;
        deltag::WaterAnalysis& w = g.water;
        w.name = std::string("w") + std::to_string(i) + "-" + kind_name(g.kind);
        w.units = "mg/L";
        w.temperature_c = g.kind == Kind::hot ? r.uniform(75.0, 100.0)
                          : r.chance(0.85)    ? r.uniform(2.0, 35.0)
                                              : r.uniform(0.0, 75.0);

        // Major ions (mg/L) and the scale of the water.
        double scale = 1.0;  // multiplies the majors
        double ph = 7.0, alk_meq = 1.0;
        switch (g.kind) {
            case Kind::fresh:
            case Kind::hot: scale = r.log_uniform(0.2, 5.0); ph = r.uniform(6.0, 9.0); alk_meq = r.log_uniform(0.2, 6.0); break;
            case Kind::soft: scale = r.log_uniform(0.02, 0.2); ph = r.uniform(5.0, 7.5); alk_meq = r.log_uniform(0.005, 0.5); break;
            case Kind::permeate: scale = r.log_uniform(0.002, 0.02); ph = r.uniform(5.5, 7.5); alk_meq = r.log_uniform(0.005, 0.05); break;
            case Kind::brackish: scale = r.log_uniform(5.0, 60.0); ph = r.uniform(6.5, 8.5); alk_meq = r.log_uniform(1.0, 8.0); break;
            case Kind::acid: scale = r.log_uniform(0.5, 10.0); ph = r.uniform(2.0, 4.5); alk_meq = 0.0; break;
            case Kind::caustic: scale = r.log_uniform(0.2, 5.0); ph = r.uniform(10.0, 12.5); alk_meq = r.log_uniform(0.2, 3.0); break;
            case Kind::reduced: scale = r.log_uniform(0.2, 5.0); ph = r.uniform(6.0, 8.5); alk_meq = r.log_uniform(1.0, 8.0); break;
        }
        std::vector<Ion> ions;
        auto add = [&](const char* name, double lo, double hi, double mm, int z, double p = 1.0) {
            if (r.chance(p)) ions.push_back({name, r.log_uniform(lo, hi), mm, z});
        };
        const bool brine = g.kind == Kind::brackish;
        add("Ca", 5.0 * scale, 60.0 * scale, 40.078, 2, 0.95);
        add("Mg", 1.0 * scale, 15.0 * scale, 24.305, 2, 0.9);
        add("Na", 3.0 * scale * (brine ? 8.0 : 1.0), 40.0 * scale * (brine ? 8.0 : 1.0), 22.990, 1, 0.95);
        add("K", 0.3 * scale, 5.0 * scale, 39.098, 1, 0.7);
        add("Cl", 4.0 * scale * (brine ? 10.0 : 1.0), 60.0 * scale * (brine ? 10.0 : 1.0), 35.45, -1, 0.95);
        add("SO4", (g.kind == Kind::acid ? 60.0 : 3.0) * scale, (g.kind == Kind::acid ? 600.0 : 60.0) * scale, 96.06, -2, 0.9);
        add("NO3", 0.1, 40.0, 62.004, -1, g.kind == Kind::reduced ? 0.9 : 0.4);
        add("SiO2", 0.5, 40.0, 60.083, 0, 0.6);
        add("F", 0.02, 1.5, 18.998, -1, 0.3);
        add("Sr", 0.02, 2.0, 87.62, 2, 0.25);
        add("Ba", 0.002, 0.2, 137.33, 2, 0.15);
        add("Mn", 0.002, g.kind == Kind::acid ? 20.0 : 1.0, 54.938, 2, g.kind == Kind::acid ? 0.7 : 0.2);
        add("Zn", 0.001, g.kind == Kind::acid ? 20.0 : 0.5, 65.38, 2, g.kind == Kind::acid ? 0.5 : 0.15);
        add("Cu", 0.001, g.kind == Kind::acid ? 5.0 : 0.3, 63.546, 2, g.kind == Kind::acid ? 0.4 : 0.1);
        add("Al", 0.002, g.kind == Kind::acid ? 60.0 : 0.2, 26.982, 3, g.kind == Kind::acid ? 0.7 : 0.15);
        add("Ni", 0.001, 0.1, 58.693, 2, 0.05);
        add("Pb", 0.0005, 0.05, 207.2, 2, 0.05);
        // Iron: total, or ferrous and ferric apart (needs a redox level to mean much; the
        // solver takes them either way).
        const double fe = r.log_uniform(0.005, g.kind == Kind::acid ? 200.0 : 3.0);
        const bool iron = r.chance(g.kind == Kind::acid || g.kind == Kind::reduced ? 0.8 : 0.25);
        const bool iron_apart = iron && r.chance(0.25);
        if (iron && !iron_apart) ions.push_back({"Fe", fe, 55.845, 2});
        if (iron_apart) {
            const double f3 = r.uniform(0.05, 0.95);
            ions.push_back({"Fe +2", fe * (1 - f3), 55.845, 2});
            // Nominal charge +1: with the alkalinity given, ferric iron counts at its form at
            // the titration end point, Fe(OH)2+ (README, "How alkalinity is counted").
            ions.push_back({"Fe +3", fe * f3, 55.845, 1});
        }
        if (g.kind == Kind::permeate)
            for (auto& ion : ions) ion.mg_per_l *= 0.05;  // permeate: mostly Na and Cl remain
        // Drop the very minor ones of a permeate to keep it realistic.

        // Carbonate: alkalinity with a measured pH, or DIC.
        const double pkw = deltag::thermo::water_pkw(w.temperature_c);
        // H+ and OH- as concentrations: the activity over a Davies activity coefficient at the
        // nominal ionic strength of the ions (a rough figure is enough: it only keeps a lab's
        // alkalinity above the hydroxide the water contains).
        double i_est = 0.0;
        for (const auto& ion : ions) i_est += 0.5 * ion.mg_per_l / ion.molar_mass * 1e-3 * ion.charge * ion.charge;
        i_est += 0.5e-3 * alk_meq;
        const double sqrt_i = std::sqrt(i_est);
        const double gamma1 = std::pow(10.0, -0.51 * (sqrt_i / (1.0 + sqrt_i) - 0.3 * i_est));
        const double oh_meq = 1000.0 * std::pow(10.0, ph - pkw) / gamma1;
        const double h_meq = 1000.0 * std::pow(10.0, -ph) / gamma1;
        // Caustic waters: the carbonate alkalinity at least a tenth of the hydroxide, so the
        // analysis stays consistent within the spread between activity models.
        // Bases other than carbonate and OH- that a titration counts at high pH: MgOH+, CaOH+
        // (log K -11.44, -12.78) and silicate (pK 9.83), Nordstrom et al. (1990), 25 degC.
        double other_bases_meq = 0.0;
        for (const auto& ion : ions) {
            const double mmol = ion.mg_per_l / ion.molar_mass;
            const std::string nm = ion.name;
            // van 't Hoff from 25 degC with dH 66.0, 64 and 25.6 kJ/mol (the first and last
            // Nordstrom et al. 1990; CaOH+ about as MgOH+, an estimate for the generator only).
            auto frac = [&](double log_k25, double dh_kj) {
                const double log_k = log_k25 - dh_kj * 1000.0 / (8.314462618 * std::log(10.0)) *
                                                   (1.0 / (w.temperature_c + 273.15) - 1.0 / 298.15);
                const double k = std::pow(10.0, log_k), h = std::pow(10.0, -ph);
                return k / (k + h);
            };
            if (nm == "Mg") other_bases_meq += mmol * frac(-11.44, 66.0);
            if (nm == "Ca") other_bases_meq += mmol * frac(-12.78, 64.0);
            if (nm == "SiO2") other_bases_meq += mmol * frac(-9.83, 25.6);
            if (nm == "Al") other_bases_meq += mmol * detail::aluminium_bases_per_mol(ph);
            if (nm == "Fe +3") other_bases_meq += mmol * detail::ferric_bases_per_mol(ph);
        }
        if (g.kind == Kind::caustic) alk_meq = std::max(alk_meq, 0.3 * oh_meq);
        // Redox level: a third of the waters, all of the reduced ones.
        double redox_pe = 14.0;  // no redox level given: taken as oxic
        if (g.kind == Kind::reduced || r.chance(0.33)) {
            const double p_ref = g.kind == Kind::reduced ? 2.0 : r.uniform();
            // Within the stability of water, away from its edges: -pH + 1 < pe < (O2 line) - 0.75.
            // The O2/H2O line at 1 atm: pe + pH = (83.1 - 29860 (1/298.15 - 1/T)) / 4, from
            // log K = -83.1 at 25 degC and dH = +571.7 kJ/mol for 2 H2O = O2(g) + 4 H+ + 4 e-
            // (Wagman et al. 1982 values, from memory; the generator needs only the trend).
            const double o2_line = (83.1 - 29860.0 * (1.0 / 298.15 - 1.0 / (w.temperature_c + 273.15))) / 4.0;
            const double lo = std::max(-ph + 1.0, -6.0), hi = std::min(o2_line - 0.75 - ph, 16.0);
            redox_pe = g.kind == Kind::reduced ? r.uniform(std::max(lo, -5.0), 3.0) : r.uniform(lo, hi);
            const double pe = redox_pe;
            if (p_ref < 0.45) {
                g.redox = Redox::pe;
                w.pe = pe;
            } else if (p_ref < 0.8) {
                g.redox = Redox::eh;
                const double t_k = w.temperature_c + 273.15;
                const double eh_she = pe * 8.314462618 * t_k * std::log(10.0) / 96485.33212;
                const char* refs[] = {"SHE", "SCE", "Ag/AgCl(sat KCl)", "Ag/AgCl(3 M KCl)"};
                const double ref_v[] = {0.0, 0.241, 0.197, 0.210};  // approximate, 25 degC
                const std::size_t k = r.pick(4);
                w.eh_reference = refs[k];
                w.eh_mv = (eh_she - ref_v[k]) * 1000.0;
            } else {
                g.redox = Redox::oxygen;
                w.dissolved_oxygen_mg_per_l = r.log_uniform(0.05, 12.0);
                redox_pe = 20.0 - ph;  // any dissolved oxygen is oxic
            }
        }
        // At a low redox level nitrate and sulfate are reduced (to NH4+, HS-), which moves the
        // charge balance far from the nominal one: such waters are balanced on pH or left
        // with their measured pH, never on an analyte (that could need a negative amount).
        const bool oxic = redox_pe + ph >= 13.0;
        // Reduced nitrate is ammonia, a base at high pH (NH4+ pKa 9.25, dH 52 kJ/mol; value
        // from memory of standard tables, for the generator only).
        if (!oxic)
            for (const auto& ion : ions)
                if (std::string(ion.name) == "NO3") {
                    const double log_k = -9.25 - 52000.0 / (8.314462618 * std::log(10.0)) * (1.0 / (w.temperature_c + 273.15) - 1.0 / 298.15);
                    other_bases_meq += ion.mg_per_l / ion.molar_mass / (1.0 + std::pow(10.0, -ph - log_k));
                }
        // Below the sulfate/sulfide line sulfate is bisulfide, a base (pKa of H2S 7.0); total
        // iron given with an oxic redox level is ferric, with its hydroxo bases.
        for (const auto& ion : ions) {
            const double mmol = ion.mg_per_l / ion.molar_mass;
            if (std::string(ion.name) == "SO4" && !oxic) {
                // SO4^2- + 9 H+ + 8 e- = HS- + 4 H2O, log K 33.65 (Nordstrom et al. 1990, from memory).
                const double log_ratio = 33.65 - 9.0 * ph - 8.0 * redox_pe;  // log [HS-]/[SO4^2-], ideal
                const double reduced = 1.0 / (1.0 + std::pow(10.0, -log_ratio));
                other_bases_meq += mmol * reduced / (1.0 + std::pow(10.0, 7.0 - ph));
            }
            if (std::string(ion.name) == "Fe" && g.redox != Redox::none && oxic)
                other_bases_meq += mmol * detail::ferric_bases_per_mol(ph);
        }
        g.balance = r.chance(0.45) ? Balance::within_5_percent : r.chance(0.5) ? Balance::on_ph : Balance::on_analyte;
        if (g.kind == Kind::acid && g.balance == Balance::on_ph && r.chance(0.5)) g.balance = Balance::on_analyte;
        if (g.balance == Balance::on_analyte && !oxic) g.balance = r.chance(0.5) ? Balance::on_ph : Balance::within_5_percent;
        if (g.balance == Balance::on_ph && g.redox == Redox::oxygen) g.balance = Balance::within_5_percent;
        bool use_dic = g.balance == Balance::on_ph || g.kind == Kind::acid || r.chance(0.3);
        double dic_mmol = 0.0;
        if (use_dic) {
            // The DIC that carries the alkalinity at the pH; acid waters: a little CO2 only.
            const double q = detail::carbonate_charge_per_dic(ph);
            dic_mmol = g.kind == Kind::acid ? r.log_uniform(0.01, 2.0) : alk_meq / std::max(q, 0.05);
            if (g.kind == Kind::caustic) dic_mmol = alk_meq / std::max(q, 1.0);
        }
        double carbonate_meq = use_dic ? dic_mmol * detail::carbonate_charge_per_dic(ph) : alk_meq;
        // Nominal balance: cations - anions (meq/L); carbonate and OH- count as anions, H+ as a cation.
        double cat = h_meq, an = carbonate_meq + oh_meq;
        for (const auto& ion : ions) {
            double meq = ion.mg_per_l / ion.molar_mass * std::abs(ion.charge);
            // Acid waters: part of the sulfate is HSO4- (pKa 1.99, Nordstrom et al. 1990).
            if (std::string(ion.name) == "SO4") meq *= 1.0 - 0.5 / (1.0 + std::pow(10.0, ph - 1.99));
            (ion.charge > 0 ? cat : an) += meq;
        }
        auto set_ion = [&](const char* name, double mg, double mm, int z) {
            for (auto& ion : ions)
                if (std::string(ion.name) == name) {
                    ion.mg_per_l += mg;
                    return;
                }
            ions.push_back({name, mg, mm, z});
        };
        // Close the nominal balance with Na or Cl (the usual unmeasured remainder).
        const double diff = cat - an;
        if (diff < 0) set_ion("Na", -diff * 22.990, 22.990, 1);
        else set_ion("Cl", diff * 35.45, 35.45, -1);
        const double sum = std::max(cat, an);
        std::string balance_on;
        if (g.balance == Balance::within_5_percent) {
            // A random analytical error within +-5 % of the ion sum, on Na or Cl.
            const double err = r.uniform(-0.05, 0.05) * sum;
            if (err > 0) set_ion("Na", err * 22.990, 22.990, 1);
            else set_ion("Cl", -err * 35.45, 35.45, -1);
        } else if (g.balance == Balance::on_analyte) {
            // Off by up to 20 %; balance on an ion that must be added.
            // At least 6 % (more than the nominal balance errs by, from ion pairs and the
            // temperature of the carbonate constants) so the ion really must be added.
            const double min_err = g.kind == Kind::caustic ? 0.12 : 0.06;  // OH- is estimated roughly
            const double err = (r.chance(0.5) ? -1.0 : 1.0) * r.uniform(min_err, 0.2) * sum;
            const bool add_cation = err < 0;  // anions in excess: add a cation
            const char* candidates_c[] = {"Na", "K", "Ca", "Mg"};
            const char* candidates_a[] = {"Cl", "SO4", "NO3"};
            balance_on = add_cation ? candidates_c[r.pick(4)] : candidates_a[r.pick(3)];
            // Remove what the error says from the balancing ion's partner so the analyte must rise.
            if (add_cation) set_ion("Cl", -err * 35.45, 35.45, -1);
            else set_ion("Na", err * 22.990, 22.990, 1);
            bool listed = false;
            for (const auto& ion : ions) listed = listed || std::string(ion.name) == balance_on;
            if (!listed) ions.push_back({balance_on.c_str(), 0.0, 1.0, 0});
        }

        for (const auto& ion : ions) {
            deltag::AnalyteValue a;
            a.name = ion.name;
            if (const auto space = a.name.find(' '); space != std::string::npos) {  // a redox state, "Fe +2"
                a.element = a.name.substr(0, space);
                a.oxidation_state = a.name.substr(space + 1);
            }
            a.value = ion.mg_per_l;
            // Some labs report nitrate as N.
            if (a.name == "NO3" && r.chance(0.5)) {
                a.as = "N";
                a.value = ion.mg_per_l * 14.007 / 62.004;
            }
            w.analytes.push_back(a);
        }
        if (use_dic && dic_mmol > 0) {
            deltag::AnalyteValue a;
            a.name = "DIC";
            a.value = dic_mmol;
            a.unit = "mmol/L";
            w.analytes.push_back(a);
        } else if (!use_dic) {
            deltag::AnalyteValue a;
            a.name = "Alkalinity";
            // Total alkalinity as a lab titrates it: carbonate plus hydroxide, minus H+.
            a.value = (alk_meq + oh_meq + other_bases_meq - h_meq) * 50.043;
            a.as = "CaCO3";
            w.analytes.push_back(a);
        }

        g.target_ph = ph;
        if (g.balance == Balance::on_ph) {
            w.charge_balance = "pH";
        } else {
            w.ph = ph;
            if (g.balance == Balance::on_analyte) w.charge_balance = balance_on;
        }

        out.push_back(std::move(g));
    }
    return out;
}

}  // namespace corpus
