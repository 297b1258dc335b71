// Case-file reader: the core of the case-file format (interface contract, "Case file (TOML)
// - the core") and every error the reader raises, each checked for its key, its line and
// what was expected.
#include <doctest/doctest.h>

#include <cstdio>
#include <fstream>
#include <optional>
#include <string>

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

// The case of the interface contract, without its [[step]] (steps come in a later version).
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
"Fe(II)" = 0.2
Al = { value = 3 }
)toml", "test.toml");
    const auto& an = c.waters[0].analytes;
    REQUIRE(an.size() == 3);
    CHECK(an[0].name == "Zn");
    CHECK(an[1].name == "Fe(II)");
    CHECK(an[1].key == "water.a.analytes.\"Fe(II)\"");
    CHECK(an[2].name == "Al");
    CHECK(an[2].value == 3.0);
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

TEST_CASE("errors: keys of later versions are refused, not ignored") {
    SUBCASE("step") {
        check_error("[water.a]\npH = 7\n\n[[step]]\nwater = \"a\"\nkind = \"equilibrate\"\n", "step", 4,
                    "process steps ([[step]]) are not run by this version of deltag yet; remove 'step'");
    }
    SUBCASE("sweep") {
        check_error("[water.a]\n[sweep]\nvalues = [1, 2]\n", "sweep", 2,
                    "sweeps are not run by this version of deltag yet");
    }
    SUBCASE("cell") {
        check_error("[water.a]\n\n[cell]\ncathode = \"x\"\n", "cell", 3,
                    "cells in a case file are not run by this version of deltag yet");
    }
    SUBCASE("diagram") {
        check_error("diagram = \"Fe\"\n[water.a]\n", "diagram", 1,
                    "diagrams are not run by this version of deltag yet");
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
                    "unknown concentration unit 'mg/l'; expected one of: mg/L, ug/L, mmol/L, umol/L, mol/L, "
                    "meq/L, mg/kg, mol/kgw, mmol/kgw",
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
    SUBCASE("a value that is not a number") {
        check_error("[water.a]\n[water.a.analytes]\nCa = \"<0.1\"\n", "water.a.analytes.Ca", 3,
                    "expected a concentration: a number, or a table { value = ..., unit = ..., as = ... }; "
                    "found a string");
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
        check_error("[water.a.analytes]\nCa = { value = 4, unit = \"ppm\" }\n", "water.a.analytes.Ca.unit", 2,
                    "unknown concentration unit 'ppm'");
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
