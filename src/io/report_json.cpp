// JSON (interface contract keys) and CSV reports.
#include <fmt/format.h>

#include <cmath>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "deltag/report.hpp"

namespace deltag::io {

namespace {

using nlohmann::ordered_json;

double finite(double v, std::string_view what) {
    if (!std::isfinite(v)) throw std::logic_error("internal error: " + std::string(what) + " is not finite");
    return v;
}

ordered_json result_json(const equilibrium::SpeciationResult& r) {
    ordered_json j;
    j["label"] = r.label;
    j["temperature_c"] = finite(r.temperature_c, "temperature");
    j["pH"] = finite(r.ph, "pH");
    j["pe"] = r.pe ? ordered_json(finite(*r.pe, "pe")) : ordered_json(nullptr);
    j["ionic_strength"] = finite(r.ionic_strength, "ionic strength");
    j["water_activity"] = finite(r.water_activity, "water activity");
    j["alkalinity_eq_per_kgw"] = finite(r.alkalinity_eq, "alkalinity");
    j["charge_balance_error_percent"] = finite(r.charge_balance_error_percent, "charge-balance error");
    j["cations_meq_per_kgw"] = finite(r.cations_meq, "cation sum");
    j["anions_meq_per_kgw"] = finite(r.anions_meq, "anion sum");
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
    j["transfers"] = ordered_json::array();
    j["gases"] = gases;
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

std::string json_report(const thermo::Database& /*db*/, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results) {
    ordered_json root;
    root["deltag_version"] = ctx.version;
    root["title"] = ctx.title;
    root["database"] = ctx.database;
    ordered_json arr = ordered_json::array();
    for (const auto& r : results) arr.push_back(result_json(r));
    root["results"] = arr;
    root["cells"] = ordered_json::array();
    root["caution"] = std::string(caution_text());
    return root.dump(2) + "\n";
}

std::string csv_report(const thermo::Database& db, const ReportContext& /*ctx*/,
                       const std::vector<equilibrium::SpeciationResult>& results) {
    // Columns: the summary, then every element total and every SI that any result has.
    std::vector<std::string> elements, phases;
    for (const auto& r : results) {
        for (const auto& [el, m] : r.element_totals)
            if (std::find(elements.begin(), elements.end(), el) == elements.end()) elements.push_back(el);
        for (const auto& s : r.saturation)
            if (!s.is_gas && std::find(phases.begin(), phases.end(), s.phase) == phases.end()) phases.push_back(s.phase);
    }
    auto quote = [](const std::string& s) {
        if (s.find_first_of(",\"\n") == std::string::npos) return s;
        std::string q = "\"";
        for (char c : s) q += c == '"' ? std::string("\"\"") : std::string(1, c);
        return q + "\"";
    };
    std::string out = "label,temperature_c,pH,pe,ionic_strength,alkalinity_eq_per_kgw,charge_balance_error_percent";
    for (const auto& el : elements) out += ",total_" + el + "_mol_per_kgw";
    for (const auto& p : phases) out += "," + quote("si_" + p);
    out += "\n";
    for (const auto& r : results) {
        out += quote(r.label);
        out += fmt::format(",{:.6g},{:.6g},{},{:.6g},{:.6g},{:.6g}", finite(r.temperature_c, "temperature"),
                           finite(r.ph, "pH"), r.pe ? fmt::format("{:.6g}", *r.pe) : std::string(),
                           finite(r.ionic_strength, "ionic strength"), finite(r.alkalinity_eq, "alkalinity"),
                           finite(r.charge_balance_error_percent, "charge balance"));
        for (const auto& el : elements) {
            auto it = r.element_totals.find(el);
            out += it == r.element_totals.end() ? "," : fmt::format(",{:.6g}", finite(it->second, el));
        }
        for (const auto& p : phases) {
            auto it = std::find_if(r.saturation.begin(), r.saturation.end(), [&](const auto& s) { return s.phase == p; });
            out += it == r.saturation.end() ? "," : fmt::format(",{:.6g}", finite(it->si, p));
        }
        out += "\n";
    }
    (void)db;
    return out;
}

}  // namespace deltag::io
