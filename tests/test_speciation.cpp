// Speciation against published values and textbook results, plus the solver's error paths.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "deltag/constants.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water_properties.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

std::size_t comp(const char* name) {
    auto i = core().find_species(name);
    REQUIRE(i.has_value());
    REQUIRE(*i < core().component_count());
    return *i;
}

ComponentInput total(const char* name, double mol_per_kgw) {
    return ComponentInput{comp(name), ComponentInput::Kind::total, mol_per_kgw};
}

double species_molality(const SpeciationResult& r, const char* name) {
    const SpeciesResult* s = r.find(name);
    REQUIRE(s != nullptr);
    return s->molality;
}

const SaturationResult& si_of(const SpeciationResult& r, const std::string& phase) {
    for (const auto& s : r.saturation)
        if (s.phase == phase) return s;
    FAIL("no saturation result for " << phase);
    return r.saturation.front();
}

// A fresh water with a measured pH, used by several checks (invented composition).
SpeciationInput hard_water() {
    SpeciationInput in;
    in.label = "hard";
    in.temperature_c = 25.0;
    in.ph = 7.4;
    in.activity_model = activity::ModelKind::truesdell_jones;
    in.components = {total("Ca^2+", 2.5e-3), total("Mg^2+", 1.0e-3), total("Na+", 1.2e-3), total("K+", 1e-4),
                     total("Cl-", 1.5e-3),   total("SO4^2-", 1.1e-3), total("HCO3-", 4.8e-3),
                     total("H4SiO4", 2e-4),  total("F-", 1e-5),       total("NO3-", 1e-4)};
    return in;
}

}  // namespace

TEST_CASE("pure water at 25 degC has pH 6.998 +- 0.003") {
    // Neutral pH = pKw/2 = 13.995/2 = 6.9975 (Bandura & Lvov 2006 pKw, value from memory,
    // check-values.md). A water with no analytes is pure water; pH from the charge balance.
    SpeciationInput in;
    in.label = "pure";
    const SpeciationResult r = speciate(core(), in);
    CHECK(std::abs(r.ph - 6.998) <= 0.003);
    CHECK(species_molality(r, "H+") == doctest::Approx(species_molality(r, "OH-")).epsilon(1e-9));
    CHECK(r.summary.converged);
}

TEST_CASE("pure water: Kw at 0, 50 and 100 degC within 0.02 of Bandura & Lvov (2006)") {
    // pKw 14.946, 13.264, 12.252 (Bandura & Lvov 2006, J. Phys. Chem. Ref. Data 35, 15;
    // values from memory, check-values.md). In pure water a(H+) a(OH-) = Kw (a_w ~ 1).
    const double published[][2] = {{0.0, 14.946}, {50.0, 13.264}, {100.0, 12.252}};
    for (const auto& row : published) {
        const double t = row[0], pkw = row[1];  // not a structured binding: clang 14 cannot CAPTURE one
        SpeciationInput in;
        in.temperature_c = t;
        const SpeciationResult r = speciate(core(), in);
        const double log_kw = std::log10(r.find("H+")->activity) + std::log10(r.find("OH-")->activity);
        CAPTURE(t);
        CHECK(std::abs(-log_kw - pkw) <= 0.02);
        CHECK(std::abs(r.ph - pkw / 2) <= 0.01);
    }
}

TEST_CASE("measured pH: every mass balance closes to 1e-10 relative") {
    const SpeciationInput in = hard_water();
    const SpeciationResult r = speciate(core(), in);
    for (const auto& c : in.components) {
        // Sum of the component over all species from the reported molalities.
        double sum = 0.0;
        for (const auto& s : r.species)
            for (const auto& [j, nu] : core().species()[s.species].formation)
                if (j == c.component) sum += nu * s.molality;
        CAPTURE(core().species()[c.component].name);
        CHECK(std::abs(sum - c.value) <= 1e-10 * c.value);
    }
    CHECK(r.ph == doctest::Approx(7.4).epsilon(1e-12));
}

TEST_CASE("charge-balance error follows Standard Methods 1030 E") {
    // Standard Methods 1030 E: % difference = 100 (sum cations - sum anions) / (sum cations +
    // sum anions), sums in milliequivalents.
    SpeciationInput in = hard_water();
    in.components[2] = total("Na+", 2.0e-3);  // an analysis with too much sodium (invented)
    const SpeciationResult r = speciate(core(), in);
    double cations = 0.0, anions = 0.0;
    for (const auto& s : r.species) {
        const int z = core().species()[s.species].formula.charge;
        if (z > 0) cations += z * s.molality * 1000;
        if (z < 0) anions -= z * s.molality * 1000;
    }
    CHECK(r.cations_meq == doctest::Approx(cations).epsilon(1e-12));
    CHECK(r.anions_meq == doctest::Approx(anions).epsilon(1e-12));
    CHECK(r.charge_balance_error_percent == doctest::Approx(100 * (cations - anions) / (cations + anions)).epsilon(1e-12));
    // The analysis above is off balance by more than the 1030 E acceptance (2 % for anion sums
    // of 3-10 meq/L): the result says so.
    CHECK(std::abs(r.charge_balance_error_percent) > 2.0);
    bool warned = false;
    for (const auto& w : r.warnings) warned = warned || w.find("1030 E") != std::string::npos;
    CHECK(warned);
}

TEST_CASE("1 mmol/kgw NaHCO3 gives pH about (pK1 + pK2)/2") {
    // Textbook result for an ampholyte: pH ~ (pK1 + pK2)/2 = (6.352 + 10.329)/2 = 8.34 with
    // the Plummer & Busenberg (1982) constants (check-values.md). Water autoprotolysis and
    // activity coefficients move the exact value a few hundredths lower.
    SpeciationInput in;
    in.components = {total("Na+", 1e-3), total("HCO3-", 1e-3)};
    const SpeciationResult r = speciate(core(), in);
    CHECK(std::abs(r.ph - (6.352 + 10.329) / 2) < 0.1);
    CHECK(std::abs(r.charge_balance_error_percent) < 1e-8);
}

TEST_CASE("1 mmol/kgw HCl gives pH about 3.0") {
    // Strong acid: a(H+) = gamma * 1e-3, gamma ~ 0.965 at I = 1e-3 (Davies): pH ~ 3.015.
    SpeciationInput in;
    in.components = {total("Cl-", 1e-3)};
    const SpeciationResult r = speciate(core(), in);
    CHECK(std::abs(r.ph - 3.0) < 0.03);
    CHECK(species_molality(r, "H+") == doctest::Approx(1e-3).epsilon(1e-6));
}

TEST_CASE("a water built to be exactly at calcite saturation reports SI = 0 and dG = 0") {
    // Fix pH and carbonate, then solve for the calcium total that makes SI(calcite) = 0 by
    // the secant method on log10(Ca); the check is that the reported SI and dG vanish.
    auto si_at = [](double log_ca) {
        SpeciationInput in;
        in.ph = 8.1;
        in.components = {total("Ca^2+", std::pow(10.0, log_ca)), total("HCO3-", 3e-3), total("Cl-", 1e-4),
                         total("Na+", 1e-3)};
        in.charge_balance_component = comp("Na+");
        const SpeciationResult r = speciate(core(), in);
        return std::make_pair(si_of(r, "Calcite").si, si_of(r, "Calcite").delta_g_kj_per_mol);
    };
    double x0 = -4.0, x1 = -3.3, f0 = si_at(x0).first, f1 = si_at(x1).first;
    for (int i = 0; i < 50 && std::abs(f1) > 1e-12; ++i) {
        const double x2 = x1 - f1 * (x1 - x0) / (f1 - f0);
        x0 = x1;
        f0 = f1;
        x1 = x2;
        f1 = si_at(x1).first;
    }
    const auto [si, dg] = si_at(x1);
    CHECK(std::abs(si) <= 1e-6);
    CHECK(std::abs(dg) <= 1e-6 * constants::rt_ln10_kj(298.15));
}

TEST_CASE("saturation index and dG of dissolution are consistent: dG = RT ln10 SI") {
    const SpeciationResult r = speciate(core(), hard_water());
    REQUIRE(!r.saturation.empty());
    for (const auto& s : r.saturation) {
        CAPTURE(s.phase);
        CHECK(s.delta_g_kj_per_mol == doctest::Approx(constants::rt_ln10_kj(298.15) * s.si).epsilon(1e-12));
        CHECK(s.si == doctest::Approx(s.log_iap - s.log_k).epsilon(1e-9));
        if (s.si > default_si_tolerance) CHECK(s.verdict == Verdict::precipitation_favoured);
        else if (s.si < -default_si_tolerance) CHECK(s.verdict == Verdict::dissolution_favoured);
        else CHECK(s.verdict == Verdict::at_equilibrium);
    }
    // Calcite's IAP as the database writes the reaction: a(Ca^2+) a(CO3^2-).
    const auto& cal = si_of(r, "Calcite");
    CHECK(cal.log_iap == doctest::Approx(std::log10(r.find("Ca^2+")->activity * r.find("CO3^2-")->activity)).epsilon(1e-9));
}

TEST_CASE("alkalinity as input is reproduced by the speciation") {
    SpeciationInput in = hard_water();
    in.components.back() = total("NO3-", 1e-4);
    for (auto& c : in.components)
        if (c.component == comp("HCO3-")) c = ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 4.5e-3};
    const SpeciationResult r = speciate(core(), in);
    CHECK(r.alkalinity_eq == doctest::Approx(4.5e-3).epsilon(1e-10));
    CHECK(r.element_totals.at("C") > 4.5e-3);  // at pH 7.4 some carbon is CO2(aq)
}

TEST_CASE("charge balance on an analyte closes the balance at a fixed pH") {
    SpeciationInput in = hard_water();
    in.charge_balance_component = comp("Cl-");
    const SpeciationResult r = speciate(core(), in);
    CHECK(std::abs(r.charge_balance_error_percent) < 1e-8);
    CHECK(r.component_totals[comp("Cl-")] > 1.5e-3);  // the analysis above lacks anions
}

TEST_CASE("hard cases converge: acid, caustic, dilute, brine; no number is NaN") {
    struct Case {
        const char* what;
        SpeciationInput in;
    };
    std::vector<Case> cases;
    {
        SpeciationInput in;  // mine drainage style acid sulfate water (invented)
        in.components = {total("SO4^2-", 2e-2), total("Ca^2+", 4e-3), total("Mg^2+", 2e-3), total("Fe^2+", 1e-3)};
        cases.push_back({"acid sulfate", in});
    }
    {
        SpeciationInput in;  // caustic: 0.05 mol/kgw NaOH with some carbonate
        in.components = {total("Na+", 5e-2), total("HCO3-", 1e-3)};
        cases.push_back({"caustic", in});
    }
    {
        SpeciationInput in;  // rain-like, nanomolar salts
        in.components = {total("Na+", 1e-9), total("Cl-", 1e-9), total("HCO3-", 1e-8)};
        cases.push_back({"dilute", in});
    }
    {
        SpeciationInput in;  // a brine near halite saturation
        in.activity_model = activity::ModelKind::truesdell_jones;
        in.components = {total("Na+", 5.5), total("Cl-", 5.5), total("Ca^2+", 1e-2), total("SO4^2-", 1e-2),
                         total("HCO3-", 2e-3)};
        cases.push_back({"brine", in});
    }
    {
        SpeciationInput in;  // seawater-like major ions (rounded, invented for the test)
        in.ph = 8.1;
        in.activity_model = activity::ModelKind::truesdell_jones;
        in.components = {total("Na+", 0.486), total("Mg^2+", 0.0547), total("Ca^2+", 0.0107), total("K+", 0.0106),
                         total("Cl-", 0.566),  total("SO4^2-", 0.0293), total("HCO3-", 0.0021)};
        cases.push_back({"seawater-like", in});
    }
    for (const auto& c : cases) {
        CAPTURE(c.what);
        const SpeciationResult r = speciate(core(), c.in);
        CHECK(r.summary.converged);
        CHECK(std::isfinite(r.ph));
        CHECK(std::isfinite(r.ionic_strength));
        for (const auto& s : r.species) {
            CHECK(std::isfinite(s.molality));
            CHECK(std::isfinite(s.log_gamma));
        }
        for (const auto& s : r.saturation) CHECK(std::isfinite(s.si));
    }
}

TEST_CASE("a warm start reaches the same answer in fewer iterations") {
    const SpeciationInput in = hard_water();
    const SpeciationResult cold = speciate(core(), in);
    SpeciationInput near = in;
    near.temperature_c = 26.0;
    const SpeciationResult warm = speciate(core(), near, {}, &cold);
    const SpeciationResult cold2 = speciate(core(), near);
    CHECK(warm.summary.iterations <= cold2.summary.iterations);
    CHECK(warm.ionic_strength == doctest::Approx(cold2.ionic_strength).epsilon(1e-10));
}

TEST_CASE("warnings: model range, temperature range, redox species without pe") {
    SUBCASE("ionic strength beyond the model") {
        SpeciationInput in;
        in.activity_model = activity::ModelKind::davies;
        in.components = {total("Na+", 1.0), total("Cl-", 1.0)};
        const SpeciationResult r = speciate(core(), in);
        bool warned = false;
        for (const auto& w : r.warnings) warned = warned || w.find("beyond the range of the davies model") != std::string::npos;
        CHECK(warned);
    }
    SUBCASE("iron without pe leaves the ferric species out, and says so") {
        SpeciationInput in;
        in.ph = 6.5;
        in.components = {total("Fe^2+", 1e-5), total("Cl-", 2e-5)};
        const SpeciationResult r = speciate(core(), in);
        CHECK(r.find("Fe^3+") == nullptr);
        bool warned = false;
        for (const auto& w : r.warnings) warned = warned || w.find("no pe given") != std::string::npos;
        CHECK(warned);
    }
    SUBCASE("with a pe the ferric species are in") {
        SpeciationInput in;
        in.ph = 3.0;
        in.pe = 13.02;  // pe = -log K of Fe2+ = Fe3+ + e- at 25 degC: equal activities
        in.components = {total("Fe^2+", 1e-5), total("Cl-", 1e-3)};
        const SpeciationResult r = speciate(core(), in);
        REQUIRE(r.find("Fe^3+") != nullptr);
        // Nordstrom et al. (1990) log K = -13.02 (value from memory): a(Fe3+)/a(Fe2+) = 1 at pe 13.02.
        CHECK(r.find("Fe^3+")->activity / r.find("Fe^2+")->activity == doctest::Approx(1.0).epsilon(0.02));
    }
}

TEST_CASE("speciate rejects input it cannot set up") {
    auto expect_input_error = [](const SpeciationInput& in, const std::string& fragment) {
        try {
            (void)speciate(core(), in);
            FAIL("expected an InputError containing: " << fragment);
        } catch (const InputError& e) {
            CHECK(std::string(e.what()).find(fragment) != std::string::npos);
        }
    };
    SpeciationInput in;
    in.temperature_c = 120.0;
    expect_input_error(in, "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 120");
    in = {};
    in.ph = 15.0;
    expect_input_error(in, "pH within 0-14");
    in = {};
    in.pe = std::nan("");
    expect_input_error(in, "finite pe");
    in = {};
    in.components = {total("Na+", 1e-3), total("Na+", 1e-3)};
    expect_input_error(in, "given twice");
    in = {};
    in.components = {ComponentInput{core().proton(), ComponentInput::Kind::total, 1e-3}};
    expect_input_error(in, "set by pH");
    in = {};
    in.components = {total("Na+", -1e-3)};
    expect_input_error(in, "positive total");
    in = {};
    in.components = {total("Na+", std::nan(""))};
    expect_input_error(in, "finite amount");
    in = {};
    in.components = {ComponentInput{9999, ComponentInput::Kind::total, 1.0}};
    expect_input_error(in, "out of range");
    in = {};
    in.components = {total("Na+", 1e-3), total("Cl-", 1e-3)};
    in.charge_balance_component = comp("Cl-");
    expect_input_error(in, "needs a measured pH");
    in.ph = 7.0;
    in.charge_balance_component = comp("H4SiO4");
    expect_input_error(in, "charged component");
    in.components = {total("Na+", 1e-3), ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 1e-3}};
    in.charge_balance_component = comp("HCO3-");
    expect_input_error(in, "cannot adjust an alkalinity");
    in = {};
    in.components = {total("Na+", 1e-3), ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 1e-3}};
    expect_input_error(in, "the pH cannot come from the charge balance when the alkalinity is given");
}

TEST_CASE("a charge balance that needs a negative amount is refused as having no solution") {
    // Much calcium, little chloride, neutral pH: closing the balance on Na+ would need a
    // negative sodium total. By hand: cations 2 x 10 mmol Ca, anions 1 mmol Cl, so without
    // sodium the water has about 19 meq/kgw more cations (less what CaOH+ and ion pairs
    // change, nothing at pH 7 with chloride), and Na+ carries +1 per mole: about -19 mmol/kgw.
    SpeciationInput in;
    in.label = "impossible";
    in.ph = 7.0;
    in.components = {total("Na+", 1e-3), total("Ca^2+", 1e-2), total("Cl-", 1e-3)};
    in.charge_balance_component = comp("Na+");
    try {
        (void)speciate(core(), in);
        FAIL("expected a NoSolutionError");
    } catch (const NoSolutionError& e) {
        CHECK(e.where().file == "impossible");
        CHECK(e.key() == "charge_balance");
        CHECK(e.message().find("negative amount (-19") != std::string::npos);
        CHECK(e.message().find("more cations than anions") != std::string::npos);
    }
}

TEST_CASE("an alkalinity below what hydroxide alone carries at the measured pH is refused as having no solution") {
    // pH 12 at 25 degC: a(OH-) = 10^(12 - 13.995) = 1.01e-2 (Bandura & Lvov 2006 pKw, value
    // from memory), so the hydroxide alone is about 10 meq/kgw; an alkalinity of 2 meq/kgw
    // would need negative carbonate.
    SpeciationInput in;
    in.label = "caustic";
    in.ph = 12.0;
    in.components = {total("Na+", 2e-2), total("Cl-", 1e-2), ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 2e-3}};
    try {
        (void)speciate(core(), in);
        FAIL("expected a NoSolutionError");
    } catch (const NoSolutionError& e) {
        CHECK(e.key() == "Alkalinity");
        CHECK(e.message().find("no amount of carbonate fits") != std::string::npos);
    }
}

TEST_CASE("an alkalinity below what aluminate carries is refused, naming the base, also with a charge balance") {
    // Hand calculation: Al 5 umol/kgw at pH 7.3 is mostly Al(OH)4- (the Al hydrolysis
    // constants of Nordstrom et al. 1990 put the Al(OH)4-/Al(OH)3 boundary near pH 6.7 and
    // Al3+ far below), and a titration to the carbonic-acid end point (about pH 4.5, where
    // Al3+ dominates) takes up 4 H+ per Al(OH)4-: about 16-20 ueq/kgw of alkalinity from the
    // aluminium alone, more than the 7 ueq/kgw given. Invented soft water.
    SpeciationInput in;
    in.label = "soft with aluminium";
    in.temperature_c = 32.0;
    in.ph = 7.3;
    in.components = {total("Ca^2+", 2.2e-5), total("Mg^2+", 8.7e-6), total("Na+", 3e-6), total("K+", 1e-6),
                     total("Cl-", 6.1e-5),   total("SO4^2-", 6.3e-6), total("Al^3+", 5.0e-6),
                     ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 7.3e-6}};
    in.charge_balance_component = comp("K+");
    try {
        (void)speciate(core(), in);
        FAIL("expected a NoSolutionError");
    } catch (const NoSolutionError& e) {
        CHECK(e.key() == "Alkalinity");
        CHECK(e.message().find("no amount of carbonate fits") != std::string::npos);
        CHECK(e.message().find("Al(OH)4-") != std::string::npos);
    }
}

TEST_CASE("a charge balance whose analyte eats the alkalinity before the balance closes is refused") {
    // Hand reasoning (invented caustic rinse water, 50 degC, pH 12.4, Davies): pKw 13.26
    // (Bandura & Lvov 2006) and gamma(OH-) about 0.75 at I 0.2 put about 0.18 mol/kgw of OH-
    // in the water, so carbonate holds only about 13 of the 193.5 meq/kgw of alkalinity.
    // Without magnesium the anions exceed the cations by about 30 meq/kgw. Magnesium at this
    // pH lives as MgOH+ (log K -11.44, Nordstrom et al. 1990): each mmol closes at most 2 meq
    // of the gap (its charge and the carbonate it displaces) but takes 1 meq of the
    // alkalinity, so at most about 13 mmol fit, closing about 26 meq: short of 30.
    SpeciationInput in;
    in.label = "caustic rinse";
    in.temperature_c = 50.0;
    in.ph = 12.4;
    in.components = {total("Na+", 0.192),     total("Cl-", 0.0318), total("Ca^2+", 7.9e-4), total("SO4^2-", 1.7e-4),
                     total("Mg^2+", 6e-5),
                     ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 0.1935}};
    in.charge_balance_component = comp("Mg^2+");
    try {
        (void)speciate(core(), in);
        FAIL("expected a NoSolutionError");
    } catch (const NoSolutionError& e) {
        CHECK(e.key() == "charge_balance");
        CHECK(e.message().find("has no solution at this pH and alkalinity") != std::string::npos);
    }
}

TEST_CASE("KINSOL's own message reaches the full summary") {
    // The start of the test below: the first attempt cannot finish, the fallback can.
    SpeciationResult bad_start = speciate(core(), hard_water());
    for (auto& s : bad_start.species) s.molality *= 1e-9;
    SolverOptions options;
    options.max_step_log10 = 0.001;
    const SpeciationResult r = speciate(core(), hard_water(), options, &bad_start);
    REQUIRE(r.summary.converged);
    // The failed first attempt ran out of iterations; KINSOL said so, and the full summary
    // (--verbose) carries its words.
    CHECK_FALSE(r.summary.kinsol_message.empty());
    CHECK(r.summary.full().find("KINSOL's last message: " + r.summary.kinsol_message) != std::string::npos);
}

TEST_CASE("a result is accepted at accept_factor times the tolerance") {
    const SpeciationResult r = speciate(core(), hard_water());
    REQUIRE(r.summary.converged);
    const SolverOptions defaults;
    CHECK(r.summary.residual_norm <= defaults.tolerance * defaults.accept_factor);
}

TEST_CASE("the fallback rescues a first attempt that cannot finish") {
    // A warm start nine decades away from the answer, with steps capped at 0.001 log units,
    // cannot get there in 200 iterations; the fallback (ideal solution from the default
    // start, then damped steps of up to 1 log unit) can.
    SpeciationResult bad_start = speciate(core(), hard_water());
    for (auto& s : bad_start.species) s.molality *= 1e-9;
    SolverOptions options;
    options.max_step_log10 = 0.001;
    const SpeciationResult r = speciate(core(), hard_water(), options, &bad_start);
    CHECK(r.summary.converged);
    CHECK(r.summary.attempts > 1);
    CHECK(r.summary.method.find("fallback") != std::string::npos);
    const SpeciationResult reference = speciate(core(), hard_water());
    CHECK(r.ionic_strength == doctest::Approx(reference.ionic_strength).epsilon(1e-9));

    options.allow_fallback = false;
    try {
        (void)speciate(core(), hard_water(), options, &bad_start);
        FAIL("expected a ConvergenceError without the fallback");
    } catch (const ConvergenceError& e) {
        CHECK(e.residual_norm() > options.tolerance);
        CHECK(std::string(e.what()).find("water 'hard'") != std::string::npos);
        CHECK(e.hint().find("check the analysis (units, charge balance, pH)") != std::string::npos);
    }
    // The hint names what the input asked for: a charge balance on an analyte, or phases.
    SpeciationInput balanced = hard_water();
    balanced.charge_balance_component = comp("Cl-");
    CHECK_THROWS_WITH_AS((void)speciate(core(), balanced, options, &bad_start),
                         doctest::Contains("the charge balance on 'Cl-' may not close with this analysis"), ConvergenceError);
    SpeciationInput with_calcite = hard_water();
    with_calcite.minerals = {MineralTarget{*core().find_mineral("Calcite"), 0.0, std::nullopt}};
    CHECK_THROWS_WITH_AS((void)speciate(core(), with_calcite, options, &bad_start),
                         doctest::Contains("check that the minerals and gases requested can coexist"), ConvergenceError);
}

TEST_CASE("solver summary texts") {
    const SpeciationResult r = speciate(core(), hard_water());
    CHECK(r.summary.brief().find("converged in") != std::string::npos);
    CHECK(r.summary.full().find("Newton iterations: ") != std::string::npos);
    CHECK(r.summary.iterations > 0);
    CHECK(r.summary.residual_norm <= 1e-11);
}

TEST_CASE("a redox level beyond the stability of water: warned past 1 atm, refused past 100 atm") {
    // The lines of water stability at 25 degC (Stumm & Morgan, Aquatic Chemistry, 3rd ed.,
    // 1996, ch. 8): O2(g) + 4 H+ + 4 e- = 2 H2O with log K = 83.1, so
    // pe = 20.78 - pH + 0.25 log p(O2); 2 H+ + 2 e- = H2(g) with log K = 0, so
    // pe = -pH - 0.5 log p(H2). At pH 7: pe 14 -> log p(O2) = 0.9; pe 20 -> 24.9;
    // pe -7.5 -> log p(H2) = 1; pe -9 -> 4.
    auto water_at = [](double pe) {
        SpeciationInput in = hard_water();
        in.label = "redox";
        in.ph = 7.0;
        in.pe = pe;
        in.charge_balance_component = comp("Cl-");
        return in;
    };
    auto warning_with = [](const SpeciationResult& r, const char* text) {
        for (const auto& w : r.warnings)
            if (w.find(text) != std::string::npos) return true;
        return false;
    };
    const SpeciationResult ok = speciate(core(), water_at(8.0));
    CHECK_FALSE(warning_with(ok, "stability"));
    const SpeciationResult high = speciate(core(), water_at(14.0));
    CHECK(warning_with(high, "above the O2/H2O line"));
    CHECK(warning_with(high, "give off oxygen"));
    const SpeciationResult low = speciate(core(), water_at(-7.5));
    CHECK(warning_with(low, "below the H2O/H2 line"));
    CHECK_THROWS_WITH_AS((void)speciate(core(), water_at(20.0)), doctest::Contains("above the O2/H2O line"),
                         NoSolutionError);
    CHECK_THROWS_WITH_AS((void)speciate(core(), water_at(-9.0)), doctest::Contains("below the H2O/H2 line"),
                         NoSolutionError);
}

TEST_CASE("a poised reduced water carried at a new pH: the first pe comes from its electrons") {
    // Invented anoxic well water whose nitrogen is all ammonium (8 e- per N against nitrate)
    // and whose sulfur is all sulfate, carried on at pH 8.86 with its electrons conserved.
    // The pe must fall where the few electrons left over sit (near the sulfate/sulfide
    // boundary, pe about 4.25 - 1.125 pH at 25 degC for equal SO4^2- and HS-, Stumm & Morgan
    // 1996), far from the default start. Before the first pe was estimated from the
    // electrons, this took 500+ Newton iterations or did not converge; now it is a plain
    // solve (the iteration count is deterministic, not a timing).
    SpeciationInput in;
    in.label = "poised";
    in.temperature_c = 12.5;
    in.ph = 8.86;
    in.components = {total("Ca^2+", 3.548e-3), total("Mg^2+", 1.277e-3),   total("Na+", 8.06e-4),
                     total("Cl-", 1.186e-3),   total("SO4^2-", 1.0008e-3), total("NO3-", 5.719e-5),
                     total("Fe^2+", 1.96e-8),  total("Mn^2+", 5.47e-6),
                     ComponentInput{comp("HCO3-"), ComponentInput::Kind::alkalinity, 7.2268e-3}};
    in.electron_total = 8.0 * 5.719e-5 + 1.16e-6;
    const SpeciationResult r = speciate(core(), in);
    REQUIRE(r.pe.has_value());
    CHECK(species_molality(r, "NH4+") + species_molality(r, "NH3(aq)") == doctest::Approx(5.719e-5).epsilon(1e-3));
    CHECK(*r.pe < 0.0);
    CHECK(std::abs(*r.pe - (4.25 - 1.125 * 8.86)) < 1.5);
    CHECK(r.summary.attempts == 1);
    CHECK(r.summary.iterations <= 25);
}

TEST_CASE("oxygen held with the electrons conserved: the gas gives the pe, whatever the warm start says") {
    // Invented water solved at pe 4, then brought to air (O2 at 10^-0.68 atm) with its
    // electrons conserved and the pe 4 result as the warm start. The O2/H2O couple fixes the
    // pe: pe = 20.78 - pH + 0.25 log p(O2) at 25 degC (Stumm & Morgan 1996).
    SpeciationInput in = hard_water();
    in.pe = 4.0;
    const SpeciationResult before = speciate(core(), in);
    double e_total = 0.0;
    const std::size_t e = core().electron().value();
    for (const auto& s : before.species)
        for (const auto& [j, nu] : core().species()[s.species].formation)
            if (j == e) e_total += nu * s.molality;
    SpeciationInput aired = in;
    aired.pe.reset();
    aired.electron_total = e_total;
    aired.gases = {GasTarget{*core().find_gas("O2(g)"), -0.68}};
    const SpeciationResult r = speciate(core(), aired, {}, &before);
    REQUIRE(r.pe.has_value());
    CHECK(*r.pe == doctest::Approx(20.78 - 7.4 - 0.17).epsilon(0.003));
    CHECK(r.summary.iterations <= 40);
}

TEST_CASE("a temperature just outside the accepted range is refused with the message naming the limit") {
    // The limit is thermo::accepted_temperature_c (0-100 degC today); the ends themselves are
    // accepted, 0.01 degC beyond either is not.
    const auto range = thermo::accepted_temperature_c;
    CHECK(range.min_c == 0.0);
    CHECK(range.max_c == 100.0);
    const std::string limit = "from " + message_number(range.min_c) + " to " + message_number(range.max_c) + " °C";
    for (double t : {range.min_c - 0.01, range.max_c + 0.01}) {
        CAPTURE(t);
        SpeciationInput in;
        in.temperature_c = t;
        try {
            (void)speciate(core(), in);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.key() == "temperature_c");
            CHECK(std::string(e.what()).find("expected a temperature " + limit) != std::string::npos);
            CHECK(std::string(e.what()).find("found " + message_number(t)) != std::string::npos);
        }
    }
    for (double t : {range.min_c, range.max_c}) {
        CAPTURE(t);
        SpeciationInput in;
        in.temperature_c = t;
        CHECK_NOTHROW((void)speciate(core(), in));
    }
    CHECK(thermo::temperature_problem(range.max_c).empty());
    CHECK_FALSE(thermo::temperature_problem(std::nan("")).empty());
}
