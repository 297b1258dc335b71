// JSON (interface contract keys) and CSV reports.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "deltag/figures.hpp"
#include "deltag/outlook.hpp"
#include "deltag/plot.hpp"
#include "deltag/report.hpp"
#include "io/text_format.hpp"

namespace deltag::io {

namespace {

using nlohmann::ordered_json;

double finite(double v, std::string_view what) {
    if (!std::isfinite(v)) throw std::logic_error("internal error: " + std::string(what) + " is not finite");
    return v;
}

// The electrons of a cell reaction: a whole number in practice (the lcm of the two
// half-reactions), so JSON carries it as an integer (2, not 2.0); a fractional count, which
// only odd database entries could give, stays a number.
ordered_json electron_count(double n) {
    const double r = std::round(finite(n, "n"));
    if (std::abs(n - r) < 1e-9) return ordered_json(static_cast<long long>(r));
    return ordered_json(n);
}

// -0.0 (from negating or rounding a zero) is written as 0: JSON numbers are printed in full
// (shortest round trip), so -0.0 is the only way a zero could show a sign.
void unsigned_zeros(ordered_json& j) {
    if (j.is_number_float()) {
        if (j.get<double>() == 0.0) j = 0.0;
    } else if (j.is_structured()) {
        for (auto& el : j) unsigned_zeros(el);
    }
}

std::string dumped(ordered_json& j) {
    unsigned_zeros(j);
    return j.dump(2) + "\n";
}

ordered_json result_json(const thermo::Database& db, const ReportItem& item) {
    const equilibrium::SpeciationResult& r = item.result;
    ordered_json j;
    j["label"] = r.label;
    j["kind"] = item.kind;
    j["temperature_c"] = finite(r.temperature_c, "temperature");
    j["pH"] = finite(r.ph, "pH");
    j["pe"] = r.pe ? ordered_json(finite(*r.pe, "pe")) : ordered_json(nullptr);
    j["ionic_strength"] = finite(r.ionic_strength, "ionic strength");
    j["water_activity"] = finite(r.water_activity, "water activity");
    j["alkalinity_eq_per_kgw"] = finite(r.alkalinity_eq, "alkalinity");
    j["charge_balance_error_percent"] = finite(r.charge_balance_error_percent, "charge-balance error");
    j["cations_meq_per_kgw"] = finite(r.cations_meq, "cation sum");
    j["anions_meq_per_kgw"] = finite(r.anions_meq, "anion sum");
    if (r.charge_balance_adjustment) {
        const auto& a = *r.charge_balance_adjustment;
        j["charge_balance_adjustment"] = {{"analyte", a.analyte},
                                          {"unit", a.unit},
                                          {"as", a.as.empty() ? ordered_json(nullptr) : ordered_json(a.as)},
                                          {"given", finite(a.given, "given analyte")},
                                          {"adjusted", finite(a.adjusted, "adjusted analyte")},
                                          {"given_mmol_per_kgw", finite(a.given_mmol_per_kgw, "given analyte")},
                                          {"adjusted_mmol_per_kgw", finite(a.adjusted_mmol_per_kgw, "adjusted analyte")},
                                          {"change_meq_per_kgw", finite(a.change_meq_per_kgw, "charge change")},
                                          {"error_percent_as_given", finite(a.error_percent_as_given, "balance as given")},
                                          {"within_standard_methods_1030e", a.within_acceptance}};
    } else {
        j["charge_balance_adjustment"] = nullptr;
    }
    j["activity_model"] = std::string(activity::model_name(r.activity_model));
    ordered_json totals = ordered_json::object();
    for (const auto& [el, m] : r.element_totals) totals[el] = finite(m, "total of " + el);
    j["totals"] = totals;
    ordered_json species = ordered_json::array();
    for (const auto& s : r.species)
        species.push_back({{"name", s.name},
                           {"molality", finite(s.molality, s.name)},
                           {"activity", finite(s.activity, s.name)},
                           {"log_gamma", finite(s.log_gamma, s.name)}});
    j["species"] = species;
    ordered_json sat = ordered_json::array(), gases = ordered_json::array();
    for (const auto& s : r.saturation) {
        if (s.is_gas) {
            gases.push_back({{"name", s.phase}, {"log_partial_pressure_atm", finite(s.si, s.phase)}});
            continue;
        }
        sat.push_back({{"phase", s.phase},
                       {"si", finite(s.si, s.phase)},
                       {"log_iap", finite(s.log_iap, s.phase)},
                       {"log_k", finite(s.log_k, s.phase)},
                       {"delta_g_kj_per_mol", finite(s.delta_g_kj_per_mol, s.phase)},
                       {"verdict", std::string(equilibrium::verdict_text(s.verdict))}});
    }
    j["saturation"] = sat;
    ordered_json transfers = ordered_json::array();
    for (const auto& t : r.transfers) {
        transfers.push_back({{"phase", t.phase},
                             {"moles", finite(t.moles, t.phase)},
                             {"mg_per_l", finite(transfer_mg_per_l(db, r, t), t.phase)},
                             {"at_target", t.at_target},
                             {"exhausted", t.exhausted},
                             {"blocked", t.blocked},
                             {"headspace", t.headspace},
                             {"gas_moles_per_kgw", finite(t.gas_moles_per_kgw, t.phase)}});
    }
    j["transfers"] = transfers;
    j["gases"] = gases;
    {
        ordered_json redox;
        if (r.pe) {
            const double eh = electro::eh_from_pe(*r.pe, r.temperature_c);
            redox["eh_v"] = finite(eh, "Eh");
            ordered_json scales = ordered_json::object();
            for (const auto& ref : electro::reference_electrodes())
                scales[ref.name] = finite(electro::convert_v(eh, "SHE", ref.name, r.temperature_c, SourceLocation{"report", 0, 0}), "Eh");
            redox["eh_v_vs"] = scales;
        }
        ordered_json couples = ordered_json::array();
        for (const auto& c : electro::couple_potentials(db, r))
            couples.push_back({{"couple", c.couple}, {"eh_v", finite(c.eh_v, c.couple)}, {"pe", finite(c.pe, c.couple)}});
        redox["couples"] = couples;
        j["redox"] = redox;
    }
    if (item.indices) {
        // Always an object; an index without an answer is null with its reason beside it.
        const auto& ix = *item.indices;
        auto value = [](bool ok, double v, std::string_view what) {
            return ok ? ordered_json(finite(v, what)) : ordered_json(nullptr);
        };
        j["indices"] = {{"langelier", value(ix.available, ix.langelier, "Langelier index")},
                        {"ph_s", value(ix.available, ix.ph_s, "pHs")},
                        {"ryznar", value(ix.available, ix.ryznar, "Ryznar index")},
                        {"ccpp_mg_per_l_as_caco3", value(ix.ccpp_available, ix.ccpp_mg_per_l, "CCPP")},
                        {"langelier_available", ix.available},
                        {"langelier_unavailable_because", ix.available ? ordered_json(nullptr) : ordered_json(ix.why_not)},
                        {"ccpp_available", ix.ccpp_available},
                        {"ccpp_unavailable_because",
                         ix.ccpp_available ? ordered_json(nullptr) : ordered_json(ix.ccpp_why_not)},
                        {"langelier_formula", value(ix.formula_available, ix.formula_langelier, "formula LSI")},
                        {"ph_s_formula", value(ix.formula_available, ix.formula_ph_s, "formula pHs")},
                        {"ph_s_calcium_mol_per_kgw", value(ix.available, ix.calcium_mol_per_kgw, "pHs calcium")},
                        {"ph_s_carbonate_alkalinity_eq_per_kgw",
                         value(ix.available, ix.carbonate_alkalinity_eq, "pHs carbonate alkalinity")},
                        {"langelier_reading",
                         ix.available ? ordered_json(process::langelier_reading(ix.langelier)) : ordered_json(nullptr)},
                        {"ryznar_reading",
                         ix.available ? ordered_json(process::ryznar_reading(ix.ryznar)) : ordered_json(nullptr)}};
    } else {
        j["indices"] = nullptr;
    }
    {
        // The figures of a lab sheet (src/process/figures.cpp names each method).
        const auto f = process::water_figures(db, r, item.indices ? &*item.indices : nullptr, &item.measured);
        auto index = [](bool ok, double v, const std::string& reading, const std::string& why, std::string_view what) {
            ordered_json o;
            o["value"] = ok ? ordered_json(finite(v, what)) : ordered_json(nullptr);
            o["reading"] = ok ? ordered_json(reading) : ordered_json(nullptr);
            o["unavailable_because"] = ok ? ordered_json(nullptr) : ordered_json(why);
            return o;
        };
        ordered_json fig;
        fig["hardness_mg_per_l_as_caco3"] = {{"total", finite(f.hardness_total, "total hardness")},
                                             {"calcium", finite(f.hardness_calcium, "calcium hardness")},
                                             {"magnesium", finite(f.hardness_magnesium, "magnesium hardness")},
                                             {"carbonate", finite(f.hardness_carbonate, "carbonate hardness")},
                                             {"non_carbonate", finite(f.hardness_non_carbonate, "non-carbonate hardness")}};
        fig["calcium_mg_per_l"] = finite(f.calcium_mg_per_l, "calcium");
        fig["magnesium_mg_per_l"] = finite(f.magnesium_mg_per_l, "magnesium");
        fig["alkalinity_mg_per_l_as_caco3"] = {{"total_m", finite(f.alkalinity_total_m, "M alkalinity")},
                                               {"phenolphthalein_p", finite(f.alkalinity_phenolphthalein_p, "P alkalinity")}};
        fig["acidity_to_ph_8_3_mg_per_l_as_caco3"] = finite(f.acidity_to_ph_8_3, "acidity to pH 8.3");
        fig["carbonate_alkalinity_meq_per_l"] = finite(f.carbonate_alkalinity_meq_per_l, "carbonate alkalinity");
        fig["tds_calculated_mg_per_l"] = finite(f.tds_calculated_mg_per_l, "calculated dissolved solids");
        fig["specific_conductance_25c_us_per_cm"] = finite(f.specific_conductance_us_per_cm, "specific conductance");
        fig["conductance_charge_left_out_percent"] =
            finite(f.conductance_charge_left_out_percent, "conductance charge left out");
        // A measured value beside the calculated one; null when the case gave none.
        auto beside = [](const process::MeasuredBeside& b, std::string_view what) {
            if (!b.given) return ordered_json(nullptr);
            ordered_json o;
            o["measured"] = finite(b.measured, what);
            o["calculated"] = finite(b.calculated, what);
            o["measured_to_calculated"] = b.ratio_available ? ordered_json(finite(b.ratio, what)) : ordered_json(nullptr);
            return o;
        };
        fig["tds_measured_mg_per_l"] = beside(f.tds_measured, "measured dissolved solids");
        fig["specific_conductance_25c_measured_us_per_cm"] = beside(f.conductance_measured, "measured conductance");
        auto ions = [](const std::vector<process::IonFigure>& list) {
            ordered_json arr = ordered_json::array();
            for (const auto& i : list)
                arr.push_back({{"ion", i.ion},
                               {"charge", i.charge},
                               {"mg_per_l", finite(i.mg_per_l, i.ion)},
                               {"meq_per_l", finite(i.meq_per_l, i.ion)}});
            return arr;
        };
        fig["ions"] = {{"cations", ions(f.cations)},
                       {"anions", ions(f.anions)},
                       {"cations_meq_per_l", finite(f.cations_meq_per_l, "cation sum")},
                       {"anions_meq_per_l", finite(f.anions_meq_per_l, "anion sum")},
                       {"balance_error_percent", finite(f.ion_balance_error_percent, "ion balance")},
                       {"balance_within_standard_methods_1030e", f.ion_balance_acceptable}};
        ordered_json checks = ordered_json::array();
        for (const auto& c : f.checks)
            checks.push_back({{"ratio", c.ratio_name},
                              {"value", finite(c.ratio, c.ratio_name)},
                              {"acceptable_from", c.low},
                              {"acceptable_to", c.high},
                              {"within", c.within}});
        fig["standard_methods_1030e_checks"] = checks;
        fig["larson_skold"] = index(f.larson_skold_available, f.larson_skold, f.larson_skold_reading,
                                    f.larson_skold_why_not, "Larson-Skold index");
        fig["puckorius"] = index(f.puckorius_available, f.puckorius, f.puckorius_reading, f.puckorius_why_not,
                                 "Puckorius index");
        fig["puckorius"]["ph_eq"] =
            f.puckorius_available ? ordered_json(finite(f.puckorius_ph_eq, "Puckorius pHeq")) : ordered_json(nullptr);
        fig["aggressive_index"] = index(f.aggressive_index_available, f.aggressive_index, f.aggressive_index_reading,
                                        f.aggressive_index_why_not, "Aggressive Index");
        fig["notes"] = f.notes;
        j["figures"] = fig;
    }
    if (item.dose) {
        j["dose"] = {{"reagent", item.dose->reagent},
                     {"mol_per_kgw", finite(item.dose->mol_per_kgw, "dose")},
                     {"mg_per_l", finite(item.dose->mg_per_l, "dose")},
                     {"found_by_target", item.dose->found_by_target}};
        if (item.dose->found_by_target) j["dose"]["target_reached"] = finite(item.dose->target_reached, "dose target");
    }
    {
        // What the water will do, mineral by mineral (the report's first section).
        const process::Outlook o = item.outlook ? *item.outlook : process::saturation_outlook(db, r);
        ordered_json minerals = ordered_json::array();
        for (const auto& m : o.minerals)
            minerals.push_back(
                {{"mineral", m.mineral},
                 {"formula", m.formula},
                 {"tendency", std::string(process::tendency_text(m.tendency))},
                 {"si", finite(m.si, "outlook SI")},
                 {"delta_g_kj_per_mol", finite(m.delta_g_kj_per_mol, "outlook ΔG")},
                 {"to_equilibrium_mg_per_l", m.amount_available ? ordered_json(finite(m.mg_per_l, "outlook amount")) : ordered_json(nullptr)},
                 {"to_equilibrium_mmol_per_kgw",
                  m.amount_available ? ordered_json(finite(m.mmol_per_kgw, "outlook amount")) : ordered_json(nullptr)},
                 {"to_equilibrium_unavailable_because", m.amount_available ? ordered_json(nullptr) : ordered_json(m.why_not)},
                 {"note", m.note.empty() ? ordered_json(nullptr) : ordered_json(m.note)}});
        j["outlook"] = {{"si_floor", o.si_floor}, {"minerals", minerals}, {"minerals_below_floor", o.far_below}};
    }
    j["warnings"] = r.warnings;
    j["solver"] = {{"converged", r.summary.converged},
                   {"iterations", r.summary.iterations},
                   {"attempts", r.summary.attempts},
                   {"residual_norm", finite(r.summary.residual_norm, "residual")},
                   {"stop_reason", r.summary.stop_reason},
                   {"method", r.summary.method}};
    return j;
}

}  // namespace

// One side of a cell: its potential and, for every term of its Nernst quotient, the activity
// and where it came from.
ordered_json electrode_json(const std::string& role, const electro::ElectrodePotential& e) {
    ordered_json quotient = ordered_json::array();
    for (const auto& q : e.quotient)
        quotient.push_back({{"species", q.species},
                            {"coefficient", finite(q.coefficient, "coefficient")},
                            {"activity", finite(q.activity, "activity")},
                            {"origin", std::string(electro::activity_origin_name(q.origin))},
                            {"detail", q.detail}});
    ordered_json convention = nullptr;
    if (e.metal_ion_activity)
        convention = {{"metal", e.metal.empty() ? ordered_json(nullptr) : ordered_json(e.metal)},
                      {"activity", finite(*e.metal_ion_activity, "metal-ion activity")},
                      {"customary", std::abs(*e.metal_ion_activity - electro::customary_metal_ion_activity) <=
                                        1e-12 * electro::customary_metal_ion_activity},
                      {"applied_to", e.convention_applied_to}};
    return {{"role", role},
            {"half_reaction", e.half_reaction},
            {"temperature_c", finite(e.temperature_c, "electrode temperature")},
            {"e0_v", finite(e.e0_v, "E°")},
            {"e_v", finite(e.e_v, "E")},
            {"water", e.water.empty() ? ordered_json(nullptr) : ordered_json(e.water)},
            {"activities_from", e.convention()},
            {"metal_ion_convention", convention},
            {"quotient", quotient}};
}

ordered_json cells_array(const std::vector<electro::CellResult>& cells) {
    ordered_json arr = ordered_json::array();
    for (const auto& c : cells)
        arr.push_back({{"label", c.label},
                       {"cathode", c.cathode},
                       {"anode", c.anode},
                       {"temperature_c", finite(c.temperature_c, "cell temperature")},
                       {"n_electrons", electron_count(c.n)},
                       {"e0_v", finite(c.e0_v, "E°")},
                       {"e_v", finite(c.e_v, "E")},
                       {"delta_g0_kj_per_mol", finite(c.delta_g0_kj_per_mol, "ΔG°")},
                       {"delta_g_kj_per_mol", finite(c.delta_g_kj_per_mol, "ΔG")},
                       {"log_k", finite(c.log_k, "log K")},
                       {"spontaneous", c.spontaneous},
                       {"cathode_e0_origin", c.cathode_origin},
                       {"anode_e0_origin", c.anode_origin},
                       {"electrodes", {electrode_json("cathode", c.cathode_electrode), electrode_json("anode", c.anode_electrode)}},
                       {"warnings", c.warnings}});
    return arr;
}

std::string cells_json(const std::vector<electro::CellResult>& cells) {
    ordered_json root;
    root["cells"] = cells_array(cells);
    root["caution"] = std::string(electro_caution_text());
    return dumped(root);
}

std::string json_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items,
                        const std::vector<SweepReport>& sweeps, const std::vector<electro::CellResult>& cells,
                        const std::vector<DiagramReport>& diagrams) {
    ordered_json root;
    root["deltag_version"] = ctx.version;
    root["title"] = ctx.title;
    root["database"] = ctx.database;
    ordered_json arr = ordered_json::array();
    for (const auto& item : items) arr.push_back(result_json(db, item));
    root["results"] = arr;
    root["cells"] = cells_array(cells);
    ordered_json dg = ordered_json::array();
    for (const auto& d : diagrams) dg.push_back({{"label", d.label}, {"svg", d.svg_path}, {"csv", d.csv_path}, {"warnings", d.warnings}});
    root["diagrams"] = dg;
    ordered_json sw = ordered_json::array();
    for (const auto& s : sweeps) {
        ordered_json one;
        one["label"] = s.sweep.label;
        one["x_label"] = s.sweep.x_label;
        ordered_json xs = ordered_json::array();
        for (double x : s.sweep.x) xs.push_back(finite(x, "sweep x"));
        one["x"] = xs;
        ordered_json series = ordered_json::object();
        for (const auto& [name, v] : s.sweep.series) {
            ordered_json ys = ordered_json::array();
            for (double y : v) ys.push_back(std::isfinite(y) ? ordered_json(y) : ordered_json(nullptr));
            series[name] = ys;
        }
        one["series"] = series;
        // null in a series: no value at that point; the notes say which and why.
        one["notes"] = s.sweep.notes;
        one["csv"] = s.csv_path;
        one["svg"] = s.svg_path;
        sw.push_back(one);
    }
    root["sweeps"] = sw;
    root["caution"] = std::string(caution_text());
    // Cells and diagrams feed corrosion and cathodic-protection decisions: their caution too.
    if (!cells.empty() || !diagrams.empty()) root["electrochemistry_caution"] = std::string(electro_caution_text());
    return dumped(root);
}

std::string json_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results) {
    return json_report(db, ctx, items_of(results));
}

std::string csv_report(const thermo::Database& db, const ReportContext& /*ctx*/, const std::vector<ReportItem>& items) {
    // Columns: the summary, the indices, the dose (of a dose step), then every element total
    // and every SI that any result has.
    std::vector<std::string> elements, phases;
    for (const auto& item : items) {
        for (const auto& [el, m] : item.result.element_totals)
            if (std::find(elements.begin(), elements.end(), el) == elements.end()) elements.push_back(el);
        for (const auto& s : item.result.saturation)
            if (!s.is_gas && std::find(phases.begin(), phases.end(), s.phase) == phases.end()) phases.push_back(s.phase);
    }
    auto quote = [](const std::string& s) { return text::csv_field(s); };
    // Numbers at 15 significant digits, shortest form: full precision without binary noise.
    auto num = [](double v, std::string_view what) { return text::csv_number(finite(v, what)); };
    std::string out =
        "label,kind,temperature_c,pH,pe,ionic_strength,alkalinity_eq_per_kgw,charge_balance_error_percent,"
        "langelier,ryznar,ccpp_mg_per_l_as_caco3,dose_reagent,dose_mol_per_kgw,dose_mg_per_l,dose_target_reached";
    for (const auto& el : elements) out += ",total_" + el + "_mol_per_kgw";
    for (const auto& p : phases) out += "," + quote("si_" + p);
    out += "\n";
    for (const auto& item : items) {
        const auto& r = item.result;
        out += quote(r.label) + "," + quote(item.kind);
        // One cell after a comma; appended piece by piece ("," + std::string trips a false
        // -Wrestrict warning of GCC 12).
        auto cell = [&](const std::string& v) {
            out += ',';
            out += v;
        };
        cell(num(r.temperature_c, "temperature"));
        cell(num(r.ph, "pH"));
        cell(r.pe ? num(*r.pe, "pe") : std::string());
        cell(num(r.ionic_strength, "ionic strength"));
        cell(num(r.alkalinity_eq, "alkalinity"));
        cell(num(r.charge_balance_error_percent, "charge balance"));
        // An index without an answer is an empty cell.
        const bool lsi = item.indices && item.indices->available;
        cell(lsi ? num(item.indices->langelier, "Langelier") : std::string());
        cell(lsi ? num(item.indices->ryznar, "Ryznar") : std::string());
        cell(item.indices && item.indices->ccpp_available ? num(item.indices->ccpp_mg_per_l, "CCPP") : std::string());
        // The dose of a dose step, as the JSON's "dose" has it; empty cells for other rows.
        const auto& d = item.dose;
        cell(d ? quote(d->reagent) : std::string());
        cell(d ? num(d->mol_per_kgw, "dose") : std::string());
        cell(d ? num(d->mg_per_l, "dose") : std::string());
        cell(d && d->found_by_target ? num(d->target_reached, "dose target") : std::string());
        for (const auto& el : elements) {
            auto it = r.element_totals.find(el);
            cell(it == r.element_totals.end() ? std::string() : num(it->second, el));
        }
        for (const auto& p : phases) {
            auto it = std::find_if(r.saturation.begin(), r.saturation.end(), [&](const auto& s) { return s.phase == p; });
            cell(it == r.saturation.end() ? std::string() : num(it->si, p));
        }
        out += "\n";
    }
    (void)db;
    return out;
}

std::string csv_report(const thermo::Database& db, const ReportContext& ctx,
                       const std::vector<equilibrium::SpeciationResult>& results) {
    return csv_report(db, ctx, items_of(results));
}

namespace {
LinePlot plot_of(const process::SweepOutcome& sweep, const std::string& title) {
    LinePlot p;
    p.title = title;
    p.x_label = sweep.x_label;
    // Saturation indices and the Langelier index share an axis: both are log units, zero at
    // calcite (or mineral) equilibrium.
    bool all_si = !sweep.series.empty(), any_langelier = false;
    for (const auto& [name, v] : sweep.series) {
        const bool lsi = name == "Langelier index";
        any_langelier = any_langelier || lsi;
        all_si = all_si && (name.rfind("SI ", 0) == 0 || lsi);
    }
    const std::string log_panel = any_langelier ? "saturation index, Langelier index (log units)"
                                                : "saturation index (log units)";
    // One panel per kind of quantity: the log-unit indices share one (zero at equilibrium);
    // every other quantity (pH, CCPP in mg/L, ...) gets its own, titled by its name and unit,
    // so a range in mg/L does not flatten the indices into a line.
    bool any_log_units = false;
    for (const auto& [name, v] : sweep.series) {
        const bool log_units = name.rfind("SI ", 0) == 0 || name == "Langelier index";
        any_log_units = any_log_units || log_units;
        p.series.push_back(Series{name, sweep.x, v, log_units ? log_panel : name});
    }
    p.y_label = all_si ? log_panel : sweep.series.size() == 1 ? sweep.series.front().first : "value (units in the legend)";
    if (any_log_units) {
        p.y_reference_lines.emplace_back(0.0, "saturation");
        p.reference_panel = log_panel;
    }
    p.note = "deltag sweep '";  // appended piece by piece: "..." + std::string trips GCC 12's -Wrestrict
    p.note += sweep.label;
    p.note += "'. Equilibrium calculation; decisions rest with licensed engineers.";
    return p;
}
}  // namespace

std::string sweep_svg(const process::SweepOutcome& sweep, const std::string& title) {
    return line_plot_svg(plot_of(sweep, title));
}

std::string sweep_csv(const process::SweepOutcome& sweep) { return series_csv(plot_of(sweep, sweep.label)); }

}  // namespace deltag::io
