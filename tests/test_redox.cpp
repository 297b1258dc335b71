// Redox in waters: the redox level from pe, from an electrode reading against a reference
// electrode, from dissolved oxygen; iron given as ferrous and ferric apart (Fe +2, Fe +3), so the couples can
// disagree; electrons conserved through process steps. Waters are invented.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "deltag/case.hpp"
#include "deltag/constants.hpp"
#include "deltag/electro.hpp"
#include "deltag/process.hpp"
#include "deltag/water_properties.hpp"

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

TEST_CASE("Fe +2 and Fe +3 given apart: the iron couple keeps its own Eh") {
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
Fe = { "+2" = 20, "+3" = 5 }
)toml");
    // The ferric species hold exactly the Fe +3 given (5 mg/L / 55.845), the iron total both.
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
    refused("Fe = { \"+3\" = 5 }\n",
            "redox states of one element are given apart only in pairs (for example Fe = { \"+2\" = ..., \"+3\" = ... "
            "}, both above 0); for one state alone, give the element's total instead: Fe = ...");
    refused("Fe = { \"+3\" = 5, \"+2\" = 0 }\n", "only in pairs");
}

TEST_CASE("redox states the database does not know are refused, with the states it knows") {
    auto refused = [](const std::string& analytes, const char* fragment, const std::string& suggestion) {
        try {
            (void)speciate_case("[water.w]\npH = 4\nunits = \"mg/L\"\n[water.w.analytes]\nSO4 = 100\n" + analytes);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(std::string(e.what()).find(fragment) != std::string::npos);
            CHECK(e.suggestion() == suggestion);
            CHECK(e.where().line == 6);
        }
    };
    refused("Fe = { \"+2\" = 1, \"+6\" = 0.1 }\n",
            "'water.w.analytes.Fe.\"+6\"': the database 'core' has no redox state +6 of Fe; its states of Fe: +2, +3", "");
    refused("Mn = { \"+2\" = 1, \"+4\" = 0.1 }\n",
            "'water.w.analytes.Mn.\"+2\"': the database 'core' gives no redox states of Mn (it gives them for Fe); "
            "give its total instead: Mn = ...",
            "");
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
    // (O2 at 0.21 atm; CO2 at 420 ppmv, air today, common practice), then carried on at the same temperature with
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
partial_pressures = { O2 = { atm = 0.21 }, CO2 = { ppmv = 420 } }

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
    CHECK(*aerated.pe == doctest::Approx(20.78 - aerated.ph + 0.25 * std::log10(0.21)).epsilon(0.002));
    CHECK(aerated.find("NO3-")->molality > 1e3 * aerated.find("NH4+")->molality);
    CHECK(*after.pe == doctest::Approx(*aerated.pe).epsilon(1e-6));
    CHECK(after.ph == doctest::Approx(aerated.ph).epsilon(1e-9));
    CHECK(after.find("O2(aq)")->molality == doctest::Approx(aerated.find("O2(aq)")->molality).epsilon(1e-6));
}

namespace {

// An invented well water: iron reported by redox state (mostly ferrous), a low redox level,
// aerated in a cascade with the ferric hydroxide allowed to settle. The same water with iron
// as a total is the second water. `extra` goes into the aeration step.
std::string aerated_well(const std::string& iron, const std::string& extra = "") {
    return R"toml(
[water.well]
temperature_c = 25
pH = 6.9
pe = 0.5
units = "mg/L"
[water.well.analytes]
Ca = 90
Mg = 12
Na = 20
Cl = 30
SO4 = 40
Alkalinity = { value = 250, as = "CaCO3" }
)toml" + iron + R"toml(
[[step]]
label = "aerated"
kind = "equilibrate"
partial_pressures = { O2 = { atm = 0.21 }, CO2 = { ppmv = 420 } }
solids = { Ferrihydrite = { may_dissolve = false } }
)toml" + extra;
}

std::vector<process::StepOutcome> run_case(const std::string& text, std::vector<process::WaterState>* waters = nullptr) {
    const io::Case c = io::parse_case(text, "redox.toml");
    std::vector<process::WaterState> w;
    for (const auto& water : c.waters) {
        const auto in = to_speciation_input(water, core(), c.activity_model);
        w.push_back(process::state_from_result(equilibrium::speciate(core(), in), in, core()));
    }
    auto out = process::run_steps(core(), w, c.steps);
    if (waters) *waters = w;
    return out;
}

double si_of(const equilibrium::SpeciationResult& r, const std::string& phase) {
    for (const auto& s : r.saturation)
        if (s.phase == phase) return s.si;
    FAIL("no SI for " << phase);
    return 0.0;
}

bool warns(const equilibrium::SpeciationResult& r, const std::string& fragment) {
    for (const auto& w : r.warnings)
        if (w.find(fragment) != std::string::npos) return true;
    return false;
}

}  // namespace

TEST_CASE("aeration brings iron given as Fe +2 and Fe +3 to the water's redox level: ferric hydroxide settles") {
    const std::string split_iron = "Fe = { \"+2\" = 2.5, \"+3\" = 0.3 }\n";
    const auto steps = run_case(aerated_well(split_iron));
    const auto& r = steps.at(0).state.result;
    // Hand reasoning (25 degC, Nordstrom et al. 1990 log K, values from memory): open to air
    // and CO2 the water goes to pH about 8; ferrihydrite, log K 4.891 for Fe(OH)3 + 3 H+ =
    // Fe3+ + 3 H2O, leaves a(Fe3+) = 10^(4.891 - 3 pH) ~ 1e-19, and the dominant Fe(OH)4-
    // (log K -21.6 from Fe3+) 10^(4.891 - 21.6 + pH) ~ 2e-9 mol/kg ~ 1e-4 mg/L. In water at
    // the O2/H2O potential (about 0.75 V at pH 8, Bard et al. 1985) Fe2+/Fe3+ (E° 0.771 V)
    // keeps a(Fe2+) of the same order as a(Fe3+): ferrous iron is gone too. So dissolved
    // iron is far below 0.01 mg/L.
    const double fe_mg_per_l = r.element_totals.at("Fe") * 55.845e3 * r.kg_water_per_litre;
    CHECK(fe_mg_per_l < 0.01);
    // One redox level: the iron couple reads what the oxygen couple reads (a few mV apart at
    // most, from the rounding of the data: the two are one pe here).
    CHECK(std::abs(couple_eh(r, "Fe^3+/Fe^2+") - couple_eh(r, "O2(aq)/H2O")) < 0.005);
    // Siderite needs ferrous iron: undersaturated in fully aerated water.
    CHECK(si_of(r, "Siderite") < 0.0);
    // The step says what it did, and the iron is carried merged afterwards.
    CHECK(warns(r, "Fe given by redox state (Fe +2, Fe +3) brought to the step's redox level"));
    CHECK(steps.at(0).state.basis.redox_splits.empty());
    // The same water given as total iron ends the same way (that already worked).
    const auto total = run_case(aerated_well("Fe = 2.8\n"));
    CHECK(total.at(0).state.result.element_totals.at("Fe") ==
          doctest::Approx(r.element_totals.at("Fe")).epsilon(1e-3).scale(0));
}

TEST_CASE("keep_redox_states_apart = true keeps the iron couple apart, and the report says so") {
    const std::string split_iron = "Fe = { \"+2\" = 2.5, \"+3\" = 0.3 }\n";
    const auto steps = run_case(aerated_well(split_iron, "keep_redox_states_apart = true\n"));
    const auto& r = steps.at(0).state.result;
    CHECK(warns(r, "Fe given by redox state (Fe +2, Fe +3) kept apart by choice (keep_redox_states_apart = true)"));
    CHECK(!steps.at(0).state.basis.redox_splits.empty());
    // Apart, the couples disagree (the iron keeps its low potential).
    CHECK(couple_eh(r, "O2(aq)/H2O") - couple_eh(r, "Fe^3+/Fe^2+") > 0.2);
    // Ferrihydrite settles from the ferric iron only; what is carried as ferric afterwards
    // is what the dissolved species hold (electrons of the iron species, counted by hand).
    double ferric = 0.0;
    for (const auto& s : r.species) {
        double nu_e = 0.0, fe = 0.0;
        for (const auto& [j, v] : core().species()[s.species].formation) {
            if (j == *core().electron()) nu_e = v;
            if (core().species()[j].name == "Fe^2+") fe = v;
        }
        if (fe > 0) ferric += -nu_e * s.molality;
    }
    REQUIRE(steps.at(0).state.basis.redox_splits.size() == 1);
    CHECK(-steps.at(0).state.basis.redox_splits[0].electron_total == doctest::Approx(ferric).epsilon(1e-9).scale(0));
}

TEST_CASE("an oxidant dose and an equilibrate step merge the redox states; a plain temperature change does not") {
    const std::string waters = R"toml(
[water.w]
pH = 6.8
pe = 1.0
units = "mg/L"
[water.w.analytes]
Ca = 50
Na = 20
Cl = 40
Alkalinity = { value = 150, as = "CaCO3" }
Fe = { "+2" = 1.0, "+3" = 0.2 }
)toml";
    std::vector<process::WaterState> w;
    const auto steps = run_case(waters + R"toml(
[[step]]
label = "warm"
kind = "temperature"
temperature_c = 30
[[step]]
label = "hypochlorite"
water = "w"
kind = "dose"
reagent = "NaOCl"
amount = { value = 0.02, unit = "mmol/kgw" }
)toml", &w);
    // A temperature change brings no redox level: the states stay apart, electrons conserved
    // (the ferric iron given: 0.2 mg/L / 55.845 g/mol, per kg of water).
    REQUIRE(steps.at(0).state.basis.redox_splits.size() == 1);
    CHECK(steps.at(0).state.basis.redox_splits[0].electron_total ==
          doctest::Approx(w[0].basis.redox_splits[0].electron_total).epsilon(1e-9).scale(0));
    CHECK(!warns(steps.at(0).state.result, "redox level"));
    // The oxidant dose merges them: the electron total of the whole water is the water's, the
    // iron's and the dose's (2 e- taken per NaOCl).
    const auto& dosed = steps.at(1).state;
    CHECK(dosed.basis.redox_splits.empty());
    CHECK(warns(dosed.result, "brought to the step's redox level"));
    const double expected = *w[0].basis.electron_total + w[0].basis.redox_splits[0].electron_total - 2 * 0.02e-3;
    CHECK(dosed.result.component_totals[*core().electron()] == doctest::Approx(expected).epsilon(1e-9).scale(0));
    CHECK(*dosed.basis.electron_total == doctest::Approx(expected).epsilon(1e-9).scale(0));
}

TEST_CASE("blends carry redox states apart as electron totals, and merge them only against a water at its redox level") {
    std::vector<process::WaterState> w;
    const auto steps = run_case(R"toml(
[water.ferrous]
pH = 6.9
pe = 0.5
units = "mg/L"
[water.ferrous.analytes]
Ca = 60
Na = 20
Cl = 30
Alkalinity = { value = 180, as = "CaCO3" }
Fe = { "+2" = 2.0, "+3" = 0.4 }

[water.soft]
pH = 7.2
units = "mg/L"
[water.soft.analytes]
Ca = 10
Na = 10
Cl = 12
Alkalinity = { value = 30, as = "CaCO3" }

[water.oxic]
pH = 7.4
pe = 12
units = "mg/L"
[water.oxic.analytes]
Ca = 30
Na = 10
Cl = 15
Alkalinity = { value = 80, as = "CaCO3" }
Fe = 0.1

[[step]]
label = "with soft"
kind = "blend"
waters = { ferrous = 0.5, soft = 0.5 }
by = "mass"

[[step]]
label = "with oxic"
kind = "blend"
waters = { ferrous = 0.5, oxic = 0.5 }
by = "mass"
)toml", &w);
    // Mass balance (definition): a blend's electron totals are the water-weighted means. By
    // mass, each water's kg of water per kg of solution weighs it.
    auto weight = [](const process::WaterState& x) {
        return x.result.kg_water_per_litre / (deltag::thermo::water_density_kg_m3(x.result.temperature_c) / 1000.0);
    };
    {
        const auto& b = steps.at(0).state;
        const double wa = weight(w[0]), wb = weight(w[1]);
        REQUIRE(b.basis.redox_splits.size() == 1);
        CHECK(b.basis.redox_splits[0].electron_total ==
              doctest::Approx(wa / (wa + wb) * w[0].basis.redox_splits[0].electron_total).epsilon(1e-9).scale(0));
        CHECK(!warns(b.result, "redox level"));
    }
    {
        const auto& b = steps.at(1).state;
        const double wa = weight(w[0]), wc = weight(w[2]);
        CHECK(b.basis.redox_splits.empty());
        CHECK(warns(b.result, "Fe given by redox state (Fe +2, Fe +3) in one water and at the redox level of another"));
        const double expected = (wa * (*w[0].basis.electron_total + w[0].basis.redox_splits[0].electron_total) +
                                 wc * *w[2].basis.electron_total) / (wa + wc);
        CHECK(*b.basis.electron_total == doctest::Approx(expected).epsilon(1e-9).scale(0));
    }
}

TEST_CASE("ferric chloride into a water whose iron is kept apart: its electrons go to the iron") {
    std::vector<process::WaterState> w;
    const auto steps = run_case(R"toml(
[water.w]
pH = 6.9
pe = 0.5
units = "mg/L"
[water.w.analytes]
Ca = 60
Na = 20
Cl = 30
Alkalinity = { value = 180, as = "CaCO3" }
Fe = { "+2" = 2.0, "+3" = 0.4 }

[[step]]
label = "coagulant"
kind = "dose"
reagent = "FeCl3"
amount = { value = 0.05, unit = "mmol/kgw" }
keep_redox_states_apart = true
)toml", &w);
    const auto& d = steps.at(0).state;
    // FeCl3 is ferric iron: 1 e- short per mole (Fe3+ = Fe2+ - e-), all of it the iron's.
    REQUIRE(d.basis.redox_splits.size() == 1);
    CHECK(d.basis.redox_splits[0].electron_total ==
          doctest::Approx(w[0].basis.redox_splits[0].electron_total - 0.05e-3).epsilon(1e-9).scale(0));
    // The water's own electrons are untouched (absolute: they are near 0 at pe 0.5).
    CHECK(std::abs(*d.basis.electron_total - *w[0].basis.electron_total) < 1e-15);
    CHECK(warns(d.result, "kept apart"));
}
