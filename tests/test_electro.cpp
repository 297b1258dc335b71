// Electrochemistry against published values: standard potentials (Bard, Parsons & Jordan
// 1985), the Nernst slope (CODATA 2018), concentration cells, reference electrodes (common
// practice), and the error paths of half-reactions.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "deltag/constants.hpp"
#include "deltag/electro.hpp"

using namespace deltag;
using namespace deltag::electro;

namespace {

// A small database with the two electrodes of the Daniell cell and the species they need,
// values from check-values.md (Bard, Parsons & Jordan 1985; value from memory).
const thermo::Database& cell_db() {
    static const thermo::Database db = thermo::Database::parse(R"toml(
[sources.bard-parsons-jordan-1985]
citation = "Bard, A.J., Parsons, R. & Jordan, J. (1985) Standard Potentials in Aqueous Solution. IUPAC, Marcel Dekker."
[components.H2O]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
[components."H+"]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
ion_size_angstrom = 9
[components."e-"]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
[components."Cu^2+"]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
ion_size_angstrom = 6
[components."Zn^2+"]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
ion_size_angstrom = 6
[components."Fe^2+"]
source = "bard-parsons-jordan-1985"
temperature_range_c = [0, 100]
ion_size_angstrom = 6
[species."Fe^3+"]
reaction = "Fe^2+ = Fe^3+ + e-"
log_k = -13.02
delta_h_kj_per_mol = 40.5
temperature_range_c = [0, 100]
source = "bard-parsons-jordan-1985"
ion_size_angstrom = 9
[minerals.Copper]
formula = "Cu"
reaction = "Cu^2+ + 2 e- = Cu(s)"
log_k = 11.558
temperature_range_c = [0, 100]
source = "bard-parsons-jordan-1985"
[electrodes."Cu^2+/Cu"]
reaction = "Cu^2+ + 2 e- = Cu(s)"
e0_v = 0.3419
de0_dt_mv_per_k = 0.01
temperature_range_c = [0, 100]
source = "bard-parsons-jordan-1985"
[electrodes."Zn^2+/Zn"]
reaction = "Zn^2+ + 2 e- = Zn(s)"
e0_v = -0.7618
de0_dt_mv_per_k = 0.12
temperature_range_c = [0, 100]
source = "bard-parsons-jordan-1985"
)toml", "cell-test.toml");
    return db;
}

const SourceLocation here{"test", 0, 0};

}  // namespace

TEST_CASE("Nernst slope: 59.16 mV per decade at 25 degC, and at 60 degC") {
    // (RT ln10)/F with CODATA 2018 R and F: 0.0591597 V at 298.15 K (check-values.md);
    // at 333.15 K: 8.314462618 * 333.15 * 2.302585093 / 96485.33212 = 0.0661040 V.
    CHECK(constants::nernst_slope_v(298.15) == doctest::Approx(0.0591597).epsilon(1e-6));
    CHECK(constants::nernst_slope_v(333.15) == doctest::Approx(0.0661040).epsilon(1e-6));
}

TEST_CASE("Cu-Zn cell at unit activities: E° = 1.104 V, dG° about -213 kJ/mol") {
    // E° = 0.3419 - (-0.7618) = 1.1037 V (Bard, Parsons & Jordan 1985); dG° = -2 F E° =
    // -2 x 96485.33212 x 1.1037 J/mol = -212.98 kJ/mol.
    const HalfCell cu = parse_half_reaction(cell_db(), "Cu^2+ + 2 e- = Cu(s)", here);
    const HalfCell zn = parse_half_reaction(cell_db(), "Zn^2+ + 2 e- = Zn(s)", here);
    const Activities unit{{"Cu^2+", 1.0}, {"Zn^2+", 1.0}};
    const CellResult c = cell(cu, unit, 25.0, zn, unit, 25.0);
    CHECK(c.n == 2.0);
    CHECK(c.e0_v == doctest::Approx(1.104).epsilon(0.001 / 1.104));
    CHECK(c.e_v == doctest::Approx(c.e0_v).epsilon(1e-12));
    CHECK(c.delta_g0_kj_per_mol == doctest::Approx(-213.0).epsilon(0.5 / 213.0));
    CHECK(c.spontaneous);
    // K = exp(nFE°/RT): log K = 2 x 1.1037 / 0.0591597 = 37.31.
    CHECK(c.log_k == doctest::Approx(37.31).epsilon(0.01 / 37.31));
    CHECK(c.cathode_origin.find("electrode Cu^2+/Cu") != std::string::npos);
}

TEST_CASE("E° from the species' log K agrees with the electrode: Fe3+/Fe2+ 0.771 V") {
    // Fe^2+ = Fe^3+ + e-, log K = -13.02 (Nordstrom et al. 1990) gives E° = 13.02 x 0.0591597
    // = 0.7703 V; Bard, Parsons & Jordan (1985) list 0.771 V. A known spread of data sets.
    const HalfCell fe = parse_half_reaction(cell_db(), "Fe^3+ + e- = Fe^2+", here);
    CHECK(fe.from_species);
    CHECK(fe.e0_v(25.0) == doctest::Approx(0.771).epsilon(0.002 / 0.771));
    // At equal activities the Nernst potential is E°.
    CHECK(nernst_v(fe, 25.0, {{"Fe^3+", 1e-5}, {"Fe^2+", 1e-5}}, here) == doctest::Approx(fe.e0_v(25.0)).epsilon(1e-12));
    // Written as an oxidation, it is stored as the same reduction.
    const HalfCell ox = parse_half_reaction(cell_db(), "Fe^2+ = Fe^3+ + e-", here);
    CHECK(ox.electrons == 1.0);
    CHECK(ox.e0_v(25.0) == doctest::Approx(fe.e0_v(25.0)).epsilon(1e-12));
    // The metal from the mineral's log K: 11.558 x 0.0591597 / 2 = 0.3419 V.
    const HalfCell cu_species = parse_half_reaction(cell_db(), "Cu^2+ + 2 e- = Cu(s)", here);
    CHECK(cu_species.e0_v(25.0) == doctest::Approx(0.3419).epsilon(1e-3));
}

TEST_CASE("a concentration cell of one half-reaction: E = (RT/nF) ln(a1/a2)") {
    const HalfCell cu = parse_half_reaction(cell_db(), "Cu^2+ + 2 e- = Cu(s)", here);
    const double a1 = 1e-2, a2 = 1e-5;
    for (double t : {25.0, 60.0}) {
        const CellResult c = cell(cu, {{"Cu^2+", a1}}, t, cu, {{"Cu^2+", a2}}, t);
        const double expected = constants::gas_constant * (t + 273.15) / (2 * constants::faraday) * std::log(a1 / a2);
        CAPTURE(t);
        CHECK(c.e0_v == doctest::Approx(0.0).scale(1));
        CHECK(c.e_v == doctest::Approx(expected).epsilon(1e-12));
        CHECK(c.spontaneous);
    }
}

TEST_CASE("E°(T) follows dE°/dT") {
    // Zn: -0.7618 V + 0.12 mV/K x 35 K = -0.7576 V at 60 degC (Bratsch 1989 coefficient).
    const HalfCell zn = parse_half_reaction(cell_db(), "Zn^2+ + 2 e- = Zn(s)", here);
    CHECK(zn.e0_v(60.0) == doctest::Approx(-0.7618 + 0.12e-3 * 35).epsilon(1e-9));
}

TEST_CASE("dG = -nFE and back") {
    CHECK(delta_g_kj(2, 1.1037) == doctest::Approx(-212.98).epsilon(1e-4));
    CHECK(potential_v(2, delta_g_kj(2, 0.4567)) == doctest::Approx(0.4567).epsilon(1e-12));
    CHECK(potential_v(4, -474.3) == doctest::Approx(1.2289).epsilon(1e-3));  // O2/H2O, 2 x 237.13 kJ (Wagman 1982)
}

TEST_CASE("reference electrodes: SCE to SHE +0.241 V at 25 degC; ORP to Eh and pe") {
    // SCE +0.241 V vs SHE at 25 degC (common practice, check-values.md).
    CHECK(convert_v(0.0, "SCE", "SHE", 25.0, here) == doctest::Approx(0.241).epsilon(1e-12));
    CHECK(convert_v(0.241, "SHE", "SCE", 25.0, here) == doctest::Approx(0.0).scale(1));
    CHECK(convert_v(0.1, "Ag/AgCl(sat KCl)", "Cu/CuSO4(sat)", 25.0, here) == doctest::Approx(0.1 + 0.197 - 0.316).epsilon(1e-12));
    // With the temperature coefficient: SCE at 45 degC = 0.241 - 0.66 mV/K x 20 K.
    CHECK(reference_v("SCE", 45.0, here) == doctest::Approx(0.241 - 0.66e-3 * 20).epsilon(1e-12));
    // An ORP reading of +220 mV on Ag/AgCl (3 M KCl) at 25 degC: Eh = 0.430 V; pe = F Eh/(RT ln10).
    const double eh = convert_v(0.220, "Ag/AgCl(3 M KCl)", "SHE", 25.0, here);
    CHECK(eh == doctest::Approx(0.430).epsilon(1e-12));
    CHECK(pe_from_eh(eh, 25.0) == doctest::Approx(0.430 / 0.0591597).epsilon(1e-5));  // slope to 6 digits
    CHECK(eh_from_pe(pe_from_eh(eh, 37.0), 37.0) == doctest::Approx(eh).epsilon(1e-12));
    CHECK_THROWS_WITH_AS(reference_v("Ag/AgCl(sat)", 25.0, here), doctest::Contains("did you mean 'Ag/AgCl(sat KCl)'"), InputError);
    CHECK(reference_names().size() == 8);
}

TEST_CASE("bad half-reactions are refused with a clear message") {
    auto refused = [](const std::string& text, const char* fragment) {
        CHECK_THROWS_WITH_AS(parse_half_reaction(cell_db(), text, here), doctest::Contains(fragment), InputError);
    };
    refused("Cu^2+ + e- = Cu(s)", "not balanced");
    refused("Cu^2+ = Cu(s)", "no electrons");
    refused("Cu^2+ + 2 e- Cu(s)", "cannot read the half-reaction");
    refused("Ni^2+ + 2 e- = Ni(s)", "unknown species 'Ni^2+'");
}

TEST_CASE("Nernst needs the activity of every dissolved species and gas") {
    const HalfCell cu = parse_half_reaction(cell_db(), "Cu^2+ + 2 e- = Cu(s)", here);
    CHECK_THROWS_WITH_AS(nernst_v(cu, 25.0, {}, here), doctest::Contains("no activity for 'Cu^2+'"), InputError);
    CHECK_THROWS_WITH_AS(nernst_v(cu, 25.0, {{"Cu^2+", -1.0}}, here), doctest::Contains("must be a positive number"), InputError);
    // Cu(s) at unit activity, Cu2+ at 1e-6: E = 0.3419 - 0.0591597/2 x 6.
    CHECK(nernst_v(cu, 25.0, {{"Cu^2+", 1e-6}}, here) == doctest::Approx(0.3419 - 0.0591597 * 3).epsilon(1e-5));
}
