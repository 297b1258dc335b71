// Activity models against published values and hand calculations.
//
// The hand calculations below were done independently of deltag (in Python, from the model
// formulas) with A = 0.5091 kg^1/2 mol^-1/2 and B = 0.3283 kg^1/2 mol^-1/2 per angstrom
// (Helgeson & Kirkham 1974 at 25 degC, values from memory, check-values.md) and
// B-dot = 0.041 kg/mol (Helgeson 1969 at 25 degC, value from memory). Ion sizes marked
// "illustrative" are chosen for the calculation, not taken from a table.
#include <doctest/doctest.h>

#include <array>
#include <cmath>
#include <stdexcept>
#include <string>
#include <vector>

#include "deltag/activity.hpp"

using namespace deltag::activity;
using deltag::thermo::DebyeHuckelParameters;

namespace {

constexpr DebyeHuckelParameters dh25{0.5091, 0.3283};
constexpr double b_dot25 = 0.041;

// log10 gamma of one species under a model at ionic strength I.
double log_gamma_of(const ActivityModel& model, double ionic_strength, const SpeciesParameters& p) {
    std::array<SpeciesParameters, 1> species{p};
    std::array<double, 1> lg{};
    std::array<double, 1> dlg{};
    model.log_gamma(ionic_strength, species, lg, dlg);
    return lg[0];
}

SpeciesParameters ion(int charge, double size) {
    SpeciesParameters p = no_parameters(charge);
    p.ion_size_angstrom = size;
    return p;
}

SpeciesParameters tj_ion(int charge, double a, double b) {
    SpeciesParameters p = no_parameters(charge);
    p.tj_a_angstrom = a;
    p.tj_b = b;
    return p;
}

// Hand-calculated values are given to 6 decimals; allow for that rounding (about 1e-6).
doctest::Approx hand(double value) { return doctest::Approx(value).epsilon(1e-6).scale(1.0); }

}  // namespace

TEST_CASE("Davies at A = 0.5091, I = 0.1 (check-values.md, computed from Davies 1962)") {
    const auto model = make_model(ModelKind::davies, dh25, b_dot25);
    // Published check values, value from memory: -0.1070 (z = +-1), -0.4282 (z = +-2).
    for (int z : {1, -1}) CHECK(std::abs(log_gamma_of(*model, 0.1, no_parameters(z)) - -0.1070) < 1e-4);
    for (int z : {2, -2}) CHECK(std::abs(log_gamma_of(*model, 0.1, no_parameters(z)) - -0.4282) < 1e-4);
}

TEST_CASE("Davies (1962) against hand calculation") {
    const auto m = make_model(ModelKind::davies, dh25, b_dot25);
    // z = 1: -A z^2 (sqrt I/(1+sqrt I) - 0.3 I)
    //  I = 0.001: -0.5091*1*(0.031623/1.031623 - 0.3*0.001) = -0.5091*0.030353 = -0.015453
    //  I = 0.01:  -0.5091*1*(0.100000/1.100000 - 0.3*0.01)  = -0.5091*0.087909 = -0.044755
    //  I = 0.1:   -0.5091*1*(0.316228/1.316228 - 0.3*0.1)   = -0.5091*0.210253 = -0.107040
    CHECK(log_gamma_of(*m, 0.001, no_parameters(1)) == hand(-0.015453));
    CHECK(log_gamma_of(*m, 0.01, no_parameters(1)) == hand(-0.044755));
    CHECK(log_gamma_of(*m, 0.1, no_parameters(1)) == hand(-0.107040));
    // z = 2: the bracket as above, times 4
    //  I = 0.001: -0.5091*4*0.030353 = -0.061812
    //  I = 0.01:  -0.5091*4*0.087909 = -0.179018
    //  I = 0.1:   -0.5091*4*0.210253 = -0.428159
    CHECK(log_gamma_of(*m, 0.001, no_parameters(2)) == hand(-0.061812));
    CHECK(log_gamma_of(*m, 0.01, no_parameters(2)) == hand(-0.179018));
    CHECK(log_gamma_of(*m, 0.1, no_parameters(2)) == hand(-0.428159));
}

TEST_CASE("extended Debye-Hueckel against hand calculation") {
    const auto m = make_model(ModelKind::debye_huckel, dh25, b_dot25);
    // z = 2, a = 6.0 angstrom (illustrative): -A z^2 sqrt I / (1 + B a sqrt I)
    //  I = 0.001: -0.5091*4*0.031623/(1+0.3283*6.0*0.031623) = -0.064397/1.062291 = -0.060621
    //  I = 0.01:  -0.5091*4*0.100000/(1+0.3283*6.0*0.100000) = -0.203640/1.196980 = -0.170128
    //  I = 0.1:   -0.5091*4*0.316228/(1+0.3283*6.0*0.316228) = -0.643966/1.622905 = -0.396798
    CHECK(log_gamma_of(*m, 0.001, ion(2, 6.0)) == hand(-0.060621));
    CHECK(log_gamma_of(*m, 0.01, ion(2, 6.0)) == hand(-0.170128));
    CHECK(log_gamma_of(*m, 0.1, ion(2, 6.0)) == hand(-0.396798));
    // z = -1, no size given, so the default a = 4.0 angstrom:
    //  I = 0.001: -0.5091*0.031623/(1+0.3283*4.0*0.031623) = -0.016099/1.041527 = -0.015457
    //  I = 0.01:  -0.5091*0.100000/(1+0.3283*4.0*0.100000) = -0.050910/1.131320 = -0.045001
    //  I = 0.1:   -0.5091*0.316228/(1+0.3283*4.0*0.316228) = -0.160992/1.415270 = -0.113753
    CHECK(log_gamma_of(*m, 0.001, no_parameters(-1)) == hand(-0.015457));
    CHECK(log_gamma_of(*m, 0.01, no_parameters(-1)) == hand(-0.045001));
    CHECK(log_gamma_of(*m, 0.1, no_parameters(-1)) == hand(-0.113753));
}

TEST_CASE("Truesdell-Jones (1974) against hand calculation") {
    const auto m = make_model(ModelKind::truesdell_jones, dh25, b_dot25);
    // Ca^2+ with a = 5.0 angstrom, b = 0.165 kg/mol (Truesdell & Jones 1974, values from
    // memory): -A z^2 sqrt I / (1 + B a sqrt I) + b I
    //  I = 0.001: -0.064397/(1+0.3283*5.0*0.031623) + 0.165*0.001 = -0.064397/1.051909 + 0.000165 = -0.061054
    //  I = 0.01:  -0.203640/(1+0.3283*5.0*0.100000) + 0.165*0.01  = -0.203640/1.164150 + 0.001650 = -0.173276
    //  I = 0.1:   -0.643966/(1+0.3283*5.0*0.316228) + 0.165*0.1   = -0.643966/1.519088 + 0.016500 = -0.407416
    CHECK(log_gamma_of(*m, 0.001, tj_ion(2, 5.0, 0.165)) == hand(-0.061054));
    CHECK(log_gamma_of(*m, 0.01, tj_ion(2, 5.0, 0.165)) == hand(-0.173276));
    CHECK(log_gamma_of(*m, 0.1, tj_ion(2, 5.0, 0.165)) == hand(-0.407416));
    // z = 1 without Truesdell-Jones parameters but with ion size 4.5 angstrom (illustrative):
    // falls back to extended Debye-Hueckel with a = 4.5, b = 0
    //  I = 0.001: -0.5091*0.031623/(1+0.3283*4.5*0.031623) = -0.016099/1.046718 = -0.015381
    //  I = 0.01:  -0.5091*0.100000/(1+0.3283*4.5*0.100000) = -0.050910/1.147735 = -0.044357
    //  I = 0.1:   -0.5091*0.316228/(1+0.3283*4.5*0.316228) = -0.160992/1.467179 = -0.109729
    CHECK(log_gamma_of(*m, 0.001, ion(1, 4.5)) == hand(-0.015381));
    CHECK(log_gamma_of(*m, 0.01, ion(1, 4.5)) == hand(-0.044357));
    CHECK(log_gamma_of(*m, 0.1, ion(1, 4.5)) == hand(-0.109729));
}

TEST_CASE("Truesdell-Jones without its parameters equals extended Debye-Hueckel") {
    const auto tj = make_model(ModelKind::truesdell_jones, dh25, b_dot25);
    const auto edh = make_model(ModelKind::debye_huckel, dh25, b_dot25);
    for (double i : {0.001, 0.05, 0.5}) {
        for (int z : {-2, -1, 1, 3}) {
            CHECK(log_gamma_of(*tj, i, ion(z, 5.5)) == doctest::Approx(log_gamma_of(*edh, i, ion(z, 5.5))));
            CHECK(log_gamma_of(*tj, i, no_parameters(z)) == doctest::Approx(log_gamma_of(*edh, i, no_parameters(z))));
        }
    }
}

TEST_CASE("B-dot (Helgeson 1969) against hand calculation") {
    const auto m = make_model(ModelKind::b_dot, dh25, b_dot25);
    // z = 2, a = 6.0 angstrom (illustrative): -A z^2 sqrt I / (1 + B a sqrt I) + Bdot I
    //  I = 0.001: -0.064397/1.062291 + 0.041*0.001 = -0.060621 + 0.000041 = -0.060580
    //  I = 0.01:  -0.203640/1.196980 + 0.041*0.01  = -0.170128 + 0.000410 = -0.169718
    //  I = 0.1:   -0.643966/1.622905 + 0.041*0.1   = -0.396798 + 0.004100 = -0.392698
    CHECK(log_gamma_of(*m, 0.001, ion(2, 6.0)) == hand(-0.060580));
    CHECK(log_gamma_of(*m, 0.01, ion(2, 6.0)) == hand(-0.169718));
    CHECK(log_gamma_of(*m, 0.1, ion(2, 6.0)) == hand(-0.392698));
    // z = -1, default a = 4.0 angstrom:
    //  I = 0.001: -0.016099/1.041527 + 0.041*0.001 = -0.015457 + 0.000041 = -0.015416
    //  I = 0.01:  -0.050910/1.131320 + 0.041*0.01  = -0.045001 + 0.000410 = -0.044591
    //  I = 0.1:   -0.160992/1.415270 + 0.041*0.1   = -0.113753 + 0.004100 = -0.109653
    CHECK(log_gamma_of(*m, 0.001, no_parameters(-1)) == hand(-0.015416));
    CHECK(log_gamma_of(*m, 0.01, no_parameters(-1)) == hand(-0.044591));
    CHECK(log_gamma_of(*m, 0.1, no_parameters(-1)) == hand(-0.109653));
}

TEST_CASE("B-dot coefficient from temperature: about 0.041 at 25 degC (Helgeson 1969)") {
    // B-dot and extended Debye-Hueckel at the same temperature and ion size differ by Bdot I.
    // Helgeson (1969): Bdot = 0.041 kg/mol at 25 degC (value from memory).
    const auto bd = make_model(ModelKind::b_dot, 25.0);
    const auto edh = make_model(ModelKind::debye_huckel, 25.0);
    const double i = 0.5;
    const double b_dot = (log_gamma_of(*bd, i, ion(1, 4.0)) - log_gamma_of(*edh, i, ion(1, 4.0))) / i;
    CHECK(std::abs(b_dot - 0.041) < 1e-4);
    // The table rises with temperature from 0 to 100 degC (Helgeson 1969, values from memory).
    auto b_dot_at = [](double t) {
        const auto b = make_model(ModelKind::b_dot, t);
        const auto e = make_model(ModelKind::debye_huckel, t);
        return (log_gamma_of(*b, 0.5, ion(1, 4.0)) - log_gamma_of(*e, 0.5, ion(1, 4.0))) / 0.5;
    };
    CHECK(b_dot_at(0.0) < b_dot_at(50.0));
    CHECK(b_dot_at(50.0) < b_dot_at(100.0));
}

TEST_CASE("make_model(kind, temperature) uses the computed A at 25 degC") {
    // Davies with the computed A against the published -0.1070 (z = 1, I = 0.1, A = 0.5091;
    // check-values.md): log gamma scales with A, and A is within 0.5 % of 0.5091.
    const auto m = make_model(ModelKind::davies, 25.0);
    CHECK(std::abs(log_gamma_of(*m, 0.1, no_parameters(1)) / -0.1070 - 1.0) < 0.005);
}

TEST_CASE("neutral species and the ideal model") {
    // Neutral species: log gamma = k I with k = 0.1 kg/mol by default (common practice).
    //  I = 0.1, default k: 0.1*0.1 = 0.01; given k = 0.2: 0.2*0.1 = 0.02.
    SpeciesParameters salted = no_parameters(0);
    salted.salting_out = 0.2;
    for (ModelKind kind : {ModelKind::davies, ModelKind::debye_huckel, ModelKind::truesdell_jones,
                           ModelKind::b_dot}) {
        const auto m = make_model(kind, dh25, b_dot25);
        CHECK(log_gamma_of(*m, 0.1, no_parameters(0)) == hand(0.01));
        CHECK(log_gamma_of(*m, 0.1, salted) == hand(0.02));
    }
    // Ideal: gamma = 1 (log gamma = 0) for every species, by definition.
    const auto ideal = make_model(ModelKind::ideal, dh25, b_dot25);
    for (int z : {-3, -1, 0, 2}) CHECK(log_gamma_of(*ideal, 0.5, no_parameters(z)) == 0.0);
    CHECK(log_gamma_of(*ideal, 0.5, salted) == 0.0);
}

TEST_CASE("analytic d(log gamma)/dI against central finite differences") {
    // Every model, charges 0, +-1, +-2, +-3, with and without parameters.
    std::vector<SpeciesParameters> species;
    for (int z : {-3, -2, -1, 0, 1, 2, 3}) {
        species.push_back(no_parameters(z));
        SpeciesParameters p = tj_ion(z, 4.5, 0.12);
        p.ion_size_angstrom = 5.5;
        p.salting_out = 0.15;
        species.push_back(p);
    }
    const std::size_t n = species.size();
    std::vector<double> lg(n), dlg(n), lg_plus(n), lg_minus(n), scratch(n);
    for (const std::string& name : model_names()) {
        ModelKind kind{};
        REQUIRE(parse_model_name(name, kind));
        const auto m = make_model(kind, dh25, b_dot25);
        for (double i : {0.001, 0.01, 0.1, 0.7}) {
            const double h = 1e-4 * i;
            m->log_gamma(i, species, lg, dlg);
            m->log_gamma(i + h, species, lg_plus, scratch);
            m->log_gamma(i - h, species, lg_minus, scratch);
            for (std::size_t k = 0; k < n; ++k) {
                CAPTURE(name);
                CAPTURE(i);
                CAPTURE(species[k].charge);
                const double fd = (lg_plus[k] - lg_minus[k]) / (2.0 * h);
                CHECK(dlg[k] == doctest::Approx(fd).epsilon(1e-6).scale(1e-6));
            }
        }
    }
}

TEST_CASE("output spans must match the species count") {
    const auto m = make_model(ModelKind::davies, dh25, b_dot25);
    std::array<SpeciesParameters, 2> species{no_parameters(1), no_parameters(-1)};
    std::array<double, 1> lg{};
    std::array<double, 2> dlg{};
    CHECK_THROWS_AS(m->log_gamma(0.01, species, lg, dlg), std::invalid_argument);
}

TEST_CASE("water activity, Raoult's law in molal form") {
    // ln a_w = -M_w sum(m), M_w = 2*1.008 + 15.999 = 18.015 g/mol (IUPAC 2021 weights,
    // check-values.md). Hand calculation: sum(m) = 0.5 mol/kg -> -0.018015*0.5 = -0.0090075;
    // sum(m) = 1 -> -0.018015, a_w = exp(-0.018015) = 0.982146.
    CHECK(ln_water_activity(0.0) == 0.0);
    CHECK(ln_water_activity(0.5) == hand(-0.0090075));
    CHECK(std::exp(ln_water_activity(1.0)) == hand(0.982146));
}

TEST_CASE("model names: round trip and rejection") {
    const std::vector<std::string> names = model_names();
    // The five names of interface.md (activity_model key).
    CHECK(names == std::vector<std::string>{"ideal", "davies", "debye-huckel", "truesdell-jones", "b-dot"});
    for (const std::string& name : names) {
        ModelKind kind{};
        REQUIRE(parse_model_name(name, kind));
        CHECK(model_name(kind) == name);
        CHECK(make_model(kind, 25.0)->kind() == kind);
    }
    ModelKind kind = ModelKind::davies;
    CHECK_FALSE(parse_model_name("debye-hueckel-extended", kind));
    CHECK_FALSE(parse_model_name("", kind));
    CHECK(kind == ModelKind::davies);  // unchanged on failure
}

TEST_CASE("no_parameters marks every parameter as not given") {
    const SpeciesParameters p = no_parameters(-2);
    CHECK(p.charge == -2);
    CHECK(std::isnan(p.ion_size_angstrom));
    CHECK(std::isnan(p.tj_a_angstrom));
    CHECK(std::isnan(p.tj_b));
    CHECK(std::isnan(p.salting_out));
}
