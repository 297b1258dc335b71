// Running a whole case (include/deltag/run.hpp).
#include "deltag/run.hpp"

#include <cmath>
#include <filesystem>

#include "deltag/diagram_io.hpp"
#include "deltag/outlook.hpp"
#include "deltag/water.hpp"
#include "chem/names.hpp"

namespace fs = std::filesystem;

namespace deltag {

std::string_view version() { return DELTAG_VERSION; }

DatabaseChoice choose_database(const std::string& path_or_core, const SourceLocation& where) {
    DatabaseChoice l;
    if (path_or_core.empty() || path_or_core == "core") {
        l.db = &thermo::Database::embedded();
        l.name = "core (embedded)";
    } else {
        // With an error code: a path the system refuses (too long, a file where a directory
        // should be) is bad input like a missing file, not an exception from the library.
        std::error_code ec;
        if (!fs::exists(path_or_core, ec))
            throw InputError(where, "database",
                             "no database file at '" + path_or_core + "'" + (ec ? " (" + ec.message() + ")" : std::string()) +
                                 "; expected \"core\" or a path");
        l.owned = std::make_shared<const thermo::Database>(thermo::Database::load_file(path_or_core));
        l.db = l.owned.get();
        l.name = path_or_core;
    }
    // The embedded database never changes: its lint runs once per process (it costs about as
    // much as a solve, which matters to a program calling this per sample), a file's at every load.
    static const std::vector<thermo::LintFinding> embedded_findings = thermo::Database::embedded().lint();
    std::vector<thermo::LintFinding> file_findings;
    if (l.owned) file_findings = l.db->lint();
    for (const auto& f : l.owned ? file_findings : embedded_findings)
        if (f.level == thermo::LintFinding::Level::error)
            throw InputError(f.where, f.key, f.message + " (run 'deltag database check' for the full list)");
    return l;
}

DatabaseChoice case_database(const io::Case& c, const std::string& base_dir, const std::string& replacement) {
    std::string db_choice = c.database;
    SourceLocation db_where = c.database_where;
    if (!replacement.empty()) {
        db_choice = replacement;
        db_where = SourceLocation{"command line", 0, 0};
    } else if (db_choice != "core" && fs::path(db_choice).is_relative()) {
        db_choice = (fs::path(base_dir) / db_choice).string();
    }
    return choose_database(db_choice, db_where);
}

const process::WaterState* CaseRun::find(const std::string& label) const {
    for (const auto& s : steps)
        if (s.label == label) return &s.state;
    for (const auto& w : waters)
        if (w.label == label) return &w;
    return nullptr;
}

std::vector<std::string> CaseRun::labels() const {
    std::vector<std::string> v;
    for (const auto& w : waters) v.push_back(w.label);
    for (const auto& s : steps) v.push_back(s.label);
    return v;
}

io::ReportContext CaseRun::context(bool verbose) const {
    return io::ReportContext{case_file.title, case_path, database.name, std::string(version()), verbose};
}

namespace {

const process::WaterState& find_or_throw(const CaseRun& k, const std::string& label, const SourceLocation& at,
                                         const std::string& key) {
    const process::WaterState* w = k.find(label);
    if (!w) throw InputError(at, key, "no water or step is called '" + label + "'", nearest_name(label, k.labels()));
    return *w;
}

electro::CellResult run_cell(const CaseRun& k, const io::CellSpec& spec) {
    struct Side {
        electro::HalfCell h;
        electro::ElectrodeActivities a;
        double t = 25.0;
    };
    auto side = [&](const io::CellElectrode& e) {
        Side s;
        s.h = electro::parse_half_reaction(*k.database.db, e.half_reaction, e.half_reaction_where);
        if (!e.water.empty()) {
            const process::WaterState& w = find_or_throw(k, e.water, e.water_where, "water");
            s.a = electro::electrode_activities_of(*k.database.db, w.result);
            s.a.water = e.water;
            s.t = w.result.temperature_c;
        }
        for (const auto& [name, value] : e.activities) s.a.set(name, value, electro::ActivityOrigin::given);
        s.a.metal_ion_activity = e.metal_ion_activity;
        if (e.temperature_c) s.t = *e.temperature_c;
        return s;
    };
    const Side c = side(spec.cathode), a = side(spec.anode);
    electro::CellResult r;
    try {
        r = electro::cell(electro::CellSide{c.h, c.a, c.t}, electro::CellSide{a.h, a.a, a.t});
    } catch (const InputError& e) {
        // A missing activity: point at the cell in the case file.
        throw InputError(spec.where, e.key(), e.message(), e.suggestion());
    }
    r.label = spec.label;
    return r;
}

// The diagram the case describes, with its water and points taken from the run.
electro::DiagramResult run_diagram(const CaseRun& k, const io::DiagramCase& d) {
    electro::DiagramSpec spec = d.spec;
    if (!d.water.empty()) {
        const process::WaterState& w = find_or_throw(k, d.water, d.water_where, "water");
        spec.water = &w.result;
        // The diagram is at the water's temperature; a different one given is refused by the module.
        if (spec.temperature_c && std::abs(*spec.temperature_c - w.result.temperature_c) <= 1e-9)
            spec.temperature_c.reset();
    }
    for (std::size_t i = 0; i < d.points.size(); ++i) {
        const SourceLocation at = i < d.point_where.size() ? d.point_where[i] : spec.where;
        const process::WaterState& w = find_or_throw(k, d.points[i], at, "points");
        if (!w.result.pe)
            throw InputError(at, "points",
                             "'" + d.points[i] + "' has no redox level (pe, eh_mv or dissolved oxygen) to place it on the diagram");
        spec.points.push_back({d.points[i], w.result.ph, electro::eh_from_pe(*w.result.pe, w.result.temperature_c)});
    }
    return electro::eh_ph_diagram(*k.database.db, spec);
}

CaseRun run(io::Case c, const std::string& case_path, const std::string& base_dir, const RunOptions& options) {
    CaseRun k;
    k.case_path = case_path;
    k.case_file = std::move(c);
    const io::Case& cf = k.case_file;
    k.database = case_database(cf, base_dir, options.database);
    const thermo::Database& db = *k.database.db;
    for (const auto& w : cf.waters) {
        const equilibrium::SpeciationInput in = to_speciation_input(w, db, cf.activity_model);
        equilibrium::SpeciationResult r = equilibrium::speciate(db, in);
        describe_lab_input(in, r, db);
        k.waters.push_back(process::state_from_result(r, in, db));
    }
    k.steps = process::run_steps(db, k.waters, cf.steps);
    if (options.waters_and_steps_only) return k;

    auto outlook = [&](const process::WaterState& w) -> std::optional<process::Outlook> {
        if (!options.outlook) return std::nullopt;
        return process::mineral_outlook(db, w);
    };
    // The lab's measured values go with the waters as analysed (k.waters follows the case).
    for (std::size_t i = 0; i < k.waters.size(); ++i)
        k.items.push_back(io::ReportItem{"water", k.waters[i].result, k.waters[i].indices, std::nullopt,
                                         outlook(k.waters[i]), cf.waters[i].measured});
    for (const auto& o : k.steps)
        k.items.push_back(io::ReportItem{o.kind, o.state.result, o.state.indices, o.dose, outlook(o.state), {}});

    const fs::path case_dir(base_dir);
    const std::string stem = fs::path(case_path).stem().string();
    auto place = [&](const std::string& given, const std::string& label, const char* ext) {
        if (given.empty()) return stem + "." + label + ext;
        const fs::path p(given);
        return (p.is_relative() ? case_dir / p : p).string();
    };
    for (std::size_t i = 0; i < cf.sweeps.size(); ++i) {
        const process::Sweep& sw = cf.sweeps[i];
        io::SweepReport rep{process::run_sweep(db, k.waters, cf.steps, sw), "", ""};
        rep.csv_path = place(sw.csv_path, sw.label, ".csv");
        rep.svg_path = place(sw.svg_path, sw.label, ".svg");
        const std::string key = "sweep[" + std::to_string(i + 1) + "].";
        k.files.push_back({rep.csv_path, io::sweep_csv(rep.sweep), key + "csv"});
        k.files.push_back(
            {rep.svg_path, io::sweep_svg(rep.sweep, (cf.title.empty() ? stem : cf.title) + ": " + sw.label), key + "svg"});
        k.sweeps.push_back(std::move(rep));
    }
    for (const auto& spec : cf.cells) k.cells.push_back(run_cell(k, spec));
    for (std::size_t di = 0; di < cf.diagrams.size(); ++di) {
        const io::DiagramCase& d = cf.diagrams[di];
        electro::DiagramResult result = run_diagram(k, d);
        io::DiagramReport rep{d.spec.label, place(d.svg_path, d.spec.label, ".svg"), place(d.csv_path, d.spec.label, ".csv"),
                              result.warnings};
        const std::string key = "diagram[" + std::to_string(di + 1) + "].";
        k.files.push_back({rep.svg_path, io::diagram_svg(result), key + "svg"});
        k.files.push_back({rep.csv_path, io::diagram_csv(result), key + "csv"});
        k.diagrams.push_back(std::move(rep));
        k.diagram_results.push_back(std::move(result));
    }
    return k;
}

}  // namespace

CaseRun run_case(const std::string& case_path, const RunOptions& options) {
    return run(io::read_case(case_path), case_path, fs::path(case_path).parent_path().string(), options);
}

CaseRun run_case_text(std::string_view toml_text, const std::string& origin, const std::string& base_dir,
                      const RunOptions& options) {
    return run(io::parse_case(toml_text, origin), origin, base_dir, options);
}

std::string report(const CaseRun& k, std::string_view format, bool verbose) {
    const io::ReportContext ctx = k.context(verbose);
    const thermo::Database& db = *k.database.db;
    if (format == "text") return io::text_report(db, ctx, k.items, k.sweeps, k.cells, k.diagrams);
    if (format == "json") return io::json_report(db, ctx, k.items, k.sweeps, k.cells, k.diagrams);
    if (format == "csv") return io::csv_report(db, ctx, k.items);
    throw InputError(SourceLocation{"command line", 0, 0}, "--format",
                     "unknown report format '" + std::string(format) + "'; expected text, json or csv",
                     nearest_name(std::string(format), {"text", "json", "csv"}));
}

}  // namespace deltag
