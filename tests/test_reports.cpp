// Report writers: the text layout (summary first), the JSON contract keys, CSV, and the
// refusal to write a non-finite number.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include "deltag/report.hpp"
#include "text_match.hpp"
#include "deltag/water.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

ComponentInput total(const char* name, double v) {
    return ComponentInput{*core().find_species(name), ComponentInput::Kind::total, v};
}

SpeciationResult sample() {
    SpeciationInput in;
    in.label = "well-7";
    in.temperature_c = 14.0;
    in.ph = 7.2;
    in.components = {total("Ca^2+", 2e-3), total("HCO3-", 4e-3), total("Cl-", 1e-3), total("Na+", 1e-3),
                     total("SO4^2-", 5e-4)};
    return speciate(core(), in);
}

io::ReportContext context() { return io::ReportContext{"Test case (invented)", "t.toml", "core", "0.1.0", false}; }

}  // namespace

TEST_CASE("text report: the answer first, then the water at a glance, the detail, what to check, the caution") {
    const std::string t = flat(io::text_report(core(), context(), {sample()}));
    const auto p_will = t.find("What it will do");
    const auto p_lsi = t.find("Langelier (LSI)");
    const auto p_glance = t.find("The water at a glance");
    const auto p_where = t.find("Where each component is");
    const auto p_species = t.find("Species, most abundant first");
    const auto p_minerals = t.find("Every mineral (log K at 14.0");
    const auto p_caution = t.find("Caution:");
    for (auto p : {p_will, p_glance, p_where, p_species, p_minerals, p_caution}) REQUIRE(p != std::string::npos);
    CHECK(p_will < p_glance);
    CHECK(p_glance < p_where);
    CHECK(p_where < p_species);
    CHECK(p_species < p_minerals);
    CHECK(p_minerals < p_caution);
    // Without items carrying indices the Langelier line is left out, never invented.
    CHECK(p_lsi == std::string::npos);
    CHECK(t.find("1. well-7: the water as given") != std::string::npos);
    CHECK(t.find("Calcite") != std::string::npos);
    CHECK(t.find("(SM 1030 E)") != std::string::npos);  // the ion balance and its method
    // The layout an engineer reads is deltag's own: none of the old grouped tables.
    CHECK(t.find("grouped by component") == std::string::npos);
    CHECK(t.find("share %") == std::string::npos);
    CHECK(t.find("log γ") == std::string::npos);
    CHECK(t.find("nan") == std::string::npos);
    CHECK(t.find("inf") == std::string::npos);
}

TEST_CASE("text report with --verbose carries the full solver summary") {
    io::ReportContext ctx = context();
    ctx.verbose = true;
    const std::string t = flat(io::text_report(core(), ctx, {sample()}));
    CHECK(t.find("Newton iterations:") != std::string::npos);
    CHECK(t.find("KINSOL") != std::string::npos);
}

TEST_CASE("JSON report has the contract's keys and values") {
    const SpeciationResult r = sample();
    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {r}));
    CHECK(j["deltag_version"] == "0.1.0");
    REQUIRE(j["results"].size() == 1);
    const auto& x = j["results"][0];
    CHECK(x["label"] == "well-7");
    CHECK(x["temperature_c"].get<double>() == doctest::Approx(14.0));
    CHECK(x["pH"].get<double>() == doctest::Approx(7.2));
    CHECK(x["pe"].is_null());
    CHECK(x["ionic_strength"].get<double>() == doctest::Approx(r.ionic_strength));
    CHECK(x["charge_balance_error_percent"].get<double>() == doctest::Approx(r.charge_balance_error_percent));
    CHECK(x["totals"]["Ca"].get<double>() == doctest::Approx(2e-3));
    CHECK(x["totals"]["C"].get<double>() == doctest::Approx(4e-3));
    CHECK(x["totals"]["S"].get<double>() == doctest::Approx(5e-4));
    REQUIRE(x["species"].is_array());
    bool found = false;
    for (const auto& s : x["species"]) {
        CHECK(s.contains("molality"));
        CHECK(s.contains("activity"));
        CHECK(s.contains("log_gamma"));
        if (s["name"] == "Ca^2+") found = true;
    }
    CHECK(found);
    bool calcite = false;
    for (const auto& s : x["saturation"]) {
        CHECK(s.contains("si"));
        CHECK(s.contains("log_iap"));
        CHECK(s.contains("log_k"));
        CHECK(s.contains("delta_g_kj_per_mol"));
        if (s["phase"] == "Calcite") calcite = true;
    }
    CHECK(calcite);
    CHECK(x["transfers"].is_array());
    REQUIRE(x["gases"].is_array());
    CHECK(x["gases"][0].contains("log_partial_pressure_atm"));
    CHECK(x["warnings"].is_array());
    CHECK(j["cells"].is_array());
    CHECK(x["solver"]["converged"] == true);
}

TEST_CASE("CSV report: a header and one row per result") {
    const std::string csv = io::csv_report(core(), context(), {sample(), sample()});
    std::size_t lines = 0;
    for (char c : csv) lines += c == '\n';
    CHECK(lines == 3);
    CHECK(csv.rfind("label,kind,temperature_c,pH,pe,ionic_strength", 0) == 0);
    CHECK(csv.find("si_Calcite") != std::string::npos);
    CHECK(csv.find("well-7,water,14,7.2,") != std::string::npos);
}

TEST_CASE("writers refuse to print a number that is not finite") {
    SpeciationResult r = sample();
    r.ionic_strength = std::numeric_limits<double>::quiet_NaN();
    CHECK_THROWS_AS(io::json_report(core(), context(), {r}), std::logic_error);
    CHECK_THROWS_AS(io::csv_report(core(), context(), {r}), std::logic_error);
}

// --- a charge balance that changed an analyte; indices without an answer -----------------

namespace {

// Invented analysis, per litre: Na 22.99 mg/L (1.000 mmol/L), Ca 40.078 (1.000 mmol/L),
// NO3 4.092 (0.066 mmol/L), Cl 40 (1.128 mmol/L), pH 7, balanced on Cl. By hand (IUPAC 2021
// atomic weights; no ion pairs of these ions; H+ and OH- at 1e-7 are negligible): chloride
// must carry 2 x 1.000 + 1.000 - 0.066 = 2.934 meq/L, i.e. 2.934 x 35.45 = 104.0 mg/L. As
// given the anions were 1.128 + 0.066 = 1.194 meq/L against 3.000 meq/L of cations, 1.806
// meq/L apart: beyond the 0.2 meq/L that Standard Methods 1030 E accepts for anion sums
// up to 3 meq/L.
WaterAnalysis lab(double cl_mg_per_l) {
    WaterAnalysis w;
    w.name = "lab";
    w.ph = 7.0;
    w.units = "mg/L";
    w.charge_balance = "Cl";
    w.charge_balance_where = SourceLocation{"t.toml", 4, 18};
    for (auto [name, v] : std::vector<std::pair<const char*, double>>{
             {"Na", 22.99}, {"Ca", 40.078}, {"NO3", 4.092}, {"Cl", cl_mg_per_l}}) {
        AnalyteValue a;
        a.name = name;
        a.value = v;
        a.where = SourceLocation{"t.toml", 8, 1};
        w.analytes.push_back(a);
    }
    return w;
}

SpeciationResult balanced(const WaterAnalysis& w) {
    const SpeciationInput in = to_speciation_input(w, core(), activity::ModelKind::davies);
    SpeciationResult r = speciate(core(), in);
    describe_charge_balance_adjustment(in, r, core());
    return r;
}

}  // namespace

TEST_CASE("a charge-balance adjustment is reported: analyte, from, to, and the 1030 E verdict") {
    const SpeciationResult r = balanced(lab(40.0));
    REQUIRE(r.charge_balance_adjustment.has_value());
    const auto& a = *r.charge_balance_adjustment;
    CHECK(a.analyte == "Cl");
    CHECK(a.unit == "mg/L");
    CHECK(a.given == doctest::Approx(40.0));
    CHECK(a.adjusted == doctest::Approx(104.0).epsilon(0.002));  // hand: 104.0 mg/L
    CHECK(a.adjusted_mmol_per_kgw == doctest::Approx(2.934 / r.kg_water_per_litre).epsilon(0.002));
    CHECK(a.given_mmol_per_kgw == doctest::Approx(40.0 / 35.45 / r.kg_water_per_litre).epsilon(1e-6));
    CHECK(a.change_meq_per_kgw == doctest::Approx(-1.806 / r.kg_water_per_litre).epsilon(0.003));
    CHECK_FALSE(a.within_acceptance);
    bool warned = false;
    for (const auto& w : r.warnings) warned = warned || w.find("beyond the Standard Methods 1030 E acceptance") != std::string::npos;
    CHECK(warned);

    const std::string t = flat(io::text_report(core(), context(), {r}));
    CHECK(t.find("balanced on Cl") != std::string::npos);
    CHECK(t.find("Cl adjusted from 40 to 104") != std::string::npos);
    CHECK(t.find("mmol/kgw) to close the balance") != std::string::npos);
    CHECK(t.find("OUTSIDE the Standard Methods 1030 E acceptance") != std::string::npos);

    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {r}));
    const auto& x = j["results"][0];
    // The contract's core keys stay.
    for (const char* key : {"label", "temperature_c", "pH", "pe", "ionic_strength", "charge_balance_error_percent",
                            "totals", "species", "saturation", "transfers", "gases", "warnings"})
        CHECK(x.contains(key));
    const auto& adj = x["charge_balance_adjustment"];
    CHECK(adj["analyte"] == "Cl");
    CHECK(adj["unit"] == "mg/L");
    CHECK(adj["as"].is_null());
    CHECK(adj["given"].get<double>() == doctest::Approx(40.0));
    CHECK(adj["adjusted"].get<double>() == doctest::Approx(104.0).epsilon(0.002));
    CHECK(adj["adjusted_mmol_per_kgw"].get<double>() == doctest::Approx(a.adjusted_mmol_per_kgw));
    CHECK(adj["within_standard_methods_1030e"] == false);

    // Chloride given close to what the balance needs: the change is within 1030 E.
    const SpeciationResult near = balanced(lab(103.0));
    REQUIRE(near.charge_balance_adjustment.has_value());
    CHECK(near.charge_balance_adjustment->within_acceptance);
    CHECK(flat(io::text_report(core(), context(), {near})).find("within the Standard Methods 1030 E acceptance") != std::string::npos);
    // A water not balanced on an analyte has no adjustment, and the JSON says null.
    CHECK(nlohmann::json::parse(io::json_report(core(), context(), {sample()}))["results"][0]["charge_balance_adjustment"].is_null());
}

TEST_CASE("indices without an answer: the reason in text and JSON, null values, empty CSV cells") {
    // Invented RO permeate: Ca 0.1 mg/L, alkalinity 0.01 meq/L, pH 6; no pH saturates it
    // with calcite (see test_process.cpp), so LSI and RSI have no value; the CCPP has one.
    WaterAnalysis w;
    w.name = "permeate";
    w.ph = 6.0;
    w.units = "mg/L";
    for (auto [name, v] : std::vector<std::pair<const char*, double>>{{"Ca", 0.1}, {"Na", 1.0}, {"Cl", 1.5}}) {
        AnalyteValue a;
        a.name = name;
        a.value = v;
        w.analytes.push_back(a);
    }
    AnalyteValue alk;
    alk.name = "Alkalinity";
    alk.value = 0.01;
    alk.unit = "meq/L";
    w.analytes.push_back(alk);
    const SpeciationInput in = to_speciation_input(w, core(), activity::ModelKind::davies);
    const process::WaterState s = process::state_from_result(speciate(core(), in), in, core());
    REQUIRE_FALSE(s.indices.available);
    REQUIRE(s.indices.ccpp_available);
    const io::ReportItem item{"water", s.result, s.indices, std::nullopt, std::nullopt};
    const std::string t = flat(io::text_report(core(), context(), {item}));
    CHECK(t.find("Langelier, Ryznar n/a calcite saturation cannot be reached") != std::string::npos);
    CHECK(t.find("pHs does not exist") != std::string::npos);
    CHECK(t.find("mg/L as CaCO3 would dissolve") != std::string::npos);
    CHECK(t.find("nan") == std::string::npos);
    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {item}));
    const auto& ix = j["results"][0]["indices"];
    CHECK(ix["langelier"].is_null());
    CHECK(ix["ryznar"].is_null());
    CHECK(ix["langelier_available"] == false);
    CHECK(ix["langelier_unavailable_because"].get<std::string>().find("pHs does not exist") != std::string::npos);
    CHECK(ix["ccpp_mg_per_l_as_caco3"].get<double>() < 0);
    const std::string csv = io::csv_report(core(), context(), {item});
    CHECK(csv.find("permeate,water,") != std::string::npos);
    CHECK(csv.find(",,,") != std::string::npos);  // langelier, ryznar empty; ccpp present
}

TEST_CASE("text report: sweep column headers are never cut, and the values line up under them") {
    // Before, each header was cut to 15 characters ("CCPP (mg/L as C").
    process::SweepOutcome sw;
    sw.label = "cycles";
    sw.x_label = "cycles of concentration (-)";
    sw.x = {1.0, 2.0};
    sw.series = {{"pH", {7.8, 8.1}}, {"CCPP (mg/L as CaCO3)", {-3.25, 12.5}}};
    const std::string t = io::text_report(core(), context(), {}, {{sw, "", ""}});  // columns: not flattened
    const auto head = t.find("CCPP (mg/L as CaCO3)\n");
    REQUIRE(head != std::string::npos);
    // The values of the last column end where its header ends.
    const auto line_start = t.rfind('\n', head) + 1;
    const std::size_t header_end = head + std::string("CCPP (mg/L as CaCO3)").size() - line_start;
    const auto row = t.find("12.5000\n", head);
    REQUIRE(row != std::string::npos);
    CHECK(row + 7 - (t.rfind('\n', row) + 1) == header_end);
}

TEST_CASE("sweep plot: pH, CCPP and the indices on panels of their own") {
    // Invented numbers. Before, all four curves shared one axis from -50 to 150.
    process::SweepOutcome sw;
    sw.label = "cycles";
    sw.x_label = "cycles of concentration (-)";
    sw.x = {1.0, 2.0, 3.0};
    sw.series = {{"pH", {7.6, 8.0, 8.3}},
                 {"SI Calcite", {-0.3, 0.2, 0.6}},
                 {"Langelier index", {-0.4, 0.1, 0.5}},
                 {"CCPP (mg/L as CaCO3)", {-40.0, 30.0, 120.0}}};
    const std::string svg = io::sweep_svg(sw, "Cycles (invented)");
    std::size_t panels = 0;
    for (auto at = svg.find("<svg x=\"0\""); at != std::string::npos; at = svg.find("<svg x=\"0\"", at + 1)) ++panels;
    CHECK(panels == 3);  // pH; SI and LSI together (both log units); CCPP
    CHECK(svg.find(">saturation index, Langelier index (log units)</text>") != std::string::npos);
    CHECK(svg.find(">CCPP (mg/L as CaCO3)</text>") != std::string::npos);
    // Only SI sweeps keep the single plot.
    sw.series = {{"SI Calcite", {-0.3, 0.2, 0.6}}, {"SI Gypsum", {-2.0, -1.5, -1.0}}};
    CHECK(io::sweep_svg(sw, "t").find("<svg x=\"0\"") == std::string::npos);
}

TEST_CASE("a sweep's points without a value are null in JSON, n/a in text, and noted") {
    process::SweepOutcome sw;
    sw.label = "share";
    sw.x_label = "fraction of permeate (-)";
    sw.x = {0.0, 1.0};
    sw.series = {{"Langelier index", {0.5, std::numeric_limits<double>::quiet_NaN()}}};
    sw.notes = {"no Langelier index at fraction of permeate (-) = 1: pHs does not exist"};
    const std::vector<io::SweepReport> sweeps{{sw, "", ""}};
    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {}, sweeps));
    CHECK(j["sweeps"][0]["series"]["Langelier index"][1].is_null());
    CHECK(j["sweeps"][0]["notes"][0].get<std::string>().find("pHs does not exist") != std::string::npos);
    const std::string t = flat(io::text_report(core(), context(), {}, sweeps));
    CHECK(t.find("n/a") != std::string::npos);
    CHECK(t.find("pHs does not exist") != std::string::npos);
    CHECK(t.find("nan") == std::string::npos);
    CHECK(io::sweep_csv(sw).find("nan") == std::string::npos);
}

// --- numbers as printed: no signed zero, no search noise, CSV like the JSON ---------------

TEST_CASE("text report: a value that rounds to zero prints unsigned; a dose target met prints as met") {
    // Before: fmt "{:+.2f}" printed -0.00 for a balance of -1e-4 %, and the dose line said
    // "reached -3.35243e-08" for an SI target of 0 met to 1e-6.
    // Now: a mineral a hair below saturation (SI -1e-4, ΔG -6e-4 kJ/mol) in the outlook.
    SpeciationResult r = sample();
    process::Outlook outlook;
    process::MineralOutlook m;
    m.mineral = "Calcite";
    m.si = -1e-4;
    m.delta_g_kj_per_mol = -6e-4;
    m.tendency = process::Tendency::balanced;
    m.amount_available = true;
    outlook.minerals.push_back(m);
    process::DoseOutcome dose;
    dose.reagent = "NaOH";
    dose.mol_per_kgw = 1.2e-4;
    dose.mg_per_l = 4.8;
    dose.found_by_target = true;
    dose.target_reached = -3.35243e-08;
    const io::ReportItem item{"dose", r, std::nullopt, dose, outlook, {}};
    const std::string t = flat(io::text_report(core(), context(), {item}));
    CHECK(t.find("-0.00") == std::string::npos);
    CHECK(t.find("\u22120.00") == std::string::npos);
    CHECK(t.find("Calcite balanced 0.00 0.00 none: at equilibrium") != std::string::npos);
    CHECK(t.find("found for the target (reached 0)") != std::string::npos);
    CHECK(t.find("3.35243") == std::string::npos);
}

TEST_CASE("CSV report: the dose columns the JSON has, and numbers at full precision") {
    SpeciationResult r = sample();
    r.ionic_strength = 0.0123456789012;  // invented; more digits than the old 6 the CSV kept
    r.ph = 6.35 + 0.1;                   // 6.449999999999999 in binary: written 6.45
    process::DoseOutcome dose;
    dose.reagent = "Ca(OH)2";
    dose.mol_per_kgw = 2.5e-4;
    dose.mg_per_l = 18.52;
    dose.found_by_target = true;
    dose.target_reached = 8.3;
    const io::ReportItem dosed{"dose", r, std::nullopt, dose};
    const io::ReportItem plain{"water", sample(), std::nullopt, std::nullopt};
    const std::string csv = io::csv_report(core(), context(), {dosed, plain});
    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {dosed, plain}));

    // Splits the CSV into records of fields (no field here is quoted but the reagent's).
    std::vector<std::vector<std::string>> rows;
    std::size_t start = 0;
    while (start < csv.size()) {
        const std::size_t end = csv.find('\n', start);
        std::vector<std::string> f;
        std::string cur;
        bool quoted = false;
        for (std::size_t i = start; i < end; ++i) {
            const char c = csv[i];
            if (c == '"') quoted = !quoted;
            else if (c == ',' && !quoted) f.push_back(std::exchange(cur, {}));
            else cur += c;
        }
        f.push_back(cur);
        rows.push_back(f);
        start = end + 1;
    }
    REQUIRE(rows.size() == 3);
    auto column = [&](const std::string& name) {
        const auto it = std::find(rows[0].begin(), rows[0].end(), name);
        REQUIRE(it != rows[0].end());
        return static_cast<std::size_t>(it - rows[0].begin());
    };
    const auto& jd = j["results"][0]["dose"];
    CHECK(rows[1][column("dose_reagent")] == jd["reagent"].get<std::string>());
    CHECK(std::stod(rows[1][column("dose_mol_per_kgw")]) == jd["mol_per_kgw"].get<double>());
    CHECK(std::stod(rows[1][column("dose_mg_per_l")]) == jd["mg_per_l"].get<double>());
    CHECK(std::stod(rows[1][column("dose_target_reached")]) == jd["target_reached"].get<double>());
    // A water without a dose: empty dose cells, as the JSON has no "dose".
    CHECK_FALSE(j["results"][1].contains("dose"));
    for (const char* c : {"dose_reagent", "dose_mol_per_kgw", "dose_mg_per_l", "dose_target_reached"})
        CHECK(rows[2][column(c)].empty());
    // Full precision, without noise.
    CHECK(rows[1][column("ionic_strength")] == "0.0123456789012");
    CHECK(rows[1][column("pH")] == "6.45");
    CHECK(csv.find("6.449999999999999") == std::string::npos);
    // A quoted reagent would need quotes only with a comma; Ca(OH)2 has none.
    CHECK(csv.find("Ca(OH)2") != std::string::npos);
}

TEST_CASE("JSON: a cell's electron count is an integer") {
    // Before: {"n_electrons": 2.0}. The values are invented; only the types are checked.
    electro::CellResult c;
    c.label = "couple";
    c.cathode = "Cu^2+ + 2 e- = Cu(s)";
    c.anode = "Zn^2+ + 2 e- = Zn(s)";
    c.n = 2.0;
    c.e0_v = 1.1;
    c.e_v = 1.1;
    const auto j = nlohmann::json::parse(io::cells_json({c}));
    CHECK(j["cells"][0]["n_electrons"].is_number_integer());
    CHECK(j["cells"][0]["n_electrons"].get<long long>() == 2);
    const auto whole = nlohmann::json::parse(io::json_report(core(), context(), {}, {}, {c}));
    CHECK(whole["cells"][0]["n_electrons"].is_number_integer());
    // The text shows it without a decimal point as before.
    CHECK(io::cell_text(c).find("electrons n" + std::string(24 - 11, ' ') + "2\n") != std::string::npos);
}
