// The deltag command: argument parsing, file output and exit codes over the library.
// Exit codes: 0 done, 2 bad input, 3 no convergence, 1 anything else.
#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <memory>

#include "deltag/case.hpp"
#include "deltag/constants.hpp"
#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/report.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"

namespace fs = std::filesystem;
using namespace deltag;

namespace {

constexpr int exit_ok = 0, exit_bug = 1, exit_input = 2, exit_convergence = 3;

struct Loaded {
    std::unique_ptr<thermo::Database> owned;
    const thermo::Database* db = nullptr;
    std::string name;
};

// Loads a database and refuses one that fails the lint.
Loaded load_database(const std::string& path_or_core, const SourceLocation& where) {
    Loaded l;
    if (path_or_core.empty() || path_or_core == "core") {
        l.db = &thermo::Database::embedded();
        l.name = "core (embedded)";
    } else {
        if (!fs::exists(path_or_core))
            throw InputError(where, "database", "no database file at '" + path_or_core + "'; expected \"core\" or a path");
        l.owned = std::make_unique<thermo::Database>(thermo::Database::load_file(path_or_core));
        l.db = l.owned.get();
        l.name = path_or_core;
    }
    for (const auto& f : l.db->lint())
        if (f.level == thermo::LintFinding::Level::error)
            throw InputError(f.where, f.key, f.message + " (run 'deltag database check' for the full list)");
    return l;
}

void write_output(const std::string& text, const std::string& path, const std::string& key = "--output") {
    if (path.empty()) {
        std::cout << text;
        std::cout.flush();
        return;
    }
    std::ofstream out(path, std::ios::binary);
    if (!out) throw InputError(SourceLocation{path, 0, 0}, key, "cannot write to this file");
    out << text;
    out.flush();
    if (!out) throw InputError(SourceLocation{path, 0, 0}, key, "writing failed");
}

int cmd_run(const std::string& case_path, const std::string& format, const std::string& output,
            const std::string& db_override, bool verbose) {
    io::Case c = io::read_case(case_path);
    std::string db_choice = c.database;
    SourceLocation db_where = c.database_where;
    if (!db_override.empty()) {
        db_choice = db_override;
        db_where = SourceLocation{"command line", 0, 0};
    } else if (db_choice != "core" && fs::path(db_choice).is_relative()) {
        db_choice = (fs::path(case_path).parent_path() / db_choice).string();
    }
    Loaded l = load_database(db_choice, db_where);
    // The waters, then the steps, then the sweeps; every file is written only after all of
    // them succeeded, so a failure leaves no partial output.
    std::vector<process::WaterState> waters;
    std::vector<io::ReportItem> items;
    for (const auto& w : c.waters) {
        const equilibrium::SpeciationInput in = to_speciation_input(w, *l.db, c.activity_model);
        const equilibrium::SpeciationResult r = equilibrium::speciate(*l.db, in);
        waters.push_back(process::state_from_result(r, in, *l.db));
        items.push_back(io::ReportItem{"water", waters.back().result, waters.back().indices, std::nullopt});
    }
    for (const auto& o : process::run_steps(*l.db, waters, c.steps))
        items.push_back(io::ReportItem{o.kind, o.state.result, o.state.indices, o.dose});
    std::vector<io::SweepReport> sweeps;
    std::vector<std::pair<std::string, std::string>> files;  // path, content
    const fs::path case_dir = fs::path(case_path).parent_path();
    const std::string stem = fs::path(case_path).stem().string();
    for (const auto& sw : c.sweeps) {
        io::SweepReport rep{process::run_sweep(*l.db, waters, c.steps, sw), "", ""};
        // A path given in the case is relative to the case file; without one, the files go
        // to the current directory as CASE.SWEEP.csv and .svg.
        auto place = [&](const std::string& given, const char* ext) {
            if (given.empty()) return stem + "." + sw.label + ext;
            const fs::path p(given);
            return (p.is_relative() ? case_dir / p : p).string();
        };
        rep.csv_path = place(sw.csv_path, ".csv");
        rep.svg_path = place(sw.svg_path, ".svg");
        files.emplace_back(rep.csv_path, io::sweep_csv(rep.sweep));
        files.emplace_back(rep.svg_path, io::sweep_svg(rep.sweep, (c.title.empty() ? stem : c.title) + ": " + sw.label));
        sweeps.push_back(std::move(rep));
    }
    io::ReportContext ctx{c.title, case_path, l.name, DELTAG_VERSION, verbose};
    std::string text;
    if (format == "text") text = io::text_report(*l.db, ctx, items, sweeps);
    else if (format == "json") text = io::json_report(*l.db, ctx, items, sweeps);
    else if (format == "csv") text = io::csv_report(*l.db, ctx, items);
    for (const auto& [path, content] : files) write_output(content, path, "sweep output");
    write_output(text, output);
    return exit_ok;
}

int cmd_database_check(const std::string& path) {
    std::unique_ptr<thermo::Database> owned;
    const thermo::Database* db = nullptr;
    if (path.empty()) {
        db = &thermo::Database::embedded();
    } else {
        if (!fs::exists(path)) throw InputError(SourceLocation{path, 0, 0}, "", "no database file here");
        owned = std::make_unique<thermo::Database>(thermo::Database::load_file(path));
        db = owned.get();
    }
    int errors = 0, warnings = 0;
    std::string report;
    for (const auto& f : db->lint()) {
        const bool err = f.level == thermo::LintFinding::Level::error;
        (err ? errors : warnings) += 1;
        report += fmt::format("{}: {}: '{}': {}\n", f.where.to_string(), err ? "error" : "warning", f.key, f.message);
    }
    report += fmt::format("{}: {} components, {} species, {} minerals, {} gases, {} sources; {} errors, {} warnings\n",
                          db->origin(), db->component_count(), db->species().size() - db->component_count(),
                          db->minerals().size(), db->gases().size(), db->sources().size(), errors, warnings);
    if (errors > 0) {
        std::cerr << report;
        return exit_input;
    }
    std::cout << report;
    return exit_ok;
}

std::string formation_text(const thermo::Database& db, const thermo::Stoichiometry& st, const std::string& self,
                           bool self_on_left) {
    std::string left, right;
    auto add = [](std::string& side, double c, const std::string& name) {
        if (!side.empty()) side += " + ";
        if (std::abs(c - 1.0) > 1e-12) side += fmt::format("{:g} ", c);
        side += name;
    };
    (self_on_left ? left : right) = self;
    for (const auto& [j, c] : st) {
        const std::string& n = db.species()[j].name;
        if ((c > 0) == self_on_left) add(right, std::abs(c), n);
        else add(left, std::abs(c), n);
    }
    return left + " = " + right;
}

int cmd_database_show(const std::string& name, const std::string& db_path) {
    Loaded l = load_database(db_path, SourceLocation{"command line", 0, 0});
    const thermo::Database& db = *l.db;
    const thermo::Entry* e = nullptr;
    const thermo::LogKFunction* fn = nullptr;
    std::string kind, resolved;
    if (auto i = db.find_species(name)) {
        const auto& s = db.species()[*i];
        e = &s;
        fn = &s.log_k;
        kind = s.is_component ? "component" : "aqueous species";
        if (!s.is_component) resolved = formation_text(db, s.formation, s.name, false);
    } else if (auto m = db.find_mineral(name)) {
        const auto& p = db.minerals()[*m];
        e = &p;
        fn = &p.log_k;
        kind = "mineral";
        resolved = formation_text(db, p.dissolution, p.formula.text + "(s)", true);
    } else if (auto g = db.find_gas(name)) {
        const auto& p = db.gases()[*g];
        e = &p;
        fn = &p.log_k;
        kind = "gas";
        resolved = formation_text(db, p.dissolution, p.name, true);
    } else {
        std::vector<std::string> all = db.species_names();
        for (auto& n : db.mineral_names()) all.push_back(n);
        for (auto& n : db.gas_names()) all.push_back(n);
        throw InputError(SourceLocation{"command line", 0, 0}, name, "no species, mineral or gas of this name in " + l.name,
                         nearest_name(name, all));
    }
    std::string out = fmt::format("{} ({}), {}\n", e->name, kind, e->where.to_string());
    out += fmt::format("  formula          {}  (molar mass {:.4f} g/mol, charge {:+d})\n", e->formula.text,
                       e->formula.molar_mass(), e->formula.charge);
    if (!e->reaction_text.empty()) {
        out += fmt::format("  reaction         {}\n", e->reaction_text);
        out += fmt::format("  in components    {}\n", resolved);
    }
    auto log_k_row = [&](std::string_view label, auto&& f) {
        out += fmt::format("  {:<17}", label);
        for (double t : {0.0, 25.0, 50.0, 100.0}) out += fmt::format("  {:g} °C: {:.3f}", t, f(t));
        out += "\n";
    };
    if (!e->reaction_text.empty()) {
        log_k_row("log K as written", [&](double t) { return e->own_log_k.log_k(t); });
        log_k_row("log K components", [&](double t) { return (*fn)(t); });
    }
    const auto range = fn->range();
    out += fmt::format("  valid            {:g} to {:g} °C{}\n", range.min_c, range.max_c,
                       fn->temperature_dependent() ? "" : " (log K constant: no temperature dependence given)");
    const auto& m = e->own_log_k;
    switch (m.form) {
        case thermo::LogKModel::Form::analytic:
            out += fmt::format("  log K(T)         {} + {}·T + {}/T + {}·log10 T + {}/T² (as written)\n", m.fit[0], m.fit[1],
                               m.fit[2], m.fit[3], m.fit[4]);
            break;
        case thermo::LogKModel::Form::van_t_hoff:
            out += fmt::format("  log K(T)         van 't Hoff, ΔH° = {} kJ/mol{}\n", m.delta_h_kj_per_mol,
                               m.delta_cp_j_per_mol_k != 0 ? fmt::format(", ΔCp° = {} J/(mol K)", m.delta_cp_j_per_mol_k) : "");
            break;
        case thermo::LogKModel::Form::water_ionization:
            out += "  log K(T)         Kw formulation of Bandura & Lvov (2006)\n";
            break;
        case thermo::LogKModel::Form::constant: break;
    }
    if (!e->source.empty()) {
        const thermo::Source* s = db.find_source(e->source);
        out += fmt::format("  source           {}{}\n", s ? s->citation : e->source, e->from_memory ? " (value written from memory of the source)" : "");
    }
    if (!e->note.empty()) out += fmt::format("  note             {}\n", e->note);
    if (auto i = db.find_species(name)) {
        const auto& s = db.species()[*i];
        if (!std::isnan(s.ion_size_angstrom)) out += fmt::format("  ion size         {} Å\n", s.ion_size_angstrom);
        if (!std::isnan(s.tj_b)) out += fmt::format("  Truesdell-Jones  a = {} Å, b = {} kg/mol\n", s.tj_a_angstrom, s.tj_b);
        if (!std::isnan(s.salting_out)) out += fmt::format("  salting out      {} kg/mol\n", s.salting_out);
        out += fmt::format("  alkalinity       {:g} eq/mol\n", s.alkalinity);
    }
    std::cout << out;
    return exit_ok;
}

}  // namespace

int main(int argc, char** argv) {
    CLI::App app{"deltag: water speciation, saturation and the Gibbs energy of reactions at real conditions"};
    app.set_version_flag("--version", std::string("deltag ") + DELTAG_VERSION);
    app.require_subcommand(1);

    std::string case_path, format = "text", output, db_path, show_name, check_path, show_db;
    bool verbose = false;
    CLI::App* run = app.add_subcommand("run", "Speciate the waters of a case file and report saturation");
    run->add_option("CASE", case_path, "case file (TOML)")->required();
    run->add_option("--format", format, "text | json | csv")->check(CLI::IsMember({"text", "json", "csv"}));
    run->add_option("--output", output, "write the report to this file instead of standard output");
    run->add_option("--database", db_path, "database file (default: the case's choice, else the embedded core)");
    run->add_flag("--verbose", verbose, "add the full solver summary to the text report");

    CLI::App* database = app.add_subcommand("database", "Lint or show the thermodynamic database");
    database->require_subcommand(1);
    CLI::App* check = database->add_subcommand("check", "Lint a database: balance, charge, sources, temperature ranges");
    check->add_option("PATH", check_path, "database file (default: the embedded core)");
    CLI::App* show = database->add_subcommand("show", "Print one species, mineral or gas with log K at 0, 25, 50, 100 °C");
    show->add_option("NAME", show_name, "name as in the database, e.g. Calcite, CaHCO3+, CO2(g)")->required();
    show->add_option("--database", show_db, "database file (default: the embedded core)");

    try {
        app.parse(argc, argv);
    } catch (const CLI::CallForHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForAllHelp& e) {
        return app.exit(e);
    } catch (const CLI::CallForVersion& e) {
        return app.exit(e);
    } catch (const CLI::ParseError& e) {
        std::cerr << "deltag: error: command line: " << e.what() << "\n";
        return exit_input;
    }

    try {
        if (*run) return cmd_run(case_path, format, output, db_path, verbose);
        if (*check) return cmd_database_check(check_path);
        if (*show) return cmd_database_show(show_name, show_db);
        return exit_bug;
    } catch (const InputError& e) {
        std::cerr << "deltag: error: " << e.what() << "\n";
        return exit_input;
    } catch (const ConvergenceError& e) {
        std::cerr << "deltag: error: " << e.what() << "\n";
        return exit_convergence;
    } catch (const std::exception& e) {
        std::cerr << "deltag: internal error (please report): " << e.what() << "\n";
        return exit_bug;
    }
}
