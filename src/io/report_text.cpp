// The text report, answer first. For each water and step: what the step did, then what the
// water will do (each mineral near saturation with its tendency, ΔG and the amount to
// equilibrium; the indices read in words), then the water at a glance in the figures of a lab
// sheet, then the detail (where each component is, the species, every mineral's log K and log
// IAP, the Eh each redox couple implies, the totals), then what to check. The caution ends it.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "deltag/constants.hpp"
#include "deltag/figures.hpp"
#include "deltag/outlook.hpp"
#include "deltag/report.hpp"
#include "io/text_format.hpp"

namespace deltag::io {

std::string_view caution_text() {
    return "Caution: these are equilibrium calculations from the data given, not a design. Decisions on "
           "drinking water, chemical dosing, pressure equipment or cathodic protection follow local codes "
           "and rest with licensed engineers.";
}

namespace {

constexpr std::size_t page_width = 80;

std::string rule(char c = '-', std::size_t n = page_width) { return std::string(n, c) + "\n"; }

// Display width of UTF-8 text (code points; all our symbols are one column wide).
std::size_t width(std::string_view s) { return text::code_points(s); }

std::string pad(std::string_view s, std::size_t w) {
    std::string out(s);
    for (std::size_t n = width(s); n < w; ++n) out += ' ';
    return out;
}

std::string rpad(std::string_view s, std::size_t w) {
    std::string out;
    for (std::size_t n = width(s); n < w; ++n) out += ' ';
    return out + std::string(s);
}

std::string sci(double v) { return fmt::format("{:.3e}", v); }

// "label   value", the value wrapped under itself when it is long.
std::string field(std::string_view label, const std::string& value, std::size_t indent = 4, std::size_t label_w = 20) {
    const std::size_t room = page_width > indent + label_w + 20 ? page_width - indent - label_w : 40;
    const auto lines = text::wrap(value, room);
    std::string out;
    for (std::size_t i = 0; i < lines.size(); ++i)
        out += std::string(indent, ' ') + pad(i == 0 ? label : "", label_w) + lines[i] + "\n";
    if (lines.empty()) out += std::string(indent, ' ') + std::string(label) + "\n";
    return out;
}

// A paragraph at an indent, wrapped to the page.
std::string para(const std::string& s, std::size_t indent = 4, std::string_view first = "") {
    std::string out;
    const std::size_t lead = width(first);
    const auto lines = text::wrap(s, page_width - indent - lead);
    for (std::size_t i = 0; i < lines.size(); ++i)
        out += std::string(indent, ' ') + (i == 0 ? std::string(first) : std::string(lead, ' ')) + lines[i] + "\n";
    return out;
}

std::string heading(std::string_view title) { return "\n  " + std::string(title) + "\n"; }

// Standard Methods for the Examination of Water and Wastewater (APHA, AWWA, WEF) is "SM" in
// the report, as on a lab sheet; its header line says so once.

// An amount in mg/L with the digits it deserves.
std::string mg(double v) {
    const double a = std::abs(v);
    if (a >= 100.0) return fmt::format("{:.0f}", a);
    if (a >= 10.0) return fmt::format("{:.1f}", a);
    if (a >= 0.01) return fmt::format("{:.2f}", a);
    return fmt::format("{:.2g}", a);
}

// The label of a component: its element (C for carbonate, S for sulfate), else its name.
std::string component_label(const thermo::Species& comp) {
    std::string label;
    for (const auto& [el, n] : comp.formula.elements)
        if (el != "H" && el != "O") label += (label.empty() ? "" : "+") + el;
    return label.empty() ? chem::pretty(comp.name) : label;
}

// ---- 1. what the water will do -----------------------------------------------------------

process::Outlook outlook_of(const thermo::Database& db, const ReportItem& item) {
    return item.outlook ? *item.outlook : process::saturation_outlook(db, item.result);
}

std::string verdict_block(const thermo::Database& db, const ReportItem& item) {
    const process::Outlook o = outlook_of(db, item);
    std::string out = heading("What it will do");
    if (o.minerals.empty() && o.far_below == 0) return out + para("no mineral of the database can form from this water");
    if (!o.minerals.empty()) {
        out += "    " + pad("mineral", 19) + pad("tendency", 15) + rpad("SI", 6) + rpad("ΔG kJ/mol", 11) + "   to reach equilibrium\n";
        for (const auto& m : o.minerals) {
            std::string amount;
            // The amount can be tiny while the SI is large: little of the element is left.
            const bool none = m.mg_per_l == 0.0 || (m.tendency == process::Tendency::balanced && std::abs(m.mg_per_l) < 0.005);
            const std::string how_much = std::abs(m.mg_per_l) < 1e-4 ? "under 0.0001" : mg(m.mg_per_l);
            if (!m.amount_available) amount = "n/a";
            else if (none) amount = "none: at equilibrium";
            else if (m.mg_per_l > 0) amount = how_much + " mg/L would deposit";
            else amount = how_much + " mg/L would dissolve, if present";
            out += "    " + pad(m.mineral, 19) + pad(process::tendency_text(m.tendency), 15) +
                   rpad(fmt::format("{:+.2f}", m.si), 6) + rpad(fmt::format("{:+.2f}", m.delta_g_kj_per_mol), 11) + "   " +
                   amount + "\n";
            if (!m.note.empty()) out += para(m.note, 4 + 19, "note: ");
            if (!m.amount_available && !m.why_not.empty() && item.outlook) out += para(m.why_not, 4 + 19, "n/a: ");
        }
    }
    std::string foot;
    if (!o.minerals.empty())
        foot = "Tendency from SI (balanced within ±" + text::trimmed(equilibrium::default_si_tolerance, 2) +
               "); ΔG = RT ln(IAP/K) drives it; the amount is what leaves or enters the water when it reaches "
               "equilibrium with that mineral alone, in a closed system (for calcite, the CCPP).";
    if (o.far_below > 0)
        foot += fmt::format("{}{} more mineral{} undersaturated by more than {} SI unit: see Every mineral.",
                            foot.empty() ? "" : " ", o.far_below, o.far_below == 1 ? " is" : "s are",
                            text::trimmed(-o.si_floor, 2));
    return out + para(foot, 4);
}

std::string indices_block(const ReportItem& item, const process::WaterFigures& f) {
    std::string out = "\n    " + pad("index", 20) + rpad("value", 7) + "   reading\n";
    auto row = [&](std::string_view name, const std::string& value, const std::string& reading) {
        const auto lines = text::wrap(reading, page_width - 4 - 20 - 7 - 3);
        for (std::size_t i = 0; i < std::max<std::size_t>(1, lines.size()); ++i)
            out += "    " + pad(i == 0 ? name : "", 20) + rpad(i == 0 ? value : "", 7) + "   " +
                   (i < lines.size() ? lines[i] : "") + "\n";
    };
    auto unavailable = [&](std::string_view name, const std::string& why) { row(name, "n/a", why); };
    if (item.indices) {
        const auto& ix = *item.indices;
        if (ix.available) {
            row("Langelier (LSI)", fmt::format("{:+.2f}", ix.langelier),
                process::langelier_reading(ix.langelier) +
                    fmt::format(" (pHs {:.2f} from the speciation; SM 2330)", ix.ph_s));
            row("Ryznar (RSI)", fmt::format("{:.2f}", ix.ryznar), process::ryznar_reading(ix.ryznar) + " (Ryznar 1944)");
        } else {
            unavailable("Langelier, Ryznar", ix.why_not);
            if (ix.formula_available)
                row("LSI, 2330 B formula", fmt::format("{:+.2f}", ix.formula_langelier),
                    fmt::format("pHs {:.2f} with all the carbonate alkalinity as bicarbonate; a rough guide only "
                                "where pHs nears pK2",
                                ix.formula_ph_s));
        }
        if (ix.ccpp_available)
            row("CCPP", fmt::format("{:+.1f}", ix.ccpp_mg_per_l),
                std::string("mg/L as CaCO3 ") +
                    (ix.ccpp_mg_per_l > 0   ? "would deposit"
                     : ix.ccpp_mg_per_l < 0 ? "would dissolve"
                                            : "at equilibrium") +
                    " (calcium carbonate precipitation potential, closed system)");
        else
            unavailable("CCPP", ix.ccpp_why_not);
    }
    if (f.puckorius_available)
        row("Puckorius (PSI)", fmt::format("{:.2f}", f.puckorius),
            f.puckorius_reading + fmt::format(" (pHeq {:.2f}; Puckorius and Brooke 1991)", f.puckorius_ph_eq));
    else if (item.indices)
        unavailable("Puckorius (PSI)", f.puckorius_why_not);
    if (f.larson_skold_available)
        row("Larson-Skold", fmt::format("{:.2f}", f.larson_skold), f.larson_skold_reading + " (Larson and Skold 1958)");
    else
        unavailable("Larson-Skold", f.larson_skold_why_not);
    if (f.aggressive_index_available)
        row("Aggressive Index", fmt::format("{:.2f}", f.aggressive_index), f.aggressive_index_reading + " (AWWA C400)");
    else
        unavailable("Aggressive Index", f.aggressive_index_why_not);
    return out;
}

// ---- 2. the water at a glance ------------------------------------------------------------

// Cations and anions side by side, mg/L and meq/L, as a lab sheet lists them.
std::string ions_table(const process::WaterFigures& f) {
    if (f.cations.empty() && f.anions.empty()) return "";
    std::string out = "    " + pad("ions", 20) + pad("cation", 10) + rpad("mg/L", 9) + rpad("meq/L", 9) + "   " +
                      pad("anion", 10) + rpad("mg/L", 9) + rpad("meq/L", 9) + "\n";
    auto cell = [](const std::vector<process::IonFigure>& v, std::size_t i) {
        if (i >= v.size()) return std::string(28, ' ');
        return pad(chem::pretty(v[i].ion), 10) + rpad(fmt::format("{:#.4g}", v[i].mg_per_l), 9) +
               rpad(fmt::format("{:.3f}", v[i].meq_per_l), 9);
    };
    for (std::size_t i = 0; i < std::max(f.cations.size(), f.anions.size()); ++i) {
        std::string line = "    " + std::string(20, ' ') + cell(f.cations, i) + "   " + cell(f.anions, i);
        while (!line.empty() && line.back() == ' ') line.pop_back();
        out += line + "\n";
    }
    return out;
}

std::string glance_block(const equilibrium::SpeciationResult& r,
                         const process::WaterFigures& f) {
    std::string out = heading("The water at a glance");
    out += field("pH, temperature", fmt::format("{:.2f} at {:.1f} °C", r.ph, r.temperature_c));
    auto beside = [](const process::MeasuredBeside& m, std::string_view unit) -> std::string {
        if (!m.given) return "";
        return fmt::format("; measured {:.4g} {}", m.measured, unit) +
               (m.ratio_available ? fmt::format(" (measured / calculated {:.2f})", m.ratio) : "");
    };
    out += field("dissolved solids", fmt::format("{:.0f} mg/L, calculated from the analysis (SM 1030 E){}",
                                                 f.tds_calculated_mg_per_l, beside(f.tds_measured, "mg/L")));
    out += field("conductance", fmt::format("{:.4g} µS/cm at 25 °C, calculated from the ions (SM 2510){}{}",
                                            f.specific_conductance_us_per_cm,
                                            f.conductance_charge_left_out_percent >= 0.05
                                                ? fmt::format("; ion pairs holding {:.1f} % of the charge left out",
                                                              f.conductance_charge_left_out_percent)
                                                : "",
                                            beside(f.conductance_measured, "µS/cm")));
    out += field("hardness", fmt::format("{:.1f} mg/L as CaCO3: calcium {:.1f}, magnesium {:.1f}; carbonate {:.1f}, "
                                         "non-carbonate {:.1f} (SM 2340 B)",
                                         f.hardness_total, f.hardness_calcium, f.hardness_magnesium,
                                         f.hardness_carbonate, f.hardness_non_carbonate));
    out += field("alkalinity", fmt::format("{:.1f} mg/L as CaCO3 (M, to pH 4.5); P {:.1f} (to pH 8.3){} (SM 2320)",
                                           f.alkalinity_total_m, f.alkalinity_phenolphthalein_p,
                                           f.acidity_to_ph_8_3 > 0
                                               ? fmt::format("; acidity to pH 8.3 {:.1f}", f.acidity_to_ph_8_3)
                                               : ""));
    out += ions_table(f);
    out += field("ion balance", fmt::format("{:+.2f} %: cations {:#.4g}, anions {:#.4g} meq/L; {} (SM 1030 E)",
                                            f.ion_balance_error_percent, f.cations_meq_per_l, f.anions_meq_per_l,
                                            f.ion_balance_acceptable ? "acceptable" : "OUTSIDE the acceptance"));
    if (!f.checks.empty()) {
        out += "    " + pad("analysis checks", 20) + "SM 1030 E: the ratio, and its acceptable range\n";
        for (const auto& c : f.checks)
            out += "    " + std::string(20, ' ') + pad(c.ratio_name, 31) + rpad(fmt::format("{:.2f}", c.ratio), 6) +
                   fmt::format("   {} {}-{}\n", c.within ? "within" : "OUTSIDE", text::fixed(c.low, 2),
                               text::fixed(c.high, 2));
    }
    if (r.charge_balance_adjustment) {
        const auto& a = *r.charge_balance_adjustment;
        const std::string unit = a.unit + (a.as.empty() ? "" : " as " + a.as);
        out += field("balanced on " + a.analyte,
                     fmt::format("{} adjusted from {:.4g} to {:.4g} {} ({:.4g} to {:.4g} mmol/kgw) to close the "
                                 "balance; as given it was {:+.2f} %, {} the Standard Methods 1030 E acceptance",
                                 a.analyte, a.given, a.adjusted, unit, a.given_mmol_per_kgw,
                                 a.adjusted_mmol_per_kgw, a.error_percent_as_given,
                                 a.within_acceptance ? "within" : "OUTSIDE"));
    }
    out += field("ionic strength", fmt::format("{:.4g} mol/kgw (water activity {:.5f})", r.ionic_strength, r.water_activity));
    if (r.pe) {
        const double eh = electro::eh_from_pe(*r.pe, r.temperature_c);
        const SourceLocation here{"report", 0, 0};
        out += field("redox level",
                     fmt::format("Eh {:+.0f} mV vs SHE (pe {:.2f}); {:+.0f} mV vs SCE, {:+.0f} mV vs Ag/AgCl (sat. "
                                 "KCl), {:+.0f} mV vs Cu/CuSO4 (sat.)",
                                 eh * 1000.0, *r.pe, electro::convert_v(eh, "SHE", "SCE", r.temperature_c, here) * 1000.0,
                                 electro::convert_v(eh, "SHE", "Ag/AgCl(sat KCl)", r.temperature_c, here) * 1000.0,
                                 electro::convert_v(eh, "SHE", "Cu/CuSO4(sat)", r.temperature_c, here) * 1000.0));
    } else {
        out += field("redox level", "not given: the redox species are left out");
    }
    std::string gases;
    for (const auto& s : r.saturation) {
        if (!s.is_gas) continue;
        const double p = std::pow(10.0, s.si);
        if (p < 1e-10) continue;  // a trace no gas phase would show (H2 in an oxic water)
        std::string name = chem::pretty(s.phase);
        if (name.size() > 3 && name.ends_with("(g)")) name.resize(name.size() - 3);
        gases += (gases.empty() ? "" : "; ") + name + " " +
                 (p < 0.01 && p >= 1e-6 ? fmt::format("{:.0f} ppmv ({} atm)", p * 1e6, sci(p)) : fmt::format("{:.3g} atm", p));
    }
    if (!gases.empty())
        out += field("gas in balance", gases + ": the partial pressure of a gas in equilibrium with the water");
    return out;
}

// ---- 3. the detail ----------------------------------------------------------------------

std::string where_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::string out = heading("Where each component is (% of its total; under 0.1 % left out)");
    for (std::size_t j = 0; j < db.component_count(); ++j) {
        if (!r.component_present[j]) continue;
        const thermo::Species& comp = db.species()[j];
        if (comp.role != thermo::ComponentRole::ordinary) continue;
        const double total = r.component_totals[j];
        if (!(total > 0)) continue;
        std::vector<std::pair<double, std::string>> parts;
        for (const auto& s : r.species) {
            double nu = 0.0;
            for (const auto& [k, v] : db.species()[s.species].formation)
                if (k == j) nu = v;
            if (nu <= 0) continue;
            const double share = 100.0 * nu * s.molality / total;
            if (share >= 0.1) parts.emplace_back(share, chem::pretty(s.name));
        }
        std::sort(parts.begin(), parts.end(), [](const auto& a, const auto& b) { return a.first > b.first; });
        std::string list;
        for (const auto& [share, name] : parts) list += (list.empty() ? "" : ", ") + name + fmt::format(" {:.1f}", share);
        out += field(component_label(comp), fmt::format("{:#.4g} mmol/kgw: ", total * 1000.0) + list, 4, 8);
    }
    return out;
}

std::string species_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::string out = heading("Species, most abundant first (γ: activity coefficient, activity = γ × molality)");
    out += "    " + pad("species", 16) + rpad("mol/kgw", 11) + rpad("mg/L", 11) + rpad("activity", 11) + rpad("γ", 8) +
           "\n";
    // Species below 1e-15 mol/kgw (a few ions per litre's worth of noise) are counted, not listed;
    // the JSON keeps them all.
    constexpr double shown_from = 1e-15;
    std::vector<const equilibrium::SpeciesResult*> rows;
    std::size_t hidden = 0;
    for (const auto& s : r.species) {
        if (s.molality >= shown_from) rows.push_back(&s);
        else ++hidden;
    }
    std::stable_sort(rows.begin(), rows.end(), [](auto* a, auto* b) { return a->molality > b->molality; });
    for (const auto* s : rows) {
        const double molar_mass = db.species()[s->species].formula.molar_mass();
        const double mg_per_l = s->molality * molar_mass * 1000.0 * r.kg_water_per_litre;
        out += "    " + pad(chem::pretty(s->name), 16) + rpad(sci(s->molality), 11) +
               rpad(mg_per_l >= 0.001 ? fmt::format("{:#.4g}", mg_per_l) : sci(mg_per_l), 11) + rpad(sci(s->activity), 11) +
               rpad(fmt::format("{:.3f}", std::pow(10.0, s->log_gamma)), 8) + "\n";
    }
    if (hidden > 0)
        out += para(fmt::format("{} more species below {:.0e} mol/kgw (in the JSON report)", hidden, shown_from), 4);
    return out;
}

std::string minerals_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::vector<const equilibrium::SaturationResult*> minerals;
    for (const auto& s : r.saturation)
        if (!s.is_gas) minerals.push_back(&s);
    if (minerals.empty()) return "";
    std::stable_sort(minerals.begin(), minerals.end(), [](auto* a, auto* b) { return a->si > b->si; });
    std::string out = heading(fmt::format("Every mineral (log K at {:.1f} °C; SI = log IAP - log K)", r.temperature_c));
    out += "    " + pad("mineral", 19) + pad("formula", 16) + rpad("log K", 9) + rpad("log IAP", 9) + rpad("SI", 8) +
           rpad("ΔG kJ/mol", 11) + "\n";
    for (const auto* s : minerals) {
        std::string formula;
        if (auto m = db.find_mineral(s->phase)) formula = chem::pretty(db.minerals()[*m].formula.text);
        out += "    " + pad(s->phase, 19) + pad(formula, 16) + rpad(fmt::format("{:.3f}", s->log_k), 9) +
               rpad(fmt::format("{:.3f}", s->log_iap), 9) + rpad(fmt::format("{:+.3f}", s->si), 8) +
               rpad(fmt::format("{:+.2f}", s->delta_g_kj_per_mol), 11) + "\n";
    }
    return out;
}

// The Eh each redox couple present implies, against the water's own.
std::string couples_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    const auto couples = electro::couple_potentials(db, r);
    if (couples.empty()) return "";
    std::string out = heading("The Eh each redox couple implies (equal values: the couples agree)");
    const bool has_eh = r.pe.has_value();
    const double eh = has_eh ? electro::eh_from_pe(*r.pe, r.temperature_c) : 0.0;
    out += "    " + pad("couple", 26) + rpad("mV vs SHE", 11) + (has_eh ? rpad("from the water's", 19) : "") + "\n";
    for (const auto& c : couples) {
        const auto slash = c.couple.find('/');
        const std::string shown = slash == std::string::npos
                                      ? chem::pretty(c.couple)
                                      : chem::pretty(c.couple.substr(0, slash)) + " / " +
                                            chem::pretty(c.couple.substr(slash + 1));
        out += "    " + pad(shown, 26) + rpad(fmt::format("{:+.0f}", c.eh_v * 1000.0), 11) +
               (has_eh ? rpad(fmt::format("{:+.0f} mV", (c.eh_v - eh) * 1000.0), 19) : "") + "\n";
    }
    return out;
}

std::string totals_block(const equilibrium::SpeciationResult& r) {
    std::string out = heading("Totals by element");
    out += "    " + pad("element", 10) + rpad("mmol/kgw", 12) + rpad("mg/L", 12) + "\n";
    for (const auto& [el, m] : r.element_totals) {
        const double mg_per_l = m * chem::atomic_weight(el).value_or(0.0) * 1000.0 * r.kg_water_per_litre;
        out += "    " + pad(el, 10) + rpad(fmt::format("{:#.4g}", m * 1000.0), 12) + rpad(fmt::format("{:#.4g}", mg_per_l), 12) + "\n";
    }
    return out;
}

// What a step did, before what the water will do.
std::string step_block(const thermo::Database& db, const ReportItem& item) {
    const auto& r = item.result;
    std::string out;
    if (item.dose) {
        const auto& d = *item.dose;
        out += field("dosed", fmt::format("{} {:.4g} mg/L ({:.4g} mmol/kgw){}", d.reagent, d.mg_per_l, d.mol_per_kgw * 1000.0,
                                          d.found_by_target
                                              ? ", found for the target (reached " + text::trimmed(d.target_reached, 4) + ")"
                                              : ""));
    }
    for (const auto& t : r.transfers) {
        const double mg_per_l = transfer_mg_per_l(db, r, t);
        const std::string state = t.headspace ? fmt::format("; closed headspace, {:.4g} mmol/kgw left in the gas",
                                                            t.gas_moles_per_kgw * 1000.0)
                                  : t.exhausted ? "; all of it dissolved"
                                  : t.blocked   ? "; stopped short of its target by the way it may move"
                                  : t.at_target ? ""
                                                : "";
        const std::string name = t.is_gas ? chem::pretty(t.phase) : t.phase;
        const std::string verb = t.moles > 0 ? (t.is_gas ? "dissolved" : "dissolved")
                                             : (t.is_gas ? "left the water" : "deposited");
        out += field(t.moles > 0 ? "into the water" : "out of the water",
                     fmt::format("{} {} mg/L ({:.4g} mmol/kgw) {}{}", name, mg(mg_per_l), std::abs(t.moles) * 1000.0, verb, state));
    }
    return out.empty() ? out : heading("What this step did") + out;
}

std::string header(std::size_t n, const ReportItem& item) {
    const auto& r = item.result;
    const std::string what = item.kind == "water" ? fmt::format("{}. {}: the water as given", n, r.label)
                                                  : fmt::format("{}. {}: after the {} step", n, r.label, item.kind);
    const std::string right = fmt::format("{:.1f} °C  pH {:.2f}", r.temperature_c, r.ph);
    const std::string line = rule('=');
    const std::size_t used = width(what) + width(right) + 2;
    return "\n" + line + " " + what + std::string(used < page_width ? page_width - used : 1, ' ') + right + "\n" + line;
}

}  // namespace

double transfer_mg_per_l(const thermo::Database& db, const equilibrium::SpeciationResult& r,
                         const equilibrium::PhaseTransfer& t) {
    double molar_mass = 0.0;
    if (t.is_gas) {
        if (auto g = db.find_gas(t.phase)) molar_mass = db.gases()[*g].formula.molar_mass();
    } else if (auto m = db.find_mineral(t.phase)) {
        molar_mass = db.minerals()[*m].formula.molar_mass();
    }
    return t.moles * molar_mass * 1000.0 * r.kg_water_per_litre;
}

std::vector<ReportItem> items_of(const std::vector<equilibrium::SpeciationResult>& results) {
    std::vector<ReportItem> items;
    for (const auto& r : results) items.push_back(ReportItem{"water", r, std::nullopt, std::nullopt, std::nullopt, {}});
    return items;
}

std::string text_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items,
                        const std::vector<SweepReport>& sweeps, const std::vector<electro::CellResult>& cells,
                        const std::vector<DiagramReport>& diagrams) {
    std::string out;
    out += fmt::format("deltag {}: {}\n", ctx.version, ctx.title.empty() ? ctx.case_path : ctx.title);
    out += fmt::format("case {}; database {}\n", ctx.case_path, ctx.database);
    if (!items.empty()) out += "SM: Standard Methods for the Examination of Water and Wastewater\n";
    std::size_t number = 0;
    for (const auto& item : items) {
        const auto& r = item.result;
        const auto f = process::water_figures(db, r, item.indices ? &*item.indices : nullptr, &item.measured);
        out += header(++number, item);
        out += step_block(db, item);
        out += verdict_block(db, item);
        out += indices_block(item, f);
        out += glance_block(r, f);
        out += "\n  ---- the detail ----\n";
        out += where_block(db, r);
        out += species_block(db, r);
        out += minerals_block(db, r);
        out += couples_block(db, r);
        out += totals_block(r);
        out += heading("How it was solved");
        out += field("activity model", std::string(activity::model_name(r.activity_model)));
        out += field("solver", r.summary.brief());
        if (ctx.verbose) out += para(r.summary.full(), 6);
        std::vector<std::string> notes = r.warnings;
        for (const auto& note : f.notes) notes.push_back(note);
        if (!notes.empty()) {
            out += heading("Check before use");
            for (const auto& w : notes) out += para(w, 4, "- ");
        }
    }
    for (const auto& sw : sweeps) {
        out += "\n" + rule('=');
        out += fmt::format("Sweep '{}': {} points of {}\n", sw.sweep.label, sw.sweep.x.size(), sw.sweep.x_label);
        out += rule('=');
        out += "  " + pad(sw.sweep.x_label, 30);
        // Each column as wide as its whole header (never cut), at least 16.
        std::vector<std::size_t> widths;
        for (const auto& [name, v] : sw.sweep.series) widths.push_back(std::max<std::size_t>(16, width(name) + 2));
        std::size_t col = 0;
        for (const auto& [name, v] : sw.sweep.series) out += std::string(widths[col++] - width(name), ' ') + name;
        out += "\n";
        for (std::size_t i = 0; i < sw.sweep.x.size(); ++i) {
            out += "  " + pad(fmt::format("{:.4g}", sw.sweep.x[i]), 30);
            col = 0;
            for (const auto& [name, v] : sw.sweep.series)
                out += std::isfinite(v[i]) ? fmt::format("{:>{}.4f}", v[i], widths[col++])
                                           : fmt::format("{:>{}}", "n/a", widths[col++]);
            out += "\n";
        }
        if (!sw.sweep.notes.empty()) {
            out += "  n/a: no value at that point:\n";
            for (const auto& n : sw.sweep.notes) out += "  - " + n + "\n";
        }
        if (!sw.csv_path.empty()) out += "  table written to " + sw.csv_path + "\n";
        if (!sw.svg_path.empty()) out += "  plot written to " + sw.svg_path + "\n";
    }
    for (const auto& c : cells) out += "\n" + rule('=') + cell_text(c);
    for (const auto& d : diagrams) {
        out += "\n" + rule('=') + fmt::format("Diagram '{}'\n", d.label) + rule('=');
        if (!d.svg_path.empty()) out += "  picture written to " + d.svg_path + "\n";
        if (!d.csv_path.empty()) out += "  boundary lines written to " + d.csv_path + "\n";
        for (const auto& w : d.warnings) out += "  - " + w + "\n";
    }
    out += "\n" + std::string(caution_text()) + "\n";
    if (!cells.empty() || !diagrams.empty()) out += std::string(electro_caution_text()) + "\n";
    return text::drop_negative_zeros(out);
}

std::string_view electro_caution_text() {
    return "Caution: corrosion and cathodic-protection decisions follow the governing standards (for example the "
           "national cathodic-protection and potable-plumbing codes) and licensed practice; a thermodynamic cell "
           "potential says which way a couple can run, not how fast it corrodes.";
}

std::string cell_text(const electro::CellResult& c) {
    std::string out;
    out += fmt::format("Cell '{}' at {:.1f} °C\n", c.label.empty() ? std::string("cell") : c.label, c.temperature_c);
    out += rule('=');
    // Each electrode: its half-reaction, E° and E, and every activity of its Nernst quotient
    // with where it came from.
    for (const auto* e : {&c.cathode_electrode, &c.anode_electrode}) {
        const bool cathode = e == &c.cathode_electrode;
        out += fmt::format("  {:<10}{}\n", cathode ? "cathode" : "anode", cathode ? c.cathode : c.anode);
        out += fmt::format("  {:<10}E° = {:+.4f} V from {}\n", "", e->e0_v, cathode ? c.cathode_origin : c.anode_origin);
        out += fmt::format("  {:<10}E  = {:+.4f} V at {:.1f} °C\n", "", e->e_v, e->temperature_c);
        // Where the activities came from, wrapped to the report's width.
        const auto lines = text::wrap("activities: " + e->convention(), 66);
        for (std::size_t i = 0; i < lines.size(); ++i) out += std::string(i ? 16 : 12, ' ') + lines[i] + "\n";
        std::size_t width = 0;
        for (const auto& q : e->quotient) width = std::max(width, text::code_points(q.species));
        for (const auto& q : e->quotient)
            out += fmt::format("  {:<12}a({}){} = {:<10.3g} {}\n", "", q.species,
                               std::string(width - text::code_points(q.species), ' '), q.activity, q.detail);
    }
    out += fmt::format("  {:<24}{:g}\n", "electrons n", c.n);
    out += fmt::format("  {:<24}{:+.4f} V     ΔG° = -nFE° = {:+.2f} kJ/mol     log K = {:.3f}\n", "E° cell", c.e0_v,
                       c.delta_g0_kj_per_mol, c.log_k);
    out += fmt::format("  {:<24}{:+.4f} V     ΔG  = -nFE  = {:+.2f} kJ/mol\n", "E cell (at activities)", c.e_v,
                       c.delta_g_kj_per_mol);
    out += "  " + std::string(c.spontaneous ? "runs as written: reduction at the cathode, oxidation at the anode (E > 0)"
                                            : "runs the other way: the written anode is reduced (E < 0)") + "\n";
    for (const auto& w : c.warnings) out += "  - " + w + "\n";
    return text::drop_negative_zeros(out);
}

std::string text_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results) {
    return text_report(db, ctx, items_of(results));
}

}  // namespace deltag::io
