// Running a whole case through the library alone (include/deltag/run.hpp): the command line is
// a thin shell over it, so the library's report of a demo case is the command's output, byte
// for byte; the files a case asks for come back as contents, never written by the library.
#include <doctest/doctest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "deltag/run.hpp"

namespace fs = std::filesystem;
using namespace deltag;

namespace {

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    return s.str();
}

// The command's standard output, run in `dir` (so default file names land there).
std::string command_output(const std::string& args, const fs::path& dir) {
    const fs::path out = dir / "stdout.txt";
    const std::string cmd = "cd '" + dir.string() + "' && '" + DELTAG_BINARY + "' " + args + " >'" + out.string() + "'";
    const int status = std::system(cmd.c_str());
    REQUIRE(WIFEXITED(status));
    REQUIRE(WEXITSTATUS(status) == 0);
    return slurp(out);
}

fs::path scratch() {
    static const fs::path dir = [] {
        fs::path d = fs::temp_directory_path() / ("deltag-run-test-" + std::to_string(::getpid()));
        fs::create_directories(d);
        return d;
    }();
    return dir;
}

// An invented case with a step, a sweep, a cell and a diagram.
const std::string whole_case = R"toml(title = "library run (invented)"
[water.loop]
temperature_c = 30
pH = 7.9
dissolved_oxygen_mg_per_l = 7
units = "mg/L"
[water.loop.analytes]
Ca = 60
Mg = 10
Na = 25
Cl = 40
SO4 = 30
Fe = 0.05
Alkalinity = { value = 150, as = "CaCO3" }

[[step]]
label = "twice"
kind = "concentrate"
factor = 2.0

[[sweep]]
label = "cycles"
step = "twice"
variable = "factor"
from = 1.0
to = 3.0
points = 5
outputs = ["si:Calcite", "langelier"]

[[cell]]
label = "oxygen on iron"
cathode = { half_reaction = "O2(g) + 4 H+ + 4 e- = 2 H2O", water = "loop" }
anode = { half_reaction = "Fe^2+ + 2 e- = Fe(s)", water = "loop" }

[[diagram]]
label = "iron"
element = "Fe"
water = "loop"
points = ["loop"]
)toml";

}  // namespace

TEST_CASE("the library's report of a demo case is the command's output, in text and JSON") {
    const fs::path demo = fs::path(DELTAG_SOURCE_DIR) / "cases" / "cooling-tower.toml";
    const CaseRun k = run_case(demo.string());
    CHECK(k.waters.size() == 1);
    CHECK(k.steps.size() == 4);
    CHECK(k.items.size() == 5);
    CHECK(k.sweeps.size() == 1);
    for (const char* format : {"text", "json", "csv"}) {
        CAPTURE(format);
        CHECK(report(k, format) == command_output("run '" + demo.string() + "' --format " + format, scratch()));
    }
    // The files the case asks for are returned with their contents, not written.
    REQUIRE(k.files.size() == 2);
    CHECK(k.files[0].path == "cooling-tower.cycles.csv");
    CHECK(k.files[1].path == "cooling-tower.cycles.svg");
    CHECK(k.files[1].content.find("<svg") != std::string::npos);
}

TEST_CASE("a case given as text runs whole: step, sweep, cell and diagram, files named after the origin") {
    const fs::path here = scratch() / "text-run";
    fs::create_directories(here);
    const CaseRun k = run_case_text(whole_case, "loop.toml", here.string());
    REQUIRE(k.items.size() == 2);
    CHECK(k.items[0].kind == "water");
    CHECK(k.items[1].kind == "concentrate");
    REQUIRE(k.items[0].outlook.has_value());
    CHECK(k.find("twice") == &k.steps[0].state);
    CHECK(k.find("nothing") == nullptr);
    REQUIRE(k.cells.size() == 1);
    CHECK(k.cells[0].label == "oxygen on iron");
    CHECK(k.cells[0].e_v > 0.0);  // oxygen drives iron's corrosion
    REQUIRE(k.diagram_results.size() == 1);
    REQUIRE(k.diagrams.size() == 1);
    CHECK(k.diagrams[0].svg_path == "loop.iron.svg");
    REQUIRE(k.files.size() == 4);  // sweep csv, svg; diagram svg, csv
    for (const auto& f : k.files) {
        CHECK_FALSE(f.content.empty());
        CHECK_FALSE(fs::exists(f.path));             // the library writes nothing
        CHECK_FALSE(fs::exists(here / f.path));
    }
    const auto j = nlohmann::json::parse(report(k, "json"));
    CHECK(j["results"].size() == 2);
    CHECK(j["cells"].size() == 1);
    CHECK(j["diagrams"].size() == 1);
    CHECK(j["deltag_version"] == std::string(version()));
}

TEST_CASE("waters and steps only: no sweeps, cells, diagrams or report items") {
    RunOptions o;
    o.waters_and_steps_only = true;
    const CaseRun k = run_case_text(whole_case, "loop.toml", scratch().string(), o);
    CHECK(k.waters.size() == 1);
    CHECK(k.steps.size() == 1);
    CHECK(k.items.empty());
    CHECK(k.sweeps.empty());
    CHECK(k.cells.empty());
    CHECK(k.files.empty());
}

TEST_CASE("without the outlook the report still gives each mineral's tendency, without amounts") {
    RunOptions o;
    o.outlook = false;
    const CaseRun k = run_case_text(whole_case, "loop.toml", scratch().string(), o);
    REQUIRE_FALSE(k.items.empty());
    CHECK_FALSE(k.items[0].outlook.has_value());
    const auto j = nlohmann::json::parse(report(k, "json"));
    const auto& first = j["results"][0]["outlook"]["minerals"][0];
    CHECK(first["to_equilibrium_mg_per_l"].is_null());
    CHECK_FALSE(first["to_equilibrium_unavailable_because"].get<std::string>().empty());
}

TEST_CASE("the errors of a run: a missing database file, an unknown format, a bad case") {
    SUBCASE("a database file that is not there") {
        RunOptions o;
        o.database = (scratch() / "no-such.toml").string();
        try {
            (void)run_case_text(whole_case, "loop.toml", scratch().string(), o);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.key() == "database");
            CHECK(e.message().find("no database file at") != std::string::npos);
        }
    }
    SUBCASE("a database named in the case, relative to the case's directory") {
        const std::string text = "database = \"missing.toml\"\n" + whole_case;
        try {
            (void)run_case_text(text, "loop.toml", "/nonexistent-dir", {});
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.key() == "database");
            CHECK(e.message().find("/nonexistent-dir/missing.toml") != std::string::npos);
            CHECK(e.where().line == 1);
        }
    }
    SUBCASE("an unknown report format, with the nearest one") {
        const CaseRun k = run_case_text(whole_case, "loop.toml", scratch().string());
        try {
            (void)report(k, "jsn");
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.key() == "--format");
            CHECK(e.suggestion() == "json");
        }
    }
    SUBCASE("a case with an unknown water in a cell names the cell's key") {
        std::string text = whole_case;
        text.replace(text.find("water = \"loop\" }\nanode"), 16, "water = \"lop\" }\n");
        CHECK_THROWS_AS((void)run_case_text(text, "loop.toml", scratch().string()), InputError);
    }
}
