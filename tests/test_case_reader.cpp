// Case-file reader: the core of the case-file format (interface contract, "Case file (TOML)
// - the core"), process steps and sweeps, electrode readings, cells and diagrams, and every
// error the reader raises, each checked for its key, its line and what was expected. Keys of
// steps, sweeps, cells and diagrams are written step[N].KEY / sweep[N].KEY / cell[N].KEY /
// diagram[N].KEY, N counted from 1 in file order (see src/io/case_reader.cpp).
// All waters in these tests are invented scenarios.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <iterator>
#include <cstdio>
#include <fstream>
#include <optional>
#include <string>
#include <variant>

#include "deltag/case.hpp"

using deltag::InputError;
using deltag::io::parse_case;

namespace {

std::optional<InputError> error_of(std::string_view text) {
    try {
        (void)parse_case(text, "test.toml");
    } catch (const InputError& e) {
        return e;
    }
    return std::nullopt;
}

bool contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

// The error a text raises: at `line`, on `key`, with `fragment` in its message; the full
// message (what() is what the program prints) names the file, line and key.
void check_error(std::string_view text, const std::string& key, int line, const std::string& fragment,
                 const std::string& suggestion = {}) {
    const auto e = error_of(text);
    REQUIRE_MESSAGE(e.has_value(), "expected an InputError for:\n" << text);
    const std::string what = e->what();
    INFO("message: " << what);
    CHECK(e->key() == key);
    CHECK(e->where().file == "test.toml");
    CHECK(e->where().line == line);
    if (line > 0) CHECK(contains(what, "test.toml:" + std::to_string(line) + ":"));
    else CHECK(what.rfind("test.toml: ", 0) == 0);  // no line to point at
    if (!key.empty()) CHECK(contains(what, "'" + key + "'"));
    CHECK(contains(what, fragment));
    CHECK(e->suggestion() == suggestion);
}

// The case of the interface contract; its [[step]] is contract_step below.
// The water is an invented scenario.
constexpr std::string_view contract_case = R"toml(title = "Make-up water, north cooling loop"
database = "core"
activity_model = "truesdell-jones"

[water.makeup]
temperature_c = 18.0
pH = 7.85
charge_balance = "Cl"
units = "mg/L"
pe = 8.0

[water.makeup.analytes]
Ca = 48.0
Mg = 11.5
Na = 22.0
K = 3.1
Cl = 31.0
SO4 = 42.0
Alkalinity = { value = 135, unit = "mg/L", as = "CaCO3" }
NO3 = { value = 2.1, as = "N" }
SiO2 = 12.0
)toml";

// The contract's [[step]], appended to contract_case: line 22 is empty, [[step]] is line 23.
constexpr std::string_view contract_step = R"toml(
[[step]]
water = "makeup"
kind = "equilibrate"
label = "open to air, calcite present"
solids = ["Calcite"]
partial_pressures = { CO2 = { ppmv = 420 } }
)toml";

}  // namespace

TEST_CASE("the contract's case file reads into a Case") {
    const auto c = parse_case(contract_case, "test.toml");
    CHECK(c.title == "Make-up water, north cooling loop");
    CHECK(c.database == "core");
    CHECK(c.database_where.line == 2);
    CHECK(c.activity_model == deltag::activity::ModelKind::truesdell_jones);
    REQUIRE(c.waters.size() == 1);
    const auto& w = c.waters[0];
    CHECK(w.name == "makeup");
    CHECK(w.where.line == 5);
    CHECK(w.temperature_c == 18.0);
    REQUIRE(w.ph.has_value());
    CHECK(*w.ph == 7.85);
    REQUIRE(w.pe.has_value());
    CHECK(*w.pe == 8.0);
    CHECK(w.charge_balance == "Cl");
    CHECK(w.charge_balance_where.line == 8);
    CHECK(w.units == "mg/L");
    CHECK_FALSE(w.density_kg_per_l.has_value());

    // Analytes in file order, each with its line and dotted key.
    const char* names[] = {"Ca", "Mg", "Na", "K", "Cl", "SO4", "Alkalinity", "NO3", "SiO2"};
    REQUIRE(w.analytes.size() == 9);
    for (std::size_t i = 0; i < 9; ++i) {
        CHECK(w.analytes[i].name == names[i]);
        CHECK(w.analytes[i].where.line == static_cast<int>(13 + i));
        CHECK(w.analytes[i].where.file == "test.toml");
        CHECK(w.analytes[i].key == std::string("water.makeup.analytes.") + names[i]);
    }
    CHECK(w.analytes[0].value == 48.0);
    CHECK(w.analytes[0].unit.empty());
    CHECK(w.analytes[0].as.empty());
    CHECK(w.analytes[6].value == 135.0);
    CHECK(w.analytes[6].unit == "mg/L");
    CHECK(w.analytes[6].as == "CaCO3");
    CHECK(w.analytes[7].value == 2.1);
    CHECK(w.analytes[7].unit.empty());
    CHECK(w.analytes[7].as == "N");
}

TEST_CASE("defaults: database core, Davies, 25 degC, mg/L, charge balance on pH without a pH") {
    const auto c = parse_case("[water.pure]\n", "test.toml");
    CHECK(c.title.empty());
    CHECK(c.database == "core");
    CHECK(c.activity_model == deltag::activity::ModelKind::davies);
    REQUIRE(c.waters.size() == 1);
    const auto& w = c.waters[0];
    CHECK(w.name == "pure");
    CHECK(w.temperature_c == 25.0);
    CHECK(w.units == "mg/L");
    CHECK(w.analytes.empty());  // a water with no analytes is pure water
    CHECK_FALSE(w.ph.has_value());
    CHECK_FALSE(w.pe.has_value());
    CHECK(w.charge_balance == "pH");
    CHECK(w.charge_balance_where.line == 1);
}

TEST_CASE("a measured pH without charge_balance: no charge balance") {
    const auto c = parse_case("[water.a]\npH = 7\n", "test.toml");
    CHECK(c.waters[0].charge_balance.empty());
    CHECK(*c.waters[0].ph == 7.0);
}

TEST_CASE("waters keep the order of the file, not the order of their names") {
    const auto c = parse_case(R"toml([water.zeta]
pH = 8
[water.alpha]
pH = 7
[water."well 3"]
temperature_c = 12
density_kg_per_l = 1.02
units = "mmol/L"
charge_balance = "pH"
)toml", "test.toml");
    REQUIRE(c.waters.size() == 3);
    CHECK(c.waters[0].name == "zeta");
    CHECK(c.waters[1].name == "alpha");
    CHECK(c.waters[2].name == "well 3");
    CHECK(c.waters[2].temperature_c == 12.0);
    CHECK(*c.waters[2].density_kg_per_l == 1.02);
    CHECK(c.waters[2].units == "mmol/L");
    CHECK(c.waters[2].charge_balance == "pH");
    CHECK(c.waters[2].charge_balance_where.line == 9);
}

TEST_CASE("analytes keep the order of the file; dotted keys are quoted where needed") {
    const auto c = parse_case(R"toml([water.a.analytes]
Zn = 0.1
"Mn 2" = 0.2
Al = { value = 3 }
)toml", "test.toml");
    const auto& an = c.waters[0].analytes;
    REQUIRE(an.size() == 3);
    CHECK(an[0].name == "Zn");
    CHECK(an[1].name == "Mn 2");
    CHECK(an[1].key == "water.a.analytes.\"Mn 2\"");
    CHECK(an[2].name == "Al");
    CHECK(an[2].value == 3.0);
}

TEST_CASE("redox states of an element given apart: one analyte per state, named \"Fe +2\"") {
    const auto c = parse_case(R"toml([water.a]
units = "mg/L"
[water.a.analytes]
Ca = 40
Fe = { "+2" = 2.4, "+3" = "<0.05" }
Mn = { "+2" = { value = 80, unit = "ug/L" }, "+4" = 0.01, unit = "mmol/L" }
)toml", "test.toml");
    const auto& an = c.waters[0].analytes;
    REQUIRE(an.size() == 5);
    CHECK(an[0].name == "Ca");
    CHECK(an[0].element.empty());
    CHECK(an[0].oxidation_state.empty());
    CHECK(an[1].name == "Fe +2");
    CHECK(an[1].element == "Fe");
    CHECK(an[1].oxidation_state == "+2");
    CHECK(an[1].value == 2.4);
    CHECK(an[1].unit.empty());  // the water's unit
    CHECK(an[1].key == "water.a.analytes.Fe.\"+2\"");
    CHECK(an[1].where.line == 5);
    CHECK(an[2].name == "Fe +3");
    CHECK(an[2].below_detection);
    CHECK(an[2].value == 0.05);
    // The table's unit goes to the states that give none of their own.
    CHECK(an[3].name == "Mn +2");
    CHECK(an[3].unit == "ug/L");
    CHECK(an[3].value == 80.0);
    CHECK(an[4].name == "Mn +4");
    CHECK(an[4].unit == "mmol/L");
}

TEST_CASE("errors: redox states given apart") {
    // Lines 1-4 are the water; the analyte under test is on line 5.
    const std::string water = "[water.a]\npH = 7\n[water.a.analytes]\nCa = 40\n";
    SUBCASE("the valence in parentheses: the element's table is asked for") {
        check_error(water + "\"Fe(2)\" = 2.4\n", "water.a.analytes.\"Fe(2)\"", 5,
                    "redox states of an element are given in its own table, by signed oxidation state: Fe = { \"+2\" = "
                    "..., \"+3\" = ... }",
                    "Fe");
        check_error(water + "\"Fe(III)\" = 0.3\n", "water.a.analytes.\"Fe(III)\"", 5,
                    "redox states of an element are given in its own table", "Fe");
    }
    SUBCASE("a state written as the database names it") {
        check_error(water + "\"Fe +2\" = 2.4\n", "water.a.analytes.\"Fe +2\"", 5,
                    "redox states of an element are given in its own table", "Fe");
    }
    SUBCASE("a state without its sign, alongside a signed one") {
        check_error(water + "Fe = { \"+2\" = 2.4, \"3\" = 0.3 }\n", "water.a.analytes.Fe.3", 5,
                    "unknown key in the redox states of Fe; expected signed oxidation states, such as \"+2\" and \"+3\", "
                    "and unit",
                    "+3");
    }
    SUBCASE("states without their sign, in roman numerals") {
        check_error(water + "Fe = { II = 2.4, III = 0.3 }\n", "water.a.analytes.Fe.II", 5,
                    "a redox state is written as a signed oxidation state, as in Fe = { \"+2\" = ..., \"+3\" = ... }",
                    "+2");
    }
    SUBCASE("a key of the analyte table among the states") {
        check_error(water + "Fe = { \"+2\" = 2.4, value = 3 }\n", "water.a.analytes.Fe.value", 5,
                    "unknown key in the redox states of Fe");
    }
    SUBCASE("a negative state") {
        check_error(water + "Fe = { \"+2\" = -1, \"+3\" = 0.3 }\n", "water.a.analytes.Fe.\"+2\"", 5,
                    "expected a concentration of zero or more, found -1");
    }
    SUBCASE("an unknown unit for the states, nearest suggested") {
        check_error(water + "Fe = { \"+2\" = 2.4, \"+3\" = 0.3, unit = \"mg/l\" }\n", "water.a.analytes.Fe.unit", 5,
                    "unknown concentration unit 'mg/l'", "mg/L");
    }
    SUBCASE("charge balance on an element given by state") {
        check_error("[water.a]\npH = 7\ncharge_balance = \"Fe\"\n[water.a.analytes]\nCa = 40\nFe = { \"+2\" = 2.4, \"+3\" = 0.3 }\n",
                    "water.a.charge_balance", 3,
                    "charge balance on Fe, which is not among the analytes of this water (Ca)");
    }
}

TEST_CASE("every activity model name is accepted") {
    for (const auto& name : deltag::activity::model_names()) {
        const auto c = parse_case("activity_model = \"" + name + "\"\n[water.a]\n", "test.toml");
        CHECK(deltag::activity::model_name(c.activity_model) == name);
    }
}

TEST_CASE("every concentration unit is accepted, for the water and for one analyte") {
    for (const auto& u : deltag::concentration_units()) {
        const auto c = parse_case("[water.a]\nunits = \"" + u + "\"\n[water.a.analytes]\nCa = { value = 1, unit = \"" +
                                      u + "\" }\n",
                                  "test.toml");
        CHECK(c.waters[0].units == u);
        CHECK(c.waters[0].analytes[0].unit == u);
    }
    // The Greek mu (U+03BC) looks like the micro sign (U+00B5) and is accepted too.
    const auto c = parse_case("[water.a.analytes]\nCa = { value = 1, unit = \"\u03BCg/L\" }\n", "test.toml");
    CHECK(c.waters[0].analytes[0].unit == "\u03BCg/L");
}

TEST_CASE("values below the detection limit, as a lab writes them") {
    const auto c = parse_case("[water.a]\nbelow_detection = \"limit\"\n[water.a.analytes]\nFe = \"<0.05\"\n"
                              "Mn = { value = \" < 2.5e-3 \", unit = \"mmol/L\" }\nCa = 40\n",
                              "test.toml");
    const auto& w = c.waters[0];
    CHECK(w.below_detection == "limit");
    CHECK(w.below_detection_where.line == 2);
    REQUIRE(w.analytes.size() == 3);
    CHECK(w.analytes[0].below_detection);
    CHECK(w.analytes[0].value == 0.05);
    CHECK(w.analytes[1].below_detection);
    CHECK(w.analytes[1].value == 2.5e-3);
    CHECK(w.analytes[1].unit == "mmol/L");
    CHECK_FALSE(w.analytes[2].below_detection);
    // The default rule is half the limit.
    CHECK(parse_case("[water.a]\n", "test.toml").waters[0].below_detection == "half");
    for (const auto& rule : deltag::below_detection_rules())
        CHECK(parse_case("[water.a]\nbelow_detection = \"" + rule + "\"\n", "test.toml").waters[0].below_detection == rule);
}

TEST_CASE("the range limits themselves are accepted") {
    const auto c = parse_case(R"toml([water.low]
temperature_c = 0
pH = 0
pe = -20
density_kg_per_l = 0.9
[water.high]
temperature_c = 100
pH = 14
pe = 20
density_kg_per_l = 1.5
[water.high.analytes]
Ca = 0
)toml", "test.toml");
    CHECK(c.waters[0].temperature_c == 0.0);
    CHECK(c.waters[1].temperature_c == 100.0);
    CHECK(c.waters[1].analytes[0].value == 0.0);
}

TEST_CASE("read_case reads a file and remembers its path") {
    const std::string path = "deltag_test_case_reader.toml";
    {
        std::ofstream out(path);
        out << "title = \"file\"\n[water.a]\npH = 7\n";
    }
    const auto c = deltag::io::read_case(path);
    std::remove(path.c_str());
    CHECK(c.path == path);
    CHECK(c.title == "file");
    CHECK(c.waters[0].where.file == path);
}

TEST_CASE("read_case: a file that cannot be opened") {
    try {
        (void)deltag::io::read_case("no/such/dir/case.toml");
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(e.where().file == "no/such/dir/case.toml");
        CHECK(contains(e.what(), "no/such/dir/case.toml"));
        CHECK(contains(e.what(), "cannot open the case file"));
    }
}

TEST_CASE("errors: the file as a whole") {
    SUBCASE("not TOML") {
        check_error("title = \"a\"\n[water.a\n", "", 2, "not valid TOML");
    }
    SUBCASE("unknown top-level key, nearest name suggested") {
        check_error("titel = \"a\"\n[water.a]\n", "titel", 1, "unknown key; expected one of: title, database",
                    "title");
    }
    SUBCASE("title of the wrong type") {
        check_error("[water.a]\n[title]\n", "title", 2, "expected a string, found a table");
    }
    SUBCASE("empty database name") {
        check_error("database = \"\"\n[water.a]\n", "database", 1, "expected \"core\" (the embedded database) or the path");
    }
    SUBCASE("unknown activity model, nearest name suggested") {
        check_error("title = \"t\"\nactivity_model = \"davis\"\n[water.a]\n", "activity_model", 2,
                    "unknown activity model 'davis'; expected one of: ideal, davies, debye-huckel, "
                    "truesdell-jones, b-dot",
                    "davies");
    }
    SUBCASE("no water at all") {
        check_error("title = \"t\"\n", "water", 0, "a case needs at least one water");
    }
    SUBCASE("an empty [water] table") {
        check_error("title = \"t\"\n[water]\n", "water", 2, "a case needs at least one water");
    }
    SUBCASE("water as an array of tables") {
        check_error("title = \"t\"\n[[water]]\npH = 7\n", "water", 2,
                    "expected tables [water.NAME], one per water, found an array");
    }
    SUBCASE("a water that is not a table") {
        check_error("[water]\nmakeup = 7\n", "water.makeup", 2,
                    "expected a table [water.makeup] describing a water, found an integer");
    }
}

TEST_CASE("errors: cell and diagram must be arrays of tables") {
    SUBCASE("[cell] as a table") {
        check_error("[water.a]\n\n[cell]\ncathode = \"x\"\n", "cell", 3,
                    "expected [[cell]] tables, one per cell, found a table ([cell]); write [[cell]]");
    }
    SUBCASE("diagram as a string") {
        check_error("diagram = \"Fe\"\n[water.a]\n", "diagram", 1,
                    "expected [[diagram]] tables, one per diagram, found a string");
    }
    SUBCASE("an element of cell that is not a table") {
        check_error("cell = [1]\n[water.a]\n", "cell[1]", 1, "expected a table describing a cell ([[cell]]), found an integer");
    }
    SUBCASE("an unknown top-level key lists cell and diagram") {
        check_error("[water.a]\n[[diagrams]]\nelement = \"Fe\"\n", "diagrams", 2,
                    "unknown key; expected one of: title, database, activity_model, water, step, sweep, cell, diagram",
                    "diagram");
    }
}

TEST_CASE("errors: the keys of a water") {
    SUBCASE("unknown key, nearest name suggested") {
        check_error("[water.a]\ntemperature = 20\n", "water.a.temperature", 2,
                    "unknown key; expected one of: temperature_c, pH, pe", "temperature_c");
    }
    SUBCASE("temperature below 0") {
        check_error("[water.a]\ntemperature_c = -5\n", "water.a.temperature_c", 2,
                    "expected a temperature from 0 to 100 °C (the range of the water-property "
                    "correlations), found -5");
    }
    SUBCASE("temperature above 100") {
        check_error("[water.a]\npH = 7\ntemperature_c = 120.5\n", "water.a.temperature_c", 3,
                    "from 0 to 100 °C (the range of the water-property correlations), found 120.5");
    }
    SUBCASE("temperature as a string") {
        check_error("[water.a]\ntemperature_c = \"hot\"\n", "water.a.temperature_c", 2,
                    "expected a number, found a string");
    }
    SUBCASE("pH out of range") {
        check_error("[water.a]\npH = 15\n", "water.a.pH", 2, "expected a pH from 0 to 14, found 15");
    }
    SUBCASE("pe out of range") {
        check_error("[water.a]\npH = 7\npe = -25\n", "water.a.pe", 3, "expected a pe from -20 to 20, found -25");
    }
    SUBCASE("density out of range") {
        check_error("[water.a]\ndensity_kg_per_l = 997\n", "water.a.density_kg_per_l", 2,
                    "expected a solution density from 0.9 to 1.5 kg/L, found 997");
    }
    SUBCASE("unknown unit, nearest name suggested") {
        check_error("[water.a]\nunits = \"mg/l\"\n", "water.a.units", 2,
                    "unknown concentration unit 'mg/l'; expected one of: mg/L, ug/L, µg/L, g/L, mol/L, mmol/L, "
                    "umol/L, µmol/L, meq/L, mg/kg, ppm, mol/kgw, mmol/kgw, umol/kgw, µmol/kgw, mg/kgw, g/kgw",
                    "mg/L");
    }
    SUBCASE("analytes not a table") {
        check_error("[water.a]\nanalytes = [1, 2]\n", "water.a.analytes", 2, "expected a table, found an array");
    }
    SUBCASE("a water name that needs quotes is quoted in the key") {
        check_error("[water.\"well 3\"]\npH = -1\n", "water.\"well 3\".pH", 2, "expected a pH from 0 to 14");
    }
}

TEST_CASE("errors: pH and charge balance") {
    SUBCASE("a measured pH and charge balance on pH contradict each other") {
        check_error("[water.a]\npH = 7.2\ncharge_balance = \"pH\"\n", "water.a.charge_balance", 3,
                    "charge_balance = \"pH\" contradicts the measured pH = 7.2 (line 2)");
    }
    SUBCASE("charge balance on an analyte needs a measured pH") {
        check_error("[water.a]\ncharge_balance = \"Cl\"\n[water.a.analytes]\nCl = 10\n", "water.a.charge_balance", 2,
                    "charge balance on Cl needs a measured pH");
    }
    SUBCASE("charge balance on an analyte the water does not list") {
        check_error("[water.a]\npH = 7\ncharge_balance = \"Cll\"\n[water.a.analytes]\nCl = 10\nNa = 5\n",
                    "water.a.charge_balance", 3,
                    "charge balance on Cll, which is not among the analytes of this water (Cl, Na); list it under "
                    "[water.a.analytes], with 0 if it was not measured",
                    "Cl");
    }
    SUBCASE("charge balance on an analyte of a water with no analytes") {
        check_error("[water.a]\npH = 7\ncharge_balance = \"Na\"\n", "water.a.charge_balance", 3,
                    "which is not among the analytes of this water (it has none)");
    }
    SUBCASE("empty charge_balance") {
        check_error("[water.a]\npH = 7\ncharge_balance = \"\"\n", "water.a.charge_balance", 3,
                    "expected \"pH\" or the name of an analyte to adjust, found an empty string");
    }
    SUBCASE("pH in the wrong case") {
        check_error("[water.a]\ncharge_balance = \"ph\"\n", "water.a.charge_balance", 2,
                    "expected \"pH\" or the name of an analyte to adjust, found \"ph\"", "pH");
    }
    SUBCASE("pH in the wrong case with a measured pH: \"pH\" would be refused too, so it is not suggested") {
        check_error("[water.a]\npH = 7.8\ncharge_balance = \"PH\"\n", "water.a.charge_balance", 3,
                    "found \"PH\", but the pH is measured (pH = 7.8) and cannot also close the charge balance; name an "
                    "analyte to adjust, such as \"Cl\", or leave charge_balance out");
    }
}

TEST_CASE("errors: analytes") {
    SUBCASE("a negative value") {
        check_error("[water.a.analytes]\nCa = 40\nMg = -1.5\n", "water.a.analytes.Mg", 3,
                    "expected a concentration of zero or more, found -1.5");
    }
    SUBCASE("a negative value in a table") {
        check_error("[water.a.analytes]\nNO3 = { value = -2, as = \"N\" }\n", "water.a.analytes.NO3", 2,
                    "expected a concentration of zero or more, found -2");
    }
    SUBCASE("a value that is neither a number nor a table") {
        check_error("[water.a]\n[water.a.analytes]\nCa = [0.1]\n", "water.a.analytes.Ca", 3,
                    "expected a concentration: a number, a value below the detection limit such as \"<0.05\", or a "
                    "table { value = ..., unit = ..., as = ... }; found an array");
    }
    SUBCASE("a string that is not a value below detection") {
        check_error("[water.a]\n[water.a.analytes]\nCa = \"0.1\"\n", "water.a.analytes.Ca", 3,
                    "expected a concentration (a number, without quotes) or a value below the detection limit, "
                    "written \"<\" and the limit, such as \"<0.05\"; found \"0.1\"");
        check_error("[water.a.analytes]\nFe = \"ND\"\n", "water.a.analytes.Fe", 2, "found \"ND\"");
    }
    SUBCASE("a value below detection whose limit is not a number") {
        for (const char* bad : {"<", "< ", "<0.05 mg/L", "<abc", "<0x10", "<inf", "<1e999", "<-0.05", "<<0.05"}) {
            CAPTURE(bad);
            check_error("[water.a.analytes]\nFe = \"" + std::string(bad) + "\"\n", "water.a.analytes.Fe", 2,
                        "\": the limit is not a number");
        }
    }
    SUBCASE("a detection limit of zero") {
        check_error("[water.a.analytes]\nFe = \"<0\"\n", "water.a.analytes.Fe", 2,
                    "expected a detection limit above zero after \"<\", found \"<0\"; a value measured as zero "
                    "is written 0, without quotes");
    }
    SUBCASE("a value below detection in a table: the key is that of the value") {
        check_error("[water.a.analytes.Fe]\nunit = \"mg/L\"\nvalue = \"<x\"\n", "water.a.analytes.Fe.value", 3,
                    "the limit is not a number");
    }
    SUBCASE("an unknown rule for values below detection") {
        check_error("[water.a]\nbelow_detection = \"halve\"\n", "water.a.below_detection", 2,
                    "expected what a value below its detection limit (\"<0.05\") counts as: \"half\" the limit, "
                    "\"zero\" or the \"limit\" itself; found \"halve\"",
                    "half");
    }
    SUBCASE("a value that is not finite") {
        check_error("[water.a.analytes]\nCa = nan\n", "water.a.analytes.Ca", 2, "expected a finite number");
    }
    SUBCASE("a value in a table that is not finite") {
        check_error("[water.a.analytes]\nCa = { value = inf }\n", "water.a.analytes.Ca.value", 2,
                    "expected a finite number");
    }
    SUBCASE("a table without value") {
        check_error("[water.a.analytes]\nCa = { unit = \"mg/L\" }\n", "water.a.analytes.Ca.value", 2,
                    "missing: expected the concentration, a number (value = ...)");
    }
    SUBCASE("a table with an unknown key, nearest name suggested") {
        check_error("[water.a.analytes]\nCa = { value = 4, units = \"mg/L\" }\n", "water.a.analytes.Ca.units", 2,
                    "unknown key; expected one of: value, unit, as", "unit");
    }
    SUBCASE("a table with an unknown unit") {
        check_error("[water.a.analytes]\nCa = { value = 4, unit = \"ppb\" }\n", "water.a.analytes.Ca.unit", 2,
                    "unknown concentration unit 'ppb'", "ppm");
    }
    SUBCASE("a table with an empty 'as'") {
        check_error("[water.a.analytes]\nNO3 = { value = 4, as = \"\" }\n", "water.a.analytes.NO3.as", 2,
                    "expected what the value is expressed as (\"CaCO3\" or an element symbol such as \"N\"), "
                    "found an empty string");
    }
    SUBCASE("'as' of the wrong type") {
        check_error("[water.a.analytes]\nNO3 = { value = 4, as = 14 }\n", "water.a.analytes.NO3.as", 2,
                    "expected a string, found an integer");
    }
}

// --- process steps and sweeps -------------------------------------------------------------

namespace {

using deltag::process::BlendStep;
using deltag::process::ConcentrateStep;
using deltag::process::DoseStep;
using deltag::process::DoseTarget;
using deltag::process::EquilibrateStep;
using deltag::process::Sweep;
using deltag::process::TemperatureStep;

// One invented water on lines 1-2; step_of() puts a [[step]] on line 3 and its kind on line 4,
// so the first of `lines` is line 5.
const std::string one_water = "[water.well]\npH = 7.5\n";
std::string step_of(const std::string& kind, const std::string& lines) {
    return one_water + "[[step]]\nkind = \"" + kind + "\"\n" + lines;
}
constexpr int first = 5;  // line of the first of step_of's `lines`

// Two invented waters on lines 1-4.
const std::string two_waters = "[water.well]\npH = 7.5\n[water.river]\npH = 7.9\n";

// Five labelled steps of every kind that a sweep can vary (invented), then [[sweep]] on
// line 25: the first of sweep_with's `lines` is line 26.
const std::string sweep_base = one_water + R"toml([[step]]
label = "heat"
kind = "temperature"
temperature_c = 40
[[step]]
label = "acid"
kind = "dose"
reagent = "H2SO4"
until = { pH = 7 }
[[step]]
label = "cycles"
kind = "concentrate"
factor = 2
[[step]]
label = "mix"
kind = "blend"
waters = { well = 1, cycles = 1 }
[[step]]
label = "lime"
kind = "dose"
reagent = "Ca(OH)2"
amount = { value = 1, unit = "mmol/kgw" }
)toml";
std::string sweep_with(const std::string& lines) { return sweep_base + "[[sweep]]\n" + lines; }
constexpr int sw = 26;  // line of the first of sweep_with's `lines`
const std::string factor_sweep = "step = \"cycles\"\nvariable = \"factor\"\nfrom = 1\nto = 4\n";  // lines sw..sw+3

}  // namespace

TEST_CASE("the contract's [[step]] reads into an equilibrate step") {
    const auto c = parse_case(std::string(contract_case) + std::string(contract_step), "test.toml");
    REQUIRE(c.steps.size() == 1);
    const auto& s = c.steps[0];
    CHECK(s.label == "open to air, calcite present");
    CHECK(s.water == "makeup");
    CHECK(s.where.line == 23);
    CHECK(s.where.file == "test.toml");
    CHECK(s.water_where.line == 24);
    CHECK(s.water_where.column == 1);
    REQUIRE(std::holds_alternative<EquilibrateStep>(s.action));
    const auto& e = std::get<EquilibrateStep>(s.action);
    REQUIRE(e.minerals.size() == 1);
    CHECK(e.minerals[0].name == "Calcite");
    CHECK(e.minerals[0].target_si == 0.0);
    CHECK_FALSE(e.minerals[0].on_hand_mol_per_kgw.has_value());
    CHECK(e.minerals[0].may_form);
    CHECK(e.minerals[0].may_dissolve);
    CHECK(e.minerals[0].where.line == 27);
    CHECK(e.minerals[0].where.column == 11);  // the name "Calcite" in the list
    REQUIRE(e.gases.size() == 1);
    CHECK(e.gases[0].name == "CO2(g)");  // the formula CO2 is the database's gas CO2(g)
    // 420 ppmv at 1 atm total is 420e-6 atm (Dalton's law).
    CHECK(e.gases[0].log_partial_pressure_atm == doctest::Approx(std::log10(420e-6)));
    CHECK(e.gases[0].where.line == 28);
    CHECK(e.gases[0].where.column == 23);
    CHECK(c.sweeps.empty());
}

TEST_CASE("every kind of step and a sweep read into their structs, in file order") {
    const auto c = parse_case(R"toml(title = "Cooling loop (invented scenario)"

[water.makeup]
pH = 7.85
[water.well]
pH = 7.2
[water.river]
pH = 8.1

[[step]]
water = "makeup"
label = "open to air"
kind = "equilibrate"
solids = { Calcite = {}, Gypsum = { hold_si = 0.5, on_hand_mmol_per_kgw = 2.0, may_form = false } }
partial_pressures = { CO2 = { ppmv = 420 } }

[[step]]
kind = "dose"
reagent = "H2SO4"
amount = { value = 0.5, unit = "mmol/kgw" }

[[step]]
kind = "dose"
reagent = "NaOH"
until = { pH = 7.2 }
max_amount = { value = 10, unit = "mmol/L" }

[[step]]
kind = "blend"
waters = { well = 0.7, river = 0.3 }
by = "mass"

[[step]]
label = "concentrate"
water = "open to air"
kind = "concentrate"
factor = 4.0
precipitate = ["Calcite", "Gypsum"]

[[step]]
kind = "temperature"
temperature_c = 45.0
equilibrate = true

[[sweep]]
label = "cycles"
step = "concentrate"
variable = "factor"
from = 1.0
to = 6.0
points = 26
outputs = ["si:Calcite", "si:Gypsum", "pH", "langelier"]
csv = "cycles.csv"
svg = "cycles.svg"
)toml", "test.toml");
    REQUIRE(c.waters.size() == 3);
    REQUIRE(c.steps.size() == 6);

    const auto& s1 = c.steps[0];
    CHECK(s1.label == "open to air");
    CHECK(s1.water == "makeup");
    CHECK(s1.where.line == 10);
    CHECK(s1.water_where.line == 11);
    const auto& e = std::get<EquilibrateStep>(s1.action);
    REQUIRE(e.minerals.size() == 2);
    CHECK(e.minerals[0].name == "Calcite");  // file order, not key order
    CHECK(e.minerals[1].name == "Gypsum");
    CHECK(e.minerals[1].target_si == 0.5);
    REQUIRE(e.minerals[1].on_hand_mol_per_kgw.has_value());
    CHECK(*e.minerals[1].on_hand_mol_per_kgw == doctest::Approx(2.0e-3));  // mmol -> mol
    CHECK_FALSE(e.minerals[1].may_form);
    CHECK(e.minerals[1].may_dissolve);
    CHECK(e.minerals[1].where.line == 14);
    CHECK(e.minerals[1].where.column == 26);
    CHECK(e.gases.at(0).where.line == 15);

    const auto& s2 = c.steps[1];
    CHECK(s2.label == "step 2 (dose)");
    CHECK(s2.water.empty());  // the previous result
    CHECK(s2.where.line == 17);
    CHECK(s2.water_where.line == 0);
    const auto& d2 = std::get<DoseStep>(s2.action);
    CHECK(d2.reagent == "H2SO4");
    CHECK(d2.reagent_where.line == 19);
    REQUIRE(d2.amount.has_value());
    CHECK(d2.amount->value == 0.5);
    CHECK(d2.amount->unit == "mmol/kgw");
    CHECK(d2.amount->where.line == 20);
    CHECK_FALSE(d2.until.has_value());
    CHECK_FALSE(d2.max_amount.has_value());

    const auto& d3 = std::get<DoseStep>(c.steps[2].action);
    CHECK(c.steps[2].label == "step 3 (dose)");
    CHECK(d3.reagent == "NaOH");
    CHECK_FALSE(d3.amount.has_value());
    REQUIRE(d3.until.has_value());
    CHECK(d3.until->kind == DoseTarget::Kind::ph);
    CHECK(d3.until->value == 7.2);
    CHECK(d3.until->mineral.empty());
    CHECK(d3.until->where.line == 25);
    REQUIRE(d3.max_amount.has_value());
    CHECK(d3.max_amount->value == 10.0);
    CHECK(d3.max_amount->unit == "mmol/L");
    CHECK(d3.max_amount->where.line == 26);

    const auto& s4 = c.steps[3];
    CHECK(s4.label == "step 4 (blend)");
    CHECK(s4.water.empty());
    const auto& b = std::get<BlendStep>(s4.action);
    CHECK(b.basis == BlendStep::Basis::mass);
    REQUIRE(b.parts.size() == 2);
    CHECK(b.parts[0].first == "well");
    CHECK(b.parts[0].second == doctest::Approx(0.7));
    CHECK(b.parts[1].first == "river");
    CHECK(b.parts[1].second == doctest::Approx(0.3));
    REQUIRE(b.part_where.size() == 2);
    CHECK(b.part_where[0].line == 30);
    CHECK(b.part_where[0].column == 12);
    CHECK(b.part_where[1].column == 24);

    const auto& s5 = c.steps[4];
    CHECK(s5.label == "concentrate");
    CHECK(s5.water == "open to air");  // an earlier step's label
    CHECK(s5.water_where.line == 35);
    const auto& k = std::get<ConcentrateStep>(s5.action);
    CHECK(k.factor == 4.0);
    REQUIRE(k.precipitate.size() == 2);
    CHECK(k.precipitate[0] == "Calcite");
    CHECK(k.precipitate[1] == "Gypsum");
    REQUIRE(k.precipitate_where.size() == 2);
    CHECK(k.precipitate_where[0].line == 38);
    CHECK(k.precipitate_where[0].column == 16);
    CHECK(k.precipitate_where[1].column == 27);

    const auto& s6 = c.steps[5];
    CHECK(s6.label == "step 6 (temperature)");
    const auto& t = std::get<TemperatureStep>(s6.action);
    CHECK(t.temperature_c == 45.0);
    CHECK(t.equilibrate);

    REQUIRE(c.sweeps.size() == 1);
    const auto& w = c.sweeps[0];
    CHECK(w.label == "cycles");
    CHECK(w.step == "concentrate");
    CHECK(w.variable == Sweep::Variable::factor);
    CHECK(w.from == 1.0);
    CHECK(w.to == 6.0);
    CHECK(w.points == 26);
    CHECK(w.fraction_of.empty());
    CHECK(w.outputs == std::vector<std::string>{"si:Calcite", "si:Gypsum", "pH", "langelier"});
    CHECK(w.csv_path == "cycles.csv");
    CHECK(w.svg_path == "cycles.svg");
    CHECK(w.where.line == 45);
}

TEST_CASE("step defaults: free to form and dissolve, unlimited solid, volume basis, no re-equilibration") {
    const auto c = parse_case(one_water + R"toml([[step]]
kind = "equilibrate"
solids = { Calcite = { } }
[[step]]
kind = "equilibrate"
partial_pressures = { O2 = { log10_atm = -0.68 } }
[[step]]
kind = "temperature"
temperature_c = 0
[[step]]
kind = "blend"
waters = { well = 1, "step 3 (temperature)" = 1 }
)toml", "test.toml");
    REQUIRE(c.steps.size() == 4);
    CHECK(c.steps[0].water.empty());  // one water: the first step starts from it
    const auto& m = std::get<EquilibrateStep>(c.steps[0].action).minerals.at(0);
    CHECK(m.target_si == 0.0);
    CHECK_FALSE(m.on_hand_mol_per_kgw.has_value());
    CHECK(m.may_form);
    CHECK(m.may_dissolve);
    CHECK(std::get<EquilibrateStep>(c.steps[0].action).gases.empty());
    CHECK(std::get<EquilibrateStep>(c.steps[1].action).minerals.empty());
    CHECK(std::get<EquilibrateStep>(c.steps[1].action).gases.at(0).log_partial_pressure_atm == -0.68);
    CHECK_FALSE(std::get<TemperatureStep>(c.steps[2].action).equilibrate);
    for (const auto& s : c.steps) CHECK_FALSE(s.keep_redox_states_apart);
    CHECK(std::get<TemperatureStep>(c.steps[2].action).temperature_c == 0.0);
    const auto& b = std::get<BlendStep>(c.steps[3].action);
    CHECK(b.basis == BlendStep::Basis::volume);
    REQUIRE(b.parts.size() == 2);
    CHECK(b.parts[1].first == "step 3 (temperature)");  // a default label can be referred to
    CHECK(b.parts[1].second == 0.5);
}

TEST_CASE("keep_redox_states_apart is read by equilibrate, dose and temperature with equilibrate") {
    const auto c = parse_case(one_water + R"toml([[step]]
kind = "equilibrate"
partial_pressures = { O2 = { percent = 21 } }
keep_redox_states_apart = true
[[step]]
kind = "dose"
reagent = "NaOCl"
amount = { value = 1, unit = "mg/L" }
keep_redox_states_apart = true
[[step]]
kind = "temperature"
temperature_c = 40
equilibrate = true
keep_redox_states_apart = false
[[step]]
kind = "temperature"
temperature_c = 45
equilibrate = true
keep_redox_states_apart = true
)toml", "test.toml");
    REQUIRE(c.steps.size() == 4);
    CHECK(c.steps[0].keep_redox_states_apart);
    CHECK(c.steps[1].keep_redox_states_apart);
    CHECK_FALSE(c.steps[2].keep_redox_states_apart);
    CHECK(c.steps[3].keep_redox_states_apart);
    // Blends and concentrate steps bring no redox level: the key is not theirs.
    check_error(step_of("concentrate", "factor = 2\nkeep_redox_states_apart = true\n"), "step[1].keep_redox_states_apart",
                first + 1, "'keep_redox_states_apart' does not belong to a step of kind 'concentrate'");
}

TEST_CASE("solids: the list form, the table form, amounts in mol, one-way solids, limits of the ranges") {
    const auto c = parse_case(step_of("equilibrate", R"toml(solids = { Barite = { on_hand_mol_per_kgw = 0.001 }, Gypsum = { hold_si = -20, may_dissolve = false }, Halite = { hold_si = 20 }, Calcite = { on_hand_mmol_per_kgw = 0, may_form = false } }
partial_pressures = { CO2 = { log10_atm = 2 }, O2 = { log10_atm = -20 } }
[[step]]
kind = "equilibrate"
solids = ["Calcite",
          "Gypsum"]
)toml"), "test.toml");
    const auto& e = std::get<EquilibrateStep>(c.steps.at(0).action);
    REQUIRE(e.minerals.size() == 4);
    CHECK(e.minerals[0].name == "Barite");
    CHECK(*e.minerals[0].on_hand_mol_per_kgw == 0.001);
    CHECK(e.minerals[0].may_form);
    CHECK(e.minerals[0].may_dissolve);
    CHECK(e.minerals[1].target_si == -20.0);
    CHECK(e.minerals[1].may_form);
    CHECK_FALSE(e.minerals[1].may_dissolve);
    CHECK_FALSE(e.minerals[1].on_hand_mol_per_kgw.has_value());
    CHECK(e.minerals[2].target_si == 20.0);
    CHECK(*e.minerals[3].on_hand_mol_per_kgw == 0.0);
    CHECK_FALSE(e.minerals[3].may_form);
    REQUIRE(e.gases.size() == 2);
    CHECK(e.gases[0].name == "CO2(g)");
    CHECK(e.gases[0].log_partial_pressure_atm == 2.0);
    CHECK(e.gases[1].name == "O2(g)");
    CHECK(e.gases[1].log_partial_pressure_atm == -20.0);
    // The list form: each solid at saturation, free both ways, at its own line.
    const auto& l = std::get<EquilibrateStep>(c.steps.at(1).action);
    REQUIRE(l.minerals.size() == 2);
    CHECK(l.minerals[0].name == "Calcite");
    CHECK(l.minerals[1].name == "Gypsum");
    CHECK(l.minerals[1].where.line == first + 5);
    for (const auto& m : l.minerals) {
        CHECK(m.target_si == 0.0);
        CHECK_FALSE(m.on_hand_mol_per_kgw.has_value());
        CHECK(m.may_form);
        CHECK(m.may_dissolve);
    }
}

TEST_CASE("partial pressures in atm, bar, kPa, ppmv, percent and log10 atm, at a total pressure of 1 atm") {
    // 1 atm = 101.325 kPa = 1.01325 bar exactly (the standard atmosphere, 10th CGPM 1954).
    // By Dalton's law at 1 atm total, x ppmv is x*1e-6 atm and x percent is x/100 atm. 420
    // ppmv of CO2 is about today's air (common practice); 20.95 % O2 is dry air (CRC
    // Handbook, composition of dry air; from memory).
    const auto c = parse_case(step_of("equilibrate", R"toml(partial_pressures = { CO2 = { ppmv = 420 }, O2 = { percent = 20.95 }, N2 = { bar = 1.01325 }, H2S = { kPa = 0.101325 }, CH4 = { atm = 2 }, NH3 = { log10_atm = -7.5 } }
headspace = { litres_per_kgw = 1, temperature_c = 20, partial_pressures = { CO2 = { percent = 5 } } }
)toml"), "test.toml");
    const auto& e = std::get<EquilibrateStep>(c.steps.at(0).action);
    REQUIRE(e.gases.size() == 6);
    CHECK(e.gases[0].log_partial_pressure_atm == doctest::Approx(std::log10(420e-6)));  // -3.3768
    CHECK(e.gases[0].log_partial_pressure_atm == doctest::Approx(-3.37675).epsilon(1e-5));
    CHECK(e.gases[1].log_partial_pressure_atm == doctest::Approx(std::log10(0.2095)));
    CHECK(e.gases[2].log_partial_pressure_atm == doctest::Approx(0.0));   // 1.01325 bar = 1 atm
    CHECK(e.gases[3].log_partial_pressure_atm == doctest::Approx(-3.0));  // 0.101325 kPa = 1e-3 atm
    CHECK(e.gases[4].log_partial_pressure_atm == doctest::Approx(std::log10(2.0)));
    CHECK(e.gases[5].log_partial_pressure_atm == -7.5);
    const char* names[] = {"CO2(g)", "O2(g)", "N2(g)", "H2S(g)", "CH4(g)", "NH3(g)"};
    for (std::size_t i = 0; i < 6; ++i) CHECK(e.gases[i].name == names[i]);
    REQUIRE(e.headspace.has_value());
    CHECK(e.headspace->volume_l_per_kgw == 1.0);
    REQUIRE(e.headspace->temperature_c.has_value());
    CHECK(*e.headspace->temperature_c == 20.0);
    CHECK(e.headspace->gases.at(0).name == "CO2(g)");
    CHECK(e.headspace->gases.at(0).log_partial_pressure_atm == doctest::Approx(std::log10(0.05)));
}

TEST_CASE("errors: partial pressures") {
    const std::string co2 = "step[1].partial_pressures.CO2";
    SUBCASE("an unknown unit, nearest suggested") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = { ppm = 420 } }\n"), co2 + ".ppm", first,
                    "unknown key; expected one of: atm, bar, kPa, ppmv, percent, log10_atm", "ppmv");
    }
    SUBCASE("a per cent sign is not a unit") {
        check_error(step_of("equilibrate", "partial_pressures = { O2 = { \"%\" = 21 } }\n"),
                    "step[1].partial_pressures.O2.\"%\"", first,
                    "unknown key; expected one of: atm, bar, kPa, ppmv, percent, log10_atm");
    }
    SUBCASE("a bare number") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = -3 }\n"), co2, first,
                    "expected a one-key table naming the unit, such as { ppmv = 420 } or { atm = 0.21 }; units: atm, "
                    "bar, kPa, ppmv, percent, log10_atm; found an integer");
    }
    SUBCASE("a string") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = \"air\" }\n"), co2, first,
                    "expected a one-key table naming the unit, such as { ppmv = 420 }");
    }
    SUBCASE("no unit") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = {} }\n"), co2, first,
                    "expected a one-key table naming the unit, such as { ppmv = 420 } or { atm = 0.21 }; units: atm, "
                    "bar, kPa, ppmv, percent, log10_atm; found an empty table");
    }
    SUBCASE("two units") {
        check_error(step_of("equilibrate", "[step.partial_pressures.CO2]\nppmv = 420\natm = 4.2e-4\n"),
                    co2 + ".atm", first + 2, "a gas level takes one unit, found both ppmv (line 6) and atm");
    }
    SUBCASE("a value that is not a number") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = { ppmv = \"420\" } }\n"), co2 + ".ppmv", first,
                    "expected a number, found a string");
    }
    SUBCASE("a gas named with (g): the formula suggested") {
        check_error(step_of("equilibrate", "partial_pressures = { \"CO2(g)\" = { ppmv = 420 } }\n"),
                    "step[1].partial_pressures.\"CO2(g)\"", first,
                    "a gas is named here by its formula, without \"(g)\": write CO2 for the gas held at this partial "
                    "pressure",
                    "CO2");
    }
    SUBCASE("no formula before (g)") {
        check_error(step_of("equilibrate", "partial_pressures = { \"(g)\" = { atm = 1 } }\n"),
                    "step[1].partial_pressures.\"(g)\"", first, "expected the formula of a gas, such as CO2 or O2");
        check_error(step_of("equilibrate", "partial_pressures = { \"\" = { atm = 1 } }\n"),
                    "step[1].partial_pressures.\"\"", first, "expected the formula of a gas, such as CO2 or O2");
    }
    SUBCASE("zero") {
        check_error(step_of("equilibrate", "partial_pressures = { O2 = { percent = 0 } }\n"),
                    "step[1].partial_pressures.O2.percent", first,
                    "expected a gas level above zero, found 0 (a partial pressure of zero has no log10); leave a gas "
                    "that is absent out");
    }
    SUBCASE("more than the whole gas phase") {
        check_error(step_of("equilibrate", "partial_pressures = { O2 = { percent = 120 } }\n"),
                    "step[1].partial_pressures.O2.percent", first,
                    "expected a share of the gas phase of at most 100 percent (1e6 ppmv), found 120 percent");
    }
    SUBCASE("beyond the range of a log10 partial pressure") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = { bar = 200 } }\n"), co2 + ".bar", first,
                    "expected a partial pressure from 1e-20 to 100 atm (log10 from -20 to 2), found 200 bar = 197.385 atm");
    }
    SUBCASE("log10 atm out of range") {
        check_error(step_of("equilibrate", "partial_pressures = { CO2 = { log10_atm = 3 } }\n"), co2 + ".log10_atm",
                    first, "expected a log10 partial pressure from -20 to 2 (log10 atm), found 3");
    }
    SUBCASE("partial_pressures not a table") {
        check_error(step_of("equilibrate", "partial_pressures = [\"CO2\"]\n"), "step[1].partial_pressures", first,
                    "expected a table, found an array");
    }
    SUBCASE("in a headspace: the formula suggested") {
        check_error(step_of("equilibrate",
                            "headspace = { litres_per_kgw = 1, partial_pressures = { \"CO2(g)\" = { ppmv = 420 } } }\n"),
                    "step[1].headspace.partial_pressures.\"CO2(g)\"", first,
                    "write CO2 for the gas that starts at this partial pressure", "CO2");
    }
    SUBCASE("in a headspace: an unknown unit") {
        check_error(step_of("equilibrate",
                            "headspace = { litres_per_kgw = 1, partial_pressures = { CO2 = { vol = 5 } } }\n"),
                    "step[1].headspace.partial_pressures.CO2.vol", first,
                    "unknown key; expected one of: atm, bar, kPa, ppmv, percent, log10_atm");
    }
}

TEST_CASE("errors: headspace") {
    SUBCASE("no volume") {
        check_error(step_of("equilibrate", "headspace = { partial_pressures = { CO2 = { ppmv = 420 } } }\n"),
                    "step[1].headspace.litres_per_kgw", first, "missing: expected the gas volume in litres per kg of water");
    }
    SUBCASE("a volume of zero") {
        check_error(step_of("equilibrate", "headspace = { litres_per_kgw = 0, partial_pressures = { CO2 = { ppmv = 420 } } }\n"),
                    "step[1].headspace.litres_per_kgw", first, "expected litres of gas per kg of water from 1e-09 to 1e+06");
    }
    SUBCASE("no partial pressures") {
        check_error(step_of("equilibrate", "headspace = { litres_per_kgw = 0.5 }\n"),
                    "step[1].headspace.partial_pressures", first,
                    "missing: expected the starting partial pressures of the gas space, such as partial_pressures = "
                    "{ CO2 = { ppmv = 420 } }");
    }
    SUBCASE("the old names of its keys are unknown keys") {
        check_error(step_of("equilibrate", "headspace = { volume_l_per_kgw = 0.5, gases = { CO2 = { ppmv = 420 } } }\n"),
                    "step[1].headspace.volume_l_per_kgw", first,
                    "unknown key; expected one of: litres_per_kgw, temperature_c, partial_pressures");
    }
    SUBCASE("a temperature out of range") {
        check_error(step_of("equilibrate",
                            "headspace = { litres_per_kgw = 0.5, temperature_c = 120, partial_pressures = { CO2 = { ppmv = 420 } } }\n"),
                    "step[1].headspace.temperature_c", first, "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 120");
    }
}

TEST_CASE("dose targets: pH, saturation index, alkalinity, Langelier index") {
    auto target_of = [](const std::string& until) {
        const auto c = parse_case(step_of("dose", "reagent = \"CO2\"\nuntil = " + until + "\n"), "test.toml");
        return *std::get<DoseStep>(c.steps.at(0).action).until;
    };
    const auto ph = target_of("{ pH = 0 }");
    CHECK(ph.kind == DoseTarget::Kind::ph);
    CHECK(ph.value == 0.0);
    CHECK(ph.where.line == first + 1);
    CHECK(ph.where.column == 11);
    const auto si = target_of("{ si = { Calcite = -0.2 } }");
    CHECK(si.kind == DoseTarget::Kind::saturation_index);
    CHECK(si.mineral == "Calcite");
    CHECK(si.value == -0.2);
    CHECK(si.where.column == 18);  // the mineral's key
    const auto alk = target_of("{ alkalinity_meq_per_l = 1.5 }");
    CHECK(alk.kind == DoseTarget::Kind::alkalinity);
    CHECK(alk.value == 1.5);
    const auto negative = target_of("{ alkalinity_meq_per_l = -0.5 }");
    CHECK(negative.value == -0.5);
    const auto lsi = target_of("{ langelier = 0.3 }");
    CHECK(lsi.kind == DoseTarget::Kind::langelier);
    CHECK(lsi.value == 0.3);
}

TEST_CASE("every dose unit is accepted") {
    for (const char* u : {"mol/kgw", "mmol/kgw", "umol/kgw", "mg/kgw", "g/kgw", "mol/L", "mmol/L", "umol/L", "mg/L",
                          "g/L"}) {
        const auto c = parse_case(step_of("dose", std::string("reagent = \"NaOCl\"\namount = { value = 0, unit = \"") + u +
                                                      "\" }\n"),
                                  "test.toml");
        CHECK(std::get<DoseStep>(c.steps.at(0).action).amount->unit == u);
    }
}

TEST_CASE("concentrate: recovery is turned into a factor, 1/(1 - r)") {
    const auto c = parse_case(step_of("concentrate", "recovery = 0.75\n") + "[[step]]\nkind = \"concentrate\"\nrecovery = 0\n" +
                                  "[[step]]\nkind = \"concentrate\"\nfactor = 1\nprecipitate = []\n",
                              "test.toml");
    CHECK(std::get<ConcentrateStep>(c.steps.at(0).action).factor == doctest::Approx(4.0));
    CHECK(std::get<ConcentrateStep>(c.steps.at(1).action).factor == 1.0);
    CHECK(std::get<ConcentrateStep>(c.steps.at(2).action).factor == 1.0);
    CHECK(std::get<ConcentrateStep>(c.steps.at(2).action).precipitate.empty());
}

TEST_CASE("blend fractions that do not add up to 1 are normalised") {
    const auto c = parse_case(two_waters + "[[step]]\nkind = \"blend\"\nwaters = { river = 3, well = 7 }\n", "test.toml");
    const auto& b = std::get<BlendStep>(c.steps.at(0).action);
    REQUIRE(b.parts.size() == 2);
    CHECK(b.parts[0].first == "river");
    CHECK(b.parts[0].second == doctest::Approx(0.3));
    CHECK(b.parts[1].first == "well");
    CHECK(b.parts[1].second == doctest::Approx(0.7));
}

TEST_CASE("steps as an array of inline tables; no steps at all") {
    const auto c = parse_case("step = [{ kind = \"temperature\", temperature_c = 30 }]\n[water.a]\n", "test.toml");
    REQUIRE(c.steps.size() == 1);
    CHECK(c.steps[0].label == "step 1 (temperature)");
    CHECK(c.steps[0].where.line == 1);
    const auto none = parse_case("step = []\n[water.a]\n", "test.toml");
    CHECK(none.steps.empty());
    CHECK(none.sweeps.empty());
}

TEST_CASE("sweeps of each variable; default label and points; every output form") {
    const auto c = parse_case(sweep_base + R"toml([[sweep]]
step = "heat"
variable = "temperature_c"
from = 100
to = 0
outputs = ["pH", "ionic_strength", "alkalinity", "langelier", "ryznar", "ccpp", "si:Calcite", "transfer:CO2(g)", "total:Ca", "total:C"]
[[sweep]]
step = "lime"
variable = "dose"
from = 0
to = 5
points = 2
outputs = ["pH"]
[[sweep]]
step = "cycles"
variable = "factor"
from = 1
to = 8
points = 1000
outputs = ["si:Gypsum"]
[[sweep]]
label = "share of the well"
step = "mix"
variable = "fraction"
fraction_of = "well"
from = 0
to = 1
outputs = ["pH"]
)toml", "test.toml");
    REQUIRE(c.sweeps.size() == 4);
    CHECK(c.sweeps[0].label == "sweep 1");
    CHECK(c.sweeps[0].variable == Sweep::Variable::temperature_c);
    CHECK(c.sweeps[0].from == 100.0);
    CHECK(c.sweeps[0].to == 0.0);
    CHECK(c.sweeps[0].points == 11);
    CHECK(c.sweeps[0].outputs.size() == 10);
    CHECK(c.sweeps[0].csv_path.empty());
    CHECK(c.sweeps[0].svg_path.empty());
    CHECK(c.sweeps[0].where.line == 25);
    CHECK(c.sweeps[1].label == "sweep 2");
    CHECK(c.sweeps[1].variable == Sweep::Variable::dose);
    CHECK(c.sweeps[1].points == 2);
    CHECK(c.sweeps[2].variable == Sweep::Variable::factor);
    CHECK(c.sweeps[2].points == 1000);
    CHECK(c.sweeps[3].label == "share of the well");
    CHECK(c.sweeps[3].variable == Sweep::Variable::fraction);
    CHECK(c.sweeps[3].fraction_of == "well");
    CHECK(c.sweeps[3].step == "mix");
}

TEST_CASE("errors: the step and sweep arrays") {
    SUBCASE("[step] as a table") {
        check_error("[water.a]\npH = 7\n\n[step]\nkind = \"dose\"\n", "step", 4,
                    "expected [[step]] tables, one per step, found a table ([step]); write [[step]]");
    }
    SUBCASE("[sweep] as a table") {
        check_error("[water.a]\n[sweep]\nstep = \"x\"\n", "sweep", 2,
                    "expected [[sweep]] tables, one per sweep, found a table ([sweep]); write [[sweep]]");
    }
    SUBCASE("step as a number") {
        check_error("step = 3\n[water.a]\n", "step", 1, "expected [[step]] tables, one per step, found an integer");
    }
    SUBCASE("an element that is not a table") {
        check_error("step = [{ kind = \"temperature\", temperature_c = 30 }, 2]\n[water.a]\n", "step[2]", 1,
                    "expected a table describing a step ([[step]]), found an integer");
    }
    SUBCASE("an unknown top-level key lists step and sweep") {
        check_error("[water.a]\n[[steps]]\nkind = \"dose\"\n", "steps", 2,
                    "unknown key; expected one of: title, database, activity_model, water, step, sweep", "step");
    }
}

TEST_CASE("errors: kind, keys, label and water of a step") {
    SUBCASE("no kind") {
        check_error(one_water + "[[step]]\nlabel = \"x\"\n", "step[1].kind", 3,
                    "missing: expected the kind of step, one of: equilibrate, dose, blend, concentrate, temperature");
    }
    SUBCASE("unknown kind, nearest name suggested") {
        check_error(one_water + "\n[[step]]\nkind = \"doze\"\n", "step[1].kind", 5,
                    "unknown kind of step 'doze'; expected one of: equilibrate, dose, blend, concentrate, temperature",
                    "dose");
    }
    SUBCASE("kind of the wrong type") {
        check_error(one_water + "[[step]]\nkind = 1\n", "step[1].kind", 4, "expected a string, found an integer");
    }
    SUBCASE("a key of another kind") {
        check_error(step_of("blend", "waters = { well = 1, x = 1 }\nreagent = \"H2SO4\"\n"), "step[1].reagent", first + 1,
                    "'reagent' does not belong to a step of kind 'blend' (it is a key of 'dose' steps); a step of kind "
                    "'blend' takes: kind, label, waters, by");
    }
    SUBCASE("water in a blend: waters suggested") {
        check_error(step_of("blend", "water = \"well\"\n"), "step[1].water", first,
                    "'water' does not belong to a step of kind 'blend' (it is a key of 'equilibrate', 'dose', "
                    "'concentrate', 'temperature' steps)",
                    "waters");
    }
    SUBCASE("the first stray key in the file is named, in the second step") {
        check_error(step_of("temperature", "temperature_c = 30\n") + "[[step]]\nkind = \"equilibrate\"\nsolid = [\"Calcite\"]\nfactor = 2\n",
                    "step[2].solid", first + 3,
                    "unknown key for a step of kind 'equilibrate'; a step of kind 'equilibrate' takes: kind, label, "
                    "water, solids, partial_pressures, headspace, keep_redox_states_apart",
                    "solids");
    }
    SUBCASE("a key in a sub-table of the step") {
        check_error(step_of("temperature", "temperature_c = 30\n[step.partial_pressures]\nCO2 = { ppmv = 420 }\n"),
                    "step[1].partial_pressures", first + 1,
                    "'partial_pressures' does not belong to a step of kind 'temperature' (it is a key of 'equilibrate' steps)");
    }
    SUBCASE("the old names of the equilibrate keys are unknown keys") {
        check_error(step_of("equilibrate", "minerals = { Calcite = 0.0 }\n"), "step[1].minerals", first,
                    "unknown key for a step of kind 'equilibrate'");
        check_error(step_of("equilibrate", "gases = { \"CO2(g)\" = -3 }\n"), "step[1].gases", first,
                    "unknown key for a step of kind 'equilibrate'");
    }
    SUBCASE("an empty label") {
        check_error(step_of("temperature", "temperature_c = 30\nlabel = \"\"\n"), "step[1].label", first + 1,
                    "expected a label for the step, found an empty string");
    }
    SUBCASE("a label that is a water's name") {
        check_error(step_of("temperature", "temperature_c = 30\nlabel = \"well\"\n"), "step[1].label", first + 1,
                    "the label 'well' is already the name of a water (line 1); results are reported by label, so "
                    "each must be unique");
    }
    SUBCASE("a label used by an earlier step") {
        check_error(step_of("temperature", "temperature_c = 30\nlabel = \"warm\"\n") +
                        "[[step]]\nkind = \"temperature\"\ntemperature_c = 40\nlabel = \"warm\"\n",
                    "step[2].label", first + 5,
                    "the label 'warm' is already the label of step 1 (line 3); results are reported by label");
    }
    SUBCASE("a default label taken by an earlier step") {
        check_error(step_of("temperature", "temperature_c = 30\nlabel = \"step 2 (dose)\"\n") +
                        "[[step]]\nkind = \"dose\"\nreagent = \"HCl\"\namount = { value = 1, unit = \"mmol/kgw\" }\n",
                    "step[2].label", first + 2,
                    "the default label 'step 2 (dose)' is already the label of step 1 (line 3); give this step a "
                    "label = \"...\" of its own");
    }
    SUBCASE("water: no such water or step, nearest name suggested") {
        check_error(two_waters + "[[step]]\nkind = \"temperature\"\nlabel = \"warm\"\ntemperature_c = 30\nwater = \"well\"\n" +
                        "[[step]]\nkind = \"temperature\"\ntemperature_c = 40\nwater = \"wam\"\n",
                    "step[2].water", 13,
                    "no water or earlier step is called 'wam'; expected one of: well, river, warm", "warm");
    }
    SUBCASE("water: the step's own label") {
        check_error(step_of("temperature", "temperature_c = 30\nlabel = \"warm\"\nwater = \"warm\"\n"), "step[1].water",
                    first + 2, "'warm' is the label of this step itself; a step starts from a water or the result of "
                               "an earlier step");
    }
    SUBCASE("water: a later step's label") {
        check_error(step_of("temperature", "temperature_c = 30\nwater = \"step 2 (temperature)\"\n") +
                        "[[step]]\nkind = \"temperature\"\ntemperature_c = 40\n",
                    "step[1].water", first + 1,
                    "'step 2 (temperature)' is the label of a later step (step 2, line 7); a step starts from a water "
                    "or the result of an earlier step");
    }
    SUBCASE("water of the wrong type") {
        check_error(step_of("temperature", "temperature_c = 30\nwater = 1\n"), "step[1].water", first + 1,
                    "expected a string, found an integer");
    }
    SUBCASE("the first step without water, with several waters") {
        check_error(two_waters + "\n[[step]]\nkind = \"temperature\"\ntemperature_c = 30\n", "step[1].water", 6,
                    "missing: the first step has no earlier step to start from and the case has 2 waters (well, "
                    "river); name the one it starts from: water = \"well\"");
    }
}

TEST_CASE("errors: equilibrate") {
    SUBCASE("neither solids nor partial pressures") {
        check_error(step_of("equilibrate", "label = \"x\"\n"), "step[1]", 3,
                    "a step of kind 'equilibrate' needs solids = [\"NAME\", ...] or partial_pressures = { GAS = { UNIT "
                    "= ... }, ... }, with at least one entry");
    }
    SUBCASE("empty solids and partial pressures") {
        check_error(step_of("equilibrate", "solids = []\npartial_pressures = {}\n"), "step[1]", 3,
                    "needs solids = [\"NAME\", ...] or partial_pressures");
        check_error(step_of("equilibrate", "solids = {}\n"), "step[1]", 3, "needs solids = [\"NAME\", ...]");
    }
    SUBCASE("solids neither a list nor a table") {
        check_error(step_of("equilibrate", "solids = \"Calcite\"\n"), "step[1].solids", first,
                    "expected a list of names, solids = [\"Calcite\", ...], or a table solids = { Calcite = { hold_si = "
                    "..., ... } }; found a string");
    }
    SUBCASE("a list entry that is not a string, at its own line") {
        check_error(step_of("equilibrate", "solids = [\"Calcite\",\n  { Gypsum = 0 }]\n"), "step[1].solids", first + 1,
                    "expected names of solids (strings), found a table in the list");
    }
    SUBCASE("an empty name in the list") {
        check_error(step_of("equilibrate", "solids = [\"\"]\n"), "step[1].solids", first,
                    "expected the name of a solid, found an empty string");
    }
    SUBCASE("a solid listed twice") {
        check_error(step_of("equilibrate", "solids = [\"Calcite\",\n\"Calcite\"]\n"), "step[1].solids", first + 1,
                    "the solid 'Calcite' is listed twice (line 5)");
    }
    SUBCASE("a bare number in the table form") {
        check_error(step_of("equilibrate", "solids = { Calcite = 0.3 }\n"), "step[1].solids.Calcite", first,
                    "expected a table { hold_si = ..., on_hand_mmol_per_kgw = ..., may_form = ..., may_dissolve = ... "
                    "}, found a number; a solid held at saturation with no other condition is listed "
                    "by name: solids = [\"Calcite\"]");
    }
    SUBCASE("hold_si out of range") {
        check_error(step_of("equilibrate", "solids = { Calcite = { hold_si = -30 } }\n"), "step[1].solids.Calcite.hold_si",
                    first, "expected a saturation index to hold from -20 to 20, found -30");
    }
    SUBCASE("hold_si not finite") {
        check_error(step_of("equilibrate", "solids = { Calcite = { hold_si = nan } }\n"),
                    "step[1].solids.Calcite.hold_si", first, "expected a finite number");
    }
    SUBCASE("both amounts on hand") {
        check_error(step_of("equilibrate",
                            "[step.solids.Gypsum]\non_hand_mol_per_kgw = 0.001\non_hand_mmol_per_kgw = 1\n"),
                    "step[1].solids.Gypsum.on_hand_mmol_per_kgw", first + 2,
                    "give the solid on hand once, as on_hand_mol_per_kgw or on_hand_mmol_per_kgw; found both "
                    "on_hand_mol_per_kgw (line 6) and on_hand_mmol_per_kgw");
    }
    SUBCASE("a negative amount on hand") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { on_hand_mmol_per_kgw = -1 } }\n"),
                    "step[1].solids.Gypsum.on_hand_mmol_per_kgw", first,
                    "expected an amount of solid on hand of zero or more, found -1");
    }
    SUBCASE("may_form not a boolean") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { may_form = \"no\" } }\n"),
                    "step[1].solids.Gypsum.may_form", first, "expected true or false, found a string");
    }
    SUBCASE("a solid that may neither form nor dissolve") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { may_form = false, may_dissolve = false } }\n"),
                    "step[1].solids.Gypsum.may_dissolve", first,
                    "a solid that may neither form nor dissolve takes no part in the step: set may_form or may_dissolve "
                    "to true, or leave Gypsum out");
    }
    SUBCASE("an amount on hand of a solid that may not dissolve") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { may_dissolve = false, on_hand_mol_per_kgw = 1 } }\n"),
                    "step[1].solids.Gypsum.on_hand_mol_per_kgw", first,
                    "the solid on hand limits how much can dissolve, and Gypsum may not dissolve (may_dissolve = "
                    "false): remove on_hand_mol_per_kgw or may_dissolve");
    }
    SUBCASE("unknown key in a solid's table, nearest name suggested") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { on_hand_mmol_per_kg = 1 } }\n"),
                    "step[1].solids.Gypsum.on_hand_mmol_per_kg", first,
                    "unknown key; expected one of: hold_si, on_hand_mmol_per_kgw, on_hand_mol_per_kgw, may_form, "
                    "may_dissolve",
                    "on_hand_mmol_per_kgw");
    }
    SUBCASE("the old keys of a solid are unknown keys") {
        check_error(step_of("equilibrate", "solids = { Gypsum = { si = 0.0 } }\n"), "step[1].solids.Gypsum.si", first,
                    "unknown key; expected one of: hold_si");
    }
}

TEST_CASE("errors: dose") {
    const std::string reagent = "reagent = \"H2SO4\"\n";  // line `first`
    SUBCASE("no reagent") {
        check_error(step_of("dose", "amount = { value = 1, unit = \"mmol/kgw\" }\n"), "step[1].reagent", 3,
                    "missing: expected the reagent, a formula such as \"H2SO4\" or \"Ca(OH)2\"");
    }
    SUBCASE("an empty reagent") {
        check_error(step_of("dose", "reagent = \"\"\n"), "step[1].reagent", first,
                    "expected the reagent's formula, such as \"H2SO4\", found an empty string");
    }
    SUBCASE("both amount and until") {
        check_error(step_of("dose", reagent + "amount = { value = 1, unit = \"mmol/kgw\" }\nuntil = { pH = 7 }\n"),
                    "step[1].until", first + 2,
                    "give either amount (a fixed dose) or until (dose until a target is reached), not both");
    }
    SUBCASE("neither amount nor until") {
        check_error(step_of("dose", reagent), "step[1].amount", 3,
                    "missing: a step of kind 'dose' needs amount = { value = ..., unit = \"mmol/kgw\" } or until = "
                    "{ pH = ... }");
    }
    SUBCASE("amount as a bare number") {
        check_error(step_of("dose", reagent + "amount = 0.5\n"), "step[1].amount", first + 1,
                    "expected an amount { value = ..., unit = \"mmol/kgw\" }, found a number");
    }
    SUBCASE("amount without value") {
        check_error(step_of("dose", reagent + "amount = { unit = \"mmol/kgw\" }\n"), "step[1].amount.value", first + 1,
                    "missing: expected the amount, a number (value = ...)");
    }
    SUBCASE("a negative amount") {
        check_error(step_of("dose", reagent + "amount = { value = -0.5, unit = \"mmol/kgw\" }\n"),
                    "step[1].amount.value", first + 1, "expected an amount of zero or more, found -0.5");
    }
    SUBCASE("amount without unit") {
        check_error(step_of("dose", reagent + "amount = { value = 0.5 }\n"), "step[1].amount.unit", first + 1,
                    "missing: expected the unit of the amount, one of: mg/L, ug/L, g/L, mol/L, mmol/L, umol/L, "
                    "mol/kgw, mmol/kgw, umol/kgw, mg/kgw, g/kgw");
    }
    SUBCASE("an unknown unit, nearest name suggested") {
        check_error(step_of("dose", reagent + "amount = { value = 0.5, unit = \"mmol/kg\" }\n"), "step[1].amount.unit",
                    first + 1, "unknown unit of amount 'mmol/kg'; expected one of: mg/L, ug/L", "mmol/kgw");
    }
    SUBCASE("a concentration per kg of solution is no unit of a dose") {
        check_error(step_of("dose", reagent + "amount = { value = 0.5, unit = \"mg/kg\" }\n"), "step[1].amount.unit",
                    first + 1,
                    "'mg/kg' is per kg of solution; give a dose per kg of water (mg/kgw) or per litre (mg/L); expected "
                    "one of: mg/L",
                    "mg/kgw");
    }
    SUBCASE("equivalents are no unit of a dose") {
        check_error(step_of("dose", reagent + "amount = { value = 0.5, unit = \"meq/L\" }\n"), "step[1].amount.unit",
                    first + 1, "'meq/L' counts equivalents, which a neutral reagent does not have");
    }
    SUBCASE("an unknown key in amount, nearest name suggested") {
        check_error(step_of("dose", reagent + "amount = { value = 0.5, unit = \"mg/L\", units = \"mg/L\" }\n"),
                    "step[1].amount.units", first + 1, "unknown key; expected one of: value, unit", "unit");
    }
    SUBCASE("a misspelt value in amount is named as misspelt, not as missing") {
        check_error(step_of("dose", reagent + "amount = { valeu = 0.5, unit = \"mg/L\" }\n"), "step[1].amount.valeu",
                    first + 1, "unknown key; expected one of: value, unit", "value");
    }
    SUBCASE("max_amount with a fixed amount") {
        check_error(step_of("dose", reagent + "amount = { value = 1, unit = \"mmol/kgw\" }\nmax_amount = { value = 2, unit = \"mmol/kgw\" }\n"),
                    "step[1].max_amount", first + 2,
                    "max_amount limits a dose with until; a fixed amount needs none");
    }
    SUBCASE("max_amount of zero") {
        check_error(step_of("dose", reagent + "until = { pH = 7 }\nmax_amount = { value = 0, unit = \"mmol/kgw\" }\n"),
                    "step[1].max_amount.value", first + 2, "expected a largest dose above zero, found 0");
    }
    SUBCASE("until as a number") {
        check_error(step_of("dose", reagent + "until = 7\n"), "step[1].until", first + 1,
                    "expected a target { pH = ..., si = { MINERAL = ... }, alkalinity_meq_per_l = ... or langelier = "
                    "... }, found an integer");
    }
    SUBCASE("an unknown target, nearest name suggested") {
        check_error(step_of("dose", reagent + "until = { ph = 7 }\n"), "step[1].until.ph", first + 1,
                    "unknown key; expected one of: pH, si, alkalinity_meq_per_l, langelier", "pH");
    }
    SUBCASE("no target") {
        check_error(step_of("dose", reagent + "until = {}\n"), "step[1].until", first + 1,
                    "expected one target in until: pH = ..., si = { MINERAL = ... }, alkalinity_meq_per_l = ... or "
                    "langelier = ...; found none");
    }
    SUBCASE("two targets") {
        check_error(step_of("dose", reagent + "[step.until]\npH = 7\nlangelier = 0\n"), "step[1].until.langelier",
                    first + 3, "until takes one target, found both 'pH' and 'langelier'");
    }
    SUBCASE("a pH out of range") {
        check_error(step_of("dose", reagent + "until = { pH = 15 }\n"), "step[1].until.pH", first + 1,
                    "expected a pH from 0 to 14, found 15");
    }
    SUBCASE("si not a table") {
        check_error(step_of("dose", reagent + "until = { si = 0 }\n"), "step[1].until.si", first + 1,
                    "expected si = { MINERAL = target saturation index }, found an integer");
    }
    SUBCASE("si with no mineral") {
        check_error(step_of("dose", reagent + "until = { si = {} }\n"), "step[1].until.si", first + 1,
                    "expected one mineral and its target saturation index, e.g. si = { Calcite = 0.0 }; found none");
    }
    SUBCASE("si with two minerals") {
        check_error(step_of("dose", reagent + "until = { si = { Calcite = 0, Aragonite = 0 } }\n"),
                    "step[1].until.si.Aragonite", first + 1, "si takes one mineral, found both 'Calcite' and 'Aragonite'");
    }
    SUBCASE("si out of range") {
        check_error(step_of("dose", reagent + "until = { si = { Calcite = 21 } }\n"), "step[1].until.si.Calcite",
                    first + 1, "expected a target saturation index from -20 to 20, found 21");
    }
    SUBCASE("alkalinity out of range") {
        check_error(step_of("dose", reagent + "until = { alkalinity_meq_per_l = 5000 }\n"),
                    "step[1].until.alkalinity_meq_per_l", first + 1,
                    "expected an alkalinity from -1000 to 1000 meq/L, found 5000");
    }
    SUBCASE("Langelier index out of range") {
        check_error(step_of("dose", reagent + "until = { langelier = -15 }\n"), "step[1].until.langelier", first + 1,
                    "expected a Langelier index from -14 to 14, found -15");
    }
}

TEST_CASE("errors: blend") {
    SUBCASE("no waters") {
        check_error(step_of("blend", "by = \"mass\"\n"), "step[1].waters", 3,
                    "missing: a step of kind 'blend' needs waters = { NAME = fraction, NAME = fraction, ... } naming "
                    "at least two waters or earlier steps");
    }
    SUBCASE("waters not a table") {
        check_error(step_of("blend", "waters = [\"well\", \"river\"]\n"), "step[1].waters", first,
                    "expected a table { NAME = fraction, ... }, found an array");
    }
    SUBCASE("one water only") {
        check_error(step_of("blend", "waters = { well = 1 }\n"), "step[1].waters", first,
                    "a blend needs at least two waters, found 1");
    }
    SUBCASE("a fraction of zero") {
        check_error(two_waters + "[[step]]\nkind = \"blend\"\nwaters = { well = 1, river = 0 }\n", "step[1].waters.river",
                    7, "expected a fraction above zero, found 0");
    }
    SUBCASE("a fraction that is not a number") {
        check_error(two_waters + "[[step]]\nkind = \"blend\"\nwaters = { well = 1, river = \"half\" }\n",
                    "step[1].waters.river", 7, "expected a number, found a string");
    }
    SUBCASE("a part that is no water, nearest name suggested") {
        check_error(two_waters + "[[step]]\nkind = \"blend\"\n\nwaters = { well = 1, rivr = 1 }\n", "step[1].waters.rivr",
                    8, "no water or earlier step is called 'rivr'; expected one of: well, river", "river");
    }
    SUBCASE("an unknown basis, nearest name suggested") {
        check_error(two_waters + "[[step]]\nkind = \"blend\"\nwaters = { well = 1, river = 1 }\nby = \"volumes\"\n",
                    "step[1].by", 8, "expected \"volume\" or \"mass\", found \"volumes\"", "volume");
    }
}

TEST_CASE("errors: concentrate") {
    SUBCASE("both factor and recovery") {
        check_error(step_of("concentrate", "factor = 2\nrecovery = 0.5\n"), "step[1].recovery", first + 1,
                    "give factor or recovery, not both (factor = 1/(1 - recovery))");
    }
    SUBCASE("neither factor nor recovery") {
        check_error(step_of("concentrate", "precipitate = [\"Calcite\"]\n"), "step[1].factor", 3,
                    "missing: a step of kind 'concentrate' needs factor = ... (cycles of concentration, from 1 to 1000) or "
                    "recovery = ... (the fraction of the water removed, from 0 to 0.999)");
    }
    SUBCASE("a factor below 1") {
        check_error(step_of("concentrate", "factor = 0.5\n"), "step[1].factor", first,
                    "expected a concentration factor from 1 to 1000 (a recovery from 0 to 0.999), found 0.5");
    }
    // Evaporation and membrane plants concentrate a fresh water tens, at most a few hundred
    // times (common practice); a factor of a million is a typing slip, not a brine.
    SUBCASE("a factor above 1000") {
        check_error(step_of("concentrate", "factor = 1e6\n"), "step[1].factor", first,
                    "expected a concentration factor from 1 to 1000 (a recovery from 0 to 0.999), found 1e+06");
        check_error(step_of("concentrate", "factor = 1e300\n"), "step[1].factor", first,
                    "expected a concentration factor from 1 to 1000 (a recovery from 0 to 0.999), found 1e+300");
    }
    SUBCASE("a recovery of 1") {
        check_error(step_of("concentrate", "recovery = 1.0\n"), "step[1].recovery", first,
                    "expected a recovery (the fraction of the water removed) from 0 to 0.999 (a concentration factor "
                    "from 1 to 1000), found 1");
    }
    SUBCASE("a recovery above 0.999") {
        check_error(step_of("concentrate", "recovery = 0.9999\n"), "step[1].recovery", first,
                    "expected a recovery (the fraction of the water removed) from 0 to 0.999 (a concentration factor "
                    "from 1 to 1000), found 0.9999");
    }
    SUBCASE("precipitate not an array") {
        check_error(step_of("concentrate", "factor = 2\nprecipitate = \"Calcite\"\n"), "step[1].precipitate", first + 1,
                    "expected an array, found a string");
    }
    SUBCASE("a mineral that is not a string, at its own line") {
        check_error(step_of("concentrate", "factor = 2\nprecipitate = [\"Calcite\",\n  3]\n"), "step[1].precipitate",
                    first + 2, "expected mineral names (strings), found an integer in the list");
    }
    SUBCASE("an empty mineral name") {
        check_error(step_of("concentrate", "factor = 2\nprecipitate = [\"\"]\n"), "step[1].precipitate", first + 1,
                    "expected a mineral name, found an empty string");
    }
    SUBCASE("a mineral listed twice") {
        check_error(step_of("concentrate", "factor = 2\nprecipitate = [\"Gypsum\", \"Gypsum\"]\n"), "step[1].precipitate",
                    first + 1, "the mineral 'Gypsum' is listed twice");
    }
}

TEST_CASE("errors: temperature") {
    SUBCASE("no temperature_c") {
        check_error(step_of("temperature", "equilibrate = true\n"), "step[1].temperature_c", 3,
                    "missing: a step of kind 'temperature' needs temperature_c = ... (°C)");
    }
    SUBCASE("above 100 degC") {
        check_error(step_of("temperature", "temperature_c = 150\n"), "step[1].temperature_c", first,
                    "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 150");
    }
    SUBCASE("equilibrate not a boolean") {
        check_error(step_of("temperature", "temperature_c = 50\nequilibrate = \"yes\"\n"), "step[1].equilibrate",
                    first + 1, "expected true or false, found a string");
    }
    SUBCASE("keep_redox_states_apart without equilibrate = true") {
        check_error(step_of("temperature", "temperature_c = 50\nkeep_redox_states_apart = true\n"),
                    "step[1].keep_redox_states_apart", first + 1,
                    "keep_redox_states_apart matters only with equilibrate = true: a temperature change alone already "
                    "keeps redox states given apart as they are");
    }
    SUBCASE("keep_redox_states_apart not a boolean") {
        check_error(step_of("equilibrate", "partial_pressures = { O2 = { percent = 21 } }\nkeep_redox_states_apart = \"yes\"\n"),
                    "step[1].keep_redox_states_apart", first + 1, "expected true or false, found a string");
    }
}

TEST_CASE("errors: sweeps") {
    const std::string outputs = "outputs = [\"pH\"]\n";
    SUBCASE("the base case reads") {
        CHECK(parse_case(sweep_with(factor_sweep + outputs), "test.toml").sweeps.size() == 1);
    }
    SUBCASE("at: a later step is read, an earlier one refused") {
        const auto c = parse_case(sweep_with(factor_sweep + "at = \"lime\"\n" + outputs), "test.toml");
        CHECK(c.sweeps.front().at == "lime");
        CHECK(c.sweeps.front().at_where.line == sw + 4);
        check_error(sweep_with(factor_sweep + "at = \"heat\"\n" + outputs), "sweep[1].at", sw + 4,
                    "'heat' is not the varied step or a step after it; expected one of: cycles, mix, lime");
    }
    SUBCASE("an empty label") {
        check_error(sweep_with("label = \"\"\n" + factor_sweep + outputs), "sweep[1].label", sw,
                    "expected a label for the sweep, found an empty string");
    }
    SUBCASE("a label used twice") {
        check_error(sweep_with("label = \"a\"\n" + factor_sweep + outputs) + "[[sweep]]\nlabel = \"a\"\n" + factor_sweep +
                        outputs,
                    "sweep[2].label", sw + 7,
                    "the label 'a' is already the label of sweep 1 (line 25); give each sweep its own label");
    }
    SUBCASE("a default label taken by an earlier sweep") {
        check_error(sweep_with("label = \"sweep 2\"\n" + factor_sweep + outputs) + "[[sweep]]\n" + factor_sweep + outputs,
                    "sweep[2].label", sw + 6, "the default label 'sweep 2' is already the label of sweep 1 (line 25)");
    }
    SUBCASE("no step") {
        check_error(sweep_with("variable = \"factor\"\nfrom = 1\nto = 2\n" + outputs), "sweep[1].step", sw - 1,
                    "missing: expected the label of the step whose input the sweep varies");
    }
    SUBCASE("no step of that label, nearest suggested") {
        check_error(sweep_with("step = \"cycle\"\nvariable = \"factor\"\nfrom = 1\nto = 2\n" + outputs), "sweep[1].step", sw,
                    "no step is labelled 'cycle'; expected one of: heat, acid, cycles, mix, lime", "cycles");
    }
    SUBCASE("the case has no steps") {
        check_error("[water.a]\n[[sweep]]\nstep = \"x\"\nvariable = \"factor\"\n", "sweep[1].step", 3,
                    "no step is labelled 'x': the case has no [[step]]; a sweep varies an input of a step");
    }
    SUBCASE("no variable") {
        check_error(sweep_with("step = \"cycles\"\n"), "sweep[1].variable", sw - 1,
                    "missing: expected what the sweep varies, one of: temperature_c, dose, factor, fraction");
    }
    SUBCASE("an unknown variable, nearest suggested") {
        check_error(sweep_with("step = \"heat\"\nvariable = \"temperature\"\n"), "sweep[1].variable", sw + 1,
                    "unknown variable 'temperature'; expected one of: temperature_c, dose, factor, fraction",
                    "temperature_c");
    }
    SUBCASE("a variable of another kind of step") {
        check_error(sweep_with("step = \"heat\"\nvariable = \"factor\"\n"), "sweep[1].variable", sw + 1,
                    "the variable 'factor' is an input of a step of kind 'concentrate', but step 'heat' (line 3) is of "
                    "kind 'temperature'");
    }
    SUBCASE("dose of a step that doses until a target") {
        check_error(sweep_with("step = \"acid\"\nvariable = \"dose\"\n"), "sweep[1].variable", sw + 1,
                    "the variable 'dose' varies a fixed amount, but step 'acid' doses until a target; give that step "
                    "amount = { ... } instead of until");
    }
    SUBCASE("no from") {
        check_error(sweep_with("step = \"cycles\"\nvariable = \"factor\"\nto = 2\n"), "sweep[1].from", sw - 1,
                    "missing: expected the first value of the variable");
    }
    SUBCASE("no to") {
        check_error(sweep_with("step = \"cycles\"\nvariable = \"factor\"\nfrom = 2\n"), "sweep[1].to", sw - 1,
                    "missing: expected the last value of the variable");
    }
    SUBCASE("a temperature out of range") {
        check_error(sweep_with("step = \"heat\"\nvariable = \"temperature_c\"\nfrom = 10\nto = 120\n"), "sweep[1].to",
                    sw + 3, "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 120");
    }
    SUBCASE("a negative dose, in the step's unit") {
        check_error(sweep_with("step = \"lime\"\nvariable = \"dose\"\nfrom = -1\nto = 2\n"), "sweep[1].from", sw + 2,
                    "expected a dose of zero or more in mmol/kgw (the unit of the step's amount), found -1");
    }
    SUBCASE("a factor below 1") {
        check_error(sweep_with("step = \"cycles\"\nvariable = \"factor\"\nfrom = 0.5\nto = 2\n"), "sweep[1].from",
                    sw + 2, "expected a concentration factor from 1 to 1000 (a recovery from 0 to 0.999), found 0.5");
    }
    SUBCASE("a factor above 1000") {
        check_error(sweep_with("step = \"cycles\"\nvariable = \"factor\"\nfrom = 1\nto = 5000\n"), "sweep[1].to",
                    sw + 3, "expected a concentration factor from 1 to 1000 (a recovery from 0 to 0.999), found 5000");
    }
    SUBCASE("a fraction above 1") {
        check_error(sweep_with("step = \"mix\"\nvariable = \"fraction\"\nfrom = 0\nto = 1.5\n"), "sweep[1].to", sw + 3,
                    "expected a fraction from 0 to 1, found 1.5");
    }
    SUBCASE("from equal to to") {
        check_error(sweep_with("step = \"cycles\"\nvariable = \"factor\"\nfrom = 2\nto = 2\n"), "sweep[1].to", sw + 3,
                    "expected a value other than from = 2; a sweep needs a range");
    }
    SUBCASE("points not a whole number") {
        check_error(sweep_with(factor_sweep + "points = 2.5\n"), "sweep[1].points", sw + 4,
                    "expected a whole number of points from 2 to 1000, found a number");
    }
    SUBCASE("too few points") {
        check_error(sweep_with(factor_sweep + "points = 1\n"), "sweep[1].points", sw + 4,
                    "expected a whole number of points from 2 to 1000, found 1");
    }
    SUBCASE("a fraction sweep without fraction_of") {
        check_error(sweep_with("step = \"mix\"\nvariable = \"fraction\"\nfrom = 0\nto = 1\n"), "sweep[1].fraction_of",
                    sw - 1, "missing: expected the water of the blend whose fraction is varied");
    }
    SUBCASE("fraction_of not a part of the blend, nearest suggested") {
        check_error(sweep_with("step = \"mix\"\nvariable = \"fraction\"\nfrom = 0\nto = 1\nfraction_of = \"wel\"\n"),
                    "sweep[1].fraction_of", sw + 4, "'wel' is not among the waters of the blend 'mix' (well, cycles)",
                    "well");
    }
    SUBCASE("fraction_of with another variable") {
        check_error(sweep_with(factor_sweep + "fraction_of = \"well\"\n"), "sweep[1].fraction_of", sw + 4,
                    "fraction_of only goes with variable = \"fraction\"");
    }
    SUBCASE("no outputs") {
        check_error(sweep_with(factor_sweep), "sweep[1].outputs", sw - 1,
                    "missing: expected outputs = [ ... ], the results to record at each point, e.g. [\"pH\", "
                    "\"si:Calcite\"]");
    }
    SUBCASE("empty outputs") {
        check_error(sweep_with(factor_sweep + "outputs = []\n"), "sweep[1].outputs", sw + 4,
                    "expected at least one output, found an empty list");
    }
    SUBCASE("an output that is not a string, at its own line") {
        check_error(sweep_with(factor_sweep + "outputs = [\n  \"pH\",\n  1,\n]\n"), "sweep[1].outputs", sw + 6,
                    "expected outputs as strings, found an integer in the list");
    }
    SUBCASE("an unknown output, nearest suggested") {
        check_error(sweep_with(factor_sweep + "outputs = [\"ph\"]\n"), "sweep[1].outputs", sw + 4,
                    "unknown output 'ph'; expected pH, ionic_strength, alkalinity, langelier, ryznar, ccpp, si:NAME, "
                    "transfer:NAME or total:ELEMENT",
                    "pH");
    }
    SUBCASE("an unknown prefix, the nearest prefix suggested with the name") {
        check_error(sweep_with(factor_sweep + "outputs = [\"pH\", \"SI:Calcite\"]\n"), "sweep[1].outputs", sw + 4,
                    "unknown output 'SI:Calcite'", "si:Calcite");
    }
    SUBCASE("no name after the colon") {
        check_error(sweep_with(factor_sweep + "outputs = [\"transfer:\"]\n"), "sweep[1].outputs", sw + 4,
                    "the output 'transfer:' needs a name after the colon, e.g. transfer:Calcite");
    }
    SUBCASE("total: of something that is not an element symbol") {
        check_error(sweep_with(factor_sweep + "outputs = [\"total:SO4\"]\n"), "sweep[1].outputs", sw + 4,
                    "the output 'total:SO4' needs an element symbol after total:, such as total:Ca or total:C; found "
                    "'SO4'");
    }
    SUBCASE("an output listed twice") {
        check_error(sweep_with(factor_sweep + "outputs = [\"pH\", \"si:Calcite\", \"pH\"]\n"), "sweep[1].outputs", sw + 4,
                    "the output 'pH' is listed twice");
    }
    SUBCASE("an empty csv path") {
        check_error(sweep_with(factor_sweep + outputs + "csv = \"\"\n"), "sweep[1].csv", sw + 5,
                    "expected the path of the file to write, found an empty string");
    }
    SUBCASE("svg of the wrong type") {
        check_error(sweep_with(factor_sweep + outputs + "svg = true\n"), "sweep[1].svg", sw + 5,
                    "expected a string, found a boolean");
    }
    SUBCASE("an unknown key, nearest suggested") {
        check_error(sweep_with(factor_sweep + "output = [\"pH\"]\n" + outputs), "sweep[1].output", sw + 4,
                    "unknown key; expected one of: label, step, at, variable, from, to, points, fraction_of, "
                    "outputs, csv, svg",
                    "outputs");
    }
    SUBCASE("a misspelt required key is named as misspelt, not as missing") {
        check_error(sweep_with("step = \"cycles\"\nvarible = \"factor\"\nfrom = 1\nto = 2\n" + outputs),
                    "sweep[1].varible", sw + 1, "unknown key; expected one of: label, step, at, variable", "variable");
    }
}

// --- redox level of a water: pe, electrode reading, dissolved oxygen -----------------------

TEST_CASE("an electrode reading and dissolved oxygen read into the water") {
    // Invented waters.
    const auto c = parse_case(R"toml([water.loop]
temperature_c = 45
pH = 8.1
eh_mv = 180
reference = "Ag/AgCl(3 M KCl)"
[water.makeup]
pH = 7.2
dissolved_oxygen_mg_per_l = 7.8
[water.well]
eh_mv = -120.5
[water.pure]
)toml", "test.toml");
    REQUIRE(c.waters.size() == 4);
    const auto& loop = c.waters[0];
    REQUIRE(loop.eh_mv.has_value());
    CHECK(*loop.eh_mv == 180.0);
    CHECK(loop.eh_reference == "Ag/AgCl(3 M KCl)");
    CHECK(loop.eh_where.file == "test.toml");
    CHECK(loop.eh_where.line == 4);
    CHECK(loop.eh_where.column == 1);
    CHECK_FALSE(loop.pe.has_value());
    CHECK_FALSE(loop.dissolved_oxygen_mg_per_l.has_value());
    CHECK(loop.dissolved_oxygen_where.line == 1);  // absent: the water's table

    const auto& makeup = c.waters[1];
    REQUIRE(makeup.dissolved_oxygen_mg_per_l.has_value());
    CHECK(*makeup.dissolved_oxygen_mg_per_l == 7.8);
    CHECK(makeup.dissolved_oxygen_where.line == 8);
    CHECK(makeup.dissolved_oxygen_where.column == 1);
    CHECK_FALSE(makeup.eh_mv.has_value());
    CHECK(makeup.eh_reference == "SHE");
    CHECK(makeup.eh_where.line == 6);  // absent: the water's table

    const auto& well = c.waters[2];
    REQUIRE(well.eh_mv.has_value());
    CHECK(*well.eh_mv == -120.5);
    CHECK(well.eh_reference == "SHE");  // the default reference
    CHECK(well.eh_where.line == 10);

    const auto& pure = c.waters[3];
    CHECK_FALSE(pure.pe.has_value());
    CHECK_FALSE(pure.eh_mv.has_value());
    CHECK_FALSE(pure.dissolved_oxygen_mg_per_l.has_value());
}

TEST_CASE("every reference electrode of the interface contract is accepted") {
    // The names listed for `deltag potential` in the interface contract.
    const char* names[] = {"SHE",          "SCE",           "Ag/AgCl(sat KCl)", "Ag/AgCl(3.5 M KCl)", "Ag/AgCl(3 M KCl)",
                           "Ag/AgCl(1 M KCl)", "Ag/AgCl(seawater)", "Cu/CuSO4(sat)"};
    for (const char* name : names) {
        const auto c = parse_case(std::string("[water.a]\neh_mv = 0\nreference = \"") + name + "\"\n", "test.toml");
        CHECK(c.waters[0].eh_reference == name);
    }
}

TEST_CASE("the limits of eh_mv and dissolved_oxygen_mg_per_l are accepted") {
    const auto c = parse_case(R"toml([water.a]
eh_mv = -2000
[water.b]
eh_mv = 2000
[water.c]
dissolved_oxygen_mg_per_l = 0
[water.d]
dissolved_oxygen_mg_per_l = 60
)toml", "test.toml");
    CHECK(*c.waters[0].eh_mv == -2000.0);
    CHECK(*c.waters[1].eh_mv == 2000.0);
    CHECK(*c.waters[2].dissolved_oxygen_mg_per_l == 0.0);
    CHECK(*c.waters[3].dissolved_oxygen_mg_per_l == 60.0);
}

TEST_CASE("errors: the redox level of a water") {
    SUBCASE("pe and eh_mv: the second is named, with the first and its line") {
        check_error("[water.a]\npH = 7\npe = 4\neh_mv = 200\n", "water.a.eh_mv", 4,
                    "give one redox level, as pe, eh_mv or dissolved_oxygen_mg_per_l; found both pe (line 3) and eh_mv");
    }
    SUBCASE("dissolved oxygen written before eh_mv") {
        check_error("[water.a]\ndissolved_oxygen_mg_per_l = 8\npH = 7\neh_mv = 200\n", "water.a.eh_mv", 4,
                    "found both dissolved_oxygen_mg_per_l (line 2) and eh_mv");
    }
    SUBCASE("all three: the first two are named") {
        check_error("[water.a]\neh_mv = 200\npe = 3\ndissolved_oxygen_mg_per_l = 8\n", "water.a.pe", 3,
                    "found both eh_mv (line 2) and pe");
    }
    SUBCASE("reference without eh_mv") {
        check_error("[water.a]\npH = 7\npe = 4\nreference = \"SCE\"\n", "water.a.reference", 4,
                    "reference names the electrode an Eh reading was measured against, but [water.a] has no eh_mv; "
                    "add eh_mv = ... (mV) or remove reference");
    }
    SUBCASE("an unknown reference electrode, nearest suggested") {
        check_error("[water.a]\neh_mv = 180\nreference = \"Ag/AgCl(3M KCl)\"\n", "water.a.reference", 3,
                    "unknown reference electrode 'Ag/AgCl(3M KCl)'; expected one of: SHE, SCE, Ag/AgCl(sat KCl), "
                    "Ag/AgCl(3.5 M KCl), Ag/AgCl(3 M KCl), Ag/AgCl(1 M KCl), Ag/AgCl(seawater), Cu/CuSO4(sat)",
                    "Ag/AgCl(3 M KCl)");
    }
    SUBCASE("a reference electrode in the wrong case is refused, the right spelling suggested") {
        check_error("[water.a]\neh_mv = 180\nreference = \"sce\"\n", "water.a.reference", 3,
                    "unknown reference electrode 'sce'", "SCE");
    }
    SUBCASE("reference of the wrong type") {
        check_error("[water.a]\neh_mv = 180\nreference = 1\n", "water.a.reference", 3, "expected a string, found an integer");
    }
    SUBCASE("eh_mv out of range") {
        check_error("[water.a]\neh_mv = 180000\n", "water.a.eh_mv", 2,
                    "expected an electrode reading from -2000 to 2000 mV, found 180000");
    }
    SUBCASE("eh_mv as a string") {
        check_error("[water.a]\neh_mv = \"180 mV\"\n", "water.a.eh_mv", 2, "expected a number, found a string");
    }
    SUBCASE("negative dissolved oxygen") {
        check_error("[water.a]\npH = 7\ndissolved_oxygen_mg_per_l = -0.1\n", "water.a.dissolved_oxygen_mg_per_l", 3,
                    "expected a dissolved oxygen concentration from 0 to 60 mg/L, found -0.1");
    }
    SUBCASE("dissolved oxygen above 60 mg/L") {
        check_error("[water.a]\npH = 7\ndissolved_oxygen_mg_per_l = 78\n", "water.a.dissolved_oxygen_mg_per_l", 3,
                    "expected a dissolved oxygen concentration from 0 to 60 mg/L, found 78");
    }
    SUBCASE("an unknown key lists the redox keys") {
        check_error("[water.a]\neh_v = 0.18\n", "water.a.eh_v", 2,
                    "unknown key; expected one of: temperature_c, pH, pe, eh_mv, reference, dissolved_oxygen_mg_per_l, "
                    "charge_balance",
                    "eh_mv");
    }
}

// --- cells ---------------------------------------------------------------------------------

namespace {

// Two invented waters and a step, on lines 1-9; cell_with() puts [[cell]] on line 10, so the
// first of its `lines` is line 11.
const std::string cell_base = R"toml([water.loop]
pH = 8.1
[water.stagnant]
pH = 7.0
[[step]]
label = "warm"
kind = "temperature"
water = "loop"
temperature_c = 60
)toml";
std::string cell_with(const std::string& lines) { return cell_base + "[[cell]]\n" + lines; }
constexpr int cl = 11;  // line of the first of cell_with's `lines`
const std::string copper = "cathode = \"Cu^2+ + 2 e- = Cu(s)\"\n";
const std::string iron = "anode = \"Fe^2+ + 2 e- = Fe(s)\"\n";

}  // namespace

TEST_CASE("cells read into CellSpec: half-reactions, waters, temperatures, merged activities") {
    const auto c = parse_case(cell_base + R"toml(
[[cell]]
label = "copper tube / steel header"
cathode = "Cu^2+ + 2 e- = Cu(s)"
anode = { half_reaction = "Fe^2+ + 2 e- = Fe(s)", water = "stagnant", temperature_c = 40, activities = { "Fe^2+" = 1e-6 } }
water = "loop"
activities = { "Cu^2+" = 1e-6, "Fe^2+" = 1e-3 }

[[cell]]
cathode = "O2(g) + 4 H+ + 4 e- = 2 H2O"
anode = "Zn^2+ + 2 e- = Zn(s)"

[[cell]]
temperature_c = 30
water = "warm"
cathode = { half_reaction = "O2(g) + 4 H+ + 4 e- = 2 H2O", water = "loop", temperature_c = 35, activities = { "O2(g)" = 0.21 } }
anode = { half_reaction = "Zn^2+ + 2 e- = Zn(s)" }
activities = { "H+" = 1e-7, "O2(g)" = 1.0, "Zn^2+" = 1e-5 }
)toml", "test.toml");
    REQUIRE(c.cells.size() == 3);

    // Cell 1 (lines 11-16): the cell's water for the cathode, the anode's own water, T and
    // activity; the cell-wide Fe^2+ loses to the anode's own and is not given to the cathode,
    // in whose half-reaction it does not take part.
    const auto& a = c.cells[0];
    CHECK(a.label == "copper tube / steel header");
    CHECK(a.where.line == 11);
    CHECK(a.cathode.half_reaction == "Cu^2+ + 2 e- = Cu(s)");
    CHECK(a.cathode.half_reaction_where.line == 13);
    CHECK(a.cathode.half_reaction_where.column == 1);
    CHECK(a.cathode.water == "loop");
    CHECK(a.cathode.water_where.line == 15);
    CHECK_FALSE(a.cathode.temperature_c.has_value());
    REQUIRE(a.cathode.activities.size() == 1);
    CHECK(a.cathode.activities[0] == std::pair<std::string, double>{"Cu^2+", 1e-6});
    REQUIRE(a.cathode.activity_where.size() == 1);
    CHECK(a.cathode.activity_where[0].line == 16);
    CHECK(a.cathode.activity_where[0].column == 16);
    CHECK(a.anode.half_reaction == "Fe^2+ + 2 e- = Fe(s)");
    CHECK(a.anode.half_reaction_where.line == 14);
    CHECK(a.anode.half_reaction_where.column == 11);
    CHECK(a.anode.water == "stagnant");
    CHECK(a.anode.water_where.line == 14);
    REQUIRE(a.anode.temperature_c.has_value());
    CHECK(*a.anode.temperature_c == 40.0);
    REQUIRE(a.anode.activities.size() == 1);
    CHECK(a.anode.activities[0] == std::pair<std::string, double>{"Fe^2+", 1e-6});
    CHECK(a.anode.activity_where[0].line == 14);

    // Cell 2 (lines 18-20): the default label, no water (its location is the electrode's key),
    // no temperature, no activities.
    const auto& b = c.cells[1];
    CHECK(b.label == "cell 2");
    CHECK(b.where.line == 18);
    CHECK(b.cathode.half_reaction == "O2(g) + 4 H+ + 4 e- = 2 H2O");
    CHECK(b.cathode.water.empty());
    CHECK(b.cathode.water_where.line == 19);
    CHECK(b.anode.water.empty());
    CHECK(b.anode.water_where.line == 20);
    CHECK_FALSE(b.cathode.temperature_c.has_value());
    CHECK_FALSE(b.anode.temperature_c.has_value());
    CHECK(b.cathode.activities.empty());
    CHECK(b.anode.activities.empty());

    // Cell 3 (lines 22-27): the cell's water (a step's label) and temperature where the
    // electrode gives none; the cathode's own O2(g) first, then the cell's H+.
    const auto& k = c.cells[2];
    CHECK(k.label == "cell 3");
    CHECK(k.cathode.water == "loop");
    CHECK(k.cathode.water_where.line == 25);
    CHECK(*k.cathode.temperature_c == 35.0);
    CHECK(k.anode.water == "warm");
    CHECK(k.anode.water_where.line == 24);
    CHECK(*k.anode.temperature_c == 30.0);
    CHECK(k.anode.half_reaction_where.line == 26);
    REQUIRE(k.cathode.activities.size() == 2);
    CHECK(k.cathode.activities[0] == std::pair<std::string, double>{"O2(g)", 0.21});
    CHECK(k.cathode.activities[1] == std::pair<std::string, double>{"H+", 1e-7});
    REQUIRE(k.cathode.activity_where.size() == 2);
    CHECK(k.cathode.activity_where[0].line == 25);
    CHECK(k.cathode.activity_where[1].line == 27);
    REQUIRE(k.anode.activities.size() == 1);
    CHECK(k.anode.activities[0] == std::pair<std::string, double>{"Zn^2+", 1e-5});
    CHECK(k.anode.activity_where[0].line == 27);
}

TEST_CASE("cells as inline tables; no cells at all") {
    const auto c = parse_case("cell = [{ cathode = \"Ag+ + e- = Ag(s)\", anode = \"Cu^2+ + 2 e- = Cu(s)\" }]\n[water.a]\n",
                              "test.toml");
    REQUIRE(c.cells.size() == 1);
    CHECK(c.cells[0].label == "cell 1");
    CHECK(c.cells[0].cathode.half_reaction == "Ag+ + e- = Ag(s)");
    CHECK(parse_case("[water.a]\n", "test.toml").cells.empty());
}

TEST_CASE("errors: cells") {
    SUBCASE("the base case reads") {
        CHECK(parse_case(cell_with(copper + iron), "test.toml").cells.size() == 1);
    }
    SUBCASE("an unknown key, nearest suggested") {
        check_error(cell_with(iron + "cathod = \"Cu^2+ + 2 e- = Cu(s)\"\n"), "cell[1].cathod", cl + 1,
                    "unknown key; expected one of: label, cathode, anode, water, temperature_c, activities", "cathode");
    }
    SUBCASE("no cathode") {
        check_error(cell_with(iron), "cell[1].cathode", cl - 1,
                    "missing: expected the cathode, a half-reaction such as \"Cu^2+ + 2 e- = Cu(s)\" or a table { "
                    "half_reaction = \"...\", water = \"...\", temperature_c = ..., activities = { ... } }");
    }
    SUBCASE("no anode") {
        check_error(cell_with(copper), "cell[1].anode", cl - 1, "missing: expected the anode, a half-reaction such as");
    }
    SUBCASE("an electrode of the wrong type") {
        check_error(cell_with(copper + "anode = 2\n"), "cell[1].anode", cl + 1,
                    "expected a half-reaction (a string such as \"Cu^2+ + 2 e- = Cu(s)\") or a table { half_reaction = "
                    "\"...\", ... }, found an integer");
    }
    SUBCASE("an unknown key of an electrode table, nearest suggested") {
        check_error(cell_with(copper + "anode = { halfreaction = \"Fe^2+ + 2 e- = Fe(s)\" }\n"), "cell[1].anode.halfreaction",
                    cl + 1, "unknown key; expected one of: half_reaction, water, temperature_c, activities",
                    "half_reaction");
    }
    SUBCASE("an electrode table without half_reaction") {
        check_error(cell_with(copper + "anode = { water = \"loop\" }\n"), "cell[1].anode.half_reaction", cl + 1,
                    "missing: expected the half-reaction, a string such as \"Cu^2+ + 2 e- = Cu(s)\"");
    }
    SUBCASE("half_reaction of the wrong type") {
        check_error(cell_with(copper + "anode = { half_reaction = 1 }\n"), "cell[1].anode.half_reaction", cl + 1,
                    "expected a string, found an integer");
    }
    SUBCASE("an empty half-reaction") {
        check_error(cell_with("cathode = \" \"\n" + iron), "cell[1].cathode", cl,
                    "expected a half-reaction such as \"Cu^2+ + 2 e- = Cu(s)\", found an empty string");
    }
    SUBCASE("a half-reaction without '='") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe(s)\" }\n"), "cell[1].anode.half_reaction", cl + 1,
                    "expected a half-reaction with '=' between its two sides, such as \"Cu^2+ + 2 e- = Cu(s)\"; found "
                    "\"Fe(s)\"");
    }
    SUBCASE("a malformed half-reaction: the character is counted in the text as written") {
        check_error(cell_with("cathode = \"  Cu^2+ + 2 e- = Cu(s) = Cu\"\n" + iron), "cell[1].cathode", cl,
                    "cannot read the half-reaction \"  Cu^2+ + 2 e- = Cu(s) = Cu\": more than one '=' (at character 24)");
    }
    SUBCASE("a half-reaction with an unknown element") {
        check_error(cell_with(copper + "\nanode = \"Xq^2+ + 2 e- = Xq(s)\"\n"), "cell[1].anode", cl + 2,
                    "cannot read the half-reaction \"Xq^2+ + 2 e- = Xq(s)\": species 'Xq^2+': unknown element 'Xq' "
                    "(at character 1)");
    }
    SUBCASE("an empty label") {
        check_error(cell_with("label = \"\"\n" + copper + iron), "cell[1].label", cl,
                    "expected a label for the cell, found an empty string");
    }
    SUBCASE("a label used twice") {
        check_error(cell_with("label = \"a\"\n" + copper + iron) + "[[cell]]\nlabel = \"a\"\n" + copper + iron,
                    "cell[2].label", cl + 4, "the label 'a' is already the label of cell 1 (line 10); give each cell "
                                            "its own label");
    }
    SUBCASE("a default label taken by an earlier cell") {
        check_error(cell_with("label = \"cell 2\"\n" + copper + iron) + "[[cell]]\n" + copper + iron, "cell[2].label",
                    cl + 3, "the default label 'cell 2' is already the label of cell 1 (line 10)");
    }
    SUBCASE("the cell's water: no such water or step, nearest suggested") {
        check_error(cell_with(copper + iron + "water = \"lop\"\n"), "cell[1].water", cl + 2,
                    "no water or step is called 'lop'; expected one of: loop, stagnant, warm", "loop");
    }
    SUBCASE("an electrode's water: no such water or step, nearest suggested") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", water = \"wram\" }\n"),
                    "cell[1].anode.water", cl + 1, "no water or step is called 'wram'; expected one of: loop, stagnant, warm",
                    "warm");
    }
    SUBCASE("water of the wrong type") {
        check_error(cell_with(copper + iron + "water = [\"loop\"]\n"), "cell[1].water", cl + 2,
                    "expected a string, found an array");
    }
    SUBCASE("the cell's temperature out of range") {
        check_error(cell_with(copper + iron + "temperature_c = 150\n"), "cell[1].temperature_c", cl + 2,
                    "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 150");
    }
    SUBCASE("an electrode's temperature out of range") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", temperature_c = -1 }\n"),
                    "cell[1].anode.temperature_c", cl + 1, "expected a temperature from 0 to 100 °C");
    }
    SUBCASE("activities not a table") {
        check_error(cell_with(copper + iron + "activities = [1e-6]\n"), "cell[1].activities", cl + 2,
                    "expected a table, found an array");
    }
    SUBCASE("an activity that is not a number") {
        check_error(cell_with(copper + iron + "activities = { \"Cu^2+\" = \"low\" }\n"), "cell[1].activities.\"Cu^2+\"",
                    cl + 2, "expected the activity of the species (a number; for a gas its fugacity in atm), found a string");
    }
    SUBCASE("an activity of zero") {
        check_error(cell_with(copper + iron + "activities = { \"Cu^2+\" = 0 }\n"), "cell[1].activities.\"Cu^2+\"", cl + 2,
                    "expected an activity above zero, found 0");
    }
    SUBCASE("a negative activity of an electrode") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", activities = { \"Fe^2+\" = -1e-6 } }\n"),
                    "cell[1].anode.activities.\"Fe^2+\"", cl + 1, "expected an activity above zero, found -1e-06");
    }
    SUBCASE("an activity that is not finite") {
        check_error(cell_with(copper + iron + "activities = { \"Cu^2+\" = inf }\n"), "cell[1].activities.\"Cu^2+\"",
                    cl + 2, "expected a finite number");
    }
    SUBCASE("an empty species name") {
        check_error(cell_with(copper + iron + "activities = { \"\" = 1 }\n"), "cell[1].activities.\"\"", cl + 2,
                    "expected a species name as the key, such as \"Cu^2+\", found an empty one");
    }
    SUBCASE("an electrode's activity of a species not in its half-reaction, nearest suggested") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", activities = { \"Fe2+\" = 1e-6 } }\n"),
                    "cell[1].anode.activities.\"Fe2+\"", cl + 1,
                    "'Fe2+' does not take part in the anode's half-reaction \"Fe^2+ + 2 e- = Fe(s)\" (Fe^2+, Fe(s))",
                    "Fe^2+");
    }
    SUBCASE("a cell's activity of a species in neither half-reaction: the species listed, another metal not suggested") {
        // Zn^2+ is one letter from Cu^2+, but zinc is not copper: no "did you mean".
        check_error(cell_with(copper + iron + "[cell.activities]\n\"Cu^2+\" = 1e-6\n\"Zn^2+\" = 1e-6\n"),
                    "cell[1].activities.\"Zn^2+\"", cl + 4,
                    "'Zn^2+' takes part in neither half-reaction of the cell (cathode: Cu^2+, Cu(s); anode: Fe^2+, Fe(s))");
    }
    SUBCASE("a cell's activity with the charge written without ^ leads to the species") {
        check_error(cell_with(copper + iron + "[cell.activities]\n\"Cu2+\" = 1e-6\n"),
                    "cell[1].activities.\"Cu2+\"", cl + 3, "'Cu2+' takes part in neither half-reaction of the cell",
                    "Cu^2+");
    }
    SUBCASE("a metal-ion activity of zero") {
        check_error(cell_with(copper + iron + "metal_ion_activity = 0\n"), "cell[1].metal_ion_activity", cl + 2,
                    "expected the activity of the dissolved species of the electrode's metal, above 0 and at most 1 "
                    "(1e-6 is the customary corrosion convention), found 0");
    }
    SUBCASE("an electrode's metal-ion activity above 1") {
        check_error(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", metal_ion_activity = 2 }\n"),
                    "cell[1].anode.metal_ion_activity", cl + 1,
                    "expected the activity of the dissolved species of the electrode's metal, above 0 and at most 1");
    }
    SUBCASE("a metal-ion activity that is not a number") {
        check_error(cell_with(copper + iron + "metal_ion_activity = \"1e-6\"\n"), "cell[1].metal_ion_activity", cl + 2,
                    "expected a number, found a string");
    }
    SUBCASE("a misspelt metal-ion key, the valid one suggested") {
        check_error(cell_with(copper + iron + "metal_ion_activities = 1e-6\n"), "cell[1].metal_ion_activities", cl + 2,
                    "unknown key", "metal_ion_activity");
    }
}

TEST_CASE("cells: the metal-ion convention goes to each electrode without its own") {
    const auto c = parse_case(cell_with(copper + "anode = { half_reaction = \"Fe^2+ + 2 e- = Fe(s)\", "
                                                 "metal_ion_activity = 1e-5 }\nmetal_ion_activity = 1e-6\nwater = \"loop\"\n"),
                              "test.toml");
    REQUIRE(c.cells.size() == 1);
    REQUIRE(c.cells[0].cathode.metal_ion_activity.has_value());
    CHECK(*c.cells[0].cathode.metal_ion_activity == 1e-6);
    REQUIRE(c.cells[0].anode.metal_ion_activity.has_value());
    CHECK(*c.cells[0].anode.metal_ion_activity == 1e-5);
    // None given: none set (the water's activities stand).
    const auto plain = parse_case(cell_with(copper + iron), "test.toml");
    CHECK_FALSE(plain.cells[0].cathode.metal_ion_activity.has_value());
    CHECK_FALSE(plain.cells[0].anode.metal_ion_activity.has_value());
}

// --- diagrams ------------------------------------------------------------------------------

namespace {

// The waters and step of cell_base on lines 1-9; diagram_with() puts [[diagram]] on line 10,
// so the first of its `lines` is line 11.
std::string diagram_with(const std::string& lines) { return cell_base + "[[diagram]]\n" + lines; }
constexpr int dl = 11;  // line of the first of diagram_with's `lines`
const std::string iron_element = "element = \"Fe\"\n";

}  // namespace

TEST_CASE("diagrams read into DiagramCase, with defaults and locations") {
    const auto c = parse_case(cell_base + R"toml(
[[diagram]]
label = "iron in the loop"
element = "Fe"
temperature_c = 45
log_activity = -6
water = "loop"
points = ["loop", "warm"]
ph_range = [2, 12]
eh_range_v = [-1.2, 1.2]
shading = true
svg = "fe-loop.svg"
csv = "fe-loop.csv"

[[diagram]]
element = "Cu"

[[diagram]]
element = "Mn"
activity = 1e-4
shading = false
points = [
  "stagnant",
]
)toml", "test.toml");
    REQUIRE(c.diagrams.size() == 3);

    const auto& a = c.diagrams[0];  // lines 11-22
    CHECK(a.spec.label == "iron in the loop");
    CHECK(a.spec.where.line == 11);
    CHECK(a.spec.element == "Fe");
    CHECK(a.element_where.line == 13);
    CHECK(a.element_where.column == 1);
    REQUIRE(a.spec.temperature_c.has_value());
    CHECK(*a.spec.temperature_c == 45.0);
    CHECK(a.spec.log_activity == -6.0);
    CHECK(a.water == "loop");
    CHECK(a.water_where.line == 16);
    REQUIRE(a.points.size() == 2);
    CHECK(a.points[0] == "loop");
    CHECK(a.points[1] == "warm");  // a step's label
    REQUIRE(a.point_where.size() == 2);
    CHECK(a.point_where[0].line == 17);
    CHECK(a.point_where[0].column == 11);
    CHECK(a.point_where[1].column == 19);
    CHECK(a.spec.ph_min == 2.0);
    CHECK(a.spec.ph_max == 12.0);
    CHECK(a.spec.eh_min_v == -1.2);
    CHECK(a.spec.eh_max_v == 1.2);
    CHECK(a.spec.shading);
    CHECK(a.svg_path == "fe-loop.svg");
    CHECK(a.csv_path == "fe-loop.csv");

    const auto& b = c.diagrams[1];  // lines 24-25: every default
    CHECK(b.spec.label == "diagram 2");
    CHECK(b.spec.where.line == 24);
    CHECK(b.spec.element == "Cu");
    CHECK(b.element_where.line == 25);
    CHECK_FALSE(b.spec.temperature_c.has_value());
    CHECK(b.spec.log_activity == -6.0);
    CHECK(b.water.empty());
    CHECK(b.water_where.line == 24);  // absent: the diagram's table
    CHECK(b.points.empty());
    CHECK(b.spec.ph_min == 0.0);
    CHECK(b.spec.ph_max == 14.0);
    CHECK(b.spec.eh_min_v == -1.5);
    CHECK(b.spec.eh_max_v == 1.5);
    CHECK(b.spec.shading);
    CHECK(b.svg_path.empty());
    CHECK(b.csv_path.empty());

    const auto& k = c.diagrams[2];  // lines 27-33
    CHECK(k.spec.label == "diagram 3");
    CHECK(k.spec.log_activity == doctest::Approx(-4.0));  // log10(1e-4)
    CHECK_FALSE(k.spec.shading);
    REQUIRE(k.points.size() == 1);
    CHECK(k.point_where[0].line == 32);  // the entry's own line
}

TEST_CASE("the limits of a diagram's ranges are accepted") {
    const auto c = parse_case(diagram_with(iron_element + "ph_range = [0, 14]\neh_range_v = [-3, 3]\nlog_activity = -12\n") +
                                  "[[diagram]]\nelement = \"Zn\"\nlog_activity = 0\ntemperature_c = 100\n" +
                                  "[[diagram]]\nelement = \"Cr\"\nactivity = 1e-12\n[[diagram]]\nelement = \"Ni\"\nactivity = 1\n",
                              "test.toml");
    REQUIRE(c.diagrams.size() == 4);
    CHECK(c.diagrams[0].spec.ph_min == 0.0);
    CHECK(c.diagrams[0].spec.ph_max == 14.0);
    CHECK(c.diagrams[0].spec.eh_min_v == -3.0);
    CHECK(c.diagrams[0].spec.eh_max_v == 3.0);
    CHECK(c.diagrams[0].spec.log_activity == -12.0);
    CHECK(c.diagrams[1].spec.log_activity == 0.0);
    CHECK(*c.diagrams[1].spec.temperature_c == 100.0);
    CHECK(c.diagrams[2].spec.log_activity == doctest::Approx(-12.0));
    CHECK(c.diagrams[3].spec.log_activity == 0.0);
}

TEST_CASE("errors: diagrams") {
    SUBCASE("the base case reads") {
        CHECK(parse_case(diagram_with(iron_element), "test.toml").diagrams.size() == 1);
    }
    SUBCASE("an unknown key, nearest suggested") {
        check_error(diagram_with(iron_element + "ph_rang = [2, 12]\n"), "diagram[1].ph_rang", dl + 1,
                    "unknown key; expected one of: label, element, temperature_c, log_activity, activity, water, "
                    "points, ph_range, eh_range_v, shading, ligands, leave_out, svg, csv",
                    "ph_range");
    }
    SUBCASE("no element") {
        check_error(diagram_with("label = \"x\"\n"), "diagram[1].element", dl - 1,
                    "missing: expected the element of the diagram, a symbol such as \"Fe\"");
    }
    SUBCASE("an empty element") {
        check_error(diagram_with("element = \"\"\n"), "diagram[1].element", dl,
                    "expected an element symbol such as \"Fe\", found an empty string");
    }
    SUBCASE("an unknown element, nearest symbol suggested") {
        check_error(diagram_with("element = \"FE\"\n"), "diagram[1].element", dl,
                    "unknown element 'FE'; expected an element symbol such as Fe, Cu or Mn", "Fe");
    }
    SUBCASE("an element's name instead of its symbol: no symbol suggested") {
        check_error(diagram_with("element = \"Iron\"\n"), "diagram[1].element", dl, "unknown element 'Iron'");
    }
    SUBCASE("element of the wrong type") {
        check_error(diagram_with("element = 26\n"), "diagram[1].element", dl, "expected a string, found an integer");
    }
    SUBCASE("an empty label") {
        check_error(diagram_with("label = \"\"\n" + iron_element), "diagram[1].label", dl,
                    "expected a label for the diagram, found an empty string");
    }
    SUBCASE("a label used twice") {
        check_error(diagram_with("label = \"a\"\n" + iron_element) + "[[diagram]]\nlabel = \"a\"\n" + iron_element,
                    "diagram[2].label", dl + 3,
                    "the label 'a' is already the label of diagram 1 (line 10); give each diagram its own label");
    }
    SUBCASE("a default label taken by an earlier diagram") {
        check_error(diagram_with("label = \"diagram 2\"\n" + iron_element) + "[[diagram]]\n" + iron_element,
                    "diagram[2].label", dl + 2, "the default label 'diagram 2' is already the label of diagram 1 (line 10)");
    }
    SUBCASE("a temperature out of range") {
        check_error(diagram_with(iron_element + "temperature_c = 101\n"), "diagram[1].temperature_c", dl + 1,
                    "expected a temperature from 0 to 100 °C (the range of the water-property correlations), found 101");
    }
    SUBCASE("log_activity below -12") {
        check_error(diagram_with(iron_element + "log_activity = -13\n"), "diagram[1].log_activity", dl + 1,
                    "expected a log10 activity of the dissolved species from -12 to 0, found -13");
    }
    SUBCASE("log_activity above 0") {
        check_error(diagram_with(iron_element + "log_activity = 0.5\n"), "diagram[1].log_activity", dl + 1,
                    "expected a log10 activity of the dissolved species from -12 to 0, found 0.5");
    }
    SUBCASE("an activity of zero") {
        check_error(diagram_with(iron_element + "activity = 0\n"), "diagram[1].activity", dl + 1,
                    "expected an activity of the dissolved species from 1e-12 to 1 (log_activity from -12 to 0), found 0");
    }
    SUBCASE("an activity above 1") {
        check_error(diagram_with(iron_element + "activity = 2\n"), "diagram[1].activity", dl + 1,
                    "expected an activity of the dissolved species from 1e-12 to 1 (log_activity from -12 to 0), found 2");
    }
    SUBCASE("an activity below 1e-12") {
        check_error(diagram_with(iron_element + "activity = 1e-13\n"), "diagram[1].activity", dl + 1,
                    "from 1e-12 to 1 (log_activity from -12 to 0), found 1e-13");
    }
    SUBCASE("both log_activity and activity") {
        check_error(diagram_with(iron_element + "activity = 1e-6\nlog_activity = -6\n"), "diagram[1].log_activity", dl + 2,
                    "give the activity of the dissolved species once, as log_activity or activity; found both activity "
                    "(line 12) and log_activity");
    }
    SUBCASE("water: no such water or step, nearest suggested") {
        check_error(diagram_with(iron_element + "water = \"stagnat\"\n"), "diagram[1].water", dl + 1,
                    "no water or step is called 'stagnat'; expected one of: loop, stagnant, warm", "stagnant");
    }
    SUBCASE("points not an array") {
        check_error(diagram_with(iron_element + "points = \"loop\"\n"), "diagram[1].points", dl + 1,
                    "expected an array, found a string");
    }
    SUBCASE("a point that is not a string, at its own line") {
        check_error(diagram_with(iron_element + "points = [\n  \"loop\",\n  3,\n]\n"), "diagram[1].points", dl + 3,
                    "expected names of waters or step labels (strings), found an integer in the list");
    }
    SUBCASE("a point that names no water or step, nearest suggested") {
        check_error(diagram_with(iron_element + "points = [\"loop\", \"warmm\"]\n"), "diagram[1].points", dl + 1,
                    "no water or step is called 'warmm'; expected one of: loop, stagnant, warm", "warm");
    }
    SUBCASE("a point listed twice") {
        check_error(diagram_with(iron_element + "points = [\"loop\", \"warm\", \"loop\"]\n"), "diagram[1].points", dl + 1,
                    "the point 'loop' is listed twice");
    }
    SUBCASE("ph_range with three numbers") {
        check_error(diagram_with(iron_element + "ph_range = [2, 7, 12]\n"), "diagram[1].ph_range", dl + 1,
                    "expected an array of 2 numbers, found 3 elements");
    }
    SUBCASE("ph_range with a string in it") {
        check_error(diagram_with(iron_element + "ph_range = [2, \"12\"]\n"), "diagram[1].ph_range", dl + 1,
                    "expected an array of 2 numbers, found a string in it");
    }
    SUBCASE("ph_range outside 0 to 14") {
        check_error(diagram_with(iron_element + "ph_range = [-1, 12]\n"), "diagram[1].ph_range", dl + 1,
                    "expected a pH range [min, max] within 0 to 14, found [-1, 12]");
    }
    SUBCASE("ph_range with min above max") {
        check_error(diagram_with(iron_element + "ph_range = [12, 2]\n"), "diagram[1].ph_range", dl + 1,
                    "expected a pH range [min, max] with min below max, found [12, 2]");
    }
    SUBCASE("eh_range_v outside -3 to 3") {
        check_error(diagram_with(iron_element + "eh_range_v = [-1.2, 3.5]\n"), "diagram[1].eh_range_v", dl + 1,
                    "expected an Eh range in V [min, max] within -3 to 3, found [-1.2, 3.5]");
    }
    SUBCASE("eh_range_v with min equal to max") {
        check_error(diagram_with(iron_element + "eh_range_v = [0.5, 0.5]\n"), "diagram[1].eh_range_v", dl + 1,
                    "expected an Eh range in V [min, max] with min below max, found [0.5, 0.5]");
    }
    SUBCASE("shading not a boolean") {
        check_error(diagram_with(iron_element + "shading = \"yes\"\n"), "diagram[1].shading", dl + 1,
                    "expected true or false, found a string");
    }
    SUBCASE("an empty svg path") {
        check_error(diagram_with(iron_element + "svg = \"\"\n"), "diagram[1].svg", dl + 1,
                    "expected the path of the file to write, found an empty string");
    }
    SUBCASE("csv of the wrong type") {
        check_error(diagram_with(iron_element + "csv = 1\n"), "diagram[1].csv", dl + 1, "expected a string, found an integer");
    }
    SUBCASE("ligands not a boolean") {
        check_error(diagram_with(iron_element + "water = \"loop\"\nligands = \"carbonate\"\n"), "diagram[1].ligands",
                    dl + 2, "expected true or false, found a string");
    }
    SUBCASE("ligands without a water") {
        check_error(diagram_with(iron_element + "ligands = true\n"), "diagram[1].ligands", dl + 1,
                    "ligands = true takes the free activities of the other components (carbonate, sulfate, chloride, ...) "
                    "from a water: name it in the diagram's water");
    }
    SUBCASE("leave_out not an array") {
        check_error(diagram_with(iron_element + "leave_out = \"Hematite\"\n"), "diagram[1].leave_out", dl + 1,
                    "expected an array, found a string");
    }
    SUBCASE("leave_out with a number in it, at its own line") {
        check_error(diagram_with(iron_element + "leave_out = [\n  \"Hematite\",\n  2,\n]\n"), "diagram[1].leave_out",
                    dl + 3,
                    "expected names of species or minerals of the database (strings) such as \"Hematite\", found an "
                    "integer in the list");
    }
    SUBCASE("leave_out with an empty name") {
        check_error(diagram_with(iron_element + "leave_out = [\"\"]\n"), "diagram[1].leave_out", dl + 1,
                    "expected the name of a species or a mineral, found an empty string");
    }
    SUBCASE("leave_out with a name twice") {
        check_error(diagram_with(iron_element + "leave_out = [\"Hematite\", \"Goethite\", \"Hematite\"]\n"),
                    "diagram[1].leave_out", dl + 1, "'Hematite' is listed twice");
    }
}

TEST_CASE("diagrams: ligands and leave_out") {
    const auto c = parse_case(diagram_with(iron_element + "water = \"loop\"\nligands = true\n"
                                                          "leave_out = [\"Hematite\",\n  \"Goethite\"]\n"),
                              "test.toml");
    REQUIRE(c.diagrams.size() == 1);
    const auto& d = c.diagrams[0];
    CHECK(d.spec.ligands);
    CHECK(d.spec.leave_out == std::vector<std::string>{"Hematite", "Goethite"});
    REQUIRE(d.spec.leave_out_where.size() == 2);
    CHECK(d.spec.leave_out_where[0].line == dl + 3);
    CHECK(d.spec.leave_out_where[1].line == dl + 4);
    // Defaults: no ligands, nothing left out; ligands = false needs no water.
    const auto plain = parse_case(diagram_with(iron_element + "ligands = false\n"), "test.toml");
    CHECK_FALSE(plain.diagrams[0].spec.ligands);
    CHECK(plain.diagrams[0].spec.leave_out.empty());
}

TEST_CASE("measured dissolved solids and conductance in the water block") {
    // An invented analysis with both measured values.
    const auto c = parse_case(R"toml(
[water.well]
pH = 7.4
measured_tds_mg_per_l = 512
measured_conductance_25c_us_per_cm = 830.5
[water.well.analytes]
Na = 20

[water.plain]
pH = 7.0
)toml",
                              "test.toml");
    REQUIRE(c.waters.size() == 2);
    REQUIRE(c.waters[0].measured.tds_mg_per_l.has_value());
    CHECK(*c.waters[0].measured.tds_mg_per_l == 512.0);
    REQUIRE(c.waters[0].measured.conductance_25c_us_per_cm.has_value());
    CHECK(*c.waters[0].measured.conductance_25c_us_per_cm == 830.5);
    // Not given: nothing measured.
    CHECK_FALSE(c.waters[1].measured.tds_mg_per_l.has_value());
    CHECK_FALSE(c.waters[1].measured.conductance_25c_us_per_cm.has_value());
}

TEST_CASE("errors: measured dissolved solids and conductance") {
    // Negative, zero, a string, and a slip of unit past the upper bound.
    check_error("[water.w]\npH = 7\nmeasured_tds_mg_per_l = -5\n", "water.w.measured_tds_mg_per_l", 3,
                "expected a measured dissolved solids above zero in mg/L, found -5");
    check_error("[water.w]\npH = 7\nmeasured_tds_mg_per_l = 0\n", "water.w.measured_tds_mg_per_l", 3,
                "leave the key out if it was not measured");
    check_error("[water.w]\npH = 7\nmeasured_tds_mg_per_l = \"512\"\n", "water.w.measured_tds_mg_per_l", 3,
                "expected a number, found a string");
    check_error("[water.w]\npH = 7\nmeasured_tds_mg_per_l = 2e6\n", "water.w.measured_tds_mg_per_l", 3,
                "of at most 1e+06, found 2e+06; is the unit right?");
    check_error("[water.w]\npH = 7\nmeasured_conductance_25c_us_per_cm = -830\n",
                "water.w.measured_conductance_25c_us_per_cm", 3,
                "expected a measured specific conductance at 25 °C above zero in µS/cm, found -830");
    check_error("[water.w]\npH = 7\nmeasured_conductance_25c_us_per_cm = true\n",
                "water.w.measured_conductance_25c_us_per_cm", 3, "expected a number, found a boolean");
    check_error("[water.w]\npH = 7\nmeasured_conductance_25c_us_per_cm = 5e6\n",
                "water.w.measured_conductance_25c_us_per_cm", 3, "is the unit right?");
}

// --- the one table of step kinds ------------------------------------------------------------

TEST_CASE("step kinds: one table, in the order of the alternatives, each with its keys") {
    using namespace deltag::process;
    const auto& table = deltag::io::step_keys();
    REQUIRE(table.size() == std::variant_size_v<StepAction>);
    for (std::size_t i = 0; i < table.size(); ++i) {
        CHECK(table[i].kind == step_kinds[i]);
        // Every kind takes kind and label; a blend names its waters instead of one water.
        const auto& keys = table[i].keys;
        CHECK(std::find(keys.begin(), keys.end(), "kind") != keys.end());
        CHECK(std::find(keys.begin(), keys.end(), "label") != keys.end());
    }
    // step_kind() of each alternative is its name in the table (a property of the visit).
    Step s;
    s.action = EquilibrateStep{};
    CHECK(step_kind(s) == "equilibrate");
    s.action = DoseStep{};
    CHECK(step_kind(s) == "dose");
    s.action = BlendStep{};
    CHECK(step_kind(s) == "blend");
    s.action = ConcentrateStep{};
    CHECK(step_kind(s) == "concentrate");
    s.action = TemperatureStep{};
    CHECK(step_kind(s) == "temperature");
}

TEST_CASE("step kinds: the README's process steps section documents every kind and every key") {
    std::ifstream f(std::string(DELTAG_SOURCE_DIR) + "/README.md");
    REQUIRE(f.good());
    const std::string readme((std::istreambuf_iterator<char>(f)), std::istreambuf_iterator<char>());
    const auto begin = readme.find("### Process steps");
    REQUIRE(begin != std::string::npos);
    const auto end = readme.find("\n### ", begin + 1);
    const std::string section = readme.substr(begin, end - begin);
    for (const auto& k : deltag::io::step_keys()) {
        CAPTURE(k.kind);
        CHECK(contains(section, "kind = \"" + k.kind + "\""));
        for (const auto& key : k.keys) {
            CAPTURE(key);
            CHECK((contains(section, key + " = ") || contains(section, "`" + key + "`")));
        }
    }
}
