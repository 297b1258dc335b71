// Process steps: conservation through every kind of step, doses found for a target,
// blending, concentrating, temperature, the water-treatment indices and sweeps. Cases are
// parsed from text (invented waters) and run through the library.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "deltag/case.hpp"
#include "deltag/constants.hpp"
#include "deltag/process.hpp"

using namespace deltag;
using namespace deltag::process;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

struct Run {
    io::Case c;
    std::vector<WaterState> waters;
    std::vector<StepOutcome> steps;
};

Run run(const std::string& text) {
    Run r;
    r.c = io::parse_case(text, "test.toml");
    for (const auto& w : r.c.waters) {
        const auto in = to_speciation_input(w, core(), r.c.activity_model);
        r.waters.push_back(state_from_result(equilibrium::speciate(core(), in), in, core()));
    }
    r.steps = run_steps(core(), r.waters, r.c.steps);
    return r;
}

const StepOutcome& step(const Run& r, const std::string& label) {
    for (const auto& s : r.steps)
        if (s.label == label) return s;
    FAIL("no step " << label);
    return r.steps.front();
}

double total(const WaterState& w, const char* el) {
    auto it = w.result.element_totals.find(el);
    return it == w.result.element_totals.end() ? 0.0 : it->second;
}

double si(const WaterState& w, const std::string& phase) {
    for (const auto& s : w.result.saturation)
        if (s.phase == phase) return s.si;
    FAIL("no SI for " << phase);
    return 0.0;
}

// An invented hard, slightly alkaline water.
const std::string water = R"toml(
title = "process test water (invented)"
[water.raw]
temperature_c = 20
pH = 7.9
units = "mg/L"
[water.raw.analytes]
Ca = 80
Mg = 12
Na = 30
K = 4
Cl = 45
SO4 = 60
Alkalinity = { value = 220, as = "CaCO3" }
SiO2 = 15

[water.soft]
temperature_c = 10
pH = 6.8
units = "mg/L"
[water.soft.analytes]
Ca = 6
Na = 8
Cl = 10
Alkalinity = { value = 15, as = "CaCO3" }
)toml";

void check_relative(double got, double expected, double rel) {
    CHECK(std::abs(got - expected) <= rel * std::abs(expected));
}

}  // namespace

TEST_CASE("a water carried as totals and its charge imbalance reproduces its analysis") {
    const Run r = run(water);
    const WaterState& raw = r.waters.front();
    const auto again = equilibrium::speciate(core(), raw.basis);
    CHECK(again.ph == doctest::Approx(7.9).epsilon(1e-9));
    CHECK(again.ionic_strength == doctest::Approx(raw.result.ionic_strength).epsilon(1e-9));
}

TEST_CASE("concentrating by 2 doubles Na and Cl exactly; every element scales by the factor") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "two cycles"
kind = "concentrate"
factor = 2
)toml");
    const WaterState& before = r.waters.front();
    const WaterState& after = step(r, "two cycles").state;
    for (const char* el : {"Na", "Cl", "Ca", "Mg", "K", "S", "C", "Si"}) {
        CAPTURE(el);
        check_relative(total(after, el), 2.0 * total(before, el), 1e-10);
    }
}

TEST_CASE("concentrate with precipitation: calcite leaves, Ca and C fall by what precipitated") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "six cycles"
kind = "concentrate"
factor = 6
precipitate = ["Calcite"]
)toml");
    const WaterState& before = r.waters.front();
    const WaterState& after = step(r, "six cycles").state;
    REQUIRE(after.result.transfers.size() == 1);
    const double xi = after.result.transfers[0].moles;
    CHECK(xi < 0);
    check_relative(total(after, "Ca"), 6.0 * total(before, "Ca") + xi, 1e-10);
    check_relative(total(after, "C"), 6.0 * total(before, "C") + xi, 1e-10);
    check_relative(total(after, "Na"), 6.0 * total(before, "Na"), 1e-10);
    CHECK(std::abs(si(after, "Calcite")) < 1e-8);
}

TEST_CASE("dose: a fixed amount adds exactly its elements") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "lime"
kind = "dose"
reagent = "Ca(OH)2"
amount = { value = 0.4, unit = "mmol/kgw" }

[[step]]
water = "raw"
label = "salt"
kind = "dose"
reagent = "CaCl2"
amount = { value = 55.49, unit = "mg/kgw" }
)toml");
    const WaterState& before = r.waters.front();
    const WaterState& lime = step(r, "lime").state;
    check_relative(total(lime, "Ca"), total(before, "Ca") + 0.4e-3, 1e-10);
    check_relative(total(lime, "C"), total(before, "C"), 1e-10);
    CHECK(lime.result.ph > before.result.ph);
    // 55.49 mg CaCl2 = 0.5 mmol (M = 40.078 + 2 x 35.45 = 110.978 g/mol, IUPAC 2021).
    const WaterState& salt = step(r, "salt").state;
    check_relative(total(salt, "Ca"), total(before, "Ca") + 55.49 / 110.978 * 1e-3, 1e-9);
    check_relative(total(salt, "Cl"), total(before, "Cl") + 2 * 55.49 / 110.978 * 1e-3, 1e-9);
    REQUIRE(step(r, "salt").dose.has_value());
    CHECK(step(r, "salt").dose->mol_per_kgw == doctest::Approx(55.49 / 110.978 * 1e-3).epsilon(1e-9));
    bool cautioned = false;
    for (const auto& w : salt.result.warnings) cautioned = cautioned || w.find("licensed practice") != std::string::npos;
    CHECK(cautioned);
}

TEST_CASE("dose until a target: pH, SI, alkalinity and Langelier index reached to 1e-6") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "acid to pH 7"
kind = "dose"
reagent = "H2SO4"
until = { pH = 7.0 }

[[step]]
water = "raw"
label = "caustic to calcite saturation"
kind = "dose"
reagent = "NaOH"
until = { si = { Calcite = 0.8 } }

[[step]]
water = "soft"
label = "soda ash to 1 meq/L"
kind = "dose"
reagent = "Na2CO3"
until = { alkalinity_meq_per_l = 1.0 }

[[step]]
water = "raw"
label = "acid to LSI 0"
kind = "dose"
reagent = "HCl"
until = { langelier = 0.0 }

[[step]]
water = "soft"
label = "CO2 to pH 6"
kind = "dose"
reagent = "CO2"
until = { pH = 6.0 }
)toml");
    CHECK(std::abs(step(r, "acid to pH 7").state.result.ph - 7.0) <= 1e-6);
    CHECK(std::abs(si(step(r, "caustic to calcite saturation").state, "Calcite") - 0.8) <= 1e-6);
    const auto& soda = step(r, "soda ash to 1 meq/L").state.result;
    CHECK(std::abs(soda.alkalinity_eq * 1000 * soda.kg_water_per_litre - 1.0) <= 1e-6);
    const auto& lsi = step(r, "acid to LSI 0").state.indices;
    REQUIRE(lsi.available);
    CHECK(std::abs(lsi.langelier) <= 1e-6);
    CHECK(std::abs(step(r, "CO2 to pH 6").state.result.ph - 6.0) <= 1e-6);
    // Sulfate rises by exactly the acid found.
    const auto& acid = step(r, "acid to pH 7");
    check_relative(total(acid.state, "S"), total(r.waters.front(), "S") + acid.dose->mol_per_kgw, 1e-10);
    CHECK(acid.dose->found_by_target);
}

TEST_CASE("an unreachable target ends with a clear error") {
    auto fails_with = [](const std::string& steps, const char* fragment) {
        try {
            (void)run(water + steps);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(std::string(e.what()).find(fragment) != std::string::npos);
            CHECK(e.where().line > 0);
        }
    };
    // Adding caustic cannot lower the pH.
    fails_with(R"toml(
[[step]]
water = "raw"
kind = "dose"
reagent = "NaOH"
until = { pH = 6.5 }
)toml", "it cannot bring it to 6.5");
    // Within a small largest dose the target is not reached.
    fails_with(R"toml(
[[step]]
water = "raw"
kind = "dose"
reagent = "HCl"
until = { pH = 4.0 }
max_amount = { value = 0.01, unit = "mmol/kgw" }
)toml", "not reached within that dose");
}

TEST_CASE("reagents split onto the components") {
    const SourceLocation at{"test.toml", 3, 1};
    auto coefficient = [](const ReagentSplit& s, const char* comp) {
        for (const auto& [j, k] : s.components)
            if (core().species()[j].name == comp) return k;
        return 0.0;
    };
    const ReagentSplit hcl = split_reagent(core(), "HCl", at);
    CHECK(coefficient(hcl, "Cl-") == 1.0);
    CHECK(hcl.protons == 1.0);
    const ReagentSplit naoh = split_reagent(core(), "NaOH", at);
    CHECK(naoh.protons == -1.0);
    CHECK(naoh.water == 1.0);
    const ReagentSplit co2 = split_reagent(core(), "CO2", at);
    CHECK(coefficient(co2, "HCO3-") == 1.0);
    CHECK(co2.protons == 1.0);
    CHECK(co2.water == -1.0);
    const ReagentSplit soda = split_reagent(core(), "Na2CO3", at);
    CHECK(coefficient(soda, "Na+") == 2.0);
    CHECK(soda.protons == -1.0);
    const ReagentSplit mgo = split_reagent(core(), "MgO", at);
    CHECK(coefficient(mgo, "Mg^2+") == 1.0);
    CHECK(mgo.protons == -2.0);
    CHECK(split_reagent(core(), "H2SO4", at).protons == 2.0);
    CHECK(split_reagent(core(), "NaHCO3", at).protons == 0.0);
    CHECK(split_reagent(core(), "Ca(OH)2", at).molar_mass_g == doctest::Approx(74.092).epsilon(1e-4));

    auto refused = [&](const char* formula, const char* fragment) {
        CHECK_THROWS_WITH_AS(split_reagent(core(), formula, at), doctest::Contains(fragment), InputError);
    };
    refused("LiOH", "no component of the database 'core' carries Li");
    // Redox reagents carry electrons: NaOCl -> Na+ + Cl- + H2O - 2 H+ - 2 e- (Cl(+1) to Cl(-1));
    // KMnO4 -> K+ + Mn^2+ + 4 H2O - 8 H+ - 5 e- (Mn(VII) to Mn(II)); Na2SO3 gives 2 e- (S(IV)
    // to S(VI)); H2O2 -> 2 H2O - 2 H+ - 2 e-.
    CHECK(split_reagent(core(), "NaOCl", at).electrons == -2.0);
    CHECK(split_reagent(core(), "KMnO4", at).electrons == -5.0);
    CHECK(split_reagent(core(), "Na2SO3", at).electrons == 2.0);
    CHECK(split_reagent(core(), "H2O2", at).electrons == -2.0);
    CHECK(split_reagent(core(), "HCl", at).electrons == 0.0);
    refused("H2O", "brings nothing but water");
    refused("Na+", "neutral substance");
    refused("Xq2", "cannot read the reagent formula");
}

TEST_CASE("blend: totals are the water-weighted mean, temperature too") {
    const Run r = run(water + R"toml(
[[step]]
label = "mix"
kind = "blend"
waters = { raw = 0.25, soft = 0.75 }
)toml");
    const WaterState& a = r.waters[0];
    const WaterState& b = r.waters[1];
    const WaterState& m = step(r, "mix").state;
    // By volume: kg of water from each litre.
    const double wa = 0.25 * a.result.kg_water_per_litre, wb = 0.75 * b.result.kg_water_per_litre;
    for (const char* el : {"Ca", "Na", "Cl", "C"}) {
        CAPTURE(el);
        check_relative(total(m, el), (wa * total(a, el) + wb * total(b, el)) / (wa + wb), 1e-10);
    }
    CHECK(m.result.temperature_c == doctest::Approx((wa * 20 + wb * 10) / (wa + wb)).epsilon(1e-12));
}

TEST_CASE("temperature: totals unchanged; calcite SI rises on heating (retrograde solubility)") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "hot"
kind = "temperature"
temperature_c = 70
)toml");
    const WaterState& cold = r.waters.front();
    const WaterState& hot = step(r, "hot").state;
    for (const char* el : {"Ca", "C", "Na"}) check_relative(total(hot, el), total(cold, el), 1e-10);
    CHECK(si(hot, "Calcite") > si(cold, "Calcite"));
}

TEST_CASE("temperature with equilibrate keeps the solids in contact at equilibrium") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "with calcite"
kind = "equilibrate"
minerals = { Calcite = 0.0 }

[[step]]
label = "warmer"
kind = "temperature"
temperature_c = 60
equilibrate = true
)toml");
    const WaterState& warm = step(r, "warmer").state;
    CHECK(std::abs(si(warm, "Calcite")) < 1e-8);
    REQUIRE(!warm.result.transfers.empty());
    CHECK(warm.result.transfers[0].moles < 0);  // calcite precipitates as the water warms
}

TEST_CASE("equilibrate errors point at the case file") {
    try {
        (void)run(water + R"toml(
[[step]]
water = "raw"
kind = "equilibrate"
minerals = { Calcit = 0.0 }
)toml");
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(std::string(e.what()).find("did you mean 'Calcite'") != std::string::npos);
        CHECK(e.where().line > 20);
    }
    try {
        (void)run(water + R"toml(
[[step]]
water = "raw"
kind = "equilibrate"
minerals = { Calcite = 0.0, Aragonite = 0.0 }
)toml");
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(std::string(e.what()).find("over-constrained") != std::string::npos);
        CHECK(e.where().file == "test.toml");
        CHECK(e.where().line > 20);
    }
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "raw"
kind = "equilibrate"
gases = { "CO3(g)" = -3.5 }
)toml"), doctest::Contains("did you mean 'CO2(g)'"), InputError);
}

TEST_CASE("Langelier index agrees with the Standard Methods 2330 B hand calculation") {
    // Standard Methods 2330 B: pHs = pK2 - pKs + p[Ca2+] + p[HCO3-] + 5 pfm, with
    // pfm = A (sqrt(I)/(1 + sqrt(I)) - 0.3 I) (Davies) and [HCO3-] ~ total alkalinity at
    // pH < 9. At 25 degC: pK2 = 10.329, pKs = 8.480 (Plummer & Busenberg 1982), A = 0.5108
    // (from deltag's water properties; 0.5091-0.5114 in tables). Water: Ca 2 mmol/kgw,
    // alkalinity 3 meq/kgw, NaCl 1 mmol/kgw, pH 7.8 (invented). I = 0.5(4 x 2e-3 + 3e-3 +
    // 2 x 1e-3 + 1e-3) = 7e-3 (the ions of CaCl2 + Ca(HCO3)2 + NaCl, minus a little pairing).
    const double ca = 2e-3, alk = 3e-3, ionic = 0.5 * (4 * ca + alk + (2 * ca - alk) + 2e-3);
    const double a = 0.5108;
    const double pfm = a * (std::sqrt(ionic) / (1 + std::sqrt(ionic)) - 0.3 * ionic);
    const double phs_hand = 10.329 - 8.480 - std::log10(ca) - std::log10(alk) + 5 * pfm;
    const Run r = run(R"toml(
activity_model = "davies"
[water.w]
pH = 7.8
units = "mmol/kgw"
[water.w.analytes]
Ca = 2
Na = 1
Cl = 2
Alkalinity = { value = 3, unit = "meq/L" }
)toml");
    const Indices& ix = r.waters.front().indices;
    REQUIRE(ix.available);
    // The speciation counts the CaHCO3+ and CaCO3(aq) ion pairs the formula ignores; they
    // raise pHs by a few hundredths in such a water, hence 0.05.
    CHECK(std::abs(ix.ph_s - phs_hand) < 0.05);
    CHECK(std::abs(ix.langelier - (7.8 - phs_hand)) < 0.05);
    CHECK(ix.ryznar == doctest::Approx(2 * ix.ph_s - 7.8).epsilon(1e-12));
}

TEST_CASE("CCPP of a water already at calcite equilibrium is 0; LSI is 0 too") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "at equilibrium"
kind = "equilibrate"
minerals = { Calcite = 0.0 }
)toml");
    const Indices& ix = step(r, "at equilibrium").state.indices;
    REQUIRE(ix.available);
    CHECK(std::abs(ix.ccpp_mg_per_l) < 1e-6);
    CHECK(std::abs(ix.langelier) < 1e-6);
    // The raw water is supersaturated: positive CCPP, and the same amount precipitated.
    const Indices& raw = r.waters.front().indices;
    CHECK(raw.ccpp_mg_per_l > 0);
    const double xi = step(r, "at equilibrium").state.result.transfers[0].moles;
    CHECK(raw.ccpp_mg_per_l == doctest::Approx(-xi * 100.086 * 1000 * r.waters.front().result.kg_water_per_litre).epsilon(1e-3));
}

TEST_CASE("sweep: the factor of a concentrate step, recorded at a later step") {
    const io::Case c = io::parse_case(water + R"toml(
[[step]]
water = "raw"
label = "cycles"
kind = "concentrate"
factor = 2

[[step]]
label = "hot"
kind = "temperature"
temperature_c = 40

[[sweep]]
label = "scan"
step = "cycles"
at = "hot"
variable = "factor"
from = 1
to = 5
points = 5
outputs = ["si:Calcite", "pH", "total:Na", "transfer:Calcite", "ccpp"]
)toml", "test.toml");
    std::vector<WaterState> waters;
    for (const auto& w : c.waters) {
        const auto in = to_speciation_input(w, core(), c.activity_model);
        waters.push_back(state_from_result(equilibrium::speciate(core(), in), in, core()));
    }
    const SweepOutcome s = run_sweep(core(), waters, c.steps, c.sweeps.front());
    REQUIRE(s.x.size() == 5);
    CHECK(s.x.front() == 1.0);
    CHECK(s.x.back() == 5.0);
    REQUIRE(s.series.size() == 5);
    for (std::size_t i = 1; i < 5; ++i) CHECK(s.series[0].second[i] > s.series[0].second[i - 1]);  // SI rises
    // total Na in mmol/kgw scales with the factor exactly.
    const double na1 = s.series[2].second[0];
    for (std::size_t i = 0; i < 5; ++i) CHECK(s.series[2].second[i] == doctest::Approx(na1 * s.x[i]).epsilon(1e-10));
    CHECK(s.series[3].second[0] == 0.0);  // no calcite phase in these steps
}

TEST_CASE("sweep outputs that name nothing in the database are refused") {
    const io::Case c = io::parse_case(water + R"toml(
[[step]]
water = "raw"
label = "hot"
kind = "temperature"
temperature_c = 40

[[sweep]]
step = "hot"
variable = "temperature_c"
from = 10
to = 30
points = 3
outputs = ["si:Calcit", "total:Qq"]
)toml", "test.toml");
    std::vector<WaterState> waters;
    for (const auto& w : c.waters) {
        const auto in = to_speciation_input(w, core(), c.activity_model);
        waters.push_back(state_from_result(equilibrium::speciate(core(), in), in, core()));
    }
    CHECK_THROWS_WITH_AS(run_sweep(core(), waters, c.steps, c.sweeps.front()), doctest::Contains("did you mean 'Calcite'"),
                         InputError);
    io::Case c2 = c;
    c2.sweeps.front().outputs = {"total:Qq"};
    CHECK_THROWS_WITH_AS(run_sweep(core(), waters, c2.steps, c2.sweeps.front()), doctest::Contains("not an element symbol"),
                         InputError);
}

TEST_CASE("equilibrate with a closed headspace, read from the case file") {
    const Run r = run(water + R"toml(
[[step]]
water = "soft"
label = "sealed tank"
kind = "equilibrate"
headspace = { volume_l_per_kgw = 0.25, gases = { "CO2(g)" = -2.0 } }
)toml");
    const WaterState& before = step(r, "sealed tank").state;
    REQUIRE(before.result.transfers.size() == 1);
    const auto& t = before.result.transfers[0];
    CHECK(t.headspace);
    // CO2-rich gas over a soft water: CO2 dissolves; carbon in water rises by what left the gas.
    CHECK(t.moles > 0);
    check_relative(total(before, "C"), total(r.waters[1], "C") + t.moles, 1e-9);
    CHECK(before.result.ph < r.waters[1].result.ph);
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "soft"
kind = "equilibrate"
headspace = { gases = { "CO2(g)" = -2.0 } }
)toml"), doctest::Contains("volume_l_per_kgw"), InputError);
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "soft"
kind = "equilibrate"
headspace = { volume_l_per_kgw = 1 }
)toml"), doctest::Contains("gases"), InputError);
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "soft"
kind = "equilibrate"
headspace = { volume_l_per_kgw = 1, gases = { "CO2(g)" = "high" } }
)toml"), doctest::Contains("starting log10 partial pressure"), InputError);
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "soft"
kind = "equilibrate"
headspace = { volume_l_per_kgw = 1, gases = { "CO2(g)" = -2 }, volume = 3 }
)toml"), doctest::Contains("unknown key"), InputError);
}

TEST_CASE("run_sweep refuses sweeps it cannot run (built in code; the case reader checks these earlier)") {
    const io::Case c = io::parse_case(water + R"toml(
[[step]]
water = "raw"
label = "hot"
kind = "temperature"
temperature_c = 40

[[step]]
label = "mix"
kind = "blend"
waters = { raw = 0.5, soft = 0.5 }
)toml", "test.toml");
    std::vector<WaterState> waters;
    for (const auto& w : c.waters) {
        const auto in = to_speciation_input(w, core(), c.activity_model);
        waters.push_back(state_from_result(equilibrium::speciate(core(), in), in, core()));
    }
    Sweep s;
    s.step = "hot";
    s.variable = Sweep::Variable::temperature_c;
    s.from = 10;
    s.to = 20;
    s.points = 2;
    s.outputs = {"pH"};
    auto refused = [&](const Sweep& sw, const char* fragment) {
        CHECK_THROWS_WITH_AS(run_sweep(core(), waters, c.steps, sw), doctest::Contains(fragment), InputError);
    };
    Sweep a = s;
    a.step = "hott";
    refused(a, "no step is labelled 'hott'");
    a = s;
    a.at = "nowhere";
    refused(a, "no step is labelled 'nowhere'");
    a = s;
    a.step = "mix";
    a.variable = Sweep::Variable::fraction;
    a.fraction_of = "raw";
    a.at = "hot";
    refused(a, "comes before the varied step");
    a.at.clear();
    a.fraction_of = "river";
    refused(a, "is not one of the blended waters");
    a = s;
    a.variable = Sweep::Variable::factor;
    refused(a, "has no such input to vary");
    a = s;
    a.outputs = {"transfer:Calcit"};
    refused(a, "did you mean 'Calcite'");
    a.outputs = {"colour"};
    refused(a, "unknown output");
}

TEST_CASE("an oxidant dose takes electrons from an aerated water; a water without a redox level refuses it") {
    const Run r = run(R"toml(
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
label = "hypochlorite"
kind = "dose"
reagent = "NaOCl"
amount = { value = 0.05, unit = "mmol/kgw" }
)toml");
    const WaterState& before = r.waters.front();
    const WaterState& after = step(r, "hypochlorite").state;
    REQUIRE(before.basis.electron_total.has_value());
    REQUIRE(after.basis.electron_total.has_value());
    // Two electrons taken per NaOCl; chloride and sodium rise by the dose.
    CHECK(*after.basis.electron_total == doctest::Approx(*before.basis.electron_total - 2 * 0.05e-3).epsilon(1e-9));
    check_relative(total(after, "Cl"), total(before, "Cl") + 0.05e-3, 1e-10);
    CHECK(*after.result.pe > *before.result.pe);
    CHECK_THROWS_WITH_AS(run(water + R"toml(
[[step]]
water = "raw"
kind = "dose"
reagent = "NaOCl"
amount = { value = 0.05, unit = "mmol/kgw" }
)toml"), doctest::Contains("is an oxidant: give the water a redox level"), InputError);
}

TEST_CASE("a dose amount in a unit the library does not know is refused (built in code)") {
    const Run r = run(water);
    Step s;
    s.label = "odd unit";
    s.water = "raw";
    DoseStep d;
    d.reagent = "HCl";
    d.amount = Amount{1.0, "kg/ton", SourceLocation{"code", 7, 1}};
    s.action = d;
    CHECK_THROWS_WITH_AS(run_steps(core(), r.waters, {s}), doctest::Contains("unknown unit 'kg/ton' for an amount"), InputError);
}

namespace {

bool warns(const WaterState& w, const std::string& fragment) {
    for (const auto& m : w.result.warnings)
        if (m.find(fragment) != std::string::npos) return true;
    return false;
}

const equilibrium::PhaseTransfer* transfer_of(const WaterState& w, const std::string& phase) {
    for (const auto& t : w.result.transfers)
        if (t.phase == phase) return &t;
    return nullptr;
}

}  // namespace

TEST_CASE("the calcite a concentrate step let precipitate stays in contact: heating with equilibrate reaches SI 0") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "four cycles"
kind = "concentrate"
factor = 4
precipitate = ["Calcite"]

[[step]]
label = "condenser"
kind = "temperature"
temperature_c = 38
equilibrate = true
)toml");
    const WaterState& cycles = step(r, "four cycles").state;
    const WaterState& hot = step(r, "condenser").state;
    REQUIRE(transfer_of(cycles, "Calcite"));
    REQUIRE(transfer_of(cycles, "Calcite")->moles < 0);  // the four cycles scale
    // Definition of equilibrium with a solid in contact: SI = 0 (|SI| < 0.01 allows nothing
    // but the solver's tolerance). Retrograde solubility (fact of the trade): more calcite
    // comes out as the water warms, so the transfer is negative and is reported.
    CHECK(std::abs(si(hot, "Calcite")) < 0.01);
    const auto* t = transfer_of(hot, "Calcite");
    REQUIRE(t);
    CHECK(t->moles < 0);
    // Conservation: calcium falls by exactly what moved.
    check_relative(total(hot, "Ca"), total(cycles, "Ca") + t->moles, 1e-10);
    // The CCPP of a water at calcite equilibrium is 0 (Standard Methods 2330).
    CHECK(std::abs(hot.indices.ccpp_mg_per_l) < 0.5);
    CHECK_FALSE(warns(hot, "no mineral or gas was in contact"));
}

TEST_CASE("heating with equilibrate when nothing is in contact warns that nothing moved") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "four cycles"
kind = "concentrate"
factor = 4

[[step]]
label = "condenser"
kind = "temperature"
temperature_c = 38
equilibrate = true
)toml");
    const WaterState& hot = step(r, "condenser").state;
    CHECK(warns(hot, "no mineral or gas was in contact with the water: nothing moved"));
    CHECK(hot.result.transfers.empty());
    CHECK(si(hot, "Calcite") > 0.1);  // four cycles of a hard water stay supersaturated
}

TEST_CASE("a concentration factor outside 1-1000 is bad input, also when built in code") {
    const Run r = run(water);
    for (double f : {1e6, 1e300, 0.5, std::nan("")}) {
        CAPTURE(f);
        Step s;
        s.label = "too far";
        s.water = "raw";
        s.where = SourceLocation{"code", 3, 1};
        ConcentrateStep c;
        c.factor = f;
        s.action = c;
        CHECK_THROWS_WITH_AS(run_steps(core(), r.waters, {s}),
                             doctest::Contains("expected a concentration factor from 1 to 1000"), InputError);
    }
}

TEST_CASE("a mineral whose components are absent is left out, with a warning, by concentrate and equilibrate alike") {
    const Run r = run(water + R"toml(
[[step]]
water = "raw"
label = "cycles"
kind = "concentrate"
factor = 3
precipitate = ["Barite", "Calcite"]

[[step]]
water = "raw"
label = "settle"
kind = "equilibrate"
minerals = { Barite = { si = 0.0, only = "precipitate" }, Calcite = { si = 0.0, only = "precipitate" } }

[[step]]
water = "raw"
label = "with barite"
kind = "equilibrate"
minerals = { Barite = 0.0 }
)toml");
    // The water has no barium: barite can neither be saturated nor precipitate (its ion
    // activity product is 0), so asking for it changes nothing but is said.
    for (const char* label : {"cycles", "settle"}) {
        CAPTURE(label);
        const WaterState& w = step(r, label).state;
        CHECK(warns(w, "Barite left out: its components (Ba^2+) are absent from the water"));
        CHECK(transfer_of(w, "Barite") == nullptr);
        REQUIRE(transfer_of(w, "Calcite"));
        CHECK(std::abs(si(w, "Calcite")) < 1e-8);
    }
    // Allowed to dissolve, barite brings its own barium: kept, at saturation (definition).
    const WaterState& b = step(r, "with barite").state;
    REQUIRE(transfer_of(b, "Barite"));
    CHECK(transfer_of(b, "Barite")->moles > 0);
    CHECK(std::abs(si(b, "Barite")) < 1e-8);
}
