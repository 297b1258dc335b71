// A sample set through one case (include/deltag/batch.hpp): the samples file as spreadsheets
// write it, units and "as" in the header, detection limits, a bad row among good ones, and
// the same rows on any thread count. Expected values are properties (the same water written
// two ways gives the same numbers) or conversions by published molar masses.
#include <doctest/doctest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "deltag/batch.hpp"

namespace fs = std::filesystem;
using namespace deltag;

namespace {

fs::path scratch() {
    static const fs::path dir = [] {
        fs::path d = fs::temp_directory_path() / ("deltag-batch-test-" + std::to_string(::getpid()));
        fs::create_directories(d);
        return d;
    }();
    return dir;
}

fs::path write(const std::string& name, const std::string& text) {
    const fs::path p = scratch() / name;
    std::ofstream(p, std::ios::binary) << text;
    return p;
}

// An invented template: a tap water in mg/L at 20 °C.
const std::string template_case = R"toml(title = "batch test template (invented)"
[water.tap]
temperature_c = 20
pH = 7.6
[water.tap.analytes]
Ca = 40
Na = 20
Cl = 35
Alkalinity = { value = 100, as = "CaCO3" }
)toml";

struct Out {
    BatchSummary summary;
    std::vector<BatchRow> rows;
    std::vector<std::size_t> per_sample;  // rows handed over per call
};

Out batch(const std::string& samples, const std::string& case_text = template_case, BatchOptions options = {}) {
    const fs::path c = write("template.toml", case_text);
    std::istringstream in(samples);
    Out o;
    o.summary = run_batch(c.string(), in, "samples.csv", options, [&](const std::vector<BatchRow>& rows) {
        o.rows.insert(o.rows.end(), rows.begin(), rows.end());
        o.per_sample.push_back(rows.size());
    });
    return o;
}

std::string table(const std::vector<BatchRow>& rows) {
    std::vector<std::string> phases;
    collect_phases(rows, phases);
    std::string t = batch_csv_header(phases);
    for (const auto& r : rows) t += batch_csv_row(r, phases);
    return t;
}

// The numbers of two rows agree (the message may differ: it says how a value was read).
void same_numbers(const BatchRow& a, const BatchRow& b, double rel = 1e-9) {
    REQUIRE(a.status == "ok");
    REQUIRE(b.status == "ok");
    CHECK(*a.ph == doctest::Approx(*b.ph).epsilon(rel));
    CHECK(*a.ionic_strength == doctest::Approx(*b.ionic_strength).epsilon(rel));
    CHECK(*a.tds_mg_per_l == doctest::Approx(*b.tds_mg_per_l).epsilon(rel));
    CHECK(*a.hardness_mg_per_l_caco3 == doctest::Approx(*b.hardness_mg_per_l_caco3).epsilon(rel));
    REQUIRE(a.phases.size() == b.phases.size());
    for (std::size_t i = 0; i < a.phases.size(); ++i) CHECK(a.phases[i].si == doctest::Approx(b.phases[i].si).epsilon(rel));
}

InputError header_error(const std::string& samples) {
    try {
        batch(samples);
    } catch (const InputError& e) {
        return e;
    }
    FAIL("expected an InputError");
    return InputError({}, "", "");
}

}  // namespace

TEST_CASE("batch: a bare analyte takes the template's unit; a unit in parentheses is the lab's") {
    // 40 mg/L Ca is 40 / 40.078 = 0.998054 mmol/L (IUPAC standard atomic weight of Ca, 40.078).
    const Out o = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n"
                        "a,7.6,40,20,35,100\n");
    const Out p = batch("sample,pH,Ca (mmol/L),Na (mg/L),Cl,Alkalinity (mg/L as CaCO3)\n"
                        "a,7.6,0.998054,20,35,100\n");
    REQUIRE(o.rows.size() == 1);
    same_numbers(o.rows[0], p.rows[0], 1e-5);
    // Alkalinity as CaCO3 reaches the figures: the computed total alkalinity is the given one.
    CHECK(*o.rows[0].alkalinity_mg_per_l_caco3 == doctest::Approx(100.0).epsilon(1e-3));
    CHECK(*o.rows[0].temperature_c == doctest::Approx(20.0));  // the template's temperature
}

TEST_CASE("batch: \"as\" in the header: NO3 as N and as NO3 are one water") {
    // 10 mg/L NO3 as N = 10 x 62.004 / 14.007 = 44.267 mg/L NO3 (IUPAC atomic weights).
    const Out o = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3),NO3 (mg/L as N)\na,7.6,40,20,35,100,10\n");
    const Out p = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3),NO3 (mg/L)\na,7.6,40,20,35,100,44.2669\n");
    same_numbers(o.rows[0], p.rows[0], 1e-5);
}

TEST_CASE("batch: the water settings of a row: temperature in °C, pH, and the template's when empty") {
    const Out o = batch("sample,Temperature (°C),pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n"
                        "warm,35,7.2,40,20,35,100\n"
                        "default,,7.2,40,20,35,100\n");
    REQUIRE(o.rows.size() == 2);
    CHECK(*o.rows[0].temperature_c == doctest::Approx(35.0));
    CHECK(*o.rows[0].ph == doctest::Approx(7.2));
    CHECK(*o.rows[1].temperature_c == doctest::Approx(20.0));
    // Without a pH the pH comes from the charge balance: the row still solves, electroneutral.
    // 20 mg/L Na and 30.84 mg/L Cl are both 0.870 mmol/L (atomic weights 22.990, 35.45): neutral salt,
    // pH near 7.
    const Out n = batch("sample,pH,Na,Cl\nno pH,,20,30.84\n");
    INFO(n.rows[0].message);
    REQUIRE(n.rows[0].status == "ok");
    CHECK(*n.rows[0].ph == doctest::Approx(7.0).epsilon(0.02));
    // With the alkalinity given, the case format needs the measured pH: a bad row, its reason.
    const Out a = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\nno pH,,40,20,35,100\n");
    CHECK(a.rows[0].status == "bad input");
    CHECK(a.rows[0].message.find("the pH cannot come from the charge balance when the alkalinity is given") != std::string::npos);
}

TEST_CASE("batch: byte order mark, semicolons and quoted fields read as the plain file") {
    const std::string plain = "sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\na,7.6,40,20,35,100\nb,7.9,60,10,20,150\n";
    const std::string excel = "\xEF\xBB\xBF"
                              "\"sample\";\"pH\";\"Ca\";Na;Cl;\"Alkalinity (mg/L as CaCO3)\"\r\n"
                              "\"a\";7.6;40;20;35;100\r\n"
                              "b;\"7.9\";60;10;20;150\r\n";
    const Out o = batch(plain), e = batch(excel);
    REQUIRE(e.rows.size() == 2);
    CHECK(table(o.rows) == table(e.rows));
    // A quoted name with the delimiter, a doubled quote and a line break in it.
    const Out q = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n\"tap, \"\"north\"\"\nline 2\",7.6,40,20,35,100\n");
    REQUIRE(q.rows.size() == 1);
    CHECK(q.rows[0].sample == "tap, \"north\"\nline 2");
    CHECK(q.rows[0].status == "ok");
}

TEST_CASE("batch: a value below the detection limit follows the case's rule") {
    const std::string head = "sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3),F\n";
    // The default rule: half the limit.
    const Out half = batch(head + "a,7.6,40,20,35,100,<0.4\nb,7.6,40,20,35,100,0.2\n");
    same_numbers(half.rows[0], half.rows[1]);
    CHECK(half.rows[0].message.find("below the detection limit") != std::string::npos);
    // The case says "limit": the limit itself.
    std::string limit_case = template_case;
    limit_case.replace(limit_case.find("pH = 7.6"), 8, "pH = 7.6\nbelow_detection = \"limit\"");
    const Out limit = batch(head + "a,7.6,40,20,35,100,<0.4\nb,7.6,40,20,35,100,0.4\n", limit_case);
    same_numbers(limit.rows[0], limit.rows[1]);
    // An empty cell is not measured: no fluoride at all, so no fluorite.
    const Out empty = batch(head + "a,7.6,40,20,35,100,\n");
    for (const auto& p : empty.rows[0].phases) CHECK(p.name != "Fluorite");
    bool fluorite = false;
    for (const auto& p : half.rows[0].phases) fluorite = fluorite || p.name == "Fluorite";
    CHECK(fluorite);
}

TEST_CASE("batch: a bad row among good ones is reported and the others solved") {
    const Out o = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n"
                        "a,7.6,40,20,35,100\n"
                        "b,7.6,forty,20,35,100\n"
                        "c,7.6,40,20,35\n"
                        "a,7.6,40,20,35,100\n"
                        "d,7.6,\"0,5\",20,35,100\n"
                        "e,7.6,<0,20,35,100\n"
                        "f,15,40,20,35,100\n"
                        "g,7.8,40,20,35,100\n");
    REQUIRE(o.rows.size() == 8);
    CHECK(o.summary.samples == 8);
    CHECK(o.summary.solved == 2);
    CHECK(o.summary.bad_input == 6);
    CHECK(o.rows[0].status == "ok");
    CHECK(o.rows[7].status == "ok");
    CHECK(o.rows[7].sample == "g");
    CHECK(o.rows[1].status == "bad input");
    CHECK(o.rows[1].message.find("Ca: expected a concentration (a number) or a value below the detection limit such as <0.05, found 'forty'") !=
          std::string::npos);
    CHECK(o.rows[2].message == "the row has 5 fields, the header 6 (separated by commas)");
    CHECK(o.rows[3].message == "the sample name 'a' is used by an earlier row; names must be unique");
    CHECK(o.rows[4].message.find("a decimal comma? write numbers with a decimal point") != std::string::npos);
    CHECK(o.rows[5].message.find("expected a detection limit above zero") != std::string::npos);
    CHECK(o.rows[6].message.find("pH: expected a pH from 0 to 14, found 15") != std::string::npos);
    for (std::size_t i = 1; i < 7; ++i) CHECK(!o.rows[i].ph);
    CHECK(summary_line(o.summary) == "2 solved, 6 bad input");
}

TEST_CASE("batch: rows of a sample without a name, an analyte or a pH for its charge balance") {
    std::string cb_case = template_case;
    cb_case.replace(cb_case.find("pH = 7.6"), 8, "pH = 7.6\ncharge_balance = \"Cl\"");
    const Out o = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n,7.6,40,20,35,100\nno pH,,40,20,35,100\nno Cl,7.6,40,20,,100\n", cb_case);
    REQUIRE(o.rows.size() == 3);
    CHECK(o.rows[0].message == "the sample has no name (the sample column is empty)");
    CHECK(o.rows[0].sample == "line 2");
    CHECK(o.rows[1].message == "pH: the case balances charge on Cl, which needs a measured pH; this sample has none");
    CHECK(o.rows[2].message == "Cl: the case balances charge on Cl, which this sample does not give");
    const Out e = batch("sample,pH,Ca\nnothing,7.6,\n");
    CHECK(e.rows[0].message == "samples: no analyte is given for this sample");
}

TEST_CASE("batch: each step of the case gives a row per sample; a failed step fails its rows only") {
    const std::string steps = template_case + R"toml(
[[step]]
kind = "dose"
reagent = "NaOH"
until = { pH = 8.5 }
)toml";
    const Out o = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\na,7.6,40,20,35,100\nhigh,9.0,40,20,35,100\n", steps);
    REQUIRE(o.rows.size() == 4);
    CHECK(o.per_sample == std::vector<std::size_t>{2, 2});
    CHECK(o.rows[0].result == "tap");
    CHECK(o.rows[1].result == "step 1 (dose)");
    CHECK(o.rows[1].status == "ok");
    CHECK(*o.rows[1].ph == doctest::Approx(8.5).epsilon(1e-4));  // the dose reaches its target
    CHECK(o.rows[2].status == "ok");  // the water of the second sample solves
    CHECK(o.rows[3].status == "bad input");  // NaOH cannot bring pH 9 down to 8.5
    CHECK(o.rows[3].message.find("cannot bring it to 8.5") != std::string::npos);
    CHECK(o.summary.bad_input == 1);
}

TEST_CASE("batch: the same rows and numbers on 1 and 2 threads, in input order") {
    // 60 invented samples, with a bad one among them.
    std::string samples = "sample,Temperature (°C),pH,Ca,Mg,Na,Cl,SO4,Alkalinity (mg/L as CaCO3)\n";
    for (int i = 0; i < 60; ++i) {
        const double f = 1.0 + 0.05 * (i % 17);
        samples += "s" + std::to_string(i) + "," + std::to_string(5 + i % 30) + "," + std::to_string(6.8 + 0.02 * (i % 50)) + "," +
                   std::to_string(30 * f) + "," + std::to_string(8 * f) + "," + std::to_string(15 * f) + "," + std::to_string(25 * f) + "," +
                   std::to_string(40 * f) + "," + (i == 31 ? std::string("x") : std::to_string(90 * f)) + "\n";
    }
    BatchOptions one, two;
    one.threads = 1;
    two.threads = 2;
    const Out a = batch(samples, template_case, one), b = batch(samples, template_case, two);
    REQUIRE(a.rows.size() == 60);
    CHECK(table(a.rows) == table(b.rows));
    for (int i = 0; i < 60; ++i) CHECK(b.rows[static_cast<std::size_t>(i)].sample == "s" + std::to_string(i));
    CHECK(b.rows[31].status == "bad input");
    CHECK(b.summary.solved == 59);
}

TEST_CASE("batch: the header is checked before anything is solved") {
    const std::string rest = ",7.6,40\n";
    InputError e = header_error("sample,pH,Caa\na" + rest);
    CHECK(e.key() == "Caa");
    CHECK(e.where().line == 1);
    CHECK(e.where().column == 3);
    CHECK(e.suggestion() == "Ca");
    CHECK(std::string(e.message()).find("column 'Caa'") == 0);

    e = header_error("sample,pH,Ca (mg/l)\na" + rest);
    CHECK(e.key() == "Ca (mg/l)");
    CHECK(std::string(e.message()).find("unknown concentration unit 'mg/l'") == 0);
    CHECK(e.suggestion() == "mg/L");

    e = header_error("sample,pH,Ca,Ca (mmol/L)\na,7.6,40,1\n");
    CHECK(e.key() == "Ca (mmol/L)");
    CHECK(e.message() == "column 'Ca (mmol/L)' repeats column 3 ('Ca'); give each value once");

    e = header_error("sample,pH (mg/L),Ca\na" + rest);
    CHECK(e.message() == "'pH' takes no unit, found 'mg/L'");

    e = header_error("sample,Temperature (K),Ca\na" + rest);
    CHECK(e.message() == "'Temperature' takes the unit °C, degC, C, found 'K'");
    CHECK(e.suggestion() == "Temperature (°C)");

    e = header_error("name,pH,Ca\na" + rest);
    CHECK(e.message() == "the header has no 'sample' column; add one that names each row (unique names)");

    e = header_error("sample,,Ca\na" + rest);
    CHECK(e.key() == "column 2");

    e = header_error("sample (id),pH,Ca\na" + rest);
    CHECK(e.message() == "the sample column takes no unit; write it as 'sample'");

    e = header_error("");
    CHECK(e.message() == "the samples file is empty; expected a header row (sample, ...)");

    e = header_error("sample,pH,Ca\n\"a,7.6,40\n");
    CHECK(e.message() == "a quoted field opened on this line is never closed (a missing \")");
}

TEST_CASE("batch: the template water: --water names it, or the case's only water") {
    const std::string two = template_case + "[water.other]\npH = 7\n[water.other.analytes]\nNa = 10\nCl = 15\n";
    BatchOptions o;
    try {
        batch("sample,pH,Ca\na,7.6,40\n", two, o);
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(e.key() == "--water");
        CHECK(e.message() == "the case has 2 waters (tap, other); name the template with --water NAME");
    }
    o.water = "tapp";
    try {
        batch("sample,pH,Ca\na,7.6,40\n", two, o);
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(e.message() == "the case has no water called 'tapp'");
        CHECK(e.suggestion() == "tap");
    }
    o.water = "other";
    const Out r = batch("sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\na,7.6,40,20,35,100\n", two, o);
    CHECK(r.rows[0].result == "other");
    CHECK(r.rows[0].status == "ok");
}

TEST_CASE("batch: the summary line counts with thousands separators") {
    BatchSummary s;
    s.samples = 2000;
    s.solved = 1998;
    s.bad_input = 1;
    s.no_convergence = 1;
    CHECK(summary_line(s) == "1,998 solved, 1 bad input, 1 did not converge");
    s.bad_input = s.no_convergence = 0;
    s.solved = 1234567;
    CHECK(summary_line(s) == "1,234,567 solved");
}

TEST_CASE("batch: the table kept in a scratch file reads back as written, numbers bit for bit") {
    std::string samples = "sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3),F\n";
    samples += "a,7.6,40,20,35,100,\nb,7.9,55,12,22,140,0.3\nbad,x,1,1,1,1,\n";
    const Out o = batch(samples);
    BatchTable t;
    for (std::size_t i = 0; i < o.rows.size(); ++i) t.add({o.rows[i]});
    CHECK(t.size() == 3);
    std::string csv, json;
    t.write(false, [&](std::string_view s) { csv += s; });
    t.write(true, [&](std::string_view s) { json += s; });
    CHECK(csv == table(o.rows));
    // Fluorite appears only in row b, so its columns come last and are empty in the others.
    CHECK(t.phases().back() == "Fluorite");
    std::string expected_json = batch_json_open();
    for (std::size_t i = 0; i < o.rows.size(); ++i) expected_json += batch_json_row(o.rows[i], t.phases(), i == 0);
    expected_json += "\n" + batch_json_close();
    CHECK(json == expected_json);
    CHECK(json.find("\"status\": \"bad input\"") != std::string::npos);
    CHECK(json.find("\"SI Fluorite\": null") != std::string::npos);
}

TEST_CASE("batch: a broken file half way stops the batch on any thread count, with the line") {
    std::string samples = "sample,pH,Ca,Na,Cl,Alkalinity (mg/L as CaCO3)\n";
    for (int i = 0; i < 40; ++i) samples += "s" + std::to_string(i) + ",7.6,40,20,35,100\n";
    samples += "\"broken,7.6,40,20,35,100\n";
    for (unsigned threads : {1u, 2u}) {
        BatchOptions o;
        o.threads = threads;
        try {
            batch(samples, template_case, o);
            FAIL("expected an InputError");
        } catch (const InputError& e) {
            CHECK(e.where().line == 42);
            CHECK(e.message() == "a quoted field opened on this line is never closed (a missing \")");
        }
    }
}
