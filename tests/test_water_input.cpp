// From a lab analysis to solver input: units, "as", density and dissolved solids, the
// charge-balance choice, and every error the conversion raises (key and line checked).
//
// Expected values are hand calculations with the IUPAC 2021 standard atomic weights
// (abridged; the table in shared/reference/check-values.md, value from memory):
// H 1.008, C 12.011, N 14.007, O 15.999, Na 22.990, Si 28.085, S 32.06, Cl 35.45, Ca 40.078.
// Derived molar masses: CaCO3 100.086 (one equivalent 50.043), HCO3 61.016, NO3 62.004,
// SiO2 60.083.
#include <doctest/doctest.h>

#include <algorithm>
#include <fstream>
#include <iterator>
#include <optional>
#include <string>

#include "deltag/database.hpp"
#include "deltag/water.hpp"

using deltag::AnalyteValue;
using deltag::InputError;
using deltag::SourceLocation;
using deltag::WaterAnalysis;
using deltag::equilibrium::ComponentInput;
using deltag::equilibrium::SpeciationInput;
using deltag::thermo::Database;

namespace {

// A small database with only what the conversion needs: components and analytes, following
// databases/README.md. No log K is used here. The alkalinity of HCO3- (1 equivalent per
// mole) is the definition of total alkalinity the README gives, not a measured value.
constexpr std::string_view test_database = R"toml([database]
name = "water-input-test"

[sources.readme]
citation = "deltag databases/README.md: definition of total alkalinity (HCO3- counts 1)."

[components.H2O]
source = "readme"
[components."H+"]
source = "readme"
alkalinity = -1
[components."e-"]
source = "readme"
[components."Ca^2+"]
source = "readme"
[components."Na+"]
source = "readme"
[components."Cl-"]
source = "readme"
[components."SO4^2-"]
source = "readme"
[components."HCO3-"]
source = "readme"
alkalinity = 1
[components."NO3-"]
source = "readme"
[components.H4SiO4]
source = "readme"

[analytes.Ca]
component = "Ca^2+"
[analytes.Na]
component = "Na+"
[analytes.Cl]
component = "Cl-"
[analytes.SO4]
component = "SO4^2-"
[analytes.Alkalinity]
component = "HCO3-"
mass_formula = "HCO3"
kind = "alkalinity"
[analytes.DIC]
component = "HCO3-"
mass_formula = "C"
[analytes.NO3]
component = "NO3-"
[analytes.SiO2]
component = "H4SiO4"
)toml";

const Database& db() {
    static const Database d = Database::parse(test_database, "test-db.toml");
    return d;
}

std::size_t component(const char* name) {
    const auto i = db().find_species(name);
    REQUIRE(i.has_value());
    return *i;
}

// A water as the case reader would produce it, with locations in "test.toml".
WaterAnalysis water(double density = 0.99705) {
    WaterAnalysis w;
    w.name = "lab";
    w.where = SourceLocation{"test.toml", 1, 1};
    w.ph = 7.0;
    w.density_kg_per_l = density;
    return w;
}

// Adds an analyte declared on `line` of test.toml.
void add(WaterAnalysis& w, const std::string& name, double value, const std::string& unit = {},
         const std::string& as = {}, int line = 10) {
    AnalyteValue a;
    a.name = name;
    a.value = value;
    a.unit = unit;
    a.as = as;
    a.where = SourceLocation{"test.toml", line, 1};
    a.key = "water.lab.analytes." + name;
    w.analytes.push_back(a);
}

void balance_on(WaterAnalysis& w, const std::string& what, int line = 4) {
    w.charge_balance = what;
    w.charge_balance_where = SourceLocation{"test.toml", line, 18};
}

SpeciationInput convert(const WaterAnalysis& w) {
    return deltag::to_speciation_input(w, db(), deltag::activity::ModelKind::davies);
}

const ComponentInput* find(const SpeciationInput& in, const char* name) {
    const std::size_t c = component(name);
    for (const auto& ci : in.components)
        if (ci.component == c) return &ci;
    return nullptr;
}

double molality(const SpeciationInput& in, const char* name) {
    const ComponentInput* ci = find(in, name);
    REQUIRE_MESSAGE(ci != nullptr, "no input for component " << name);
    return ci->value;
}

// Relative tolerance (doctest's Approx adds 1 to the scale by default, which makes a relative
// epsilon meaningless for values of order 1e-3).
doctest::Approx near(double expected) { return doctest::Approx(expected).scale(0.0); }

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

void check_error(const WaterAnalysis& w, const std::string& key, int line, const std::string& fragment,
                 const std::string& suggestion = {}) {
    try {
        (void)convert(w);
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        const std::string what = e.what();
        INFO("message: " << what);
        CHECK(e.key() == key);
        CHECK(e.where().line == line);
        CHECK(contains(what, "test.toml:" + std::to_string(line) + ":"));
        CHECK(contains(what, "'" + key + "'"));
        CHECK(contains(what, fragment));
        CHECK(e.suggestion() == suggestion);
    }
}

}  // namespace

TEST_CASE("the concentration units") {
    const auto& u = deltag::concentration_units();
    for (const char* name : {"mg/L", "ug/L", "\u00B5g/L", "g/L", "mmol/L", "umol/L", "\u00B5mol/L", "mol/L", "meq/L",
                             "mg/kg", "ppm", "mol/kgw", "mmol/kgw", "umol/kgw", "\u00B5mol/kgw", "mg/kgw", "g/kgw"})
        CHECK(std::find(u.begin(), u.end(), name) != u.end());
    CHECK(u.size() == 17);
    // Every name in the list is found in the one table, and every entry's name is in the list.
    for (const auto& name : u) CHECK(deltag::find_concentration_unit(name) != nullptr);
    for (const auto& e : deltag::concentration_unit_table())
        CHECK(std::find(u.begin(), u.end(), std::string(e.name)) != u.end());
    CHECK(deltag::is_concentration_unit("\u03BCg/L"));  // Greek mu, accepted like the micro sign
    CHECK_FALSE(deltag::is_concentration_unit("ppb"));
}

TEST_CASE("mg/L: 40.078 mg/L Ca at density 0.99705 kg/L") {
    // 40.078 mg/L / 40.078 g/mol = 1.000 mmol/L. kg of water per litre = 0.99705 - 40.078e-6
    // = 0.997009922; molality = 1.000e-3 / 0.997009922 = 1.0029990e-3 mol/kgw.
    auto w = water();
    add(w, "Ca", 40.078);
    const auto in = convert(w);
    REQUIRE(in.components.size() == 1);
    CHECK(in.components[0].kind == ComponentInput::Kind::total);
    CHECK(molality(in, "Ca^2+") == near(1.0029990e-3).epsilon(1e-7));
}

TEST_CASE("mg/L with the density of pure water at the water's temperature") {
    // Density of water at 25 degC, 0.1 MPa: 997.05 kg/m3 (IAPWS-95, value from memory); the
    // default uses Kell (1975), which agrees to about 0.01 kg/m3. Expected as above:
    // 1.000e-3 / (0.99705 - 40.078e-6) = 1.0029990e-3 mol/kgw, to within 1e-5 relative.
    auto w = water();
    w.density_kg_per_l.reset();
    add(w, "Ca", 40.078);
    CHECK(molality(convert(w), "Ca^2+") == near(1.0029990e-3).epsilon(1e-5));
}

TEST_CASE("ug/L, mmol/L, umol/L and mol/L, per litre of solution") {
    // Density 1 kg/L makes the kg of water per litre 1 - (dissolved mass in kg/L).
    SUBCASE("ug/L") {
        // 40.078 ug/L Ca = 1.000 umol/L; water 1 - 40.078e-9 kg/L.
        auto w = water(1.0);
        add(w, "Ca", 40.078, "ug/L");
        CHECK(molality(convert(w), "Ca^2+") == near(1e-6 / (1 - 40.078e-9)).epsilon(1e-9));
    }
    SUBCASE("mmol/L") {
        // 1 mmol/L Na = 22.990 mg/L; molality 1e-3 / (1 - 22.990e-6) = 1.0000230e-3.
        auto w = water(1.0);
        add(w, "Na", 1.0, "mmol/L");
        CHECK(molality(convert(w), "Na+") == near(1.0000230e-3).epsilon(1e-7));
    }
    SUBCASE("umol/L") {
        auto w = water(1.0);
        add(w, "Na", 500.0, "umol/L");
        CHECK(molality(convert(w), "Na+") == near(5e-4 / (1 - 0.5 * 22.990e-6)).epsilon(1e-9));
    }
    SUBCASE("mol/L") {
        // 0.1 mol/L NaCl: 5.844 g/L dissolved; water 1.02 - 0.005844 = 1.014156 kg/L.
        auto w = water(1.02);
        add(w, "Na", 0.1, "mol/L");
        add(w, "Cl", 0.1, "mol/L");
        const auto in = convert(w);
        CHECK(molality(in, "Na+") == near(0.1 / 1.014156).epsilon(1e-6));
        CHECK(molality(in, "Cl-") == near(0.1 / 1.014156).epsilon(1e-6));
    }
}

TEST_CASE("the water's default unit applies where an analyte gives none") {
    auto w = water(1.0);
    w.units = "mmol/L";
    add(w, "Na", 1.0);
    add(w, "Cl", 35.45, "mg/L");
    // Both 1 mmol/L; dissolved 22.990 + 35.45 = 58.44 mg/L.
    const auto in = convert(w);
    CHECK(molality(in, "Na+") == near(1e-3 / (1 - 58.44e-6)).epsilon(1e-9));
    CHECK(molality(in, "Cl-") == near(1e-3 / (1 - 58.44e-6)).epsilon(1e-9));
}

TEST_CASE("meq/L: divided by the charge; alkalinity in equivalents directly") {
    auto w = water(1.0);
    add(w, "SO4", 2.0, "meq/L");         // 1 mmol/L SO4^2- = 96.056 mg/L
    add(w, "Alkalinity", 2.0, "meq/L");  // 2 meq/L, as HCO3 2 x 61.016 = 122.032 mg/L
    const auto in = convert(w);
    const double water_kg = 1 - (96.056 + 122.032) * 1e-6;
    CHECK(molality(in, "SO4^2-") == near(1e-3 / water_kg).epsilon(1e-9));
    CHECK(molality(in, "HCO3-") == near(2e-3 / water_kg).epsilon(1e-9));
    CHECK(find(in, "HCO3-")->kind == ComponentInput::Kind::alkalinity);
}

TEST_CASE("alkalinity: as CaCO3, and as HCO3 by default") {
    SUBCASE("100 mg/L as CaCO3 = 1.998 meq/L") {
        // Trade convention: one equivalent of CaCO3 is 100.086/2 = 50.043 g, so 100 mg/L as
        // CaCO3 = 100 / 50.043 = 1.99828 meq/L. Counted as HCO3 that is 1.99828 x 61.016 =
        // 121.93 mg/L dissolved: water 0.99705 - 121.93e-6 = 0.996928 kg/L, and
        // 1.99828e-3 / 0.996928 = 2.00444e-3 eq/kgw.
        auto w = water();
        add(w, "Alkalinity", 100.0, "", "CaCO3");
        const auto in = convert(w);
        CHECK(find(in, "HCO3-")->kind == ComponentInput::Kind::alkalinity);
        CHECK(molality(in, "HCO3-") == near(2.00444e-3).epsilon(1e-5));
        // The per-litre value itself, undoing the water per litre.
        CHECK(molality(in, "HCO3-") * (0.99705 - 1.99828e-3 * 61.016e-3) == near(1.99828e-3).epsilon(1e-5));
    }
    SUBCASE("in mg/L without 'as': mass as HCO3") {
        // 61.016 mg/L as HCO3 = 1.000 meq/L; water 1 - 61.016e-6.
        auto w = water(1.0);
        add(w, "Alkalinity", 61.016);
        CHECK(molality(convert(w), "HCO3-") == near(1e-3 / (1 - 61.016e-6)).epsilon(1e-9));
    }
    SUBCASE("as HCO3, said explicitly") {
        auto w = water(1.0);
        add(w, "Alkalinity", 61.016, "mg/L", "HCO3");
        CHECK(molality(convert(w), "HCO3-") == near(1e-3 / (1 - 61.016e-6)).epsilon(1e-9));
    }
    SUBCASE("mmol/L as CaCO3 = 2 meq/L") {
        auto w = water(1.0);
        add(w, "Alkalinity", 1.0, "mmol/L", "CaCO3");
        CHECK(molality(convert(w), "HCO3-") == near(2e-3 / (1 - 2 * 61.016e-6)).epsilon(1e-9));
    }
}

TEST_CASE("a cation or anion as CaCO3: mg / 100.09 for a divalent ion") {
    // Hardness convention: Ca as CaCO3, 100.086 mg/L = 2 meq/L = 1 mmol/L Ca (40.078 mg/L).
    auto w = water(1.0);
    add(w, "Ca", 100.086, "mg/L", "CaCO3");
    add(w, "Na", 50.043, "mg/L", "CaCO3");  // 1 meq/L = 1 mmol/L Na, 22.990 mg/L
    const auto in = convert(w);
    const double water_kg = 1 - (40.078 + 22.990) * 1e-6;
    CHECK(molality(in, "Ca^2+") == near(1e-3 / water_kg).epsilon(1e-9));
    CHECK(molality(in, "Na+") == near(1e-3 / water_kg).epsilon(1e-9));
}

TEST_CASE("as an element: the mass is of that element") {
    SUBCASE("14.007 mg/L NO3 as N = 1 mmol/L") {
        // Dissolved as NO3: 62.004 mg/L; water 0.99705 - 62.004e-6 = 0.996988 kg/L;
        // 1e-3 / 0.996988 = 1.0030211e-3 mol/kgw.
        auto w = water();
        add(w, "NO3", 14.007, "", "N");
        CHECK(molality(convert(w), "NO3-") == near(1.0030211e-3).epsilon(1e-7));
    }
    SUBCASE("SiO2 as Si, and SiO2 as itself") {
        // 28.085 mg/L Si = 1 mmol/L = 60.083 mg/L SiO2.
        auto w = water(1.0);
        add(w, "SiO2", 28.085, "mg/L", "Si");
        CHECK(molality(convert(w), "H4SiO4") == near(1e-3 / (1 - 60.083e-6)).epsilon(1e-9));
        auto w2 = water(1.0);
        add(w2, "SiO2", 60.083);
        CHECK(molality(convert(w2), "H4SiO4") == near(1e-3 / (1 - 60.083e-6)).epsilon(1e-9));
    }
    SUBCASE("an amount as an element: mmol/L of N") {
        auto w = water(1.0);
        add(w, "NO3", 1.0, "mmol/L", "N");
        CHECK(molality(convert(w), "NO3-") == near(1e-3 / (1 - 62.004e-6)).epsilon(1e-9));
    }
    SUBCASE("DIC reported as C") {
        // 12.011 mg/L C = 1 mmol/L carbonate carbon; the mass formula of DIC is C itself.
        auto w = water(1.0);
        add(w, "DIC", 12.011);
        const auto in = convert(w);
        CHECK(find(in, "HCO3-")->kind == ComponentInput::Kind::total);
        CHECK(molality(in, "HCO3-") == near(1e-3 / (1 - 12.011e-6)).epsilon(1e-9));
    }
}

TEST_CASE("mg/kg: per kg of solution, divided by 1 minus the dissolved mass fraction") {
    // 35.45 mg/kg Cl = 1 mmol per kg of solution; water 1 - 35.45e-6 kg per kg;
    // 1e-3 / 0.99996455 = 1.0000355e-3 mol/kgw, whatever the density.
    for (double density : {0.99705, 1.2}) {
        auto w = water(density);
        add(w, "Cl", 35.45, "mg/kg");
        CHECK(molality(convert(w), "Cl-") == near(1.0000355e-3).epsilon(1e-7));
    }
}

TEST_CASE("ppm is mg per kg of solution (parts per million by mass)") {
    // Definition: 1 ppm (mass) = 1e-6 kg per kg = 1 mg/kg (IUPAC Green Book, 3rd ed., 2007,
    // section 2.10: ppm as 1e-6 of a mass fraction; from memory). So 35.45 ppm Cl is the
    // mg/kg case above: 1e-3 / (1 - 35.45e-6) = 1.0000355e-3 mol/kgw, whatever the density,
    // and not the 1e-3 / (0.99705 - 35.45e-6) = 1.0029945e-3 of 35.45 mg/L at 0.99705 kg/L.
    for (double density : {0.99705, 1.2}) {
        auto w = water(density);
        add(w, "Cl", 35.45, "ppm");
        CHECK(molality(convert(w), "Cl-") == near(1.0000355e-3).epsilon(1e-7));
    }
}

TEST_CASE("ug/L, the micro sign and the Greek mu are one unit") {
    // 40.078 ug/L Ca = 1.000 umol/L (as in the ug/L case above); the unit as the lab typed it.
    for (const char* unit : {"ug/L", "\u00B5g/L", "\u03BCg/L"}) {
        CAPTURE(unit);
        auto w = water(1.0);
        add(w, "Ca", 40.078, unit);
        CHECK(molality(convert(w), "Ca^2+") == near(1e-6 / (1 - 40.078e-9)).epsilon(1e-9));
    }
    auto w = water(1.0);
    add(w, "Na", 500.0, "\u00B5mol/L");
    CHECK(molality(convert(w), "Na+") == near(5e-4 / (1 - 0.5 * 22.990e-6)).epsilon(1e-9));
}

TEST_CASE("values below the detection limit: half, zero or the limit, and a note naming them") {
    // "<0.05" mmol/L Na with the rule: half -> 0.025 mmol/L, limit -> 0.05 mmol/L, zero -> no
    // Na at all. Density 1 kg/L; water 1 - (mass of Na) kg/L, M(Na) = 22.990 g/mol.
    auto lab = [](const std::string& rule, int rule_line) {
        auto w = water(1.0);
        w.below_detection = rule;
        w.below_detection_where = SourceLocation{"test.toml", rule_line, 1};
        add(w, "Na", 0.05, "mmol/L");
        w.analytes.back().below_detection = true;
        add(w, "Cl", 1.0, "mmol/L");
        return w;
    };
    SUBCASE("half the limit, the default") {
        const auto in = convert(lab("half", 0));
        CHECK(molality(in, "Na+") == near(0.025e-3 / (1 - (0.025 * 22.990 + 35.45) * 1e-6)).epsilon(1e-9));
        REQUIRE(in.notes.size() == 1);
        CHECK(in.notes[0] == "values below the detection limit taken as half the detection limit (below_detection = "
                             "\"half\", the default): Na <0.05 mmol/L: 0.025 mmol/L");
    }
    SUBCASE("the limit") {
        const auto in = convert(lab("limit", 3));
        CHECK(molality(in, "Na+") == near(0.05e-3 / (1 - (0.05 * 22.990 + 35.45) * 1e-6)).epsilon(1e-9));
        REQUIRE(in.notes.size() == 1);
        CHECK(contains(in.notes[0], "taken as the detection limit itself (below_detection = \"limit\"): Na <0.05 mmol/L"));
    }
    SUBCASE("zero") {
        const auto in = convert(lab("zero", 3));
        CHECK(find(in, "Na+") == nullptr);
        REQUIRE(in.notes.size() == 1);
        CHECK(contains(in.notes[0], "taken as zero (below_detection = \"zero\"): Na <0.05 mmol/L: 0 mmol/L"));
    }
    SUBCASE("no value below detection, no note") {
        auto w = water(1.0);
        add(w, "Na", 1.0);
        CHECK(convert(w).notes.empty());
    }
}

TEST_CASE("describe_lab_input passes the notes on as warnings") {
    SpeciationInput in;
    in.notes = {"a note"};
    deltag::equilibrium::SpeciationResult r;
    r.warnings = {"from the solver"};
    deltag::describe_lab_input(in, r, db());
    CHECK(r.warnings == std::vector<std::string>{"from the solver", "a note"});
}

TEST_CASE("mol/kgw and mmol/kgw are taken as they are") {
    auto w = water(1.3);
    add(w, "Na", 0.5, "mol/kgw");
    add(w, "Cl", 500.0, "mmol/kgw");
    const auto in = convert(w);
    CHECK(molality(in, "Na+") == near(0.5).epsilon(1e-15));
    CHECK(molality(in, "Cl-") == near(0.5).epsilon(1e-15));
}

TEST_CASE("mg/kgw, g/kgw and umol/kgw: per kg of water, a mass through the molar mass") {
    // 40.078 mg Ca per kg of water is 1 mmol/kgw (Ca 40.078 g/mol, IUPAC); 2.2990 g/kgw Na is
    // 0.1 mol/kgw; 250 umol/kgw Cl is 2.5e-4 mol/kgw. The density does not enter.
    auto w = water(1.3);
    add(w, "Ca", 40.078, "mg/kgw");
    add(w, "Na", 2.2990, "g/kgw");
    add(w, "Cl", 250.0, "\u00B5mol/kgw");
    const auto in = convert(w);
    CHECK(molality(in, "Ca^2+") == near(1e-3).epsilon(1e-12));
    CHECK(molality(in, "Na+") == near(0.1).epsilon(1e-4));
    CHECK(molality(in, "Cl-") == near(2.5e-4).epsilon(1e-15));
}

TEST_CASE("the README's list of units is the table's") {
    std::ifstream f(std::string(DELTAG_SOURCE_DIR) + "/README.md");
    REQUIRE(f.good());
    const std::string readme((std::istreambuf_iterator<char>(f)), std::istreambuf_iterator<char>());
    const auto begin = readme.find("- **Units**:");
    REQUIRE(begin != std::string::npos);
    const std::string bullet = readme.substr(begin, readme.find("\n- **", begin + 1) - begin);
    for (const auto& e : deltag::concentration_unit_table()) {
        CAPTURE(e.name);
        CHECK(contains(bullet, "`" + std::string(e.name) + "`"));
    }
}

TEST_CASE("g/L is 1000 mg/L") {
    auto a = water(1.0), b = water(1.0);
    add(a, "Na", 0.5, "g/L");
    add(b, "Na", 500.0, "mg/L");
    CHECK(molality(convert(a), "Na+") == near(molality(convert(b), "Na+")).epsilon(1e-15));
}

TEST_CASE("units of several bases in one water") {
    // Na 1 mmol/kgw (22.990 mg per kg of water) and Cl 35.45 mg/L, density 1 kg/L:
    // 1 = W + 35.45e-6 + 22.990e-6 W, so W = (1 - 35.45e-6) / (1 + 22.990e-6) = 0.99994156;
    // Cl = 1e-3 / W = 1.0000584e-3 mol/kgw.
    auto w = water(1.0);
    add(w, "Na", 1.0, "mmol/kgw");
    add(w, "Cl", 35.45, "mg/L");
    const auto in = convert(w);
    CHECK(molality(in, "Na+") == near(1e-3).epsilon(1e-15));
    CHECK(molality(in, "Cl-") == near(1.0000584e-3).epsilon(1e-7));
}

TEST_CASE("the rest of the solver input") {
    auto w = water();
    w.name = "makeup";
    w.temperature_c = 18.0;
    w.ph = 7.85;
    w.pe = 8.0;
    add(w, "Ca", 40.0);
    add(w, "Na", 0.0);  // zero: absent
    const auto in = deltag::to_speciation_input(w, db(), deltag::activity::ModelKind::truesdell_jones);
    CHECK(in.label == "makeup");
    CHECK(in.temperature_c == 18.0);
    CHECK(in.activity_model == deltag::activity::ModelKind::truesdell_jones);
    REQUIRE(in.ph.has_value());
    CHECK(*in.ph == 7.85);
    REQUIRE(in.pe.has_value());
    CHECK(*in.pe == 8.0);
    CHECK(in.components.size() == 1);
    CHECK(find(in, "Na+") == nullptr);
    CHECK_FALSE(in.charge_balance_component.has_value());
}

TEST_CASE("a water with no analytes is pure water, balanced on pH") {
    auto w = water();
    w.ph.reset();
    const auto in = convert(w);
    CHECK(in.components.empty());
    CHECK_FALSE(in.ph.has_value());
    CHECK_FALSE(in.charge_balance_component.has_value());
}

TEST_CASE("charge balance") {
    SUBCASE("on pH: pH left to the solver") {
        auto w = water();
        w.ph.reset();
        balance_on(w, "pH");
        add(w, "Na", 23.0);
        const auto in = convert(w);
        CHECK_FALSE(in.ph.has_value());
        CHECK_FALSE(in.charge_balance_component.has_value());
    }
    SUBCASE("on an analyte: its component, pH kept") {
        auto w = water();
        balance_on(w, "Cl");
        add(w, "Na", 23.0);
        add(w, "Cl", 30.0);
        const auto in = convert(w);
        REQUIRE(in.ph.has_value());
        REQUIRE(in.charge_balance_component.has_value());
        CHECK(*in.charge_balance_component == component("Cl-"));
        CHECK(molality(in, "Cl-") > 8e-4);  // 30 mg/L / 35.45 = 0.846 mmol/L, kept as given
    }
    SUBCASE("on an analyte reported as 0: a starting value of 1e-4 mol/kgw") {
        auto w = water();
        balance_on(w, "Cl");
        add(w, "Na", 23.0);
        add(w, "Cl", 0.0);
        const auto in = convert(w);
        CHECK(*in.charge_balance_component == component("Cl-"));
        CHECK(molality(in, "Cl-") == 1e-4);
        CHECK(find(in, "Cl-")->kind == ComponentInput::Kind::total);
    }
}

TEST_CASE("errors: analytes") {
    SUBCASE("an analyte the database does not have, nearest name suggested") {
        auto w = water();
        add(w, "Ca", 40.0, "", "", 7);
        add(w, "Cll", 30.0, "", "", 8);
        check_error(w, "water.lab.analytes.Cll", 8,
                    "unknown analyte 'Cll'; it is not an analyte of the database 'water-input-test' (its analytes: ",
                    "Cl");
    }
    SUBCASE("no suggestion of another substance; HCO3 and CO3 are among the analytes named") {
        auto w = water();
        add(w, "PO4", 1.0, "", "", 8);  // one letter from SO4, but phosphate is not sulfate
        check_error(w, "water.lab.analytes.PO4", 8,
                    "(its analytes: Alkalinity, Ca, Cl, DIC, NO3, Na, SO4, SiO2, HCO3, CO3)");
    }
    SUBCASE("a charge written in the analyte's name leads to the analyte") {
        auto w = water();
        add(w, "HCO3-", 61.0, "", "", 8);
        check_error(w, "water.lab.analytes.HCO3-", 8, "unknown analyte 'HCO3-'", "HCO3");
    }
    SUBCASE("two analytes for one component") {
        auto w = water();
        add(w, "Alkalinity", 120.0, "", "CaCO3", 7);
        add(w, "DIC", 25.0, "", "", 9);
        check_error(w, "water.lab.analytes.DIC", 9,
                    "Alkalinity (line 7) and DIC both give component HCO3-; give only one of them");
    }
    SUBCASE("an unknown unit") {
        auto w = water();
        add(w, "Ca", 40.0, "mg/dL", "", 7);
        check_error(w, "water.lab.analytes.Ca", 7, "unknown concentration unit 'mg/dL'; expected one of: mg/L, ug/L",
                    "mg/L");
    }
    SUBCASE("an unknown unit, nearest name suggested") {
        auto w = water();
        w.units = "mmol/l";
        add(w, "Ca", 1.0, "", "", 7);
        check_error(w, "water.lab.analytes.Ca", 7, "unknown concentration unit 'mmol/l'", "mmol/L");
    }
    SUBCASE("'as' an element the analyte does not contain") {
        auto w = water();
        add(w, "SO4", 40.0, "", "N", 7);
        check_error(w, "water.lab.analytes.SO4.as", 7,
                    "analyte SO4 cannot be given as 'N'; expected one of: CaCO3, S, SO4");  // N is not S: no hint
    }
    SUBCASE("alkalinity as an element") {
        auto w = water();
        add(w, "Alkalinity", 40.0, "", "C", 7);
        check_error(w, "water.lab.analytes.Alkalinity.as", 7,
                    "analyte Alkalinity cannot be given as 'C'; expected one of: CaCO3, HCO3");
    }
    SUBCASE("an uncharged component as CaCO3") {
        auto w = water();
        add(w, "SiO2", 10.0, "", "CaCO3", 7);
        check_error(w, "water.lab.analytes.SiO2.as", 7,
                    "analyte SiO2 cannot be given as 'CaCO3'; expected one of: Si, SiO2");
    }
    SUBCASE("'as' an element with meq/L") {
        auto w = water();
        add(w, "NO3", 1.0, "meq/L", "N", 7);
        check_error(w, "water.lab.analytes.NO3.as", 7,
                    "'as' = 'N' does not apply to a value in meq/L: equivalents are counted per charge");
    }
    SUBCASE("meq/L of an uncharged component") {
        auto w = water();
        add(w, "SiO2", 1.0, "meq/L", "", 7);
        check_error(w, "water.lab.analytes.SiO2", 7,
                    "a value in meq/L needs a charged component, and SiO2 gives H4SiO4, which has no charge");
    }
    SUBCASE("more dissolved mass than the solution holds") {
        auto w = water(1.0);
        add(w, "Na", 600000.0, "", "", 7);
        add(w, "Cl", 500000.0, "", "", 8);
        check_error(w, "water.lab", 1,
                    "the analytes add up to more dissolved mass than the solution holds (1100 g per litre");
    }
}

TEST_CASE("HCO3 and CO3 are taken as total alkalinity (Standard Methods 2320 B)") {
    // Standard Methods 2320 B, Calculation: HCO3 = 1.22 x bicarbonate alkalinity as CaCO3,
    // CO3 = 0.60 x carbonate alkalinity as CaCO3 (from memory); in equivalents
    // alkalinity = HCO3 (mol) + 2 CO3 (mol). 61.016 mg/L HCO3 = 1 meq/L, 30.004 mg/L CO3 =
    // 0.5 mmol/L = 1 meq/L (M(CO3) = 60.008); 2 meq/L in all. Density 1 kg/L; the dissolved
    // mass counts the ions as given: water 1 - (61.016 + 30.004)e-6 kg/L.
    SUBCASE("both ions, mg/L") {
        auto w = water(1.0);
        add(w, "HCO3", 61.016, "", "", 7);
        add(w, "CO3", 30.004, "", "", 8);
        const auto in = convert(w);
        REQUIRE(in.components.size() == 1);
        CHECK(in.components[0].kind == ComponentInput::Kind::alkalinity);
        const double water_kg = 1 - (61.016 + 30.004) * 1e-6;
        CHECK(molality(in, "HCO3-") == near(2e-3 / water_kg).epsilon(1e-6));
        // The note: 2 meq/L x 50.043 mg/meq = 100.086 mg/L as CaCO3; by the Standard Methods
        // factors, 61.016/1.22 + 30.004/0.60 = 50.01 + 50.01 = 100.0 (to their 3 digits).
        REQUIRE(in.notes.size() == 1);
        INFO(in.notes[0]);
        CHECK(contains(in.notes[0], "HCO3 61.016 mg/L and CO3 30.004 mg/L taken as total alkalinity, 100.086 mg/L as CaCO3"));
        CHECK(contains(in.notes[0], "alkalinity as CaCO3 = 50.04 x (HCO3/61.02 + 2 CO3/60.01) mg/L, Standard Methods 2320 B"));
    }
    SUBCASE("the published factors: 122 mg/L HCO3 is 100 mg/L alkalinity as CaCO3") {
        // 1.22 x 100 = 122 mg/L HCO3 (Standard Methods 2320 B, from memory). The conversion
        // gives 122/61.016 x 50.043 = 100.06, within the 3 digits of the factor.
        auto w = water(1.0);
        add(w, "HCO3", 122.0);
        const auto in = convert(w);
        CHECK(molality(in, "HCO3-") * (1 - 122e-6) * 50.043e3 == doctest::Approx(100.0).epsilon(0.005));
    }
    SUBCASE("mmol/L and meq/L: CO3 counts twice in mmol, once in meq") {
        auto w = water(1.0);
        add(w, "CO3", 1.0, "mmol/L");
        add(w, "HCO3", 1.0, "meq/L");
        const double water_kg = 1 - (60.008 + 61.016) * 1e-6;
        CHECK(molality(convert(w), "HCO3-") == near(3e-3 / water_kg).epsilon(1e-6));
    }
    SUBCASE("as CaCO3: already alkalinity as CaCO3") {
        auto w = water(1.0);
        add(w, "HCO3", 50.043, "", "CaCO3");  // 1 meq/L; as HCO3 61.016 mg/L dissolved
        CHECK(molality(convert(w), "HCO3-") == near(1e-3 / (1 - 61.016e-6)).epsilon(1e-6));
    }
    SUBCASE("with the other analytes") {
        auto w = water(1.0);
        add(w, "Ca", 40.078);
        add(w, "HCO3", 61.016);
        const auto in = convert(w);
        CHECK(in.components.size() == 2);
        CHECK(molality(in, "Ca^2+") == near(1e-3 / (1 - (40.078 + 61.016) * 1e-6)).epsilon(1e-6));
    }
}

TEST_CASE("errors: HCO3 and CO3") {
    SUBCASE("with Alkalinity") {
        auto w = water();
        add(w, "Alkalinity", 100.0, "", "CaCO3", 7);
        add(w, "HCO3", 61.0, "", "", 8);
        check_error(w, "water.lab.analytes.HCO3", 8,
                    "HCO3 is taken as alkalinity (HCO3 and CO3 together give the total alkalinity, Standard Methods "
                    "2320 B), and Alkalinity (line 7) gives the alkalinity too; give the alkalinity once: as HCO3 and "
                    "CO3, or as Alkalinity");
    }
    SUBCASE("with DIC") {
        auto w = water();
        add(w, "CO3", 6.0, "", "", 7);
        add(w, "DIC", 25.0, "", "", 9);
        check_error(w, "water.lab.analytes.CO3", 7,
                    "and DIC (line 9) gives the carbonate as a total; give HCO3 and CO3 (the alkalinity, with a "
                    "measured pH) or DIC, not both");
    }
    SUBCASE("as something else") {
        auto w = water();
        add(w, "HCO3", 61.0, "", "C", 7);
        check_error(w, "water.lab.analytes.HCO3.as", 7,
                    "HCO3 cannot be given as 'C'; expected one of: CaCO3, HCO3 (or leave 'as' out: the mass of the ion HCO3)");
    }
    SUBCASE("as CaCO3 with a unit that is not a mass") {
        auto w = water();
        add(w, "CO3", 1.0, "mmol/L", "CaCO3", 7);
        check_error(w, "water.lab.analytes.CO3.as", 7,
                    "'as' = 'CaCO3' applies to a mass (mg/L as CaCO3), not to a value in mmol/L; leave 'as' out");
    }
    SUBCASE("an unknown unit") {
        auto w = water();
        add(w, "HCO3", 1.0, "mg/dl", "", 7);
        check_error(w, "water.lab.analytes.HCO3", 7, "unknown concentration unit 'mg/dl'", "mg/L");
    }
    SUBCASE("without a measured pH") {
        auto w = water();
        w.ph.reset();
        add(w, "HCO3", 61.0, "", "", 7);
        check_error(w, "water.lab", 1, "the pH cannot come from the charge balance when the alkalinity is given");
    }
    SUBCASE("a database without an alkalinity analyte") {
        std::string text(test_database);
        text.replace(text.find("kind = \"alkalinity\"\n"), 20, "");
        const Database no_alkalinity = Database::parse(text, "test-db.toml");
        auto w = water();
        add(w, "HCO3", 61.0, "", "", 7);
        try {
            (void)deltag::to_speciation_input(w, no_alkalinity, deltag::activity::ModelKind::davies);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.key() == "water.lab.analytes.HCO3");
            CHECK(e.where().line == 7);
            CHECK(contains(e.what(), "HCO3 is taken as alkalinity, and the database 'water-input-test' has no analyte "
                                     "of kind alkalinity to take it"));
        }
    }
}

TEST_CASE("errors: a database analyte of kind alkalinity whose component carries none") {
    // A deliberately wrong database: the alkalinity of HCO3- is left at its default, 0.
    std::string text(test_database);
    text.replace(text.find("alkalinity = 1\n"), 15, "");
    const Database bad = Database::parse(text, "test-db.toml");
    auto w = water();
    add(w, "Alkalinity", 100.0, "", "CaCO3", 7);
    try {
        (void)deltag::to_speciation_input(w, bad, deltag::activity::ModelKind::davies);
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        const std::string what = e.what();
        INFO(what);
        CHECK(e.key() == "analytes.Alkalinity");
        CHECK(e.where().file == "test-db.toml");
        CHECK(contains(what, "test-db.toml:" + std::to_string(e.where().line)));
        CHECK(e.where().line > 0);
        CHECK(contains(what, "analyte Alkalinity is of kind alkalinity but its component HCO3- carries no alkalinity"));
    }
}

TEST_CASE("errors: charge balance") {
    SUBCASE("on pH with a measured pH") {
        auto w = water();
        balance_on(w, "pH", 5);
        check_error(w, "water.lab.charge_balance", 5, "charge_balance = \"pH\" contradicts the measured pH = 7");
    }
    SUBCASE("on a name that is not an analyte of the database") {
        auto w = water();
        balance_on(w, "Chloride", 5);
        add(w, "Ca", 40.0);
        check_error(w, "water.lab.charge_balance", 5,
                    "cannot balance the charge on 'Chloride': expected \"pH\" or an analyte of the database "
                    "'water-input-test'");
    }
    SUBCASE("on a misspelt analyte, nearest name suggested") {
        auto w = water();
        balance_on(w, "SO", 5);
        check_error(w, "water.lab.charge_balance", 5, "cannot balance the charge on 'SO'", "SO4");
    }
    SUBCASE("on an alkalinity") {
        auto w = water();
        balance_on(w, "Alkalinity", 5);
        add(w, "Alkalinity", 100.0);
        check_error(w, "water.lab.charge_balance", 5,
                    "cannot balance the charge on Alkalinity: it is an alkalinity, not a total");
    }
    SUBCASE("on an uncharged component") {
        auto w = water();
        balance_on(w, "SiO2", 5);
        add(w, "SiO2", 10.0);
        check_error(w, "water.lab.charge_balance", 5,
                    "cannot balance the charge on SiO2: its component H4SiO4 has no charge");
    }
    SUBCASE("on an analyte the water does not list") {
        auto w = water();
        balance_on(w, "Cl", 5);
        add(w, "Na", 23.0);
        check_error(w, "water.lab.charge_balance", 5,
                    "charge balance on Cl, which is not among the analytes of water lab; list it under "
                    "[water.lab.analytes], with 0 if it was not measured");
    }
    SUBCASE("on pH when the alkalinity is given") {
        // Alkalinity is the charge excess of the conservative ions, so it fixes the charge
        // balance by itself and leaves nothing for the pH to close.
        auto w = water();
        w.ph.reset();
        balance_on(w, "pH", 5);
        add(w, "Alkalinity", 100.0);
        check_error(w, "water.lab.charge_balance", 5,
                    "the pH cannot come from the charge balance when the alkalinity is given");
        w.charge_balance.clear();  // the default (no pH, no choice) is the same balance
        check_error(w, "water.lab", 1, "the pH cannot come from the charge balance when the alkalinity is given");
    }
    SUBCASE("on an analyte without a measured pH") {
        auto w = water();
        w.ph.reset();
        balance_on(w, "Cl", 5);
        add(w, "Cl", 30.0);
        check_error(w, "water.lab.charge_balance", 5, "charge balance on Cl needs a measured pH");
    }
}

TEST_CASE("keys are built from the names when the water was not read from a file") {
    WaterAnalysis w;
    w.name = "well 3";
    w.where = SourceLocation{"samples.csv", 3, 0};
    AnalyteValue a;
    a.name = "Zn";
    a.value = 1.0;
    a.where = SourceLocation{"samples.csv", 3, 5};
    w.analytes.push_back(a);
    try {
        (void)convert(w);
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(e.key() == "water.\"well 3\".analytes.Zn");
        CHECK(contains(e.what(), "samples.csv:3:5"));
    }
}

TEST_CASE("Standard Methods 1030 E acceptance of a charge balance") {
    // Standard Methods 1030 E: |cations - anions| <= 0.2 meq/L for anion sums 0-3 meq/L;
    // |100 (c - a)/(c + a)| <= 2 % for 3-10 meq/L; <= 5 % for 10-800 meq/L.
    using deltag::equilibrium::charge_balance_acceptable;
    using deltag::equilibrium::charge_balance_error_percent;
    CHECK(charge_balance_acceptable(2.9, 2.75));        // 0.15 meq apart
    CHECK_FALSE(charge_balance_acceptable(3.0, 1.194)); // 1.8 meq apart
    CHECK(charge_balance_acceptable(5.0, 5.15));        // -1.48 %
    CHECK_FALSE(charge_balance_acceptable(5.0, 5.3));   // -2.91 %
    CHECK(charge_balance_acceptable(20.0, 21.0));       // -2.44 %
    CHECK_FALSE(charge_balance_acceptable(20.0, 23.0)); // -6.98 %
    CHECK(charge_balance_error_percent(5.0, 5.3) == doctest::Approx(100.0 * -0.3 / 10.3));
    CHECK(charge_balance_error_percent(0.0, 0.0) == 0.0);
}
