// The deltag command end to end: exit codes, messages naming file, line and key, no partial
// output on failure, and the JSON contract.
#include <doctest/doctest.h>

#include "text_match.hpp"

#include <sys/wait.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

namespace fs = std::filesystem;

namespace {

struct Run {
    int code = -1;
    std::string out, err;
};

fs::path scratch() {
    static const fs::path dir = [] {
        fs::path d = fs::temp_directory_path() / ("deltag-cli-test-" + std::to_string(::getpid()));
        fs::create_directories(d);
        return d;
    }();
    return dir;
}

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    return s.str();
}

fs::path write(const std::string& name, const std::string& text) {
    const fs::path p = scratch() / name;
    std::ofstream(p, std::ios::binary) << text;
    return p;
}

Run deltag(const std::string& args) {
    const fs::path out = scratch() / "stdout.txt", err = scratch() / "stderr.txt";
    const std::string cmd = std::string("'") + DELTAG_BINARY + "' " + args + " >'" + out.string() + "' 2>'" + err.string() + "'";
    const int status = std::system(cmd.c_str());
    Run r;
    r.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    r.out = slurp(out);
    r.err = slurp(err);
    return r;
}

// The report wraps its lines: a phrase matches wherever the wrap fell (text_match.hpp).
bool has(const std::string& text, const std::string& part) { return flat(text).find(flat(part)) != std::string::npos; }

const std::string good_case = R"toml(title = "CLI test water (invented)"
[water.tap]
temperature_c = 20
pH = 7.6
[water.tap.analytes]
Ca = 40
Na = 20
Cl = 35
Alkalinity = { value = 100, as = "CaCO3" }
)toml";

}  // namespace

TEST_CASE("run: a good case gives exit 0 and a text report") {
    const Run r = deltag("run '" + write("good.toml", good_case).string() + "'");
    CHECK(r.code == 0);
    CHECK(has(r.out, "1. tap: the water as given"));
    CHECK(has(r.out, "Calcite"));
    CHECK(has(r.out, "Caution:"));
    CHECK(r.err.empty());
}

TEST_CASE("run --format json writes the contract's JSON, to a file with --output") {
    const fs::path out = scratch() / "report.json";
    const Run r = deltag("run '" + write("good.toml", good_case).string() + "' --format json --output '" + out.string() + "'");
    REQUIRE(r.code == 0);
    CHECK(r.out.empty());
    const auto j = nlohmann::json::parse(slurp(out));
    CHECK(j["results"][0]["label"] == "tap");
    CHECK(j["results"][0]["pH"].get<double>() == doctest::Approx(7.6));
    CHECK(j.contains("deltag_version"));
}

TEST_CASE("run --format csv") {
    const Run r = deltag("run '" + write("good.toml", good_case).string() + "' --format csv");
    CHECK(r.code == 0);
    CHECK(r.out.rfind("label,", 0) == 0);
}

TEST_CASE("every demo case runs") {
    for (const auto& entry : fs::directory_iterator(fs::path(DELTAG_SOURCE_DIR) / "cases")) {
        if (entry.path().extension() != ".toml") continue;
        CAPTURE(entry.path().string());
        const Run r = deltag("run '" + entry.path().string() + "'");
        CHECK(r.code == 0);
        CHECK(!has(r.out, "nan"));
        CHECK(r.err.empty());
    }
}

TEST_CASE("bad input: exit 2, file:line and key named, nearest name suggested, nothing on stdout") {
    const std::string bad = R"toml(title = "typo (invented)"
[water.tap]
pH = 7.6
[water.tap.analytes]
Mgg = 11
)toml";
    const fs::path p = write("bad.toml", bad);
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, p.string() + ":5"));
    CHECK(has(r.err, "Mgg"));
    CHECK(has(r.err, "did you mean"));
}

TEST_CASE("bad input: a missing case file exits 2") {
    const Run r = deltag("run '" + (scratch() / "absent.toml").string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(!r.err.empty());
}

TEST_CASE("bad input: invalid TOML reports line and column") {
    const fs::path p = write("broken.toml", "title = \"x\"\n[water.a\npH = 7\n");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, p.string() + ":2"));
    CHECK(has(r.err, "not valid TOML"));
}

TEST_CASE("bad command lines exit 2") {
    CHECK(deltag("frobnicate").code == 2);
    CHECK(deltag("run").code == 2);
    CHECK(deltag("run x.toml --format pdf").code == 2);
    CHECK(deltag("").code == 2);
    const Run r = deltag("run '" + write("good.toml", good_case).string() + "' --output /nonexistent-dir/x.json");
    CHECK(r.code == 2);
    CHECK(has(r.err, "cannot write"));
}

TEST_CASE("--version and --help exit 0") {
    const Run v = deltag("--version");
    CHECK(v.code == 0);
    CHECK(has(v.out, "deltag 0.1.0"));
    const Run h = deltag("--help");
    CHECK(h.code == 0);
    CHECK(has(h.out, "run"));
    CHECK(has(h.out, "database"));
}

TEST_CASE("a case naming a database file that does not exist exits 2") {
    const fs::path p = write("nodb.toml", "database = \"nowhere.toml\"\n[water.a]\npH = 7\n");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "no database file"));
}

TEST_CASE("a water with no solution exits 2 and says which water and why") {
    // Charge balance on Na+ with far more calcium than chloride: sodium would have to be
    // negative (about -19 mmol/kgw by hand: 2 x 10 meq Ca against 1 meq Cl).
    const fs::path p = write("noconv.toml", R"toml([water.odd]
pH = 7.0
charge_balance = "Na"
units = "mmol/L"
[water.odd.analytes]
Na = 1
Ca = 10
Cl = 1
)toml");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, "odd"));
    CHECK(has(r.err, "charge_balance"));
    CHECK(has(r.err, "would need a negative amount"));
}

TEST_CASE("database check passes on core and fails clearly on an unbalanced reaction") {
    const Run ok = deltag("database check");
    CHECK(ok.code == 0);
    CHECK(has(ok.out, "0 errors"));
    const Run core_file = deltag("database check '" + (fs::path(DELTAG_SOURCE_DIR) / "databases" / "core.toml").string() + "'");
    CHECK(core_file.code == 0);

    const fs::path p = write("unbalanced.toml", R"toml([sources.test]
citation = "A made-up source for a test, 2026"
[components."H2O"]
source = "test"
temperature_range_c = [0, 100]
[components."H+"]
source = "test"
temperature_range_c = [0, 100]
[components."Ca^2+"]
source = "test"
temperature_range_c = [0, 100]
ion_size_angstrom = 6
[species."CaOH+"]
reaction = "Ca^2+ + H2O = CaOH+ + 2 H+"
log_k = -12.78
delta_h_kj_per_mol = 60
temperature_range_c = [0, 100]
source = "test"
ion_size_angstrom = 4
)toml");
    const Run bad = deltag("database check '" + p.string() + "'");
    CHECK(bad.code == 2);
    CHECK(has(bad.err, p.string() + ":13"));  // the [species."CaOH+"] table
    CHECK(has(bad.err, "species.CaOH+"));
    CHECK(has(bad.err, "not balanced"));
    CHECK(has(bad.err, "H +1"));
    CHECK(has(bad.err, "charge +1"));
    // The same database refused for a run.
    const fs::path c = write("uses-unbalanced.toml", "database = \"unbalanced.toml\"\n[water.a]\npH = 7\n");
    const Run run = deltag("run '" + c.string() + "'");
    CHECK(run.code == 2);
    CHECK(has(run.err, "not balanced"));
    CHECK(run.out.empty());
}

TEST_CASE("database check on a missing file exits 2") {
    CHECK(deltag("database check /nonexistent/db.toml").code == 2);
}

TEST_CASE("database show prints an entry with log K at 0, 25, 50 and 100 degC") {
    const Run r = deltag("database show Calcite");
    CHECK(r.code == 0);
    CHECK(has(r.out, "Calcite (mineral)"));
    CHECK(has(r.out, "0 °C:"));
    CHECK(has(r.out, "25 °C: -8.480"));  // Plummer & Busenberg (1982), check-values.md
    CHECK(has(r.out, "50 °C:"));
    CHECK(has(r.out, "100 °C:"));
    CHECK(has(r.out, "Plummer"));
    const Run s = deltag("database show 'CaHCO3+'");
    CHECK(s.code == 0);
    CHECK(has(s.out, "aqueous species"));
}

TEST_CASE("database show of an unknown name exits 2 with the nearest name") {
    const Run r = deltag("database show Calcit");
    CHECK(r.code == 2);
    CHECK(has(r.err, "did you mean 'Calcite'"));
    CHECK(r.out.empty());
}

TEST_CASE("a write that fails (device full) exits 2 and says so") {
    const Run r = deltag("run '" + write("good.toml", good_case).string() + "' --output /dev/full");
    CHECK(r.code == 2);
    CHECK(has(r.err, "/dev/full"));
}

TEST_CASE("steps: an over-constrained equilibrate exits 2 and names the conflict") {
    const fs::path p = write("overc.toml", good_case + R"toml(
[[step]]
kind = "equilibrate"
solids = ["Calcite", "Aragonite"]
)toml");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, "over-constrained"));
    CHECK(has(r.err, "Aragonite"));
    CHECK(has(r.err, "Calcite"));
    CHECK(has(r.err, p.string() + ":"));
}

TEST_CASE("steps: a dose target the reagent cannot reach exits 2") {
    const fs::path p = write("unreach.toml", good_case + R"toml(
[[step]]
kind = "dose"
reagent = "NaOH"
until = { pH = 5.0 }
)toml");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, "cannot bring it to 5"));
}

TEST_CASE("steps and a sweep: report blocks, JSON keys, sweep files") {
    const fs::path p = write("sweep.toml", good_case + R"toml(
[[step]]
label = "concentrated"
kind = "concentrate"
factor = 3

[[step]]
label = "acid"
kind = "dose"
reagent = "H2SO4"
until = { langelier = 0.0 }

[[sweep]]
label = "scan"
step = "concentrated"
variable = "factor"
from = 1
to = 4
points = 4
outputs = ["si:Calcite", "langelier"]
csv = "scan-out.csv"
svg = "scan-out.svg"
)toml");
    fs::remove(scratch() / "scan-out.csv");
    fs::remove(scratch() / "scan-out.svg");
    const Run t = deltag("run '" + p.string() + "'");
    REQUIRE(t.code == 0);
    CHECK(has(t.out, "concentrated: after the concentrate step"));
    CHECK(has(t.out, "acid: after the dose step"));
    CHECK(has(t.out, "Langelier (LSI)"));
    CHECK(has(t.out, "licensed practice"));
    CHECK(has(t.out, "Sweep 'scan'"));
    CHECK(fs::exists(scratch() / "scan-out.csv"));
    CHECK(fs::exists(scratch() / "scan-out.svg"));
    CHECK(slurp(scratch() / "scan-out.svg").rfind("<svg", 0) == 0);
    const Run j = deltag("run '" + p.string() + "' --format json");
    REQUIRE(j.code == 0);
    const auto doc = nlohmann::json::parse(j.out);
    REQUIRE(doc["results"].size() == 3);
    CHECK(doc["results"][1]["kind"] == "concentrate");
    CHECK(doc["results"][2]["dose"]["reagent"] == "H2SO4");
    CHECK(std::abs(doc["results"][2]["indices"]["langelier"].get<double>()) < 1e-6);
    CHECK(doc["sweeps"][0]["x"].size() == 4);
}

TEST_CASE("cell: Cu-Zn at unit activities with the core database, text and JSON") {
    // E° = 0.33938 - (-0.7618) = 1.10118 V: copper from the NBS tables (Wagman et al. 1982,
    // Delta_f G(Cu^2+) = 65.49 kJ/mol, E° = 65490/(2F); the core database keeps all copper data
    // in that one set), zinc from Bard, Parsons & Jordan (1985); dG° = -2F E° = -212.50 kJ/mol.
    // (With Bard's copper, 0.3419 V, it would be 1.1037 V: a 2.5 mV spread of sources.)
    const std::string args = "cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --activity 'Cu^2+=1' --activity 'Zn^2+=1'";
    const Run t = deltag(args);
    CHECK(t.code == 0);
    CHECK(has(t.out, "+1.1012 V"));
    CHECK(has(t.out, "Caution"));
    const Run j = deltag(args + " --format json");
    REQUIRE(j.code == 0);
    const auto doc = nlohmann::json::parse(j.out);
    REQUIRE(doc["cells"].size() == 1);
    const auto& c = doc["cells"][0];
    CHECK(c["n_electrons"].get<double>() == 2.0);
    CHECK(c["e0_v"].get<double>() == doctest::Approx(1.10118).epsilon(1e-4));
    CHECK(c["delta_g0_kj_per_mol"].get<double>() == doctest::Approx(-212.50).epsilon(0.05 / 212.5));
    CHECK(c["spontaneous"] == true);
    // --ph gives H+: the O2/H2O couple against the hydrogen electrode at pH 7 is 1.229 V (pH cancels).
    const Run o = deltag("cell --cathode 'O2(g) + 4 H+ + 4 e- = 2 H2O' --anode '2 H+ + 2 e- = H2(g)' --ph 7 --activity 'O2(g)=1' --activity 'H2(g)=1' --format json");
    REQUIRE(o.code == 0);
    CHECK(nlohmann::json::parse(o.out)["cells"][0]["e_v"].get<double>() == doctest::Approx(1.229).epsilon(0.002 / 1.229));
}

TEST_CASE("cell: activities from a water of a case") {
    const fs::path p = write("cellwater.toml", good_case);
    const Run r = deltag("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --water '" + p.string() +
                         ":tap' --activity 'Cu^2+=1e-6' --activity 'Zn^2+=1e-6'");
    CHECK(r.code == 0);
    CHECK(has(r.out, "at 20.0 °C"));
    const Run bad = deltag("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --water '" + p.string() + ":tapp'");
    CHECK(bad.code == 2);
    CHECK(has(bad.err, "did you mean 'tap'"));
    CHECK(deltag("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --water nocolon").code == 2);
    CHECK(deltag("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --water '" + p.string() +
                 ":tap' --temperature-c 30").code == 2);
    CHECK(deltag("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --water '" + p.string() + ":tap' --ph 7").code == 2);
}

TEST_CASE("cell: bad half-reactions and activities exit 2 with a clear message") {
    auto fails = [](const std::string& args, const char* fragment) {
        const Run r = deltag(args);
        CHECK(r.code == 2);
        CHECK(r.out.empty());
        CHECK(has(r.err, fragment));
    };
    fails("cell --cathode 'Cu^2+ + e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)'", "not balanced");
    fails("cell --cathode 'Cu^2+ = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)'", "no electrons");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Qq^2+ + 2 e- = Qq(s)'", "cannot read the half-reaction");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Ag+ + e- = Agg(s)'", "cannot read");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --activity 'Cu^2+=1'", "no activity for 'Zn^2+'");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --activity 'Cu^2+'", "expected SPECIES=VALUE");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --activity 'Cu^2+=-3'", "must be a positive number");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --temperature-c 150", "expected a temperature from 0 to 100 °C");
    fails("cell --cathode 'Cu^2+ + 2 e- = Cu(s)' --anode 'Zn^2+ + 2 e- = Zn(s)' --ph 15", "pH within 0-14");
}

TEST_CASE("potential: SCE to SHE +0.241 V at 25 degC; JSON keys; unknown electrodes exit 2") {
    // SCE +0.241 V vs SHE at 25 degC (common practice, check-values.md).
    const Run j = deltag("potential 0 --from SCE --to SHE --format json");
    REQUIRE(j.code == 0);
    const auto doc = nlohmann::json::parse(j.out);
    CHECK(doc["value_v"].get<double>() == doctest::Approx(0.241));
    CHECK(doc["from"] == "SCE");
    CHECK(doc["to"] == "SHE");
    CHECK(doc["temperature_c"].get<double>() == 25.0);
    const Run t = deltag("potential 0.25 --from 'Ag/AgCl(sat KCl)' --to 'Cu/CuSO4(sat)' --temperature-c 30");
    CHECK(t.code == 0);
    CHECK(has(t.out, "pe"));
    const Run bad = deltag("potential 0.1 --from SCEE --to SHE");
    CHECK(bad.code == 2);
    CHECK(has(bad.err, "did you mean 'SCE'"));
    CHECK(deltag("potential 0.1 --from SCE").code == 2);
    CHECK(deltag("potential --from SCE --to SHE").code == 2);
    CHECK(deltag("potential 0.1 --from SCE --to SHE --temperature-c 120").code == 2);
    // dG to E: -213 kJ/mol with n = 2 is 1.1038 V.
    const Run g = deltag("potential --delta-g-kj -213 --electrons 2 --format json");
    REQUIRE(g.code == 0);
    CHECK(nlohmann::json::parse(g.out)["e_v"].get<double>() == doctest::Approx(1.10379).epsilon(1e-5));
    CHECK(deltag("potential --delta-g-kj -213").code == 2);
    CHECK(deltag("potential 0.3 --delta-g-kj -213 --electrons 2").code == 2);
}

TEST_CASE("run: cells and diagrams of a case, JSON and files") {
    const fs::path p = write("electro.toml", R"toml(
title = "electro test (invented)"
[water.a]
pH = 7.5
dissolved_oxygen_mg_per_l = 8
units = "mg/L"
[water.a.analytes]
Na = 20
Cl = 30
Cu = 0.05
Fe = 0.1
Alkalinity = { value = 50, as = "CaCO3" }
[water.s]
pH = 7.5
dissolved_oxygen_mg_per_l = 0.5
units = "mg/L"
[water.s.analytes]
Na = 20
Cl = 30
Alkalinity = { value = 50, as = "CaCO3" }

[[cell]]
label = "aeration"
cathode = { half_reaction = "O2(g) + 4 H+ + 4 e- = 2 H2O", water = "a" }
anode = { half_reaction = "O2(g) + 4 H+ + 4 e- = 2 H2O", water = "s" }

[[diagram]]
label = "fe"
element = "Fe"
water = "a"
points = ["a", "s"]
svg = "fe-test.svg"
csv = "fe-test.csv"
)toml");
    const Run r = deltag("run '" + p.string() + "' --format json");
    REQUIRE(r.code == 0);
    const auto doc = nlohmann::json::parse(r.out);
    REQUIRE(doc["cells"].size() == 1);
    // Same pH: E = (RT/4F) ln(p_O2,a / p_O2,s) = (0.0591597/4) log10(8 / 0.5) = 0.01781 V
    // (dissolved oxygen proportional to its pressure, Henry's law; gamma(O2) taken as 1).
    CHECK(doc["cells"][0]["e_v"].get<double>() == doctest::Approx(0.0591597 / 4 * std::log10(8.0 / 0.5)).epsilon(0.01));
    CHECK(doc["results"][0]["redox"]["couples"].size() > 0);
    CHECK(doc["results"][0]["redox"]["eh_v_vs"].contains("SCE"));
    CHECK(fs::exists(scratch() / "fe-test.svg"));
    CHECK(slurp(scratch() / "fe-test.csv").rfind("region_a,region_b", 0) == 0);
    // A point without a redox level is refused.
    const fs::path q = write("electro2.toml", R"toml(
[water.a]
pH = 7
[water.a.analytes]
Na = 1
Cl = 1
[[diagram]]
element = "Fe"
points = ["a"]
)toml");
    const Run bad = deltag("run '" + q.string() + "'");
    CHECK(bad.code == 2);
    CHECK(has(bad.err, "has no redox level"));
}

TEST_CASE("a case whose pHs cannot exist runs to the end (exit 0) with the reason shown, sweep included") {
    // Invented RO permeate (Ca 0.1 mg/L, alkalinity 0.01 meq/L): no pH saturates it with
    // calcite. Before, its pHs search aborted the whole run.
    const std::string text = R"toml(title = "RO permeate and a blend sweep (invented)"
[water.hard]
pH = 7.8
[water.hard.analytes]
Ca = 100
Na = 20
Cl = 40
Alkalinity = { value = 200, as = "CaCO3" }

[water.permeate]
pH = 6.0
[water.permeate.analytes]
Ca = 0.1
Na = 1.0
Cl = 1.5
Alkalinity = { value = 0.01, unit = "meq/L" }

[[step]]
label = "mix"
kind = "blend"
waters = { hard = 0.5, permeate = 0.5 }

[[sweep]]
label = "share"
step = "mix"
variable = "fraction"
fraction_of = "permeate"
from = 0.0
to = 1.0
points = 3
outputs = ["langelier", "ccpp"]
csv = "share.csv"
svg = "share.svg"
)toml";
    const fs::path c = write("permeate.toml", text);
    const Run r = deltag("run '" + c.string() + "'");
    CHECK(r.code == 0);
    CHECK(has(r.out, "Langelier, Ryznar n/a calcite saturation cannot be reached"));
    CHECK(has(r.out, "n/a"));
    CHECK_FALSE(has(r.out, "nan"));
    const Run j = deltag("run '" + c.string() + "' --format json");
    CHECK(j.code == 0);
    const auto doc = nlohmann::json::parse(j.out);
    CHECK(doc["results"][1]["indices"]["langelier"].is_null());
    CHECK(doc["sweeps"][0]["series"]["Langelier index"][2].is_null());
    CHECK_FALSE(doc["sweeps"][0]["notes"].empty());
    const std::string csv = slurp(scratch() / "share.csv");
    CHECK_FALSE(has(csv, "nan"));
}

TEST_CASE("run: a concentration factor beyond 1000 is bad input (exit 2), not a failed calculation") {
    for (const char* factor : {"1e6", "1e300"}) {
        CAPTURE(factor);
        const Run r = deltag("run '" +
                             write("factor.toml", good_case + "[[step]]\nkind = \"concentrate\"\nfactor = " + factor + "\n").string() +
                             "'");
        CHECK(r.code == 2);
        CHECK(has(r.err, "factor.toml:12:"));
        CHECK(has(r.err, "step[1].factor"));
        CHECK(has(r.err, "expected a concentration factor from 1 to 1000"));
        CHECK(r.out.empty());
    }
}

TEST_CASE("run: iron kept apart from the redox level by choice is reported in the JSON warnings") {
    const Run r = deltag("run '" + write("apart.toml", R"toml(
[water.well]
pH = 6.9
pe = 0.5
units = "mg/L"
[water.well.analytes]
Ca = 60
Na = 20
Cl = 30
Alkalinity = { value = 180, as = "CaCO3" }
Fe = { "+2" = 2.0, "+3" = 0.2 }
[[step]]
label = "aerated, iron kept apart"
kind = "equilibrate"
partial_pressures = { O2 = { percent = 21 } }
keep_redox_states_apart = true
)toml").string() + "' --format json");
    REQUIRE(r.code == 0);
    const auto doc = nlohmann::json::parse(r.out);
    bool said = false;
    for (const auto& w : doc["results"][1]["warnings"]) said = said || has(w.get<std::string>(), "kept apart");
    CHECK(said);
}

// ---- Paths the system refuses, directories, and files written all together or not at all.

namespace {

// A path longer than the system allows (PATH_MAX is 4096 on Linux).
std::string too_long_path() {
    std::string p = "/tmp";
    while (p.size() < 5000) p += "/a-directory-name-of-some-length";
    return p + "/core.toml";
}

// Names in the scratch directory that look like left-over temporary files.
int temp_files_left() {
    int n = 0;
    for (const auto& e : fs::directory_iterator(scratch()))
        if (has(e.path().filename().string(), "deltag-tmp")) ++n;
    return n;
}

// The deltag command run by the shell after `prefix` (e.g. a file-size limit).
Run deltag_after(const std::string& prefix, const std::string& args) {
    const fs::path out = scratch() / "stdout.txt", err = scratch() / "stderr.txt";
    const std::string cmd = prefix + "; '" + DELTAG_BINARY + "' " + args + " >'" + out.string() + "' 2>'" + err.string() + "'";
    const int status = std::system(cmd.c_str());
    Run r;
    r.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    r.out = slurp(out);
    r.err = slurp(err);
    return r;
}

}  // namespace

TEST_CASE("a database path longer than the system allows exits 2 naming the file and the key") {
    // In the case file: the message points at the case's 'database' key (line 1).
    const fs::path p = write("longdb.toml", "database = \"" + too_long_path() + "\"\n[water.a]\npH = 7\n");
    const Run r = deltag("run '" + p.string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, p.string() + ":1"));
    CHECK(has(r.err, "'database': no database file at"));
    CHECK(has(r.err, "File name too long"));
    // On the command line.
    const Run c = deltag("run '" + write("good.toml", good_case).string() + "' --database '" + too_long_path() + "'");
    CHECK(c.code == 2);
    CHECK(c.out.empty());
    CHECK(has(c.err, "command line: 'database': no database file at"));
    CHECK(has(c.err, "File name too long"));
    // database check and database show take a path too.
    const Run k = deltag("database check '" + too_long_path() + "'");
    CHECK(k.code == 2);
    CHECK(has(k.err, "no database file here (File name too long)"));
    const Run s = deltag("database show Calcite --database '" + too_long_path() + "'");
    CHECK(s.code == 2);
    CHECK(has(s.err, "File name too long"));
}

TEST_CASE("a directory given as the case file is named as a directory") {
    const Run r = deltag("run '" + scratch().string() + "'");
    CHECK(r.code == 2);
    CHECK(r.out.empty());
    CHECK(has(r.err, scratch().string() + ": this is a directory, not a case file"));
    CHECK(!has(r.err, "at least one water"));
}

TEST_CASE("a case file path longer than the system allows exits 2") {
    const Run r = deltag("run '" + too_long_path() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "cannot open the case file: File name too long"));
}

TEST_CASE("a run whose second output file cannot be written leaves the first untouched and creates none") {
    const std::string sweep = R"toml(
[[step]]
label = "concentrated"
kind = "concentrate"
factor = 2

[[sweep]]
step = "concentrated"
variable = "factor"
from = 1
to = 3
points = 3
outputs = ["si:Calcite"]
csv = "atomic-first.csv"
)toml";
    // The svg of the sweep goes to a directory that does not exist.
    const fs::path p = write("atomic.toml", good_case + sweep + "svg = \"no-such-dir/atomic.svg\"\n");
    fs::remove(scratch() / "atomic-first.csv");
    const fs::path report = scratch() / "atomic-report.json";
    std::ofstream(report) << "an earlier report\n";
    const Run r = deltag("run '" + p.string() + "' --format json --output '" + report.string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "'sweep[1].svg': cannot write to this file"));
    CHECK(!fs::exists(scratch() / "atomic-first.csv"));
    CHECK(slurp(report) == "an earlier report\n");
    // An existing first file keeps its content too.
    std::ofstream(scratch() / "atomic-first.csv") << "an earlier sweep\n";
    CHECK(deltag("run '" + p.string() + "'").code == 2);
    CHECK(slurp(scratch() / "atomic-first.csv") == "an earlier sweep\n");
    CHECK(temp_files_left() == 0);
    // With the directory there, all three files are written.
    fs::create_directories(scratch() / "no-such-dir");
    const Run ok = deltag("run '" + p.string() + "' --format json --output '" + report.string() + "'");
    CHECK(ok.code == 0);
    CHECK(slurp(scratch() / "atomic-first.csv").rfind("concentration factor", 0) == 0);
    CHECK(slurp(scratch() / "no-such-dir" / "atomic.svg").rfind("<svg", 0) == 0);
    CHECK(nlohmann::json::parse(slurp(report))["results"].size() == 2);
    fs::remove_all(scratch() / "no-such-dir");
}

TEST_CASE("an --output write that fails half way leaves the earlier file intact and no temporary file") {
    // A file-size limit of 2 blocks (1 KiB in dash, 2 KiB in bash) is far below the JSON
    // report; the signal that would end the process is ignored so the write fails (EFBIG).
    const fs::path report = scratch() / "half-report.json";
    std::ofstream(report) << "an earlier report\n";
    const Run r = deltag_after("trap '' XFSZ; ulimit -f 2",
                               "run '" + write("good.toml", good_case).string() + "' --format json --output '" + report.string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "writing failed: File too large"));
    CHECK(slurp(report) == "an earlier report\n");
    CHECK(temp_files_left() == 0);
}

TEST_CASE("a failed calculation leaves an existing --output file as it was") {
    const fs::path report = scratch() / "unchanged-report.txt";
    std::ofstream(report) << "an earlier report\n";
    const fs::path p = write("unreach2.toml", good_case + R"toml(
[[step]]
kind = "dose"
reagent = "NaOH"
until = { pH = 5.0 }
)toml");
    CHECK(deltag("run '" + p.string() + "' --output '" + report.string() + "'").code == 2);
    CHECK(slurp(report) == "an earlier report\n");
}

TEST_CASE("run: a water that does not converge exits 3 with the residual and a hint") {
    // No plausible water is known to fail any more, so the exit-3 path is reached through a
    // database of our own making: calcium sulfate as an aqueous complex with log K 400 (real
    // ion pairs sit below 10; this one puts the free ions near 1e-200 mol/kgw).
    std::string db = slurp(fs::path(DELTAG_SOURCE_DIR) / "databases" / "core.toml");
    const std::string from = "reaction = \"Ca^2+ + SO4^2- = CaSO4(aq)\"\nlog_k = 2.30";
    const auto at = db.find(from);
    REQUIRE(at != std::string::npos);
    db.replace(at, from.size(), "reaction = \"Ca^2+ + SO4^2- = CaSO4(aq)\"\nlog_k = 400.0");
    write("absurd-complex.toml", db);
    const fs::path c = write("absurd-run.toml", R"toml(database = "absurd-complex.toml"
[water.w]
pH = 7.0
units = "mmol/kgw"
[water.w.analytes]
Ca = 1
SO4 = 1
)toml");
    const Run r = deltag("run '" + c.string() + "'");
    CHECK(r.code == 3);
    CHECK(has(r.err, "water 'w': did not converge"));
    CHECK(has(r.err, "scaled residual"));
    CHECK(has(r.err, "check the analysis"));
}

TEST_CASE("run: a water's measured TDS and conductance reach its figures in the JSON, not a step's") {
    // An invented water with measured values, and one step from it.
    const fs::path p = write("measured.toml", R"toml(title = "measured values (invented)"
[water.tap]
pH = 7.6
measured_tds_mg_per_l = 300
measured_conductance_25c_us_per_cm = 480
[water.tap.analytes]
Ca = 40
Na = 20
Cl = 35
Alkalinity = { value = 100, as = "CaCO3" }

[[step]]
label = "warm"
kind = "temperature"
temperature_c = 40
)toml");
    const Run r = deltag("run '" + p.string() + "' --format json");
    REQUIRE(r.code == 0);
    const auto j = nlohmann::json::parse(r.out);
    const auto& water = j["results"][0]["figures"];
    CHECK(water["tds_measured_mg_per_l"]["measured"].get<double>() == 300.0);
    CHECK(water["specific_conductance_25c_measured_us_per_cm"]["measured"].get<double>() == 480.0);
    CHECK(water["standard_methods_1030e_checks"].size() == 6);
    // The step's water is no longer the sample the lab measured.
    const auto& step = j["results"][1]["figures"];
    CHECK(step["tds_measured_mg_per_l"].is_null());
    CHECK(step["standard_methods_1030e_checks"].empty());
}

namespace {

// An invented oxic water with iron and carbonate, for the cells and diagrams below.
const std::string oxic_case = R"toml(title = "oxic loop (invented)"
[water.oxic]
pH = 7.8
dissolved_oxygen_mg_per_l = 8
units = "mg/L"
[water.oxic.analytes]
Na = 20
Cl = 30
Fe = 0.05
Cu = 0.02
Alkalinity = { value = 80, as = "CaCO3" }
)toml";

const nlohmann::json* quotient_term(const nlohmann::json& electrode, const std::string& species) {
    for (const auto& q : electrode["quotient"])
        if (q["species"] == species) return &q;
    return nullptr;
}

}  // namespace

TEST_CASE("run: a cell says where each activity came from, with and without the metal-ion convention") {
    const fs::path p = write("provenance.toml", oxic_case + R"toml(
[[cell]]
label = "as the water has it"
cathode = "O2(g) + 4 H+ + 4 e- = 2 H2O"
anode = "Fe^2+ + 2 e- = Fe(s)"
water = "oxic"

[[cell]]
label = "corrosion convention"
cathode = "O2(g) + 4 H+ + 4 e- = 2 H2O"
anode = "Fe^2+ + 2 e- = Fe(s)"
water = "oxic"
metal_ion_activity = 1e-6
)toml");
    const Run r = deltag("run '" + p.string() + "' --format json");
    REQUIRE(r.code == 0);
    const auto doc = nlohmann::json::parse(r.out);
    REQUIRE(doc["cells"].size() == 2);
    // Cells feed cathodic-protection decisions: the JSON carries that caution.
    CHECK(has(doc["electrochemistry_caution"].get<std::string>(), "cathodic-protection"));

    const auto& plain = doc["cells"][0]["electrodes"];
    REQUIRE(plain.size() == 2);
    CHECK(plain[0]["role"] == "cathode");
    CHECK(plain[1]["role"] == "anode");
    CHECK(plain[1]["water"] == "oxic");
    CHECK(plain[1]["metal_ion_convention"].is_null());
    CHECK(plain[1]["activities_from"] == "the speciation of water 'oxic'");
    const auto* fe_water = quotient_term(plain[1], "Fe^2+");
    REQUIRE(fe_water != nullptr);
    CHECK((*fe_water)["origin"] == "water");
    CHECK((*fe_water)["detail"] == "speciation of water 'oxic'");
    // Oxic water at pH 7.8: ferrous iron is scarce (thermodynamically right, far below 1e-6).
    CHECK((*fe_water)["activity"].get<double>() < 1e-10);
    const auto* fe_metal = quotient_term(plain[1], "Fe(s)");
    REQUIRE(fe_metal != nullptr);
    CHECK((*fe_metal)["origin"] == "unit");
    const auto* o2 = quotient_term(plain[0], "O2(g)");
    REQUIRE(o2 != nullptr);
    CHECK((*o2)["origin"] == "water");
    CHECK((*o2)["detail"] == "partial pressure in equilibrium with water 'oxic'");
    CHECK((*quotient_term(plain[0], "H+"))["origin"] == "water");
    CHECK((*quotient_term(plain[0], "H2O"))["origin"] == "water");

    const auto& conv = doc["cells"][1]["electrodes"];
    const auto* fe_conv = quotient_term(conv[1], "Fe^2+");
    REQUIRE(fe_conv != nullptr);
    CHECK((*fe_conv)["origin"] == "convention");
    CHECK((*fe_conv)["activity"].get<double>() == 1e-6);
    CHECK(conv[1]["metal_ion_convention"]["metal"] == "Fe");
    CHECK(conv[1]["metal_ion_convention"]["customary"] == true);
    CHECK(conv[1]["metal_ion_convention"]["applied_to"] == nlohmann::json::array({"Fe^2+"}));
    // The cathode (oxygen) has no metal: the convention touches none of its terms.
    CHECK(conv[0]["metal_ion_convention"]["metal"].is_null());
    CHECK(conv[0]["metal_ion_convention"]["applied_to"].empty());
    // The anode's Nernst term moves from the water's activity to 1e-6:
    // dE(anode) = -(RT/2F) ln(1e-6 / a_water), at the water's 25 degC.
    const double slope = 8.314462618 * 298.15 * std::log(10.0) / 96485.33212;
    const double shift = -slope / 2.0 * std::log10(1e-6 / (*fe_water)["activity"].get<double>());
    CHECK(conv[1]["e_v"].get<double>() - plain[1]["e_v"].get<double>() == doctest::Approx(-shift).epsilon(1e-9));
    CHECK(conv[1]["e_v"].get<double>() == doctest::Approx(conv[1]["e0_v"].get<double>() - slope * 3.0).epsilon(1e-9));

    // The text report names the sources and carries the caution.
    const Run t = deltag("run '" + p.string() + "'");
    REQUIRE(t.code == 0);
    CHECK(has(t.out, "a(Fe^2+) = 1e-06      metal-ion convention (1e-06, customary in corrosion work)"));
    CHECK(has(t.out, "            activities: dissolved Fe species at activity 1e-06 (the customary\n"
                     "                convention of corrosion work, common practice); pure phases at\n"
                     "                unit activity\n"));
    CHECK(has(t.out, "a(Fe(s)) = 1          pure solid"));
    CHECK(has(t.out, "activities: the speciation of water 'oxic'"));
    CHECK(has(t.out, "Caution: corrosion and cathodic-protection decisions"));
}

TEST_CASE("cell --metal-ion-activity: the convention on the command line") {
    // Fe^2+/Fe against the hydrogen electrode at pH 0: E(anode) = E° + (RT/2F) ln 1e-6 =
    // -0.447 - 0.1775 V (E° of the core database, Bard, Parsons & Jordan 1985).
    const Run r = deltag("cell --cathode '2 H+ + 2 e- = H2(g)' --anode 'Fe^2+ + 2 e- = Fe(s)' --ph 0 "
                         "--activity 'H2(g)=1' --metal-ion-activity 1e-6 --format json");
    REQUIRE(r.code == 0);
    const auto doc = nlohmann::json::parse(r.out);
    const auto& anode = doc["cells"][0]["electrodes"][1];
    CHECK(anode["e_v"].get<double>() == doctest::Approx(-0.447 - 0.17748).epsilon(0.00002 / 0.6245));
    CHECK((*quotient_term(anode, "Fe^2+"))["origin"] == "convention");
    CHECK((*quotient_term(doc["cells"][0]["electrodes"][0], "H+"))["origin"] == "given");
    CHECK(has(doc["caution"].get<std::string>(), "cathodic-protection"));
    const Run bad = deltag("cell --cathode '2 H+ + 2 e- = H2(g)' --anode 'Fe^2+ + 2 e- = Fe(s)' --ph 0 "
                           "--activity 'H2(g)=1' --metal-ion-activity 2");
    CHECK(bad.code == 2);
    CHECK(has(bad.err, "expected an activity above 0 and at most 1 (1e-6 is the customary value)"));
}

TEST_CASE("run: a diagram leaves out the solids named in leave_out; an unknown name is refused with the nearest") {
    const std::string diagram = R"toml(
[[diagram]]
label = "fe"
element = "Fe"
svg = "leave-fe.svg"
csv = "leave-fe.csv"
)toml";
    // Without leave_out the aged oxides are the stable iron solids; ferrihydrite has no region.
    const fs::path p = write("leave0.toml", oxic_case + diagram);
    REQUIRE(deltag("run '" + p.string() + "'").code == 0);
    const std::string with_oxides = slurp(scratch() / "leave-fe.csv");
    CHECK(has(with_oxides, "Hematite"));
    CHECK_FALSE(has(with_oxides, "Ferrihydrite"));
    // With hematite and goethite left out, fresh ferrihydrite takes their place.
    const fs::path q = write("leave1.toml", oxic_case + diagram + "leave_out = [\"Hematite\", \"Goethite\"]\n");
    REQUIRE(deltag("run '" + q.string() + "'").code == 0);
    const std::string fresh = slurp(scratch() / "leave-fe.csv");
    CHECK(has(fresh, "Ferrihydrite"));
    CHECK_FALSE(has(fresh, "Hematite"));
    CHECK_FALSE(has(fresh, "Goethite"));
    // A misspelt name: exit 2, its line, the nearest name.
    const fs::path b = write("leave2.toml", oxic_case + diagram + "leave_out = [\"Goethite\",\n  \"Hematit\"]\n");
    const Run bad = deltag("run '" + b.string() + "'");
    CHECK(bad.code == 2);
    CHECK(bad.out.empty());
    CHECK(has(bad.err, "leave2.toml:19:3:"));
    CHECK(has(bad.err, "'Hematit' is neither a species nor a mineral of database"));
    CHECK(has(bad.err, "did you mean 'Hematite'"));
}

TEST_CASE("run: ligands = true brings in the forms with the water's other components, as the warning asks") {
    const std::string diagram = R"toml(
[[diagram]]
label = "fe"
element = "Fe"
water = "oxic"
svg = "ligands-fe.svg"
csv = "ligands-fe.csv"
)toml";
    const fs::path p = write("lig0.toml", oxic_case + diagram);
    const Run r = deltag("run '" + p.string() + "' --format json");
    REQUIRE(r.code == 0);
    const auto without = nlohmann::json::parse(r.out)["diagrams"][0]["warnings"].dump();
    CHECK(has(without, "set ligands = true to include them at the water's activities"));
    const fs::path q = write("lig1.toml", oxic_case + diagram + "ligands = true\n");
    const Run l = deltag("run '" + q.string() + "' --format json");
    REQUIRE(l.code == 0);
    const auto with = nlohmann::json::parse(l.out)["diagrams"][0]["warnings"].dump();
    CHECK_FALSE(has(with, "set ligands = true"));
    CHECK(has(with, "ligand activities held at the values of water 'oxic'"));
    CHECK(has(with, "HCO3-"));
}

// ---- deltag batch --------------------------------------------------------------------------

namespace {
const std::string batch_samples = "sample,pH,Ca (mg/L),Na,Cl,Alkalinity (mg/L as CaCO3)\n"
                                  "north,7.6,40,20,35,100\n"
                                  "south,7.9,55,12,22,140\n";
}

TEST_CASE("batch: CSV on standard output, the summary on stderr, exit 0") {
    const fs::path c = write("batch.toml", good_case), s = write("batch.csv", batch_samples);
    const Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "'");
    CHECK(r.code == 0);
    CHECK(r.out.rfind("sample,result,status,message,temperature (°C),pH,ionic strength (mol/kgw),", 0) == 0);
    CHECK(has(r.out, "north,tap,ok,"));
    CHECK(has(r.out, "south,tap,ok,"));
    CHECK(has(r.out, ",SI Calcite,ΔG Calcite (kJ/mol)"));
    // Standard error is not a terminal here: no progress line, the summary only.
    CHECK(r.err == "2 solved\n");
}

TEST_CASE("batch --output OUT.json: one object per row; OUT.csv: the same table as standard output") {
    const fs::path c = write("batch.toml", good_case), s = write("batch.csv", batch_samples);
    const fs::path json = scratch() / "batch-out.json", csv = scratch() / "batch-out.csv";
    Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + json.string() + "'");
    REQUIRE(r.code == 0);
    CHECK(r.out.empty());
    const auto j = nlohmann::json::parse(slurp(json));
    REQUIRE(j.is_array());
    REQUIRE(j.size() == 2);
    CHECK(j[0]["sample"] == "north");
    CHECK(j[0]["result"] == "tap");
    CHECK(j[0]["status"] == "ok");
    CHECK(j[1]["pH"].get<double>() == doctest::Approx(7.9));
    CHECK(j[0].contains("SI Calcite"));
    CHECK(j[0]["Langelier index"].is_number());
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + csv.string() + "' --threads 2");
    REQUIRE(r.code == 0);
    const Run o = deltag("batch '" + c.string() + "' --samples '" + s.string() + "'");
    CHECK(slurp(csv) == o.out);
}

TEST_CASE("batch: a bad column is bad input for the whole file: exit 2, the column and a suggestion, nothing written") {
    const fs::path c = write("batch.toml", good_case);
    const fs::path s = write("batch-bad-col.csv", "sample,pH,Caa (mg/L)\na,7.6,40\n");
    const fs::path out = scratch() / "batch-never.csv";
    const Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + out.string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "batch-bad-col.csv:1:3"));
    CHECK(has(r.err, "column 'Caa (mg/L)': unknown analyte 'Caa'"));
    CHECK(has(r.err, "Ca"));
    CHECK(!fs::exists(out));
    CHECK(r.out.empty());
}

TEST_CASE("batch --strict: a bad row exits 2, the table still complete") {
    const fs::path c = write("batch.toml", good_case);
    const fs::path s = write("batch-bad-row.csv", batch_samples + "west,7.6,lots,20,35,100\n");
    const fs::path out = scratch() / "batch-strict.csv";
    Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + out.string() + "'");
    CHECK(r.code == 0);
    CHECK(r.err == "2 solved, 1 bad input\n");
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + out.string() + "' --strict");
    CHECK(r.code == 2);
    CHECK(r.err == "2 solved, 1 bad input\n");
    const std::string table = slurp(out);
    CHECK(has(table, "north,tap,ok,"));
    CHECK(has(table, "west,tap,bad input,\"Ca (mg/L): expected a concentration (a number) or a value below the detection limit such as <0.05, found 'lots'\""));
}

TEST_CASE("batch --strict: a sample that does not converge exits 3, the others solved") {
    // As for run: a database of our own making with an absurd CaSO4(aq) log K of 400, so a
    // sample with calcium and sulfate cannot be solved, and one without them can.
    std::string db = slurp(fs::path(DELTAG_SOURCE_DIR) / "databases" / "core.toml");
    const std::string from = "reaction = \"Ca^2+ + SO4^2- = CaSO4(aq)\"\nlog_k = 2.30";
    const auto at = db.find(from);
    REQUIRE(at != std::string::npos);
    db.replace(at, from.size(), "reaction = \"Ca^2+ + SO4^2- = CaSO4(aq)\"\nlog_k = 400.0");
    write("absurd-complex.toml", db);
    const fs::path c = write("absurd-batch.toml", R"toml(database = "absurd-complex.toml"
[water.w]
pH = 7.0
units = "mmol/kgw"
[water.w.analytes]
Na = 1
Cl = 1
)toml");
    const fs::path s = write("absurd-samples.csv", "sample,pH,Na,Cl,Ca,SO4\nplain,7,1,1,,\nstuck,7,1,1,1,1\nplain 2,7.2,2,2,,\n");
    const fs::path out = scratch() / "absurd-out.csv";
    Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output '" + out.string() + "' --strict");
    CHECK(r.code == 3);
    CHECK(r.err == "2 solved, 1 did not converge\n");
    const std::string table = slurp(out);
    CHECK(has(table, "plain,w,ok,"));
    CHECK(has(table, "plain 2,w,ok,"));
    CHECK(has(table, "stuck,w,no convergence,\"water 'w': did not converge"));
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "'");
    CHECK(r.code == 0);
}

TEST_CASE("batch: command-line mistakes: output type, threads, template water, samples file") {
    const fs::path c = write("batch.toml", good_case), s = write("batch.csv", batch_samples);
    Run r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --output out.xlsx");
    CHECK(r.code == 2);
    CHECK(has(r.err, "--output"));
    CHECK(has(r.err, "expected a file ending in .csv or .json, found 'out.xlsx' (.xlsx is not written yet)"));
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --threads 0");
    CHECK(r.code == 2);
    CHECK(has(r.err, "expected 1 to 256 threads, found 0"));
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --threads 1000");
    CHECK(r.code == 2);
    CHECK(has(r.err, "expected 1 to 256 threads, found 1000"));
    r = deltag("batch '" + c.string() + "' --samples '" + s.string() + "' --water tapp");
    CHECK(r.code == 2);
    CHECK(has(r.err, "the case has no water called 'tapp'"));
    CHECK(has(r.err, "tap"));
    r = deltag("batch '" + c.string() + "' --samples '" + (scratch() / "no-such.csv").string() + "'");
    CHECK(r.code == 2);
    CHECK(has(r.err, "cannot read the samples file"));
    r = deltag("batch '" + c.string() + "'");
    CHECK(r.code == 2);
}

TEST_CASE("batch: the example samples file of cases/ runs through its demo case") {
    const fs::path dir = fs::path(DELTAG_SOURCE_DIR) / "cases";
    const Run r = deltag("batch '" + (dir / "hard-well.toml").string() + "' --samples '" + (dir / "hard-well-samples.csv").string() + "'");
    CHECK(r.code == 0);
    CHECK(r.err == "5 solved\n");
    CHECK(!has(r.out, "nan"));
}
