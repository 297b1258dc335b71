// Running a whole case: the database chosen and linted, the waters speciated, the steps, the
// sweeps, the cells and the diagrams, each result ready for the report writers, and the files
// the case asks for (sweep tables and plots, diagrams) with their contents. The command line
// is a thin shell over this; a C++ or Python user calls it the same way. Nothing here prints
// or writes a file.
#pragma once

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/case.hpp"
#include "deltag/database.hpp"
#include "deltag/diagram.hpp"
#include "deltag/electro.hpp"
#include "deltag/output_files.hpp"
#include "deltag/process.hpp"
#include "deltag/report.hpp"

namespace deltag {

// The version of the library ("0.1.0").
std::string_view version();

// A database by name or path: "core" (or "") is the embedded one; anything else a TOML file.
// A database whose lint finds an error is refused (InputError at the finding).
struct DatabaseChoice {
    std::shared_ptr<const thermo::Database> owned;  // a file's database; null for the embedded one
    const thermo::Database* db = nullptr;
    std::string name;                               // "core (embedded)" or the path
};
DatabaseChoice choose_database(const std::string& path_or_core, const SourceLocation& where);
// The database a case asks for: `replacement` if given (from the command line), else the
// case's choice, a relative path taken from `base_dir` (the case file's directory).
DatabaseChoice case_database(const io::Case& c, const std::string& base_dir, const std::string& replacement);

struct RunOptions {
    // Replaces the case's own database choice ("" keeps it). A relative path is taken as
    // given (from the current directory), as on the command line.
    std::string database;
    // Stop after the waters and the steps (no sweeps, cells or diagrams): enough to take a
    // water's activities into a cell.
    bool waters_and_steps_only = false;
    // Work out, for the report's first section, how much of each mineral would deposit or
    // dissolve to reach equilibrium (one closed-system solve per mineral near saturation).
    bool outlook = true;
};

struct CaseRun {
    io::Case case_file;
    DatabaseChoice database;
    std::vector<process::WaterState> waters;      // in case order
    std::vector<process::StepOutcome> steps;      // in case order
    std::vector<io::ReportItem> items;            // the waters, then the steps, for the writers
    std::vector<io::SweepReport> sweeps;
    std::vector<electro::CellResult> cells;
    std::vector<electro::DiagramResult> diagram_results;
    std::vector<io::DiagramReport> diagrams;
    // The files the case asks for (sweep CSV and SVG, diagram SVG and CSV), with contents,
    // for io::write_files_atomically. Paths given in the case are relative to the case file;
    // without one a file is named CASE.LABEL.csv / .svg in the current directory.
    std::vector<io::OutputFile> files;
    std::string case_path;                        // as given (or the origin of a text)

    // A water or a step's result by label; null if there is none.
    const process::WaterState* find(const std::string& label) const;
    std::vector<std::string> labels() const;
    io::ReportContext context(bool verbose = false) const;
};

// Runs a case file. Throws InputError (bad input, with file, line and key) or
// ConvergenceError (a water or step that did not converge).
CaseRun run_case(const std::string& case_path, const RunOptions& options = {});
// Runs a case given as TOML text; `origin` names it in messages and in the default file
// names, `base_dir` is where paths in the case are taken from.
CaseRun run_case_text(std::string_view toml_text, const std::string& origin, const std::string& base_dir,
                      const RunOptions& options = {});

// The report of a run: "text", "json" or "csv" (InputError at "--format" otherwise).
std::string report(const CaseRun& run, std::string_view format, bool verbose = false);

}  // namespace deltag
