// deltag._core: the C++ side of the Python module deltag (python/deltag/__init__.py is the
// Python side and carries the user-facing docstrings). Every function converts its Python
// arguments first, then releases the GIL for the work, so threads run solves in parallel.
// Library errors become the exceptions of deltag.errors with the library's message, file,
// line, column and key.
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include "deltag/batch.hpp"

#include <cmath>
#include <sstream>
#include <filesystem>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/electro.hpp"
#include "deltag/error.hpp"
#include "deltag/process.hpp"
#include "deltag/reference_electrodes.hpp"
#include "deltag/report.hpp"
#include "deltag/run.hpp"
#include "deltag/water_properties.hpp"

namespace py = pybind11;
using namespace deltag;

namespace {

// The temperatures the functions below accept: the library's one limit
// (thermo::accepted_temperature_c), as the command line and case files.
void check_temperature(double t, const SourceLocation& where) {
    if (const std::string p = thermo::temperature_problem(t); !p.empty()) throw InputError(where, "temperature_c", p);
}

// One speciated water: what deltag.speciate returns (wrapped by deltag.Water in Python).
struct Water {
    process::WaterState state;
    std::string database;
    std::string json;  // the water's entry in the JSON report, as `deltag run --format json` writes it
};

// An error of the case text that deltag.speciate builds from its arguments: reported
// against the Python function and its argument ("analytes.Ca", "pH"), not against the
// lines of that text.
[[noreturn]] void rethrow_for_arguments(const InputError& e, const std::string& water_name, const std::string& origin) {
    std::string key = e.key();
    const std::string prefix = "water." + water_name + ".";
    const std::string quoted_prefix = "water.\"" + water_name + "\".";
    if (key.rfind(prefix, 0) == 0) key = key.substr(prefix.size());
    else if (key.rfind(quoted_prefix, 0) == 0) key = key.substr(quoted_prefix.size());
    // A database file's own errors keep their file and line.
    const bool in_text = e.where().file == origin;
    const SourceLocation where = in_text ? SourceLocation{origin, 0, 0} : e.where();
    if (dynamic_cast<const NoSolutionError*>(&e)) throw NoSolutionError(where, key, e.message(), e.suggestion());
    throw InputError(where, key, e.message(), e.suggestion());
}

Water speciate_text(const std::string& toml_text, const std::string& origin, const std::string& water_name) {
    try {
        const CaseRun run = run_case_text(toml_text, origin, std::filesystem::current_path().string());
        Water out;
        out.state = run.waters.at(0);
        out.database = run.database.name;
        out.json = report(run, "json");
        return out;
    } catch (const InputError& e) {
        rethrow_for_arguments(e, water_name, origin);
    }
}

// The JSON of `deltag run --format json` for a case file or a case's text; with
// write_files, the files the case asks for are written as the command writes them.
std::string run_case_json(const std::string& path_or_text, bool is_text, const std::string& database, bool write_files) {
    RunOptions options;
    options.database = database;
    const CaseRun run = is_text ? run_case_text(path_or_text, "deltag.run_case", std::filesystem::current_path().string(), options)
                                : run_case(path_or_text, options);
    std::string json = report(run, "json");
    if (write_files) io::write_files_atomically(run.files);
    return json;
}

electro::CellResult run_cell(const std::string& cathode, const std::string& anode, const electro::Activities& activities,
                             double temperature_c, std::optional<double> ph, std::optional<double> metal_ion_activity,
                             const std::string& database) {
    const SourceLocation at{"deltag.cell", 0, 0};
    check_temperature(temperature_c, at);
    const DatabaseChoice l = choose_database(database, at);
    electro::ElectrodeActivities acts;
    acts.metal_ion_activity = metal_ion_activity;
    if (ph) {
        if (!(*ph >= 0.0 && *ph <= 14.0)) throw InputError(at, "pH", "expected a pH within 0-14");
        acts.set("H+", std::pow(10.0, -*ph), electro::ActivityOrigin::given);
    }
    for (const auto& [name, v] : activities) {
        if (!(v > 0) || !std::isfinite(v))
            throw InputError(at, "activities", "the activity of '" + name + "' must be a positive number, found " + message_number(v));
        acts.set(name, v, electro::ActivityOrigin::given);
    }
    if (metal_ion_activity && !(*metal_ion_activity > 0.0 && *metal_ion_activity <= 1.0))
        throw InputError(at, "metal_ion_activity", "expected an activity above 0 and at most 1 (1e-6 is the customary value)");
    auto side = [&](const std::string& text, const char* key) {
        try {
            return electro::parse_half_reaction(*l.db, text, at);
        } catch (const InputError& e) {
            throw InputError(at, key, e.message(), e.suggestion());
        }
    };
    const electro::HalfCell hc = side(cathode, "cathode"), ha = side(anode, "anode");
    electro::CellResult r;
    try {
        r = electro::cell(electro::CellSide{hc, acts, temperature_c}, electro::CellSide{ha, acts, temperature_c});
    } catch (const InputError& e) {
        // A missing activity: point at the function, as the command line points at the cell.
        throw InputError(at, e.key(), e.message(), e.suggestion());
    }
    r.label = "cell";
    return r;
}

// Raises the Python exception of deltag.errors named `cls` for a library error.
void raise_input(const char* cls, const InputError& e) {
    py::object type = py::module_::import("deltag.errors").attr(cls);
    py::object err = type(e.what(), py::arg("message") = e.message(), py::arg("file") = e.where().file,
                          py::arg("line") = e.where().line, py::arg("column") = e.where().column, py::arg("key") = e.key(),
                          py::arg("suggestion") = e.suggestion());
    PyErr_SetObject(type.ptr(), err.ptr());
}

}  // namespace

PYBIND11_MODULE(_core, m) {
    m.doc() = "The compiled part of deltag; use the package deltag, which documents every function.";
    m.attr("__version__") = std::string(deltag::version());
    m.attr("caution") = std::string(io::caution_text());
    m.attr("electro_caution") = std::string(io::electro_caution_text());

    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const NoSolutionError& e) {
            raise_input("NoSolutionError", e);
        } catch (const InputError& e) {
            raise_input("InputError", e);
        } catch (const ConvergenceError& e) {
            py::object type = py::module_::import("deltag.errors").attr("ConvergenceError");
            py::object err = type(e.what(), py::arg("subject") = e.subject(), py::arg("residual_norm") = e.residual_norm(),
                                  py::arg("reason") = e.reason(), py::arg("hint") = e.hint());
            PyErr_SetObject(type.ptr(), err.ptr());
        }
    });

    py::class_<Water>(m, "Water")
        .def_property_readonly("label", [](const Water& w) { return w.state.result.label; })
        .def_property_readonly("database", [](const Water& w) { return w.database; })
        .def_property_readonly("temperature_c", [](const Water& w) { return w.state.result.temperature_c; })
        .def_property_readonly("pH", [](const Water& w) { return w.state.result.ph; })
        .def_property_readonly("pe", [](const Water& w) { return w.state.result.pe; })
        .def_property_readonly("ionic_strength", [](const Water& w) { return w.state.result.ionic_strength; })
        .def_property_readonly("species",
                               [](const Water& w) {
                                   py::dict d;
                                   for (const auto& s : w.state.result.species)
                                       d[py::str(s.name)] = py::make_tuple(s.molality, s.activity);
                                   return d;
                               })
        .def_property_readonly("saturation",
                               [](const Water& w) {
                                   py::dict d;
                                   for (const auto& s : w.state.result.saturation)
                                       if (!s.is_gas) d[py::str(s.phase)] = py::make_tuple(s.si, s.delta_g_kj_per_mol);
                                   return d;
                               })
        .def_property_readonly("gases",
                               [](const Water& w) {
                                   py::dict d;
                                   for (const auto& s : w.state.result.saturation)
                                       if (s.is_gas) d[py::str(s.phase)] = s.si;
                                   return d;
                               })
        .def_property_readonly("warnings", [](const Water& w) { return w.state.result.warnings; })
        .def_property_readonly("json", [](const Water& w) { return w.json; });

    m.def(
        "run_case_json",
        [](const std::string& path_or_text, bool is_text, const std::string& database, bool write_files) {
            py::gil_scoped_release unlocked;
            return run_case_json(path_or_text, is_text, database, write_files);
        },
        py::arg("path_or_text"), py::arg("is_text"), py::arg("database"), py::arg("write_files"));

    m.def(
        "speciate_text",
        [](const std::string& text, const std::string& origin, const std::string& water_name) {
            py::gil_scoped_release unlocked;
            return speciate_text(text, origin, water_name);
        },
        py::arg("toml_text"), py::arg("origin"), py::arg("water_name"));

    py::class_<electro::CellResult>(m, "CellResult")
        .def_readonly("cathode", &electro::CellResult::cathode)
        .def_readonly("anode", &electro::CellResult::anode)
        .def_readonly("temperature_c", &electro::CellResult::temperature_c)
        .def_readonly("n", &electro::CellResult::n)
        .def_readonly("e0_v", &electro::CellResult::e0_v)
        .def_readonly("e_v", &electro::CellResult::e_v)
        .def_readonly("delta_g0_kj_per_mol", &electro::CellResult::delta_g0_kj_per_mol)
        .def_readonly("delta_g_kj_per_mol", &electro::CellResult::delta_g_kj_per_mol)
        .def_readonly("log_k", &electro::CellResult::log_k)
        .def_readonly("spontaneous", &electro::CellResult::spontaneous)
        .def_readonly("cathode_origin", &electro::CellResult::cathode_origin)
        .def_readonly("anode_origin", &electro::CellResult::anode_origin)
        .def_readonly("warnings", &electro::CellResult::warnings)
        .def_property_readonly("json", [](const electro::CellResult& c) { return io::cells_json({c}); });

    m.def(
        "cell",
        [](const std::string& cathode, const std::string& anode, const std::map<std::string, double>& activities,
           double temperature_c, std::optional<double> ph, std::optional<double> metal_ion_activity,
           const std::string& database) {
            const electro::Activities acts(activities.begin(), activities.end());
            py::gil_scoped_release unlocked;
            return run_cell(cathode, anode, acts, temperature_c, ph, metal_ion_activity, database);
        },
        py::arg("cathode"), py::arg("anode"), py::arg("activities"), py::arg("temperature_c"), py::arg("pH"),
        py::arg("metal_ion_activity"), py::arg("database"));

    m.def(
        "convert_potential",
        [](double value_v, const std::string& from, const std::string& to, double temperature_c) {
            py::gil_scoped_release unlocked;
            const SourceLocation at{"deltag.convert_potential", 0, 0};
            check_temperature(temperature_c, at);
            if (!std::isfinite(value_v)) throw InputError(at, "value_v", "expected a finite potential in V");
            return electro::convert_v(value_v, from, to, temperature_c, at);
        },
        py::arg("value_v"), py::arg("from_electrode"), py::arg("to_electrode"), py::arg("temperature_c"));

    m.def(
        "run_samples_json",
        [](const std::string& case_path, const std::string& csv_text, const std::string& water,
           const std::string& database, unsigned threads) {
            py::gil_scoped_release unlocked;
            BatchOptions options;
            options.water = water;
            options.database = database;
            options.threads = std::max(1u, threads);
            std::istringstream samples(csv_text);
            std::vector<BatchRow> rows;
            const BatchSummary summary = run_batch(case_path, samples, "deltag.run_samples", options,
                                                   [&](const std::vector<BatchRow>& r) { rows.insert(rows.end(), r.begin(), r.end()); });
            std::vector<std::string> phases;
            collect_phases(rows, phases);
            std::string json = batch_json_open();
            for (std::size_t i = 0; i < rows.size(); ++i) json += batch_json_row(rows[i], phases, i == 0);
            json += batch_json_close();
            return std::make_pair(json, summary_line(summary));
        },
        py::arg("case_path"), py::arg("csv_text"), py::arg("water"), py::arg("database"), py::arg("threads"));

    m.def("reference_electrodes", [] { return electro::reference_names(); });

    // For the tests of the exception translator: throws the library error named by `kind`,
    // as the library would (a ConvergenceError cannot be provoked from valid input on demand).
    m.def("_throw_library_error", [](const std::string& kind) {
        const SourceLocation where{"case.toml", 12, 3};
        if (kind == "input") throw InputError(where, "water.tap.analytes.Ca", "expected a number", "Cl");
        if (kind == "no_solution") throw NoSolutionError(where, "charge_balance", "would need a negative amount");
        if (kind == "convergence") throw ConvergenceError("water 'tap'", 0.25, "line search failed", "give a pH");
        throw std::logic_error("unknown kind '" + kind + "'");
    });
}
