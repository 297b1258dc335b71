// What a water will do, mineral by mineral (process::mineral_outlook), and the Langelier and
// Ryznar readings: against published values and against properties of the equilibrium.
#include <doctest/doctest.h>

#include <cmath>

#include "deltag/outlook.hpp"
#include "deltag/process.hpp"
#include "deltag/report.hpp"
#include "text_match.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

ComponentInput total(const char* name, double v) {
    return ComponentInput{*core().find_species(name), ComponentInput::Kind::total, v};
}

process::WaterState state(SpeciationInput in) {
    const SpeciationResult r = speciate(core(), in);
    return process::state_from_result(r, in, core());
}

const process::MineralOutlook* find(const process::Outlook& o, std::string_view name) {
    for (const auto& m : o.minerals)
        if (m.mineral == name) return &m;
    return nullptr;
}

// Invented hard, alkaline water at 25 degC, supersaturated with calcite.
SpeciationInput hard_water(double ph) {
    SpeciationInput in;
    in.label = "hard (invented)";
    in.temperature_c = 25.0;
    in.ph = ph;
    in.components = {total("Ca^2+", 3e-3), total("HCO3-", 5e-3), total("Cl-", 1e-3), total("Na+", 1e-3),
                     total("SO4^2-", 1e-3)};
    return in;
}

}  // namespace

TEST_CASE("the amount of calcite to equilibrium is the CCPP, deposit and dissolve (closed system, both ways)") {
    for (double ph : {8.2, 6.8}) {
        CAPTURE(ph);
        const process::WaterState w = state(hard_water(ph));
        REQUIRE(w.indices.ccpp_available);
        const process::Outlook o = process::mineral_outlook(core(), w, -10.0);
        const auto* calcite = find(o, "Calcite");
        REQUIRE(calcite != nullptr);
        REQUIRE(calcite->amount_available);
        // CaCO3 is calcite's formula: the same mass as the CCPP in mg/L as CaCO3.
        CHECK(calcite->mg_per_l == doctest::Approx(w.indices.ccpp_mg_per_l).epsilon(1e-9));
        CHECK((calcite->mg_per_l > 0) == (calcite->si > 0));  // deposits when supersaturated
        CHECK(calcite->mmol_per_kgw * 100.087 * w.result.kg_water_per_litre ==
              doctest::Approx(calcite->mg_per_l).epsilon(1e-3));
        CHECK(calcite->tendency == (ph > 7.5 ? process::Tendency::scale_forming : process::Tendency::dissolving));
    }
}

TEST_CASE("gypsum dissolves in near-pure water to its published solubility") {
    // Solubility of gypsum in pure water at 25 degC: 15.4 mmol/kg (Marshall and Slusher 1966,
    // J. Phys. Chem. 70:4015; written from memory; the CRC Handbook's 0.205 g CaSO4 per 100 g of
    // water is 15.1 mmol/kg). A water with 0.1 mmol/kgw of CaSO4 takes up the rest. The
    // activity model (Truesdell-Jones at I about 0.05) and the ion pair CaSO4(aq) set how close
    // a speciation model comes: 7 %.
    SpeciationInput in;
    in.label = "near-pure (invented)";
    in.temperature_c = 25.0;
    in.ph = 7.0;
    in.activity_model = activity::ModelKind::truesdell_jones;
    in.components = {total("Ca^2+", 1e-4), total("SO4^2-", 1e-4)};
    const process::WaterState w = state(in);
    const process::Outlook o = process::mineral_outlook(core(), w, -10.0);
    const auto* gypsum = find(o, "Gypsum");
    REQUIRE(gypsum != nullptr);
    REQUIRE(gypsum->amount_available);
    CHECK(gypsum->tendency == process::Tendency::dissolving);
    CHECK(-gypsum->mmol_per_kgw + 0.1 == doctest::Approx(15.3).epsilon(0.07));
    CHECK(gypsum->mg_per_l < 0);
}

TEST_CASE("the outlook lists minerals above the floor by risk, counts the rest, notes the slow ones") {
    SpeciationInput in = hard_water(8.4);
    in.components.push_back(total("Mg^2+", 2e-3));
    in.components.push_back(total("H4SiO4", 0.5e-3));
    const process::WaterState w = state(in);
    const process::Outlook o = process::mineral_outlook(core(), w, -1.0);
    std::size_t minerals = 0;
    for (const auto& s : w.result.saturation) minerals += s.is_gas ? 0 : 1;
    CHECK(o.minerals.size() + o.far_below == minerals);
    for (const auto& m : o.minerals) CHECK(m.si >= -1.0);
    // Scale-forming first; quartz and dolomite (noted: they form too slowly) after calcite.
    REQUIRE(find(o, "Calcite") != nullptr);
    REQUIRE(find(o, "Dolomite") != nullptr);
    REQUIRE(find(o, "Quartz") != nullptr);
    CHECK(find(o, "Dolomite")->si > find(o, "Calcite")->si);
    CHECK_FALSE(find(o, "Dolomite")->note.empty());
    CHECK_FALSE(find(o, "Quartz")->note.empty());
    CHECK(find(o, "Calcite")->note.empty());
    CHECK(o.minerals.front().mineral == "Calcite");
    for (std::size_t i = 1; i < o.minerals.size(); ++i)
        CHECK(static_cast<int>(o.minerals[i - 1].tendency) <= static_cast<int>(o.minerals[i].tendency));
    // The same list without solving carries no amounts, and says why.
    const process::Outlook quick = process::saturation_outlook(core(), w.result, -1.0);
    CHECK(quick.minerals.size() == o.minerals.size());
    for (const auto& m : quick.minerals) {
        CHECK_FALSE(m.amount_available);
        CHECK_FALSE(m.why_not.empty());
    }
}

TEST_CASE("tendency in words: balanced within the log K uncertainty of 0.05") {
    CHECK(process::tendency_of(0.05) == process::Tendency::balanced);
    CHECK(process::tendency_of(-0.05) == process::Tendency::balanced);
    CHECK(process::tendency_of(0.051) == process::Tendency::scale_forming);
    CHECK(process::tendency_of(-0.051) == process::Tendency::dissolving);
    CHECK(process::tendency_text(process::Tendency::scale_forming) == "scale-forming");
}

TEST_CASE("Langelier (1936) and Ryznar (1944) readings at their class limits") {
    CHECK(process::langelier_reading(0.5).starts_with("scale-forming"));
    CHECK(process::langelier_reading(-0.5).starts_with("dissolves calcium carbonate"));
    CHECK(process::langelier_reading(0.04).starts_with("balanced"));
    CHECK(process::langelier_reading(0.054).starts_with("balanced"));  // prints as +0.05
    // Ryznar's classes (as reproduced in the water-treatment handbooks).
    CHECK(process::ryznar_reading(4.5) == "heavy scale");
    CHECK(process::ryznar_reading(5.5) == "light scale");
    CHECK(process::ryznar_reading(6.5) == "little scale or corrosion");
    CHECK(process::ryznar_reading(7.2) == "significant corrosion");
    CHECK(process::ryznar_reading(8.0) == "heavy corrosion");
    CHECK(process::ryznar_reading(9.5) == "intolerable corrosion");
    CHECK(process::ryznar_reading(6.004) == "light scale");  // prints as 6.00: the lower class
}

TEST_CASE("the report's first section is the outlook, with the amounts from the outlook") {
    const process::WaterState w = state(hard_water(8.2));
    const process::Outlook o = process::mineral_outlook(core(), w);
    const io::ReportItem item{"water", w.result, w.indices, std::nullopt, o};
    const std::string t = flat(io::text_report(core(), io::ReportContext{}, {item}));
    const auto* calcite = find(o, "Calcite");
    REQUIRE(calcite != nullptr);
    const auto at = t.find("Calcite scale-forming");
    REQUIRE(at != std::string::npos);
    CHECK(at < t.find("The water at a glance"));
    CHECK(t.find("mg/L would deposit", at) < t.find("The water at a glance"));
    CHECK(t.find("Langelier (LSI)") < t.find("The water at a glance"));
    CHECK(t.find("Ryznar (RSI)") < t.find("The water at a glance"));
}
