// Report writers: the text layout (summary first), the JSON contract keys, CSV, and the
// refusal to write a non-finite number.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "deltag/report.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

ComponentInput total(const char* name, double v) {
    return ComponentInput{*core().find_species(name), ComponentInput::Kind::total, v};
}

SpeciationResult sample() {
    SpeciationInput in;
    in.label = "well-7";
    in.temperature_c = 14.0;
    in.ph = 7.2;
    in.components = {total("Ca^2+", 2e-3), total("HCO3-", 4e-3), total("Cl-", 1e-3), total("Na+", 1e-3),
                     total("SO4^2-", 5e-4)};
    return speciate(core(), in);
}

io::ReportContext context() { return io::ReportContext{"Test case (invented)", "t.toml", "core", "0.1.0", false}; }

}  // namespace

TEST_CASE("text report: summary first, then totals, species, saturation, caution") {
    const std::string t = io::text_report(core(), context(), {sample()});
    const auto p_summary = t.find("ionic strength");
    const auto p_totals = t.find("Totals");
    const auto p_species = t.find("Species, grouped by component");
    const auto p_sat = t.find("Saturation at 14.0");
    const auto p_caution = t.find("Caution:");
    REQUIRE(p_summary != std::string::npos);
    REQUIRE(p_totals != std::string::npos);
    REQUIRE(p_species != std::string::npos);
    REQUIRE(p_sat != std::string::npos);
    REQUIRE(p_caution != std::string::npos);
    CHECK(p_summary < p_totals);
    CHECK(p_totals < p_species);
    CHECK(p_species < p_sat);
    CHECK(p_sat < p_caution);
    CHECK(t.find("Water 'well-7'") != std::string::npos);
    CHECK(t.find("Calcite") != std::string::npos);
    CHECK(t.find("Standard Methods 1030 E") != std::string::npos);
    CHECK(t.find("nan") == std::string::npos);
    CHECK(t.find("inf") == std::string::npos);
}

TEST_CASE("text report with --verbose carries the full solver summary") {
    io::ReportContext ctx = context();
    ctx.verbose = true;
    const std::string t = io::text_report(core(), ctx, {sample()});
    CHECK(t.find("Newton iterations:") != std::string::npos);
    CHECK(t.find("KINSOL") != std::string::npos);
}

TEST_CASE("JSON report has the contract's keys and values") {
    const SpeciationResult r = sample();
    const auto j = nlohmann::json::parse(io::json_report(core(), context(), {r}));
    CHECK(j["deltag_version"] == "0.1.0");
    REQUIRE(j["results"].size() == 1);
    const auto& x = j["results"][0];
    CHECK(x["label"] == "well-7");
    CHECK(x["temperature_c"].get<double>() == doctest::Approx(14.0));
    CHECK(x["pH"].get<double>() == doctest::Approx(7.2));
    CHECK(x["pe"].is_null());
    CHECK(x["ionic_strength"].get<double>() == doctest::Approx(r.ionic_strength));
    CHECK(x["charge_balance_error_percent"].get<double>() == doctest::Approx(r.charge_balance_error_percent));
    CHECK(x["totals"]["Ca"].get<double>() == doctest::Approx(2e-3));
    CHECK(x["totals"]["C"].get<double>() == doctest::Approx(4e-3));
    CHECK(x["totals"]["S"].get<double>() == doctest::Approx(5e-4));
    REQUIRE(x["species"].is_array());
    bool found = false;
    for (const auto& s : x["species"]) {
        CHECK(s.contains("molality"));
        CHECK(s.contains("activity"));
        CHECK(s.contains("log_gamma"));
        if (s["name"] == "Ca^2+") found = true;
    }
    CHECK(found);
    bool calcite = false;
    for (const auto& s : x["saturation"]) {
        CHECK(s.contains("si"));
        CHECK(s.contains("log_iap"));
        CHECK(s.contains("log_k"));
        CHECK(s.contains("delta_g_kj_per_mol"));
        if (s["phase"] == "Calcite") calcite = true;
    }
    CHECK(calcite);
    CHECK(x["transfers"].is_array());
    REQUIRE(x["gases"].is_array());
    CHECK(x["gases"][0].contains("log_partial_pressure_atm"));
    CHECK(x["warnings"].is_array());
    CHECK(j["cells"].is_array());
    CHECK(x["solver"]["converged"] == true);
}

TEST_CASE("CSV report: a header and one row per result") {
    const std::string csv = io::csv_report(core(), context(), {sample(), sample()});
    std::size_t lines = 0;
    for (char c : csv) lines += c == '\n';
    CHECK(lines == 3);
    CHECK(csv.rfind("label,kind,temperature_c,pH,pe,ionic_strength", 0) == 0);
    CHECK(csv.find("si_Calcite") != std::string::npos);
    CHECK(csv.find("well-7,water,14,7.2,") != std::string::npos);
}

TEST_CASE("writers refuse to print a number that is not finite") {
    SpeciationResult r = sample();
    r.ionic_strength = std::numeric_limits<double>::quiet_NaN();
    CHECK_THROWS_AS(io::json_report(core(), context(), {r}), std::logic_error);
    CHECK_THROWS_AS(io::csv_report(core(), context(), {r}), std::logic_error);
}
