// The deltag command: argument parsing, file output and exit codes over the library.
// Exit codes: 0 done, 2 bad input, 3 no convergence, 1 anything else.
#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <iterator>
#include <memory>

#include "deltag/batch.hpp"
#include "deltag/case.hpp"
#include "deltag/constants.hpp"
#include "deltag/database.hpp"
#include "deltag/diagram.hpp"
#include "deltag/diagram_io.hpp"
#include "deltag/electro.hpp"
#include "deltag/output_files.hpp"
#include "deltag/process.hpp"
#include "deltag/report.hpp"
#include "deltag/run.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"
#include "deltag/water_properties.hpp"
#include "chem/names.hpp"

namespace fs = std::filesystem;
using namespace deltag;

namespace {

constexpr int exit_ok = 0, exit_bug = 1, exit_input = 2, exit_convergence = 3;

int cmd_run(const std::string& case_path, const std::string& format, const std::string& output,
            const std::string& db_override, bool verbose) {
    RunOptions options;
    options.database = db_override;
    const CaseRun k = run_case(case_path, options);
    std::vector<io::OutputFile> files = k.files;
    std::string text = report(k, format, verbose);
    // Every file, the report's included, goes to a temporary name first and replaces its
    // target only when all were written: a failure leaves the existing files as they were.
    if (!output.empty()) files.push_back({output, std::move(text), "--output"});
    io::write_files_atomically(files);
    if (output.empty()) {
        std::cout << text;
        std::cout.flush();
    }
    return exit_ok;
}

// A sample set through a case. The rows are solved in a bounded window and come back in
// input order into a scratch file; the table is written when the last row is in, since its
// columns (the minerals of any row) are known only then, atomically (or to standard output).
int cmd_batch(const std::string& case_path, const std::string& samples_path, const std::string& water,
              const std::string& output, unsigned threads, bool strict, const std::string& db_override) {
    const SourceLocation cmd{"command line", 0, 0};
    const std::string ext = fs::path(output).extension().string();
    if (!output.empty() && ext != ".csv" && ext != ".json")
        throw InputError(cmd, "--output",
                         "expected a file ending in .csv or .json, found '" + output + "' (.xlsx is not written yet)",
                         nearest_name(ext, {".csv", ".json"}));
    if (threads < 1 || threads > 256) throw InputError(cmd, "--threads", "expected 1 to 256 threads, found " + std::to_string(threads));
    std::ifstream in(samples_path, std::ios::binary);
    if (!in) throw InputError(SourceLocation{samples_path, 0, 0}, "--samples", "cannot read the samples file");
    BatchOptions options;
    options.water = water;
    options.database = db_override;
    options.threads = threads;
    BatchTable table;
    // A progress line only on a terminal: samples done of about how many (the lines of the
    // file, counted first; a quoted line break would count one too many), rate, time left.
    const bool progress = ::isatty(2) != 0;
    std::size_t total = 0;
    if (progress) {
        std::ifstream count(samples_path, std::ios::binary);
        total = static_cast<std::size_t>(
            std::count(std::istreambuf_iterator<char>(count), std::istreambuf_iterator<char>(), '\n'));
        total = total > 0 ? total - 1 : 0;  // the header
    }
    const auto start = std::chrono::steady_clock::now();
    std::size_t done = 0;
    auto last = start;
    const BatchSummary summary = run_batch(case_path, in, samples_path, options, [&](const std::vector<BatchRow>& sample_rows) {
        table.add(sample_rows);
        ++done;
        if (progress) {
            const auto now = std::chrono::steady_clock::now();
            if (now - last > std::chrono::milliseconds(200)) {
                last = now;
                const double s = std::chrono::duration<double>(now - start).count();
                const double rate = s > 0 ? static_cast<double>(done) / s : 0.0;
                const double left = rate > 0 && total > done ? static_cast<double>(total - done) / rate : 0.0;
                std::cerr << fmt::format("\r\033[K{} of about {} samples, {:.0f} per s, {:.0f} s left", done, total, rate, left)
                          << std::flush;
            }
        }
    });
    if (progress) std::cerr << "\r\033[K";
    const bool json = ext == ".json";
    if (output.empty()) {
        table.write(json, [](std::string_view piece) { std::cout << piece; });
        std::cout.flush();
    } else {
        io::write_file_atomically(output, "--output", [&](const std::function<void(std::string_view)>& put) { table.write(json, put); });
    }
    std::cerr << summary_line(summary) << "\n";
    if (strict && summary.bad_input > 0) return exit_input;
    if (strict && summary.no_convergence > 0) return exit_convergence;
    return exit_ok;
}

// KEY=VALUE pairs of --activity.
std::vector<std::pair<std::string, double>> parse_activities(const std::vector<std::string>& items) {
    std::vector<std::pair<std::string, double>> out;
    for (const auto& item : items) {
        const auto eq = item.rfind('=');
        const SourceLocation cmd{"command line", 0, 0};
        if (eq == std::string::npos || eq == 0 || eq + 1 == item.size())
            throw InputError(cmd, "--activity", "expected SPECIES=VALUE, found '" + item + "'");
        const std::string name = item.substr(0, eq), value = item.substr(eq + 1);
        char* end = nullptr;
        const double v = std::strtod(value.c_str(), &end);
        if (end != value.c_str() + value.size() || !(v > 0) || !std::isfinite(v))
            throw InputError(cmd, "--activity", "the activity of '" + name + "' must be a positive number, found '" + value + "'");
        out.emplace_back(name, v);
    }
    return out;
}

int cmd_cell(const std::string& cathode, const std::string& anode, const std::vector<std::string>& activity_args,
             std::optional<double> ph, std::optional<double> temperature_c, const std::string& water_ref,
             std::optional<double> metal_ion_activity, const std::string& format, const std::string& db_path) {
    const SourceLocation cmd{"command line", 0, 0};
    std::optional<CaseRun> k;
    const thermo::Database* db = nullptr;
    DatabaseChoice l;
    electro::ElectrodeActivities acts;
    acts.metal_ion_activity = metal_ion_activity;
    double t = temperature_c.value_or(25.0);
    if (!water_ref.empty()) {
        const auto colon = water_ref.rfind(':');
        if (colon == std::string::npos || colon == 0 || colon + 1 == water_ref.size())
            throw InputError(cmd, "--water", "expected CASE.toml:WATER, found '" + water_ref + "'");
        RunOptions options;
        options.database = db_path;
        options.waters_and_steps_only = true;
        k = run_case(water_ref.substr(0, colon), options);
        const std::string name = water_ref.substr(colon + 1);
        const process::WaterState* w = k->find(name);
        if (!w) throw InputError(cmd, "--water", "the case has no water or step called '" + name + "'", nearest_name(name, k->labels()));
        if (temperature_c)
            throw InputError(cmd, "--temperature-c", "the water sets the temperature; leave out --temperature-c with --water");
        if (ph) throw InputError(cmd, "--ph", "the water sets the pH; leave out --ph with --water (or give --activity H+=...)");
        acts = electro::electrode_activities_of(*k->database.db, w->result);
        acts.metal_ion_activity = metal_ion_activity;
        acts.water = name;
        t = w->result.temperature_c;
        db = k->database.db;
    } else {
        l = choose_database(db_path, cmd);
        db = l.db;
    }
    if (const std::string p = thermo::temperature_problem(t); !p.empty()) throw InputError(cmd, "--temperature-c", p);
    if (ph) {
        if (!(*ph >= 0.0 && *ph <= 14.0)) throw InputError(cmd, "--ph", "expected a pH within 0-14");
        acts.set("H+", std::pow(10.0, -*ph), electro::ActivityOrigin::given);
    }
    for (const auto& [name, v] : parse_activities(activity_args)) acts.set(name, v, electro::ActivityOrigin::given);
    if (metal_ion_activity && !(*metal_ion_activity > 0.0 && *metal_ion_activity <= 1.0))
        throw InputError(cmd, "--metal-ion-activity", "expected an activity above 0 and at most 1 (1e-6 is the customary value)");
    SourceLocation c_at{"--cathode", 0, 0}, a_at{"--anode", 0, 0};
    const electro::HalfCell hc = electro::parse_half_reaction(*db, cathode, c_at);
    const electro::HalfCell ha = electro::parse_half_reaction(*db, anode, a_at);
    electro::CellResult r = electro::cell(electro::CellSide{hc, acts, t}, electro::CellSide{ha, acts, t});
    r.label = "cell";
    if (format == "json") std::cout << io::cells_json({r});
    else std::cout << io::cell_text(r) << "\n" << io::electro_caution_text() << "\n";
    return exit_ok;
}

int cmd_potential(std::optional<double> value_v, const std::string& from, const std::string& to, double temperature_c,
                  std::optional<double> delta_g_kj, std::optional<double> electrons, const std::string& format) {
    const SourceLocation cmd{"command line", 0, 0};
    if (const std::string p = thermo::temperature_problem(temperature_c); !p.empty())
        throw InputError(cmd, "--temperature-c", p);
    if (delta_g_kj) {
        // The other way: a Gibbs energy to the potential that drives it, E = -dG/(nF).
        if (!electrons || !(*electrons > 0))
            throw InputError(cmd, "--electrons", "with --delta-g-kj, give the electrons of the reaction (--electrons N, N > 0)");
        if (value_v) throw InputError(cmd, "VALUE_V", "give either a potential or --delta-g-kj, not both");
        const double e = electro::potential_v(*electrons, *delta_g_kj);
        if (format == "json")
            std::cout << fmt::format("{{\"delta_g_kj_per_mol\": {}, \"n_electrons\": {}, \"e_v\": {}}}\n", *delta_g_kj, *electrons, e);
        else
            std::cout << fmt::format("ΔG = {:+.3f} kJ/mol with n = {:g} corresponds to E = -ΔG/(nF) = {:+.5f} V\n", *delta_g_kj,
                                     *electrons, e);
        return exit_ok;
    }
    if (!value_v) throw InputError(cmd, "VALUE_V", "give the potential to convert (in V), or --delta-g-kj with --electrons");
    if (from.empty() || to.empty()) throw InputError(cmd, from.empty() ? "--from" : "--to", "give both --from and --to electrodes");
    const double v = electro::convert_v(*value_v, from, to, temperature_c, cmd);
    if (format == "json") {
        std::cout << fmt::format("{{\"value_v\": {}, \"from\": \"{}\", \"to\": \"{}\", \"temperature_c\": {}}}\n", v, from, to,
                                 temperature_c);
    } else {
        const double she = electro::convert_v(*value_v, from, "SHE", temperature_c, cmd);
        std::cout << fmt::format("{:+.4f} V vs {} = {:+.4f} V vs {} at {:g} °C (Eh {:+.4f} V vs SHE, pe {:.2f})\n", *value_v, from, v,
                                 to, temperature_c, she, electro::pe_from_eh(she, temperature_c));
        std::cout << "Reference electrode potentials are common-practice values; they vary by a few mV between makers.\n";
    }
    return exit_ok;
}

int cmd_database_check(const std::string& path) {
    std::unique_ptr<thermo::Database> owned;
    const thermo::Database* db = nullptr;
    if (path.empty()) {
        db = &thermo::Database::embedded();
    } else {
        std::error_code ec;
        if (!fs::exists(path, ec))
            throw InputError(SourceLocation{path, 0, 0}, "", "no database file here" + (ec ? " (" + ec.message() + ")" : std::string()));
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
    DatabaseChoice l = choose_database(db_path, SourceLocation{"command line", 0, 0});
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
    } else if (auto el = std::find_if(db.electrodes().begin(), db.electrodes().end(),
                                      [&](const thermo::Electrode& x) { return x.name == name; });
               el != db.electrodes().end()) {
        std::string out = fmt::format("{} (electrode), {}\n", el->name, el->where.to_string());
        out += fmt::format("  reaction         {}\n", el->reaction_text);
        out += fmt::format("  E°               {:+.4f} V vs SHE at 25 °C, dE°/dT {:+.3f} mV/K\n", el->e0_v, el->de0_dt_v_per_k * 1000);
        out += "  E°(T)            ";
        for (double t : {0.0, 25.0, 50.0, 100.0}) out += fmt::format("  {:g} °C: {:+.4f} V", t, el->e0_at(t));
        out += "\n";
        if (el->range) out += fmt::format("  valid            {:g} to {:g} °C\n", el->range->min_c, el->range->max_c);
        const thermo::Source* src = db.find_source(el->source);
        out += fmt::format("  source           {}{}\n", src ? src->citation : el->source,
                           el->from_memory ? " (value written from memory of the source)" : "");
        if (!el->note.empty()) out += fmt::format("  note             {}\n", el->note);
        std::cout << out;
        return exit_ok;
    } else {
        std::vector<std::string> all = db.species_names();
        for (auto& n : db.mineral_names()) all.push_back(n);
        for (auto& n : db.gas_names()) all.push_back(n);
        for (const auto& x : db.electrodes()) all.push_back(x.name);
        throw InputError(SourceLocation{"command line", 0, 0}, name, "no species, mineral, gas or electrode of this name in " + l.name,
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
        case thermo::LogKModel::Form::gas_solubility:
            out += fmt::format("  log K(T)         Henry's constant of the IAPWS (2004) guideline, A = {}, B = {}, C = {}\n",
                               m.henry[0], m.henry[1], m.henry[2]);
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
    app.set_version_flag("--version", std::string("deltag ") + std::string(version()));
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

    std::string cathode, anode, water_ref, cell_format = "text", cell_db;
    std::vector<std::string> activity_args;
    std::optional<double> cell_ph, cell_t, cell_metal_ions;
    CLI::App* cellc = app.add_subcommand("cell", "Cell potential, n, ΔG = -nFE and K of two half-reactions at real activities");
    cellc->add_option("--cathode", cathode, "half-reaction of the cathode, e.g. \"Cu^2+ + 2 e- = Cu(s)\"")->required();
    cellc->add_option("--anode", anode, "half-reaction of the anode, e.g. \"Zn^2+ + 2 e- = Zn(s)\"")->required();
    cellc->add_option("--activity", activity_args, "SPECIES=VALUE (gases: fugacity in atm); repeat as needed");
    cellc->add_option("--ph", cell_ph, "sets a(H+) = 10^-pH");
    cellc->add_option("--temperature-c", cell_t, "temperature (default 25)");
    cellc->add_option("--water", water_ref, "CASE.toml:WATER: take the activities and temperature from that water");
    cellc->add_option("--metal-ion-activity", cell_metal_ions,
                      "dissolved species of each electrode's metal at this activity (1e-6: the customary corrosion convention)");
    cellc->add_option("--format", cell_format, "text | json")->check(CLI::IsMember({"text", "json"}));
    cellc->add_option("--database", cell_db, "database file (default: the embedded core)");

    std::optional<double> pot_value, pot_dg, pot_n;
    std::string pot_from, pot_to, pot_format = "text";
    double pot_t = 25.0;
    CLI::App* pot = app.add_subcommand("potential", "Convert an electrode potential between reference scales (or a ΔG to E)");
    pot->add_option("VALUE_V", pot_value, "the potential, V");
    pot->add_option("--from", pot_from, "reference electrode of VALUE_V (SHE, SCE, Ag/AgCl(sat KCl), ...)");
    pot->add_option("--to", pot_to, "reference electrode wanted");
    pot->add_option("--temperature-c", pot_t, "temperature (default 25)");
    pot->add_option("--delta-g-kj", pot_dg, "instead of a potential: a Gibbs energy (kJ/mol) to turn into E = -ΔG/(nF)");
    pot->add_option("--electrons", pot_n, "electrons n, with --delta-g-kj");
    pot->add_option("--format", pot_format, "text | json")->check(CLI::IsMember({"text", "json"}));

    std::string batch_case, batch_samples, batch_water, batch_output, batch_db;
    unsigned batch_threads = 1;
    bool batch_strict = false;
    CLI::App* batch = app.add_subcommand("batch", "Run every sample of a CSV file through a case (one row per sample and result)");
    batch->add_option("CASE", batch_case, "case file (TOML): the template water and its steps")->required();
    batch->add_option("--samples", batch_samples, "samples file (CSV): a sample column, then water settings and analytes")->required();
    batch->add_option("--water", batch_water, "the case's template water (default: its only water)");
    batch->add_option("--output", batch_output, "write the table to OUT.csv or OUT.json (default: CSV on standard output)");
    batch->add_option("--threads", batch_threads, "samples solved at once (default 1)");
    batch->add_flag("--strict", batch_strict, "exit 2 (bad input) or 3 (no convergence) when any sample failed");
    batch->add_option("--database", batch_db, "database file (default: the case's choice, else the embedded core)");

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
        if (*batch) return cmd_batch(batch_case, batch_samples, batch_water, batch_output, batch_threads, batch_strict, batch_db);
        if (*check) return cmd_database_check(check_path);
        if (*show) return cmd_database_show(show_name, show_db);
        if (*cellc) return cmd_cell(cathode, anode, activity_args, cell_ph, cell_t, water_ref, cell_metal_ions, cell_format, cell_db);
        if (*pot) return cmd_potential(pot_value, pot_from, pot_to, pot_t, pot_dg, pot_n, pot_format);
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
