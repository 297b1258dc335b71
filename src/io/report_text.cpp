// The text report: a summary block first, then species grouped by component with the share
// of the component each one holds, then saturation with verdicts, warnings and the caution.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "deltag/constants.hpp"
#include "deltag/figures.hpp"
#include "deltag/report.hpp"
#include "io/text_format.hpp"

namespace deltag::io {

std::string_view caution_text() {
    return "Caution: these are equilibrium calculations from the data given, not a design. Decisions on "
           "drinking water, chemical dosing, pressure equipment or cathodic protection follow local codes "
           "and rest with licensed engineers.";
}

namespace {

std::string rule(char c = '-', std::size_t n = 78) { return std::string(n, c) + "\n"; }

// Display width of UTF-8 text (code points; all our symbols are one column wide).
std::size_t width(std::string_view s) {
    std::size_t n = 0;
    for (unsigned char c : s)
        if ((c & 0xC0) != 0x80) ++n;
    return n;
}

std::string pad(std::string_view s, std::size_t w) {
    std::string out(s);
    for (std::size_t n = width(s); n < w; ++n) out += ' ';
    return out;
}

std::string sci(double v) { return fmt::format("{:.3e}", v); }

std::string summary_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::string out;
    auto line = [&](std::string_view k, const std::string& v) { out += "  " + pad(k, 22) + v + "\n"; };
    line("temperature", fmt::format("{:.1f} °C", r.temperature_c));
    line("pH", fmt::format("{:.3f}", r.ph));
    if (r.pe) {
        const double slope = constants::nernst_slope_v(r.temperature_c + constants::zero_celsius_k);
        line("pe / Eh", fmt::format("{:.2f} / {:.3f} V vs SHE", *r.pe, *r.pe * slope));
    } else {
        line("pe / Eh", "not given (redox species left out)");
    }
    line("ionic strength", fmt::format("{:.4g} mol/kgw", r.ionic_strength));
    line("water activity", fmt::format("{:.5f}", r.water_activity));
    line("total alkalinity", fmt::format("{:.4g} meq/kgw", r.alkalinity_eq * 1000.0));
    line("charge balance", fmt::format("{:+.2f} % (cations {:.4g}, anions {:.4g} meq/kgw; Standard Methods 1030 E)",
                                       r.charge_balance_error_percent, r.cations_meq, r.anions_meq));
    if (r.charge_balance_adjustment) {
        const auto& a = *r.charge_balance_adjustment;
        const std::string unit = a.unit + (a.as.empty() ? "" : " as " + a.as);
        line("balanced on " + a.analyte,
             fmt::format("{} adjusted from {:.4g} to {:.4g} {} ({:.4g} to {:.4g} mmol/kgw) to close the balance; "
                         "as given the balance was {:+.2f} %, {} the Standard Methods 1030 E acceptance",
                         a.analyte, a.given, a.adjusted, unit, a.given_mmol_per_kgw, a.adjusted_mmol_per_kgw,
                         a.error_percent_as_given, a.within_acceptance ? "within" : "OUTSIDE"));
    }
    line("activity model", std::string(activity::model_name(r.activity_model)));
    line("solver", r.summary.brief());
    // Verdicts in one line each.
    std::vector<std::string> over, at, under;
    for (const auto& s : r.saturation) {
        if (s.is_gas) continue;
        const std::string item = fmt::format("{} ({:+.2f})", s.phase, s.si);
        switch (s.verdict) {
            case equilibrium::Verdict::precipitation_favoured: over.push_back(item); break;
            case equilibrium::Verdict::at_equilibrium: at.push_back(item); break;
            case equilibrium::Verdict::dissolution_favoured: under.push_back(item); break;
        }
    }
    auto join = [](const std::vector<std::string>& v) {
        if (v.empty()) return std::string("none");
        std::string s;
        for (const auto& x : v) s += (s.empty() ? "" : ", ") + x;
        return s;
    };
    line("supersaturated", join(over));
    line("at equilibrium", join(at) + fmt::format("  (|SI| <= {})", equilibrium::default_si_tolerance));
    line("undersaturated", under.empty() ? std::string("none") : fmt::format("{} phases", under.size()));
    (void)db;
    return out;
}

std::string totals_block(const equilibrium::SpeciationResult& r) {
    std::string out = "Totals\n";
    out += fmt::format("  {:<10}{:>14}{:>14}\n", "element", "mol/kgw", "mg/kgw");
    for (const auto& [el, m] : r.element_totals) {
        const double mg = m * chem::atomic_weight(el).value_or(0.0) * 1000.0;
        out += fmt::format("  {:<10}{:>14}{:>14.4g}\n", el, sci(m), mg);
    }
    return out;
}

std::string species_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    std::string out = "Species, grouped by component (share = moles of the component in the species / total)\n";
    out += "  " + pad("species", 18) + fmt::format("{:>14}{:>14}{:>10}{:>10}\n", "mol/kgw", "activity", "log γ", "share %");
    for (std::size_t j = 0; j < db.component_count(); ++j) {
        if (!r.component_present[j]) continue;
        const thermo::Species& comp = db.species()[j];
        if (comp.role != thermo::ComponentRole::ordinary) continue;
        const double total = r.component_totals[j];
        if (!(total > 0)) continue;
        out += fmt::format("  {} (total {} mol/kgw)\n", chem::pretty(comp.name), sci(total));
        std::vector<std::pair<double, const equilibrium::SpeciesResult*>> rows;
        for (const auto& s : r.species) {
            double nu = 0.0;
            for (const auto& [k, v] : db.species()[s.species].formation)
                if (k == j) nu = v;
            if (nu <= 0) continue;
            rows.emplace_back(100.0 * nu * s.molality / total, &s);
        }
        std::sort(rows.begin(), rows.end(), [](const auto& a, const auto& b) { return a.first > b.first; });
        for (const auto& [share, s] : rows) {
            if (share < 0.01) continue;
            out += "    " + pad(chem::pretty(s->name), 16) +
                   fmt::format("{:>14}{:>14}{:>10.4f}{:>10.2f}\n", sci(s->molality), sci(s->activity), s->log_gamma, share);
        }
    }
    // H+ and OH- are not shares of a component: list them apart.
    out += "  water and its ions\n";
    for (const char* n : {"H+", "OH-"})
        if (const auto* s = r.find(n))
            out += "    " + pad(chem::pretty(s->name), 16) +
                   fmt::format("{:>14}{:>14}{:>10.4f}{:>10}\n", sci(s->molality), sci(s->activity), s->log_gamma, "");
    return out;
}

std::string saturation_block(const equilibrium::SpeciationResult& r) {
    std::string out = fmt::format("Saturation at {:.1f} °C (ΔG of dissolution = RT ln(IAP/K); positive: precipitation favoured)\n",
                                  r.temperature_c);
    out += "  " + pad("phase", 20) + fmt::format("{:>9}{:>10}{:>10}{:>12}  {}\n", "SI", "log IAP", "log K", "ΔG kJ/mol", "verdict");
    std::vector<const equilibrium::SaturationResult*> minerals, gases;
    for (const auto& s : r.saturation) (s.is_gas ? gases : minerals).push_back(&s);
    std::sort(minerals.begin(), minerals.end(), [](auto* a, auto* b) { return a->si > b->si; });
    for (const auto* s : minerals)
        out += "  " + pad(s->phase, 20) +
               fmt::format("{:>+9.3f}{:>10.3f}{:>10.3f}{:>+12.2f}  {}\n", s->si, s->log_iap, s->log_k,
                           s->delta_g_kj_per_mol, equilibrium::verdict_text(s->verdict));
    if (!gases.empty()) {
        out += "  gas partial pressures in equilibrium with the water\n";
        for (const auto* g : gases)
            out += "    " + pad(chem::pretty(g->phase), 18) + fmt::format("log p = {:+.3f} (p = {:.3e} atm)\n", g->si, std::pow(10.0, g->si));
    }
    return out;
}

// The figures of a lab sheet, one line each (methods named in src/process/figures.cpp).
std::string figures_block(const thermo::Database& db, const equilibrium::SpeciationResult& r,
                          const process::Indices* ix) {
    const auto f = process::water_figures(db, r, ix);
    std::string out;
    out += "  " + pad("hardness as CaCO3", 22) +
           fmt::format("{:.1f} mg/L: Ca {:.1f}, Mg {:.1f}; carbonate {:.1f}, non-carbonate {:.1f} (SM 2340 B)\n",
                       f.hardness_total, f.hardness_calcium, f.hardness_magnesium, f.hardness_carbonate,
                       f.hardness_non_carbonate);
    out += "  " + pad("alkalinity as CaCO3", 22) +
           fmt::format("M {:.1f} mg/L (to pH 4.5), P {:.1f} mg/L (to pH 8.3){} (SM 2320)\n", f.alkalinity_total_m,
                       f.alkalinity_phenolphthalein_p,
                       f.acidity_to_ph_8_3 > 0 ? fmt::format("; acidity to pH 8.3 {:.1f}", f.acidity_to_ph_8_3) : "");
    out += "  " + pad("dissolved solids", 22) +
           fmt::format("{:.0f} mg/L calculated, carbonate as CO3 (SM 1030 E)\n", f.tds_calculated_mg_per_l);
    out += "  " + pad("conductance at 25 °C", 22) +
           fmt::format("{:.4g} µS/cm calculated (SM 2510, Onsager){}\n", f.specific_conductance_us_per_cm,
                       f.conductance_charge_left_out_percent >= 0.05
                           ? fmt::format("; ion pairs with {:.1f} % of the charge left out",
                                         f.conductance_charge_left_out_percent)
                           : "");
    auto index_line = [&](std::string_view name, bool ok, double v, const std::string& reading, const std::string& why,
                          std::string_view extra) {
        out += "  " + pad(name, 22) +
               (ok ? fmt::format("{:.2f}: {}{}\n", v, reading, extra) : "unavailable, because " + why + "\n");
    };
    index_line("Larson-Skold", f.larson_skold_available, f.larson_skold, f.larson_skold_reading,
               f.larson_skold_why_not, "");
    index_line("Puckorius", f.puckorius_available, f.puckorius, f.puckorius_reading, f.puckorius_why_not,
               f.puckorius_available ? fmt::format(" (pHeq {:.2f})", f.puckorius_ph_eq) : "");
    index_line("Aggressive Index", f.aggressive_index_available, f.aggressive_index, f.aggressive_index_reading,
               f.aggressive_index_why_not, " (AWWA C400)");
    for (const auto& n : f.notes) out += "  " + pad("note", 22) + n + "\n";
    return out;
}

std::string indices_block(const process::Indices& ix) {
    std::string out;
    if (ix.available) {
        out += "  " + pad("Langelier index", 22) +
               fmt::format("{:+.2f} (pHs {:.2f} at Ca {:.4g} mmol/kgw and carbonate alkalinity {:.4g} meq/kgw; "
                           "Standard Methods 2330, pHs from the speciation)\n",
                           ix.langelier, ix.ph_s, ix.calcium_mol_per_kgw * 1000.0, ix.carbonate_alkalinity_eq * 1000.0);
        out += "  " + pad("Ryznar index", 22) + fmt::format("{:.2f}\n", ix.ryznar);
    } else {
        out += "  " + pad("Langelier, Ryznar", 22) + "unavailable, because " + ix.why_not + "\n";
        if (ix.formula_available)
            out += "  " + pad("LSI, 2330 B formula", 22) +
                   fmt::format("{:+.2f} (pHs {:.2f} with all the carbonate alkalinity as bicarbonate; a rough guide "
                               "only where pHs nears pK2)\n",
                               ix.formula_langelier, ix.formula_ph_s);
    }
    if (ix.ccpp_available)
        out += "  " + pad("CCPP", 22) +
               fmt::format("{:+.2f} mg/L as CaCO3 ({}; closed system)\n", ix.ccpp_mg_per_l,
                           ix.ccpp_mg_per_l > 0   ? "would precipitate"
                           : ix.ccpp_mg_per_l < 0 ? "would dissolve"
                                                  : "at equilibrium");
    else
        out += "  " + pad("CCPP", 22) + "unavailable, because " + ix.ccpp_why_not + "\n";
    return out;
}

// The water's Eh on the usual scales, and the Eh each redox couple present implies.
std::string redox_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    const auto couples = electro::couple_potentials(db, r);
    if (!r.pe && couples.empty()) return "";
    std::string out = "Redox\n";
    if (r.pe) {
        const double eh = electro::eh_from_pe(*r.pe, r.temperature_c);
        const SourceLocation here{"report", 0, 0};
        out += fmt::format("  Eh {:+.3f} V vs SHE = {:+.3f} V vs SCE = {:+.3f} V vs Ag/AgCl(sat KCl) = {:+.3f} V vs "
                           "Cu/CuSO4(sat) at {:.1f} °C (pe {:.2f})\n",
                           eh, electro::convert_v(eh, "SHE", "SCE", r.temperature_c, here),
                           electro::convert_v(eh, "SHE", "Ag/AgCl(sat KCl)", r.temperature_c, here),
                           electro::convert_v(eh, "SHE", "Cu/CuSO4(sat)", r.temperature_c, here), r.temperature_c, *r.pe);
    }
    if (!couples.empty()) {
        out += "  Eh each couple implies (equal values: the couples are in equilibrium with each other)\n";
        out += "  " + pad("couple", 24) + fmt::format("{:>12}{:>10}\n", "Eh (V)", "pe");
        for (const auto& c : couples)
        {
            const auto slash = c.couple.find('/');
            const std::string shown = slash == std::string::npos
                                          ? chem::pretty(c.couple)
                                          : chem::pretty(c.couple.substr(0, slash)) + "/" + chem::pretty(c.couple.substr(slash + 1));
            out += "  " + pad(shown, 24) + fmt::format("{:>+12.3f}{:>10.2f}\n", c.eh_v, c.pe);
        }
    }
    return out;
}

std::string transfers_block(const thermo::Database& db, const equilibrium::SpeciationResult& r) {
    if (r.transfers.empty()) return "";
    std::string out = "Transfers (positive: into the water)\n";
    out += "  " + pad("phase", 20) + fmt::format("{:>14}{:>12}  {}\n", "mmol/kgw", "mg/L", "state");
    for (const auto& t : r.transfers) {
        const double mg_per_l = transfer_mg_per_l(db, r, t);
        const std::string state = t.headspace ? fmt::format("closed headspace, {:.4g} mmol/kgw left in the gas", t.gas_moles_per_kgw * 1000.0)
                                  : t.exhausted ? "exhausted"
                                  : t.blocked   ? "held back by its allowed direction"
                                  : t.at_target ? "at its target"
                                                : "";
        out += "  " + pad(t.is_gas ? chem::pretty(t.phase) : t.phase, 20) +
               fmt::format("{:>+14.4f}{:>+12.2f}  {}\n", t.moles * 1000.0, mg_per_l, state);
    }
    return out;
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
    for (const auto& r : results) items.push_back(ReportItem{"water", r, std::nullopt, std::nullopt});
    return items;
}

std::string text_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items,
                        const std::vector<SweepReport>& sweeps, const std::vector<electro::CellResult>& cells,
                        const std::vector<DiagramReport>& diagrams) {
    std::string out;
    out += fmt::format("deltag {}: {}\n", ctx.version, ctx.title.empty() ? ctx.case_path : ctx.title);
    out += fmt::format("case {}; database {}\n", ctx.case_path, ctx.database);
    for (const auto& item : items) {
        const auto& r = item.result;
        out += "\n" + rule('=');
        if (item.kind == "water") out += fmt::format("Water '{}'\n", r.label);
        else out += fmt::format("Step '{}' ({})\n", r.label, item.kind);
        out += rule('=');
        out += summary_block(db, r);
        if (item.indices) out += indices_block(*item.indices);
        out += figures_block(db, r, item.indices ? &*item.indices : nullptr);
        if (item.dose) {
            const auto& d = *item.dose;
            out += "  " + pad("dose", 22) +
                   fmt::format("{} {:.4g} mmol/kgw = {:.4g} mg/L{}\n", d.reagent, d.mol_per_kgw * 1000.0, d.mg_per_l,
                               d.found_by_target ? fmt::format(" (found for the target; reached {})", text::trimmed(d.target_reached, 6)) : "");
        }
        out += "\n";
        const std::string transfers = transfers_block(db, r);
        if (!transfers.empty()) out += transfers + "\n";
        const std::string redox = redox_block(db, r);
        if (!redox.empty()) out += redox + "\n";
        out += totals_block(r) + "\n";
        out += species_block(db, r) + "\n";
        out += saturation_block(r);
        if (ctx.verbose) out += "\nSolver\n" + r.summary.full();
        if (!r.warnings.empty()) {
            out += "\nWarnings\n";
            for (const auto& w : r.warnings) out += "  - " + w + "\n";
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
