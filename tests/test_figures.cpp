// The figures of a lab sheet (src/process/figures.cpp): each formula against its published
// definition, and the figures of speciated waters (invented analyses) against the same
// formulas worked by hand from the analysis. Sources are named beside each check.
#include <doctest/doctest.h>

#include <cmath>
#include <nlohmann/json.hpp>
#include <string>

#include "deltag/case.hpp"
#include "deltag/figures.hpp"
#include "deltag/process.hpp"
#include "deltag/report.hpp"
#include "text_match.hpp"

using namespace deltag;
using namespace deltag::process;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

// The speciated waters of a case, with their indices.
std::vector<WaterState> waters_of(const std::string& text) {
    const io::Case c = io::parse_case(text, "test.toml");
    std::vector<WaterState> out;
    for (const auto& w : c.waters) {
        const auto in = to_speciation_input(w, core(), c.activity_model);
        out.push_back(state_from_result(equilibrium::speciate(core(), in), in, core()));
        out.back().indices = water_treatment_indices(core(), out.back());
    }
    return out;
}

const WaterState& water(const std::vector<WaterState>& ws, const std::string& name) {
    for (const auto& w : ws)
        if (w.label == name) return w;
    FAIL("no water " << name);
    return ws.front();
}

// Invented analyses, mg/L.
const std::string analyses = R"toml(
title = "figures test waters (invented)"
[water.hard]
pH = 7.5
units = "mg/L"
[water.hard.analytes]
Ca = 40
Mg = 12.15
Na = 23
K = 3.9
Cl = 71
SO4 = 96
Alkalinity = { value = 100, as = "CaCO3" }

[water.soda]
charge_balance = "pH"
units = "mmol/L"
[water.soda.analytes]
Na = 2.0
DIC = 1.0

[water.bicarbonate]
charge_balance = "pH"
units = "mmol/L"
[water.bicarbonate.analytes]
Na = 1.0
DIC = 1.0

[water.carbonic]
charge_balance = "pH"
units = "mmol/L"
[water.carbonic.analytes]
Na = 0.1
DIC = 1.0

[water.kcl_0_001]
charge_balance = "pH"
units = "mmol/L"
[water.kcl_0_001.analytes]
K = 1.0
Cl = 1.0

[water.kcl_0_01]
charge_balance = "pH"
units = "mmol/L"
[water.kcl_0_01.analytes]
K = 10.0
Cl = 10.0

[water.kcl_0_1]
charge_balance = "pH"
units = "mmol/L"
[water.kcl_0_1.analytes]
K = 100.0
Cl = 100.0

[water.pure]
charge_balance = "pH"

[water.sea_brine]
pH = 7.8
units = "mg/L"
[water.sea_brine.analytes]
Na = 21000
Cl = 32400
Ca = 800
Alkalinity = { value = 250, as = "CaCO3" }

[water.brine_no_carbon]
pH = 7.0
units = "mg/L"
[water.brine_no_carbon.analytes]
Na = 393
Cl = 607
)toml";

}  // namespace

TEST_CASE("hardness by calculation, Standard Methods 2340 B") {
    // 2340 B: hardness, mg equivalent CaCO3/L = 2.497 [Ca, mg/L] + 4.118 [Mg, mg/L].
    CHECK(hardness_from_ca_mg(100.0, 0.0) == doctest::Approx(249.7));
    CHECK(hardness_from_ca_mg(0.0, 10.0) == doctest::Approx(41.18));
    CHECK(hardness_from_ca_mg(40.0, 12.15) == doctest::Approx(2.497 * 40.0 + 4.118 * 12.15));
    // The factors are CaCO3/Ca and CaCO3/Mg (IUPAC atomic weights: 100.087/40.078, 100.087/24.305).
    CHECK(2.497 == doctest::Approx(100.087 / 40.078).epsilon(2e-4));
    CHECK(4.118 == doctest::Approx(100.087 / 24.305).epsilon(2e-4));
}

TEST_CASE("carbonate and non-carbonate hardness, Standard Methods 2340 definitions") {
    // Alkalinity below the hardness: carbonate hardness = alkalinity, the rest non-carbonate.
    auto [c1, n1] = split_hardness(200.0, 150.0);
    CHECK(c1 == doctest::Approx(150.0));
    CHECK(n1 == doctest::Approx(50.0));
    // Alkalinity at or above the hardness: all of it is carbonate hardness.
    auto [c2, n2] = split_hardness(200.0, 250.0);
    CHECK(c2 == doctest::Approx(200.0));
    CHECK(n2 == doctest::Approx(0.0));
}

TEST_CASE("the hardness of a speciated water is the 2340 B formula on its analysis") {
    const auto ws = waters_of(analyses);
    const auto f = water_figures(core(), water(ws, "hard").result, &water(ws, "hard").indices);
    // Ca 40 and Mg 12.15 mg/L come back through the density conversion to within 0.1 %.
    CHECK(f.calcium_mg_per_l == doctest::Approx(40.0).epsilon(1e-3));
    CHECK(f.magnesium_mg_per_l == doctest::Approx(12.15).epsilon(1e-3));
    CHECK(f.hardness_calcium == doctest::Approx(2.497 * 40.0).epsilon(1e-3));
    CHECK(f.hardness_magnesium == doctest::Approx(4.118 * 12.15).epsilon(1e-3));
    CHECK(f.hardness_total == doctest::Approx(2.497 * 40.0 + 4.118 * 12.15).epsilon(1e-3));
    // Alkalinity 100 < hardness 149.9: carbonate hardness 100, non-carbonate 49.9 (2340).
    CHECK(f.hardness_carbonate == doctest::Approx(100.0).epsilon(1e-3));
    CHECK(f.hardness_non_carbonate == doctest::Approx(2.497 * 40.0 + 4.118 * 12.15 - 100.0).epsilon(5e-3));
}

TEST_CASE("total (M) and phenolphthalein (P) alkalinity, Standard Methods 2320") {
    const auto ws = waters_of(analyses);
    {
        // The total alkalinity given comes back as M, 100 mg/L as CaCO3.
        const auto f = water_figures(core(), water(ws, "hard").result);
        CHECK(f.alkalinity_total_m == doctest::Approx(100.0).epsilon(1e-3));
        // pH 7.5 is below the phenolphthalein end point: no P, some acidity to pH 8.3 instead.
        CHECK(f.alkalinity_phenolphthalein_p == 0.0);
        CHECK(f.acidity_to_ph_8_3 > 0.0);
    }
    {
        // Sodium carbonate, 1 mmol/L: M = 2 meq/L = 100.1 mg/L as CaCO3, and P = M/2, which in
        // Standard Methods 2320 Table 2320:I (P = T/2) means all of it is carbonate.
        const auto f = water_figures(core(), water(ws, "soda").result);
        CHECK(f.alkalinity_total_m == doctest::Approx(2.0 * mg_caco3_per_meq).epsilon(2e-3));
        CHECK(f.alkalinity_phenolphthalein_p == doctest::Approx(f.alkalinity_total_m / 2.0).epsilon(1e-6));
        CHECK(f.acidity_to_ph_8_3 == 0.0);
    }
    {
        // Sodium bicarbonate, 1 mmol/L: its pH is near 8.3, so P is nearly 0 (Table 2320:I:
        // P = 0, all bicarbonate) while M is 1 meq/L.
        const auto f = water_figures(core(), water(ws, "bicarbonate").result);
        CHECK(f.alkalinity_total_m == doctest::Approx(mg_caco3_per_meq).epsilon(2e-3));
        CHECK(f.alkalinity_phenolphthalein_p + f.acidity_to_ph_8_3 < 0.02 * f.alkalinity_total_m);
    }
    {
        // Carbonic water, charge-balanced (its pH near 5.4), so its alkalinity is its sodium,
        // 0.1 meq/L, the charge the carbonate and hydroxide balance. The acidity
        // to pH 8.3 is the carbon less the alkalinity, 0.9 meq/L = 45.0 mg/L as CaCO3
        // (Standard Methods 2310, phenolphthalein acidity, at its equivalence point).
        const auto f = water_figures(core(), water(ws, "carbonic").result);
        CHECK(f.alkalinity_phenolphthalein_p == 0.0);
        CHECK(f.acidity_to_ph_8_3 == doctest::Approx(0.9 * mg_caco3_per_meq).epsilon(1e-2));
    }
}

TEST_CASE("dissolved solids by calculation, Standard Methods 1030 E and Hem (1985)") {
    const auto ws = waters_of(analyses);
    const auto f = water_figures(core(), water(ws, "hard").result);
    // 1030 E: 0.6 x alkalinity (as CaCO3) + Na + K + Ca + Mg + Cl + SO4 (+ SiO3, NO3, F: none
    // here). At pH 7.5 nearly all of the alkalinity is carbonate (OH- is 0.003 meq/L of 2).
    const double sm_1030e = 0.6 * 100.0 + 23 + 3.9 + 40 + 12.15 + 71 + 96;
    CHECK(f.tds_calculated_mg_per_l == doctest::Approx(sm_1030e).epsilon(3e-3));
    // Hem (1985), USGS WSP 2254: bicarbonate x 0.4917; 100 mg/L as CaCO3 is 121.9 mg/L HCO3-.
    const double hem = 0.4917 * 100.0 * 61.017 / 50.04 + 23 + 3.9 + 40 + 12.15 + 71 + 96;
    CHECK(f.tds_calculated_mg_per_l == doctest::Approx(hem).epsilon(3e-3));
    // A brine without carbon: the sum of the constituents, 1000 mg/L.
    const auto b = water_figures(core(), water(ws, "brine_no_carbon").result);
    CHECK(b.tds_calculated_mg_per_l == doctest::Approx(1000.0).epsilon(1e-3));
}

TEST_CASE("Larson-Skold index, Larson and Skold (1958)") {
    // (Cl- + SO4^2-) / (HCO3- + CO3^2-), equivalents: (1 + 0.5) / 2.
    CHECK(larson_skold(1.0, 0.5, 2.0) == doctest::Approx(0.75));
    // The common reading (from memory): below 0.8, 0.8 to 1.2, above 1.2.
    CHECK(larson_skold_reading(0.75) == "chloride and sulfate unlikely to upset protective films");
    CHECK(larson_skold_reading(1.0) == "chloride and sulfate may upset protective films");
    CHECK(larson_skold_reading(1.21) == "high local corrosion rates of steel likely");
    const auto ws = waters_of(analyses);
    const auto f = water_figures(core(), water(ws, "hard").result);
    // Cl 71 mg/L = 2.003 meq/L, SO4 96 mg/L = 1.999 meq/L, alkalinity 100 as CaCO3 = 1.998 meq/L.
    REQUIRE(f.larson_skold_available);
    CHECK(f.larson_skold == doctest::Approx((71.0 / 35.453 + 2.0 * 96.0 / 96.06) / (100.0 / 50.04)).epsilon(3e-3));
    // About 2: above 1.2, read as high local corrosion rates (common reading, from memory).
    CHECK(f.larson_skold_reading == "high local corrosion rates of steel likely");
    // No carbonate: no index, with the reason.
    const auto b = water_figures(core(), water(ws, "brine_no_carbon").result);
    CHECK_FALSE(b.larson_skold_available);
    CHECK(b.larson_skold_why_not.find("no carbonate alkalinity") != std::string::npos);
}

TEST_CASE("Puckorius index, Puckorius and Brooke (1991)") {
    // pHeq = 1.465 log10(Alk) + 4.54: 1.465 x 2 + 4.54 = 7.47 at 100 mg/L as CaCO3.
    CHECK(puckorius_ph_eq(100.0) == doctest::Approx(7.47));
    // PSI = 2 pHs - pHeq: 2 x 7.0 - 7.47 = 6.53.
    CHECK(puckorius(7.0, 100.0) == doctest::Approx(6.53));
    // Read as Ryznar's (from memory): below 6 scale-forming, 6 to 7 near balance, above 7 corrosive.
    CHECK(puckorius_reading(5.5) == "scale-forming");
    CHECK(puckorius_reading(6.53) == "near balance");
    CHECK(puckorius_reading(7.2) == "corrosive");
    const auto ws = waters_of(analyses);
    const auto& w = water(ws, "hard");
    REQUIRE(w.indices.available);
    const auto f = water_figures(core(), w.result, &w.indices);
    REQUIRE(f.puckorius_available);
    CHECK(f.puckorius == doctest::Approx(2.0 * w.indices.ph_s - (1.465 * std::log10(100.0) + 4.54)).epsilon(1e-3));
    // Without the Langelier pHs there is no index, and the reason says so.
    const auto g = water_figures(core(), w.result);
    CHECK_FALSE(g.puckorius_available);
    CHECK(g.puckorius_why_not.find("pHs") != std::string::npos);
    Indices none;
    none.why_not = "test";
    const auto h = water_figures(core(), w.result, &none);
    CHECK_FALSE(h.puckorius_available);
    CHECK(h.puckorius_why_not.find("unavailable") != std::string::npos);
}

TEST_CASE("Aggressive Index, AWWA C400") {
    // AI = pH + log10(A H): 8.0 + log10(100 x 100) = 12.0.
    CHECK(aggressive_index(8.0, 100.0, 100.0) == doctest::Approx(12.0));
    const auto ws = waters_of(analyses);
    const auto f = water_figures(core(), water(ws, "hard").result);
    REQUIRE(f.aggressive_index_available);
    // pH 7.5, A = 100, H = 2.497 x 40 = 99.88: AI = 7.5 + 3.9995 = 11.4995, moderately
    // aggressive (10 to 12).
    CHECK(f.aggressive_index == doctest::Approx(7.5 + std::log10(100.0 * 2.497 * 40.0)).epsilon(1e-4));
    CHECK(f.aggressive_index_reading == "moderately aggressive");
    // The AWWA C400 classes (from memory): 12 and above, 10 to 12, below 10.
    CHECK(aggressive_index_reading(12.3) == "non-aggressive");
    CHECK(aggressive_index_reading(11.99) == "moderately aggressive");
    // 11.996 is shown as 12.00, and read as the 12.00 shown.
    CHECK(aggressive_index_reading(11.996) == "non-aggressive");
    CHECK(aggressive_index_reading(10.0) == "moderately aggressive");
    CHECK(aggressive_index_reading(9.9) == "highly aggressive");
    // No calcium, no alkalinity: no index, with the reason.
    const auto b = water_figures(core(), water(ws, "brine_no_carbon").result);
    CHECK_FALSE(b.aggressive_index_available);
    CHECK(b.aggressive_index_why_not.find("calcium and total alkalinity") != std::string::npos);
}

TEST_CASE("the figures stand in the JSON (new keys) and in the text report") {
    const auto ws = waters_of(analyses);
    const auto& w = water(ws, "hard");
    const std::vector<io::ReportItem> items{io::ReportItem{"water", w.result, w.indices, std::nullopt, std::nullopt}};
    const auto j = nlohmann::json::parse(io::json_report(core(), io::ReportContext{}, items));
    const auto& fig = j["results"][0]["figures"];
    // The same numbers as the formulas on the analysis (2340 B, 2320, AWWA C400).
    CHECK(fig["hardness_mg_per_l_as_caco3"]["total"].get<double>() ==
          doctest::Approx(2.497 * 40.0 + 4.118 * 12.15).epsilon(1e-3));
    CHECK(fig["alkalinity_mg_per_l_as_caco3"]["total_m"].get<double>() == doctest::Approx(100.0).epsilon(1e-3));
    CHECK(fig["alkalinity_mg_per_l_as_caco3"]["phenolphthalein_p"].get<double>() == 0.0);
    CHECK(fig["aggressive_index"]["value"].get<double>() ==
          doctest::Approx(7.5 + std::log10(100.0 * 2.497 * 40.0)).epsilon(1e-4));
    CHECK(fig["puckorius"]["value"].is_number());
    CHECK(fig["specific_conductance_25c_us_per_cm"].get<double>() > 0.0);
    CHECK(fig["larson_skold"]["unavailable_because"].is_null());
    // The core keys are still there (interface contract).
    for (const char* key : {"label", "temperature_c", "pH", "pe", "ionic_strength", "charge_balance_error_percent",
                            "totals", "species", "saturation", "transfers", "gases", "warnings"})
        CHECK(j["results"][0].contains(key));
    // Without carbonate the index is null with its reason.
    const auto& b = water(ws, "brine_no_carbon");
    const auto jb = nlohmann::json::parse(
        io::json_report(core(), io::ReportContext{}, {io::ReportItem{"water", b.result, b.indices, std::nullopt, std::nullopt}}));
    CHECK(jb["results"][0]["figures"]["larson_skold"]["value"].is_null());
    CHECK(jb["results"][0]["figures"]["larson_skold"]["unavailable_because"].get<std::string>().find("carbonate") !=
          std::string::npos);
    const std::string text = flat(io::text_report(core(), io::ReportContext{}, items));
    CHECK(text.find("mg/L as CaCO3: calcium 99.9") != std::string::npos);  // 2.497 x 40 mg/L Ca
    CHECK(text.find("100.0 mg/L as CaCO3 (M, to pH 4.5)") != std::string::npos);
    CHECK(text.find("Aggressive Index 11.50 moderately aggressive (AWWA C400)") != std::string::npos);
}

TEST_CASE("specific conductance at 25 degC by the ionic-conductivity method (SM 2510, Onsager 1927)") {
    // The Debye-Hueckel-Onsager equation for KCl: Lambda = 149.79 - (0.2289 x 149.79 + 60.20)
    // x 0.1 / 1.1 = 141.2 S cm2/mol at 0.01 mol/L (Robinson and Stokes 1959, from memory).
    const double lambda_kcl = ionic_conductance(73.48, 1, 0.01) + ionic_conductance(76.31, -1, 0.01);
    CHECK(lambda_kcl == doctest::Approx(149.79 - (0.2289 * 149.79 + 60.20) * 0.1 / 1.1));
    // A divalent ion: the relaxation term times z^2, the electrophoretic term times |z|.
    CHECK(ionic_conductance(59.47, 2, 0.01) ==
          doctest::Approx(59.47 - (0.2289 * 4.0 * 59.47 + 60.20) * 0.1 / 1.1));
    // Never below zero, however strong the brine.
    CHECK(ionic_conductance(50.0, 2, 100.0) == 0.0);

    const auto ws = waters_of(analyses);
    // Potassium chloride conductivity standards at 25 degC, Standard Methods 2510 Table 2510:I
    // (written from memory): 0.001 M 147.0, 0.01 M 1413 (the common calibration standard),
    // 0.1 M 12 890 uS/cm. The extended Onsager equation is within 0.5 % up to 0.01 M and
    // about 1.5 % low at 0.1 M, where it is past its range.
    auto kappa = [&](const char* name) {
        const auto& w = water(ws, name);
        return water_figures(core(), w.result).specific_conductance_us_per_cm;
    };
    CHECK(kappa("kcl_0_001") == doctest::Approx(147.0).epsilon(5e-3));
    CHECK(kappa("kcl_0_01") == doctest::Approx(1413.0).epsilon(5e-3));
    CHECK(kappa("kcl_0_1") == doctest::Approx(12890.0).epsilon(2.5e-2));
    // Pure water: 18.2 megohm cm at 25 degC, 0.055 uS/cm (ASTM D1193 Type I; from H+ and OH-
    // at Kw = 1.0e-14; written from memory).
    CHECK(kappa("pure") == doctest::Approx(0.0550).epsilon(1e-2));
    // KCl waters hold no ion pairs outside the table: nothing left out.
    CHECK(water_figures(core(), water(ws, "kcl_0_01").result).conductance_charge_left_out_percent == doctest::Approx(0.0));
    // The hard water has CaHCO3+, NaSO4- and other pairs without a limiting conductance: a
    // small share is left out, and reported.
    const auto f = water_figures(core(), water(ws, "hard").result);
    CHECK(f.conductance_charge_left_out_percent > 0.0);
    CHECK(f.conductance_charge_left_out_percent < 10.0);
    // Standard Methods 1030 E (from memory): the calculated dissolved solids over the
    // conductance lie between 0.55 and 0.7 for ordinary waters.
    const double ratio = f.tds_calculated_mg_per_l / f.specific_conductance_us_per_cm;
    CHECK(ratio > 0.55);
    CHECK(ratio < 0.7);
}

TEST_CASE("a note where the Langelier family stops being meaningful (Standard Methods 2330, Davies 1962)") {
    const auto ws = waters_of(analyses);
    // An invented brine, about twice seawater's salt: ionic strength above 0.5 mol/kgw.
    const auto& b = water(ws, "sea_brine");
    REQUIRE(b.result.ionic_strength > langelier_ionic_strength_limit);
    const auto f = water_figures(core(), b.result, &b.indices);
    REQUIRE(f.notes.size() == 1);
    CHECK(f.notes[0].find("stop being meaningful") != std::string::npos);
    CHECK(f.notes[0].find("Stiff-Davis") != std::string::npos);
    // A fresh water carries no such note.
    CHECK(water_figures(core(), water(ws, "hard").result).notes.empty());
    // The note stands in the text block and the JSON.
    const std::vector<io::ReportItem> items{io::ReportItem{"water", b.result, b.indices, std::nullopt, std::nullopt}};
    CHECK(io::text_report(core(), io::ReportContext{}, items).find("stop being meaningful") != std::string::npos);
    const auto j = nlohmann::json::parse(io::json_report(core(), io::ReportContext{}, items));
    CHECK(j["results"][0]["figures"]["notes"].size() == 1);
}
