// The case-file reader: TOML text -> a validated io::Case (see the interface contract,
// "Case file (TOML) - the core"). Every problem is an InputError carrying the file, line,
// column and dotted key; a Case is only returned when the whole file has been read.
//
// What is checked here needs no database: types, ranges, units, and the consistency of
// pH and charge_balance. Analyte names and "as" are checked against the database when the
// water is turned into solver input (to_speciation_input, src/equilibrium/water_input.cpp).

#include "deltag/case.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <fstream>
#include <sstream>
#include <tuple>
#include <utility>

#include "thermo/toml_util.hpp"

namespace deltag::io {

namespace {

// Plain number for messages: 7.85, 120, 0.0001.
std::string show(double v) {
    std::ostringstream out;
    out.precision(6);
    out << v;
    return out.str();
}

std::string list_of(const std::vector<std::string>& names) {
    std::string s;
    for (const auto& n : names) s += (s.empty() ? "" : ", ") + n;
    return s;
}

// Keys of later versions: reading past them would silently drop what the user asked for.
struct LaterKey {
    const char* key;
    const char* what;
};
constexpr LaterKey later_keys[] = {
    {"step", "process steps ([[step]])"},
    {"sweep", "sweeps"},
    {"cell", "cells in a case file"},
    {"diagram", "diagrams"},
};

const std::vector<std::string> top_level_keys = {"title", "database", "activity_model", "water"};
const std::vector<std::string> water_keys = {"temperature_c", "pH",    "pe",
                                             "charge_balance", "units", "density_kg_per_l",
                                             "analytes"};
const std::vector<std::string> analyte_keys = {"value", "unit", "as"};

// A number that must lie in [lo, hi]; `what` names it and `unit` follows the bounds.
std::optional<double> ranged(tomlu::TableReader& r, std::string_view key, double lo, double hi,
                             const std::string& what, const std::string& unit = {},
                             const std::string& why = {}) {
    auto v = r.number(key);
    if (v && (*v < lo || *v > hi))
        r.fail(key, "expected " + what + " from " + show(lo) + " to " + show(hi) + unit + why +
                        ", found " + show(*v));
    return v;
}

// The unit names, checked against deltag::concentration_units().
std::string checked_unit(tomlu::TableReader& r, std::string_view key) {
    const std::string u = *r.string(key);
    const auto& units = concentration_units();
    if (std::find(units.begin(), units.end(), u) == units.end())
        r.fail(key, "unknown concentration unit '" + u + "'; expected one of: " + list_of(units),
               nearest_name(u, units));
    return u;
}

// Entries of a TOML table in the order they appear in the file (toml::table iterates in
// key order, and the order of the waters is part of the contract).
std::vector<std::pair<std::string, const toml::node*>> in_file_order(const toml::table& t) {
    std::vector<std::tuple<std::size_t, std::size_t, std::string, const toml::node*>> items;
    for (const auto& [k, v] : t)
        items.emplace_back(k.source().begin.line, k.source().begin.column, std::string(k.str()), &v);
    std::sort(items.begin(), items.end(), [](const auto& a, const auto& b) {
        return std::tie(std::get<0>(a), std::get<1>(a)) < std::tie(std::get<0>(b), std::get<1>(b));
    });
    std::vector<std::pair<std::string, const toml::node*>> out;
    for (auto& [line, col, k, v] : items) out.emplace_back(std::move(k), v);
    return out;
}

AnalyteValue read_analyte(const std::string& name, const toml::node& node, const std::string& file,
                          const std::string& water_prefix) {
    AnalyteValue a;
    a.name = name;
    a.key = tomlu::join_key(water_prefix + ".analytes", name);
    a.where = tomlu::where(node.source(), file);
    if (node.is_integer() || node.is_floating_point()) {
        a.value = node.is_integer() ? static_cast<double>(node.as_integer()->get())
                                    : node.as_floating_point()->get();
        if (!std::isfinite(a.value)) throw InputError(a.where, a.key, "expected a finite number");
    } else if (const toml::table* t = node.as_table()) {
        tomlu::TableReader r(*t, file, a.key);
        a.value = r.require_number("value", "the concentration, a number (value = ...)");
        if (r.has("unit")) a.unit = checked_unit(r, "unit");
        if (auto as = r.string("as")) {
            if (as->empty())
                r.fail("as", "expected what the value is expressed as (\"CaCO3\" or an element "
                             "symbol such as \"N\"), found an empty string");
            a.as = *as;
        }
        r.finish(analyte_keys);
    } else {
        throw InputError(a.where, a.key,
                         "expected a concentration: a number, or a table { value = ..., unit = ..., "
                         "as = ... }; found " + tomlu::type_name(node));
    }
    if (a.value < 0.0)
        throw InputError(a.where, a.key,
                         "expected a concentration of zero or more, found " + show(a.value));
    return a;
}

WaterAnalysis read_water(const std::string& name, const toml::node& node, const std::string& file) {
    WaterAnalysis w;
    w.name = name;
    const std::string prefix = tomlu::join_key("water", name);
    w.where = tomlu::where(node.source(), file);
    const toml::table* t = node.as_table();
    if (!t)
        throw InputError(w.where, prefix,
                         "expected a table [" + prefix + "] describing a water, found " +
                             tomlu::type_name(node));

    tomlu::TableReader r(*t, file, prefix);
    if (auto v = ranged(r, "temperature_c", 0.0, 100.0, "a temperature", " °C",
                        " (the range of the water-property correlations)"))
        w.temperature_c = *v;
    w.ph = ranged(r, "pH", 0.0, 14.0, "a pH");
    w.pe = ranged(r, "pe", -20.0, 20.0, "a pe");
    if (auto cb = r.string("charge_balance")) {
        w.charge_balance_where = r.location("charge_balance");
        if (cb->empty())
            r.fail("charge_balance", "expected \"pH\" or the name of an analyte to adjust, found an empty string");
        // "ph", "PH": surely meant pH, not an analyte.
        if (*cb != "pH" && edit_distance(*cb, "pH") == 0)
            r.fail("charge_balance", "expected \"pH\" or the name of an analyte to adjust, found \"" + *cb + "\"", "pH");
        w.charge_balance = *cb;
    }
    if (r.has("units")) w.units = checked_unit(r, "units");
    w.density_kg_per_l = ranged(r, "density_kg_per_l", 0.9, 1.5, "a solution density", " kg/L");

    if (const toml::table* analytes = r.table("analytes")) {
        for (const auto& [aname, anode] : in_file_order(*analytes))
            w.analytes.push_back(read_analyte(aname, *anode, file, prefix));
    }
    r.finish(water_keys);

    // pH and charge balance. A water with neither a measured pH nor a charge_balance gets
    // its pH from the charge balance: without a pH the solver needs some condition to fix
    // it, and electroneutrality is the only one available.
    if (w.charge_balance.empty() && !w.ph) {
        w.charge_balance = "pH";
        w.charge_balance_where = w.where;
    } else if (w.charge_balance == "pH" && w.ph) {
        r.fail("charge_balance",
               "charge_balance = \"pH\" contradicts the measured pH = " + show(*w.ph) + " (line " +
                   std::to_string(r.location("pH").line) +
                   "); give the measured pH, or leave it out and balance on pH, not both");
    } else if (!w.charge_balance.empty() && w.charge_balance != "pH") {
        if (!w.ph)
            r.fail("charge_balance", "charge balance on " + w.charge_balance +
                                         " needs a measured pH; add pH = ... to [" + prefix +
                                         "] or set charge_balance = \"pH\"");
        const bool listed = std::any_of(w.analytes.begin(), w.analytes.end(),
                                        [&](const AnalyteValue& a) { return a.name == w.charge_balance; });
        if (!listed) {
            std::vector<std::string> names;
            for (const auto& a : w.analytes) names.push_back(a.name);
            r.fail("charge_balance",
                   "charge balance on " + w.charge_balance + ", which is not among the analytes of this water" +
                       (names.empty() ? std::string(" (it has none)") : " (" + list_of(names) + ")") +
                       "; list it under [" + prefix + ".analytes], with 0 if it was not measured",
                   nearest_name(w.charge_balance, names));
        }
    }
    return w;
}

}  // namespace

Case parse_case(std::string_view toml_text, const std::string& origin) {
    const toml::table root = tomlu::parse(toml_text, origin);
    tomlu::TableReader r(root, origin, "");

    // Keys of later versions first: a file that uses them is not runnable at all here.
    for (const auto& [k, v] : root) {
        for (const auto& later : later_keys) {
            if (k.str() == later.key)
                throw InputError(tomlu::where(k.source(), origin), std::string(k.str()),
                                 std::string(later.what) +
                                     " are not run by this version of deltag yet; remove '" +
                                     later.key + "' from the case file");
        }
    }

    Case c;
    if (auto title = r.string("title")) c.title = *title;
    if (auto db = r.string("database")) {
        if (db->empty())
            r.fail("database", "expected \"core\" (the embedded database) or the path of a database file, "
                               "found an empty string");
        c.database = *db;
        c.database_where = r.location("database");
    }
    if (auto model = r.string("activity_model")) {
        if (!activity::parse_model_name(*model, c.activity_model)) {
            const auto names = activity::model_names();
            r.fail("activity_model",
                   "unknown activity model '" + *model + "'; expected one of: " + list_of(names),
                   nearest_name(*model, names));
        }
    }

    const toml::node* waters_node = r.node("water");
    if (waters_node && !waters_node->is_table())
        throw InputError(tomlu::where(waters_node->source(), origin), "water",
                         "expected tables [water.NAME], one per water, found " +
                             tomlu::type_name(*waters_node));
    if (!waters_node || waters_node->as_table()->empty())
        throw InputError(waters_node ? tomlu::where(waters_node->source(), origin) : SourceLocation{origin},
                         "water",
                         "a case needs at least one water: add a table [water.NAME] (with no "
                         "analytes it is pure water)");
    for (const auto& [name, node] : in_file_order(*waters_node->as_table()))
        c.waters.push_back(read_water(name, *node, origin));

    r.finish(top_level_keys);
    return c;
}

Case read_case(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        const int err = errno;
        throw InputError(SourceLocation{path}, "",
                         std::string("cannot open the case file: ") +
                             (err ? std::strerror(err) : "unknown reason"));
    }
    std::ostringstream text;
    text << in.rdbuf();
    if (in.bad())
        throw InputError(SourceLocation{path}, "", "cannot read the case file");
    Case c = parse_case(text.str(), path);
    c.path = path;
    return c;
}

}  // namespace deltag::io
