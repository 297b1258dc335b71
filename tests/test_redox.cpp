// Redox in waters: the redox level from pe, from an electrode reading against a reference
// electrode, from dissolved oxygen; iron given as Fe(2) and Fe(3) apart, so the couples can
// disagree; electrons conserved through process steps. Waters are invented.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "deltag/case.hpp"
#include "deltag/constants.hpp"
#include "deltag/electro.hpp"
#include "deltag/process.hpp"

using namespace deltag;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

equilibrium::SpeciationResult speciate_case(const std::string& text, std::size_t which = 0) {
    const io::Case c = io::parse_case(text, "redox.toml");
    const auto in = to_speciation_input(c.waters.at(which), core(), c.activity_model);
    return equilibrium::speciate(core(), in);
}

double couple_eh(const equilibrium::SpeciationResult& r, const std::string& couple) {
    for (const auto& c : electro::couple_potentials(core(), r))
        if (c.couple == couple) return c.eh_v;
    FAIL("no couple " << couple);
    return 0.0;
}

}  // namespace

TEST_CASE("an ORP reading against a reference electrode becomes pe at the water's temperature") {
    // +180 mV on Ag/AgCl (3 M KCl) at 25 degC: Eh = 0.180 + 0.210 = 0.390 V (common-practice
    // reference value); pe = F Eh / (RT ln10) = 0.390 / 0.0591597 = 6.592.
    const auto r = speciate_case(R"toml(
[water.w]
pH = 7.2
eh_mv = 180
reference = "Ag/AgCl(3 M KCl)"
units = "mmol/kgw"
[water.w.analytes]
Na = 1
Cl = 1
)toml");
    REQUIRE(r.pe.has_value());
    CHECK(*r.pe == doctest::Approx(0.390 / 0.0591597).epsilon(1e-5));
    CHECK(electro::eh_from_pe(*r.pe, 25.0) == doctest::Approx(0.390).epsilon(1e-9));
}

TEST_CASE("dissolved oxygen sets pe through the O2/H2O couple") {
    // 8.26 mg/L O2 is air saturation at 25 degC (about 2.58e-4 mol/kg; common practice). The
    // O2(aq) the speciation then holds must be the oxygen given.
    const auto r = speciate_case(R"toml(
[water.w]
pH = 7.0
dissolved_oxygen_mg_per_l = 8.26
units = "mmol/kgw"
[water.w.analytes]
Na = 1
Cl = 1
)toml");
    REQUIRE(r.pe.has_value());
    const double m_o2 = 8.26e-3 / 31.998 / r.kg_water_per_litre;
    CHECK(r.find("O2(aq)")->molality == doctest::Approx(m_o2).epsilon(0.02));  // gamma(O2) taken as 1
    // An aerated neutral water sits near pe 13.6 (Eh about 0.8 V): common practice.
    CHECK(*r.pe > 13.0);
    CHECK(*r.pe < 14.0);
}

TEST_CASE("Fe(2) and Fe(3) given apart: the iron couple keeps its own Eh") {
    const auto r = speciate_case(R"toml(
[water.w]
temperature_c = 15
pH = 3.0
dissolved_oxygen_mg_per_l = 5
units = "mg/L"
[water.w.analytes]
SO4 = 300
Na = 60
Ca = 40
"Fe(2)" = 20
"Fe(3)" = 5
)toml");
    // The ferric species hold exactly the Fe(3) given (5 mg/L / 55.845), the iron total both.
    double ferric = 0.0;
    for (const auto& s : r.species) {
        double nu_e = 0.0, fe = 0.0;
        for (const auto& [j, v] : core().species()[s.species].formation) {
            if (j == *core().electron()) nu_e = v;
            if (core().species()[j].name == "Fe^2+") fe = v;
        }
        if (fe > 0) ferric += -nu_e * s.molality;
    }
    CHECK(ferric == doctest::Approx(5e-3 / 55.845 / r.kg_water_per_litre).epsilon(1e-9));
    CHECK(r.element_totals.at("Fe") == doctest::Approx(25e-3 / 55.845 / r.kg_water_per_litre).epsilon(1e-9));
    // The oxygen couple and the iron couple disagree: disequilibrium is visible.
    const double eh_o2 = couple_eh(r, "O2(aq)/H2O");
    const double eh_fe = couple_eh(r, "Fe^3+/Fe^2+");
    CHECK(eh_o2 - eh_fe > 0.2);
    // Fe3+/Fe2+: Eh = E° + slope log(a3/a2) with the speciated activities (E° from log K -13.02).
    const double slope = constants::nernst_slope_v(288.15);
    const double e0 = 13.02 * slope;  // log K at 15 degC differs; compare through the database
    const double lk = core().species()[*core().find_species("Fe^3+")].log_k(15.0);
    const double expected = -lk * slope + slope * std::log10(r.find("Fe^3+")->activity / r.find("Fe^2+")->activity);
    CHECK(eh_fe == doctest::Approx(expected).epsilon(1e-9));
    CHECK(e0 > 0.7);
}

TEST_CASE("redox-state analytes come in pairs and not with the element's total") {
    auto refused = [](const std::string& analytes, const char* fragment) {
        CHECK_THROWS_WITH_AS(speciate_case("[water.w]\npH = 4\nunits = \"mg/L\"\n[water.w.analytes]\nSO4 = 100\n" + analytes),
                             doctest::Contains(fragment), InputError);
    };
    refused("\"Fe(3)\" = 5\n", "only in pairs");
    refused("Fe = 5\n\"Fe(3)\" = 5\n\"Fe(2)\" = 1\n", "give only one of them");
}

TEST_CASE("one redox level only; dissolved oxygen needs a pH and must be above 0") {
    CHECK_THROWS_WITH_AS(speciate_case("[water.w]\ncharge_balance = \"pH\"\ndissolved_oxygen_mg_per_l = 8\n[water.w.analytes]\nNa = 1\nCl = 1\n"),
                         doctest::Contains("only with a measured pH"), InputError);
    CHECK_THROWS_WITH_AS(speciate_case("[water.w]\npH = 7\ndissolved_oxygen_mg_per_l = 0\n[water.w.analytes]\nNa = 1\nCl = 1\n"),
                         doctest::Contains("gives no redox level"), InputError);
    // Built in code (the case reader stops this earlier): two redox levels at once.
    WaterAnalysis w;
    w.name = "w";
    w.ph = 7.0;
    w.pe = 4.0;
    w.eh_mv = 100.0;
    w.eh_where = SourceLocation{"code", 1, 1};
    CHECK_THROWS_WITH_AS(to_speciation_input(w, core(), activity::ModelKind::davies), doctest::Contains("give one redox level"),
                         InputError);
    // A database without O2(aq) cannot use dissolved oxygen.
    const thermo::Database bare = thermo::Database::parse(R"toml(
[sources.s]
citation = "A fixture for a test, no published source needed"
[components.H2O]
source = "s"
[components."H+"]
source = "s"
[components."e-"]
source = "s"
)toml", "bare.toml");
    WaterAnalysis d;
    d.name = "d";
    d.ph = 7.0;
    d.dissolved_oxygen_mg_per_l = 8.0;
    CHECK_THROWS_WITH_AS(to_speciation_input(d, bare, activity::ModelKind::davies), doctest::Contains("has no O2(aq)"), InputError);
}

TEST_CASE("electrons are conserved through steps: oxygen does not appear from nothing") {
    const io::Case c = io::parse_case(R"toml(
[water.w]
pH = 7.5
dissolved_oxygen_mg_per_l = 8
units = "mg/L"
[water.w.analytes]
Ca = 40
Na = 10
Cl = 15
Alkalinity = { value = 100, as = "CaCO3" }

[[step]]
label = "acid"
kind = "dose"
reagent = "HCl"
amount = { value = 1, unit = "mmol/kgw" }

[[step]]
label = "hot"
kind = "temperature"
temperature_c = 60
)toml", "redox.toml");
    const auto in = to_speciation_input(c.waters[0], core(), c.activity_model);
    std::vector<process::WaterState> waters{process::state_from_result(equilibrium::speciate(core(), in), in, core())};
    const auto steps = process::run_steps(core(), waters, c.steps);
    const double o2_before = waters[0].result.find("O2(aq)")->molality;
    for (const auto& s : steps) {
        CAPTURE(s.label);
        REQUIRE(s.state.result.pe.has_value());
        // Oxygen is nearly all of the electrons here: its molality stays put.
        CHECK(s.state.result.find("O2(aq)")->molality == doctest::Approx(o2_before).epsilon(1e-6));
    }
    // The indices of an aerated water solve too (pHs with the electrons conserved).
    CHECK(waters[0].indices.available);
}

TEST_CASE("a gas that brings electrons (oxygen) changes the electrons the water carries on") {
    // An invented anoxic well (pe -3: its nitrogen lives as ammonium) aerated with air
    // (O2 at 0.21 atm, log -0.68; CO2 at -3.4), then carried on at the same temperature with
    // no gas. The water after aeration sits on the O2/H2O line (Stumm & Morgan 1996:
    // pe = 20.78 - pH + 0.25 log p(O2) at 25 degC) and its ammonium is oxidised to nitrate;
    // the next step must find the same water: the oxygen taken up (4 e- per O2) is part of
    // the electrons it carries, or the step would put the nitrogen back as ammonium.
    const io::Case c = io::parse_case(R"toml(
[water.well]
pH = 7.05
pe = -3.0
units = "mg/L"
[water.well.analytes]
Ca = 142
Mg = 31
Na = 18.5
Cl = 42
SO4 = 96
Alkalinity = { value = 372, as = "CaCO3" }
NO3 = { value = 0.8, as = "N" }

[[step]]
label = "aerate"
kind = "equilibrate"
gases = { "O2(g)" = -0.68, "CO2(g)" = -3.4 }

[[step]]
label = "carried on"
kind = "temperature"
temperature_c = 25
)toml", "redox.toml");
    const auto in = to_speciation_input(c.waters[0], core(), c.activity_model);
    std::vector<process::WaterState> waters{process::state_from_result(equilibrium::speciate(core(), in), in, core())};
    const auto steps = process::run_steps(core(), waters, c.steps);
    REQUIRE(steps.size() == 2);
    const auto& aerated = steps[0].state.result;
    const auto& after = steps[1].state.result;
    REQUIRE(aerated.pe.has_value());
    REQUIRE(after.pe.has_value());
    CHECK(*aerated.pe == doctest::Approx(20.78 - aerated.ph + 0.25 * -0.68).epsilon(0.002));
    CHECK(aerated.find("NO3-")->molality > 1e3 * aerated.find("NH4+")->molality);
    CHECK(*after.pe == doctest::Approx(*aerated.pe).epsilon(1e-6));
    CHECK(after.ph == doctest::Approx(aerated.ph).epsilon(1e-9));
    CHECK(after.find("O2(aq)")->molality == doctest::Approx(aerated.find("O2(aq)")->molality).epsilon(1e-6));
}
