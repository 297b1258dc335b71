// The case-file reader: TOML text -> a validated io::Case (see the interface contract,
// "Case file (TOML) - the core"). Every problem is an InputError carrying the file, line,
// column and dotted key; a Case is only returned when the whole file has been read.
//
// What is checked here needs no database: types, ranges, units, and the consistency of
// pH and charge_balance. Analyte names and "as" are checked against the database when the
// water is turned into solver input (to_speciation_input, src/equilibrium/water_input.cpp).
//
// Steps, sweeps, cells and diagrams ([[step]], [[sweep]], [[cell]], [[diagram]]) are read in
// file order. Messages name one by its position in the file, counted from 1 as in the default
// labels ("step 2 (dose)", "cell 1", "diagram 3"):
//   step[2].reagent                  the key reagent of the second [[step]]
//   step[1].solids.Gypsum.hold_si    a key inside an inline table of the first step
//   water.a.analytes.Fe."+2"         a key that is not a bare word is quoted
//   sweep[1].outputs                 an entry of an array: the key of the array, at the
//                                    entry's own line and column
//   cell[1].anode.half_reaction      a key of an electrode given as a table
//   cell[2].activities."Cu^2+"       an activity given for both electrodes of a cell
//   diagram[1].points                a point of a diagram (an entry of an array, as above)
// Checked here: the keys of each kind, required keys, types and ranges, references to
// waters and steps, unique labels, the form of sweep outputs and of half-reactions. Mineral,
// gas and reagent names, species and electrodes are checked against the database when the
// case is run; the SourceLocation fields filled here (at the key) let those messages point at
// the line. A location of an optional key that is absent is that of the table around it.

#include "deltag/case.hpp"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <map>
#include <regex>
#include <sstream>
#include <tuple>
#include <type_traits>
#include <utility>
#include <variant>

#include "deltag/chem.hpp"
#include "deltag/process.hpp"
#include "deltag/reference_electrodes.hpp"
#include "deltag/water_properties.hpp"
#include "chem/names.hpp"
#include "thermo/toml_util.hpp"

namespace deltag::io {

namespace {

bool is_one_of(std::string_view name, const std::vector<std::string>& names) {
    return std::find(names.begin(), names.end(), name) != names.end();
}

const std::vector<std::string> top_level_keys = {"title", "database", "activity_model", "water", "step",
                                                 "sweep", "cell",     "diagram"};
const std::vector<std::string> water_keys = {"temperature_c",  "pH",    "pe",
                                             "eh_mv",          "reference", "dissolved_oxygen_mg_per_l",
                                             "charge_balance", "units", "density_kg_per_l",
                                             "below_detection", "analytes", "measured_tds_mg_per_l",
                                             "measured_conductance_25c_us_per_cm"};
// Ways of giving a water's redox level; at most one of them.
const std::vector<std::string> redox_keys = {"pe", "eh_mv", "dissolved_oxygen_mg_per_l"};
const std::vector<std::string> analyte_keys = {"value", "unit", "as"};

// A number that must lie in [lo, hi]; `what` names it and `unit` follows the bounds.
std::optional<double> ranged(tomlu::TableReader& r, std::string_view key, double lo, double hi,
                             const std::string& what, const std::string& unit = {},
                             const std::string& why = {}) {
    auto v = r.number(key);
    if (v && (*v < lo || *v > hi))
        r.fail(key, "expected " + what + " from " + message_number(lo) + " to " + message_number(hi) + unit + why +
                        ", found " + message_number(*v));
    return v;
}

// A temperature, checked against thermo::accepted_temperature_c.
std::optional<double> temperature(tomlu::TableReader& r, std::string_view key) {
    auto v = r.number(key);
    if (v)
        if (const std::string p = thermo::temperature_problem(*v); !p.empty()) r.fail(key, p);
    return v;
}

// The unit names, checked against deltag::concentration_units().
std::string checked_unit(tomlu::TableReader& r, std::string_view key) {
    const std::string u = *r.string(key);
    const auto& units = concentration_units();
    if (!is_concentration_unit(u))
        r.fail(key, "unknown concentration unit '" + u + "'; expected one of: " + name_list(units),
               nearest_name(u, units));
    return u;
}

// One entry of a table: its key, its value and where the key is written.
struct Entry {
    std::string name;
    const toml::node* node;
    SourceLocation key_where;
};

// Entries of a TOML table in the order they appear in the file (toml::table iterates in
// key order, and the order of the waters, of a step's minerals and of a blend's parts is
// kept as written).
std::vector<Entry> in_file_order(const toml::table& t, const std::string& file) {
    std::vector<std::tuple<std::size_t, std::size_t, Entry>> items;
    for (const auto& [k, v] : t)
        items.emplace_back(k.source().begin.line, k.source().begin.column,
                           Entry{std::string(k.str()), &v, tomlu::where(k.source(), file)});
    std::sort(items.begin(), items.end(), [](const auto& a, const auto& b) {
        return std::tie(std::get<0>(a), std::get<1>(a)) < std::tie(std::get<0>(b), std::get<1>(b));
    });
    std::vector<Entry> out;
    for (auto& item : items) out.push_back(std::move(std::get<2>(item)));
    return out;
}

// Where a key is written (the key itself, not its value); the table when it is absent.
SourceLocation key_where(const toml::table& t, std::string_view key, const std::string& file) {
    if (auto it = t.find(key); it != t.end()) return tomlu::where(it->first.source(), file);
    return tomlu::where(t.source(), file);
}

// A value below the detection limit as a lab writes it: "<0.05" (spaces allowed around the
// number). Returns the limit; anything else in quotes is an error at `where` and `key`.
double below_detection_limit(const std::string& text, const SourceLocation& where, const std::string& key) {
    const std::string form = "a value below the detection limit, written \"<\" and the limit, such as \"<0.05\"";
    std::size_t i = text.find_first_not_of(' ');
    if (i == std::string::npos || text[i] != '<')
        throw InputError(where, key,
                         "expected a concentration (a number, without quotes) or " + form + "; found \"" + text + "\"");
    // The limit: a plain decimal number ("0.05", "5e-3"), spaces around it allowed.
    static const std::regex decimal(R"(\s*([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?\s*)");
    const std::string rest = text.substr(i + 1);
    if (!std::regex_match(rest, decimal))
        throw InputError(where, key, "expected " + form + "; found \"" + text + "\": the limit is not a number");
    const double limit = std::strtod(rest.c_str(), nullptr);
    if (!std::isfinite(limit))
        throw InputError(where, key, "expected " + form + "; found \"" + text + "\": the limit is not a number");
    if (!(limit > 0.0))
        throw InputError(where, key,
                         "expected a detection limit above zero after \"<\", found \"" + text +
                             "\"; a value measured as zero is written 0, without quotes");
    return limit;
}

std::string signed_state(std::string_view k);

// One analyte's value at `key`: a number, "<0.05" or a table { value, unit, as }.
AnalyteValue read_analyte(const std::string& name, const std::string& key, const toml::node& node,
                          const std::string& file) {
    AnalyteValue a;
    a.name = name;
    a.key = key;
    a.where = tomlu::where(node.source(), file);
    if (node.is_integer() || node.is_floating_point()) {
        a.value = node.is_integer() ? static_cast<double>(node.as_integer()->get())
                                    : node.as_floating_point()->get();
        if (!std::isfinite(a.value)) throw InputError(a.where, a.key, "expected a finite number");
    } else if (node.is_string()) {
        a.value = below_detection_limit(node.as_string()->get(), a.where, a.key);
        a.below_detection = true;
    } else if (const toml::table* t = node.as_table()) {
        tomlu::TableReader r(*t, file, a.key);
        // "2" or "III" where a redox state was meant: the states take their sign.
        for (const auto& e : in_file_order(*t, file))
            if (!is_one_of(e.name, analyte_keys) && !signed_state(e.name).empty())
                throw InputError(e.key_where, tomlu::join_key(a.key, e.name),
                                 "a redox state is written as a signed oxidation state, as in " + name +
                                     " = { \"+2\" = ..., \"+3\" = ... }",
                                 signed_state(e.name));
        if (const toml::node* v = t->get("value"); v && v->is_string()) {
            const std::string vkey = tomlu::join_key(a.key, "value");
            a.value = below_detection_limit(v->as_string()->get(), tomlu::where(v->source(), file), vkey);
            a.below_detection = true;
            (void)r.node("value");
        } else {
            a.value = r.require_number("value", "the concentration, a number (value = ...) or a value below the "
                                                "detection limit (value = \"<0.05\")");
        }
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
                         "expected a concentration: a number, a value below the detection limit such as \"<0.05\", "
                         "or a table { value = ..., unit = ..., as = ... }; found " + tomlu::type_name(node));
    }
    if (a.value < 0.0)
        throw InputError(a.where, a.key,
                         "expected a concentration of zero or more, found " + message_number(a.value));
    return a;
}

// A signed oxidation state as a key: "+2", "+3", "-2".
bool is_oxidation_state(std::string_view k) {
    static const std::regex state(R"([+-][0-9]+)");
    return std::regex_match(k.begin(), k.end(), state);
}

// An oxidation state written another way ("2", "III", "+III"): the signed form, else "".
std::string signed_state(std::string_view k) {
    std::string_view body = k;
    if (!body.empty() && (body.front() == '+' || body.front() == '-')) body.remove_prefix(1);
    static const std::vector<std::string> roman = {"I", "II", "III", "IV", "V", "VI", "VII"};
    std::string digits;
    for (std::size_t i = 0; i < roman.size(); ++i)
        if (body == roman[i]) digits = std::to_string(i + 1);
    if (digits.empty() && !body.empty() && body.size() <= 1 && std::isdigit(static_cast<unsigned char>(body.front())))
        digits = std::string(body);
    if (digits.empty()) return "";
    return (!k.empty() && k.front() == '-' ? "-" : "+") + digits;
}

// Fe = { "+2" = 2.4, "+3" = 0.3, unit = "mg/L" }: an element given by redox state, as labs
// report ferrous and ferric iron apart. Each state is an analyte of its own, "Fe +2", whose
// value is written as any analyte's (a number, "<0.05" or a table); `unit` applies to the
// states that give none of their own.
std::vector<AnalyteValue> read_redox_states(const std::string& element, const toml::table& t, const std::string& file,
                                            const std::string& water_prefix) {
    const std::string key = tomlu::join_key(water_prefix + ".analytes", element);
    std::vector<AnalyteValue> out;
    tomlu::TableReader r(t, file, key);
    for (const auto& e : in_file_order(t, file)) {
        if (e.name == "unit") continue;
        if (!is_oxidation_state(e.name)) {
            const std::string fix = signed_state(e.name);
            throw InputError(e.key_where, tomlu::join_key(key, e.name),
                             "unknown key in the redox states of " + element +
                                 "; expected signed oxidation states, such as \"+2\" and \"+3\", and unit",
                             fix.empty() ? nearest_name(e.name, {"unit"}) : fix);
        }
        AnalyteValue a = read_analyte(element + " " + e.name, tomlu::join_key(key, e.name), *e.node, file);
        (void)r.node(e.name);
        a.element = element;
        a.oxidation_state = e.name;
        out.push_back(std::move(a));
    }
    if (r.has("unit")) {
        const std::string unit = checked_unit(r, "unit");
        for (auto& a : out)
            if (a.unit.empty()) a.unit = unit;
    }
    r.finish({"unit"});
    return out;
}

// An analyte key that gives a redox state in a form of its own ("Fe(2)", "Fe(III)",
// "Fe +2"): the element, else "". Such states go in the element's table.
std::string state_apart_from_table(const std::string& name) {
    static const std::regex in_parentheses(R"(([A-Z][a-z]?)\s*\(\s*([+-]?([0-9]+|[IVX]+))\s*\))");
    static const std::regex with_sign(R"(([A-Z][a-z]?)\s+[+-][0-9]+)");
    std::smatch m;
    if (std::regex_match(name, m, in_parentheses) || std::regex_match(name, m, with_sign)) return m[1].str();
    return "";
}

// Of keys that exclude each other, the second one written (in file order) is reported, naming
// the first and its line. `what` says what the keys give and how often.
void at_most_one(tomlu::TableReader& r, const std::vector<std::string>& keys, const std::string& what) {
    std::vector<Entry> given;
    for (auto& e : in_file_order(r.table(), r.file()))
        if (is_one_of(e.name, keys)) given.push_back(std::move(e));
    if (given.size() < 2) return;
    r.fail(given[1].name, what + "; found both " + given[0].name + " (line " + std::to_string(given[0].key_where.line) +
                              ") and " + given[1].name);
}

// The redox level of a water: pe, an electrode reading eh_mv against a reference electrode,
// or dissolved oxygen; at most one of them.
void read_redox(tomlu::TableReader& r, WaterAnalysis& w) {
    at_most_one(r, redox_keys, "give one redox level, as pe, eh_mv or dissolved_oxygen_mg_per_l");
    w.pe = ranged(r, "pe", -20.0, 20.0, "a pe");
    // The bound only catches slips such as a reading in microvolts: a water's Eh lies within
    // the stability of water, well inside +-2 V against any of the reference electrodes.
    w.eh_mv = ranged(r, "eh_mv", -2000.0, 2000.0, "an electrode reading", " mV");
    w.eh_where = w.eh_mv ? key_where(r.table(), "eh_mv", r.file()) : w.where;
    if (auto ref = r.string("reference")) {
        if (!w.eh_mv)
            r.fail("reference", "reference names the electrode an Eh reading was measured against, but [" +
                                    r.prefix() + "] has no eh_mv; add eh_mv = ... (mV) or remove reference");
        const auto names = electro::reference_names();
        if (!is_one_of(*ref, names))
            r.fail("reference", "unknown reference electrode '" + *ref + "'; expected one of: " + name_list(names),
                   nearest_name(*ref, names));
        w.eh_reference = *ref;
    }
    w.dissolved_oxygen_mg_per_l = ranged(r, "dissolved_oxygen_mg_per_l", 0.0, 60.0, "a dissolved oxygen concentration", " mg/L");
    w.dissolved_oxygen_where =
        w.dissolved_oxygen_mg_per_l ? key_where(r.table(), "dissolved_oxygen_mg_per_l", r.file()) : w.where;
}

// What the lab measured on the whole sample (for the Standard Methods 1030 E checks): each
// above zero. The upper bounds only catch slips of unit: 1 000 000 mg/L would be a kilogram of
// solids in a litre, and 1 000 000 uS/cm (1 S/cm) is beyond the strongest brines.
void read_lab_measurements(tomlu::TableReader& r, WaterAnalysis& w) {
    auto positive = [&](std::string_view key, double hi, const std::string& what, const std::string& unit) {
        auto v = r.number(key);
        if (v && !(*v > 0.0))
            r.fail(key, "expected " + what + " above zero in " + unit + ", found " + message_number(*v) +
                            "; leave the key out if it was not measured");
        if (v && *v > hi)
            r.fail(key, "expected " + what + " in " + unit + " of at most " + message_number(hi) + ", found " +
                            message_number(*v) + "; is the unit right?");
        return v;
    };
    w.measured.tds_mg_per_l = positive("measured_tds_mg_per_l", 1e6, "a measured dissolved solids", "mg/L");
    w.measured.conductance_25c_us_per_cm =
        positive("measured_conductance_25c_us_per_cm", 1e6, "a measured specific conductance at 25 °C", "µS/cm");
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
    if (auto v = temperature(r, "temperature_c"))
        w.temperature_c = *v;
    w.ph = ranged(r, "pH", 0.0, 14.0, "a pH");
    read_redox(r, w);
    if (auto cb = r.string("charge_balance")) {
        w.charge_balance_where = r.location("charge_balance");
        if (cb->empty())
            r.fail("charge_balance", "expected \"pH\" or the name of an analyte to adjust, found an empty string");
        // "ph", "PH": surely meant pH, not an analyte. With a measured pH, "pH" would be
        // refused too, so it is not suggested: a suggestion must itself be valid.
        if (*cb != "pH" && edit_distance(*cb, "pH") == 0) {
            if (w.ph)
                r.fail("charge_balance", "found \"" + *cb + "\", but the pH is measured (pH = " + message_number(*w.ph) +
                                             ") and cannot also close the charge balance; name an analyte to adjust, "
                                             "such as \"Cl\", or leave charge_balance out");
            r.fail("charge_balance", "expected \"pH\" or the name of an analyte to adjust, found \"" + *cb + "\"", "pH");
        }
        w.charge_balance = *cb;
    }
    if (r.has("units")) w.units = checked_unit(r, "units");
    w.density_kg_per_l = ranged(r, "density_kg_per_l", 0.9, 1.5, "a solution density", " kg/L");
    if (auto rule = r.string("below_detection")) {
        const auto& rules = below_detection_rules();
        if (!is_one_of(*rule, rules))
            r.fail("below_detection",
                   "expected what a value below its detection limit (\"<0.05\") counts as: \"half\" the limit, "
                   "\"zero\" or the \"limit\" itself; found \"" + *rule + "\"",
                   nearest_name(*rule, rules));
        w.below_detection = *rule;
        w.below_detection_where = r.location("below_detection");
    }

    read_lab_measurements(r, w);

    if (const toml::table* analytes = r.table("analytes")) {
        for (const auto& e : in_file_order(*analytes, file)) {
            if (const std::string element = state_apart_from_table(e.name); !element.empty())
                throw InputError(e.key_where, tomlu::join_key(prefix + ".analytes", e.name),
                                 "redox states of an element are given in its own table, by signed oxidation state: " +
                                     element + " = { \"+2\" = ..., \"+3\" = ... }",
                                 element);
            const toml::table* states = e.node->as_table();
            if (states && std::any_of(states->begin(), states->end(),
                                      [](const auto& kv) { return is_oxidation_state(kv.first.str()); })) {
                for (auto& a : read_redox_states(e.name, *states, file, prefix)) w.analytes.push_back(std::move(a));
                continue;
            }
            w.analytes.push_back(read_analyte(e.name, tomlu::join_key(prefix + ".analytes", e.name), *e.node, file));
        }
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
               "charge_balance = \"pH\" contradicts the measured pH = " + message_number(*w.ph) + " (line " +
                   std::to_string(r.location("pH").line) +
                   "); give the measured pH, or leave it out and balance on pH, not both");
    } else if (!w.charge_balance.empty() && w.charge_balance != "pH") {
        if (!w.ph)
            r.fail("charge_balance", "charge balance on " + w.charge_balance +
                                         " needs a measured pH; add pH = ... to [" + prefix +
                                         "] or set charge_balance = \"pH\"");
        // A redox state given apart is not one to adjust: the balance takes an analyte's total.
        const bool listed = std::any_of(w.analytes.begin(), w.analytes.end(), [&](const AnalyteValue& a) {
            return a.oxidation_state.empty() && a.name == w.charge_balance;
        });
        if (!listed) {
            std::vector<std::string> names;
            for (const auto& a : w.analytes)
                if (a.oxidation_state.empty()) names.push_back(a.name);
            r.fail("charge_balance",
                   "charge balance on " + w.charge_balance + ", which is not among the analytes of this water" +
                       (names.empty() ? std::string(" (it has none)") : " (" + name_list(names) + ")") +
                       "; list it under [" + prefix + ".analytes], with 0 if it was not measured",
                   nearest_name(w.charge_balance, names));
        }
    }
    return w;
}

// --- steps and sweeps ---------------------------------------------------------------------

// The names of the kinds of step (process::step_kinds), as the name lists below take them.
const std::vector<std::string> step_kinds(process::step_kinds.begin(), process::step_kinds.end());

// The keys each kind of step takes, one overload per alternative of process::StepAction, so a
// kind without its keys does not compile. A blend has no `water`: it names its waters in `waters`.
std::vector<std::string> keys_of(std::type_identity<process::EquilibrateStep>) {
    return {"kind", "label", "water", "solids", "partial_pressures", "headspace", "keep_redox_states_apart"};
}
std::vector<std::string> keys_of(std::type_identity<process::DoseStep>) {
    return {"kind", "label", "water", "reagent", "amount", "until", "max_amount", "keep_redox_states_apart"};
}
std::vector<std::string> keys_of(std::type_identity<process::BlendStep>) { return {"kind", "label", "waters", "by"}; }
std::vector<std::string> keys_of(std::type_identity<process::ConcentrateStep>) {
    return {"kind", "label", "water", "factor", "recovery", "precipitate"};
}
std::vector<std::string> keys_of(std::type_identity<process::TemperatureStep>) {
    return {"kind", "label", "water", "temperature_c", "equilibrate", "keep_redox_states_apart"};
}

template <std::size_t... I>
std::vector<StepKindKeys> make_step_keys(std::index_sequence<I...>) {
    return {StepKindKeys{std::string(process::step_kinds[I]),
                         keys_of(std::type_identity<std::variant_alternative_t<I, process::StepAction>>{})}...};
}

const std::vector<std::string>& keys_of_kind(std::string_view kind) {
    for (const auto& k : step_keys())
        if (k.kind == kind) return k.keys;
    throw std::logic_error("no step kind '" + std::string(kind) + "'");
}

const std::vector<std::string> solid_keys = {"hold_si", "on_hand_mmol_per_kgw", "on_hand_mol_per_kgw", "may_form",
                                             "may_dissolve"};
const std::vector<std::string> headspace_keys = {"litres_per_kgw", "temperature_c", "partial_pressures"};
const std::vector<std::string> amount_keys = {"value", "unit"};
const std::vector<std::string> gas_units = {"atm", "bar", "kPa", "ppmv", "percent", "log10_atm"};
const std::vector<std::string> until_keys = {"pH", "si", "alkalinity_meq_per_l", "langelier"};
const std::vector<std::string> blend_bases = {"volume", "mass"};
const std::vector<std::string> sweep_keys = {"label",  "step",        "at",      "variable", "from", "to",
                                             "points", "fraction_of", "outputs", "csv",      "svg"};
const std::vector<std::string> sweep_variables = {"temperature_c", "dose", "factor", "fraction"};
const std::vector<std::string> plain_outputs = {"pH", "ionic_strength", "alkalinity", "langelier", "ryznar", "ccpp"};
const std::vector<std::string> output_prefixes = {"si", "transfer", "total"};

std::string default_step_label(std::size_t n, std::string_view kind) {
    return "step " + std::to_string(n) + " (" + std::string(kind) + ")";
}

// The range check of `ranged`, for a value already read.
void check_range(tomlu::TableReader& r, std::string_view key, double v, double lo, double hi,
                 const std::string& what, const std::string& unit = {}) {
    if (v < lo || v > hi)
        r.fail(key, "expected " + what + " from " + message_number(lo) + " to " + message_number(hi) + unit + ", found " + message_number(v));
}

// An array of tables ([[step]] or [[sweep]]), in file order.
std::vector<const toml::table*> array_of_tables(tomlu::TableReader& r, const std::string& key,
                                                const std::string& what, const std::string& file) {
    const toml::node* n = r.node(key);
    if (!n) return {};
    const toml::array* a = n->as_array();
    if (!a)
        throw InputError(tomlu::where(n->source(), file), key,
                         "expected [[" + key + "]] tables, one per " + what + ", found " + tomlu::type_name(*n) +
                             (n->is_table() ? " ([" + key + "]); write [[" + key + "]]" : std::string()));
    std::vector<const toml::table*> out;
    for (std::size_t i = 0; i < a->size(); ++i) {
        const toml::node& el = *a->get(i);
        if (!el.is_table())
            throw InputError(tomlu::where(el.source(), file), key + "[" + std::to_string(i + 1) + "]",
                             "expected a table describing a " + what + " ([[" + key + "]]), found " +
                                 tomlu::type_name(el));
        out.push_back(el.as_table());
    }
    return out;
}

// The label each step will have, known before the steps are read, so that a reference to a
// later step can be named as such. "" where the step's label or kind is unreadable (the
// step's own reading reports that).
struct PlannedLabel {
    std::string label;
    int line = 0;
};

std::vector<PlannedLabel> planned_labels(const std::vector<const toml::table*>& steps) {
    std::vector<PlannedLabel> out;
    for (std::size_t i = 0; i < steps.size(); ++i) {
        const toml::table& t = *steps[i];
        PlannedLabel p;
        p.line = static_cast<int>(t.source().begin.line);
        if (const toml::node* l = t.get("label"); l && l->is_string()) {
            p.label = l->as_string()->get();
        } else if (const toml::node* k = t.get("kind"); !l && k && k->is_string() &&
                                                        is_one_of(k->as_string()->get(), step_kinds)) {
            p.label = default_step_label(i + 1, k->as_string()->get());
        }
        out.push_back(std::move(p));
    }
    return out;
}

struct StepContext {
    const std::string& file;
    const std::vector<WaterAnalysis>& waters;
    std::vector<PlannedLabel> planned;  // one per step in the file
    std::vector<process::Step> done;    // the steps read so far
};

// `name` (a step's water, or a part of a blend) must be a water or an earlier step.
void check_source(const StepContext& c, std::size_t n, const std::string& name, const SourceLocation& at,
                  const std::string& key) {
    for (const auto& w : c.waters)
        if (w.name == name) return;
    for (const auto& s : c.done)
        if (s.label == name) return;
    if (c.planned[n - 1].label == name)
        throw InputError(at, key,
                         "'" + name + "' is the label of this step itself; a step starts from a water or "
                         "the result of an earlier step");
    for (std::size_t i = n; i < c.planned.size(); ++i)
        if (c.planned[i].label == name)
            throw InputError(at, key,
                             "'" + name + "' is the label of a later step (step " + std::to_string(i + 1) +
                                 ", line " + std::to_string(c.planned[i].line) +
                                 "); a step starts from a water or the result of an earlier step");
    std::vector<std::string> names;
    for (const auto& w : c.waters) names.push_back(w.name);
    for (const auto& s : c.done) names.push_back(s.label);
    throw InputError(at, key,
                     "no water or earlier step is called '" + name + "'; expected one of: " + name_list(names),
                     nearest_name(name, names));
}

// Labels name results (and the waters' names do too), so they are unique across both.
void check_label_unique(const StepContext& c, const tomlu::TableReader& r, const std::string& label,
                        bool given) {
    const std::string what = given ? "the label '" + label + "'" : "the default label '" + label + "'";
    const std::string fix = given ? "; results are reported by label, so each must be unique"
                                  : "; give this step a label = \"...\" of its own";
    for (const auto& w : c.waters)
        if (w.name == label)
            r.fail("label", what + " is already the name of a water (line " + std::to_string(w.where.line) + ")" + fix);
    for (std::size_t i = 0; i < c.done.size(); ++i)
        if (c.done[i].label == label)
            r.fail("label", what + " is already the label of step " + std::to_string(i + 1) + " (line " +
                                std::to_string(c.done[i].where.line) + ")" + fix);
}

// Unknown keys, checked before the known ones are read, so that a misspelt required key is
// reported as misspelt rather than as missing. The first one in the file is named.
void reject_unknown_keys(const toml::table& t, const std::vector<std::string>& allowed, const std::string& file,
                         const std::string& prefix) {
    for (const auto& e : in_file_order(t, file))
        if (!is_one_of(e.name, allowed))
            throw InputError(e.key_where, tomlu::join_key(prefix, e.name),
                             "unknown key; expected one of: " + name_list(allowed), nearest_name(e.name, allowed));
}

// Every key of the step must belong to its kind; the first stray key in the file is named.
void check_step_keys(const toml::table& t, const std::string& kind, const std::string& file,
                     const std::string& prefix) {
    const auto& allowed = keys_of_kind(kind);
    for (const auto& e : in_file_order(t, file)) {
        if (is_one_of(e.name, allowed)) continue;
        std::vector<std::string> owners;
        for (const auto& k : step_kinds)
            if (is_one_of(e.name, keys_of_kind(k))) owners.push_back("'" + k + "'");
        const std::string takes = "; a step of kind '" + kind + "' takes: " + name_list(allowed);
        const std::string message =
            owners.empty() ? "unknown key for a step of kind '" + kind + "'" + takes
                           : "'" + e.name + "' does not belong to a step of kind '" + kind + "' (it is a key of " +
                                 name_list(owners) + " steps)" + takes;
        throw InputError(e.key_where, tomlu::join_key(prefix, e.name), message, nearest_name(e.name, allowed));
    }
}

// The long form of one solid:
//   Calcite = { hold_si = 0.3, on_hand_mmol_per_kgw = 5, may_form = false }
// Absent keys keep the short form's meaning: held at saturation (hold_si = 0), as much solid
// as it takes (no on-hand amount), free to form and to dissolve.
process::MineralSpec read_solid(const Entry& e, const std::string& file, const std::string& prefix) {
    process::MineralSpec m;
    m.name = e.name;
    m.where = e.key_where;
    const std::string key = tomlu::join_key(prefix, e.name);
    const toml::table* t = e.node->as_table();
    if (!t)
        throw InputError(tomlu::where(e.node->source(), file), key,
                         "expected a table { hold_si = ..., on_hand_mmol_per_kgw = ..., may_form = ..., may_dissolve = "
                         "... }, found " + tomlu::type_name(*e.node) +
                             "; a solid held at saturation with no other condition is listed by name: solids = [\"" +
                             e.name + "\"]");
    reject_unknown_keys(*t, solid_keys, file, key);
    tomlu::TableReader r(*t, file, key);
    if (auto si = ranged(r, "hold_si", -20.0, 20.0, "a saturation index to hold")) m.target_si = *si;
    const auto mol = r.number("on_hand_mol_per_kgw");
    const auto mmol = r.number("on_hand_mmol_per_kgw");
    at_most_one(r, {"on_hand_mol_per_kgw", "on_hand_mmol_per_kgw"},
                "give the solid on hand once, as on_hand_mol_per_kgw or on_hand_mmol_per_kgw");
    const std::string on_hand_key = mol ? "on_hand_mol_per_kgw" : "on_hand_mmol_per_kgw";
    if (mol || mmol) {
        const double v = mol ? *mol : *mmol;
        if (v < 0.0) r.fail(on_hand_key, "expected an amount of solid on hand of zero or more, found " + message_number(v));
        m.on_hand_mol_per_kgw = mol ? v : v * 1e-3;
    }
    m.may_form = r.boolean("may_form").value_or(true);
    m.may_dissolve = r.boolean("may_dissolve").value_or(true);
    if (!m.may_form && !m.may_dissolve)
        r.fail(r.has("may_dissolve") ? "may_dissolve" : "may_form",
               "a solid that may neither form nor dissolve takes no part in the step: set may_form or may_dissolve "
               "to true, or leave " + e.name + " out");
    if (m.on_hand_mol_per_kgw && !m.may_dissolve)
        r.fail(on_hand_key, "the solid on hand limits how much can dissolve, and " + e.name +
                                " may not dissolve (may_dissolve = false): remove " + on_hand_key + " or may_dissolve");
    r.finish(solid_keys);
    return m;
}

// solids = ["Calcite", "Gypsum"]                        each held at saturation, free both ways
// solids = { Calcite = { hold_si = 0.3 }, ... }         the long form (read_solid)
std::vector<process::MineralSpec> read_solids(tomlu::TableReader& r) {
    std::vector<process::MineralSpec> out;
    const toml::node* n = r.node("solids");
    if (!n) return out;
    const std::string key = r.dotted("solids");
    if (const toml::array* a = n->as_array()) {
        for (const auto& el : *a) {
            const SourceLocation at = tomlu::where(el.source(), r.file());
            if (!el.is_string())
                throw InputError(at, key,
                                 "expected names of solids (strings), found " + tomlu::type_name(el) +
                                     " in the list; a solid with conditions goes in the table form, solids = { NAME = "
                                     "{ hold_si = ..., ... } }");
            const std::string name = el.as_string()->get();
            if (name.empty()) throw InputError(at, key, "expected the name of a solid, found an empty string");
            for (const auto& m : out)
                if (m.name == name)
                    throw InputError(at, key, "the solid '" + name + "' is listed twice (line " +
                                                  std::to_string(m.where.line) + ")");
            process::MineralSpec m;
            m.name = name;
            m.where = at;
            out.push_back(std::move(m));
        }
        return out;
    }
    const toml::table* t = n->as_table();
    if (!t)
        r.fail("solids", "expected a list of names, solids = [\"Calcite\", ...], or a table solids = { Calcite = "
                         "{ hold_si = ..., ... } }; found " + tomlu::type_name(*n));
    for (const auto& entry : in_file_order(*t, r.file())) out.push_back(read_solid(entry, r.file(), key));
    return out;
}

// A gas level: a one-key table whose key is the unit, { ppmv = 420 }: a partial pressure in
// atm, bar or kPa; the gas's share of the gas phase in ppmv (parts per million by volume) or
// percent (by volume), taken at a total pressure of 1 atm (Dalton's law, p = x P): 420 ppmv
// of CO2 is 420e-6 atm, 21 percent of O2 is 0.21 atm; or log10_atm, the log10 of the partial
// pressure in atm. 1 atm = 101.325 kPa = 1.01325 bar exactly (the standard atmosphere, 10th
// CGPM 1954). Returns the log10 partial pressure in atm, from -20 to 2.
double gas_level(tomlu::TableReader& g, const Entry& entry) {
    const std::string key = g.dotted(entry.name);
    const std::string form = "a one-key table naming the unit, such as { ppmv = 420 } or { atm = 0.21 }; units: " +
                             name_list(gas_units);
    const toml::table* t = entry.node->as_table();
    if (!t) g.fail(entry.name, "expected " + form + "; found " + tomlu::type_name(*entry.node));
    (void)g.node(entry.name);
    const auto given = in_file_order(*t, g.file());
    if (given.empty()) g.fail(entry.name, "expected " + form + "; found an empty table");
    reject_unknown_keys(*t, gas_units, g.file(), key);
    tomlu::TableReader r(*t, g.file(), key);
    if (given.size() > 1)
        r.fail(given[1].name, "a gas level takes one unit, found both " + given[0].name + " (line " +
                                  std::to_string(given[0].key_where.line) + ") and " + given[1].name);
    const std::string& unit = given[0].name;
    const double v = *r.number(unit);
    if (unit == "log10_atm") {
        check_range(r, unit, v, -20.0, 2.0, "a log10 partial pressure", " (log10 atm)");
        return v;
    }
    if (!(v > 0.0))
        r.fail(unit, "expected a gas level above zero, found " + message_number(v) +
                         " (a partial pressure of zero has no log10); leave a gas that is absent out");
    double atm = v;
    if (unit == "bar") atm = v / 1.01325;
    else if (unit == "kPa") atm = v / 101.325;
    else if (unit == "ppmv") atm = v * 1e-6;
    else if (unit == "percent") atm = v / 100.0;
    const bool share = unit == "ppmv" || unit == "percent";
    if (share && atm > 1.0)
        r.fail(unit, "expected a share of the gas phase of at most 100 percent (1e6 ppmv), found " + message_number(v) +
                         " " + unit);
    const double log_p = std::log10(atm);
    if (log_p < -20.0 || log_p > 2.0)
        r.fail(unit, "expected a partial pressure from 1e-20 to 100 atm (log10 from -20 to 2), found " +
                         message_number(v) + " " + unit + " = " + message_number(atm) + " atm");
    return log_p;
}

// partial_pressures = { CO2 = { ppmv = 420 }, O2 = { percent = 21 } }: gases named by their
// formula; each is the database's gas of that formula, "CO2" the gas CO2(g).
std::vector<process::GasSpec> read_partial_pressures(tomlu::TableReader& r, const std::string& what) {
    std::vector<process::GasSpec> out;
    const toml::table* t = r.table("partial_pressures");
    if (!t) return out;
    tomlu::TableReader g(*t, r.file(), r.dotted("partial_pressures"));
    for (const auto& entry : in_file_order(*t, r.file())) {
        const std::string& name = entry.name;
        static const std::string mark = "(g)";
        if (name.size() > mark.size() && name.ends_with(mark))
            throw InputError(entry.key_where, g.dotted(name),
                             "a gas is named here by its formula, without \"(g)\": write " +
                                 name.substr(0, name.size() - mark.size()) + " for " + what,
                             name.substr(0, name.size() - mark.size()));
        if (name.empty() || name == mark)
            throw InputError(entry.key_where, g.dotted(name), "expected the formula of a gas, such as CO2 or O2");
        process::GasSpec gas;
        gas.name = name + mark;
        gas.where = entry.key_where;
        gas.log_partial_pressure_atm = gas_level(g, entry);
        out.push_back(std::move(gas));
    }
    return out;
}

process::EquilibrateStep read_action(std::type_identity<process::EquilibrateStep>, const StepContext&, std::size_t,
                                     tomlu::TableReader& r) {
    process::EquilibrateStep e;
    e.minerals = read_solids(r);
    e.gases = read_partial_pressures(r, "the gas held at this partial pressure");
    // headspace = { litres_per_kgw = 0.5, temperature_c = 20, partial_pressures = { CO2 = { ppmv = 420 } } }
    if (const toml::table* hs = r.table("headspace")) {
        tomlu::TableReader h(*hs, r.file(), r.dotted("headspace"));
        reject_unknown_keys(*hs, headspace_keys, r.file(), h.prefix());
        process::HeadspaceSpec spec;
        spec.where = r.location("headspace");
        if (!h.has("litres_per_kgw")) h.fail("litres_per_kgw", "missing: expected the gas volume in litres per kg of water");
        spec.volume_l_per_kgw = *ranged(h, "litres_per_kgw", 1e-9, 1e6, "litres of gas per kg of water");
        if (h.has("temperature_c")) spec.temperature_c = temperature(h, "temperature_c");
        spec.gases = read_partial_pressures(h, "the gas that starts at this partial pressure");
        if (spec.gases.empty())
            h.fail("partial_pressures", "missing: expected the starting partial pressures of the gas space, such as "
                                        "partial_pressures = { CO2 = { ppmv = 420 } }");
        h.finish(headspace_keys);
        e.headspace = std::move(spec);
    }
    if (e.minerals.empty() && e.gases.empty() && !e.headspace)
        throw InputError(r.table_location(), r.prefix(),
                         "a step of kind 'equilibrate' needs solids = [\"NAME\", ...] or partial_pressures = "
                         "{ GAS = { UNIT = ... }, ... }, with at least one entry");
    return e;
}

// amount = { value = 0.5, unit = "mmol/kgw" }
process::Amount read_amount(tomlu::TableReader& r, std::string_view key, bool above_zero) {
    const toml::node* n = r.node(key);
    const toml::table* t = n->as_table();
    if (!t)
        r.fail(key, "expected an amount { value = ..., unit = \"mmol/kgw\" }, found " + tomlu::type_name(*n));
    process::Amount a;
    a.where = key_where(r.table(), key, r.file());
    reject_unknown_keys(*t, amount_keys, r.file(), r.dotted(key));
    tomlu::TableReader ar(*t, r.file(), r.dotted(key));
    a.value = ar.require_number("value", "the amount, a number (value = ...)");
    if (above_zero && a.value <= 0.0)
        ar.fail("value", "expected a largest dose above zero, found " + message_number(a.value));
    if (a.value < 0.0) ar.fail("value", "expected an amount of zero or more, found " + message_number(a.value));
    a.unit = ar.require_string("unit", "the unit of the amount, one of: " + name_list(process::amount_units()));
    if (const std::string p = process::amount_unit_problem(a.unit); !p.empty())
        ar.fail("unit", p, process::amount_unit_suggestion(a.unit));
    return a;
}

// until = { pH = 7.2 } | { si = { Calcite = 0.0 } } | { alkalinity_meq_per_l = 2.0 } | { langelier = 0.0 }
process::DoseTarget read_until(tomlu::TableReader& r) {
    using Kind = process::DoseTarget::Kind;
    const std::string targets = "pH = ..., si = { MINERAL = ... }, alkalinity_meq_per_l = ... or langelier = ...";
    const toml::node* n = r.node("until");
    const toml::table* t = n->as_table();
    if (!t) r.fail("until", "expected a target { " + targets + " }, found " + tomlu::type_name(*n));
    tomlu::TableReader ur(*t, r.file(), r.dotted("until"));
    const auto entries = in_file_order(*t, r.file());
    reject_unknown_keys(*t, until_keys, r.file(), ur.prefix());
    if (entries.empty()) r.fail("until", "expected one target in until: " + targets + "; found none");
    if (entries.size() > 1)
        throw InputError(entries[1].key_where, ur.dotted(entries[1].name),
                         "until takes one target, found both '" + entries[0].name + "' and '" + entries[1].name + "'");

    process::DoseTarget d;
    d.where = entries[0].key_where;
    const std::string& name = entries[0].name;
    if (name == "pH") {
        d.kind = Kind::ph;
        d.value = *ranged(ur, "pH", 0.0, 14.0, "a pH");
    } else if (name == "alkalinity_meq_per_l") {
        // Negative values are meaningful (mineral acidity); the bound only catches slips.
        d.kind = Kind::alkalinity;
        d.value = *ranged(ur, name, -1000.0, 1000.0, "an alkalinity", " meq/L");
    } else if (name == "langelier") {
        // pH minus the pH of calcite saturation, both within 0..14.
        d.kind = Kind::langelier;
        d.value = *ranged(ur, name, -14.0, 14.0, "a Langelier index");
    } else {
        d.kind = Kind::saturation_index;
        const toml::node* sn = ur.node("si");
        const toml::table* st = sn->as_table();
        if (!st) ur.fail("si", "expected si = { MINERAL = target saturation index }, found " + tomlu::type_name(*sn));
        const auto minerals = in_file_order(*st, r.file());
        if (minerals.empty())
            ur.fail("si", "expected one mineral and its target saturation index, e.g. si = { Calcite = 0.0 }; found none");
        tomlu::TableReader sr(*st, r.file(), ur.dotted("si"));
        if (minerals.size() > 1)
            throw InputError(minerals[1].key_where, sr.dotted(minerals[1].name),
                             "si takes one mineral, found both '" + minerals[0].name + "' and '" +
                                 minerals[1].name + "'");
        d.mineral = minerals[0].name;
        d.where = minerals[0].key_where;
        d.value = *ranged(sr, d.mineral, -20.0, 20.0, "a target saturation index");
    }
    return d;
}

process::DoseStep read_action(std::type_identity<process::DoseStep>, const StepContext&, std::size_t, tomlu::TableReader& r) {
    process::DoseStep d;
    d.reagent = r.require_string("reagent", "the reagent, a formula such as \"H2SO4\" or \"Ca(OH)2\"");
    if (d.reagent.empty()) r.fail("reagent", "expected the reagent's formula, such as \"H2SO4\", found an empty string");
    d.reagent_where = key_where(r.table(), "reagent", r.file());
    const bool amount = r.has("amount"), until = r.has("until");
    if (amount && until)
        r.fail("until", "give either amount (a fixed dose) or until (dose until a target is reached), not both");
    if (!amount && !until)
        throw InputError(r.table_location(), r.dotted("amount"),
                         "missing: a step of kind 'dose' needs amount = { value = ..., unit = \"mmol/kgw\" } "
                         "or until = { pH = ... }");
    if (amount) d.amount = read_amount(r, "amount", false);
    if (until) d.until = read_until(r);
    if (r.has("max_amount")) {
        if (!until)
            r.fail("max_amount", "max_amount limits a dose with until; a fixed amount needs none");
        d.max_amount = read_amount(r, "max_amount", true);
    }
    return d;
}

process::BlendStep read_action(std::type_identity<process::BlendStep>, const StepContext& c, std::size_t n,
                               tomlu::TableReader& r) {
    process::BlendStep b;
    const toml::node* wn = r.node("waters");
    if (!wn)
        throw InputError(r.table_location(), r.dotted("waters"),
                         "missing: a step of kind 'blend' needs waters = { NAME = fraction, NAME = fraction, ... } "
                         "naming at least two waters or earlier steps");
    const toml::table* wt = wn->as_table();
    if (!wt) r.fail("waters", "expected a table { NAME = fraction, ... }, found " + tomlu::type_name(*wn));
    const auto parts = in_file_order(*wt, r.file());
    if (parts.size() < 2)
        r.fail("waters", "a blend needs at least two waters, found " + std::to_string(parts.size()));
    tomlu::TableReader wr(*wt, r.file(), r.dotted("waters"));
    double sum = 0.0;
    for (const auto& p : parts) {
        const double f = *wr.number(p.name);
        if (f <= 0.0) wr.fail(p.name, "expected a fraction above zero, found " + message_number(f));
        check_source(c, n, p.name, p.key_where, wr.dotted(p.name));
        b.parts.emplace_back(p.name, f);
        b.part_where.push_back(p.key_where);
        sum += f;
    }
    // The fractions need not add up to 1 (7 and 3 mean 70 % and 30 %): they are normalised
    // here, so the parts always add up to 1.
    for (auto& part : b.parts) part.second /= sum;
    if (auto by = r.string("by")) {
        if (*by == "volume") b.basis = process::BlendStep::Basis::volume;
        else if (*by == "mass") b.basis = process::BlendStep::Basis::mass;
        else
            r.fail("by", "expected \"volume\" or \"mass\", found \"" + *by + "\"", nearest_name(*by, blend_bases));
    }
    return b;
}

process::ConcentrateStep read_action(std::type_identity<process::ConcentrateStep>, const StepContext&, std::size_t,
                                     tomlu::TableReader& r) {
    process::ConcentrateStep k;
    const bool factor = r.has("factor"), recovery = r.has("recovery");
    if (factor && recovery)
        r.fail("recovery", "give factor or recovery, not both (factor = 1/(1 - recovery))");
    if (!factor && !recovery)
        throw InputError(r.table_location(), r.dotted("factor"),
                         "missing: a step of kind 'concentrate' needs factor = ... (cycles of concentration, from " +
                             message_number(process::min_concentration_factor) + " to " +
                             message_number(process::max_concentration_factor) +
                             ") or recovery = ... (the fraction of the water removed, from 0 to " +
                             message_number(1.0 - 1.0 / process::max_concentration_factor) + ")");
    if (factor) {
        k.factor = *r.number("factor");
        if (const auto problem = process::concentration_factor_problem(k.factor); !problem.empty()) r.fail("factor", problem);
    } else {
        const double v = *r.number("recovery");
        if (const auto problem = process::recovery_problem(v); !problem.empty()) r.fail("recovery", problem);
        k.factor = 1.0 / (1.0 - v);
    }
    if (const toml::array* minerals = r.array("precipitate")) {
        for (const auto& el : *minerals) {
            const SourceLocation at = tomlu::where(el.source(), r.file());
            if (!el.is_string())
                throw InputError(at, r.dotted("precipitate"),
                                 "expected mineral names (strings), found " + tomlu::type_name(el) + " in the list");
            const std::string name = el.as_string()->get();
            if (name.empty())
                throw InputError(at, r.dotted("precipitate"), "expected a mineral name, found an empty string");
            if (is_one_of(name, k.precipitate))
                throw InputError(at, r.dotted("precipitate"), "the mineral '" + name + "' is listed twice");
            k.precipitate.push_back(name);
            k.precipitate_where.push_back(at);
        }
    }
    return k;
}

process::TemperatureStep read_action(std::type_identity<process::TemperatureStep>, const StepContext&, std::size_t,
                                     tomlu::TableReader& r) {
    process::TemperatureStep t;
    const auto tc = temperature(r, "temperature_c");
    if (!tc)
        throw InputError(r.table_location(), r.dotted("temperature_c"),
                         "missing: a step of kind 'temperature' needs temperature_c = ... (°C)");
    t.temperature_c = *tc;
    t.equilibrate = r.boolean("equilibrate").value_or(false);
    return t;
}

// The action of the kind named, read by the read_action overload of its alternative.
template <std::size_t... I>
process::StepAction read_action_of_kind(std::string_view kind, const StepContext& c, std::size_t n, tomlu::TableReader& r,
                                        std::index_sequence<I...>) {
    process::StepAction a;
    const bool found =
        ((kind == process::step_kinds[I]
              ? (a = read_action(std::type_identity<std::variant_alternative_t<I, process::StepAction>>{}, c, n, r), true)
              : false) ||
         ...);
    if (!found) throw std::logic_error("no step kind '" + std::string(kind) + "'");
    return a;
}

process::Step read_step(const StepContext& c, std::size_t n, const toml::table& t) {
    const std::string prefix = "step[" + std::to_string(n) + "]";
    tomlu::TableReader r(t, c.file, prefix);
    process::Step s;
    s.where = r.table_location();

    const auto kind = r.string("kind");
    if (!kind)
        throw InputError(s.where, r.dotted("kind"),
                         "missing: expected the kind of step, one of: " + name_list(step_kinds));
    if (!is_one_of(*kind, step_kinds))
        r.fail("kind", "unknown kind of step '" + *kind + "'; expected one of: " + name_list(step_kinds),
               nearest_name(*kind, step_kinds));
    check_step_keys(t, *kind, c.file, prefix);

    if (auto label = r.string("label")) {
        if (label->empty()) r.fail("label", "expected a label for the step, found an empty string");
        s.label = *label;
        check_label_unique(c, r, s.label, true);
    } else {
        s.label = default_step_label(n, *kind);
        check_label_unique(c, r, s.label, false);
    }

    if (auto water = r.string("water")) {
        s.water = *water;
        s.water_where = key_where(t, "water", c.file);
        check_source(c, n, s.water, s.water_where, r.dotted("water"));
    } else if (*kind != "blend" && c.done.empty() && c.waters.size() > 1) {
        // Without `water` a step starts from the previous result; the first step has none of
        // its own, and with several waters it would be a guess which one was meant.
        std::vector<std::string> names;
        for (const auto& w : c.waters) names.push_back(w.name);
        throw InputError(s.where, r.dotted("water"),
                         "missing: the first step has no earlier step to start from and the case has " +
                             std::to_string(names.size()) + " waters (" + name_list(names) +
                             "); name the one it starts from: water = \"" + names.front() + "\"");
    }

    s.action = read_action_of_kind(*kind, c, n, r, std::make_index_sequence<std::variant_size_v<process::StepAction>>{});
    // Only the kinds that bring the water to one redox level take this key (check_step_keys).
    s.keep_redox_states_apart = r.boolean("keep_redox_states_apart").value_or(false);
    if (r.has("keep_redox_states_apart") && *kind == "temperature" && !std::get<process::TemperatureStep>(s.action).equilibrate)
        r.fail("keep_redox_states_apart",
               "keep_redox_states_apart matters only with equilibrate = true: a temperature change alone already keeps "
               "redox states given apart as they are");
    return s;
}

// An output of a sweep: "pH", ..., "si:NAME", "transfer:NAME", "total:ELEMENT". Only the form
// is checked here; the names are the database's.
void check_output(const std::string& out, const SourceLocation& at, const std::string& key) {
    const std::string expected = "expected " + name_list(plain_outputs) +
                                 ", si:NAME, transfer:NAME or total:ELEMENT";
    const auto colon = out.find(':');
    if (colon == std::string::npos) {
        if (!is_one_of(out, plain_outputs))
            throw InputError(at, key, "unknown output '" + out + "'; " + expected, nearest_name(out, plain_outputs));
        return;
    }
    const std::string head = out.substr(0, colon), name = out.substr(colon + 1);
    if (!is_one_of(head, output_prefixes)) {
        const std::string near = nearest_name(head, output_prefixes);
        throw InputError(at, key, "unknown output '" + out + "'; " + expected, near.empty() ? "" : near + ":" + name);
    }
    if (name.empty())
        throw InputError(at, key, "the output '" + out + "' needs a name after the colon, e.g. " + head +
                                      (head == "total" ? ":Ca" : ":Calcite"));
    if (head == "total") {
        const bool symbol = (name.size() == 1 || name.size() == 2) && std::isupper(static_cast<unsigned char>(name[0])) &&
                            (name.size() == 1 || std::islower(static_cast<unsigned char>(name[1])));
        if (!symbol)
            throw InputError(at, key, "the output '" + out + "' needs an element symbol after total:, such as "
                                      "total:Ca or total:C; found '" + name + "'");
    }
}

process::Sweep read_sweep(const std::string& file, std::size_t n, const toml::table& t,
                          const std::vector<process::Step>& steps, const std::vector<process::Sweep>& done) {
    using Variable = process::Sweep::Variable;
    tomlu::TableReader r(t, file, "sweep[" + std::to_string(n) + "]");
    reject_unknown_keys(t, sweep_keys, file, r.prefix());
    process::Sweep sw;
    sw.where = r.table_location();

    if (auto label = r.string("label")) {
        if (label->empty()) r.fail("label", "expected a label for the sweep, found an empty string");
        sw.label = *label;
    } else {
        sw.label = "sweep " + std::to_string(n);
    }
    for (std::size_t i = 0; i < done.size(); ++i)
        if (done[i].label == sw.label)
            r.fail("label", std::string(r.has("label") ? "the label '" : "the default label '") + sw.label +
                                "' is already the label of sweep " + std::to_string(i + 1) + " (line " +
                                std::to_string(done[i].where.line) + "); give each sweep its own label");

    sw.step = r.require_string("step", "the label of the step whose input the sweep varies");
    sw.step_where = r.location("step");
    const process::Step* step = nullptr;
    for (const auto& s : steps)
        if (s.label == sw.step) step = &s;
    if (!step) {
        std::vector<std::string> labels;
        for (const auto& s : steps) labels.push_back(s.label);
        if (labels.empty())
            r.fail("step", "no step is labelled '" + sw.step + "': the case has no [[step]]; a sweep varies an "
                           "input of a step");
        r.fail("step", "no step is labelled '" + sw.step + "'; expected one of: " + name_list(labels),
               nearest_name(sw.step, labels));
    }

    // `at`: the step whose result is recorded, the varied step itself or a later one.
    if (auto at = r.string("at")) {
        sw.at = *at;
        sw.at_where = r.location("at");
        std::size_t varied = 0, recorded = steps.size();
        std::vector<std::string> later;
        for (std::size_t k = 0; k < steps.size(); ++k) {
            if (&steps[k] == step) varied = k;
            if (steps[k].label == sw.at) recorded = k;
        }
        for (std::size_t k = varied; k < steps.size(); ++k) later.push_back(steps[k].label);
        if (recorded == steps.size() || recorded < varied)
            r.fail("at", "'" + sw.at + "' is not the varied step or a step after it; expected one of: " + name_list(later),
                   nearest_name(sw.at, later));
    }
    const std::string variable = r.require_string("variable", "what the sweep varies, one of: " + name_list(sweep_variables));
    sw.variable_where = r.location("variable");
    if (!is_one_of(variable, sweep_variables))
        r.fail("variable", "unknown variable '" + variable + "'; expected one of: " + name_list(sweep_variables),
               nearest_name(variable, sweep_variables));
    // Each variable is an input of one kind of step.
    const std::string needs = variable == "temperature_c" ? "temperature"
                              : variable == "dose"        ? "dose"
                              : variable == "factor"      ? "concentrate"
                                                          : "blend";
    if (std::string(process::step_kind(*step)) != needs)
        r.fail("variable", "the variable '" + variable + "' is an input of a step of kind '" + needs + "', but step '" +
                               step->label + "' (line " + std::to_string(step->where.line) + ") is of kind '" +
                               std::string(process::step_kind(*step)) + "'");
    std::string unit;
    if (variable == "temperature_c") {
        sw.variable = Variable::temperature_c;
        unit = " °C";
    } else if (variable == "dose") {
        sw.variable = Variable::dose;
        const auto& dose = std::get<process::DoseStep>(step->action);
        if (!dose.amount)
            r.fail("variable", "the variable 'dose' varies a fixed amount, but step '" + step->label +
                                   "' doses until a target; give that step amount = { ... } instead of until");
        unit = " " + dose.amount->unit + " (the unit of the step's amount)";
    } else if (variable == "factor") {
        sw.variable = Variable::factor;
    } else {
        sw.variable = Variable::fraction;
    }

    sw.from = r.require_number("from", "the first value of the variable");
    sw.to = r.require_number("to", "the last value of the variable");
    for (const char* key : {"from", "to"}) {
        const double v = std::string_view(key) == "from" ? sw.from : sw.to;
        switch (sw.variable) {
            case Variable::temperature_c: if (const std::string p = thermo::temperature_problem(v); !p.empty()) r.fail(key, p); break;
            case Variable::dose:
                if (v < 0.0) r.fail(key, "expected a dose of zero or more in" + unit + ", found " + message_number(v));
                break;
            case Variable::factor:
                if (const auto problem = process::concentration_factor_problem(v); !problem.empty()) r.fail(key, problem);
                break;
            case Variable::fraction: check_range(r, key, v, 0.0, 1.0, "a fraction"); break;
        }
    }
    if (sw.from == sw.to)
        r.fail("to", "expected a value other than from = " + message_number(sw.from) + "; a sweep needs a range");

    if (const toml::node* p = r.node("points")) {
        if (!p->is_integer())
            r.fail("points", "expected a whole number of points from 2 to 1000, found " + tomlu::type_name(*p));
        const auto v = p->as_integer()->get();
        if (v < 2 || v > 1000)
            r.fail("points", "expected a whole number of points from 2 to 1000, found " + std::to_string(v));
        sw.points = static_cast<int>(v);
    }

    if (sw.variable == Variable::fraction) {
        sw.fraction_of = r.require_string("fraction_of", "the water of the blend whose fraction is varied");
        const auto& blend = std::get<process::BlendStep>(step->action);
        std::vector<std::string> parts;
        for (const auto& part : blend.parts) parts.push_back(part.first);
        if (!is_one_of(sw.fraction_of, parts))
            r.fail("fraction_of",
                   "'" + sw.fraction_of + "' is not among the waters of the blend '" + step->label + "' (" +
                       name_list(parts) + ")",
                   nearest_name(sw.fraction_of, parts));
    } else if (r.has("fraction_of")) {
        r.fail("fraction_of", "fraction_of only goes with variable = \"fraction\"");
    }

    const toml::array* outputs = r.array("outputs");
    if (!outputs)
        throw InputError(sw.where, r.dotted("outputs"),
                         "missing: expected outputs = [ ... ], the results to record at each point, e.g. "
                         "[\"pH\", \"si:Calcite\"]");
    if (outputs->empty()) r.fail("outputs", "expected at least one output, found an empty list");
    for (const auto& el : *outputs) {
        const SourceLocation at = tomlu::where(el.source(), file);
        if (!el.is_string())
            throw InputError(at, r.dotted("outputs"), "expected outputs as strings, found " + tomlu::type_name(el) +
                                                          " in the list");
        const std::string out = el.as_string()->get();
        check_output(out, at, r.dotted("outputs"));
        if (is_one_of(out, sw.outputs))
            throw InputError(at, r.dotted("outputs"), "the output '" + out + "' is listed twice");
        sw.outputs.push_back(out);
        sw.output_where.push_back(at);
    }

    for (const char* key : {"csv", "svg"}) {
        if (auto path = r.string(key)) {
            if (path->empty()) r.fail(key, "expected the path of the file to write, found an empty string");
            (std::string_view(key) == "csv" ? sw.csv_path : sw.svg_path) = *path;
        }
    }
    return sw;
}

// --- cells and diagrams -------------------------------------------------------------------

const std::vector<std::string> cell_keys = {"label",         "cathode",    "anode",
                                            "water",         "temperature_c", "activities",
                                            "metal_ion_activity"};
const std::vector<std::string> electrode_keys = {"half_reaction", "water", "temperature_c", "activities",
                                                 "metal_ion_activity"};
const std::vector<std::string> diagram_keys = {"label",      "element", "temperature_c", "log_activity", "activity",
                                               "water",      "points",  "ph_range",      "eh_range_v",   "shading",
                                               "ligands",    "leave_out", "svg",         "csv"};
const std::string half_reaction_example = "\"Cu^2+ + 2 e- = Cu(s)\"";

// A water or step label named by a cell or a diagram. They are evaluated once every step has
// run, so the label of any step will do.
void check_result_name(const std::vector<WaterAnalysis>& waters, const std::vector<process::Step>& steps,
                       const std::string& name, const SourceLocation& at, const std::string& key) {
    std::vector<std::string> names;
    for (const auto& w : waters) names.push_back(w.name);
    for (const auto& s : steps) names.push_back(s.label);
    if (is_one_of(name, names)) return;
    throw InputError(at, key, "no water or step is called '" + name + "'; expected one of: " + name_list(names),
                     nearest_name(name, names));
}

// The form of a half-reaction: not empty, two sides around '=', species that read as formulas.
// Whether the database knows the species and the reaction balances is checked when it is run.
chem::Reaction check_half_reaction(const std::string& text, const SourceLocation& at, const std::string& key) {
    const auto lead = text.find_first_not_of(" \t\r\n");
    if (lead == std::string::npos)
        throw InputError(at, key, "expected a half-reaction such as " + half_reaction_example + ", found an empty string");
    if (text.find('=') == std::string::npos)
        throw InputError(at, key, "expected a half-reaction with '=' between its two sides, such as " +
                                      half_reaction_example + "; found \"" + text + "\"");
    try {
        return chem::parse_reaction(text);
    } catch (const chem::ParseError& e) {
        // The parser counts within the text with its leading blanks removed.
        const std::string at_char =
            e.column() > 0 ? " (at character " + std::to_string(static_cast<std::size_t>(e.column()) + lead) + ")" : "";
        throw InputError(at, key, "cannot read the half-reaction \"" + text + "\": " + e.message() + at_char);
    }
}

// The species of a half-reaction that can be given an activity: every term but the electrons.
std::vector<std::string> species_of(const chem::Reaction& reaction) {
    std::vector<std::string> out;
    for (const auto& term : reaction.terms)
        if (!chem::parse_formula(term.species).is_electron() && !is_one_of(term.species, out))
            out.push_back(term.species);
    return out;
}

bool same_species(std::string_view a, std::string_view b) { return chem::ascii_form(a) == chem::ascii_form(b); }

bool among(std::string_view name, const std::vector<std::string>& species) {
    return std::any_of(species.begin(), species.end(), [&](const std::string& s) { return same_species(name, s); });
}

// Activities of a cell or an electrode: activities = { "Cu^2+" = 1e-6, "O2(g)" = 0.21 }.
struct ActivityEntry {
    std::string species;
    double value;
    SourceLocation where;  // of the key
    std::string key;       // dotted, for messages
};

std::vector<ActivityEntry> read_activities(tomlu::TableReader& r) {
    std::vector<ActivityEntry> out;
    const toml::table* t = r.table("activities");
    if (!t) return out;
    tomlu::TableReader ar(*t, r.file(), r.dotted("activities"));
    for (const auto& e : in_file_order(*t, r.file())) {
        if (e.name.empty())
            throw InputError(e.key_where, ar.dotted(e.name),
                             "expected a species name as the key, such as \"Cu^2+\", found an empty one");
        if (!e.node->is_integer() && !e.node->is_floating_point())
            ar.fail(e.name, "expected the activity of the species (a number; for a gas its fugacity in atm), found " +
                                tomlu::type_name(*e.node));
        const double v = *ar.number(e.name);
        if (v <= 0.0) ar.fail(e.name, "expected an activity above zero, found " + message_number(v));
        out.push_back({e.name, v, e.key_where, ar.dotted(e.name)});
    }
    return out;
}

// The activity at which the dissolved species of an electrode's metal are taken (the
// customary corrosion convention is 1e-6).
std::optional<double> read_metal_ion_activity(tomlu::TableReader& r) {
    auto v = r.number("metal_ion_activity");
    if (v && !(*v > 0.0 && *v <= 1.0))
        r.fail("metal_ion_activity",
               "expected the activity of the dissolved species of the electrode's metal, above 0 and at most 1 "
               "(1e-6 is the customary corrosion convention), found " + message_number(*v));
    return v;
}

// One electrode of a cell: a half-reaction string, or a table with its own water, temperature
// and activities. `reaction` receives the parsed half-reaction.
CellElectrode read_electrode(tomlu::TableReader& r, const std::string& which, const Case& c,
                             chem::Reaction& reaction, SourceLocation& electrode_where) {
    const toml::node* n = r.node(which);
    if (!n)
        throw InputError(r.table_location(), r.dotted(which),
                         "missing: expected the " + which + ", a half-reaction such as " + half_reaction_example +
                             " or a table { half_reaction = \"...\", water = \"...\", temperature_c = ..., "
                             "activities = { ... } }");
    CellElectrode e;
    electrode_where = key_where(r.table(), which, r.file());
    if (n->is_string()) {
        e.half_reaction = n->as_string()->get();
        e.half_reaction_where = electrode_where;
        reaction = check_half_reaction(e.half_reaction, r.location(which), r.dotted(which));
        return e;
    }
    const toml::table* t = n->as_table();
    if (!t)
        r.fail(which, "expected a half-reaction (a string such as " + half_reaction_example +
                          ") or a table { half_reaction = \"...\", ... }, found " + tomlu::type_name(*n));
    reject_unknown_keys(*t, electrode_keys, r.file(), r.dotted(which));
    tomlu::TableReader er(*t, r.file(), r.dotted(which));
    e.half_reaction = er.require_string("half_reaction", "the half-reaction, a string such as " + half_reaction_example);
    e.half_reaction_where = key_where(*t, "half_reaction", r.file());
    reaction = check_half_reaction(e.half_reaction, er.location("half_reaction"), er.dotted("half_reaction"));
    if (auto w = er.string("water")) {
        e.water = *w;
        e.water_where = key_where(*t, "water", r.file());
        check_result_name(c.waters, c.steps, e.water, e.water_where, er.dotted("water"));
    }
    e.temperature_c = temperature(er, "temperature_c");
    e.metal_ion_activity = read_metal_ion_activity(er);
    const auto species = species_of(reaction);
    for (const auto& a : read_activities(er)) {
        if (!among(a.species, species))
            throw InputError(a.where, a.key,
                             "'" + a.species + "' does not take part in the " + which + "'s half-reaction \"" +
                                 e.half_reaction + "\" (" + name_list(species) + ")",
                             nearest_name(a.species, species));
        e.activities.emplace_back(a.species, a.value);
        e.activity_where.push_back(a.where);
    }
    return e;
}

CellSpec read_cell(const std::string& file, const Case& c, std::size_t n, const toml::table& t) {
    tomlu::TableReader r(t, file, "cell[" + std::to_string(n) + "]");
    reject_unknown_keys(t, cell_keys, r.file(), r.prefix());
    CellSpec cell;
    cell.where = r.table_location();

    if (auto label = r.string("label")) {
        if (label->empty()) r.fail("label", "expected a label for the cell, found an empty string");
        cell.label = *label;
    } else {
        cell.label = "cell " + std::to_string(n);
    }
    for (std::size_t i = 0; i < c.cells.size(); ++i)
        if (c.cells[i].label == cell.label)
            r.fail("label", std::string(r.has("label") ? "the label '" : "the default label '") + cell.label +
                                "' is already the label of cell " + std::to_string(i + 1) + " (line " +
                                std::to_string(c.cells[i].where.line) + "); give each cell its own label");

    // What the cell gives for both electrodes; an electrode's own water and temperature win,
    // and its own activities win species by species.
    std::string water;
    SourceLocation water_where;
    if (auto w = r.string("water")) {
        water = *w;
        water_where = key_where(t, "water", r.file());
        check_result_name(c.waters, c.steps, water, water_where, r.dotted("water"));
    }
    const auto temperature_c = temperature(r, "temperature_c");
    const auto metal_ion_activity = read_metal_ion_activity(r);

    chem::Reaction cathode_reaction, anode_reaction;
    SourceLocation cathode_where, anode_where;
    cell.cathode = read_electrode(r, "cathode", c, cathode_reaction, cathode_where);
    cell.anode = read_electrode(r, "anode", c, anode_reaction, anode_where);
    const auto shared = read_activities(r);
    const auto cathode_species = species_of(cathode_reaction), anode_species = species_of(anode_reaction);
    for (const auto& a : shared)
        if (!among(a.species, cathode_species) && !among(a.species, anode_species)) {
            std::vector<std::string> both = cathode_species;
            for (const auto& s : anode_species)
                if (!among(s, both)) both.push_back(s);
            throw InputError(a.where, a.key,
                             "'" + a.species + "' takes part in neither half-reaction of the cell (cathode: " +
                                 name_list(cathode_species) + "; anode: " + name_list(anode_species) + ")",
                             nearest_name(a.species, both));
        }

    // The cell-wide values go to each electrode that has none of its own; a cell-wide activity
    // only to the electrodes in whose half-reaction the species takes part.
    for (auto* e : {&cell.cathode, &cell.anode}) {
        const bool is_cathode = e == &cell.cathode;
        if (e->water.empty() && !water.empty()) {
            e->water = water;
            e->water_where = water_where;
        } else if (e->water.empty()) {
            e->water_where = is_cathode ? cathode_where : anode_where;
        }
        if (!e->temperature_c) e->temperature_c = temperature_c;
        if (!e->metal_ion_activity) e->metal_ion_activity = metal_ion_activity;
        for (const auto& a : shared) {
            const bool own = std::any_of(e->activities.begin(), e->activities.end(),
                                         [&](const auto& given) { return same_species(given.first, a.species); });
            if (own || !among(a.species, is_cathode ? cathode_species : anode_species)) continue;
            e->activities.emplace_back(a.species, a.value);
            e->activity_where.push_back(a.where);
        }
    }
    return cell;
}

// A [min, max] pair within [lo, hi], min below max.
std::optional<std::pair<double, double>> read_range(tomlu::TableReader& r, std::string_view key, double lo, double hi,
                                                    const std::string& what) {
    const auto v = r.numbers(key, 2);
    if (!v) return std::nullopt;
    const double a = (*v)[0], b = (*v)[1];
    const std::string found = ", found [" + message_number(a) + ", " + message_number(b) + "]";
    if (a < lo || b > hi || a > hi || b < lo)
        r.fail(key, "expected " + what + " [min, max] within " + message_number(lo) + " to " + message_number(hi) + found);
    if (!(a < b)) r.fail(key, "expected " + what + " [min, max] with min below max" + found);
    return std::pair{a, b};
}

DiagramCase read_diagram(const std::string& file, const Case& c, std::size_t n, const toml::table& t) {
    tomlu::TableReader r(t, file, "diagram[" + std::to_string(n) + "]");
    reject_unknown_keys(t, diagram_keys, r.file(), r.prefix());
    DiagramCase d;
    d.spec.where = r.table_location();

    if (auto label = r.string("label")) {
        if (label->empty()) r.fail("label", "expected a label for the diagram, found an empty string");
        d.spec.label = *label;
    } else {
        d.spec.label = "diagram " + std::to_string(n);
    }
    for (std::size_t i = 0; i < c.diagrams.size(); ++i)
        if (c.diagrams[i].spec.label == d.spec.label)
            r.fail("label", std::string(r.has("label") ? "the label '" : "the default label '") + d.spec.label +
                                "' is already the label of diagram " + std::to_string(i + 1) + " (line " +
                                std::to_string(c.diagrams[i].spec.where.line) + "); give each diagram its own label");

    d.spec.element = r.require_string("element", "the element of the diagram, a symbol such as \"Fe\"");
    d.element_where = key_where(t, "element", r.file());
    if (d.spec.element.empty())
        r.fail("element", "expected an element symbol such as \"Fe\", found an empty string");
    if (!chem::atomic_weight(d.spec.element))
        // Only short names are matched to a symbol: "Iron" is not a misspelt "Ir".
        r.fail("element", "unknown element '" + d.spec.element + "'; expected an element symbol such as Fe, Cu or Mn",
               d.spec.element.size() <= 3 ? nearest_name(d.spec.element, chem::element_symbols()) : std::string());

    d.spec.temperature_c = temperature(r, "temperature_c");
    at_most_one(r, {"log_activity", "activity"},
                "give the activity of the dissolved species once, as log_activity or activity");
    if (auto la = ranged(r, "log_activity", -12.0, 0.0, "a log10 activity of the dissolved species")) d.spec.log_activity = *la;
    if (auto a = r.number("activity")) {
        if (!(*a >= 1e-12 && *a <= 1.0))
            r.fail("activity", "expected an activity of the dissolved species from 1e-12 to 1 (log_activity from -12 "
                               "to 0), found " + message_number(*a));
        d.spec.log_activity = std::log10(*a);
    }

    if (auto w = r.string("water")) {
        d.water = *w;
        d.water_where = key_where(t, "water", r.file());
        check_result_name(c.waters, c.steps, d.water, d.water_where, r.dotted("water"));
    } else {
        d.water_where = d.spec.where;
    }

    if (const toml::array* points = r.array("points")) {
        for (const auto& el : *points) {
            const SourceLocation at = tomlu::where(el.source(), r.file());
            if (!el.is_string())
                throw InputError(at, r.dotted("points"), "expected names of waters or step labels (strings), found " +
                                                             tomlu::type_name(el) + " in the list");
            const std::string name = el.as_string()->get();
            check_result_name(c.waters, c.steps, name, at, r.dotted("points"));
            if (is_one_of(name, d.points)) throw InputError(at, r.dotted("points"), "the point '" + name + "' is listed twice");
            d.points.push_back(name);
            d.point_where.push_back(at);
        }
    }

    if (auto ph = read_range(r, "ph_range", 0.0, 14.0, "a pH range")) std::tie(d.spec.ph_min, d.spec.ph_max) = *ph;
    if (auto eh = read_range(r, "eh_range_v", -3.0, 3.0, "an Eh range in V")) std::tie(d.spec.eh_min_v, d.spec.eh_max_v) = *eh;
    if (auto shading = r.boolean("shading")) d.spec.shading = *shading;
    if (auto ligands = r.boolean("ligands")) {
        // The forms with other components (carbonate, sulfate, chloride, ...) take those
        // components' free activities from the diagram's water.
        if (*ligands && d.water.empty())
            r.fail("ligands", "ligands = true takes the free activities of the other components (carbonate, sulfate, "
                              "chloride, ...) from a water: name it in the diagram's water");
        d.spec.ligands = *ligands;
    }
    if (const toml::array* names = r.array("leave_out")) {
        // Whether the database knows the names is checked when the diagram is drawn.
        for (const auto& el : *names) {
            const SourceLocation at = tomlu::where(el.source(), r.file());
            if (!el.is_string())
                throw InputError(at, r.dotted("leave_out"),
                                 "expected names of species or minerals of the database (strings) such as \"Hematite\", "
                                 "found " + tomlu::type_name(el) + " in the list");
            const std::string name = el.as_string()->get();
            if (name.empty())
                throw InputError(at, r.dotted("leave_out"), "expected the name of a species or a mineral, found an empty string");
            if (is_one_of(name, d.spec.leave_out))
                throw InputError(at, r.dotted("leave_out"), "'" + name + "' is listed twice");
            d.spec.leave_out.push_back(name);
            d.spec.leave_out_where.push_back(at);
        }
    }
    for (const char* key : {"svg", "csv"}) {
        if (auto path = r.string(key)) {
            if (path->empty()) r.fail(key, "expected the path of the file to write, found an empty string");
            (std::string_view(key) == "svg" ? d.svg_path : d.csv_path) = *path;
        }
    }
    return d;
}

}  // namespace

const std::vector<StepKindKeys>& step_keys() {
    static const std::vector<StepKindKeys> table =
        make_step_keys(std::make_index_sequence<std::variant_size_v<process::StepAction>>{});
    return table;
}

Case parse_case(std::string_view toml_text, const std::string& origin) {
    const toml::table root = tomlu::parse(toml_text, origin);
    tomlu::TableReader r(root, origin, "");

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
                   "unknown activity model '" + *model + "'; expected one of: " + name_list(names),
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
    for (const auto& e : in_file_order(*waters_node->as_table(), origin))
        c.waters.push_back(read_water(e.name, *e.node, origin));

    // Steps, then the sweeps that refer to them by label.
    const auto step_tables = array_of_tables(r, "step", "step", origin);
    StepContext steps{origin, c.waters, planned_labels(step_tables), {}};
    for (std::size_t i = 0; i < step_tables.size(); ++i)
        steps.done.push_back(read_step(steps, i + 1, *step_tables[i]));
    c.steps = std::move(steps.done);
    const auto sweep_tables = array_of_tables(r, "sweep", "sweep", origin);
    for (std::size_t i = 0; i < sweep_tables.size(); ++i)
        c.sweeps.push_back(read_sweep(origin, i + 1, *sweep_tables[i], c.steps, c.sweeps));

    // Cells and diagrams, which name waters and steps.
    const auto cell_tables = array_of_tables(r, "cell", "cell", origin);
    for (std::size_t i = 0; i < cell_tables.size(); ++i) c.cells.push_back(read_cell(origin, c, i + 1, *cell_tables[i]));
    const auto diagram_tables = array_of_tables(r, "diagram", "diagram", origin);
    for (std::size_t i = 0; i < diagram_tables.size(); ++i)
        c.diagrams.push_back(read_diagram(origin, c, i + 1, *diagram_tables[i]));

    r.finish(top_level_keys);
    return c;
}

Case read_case(const std::string& path) {
    // A directory opens as a stream that reads nothing: say what it is rather than report
    // an empty case.
    std::error_code dir_ec;
    if (std::filesystem::is_directory(path, dir_ec))
        throw InputError(SourceLocation{path}, "", "this is a directory, not a case file: give the path of a .toml file");
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

double below_detection_limit_of(const std::string& text, const SourceLocation& where, const std::string& key) {
    return below_detection_limit(text, where, key);
}

}  // namespace deltag::io
