// Report writers: text for a terminal, JSON per the interface contract, CSV (one row per
// result). Writers only format; they never solve.
#pragma once

#include <string>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/electro.hpp"
#include "deltag/outlook.hpp"
#include "deltag/process.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"

namespace deltag::io {

struct ReportContext {
    std::string title;
    std::string case_path;
    std::string database;      // name or path of the database used
    std::string version;
    bool verbose = false;      // text: add the full solver summary
};

// The caution every report carries, and the one for cells and diagrams.
std::string_view caution_text();
std::string_view electro_caution_text();

// One block of a report: a water as analysed or the result of a step.
struct ReportItem {
    std::string kind = "water";                  // "water" or the step's kind
    equilibrium::SpeciationResult result;
    std::optional<process::Indices> indices;     // absent: not computed
    std::optional<process::DoseOutcome> dose;
    // Mineral by mineral, what the water will do (process::mineral_outlook). Absent: the
    // report shows each mineral's tendency from its saturation index, without amounts.
    std::optional<process::Outlook> outlook;
    LabMeasurements measured;                    // the lab's measured TDS and conductance (waters only)
};

struct SweepReport {
    process::SweepOutcome sweep;
    std::string csv_path, svg_path;              // where the CLI wrote them ("" if not written)
};

// A diagram the CLI wrote (for the report's list of files).
struct DiagramReport {
    std::string label;
    std::string svg_path, csv_path;
    std::vector<std::string> warnings;
};

std::string text_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items,
                        const std::vector<SweepReport>& sweeps = {}, const std::vector<electro::CellResult>& cells = {},
                        const std::vector<DiagramReport>& diagrams = {});
std::string json_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items,
                        const std::vector<SweepReport>& sweeps = {}, const std::vector<electro::CellResult>& cells = {},
                        const std::vector<DiagramReport>& diagrams = {});

// `deltag cell`: one cell as text, or as {"cells": [ ... ]}.
std::string cell_text(const electro::CellResult& c);
std::string cells_json(const std::vector<electro::CellResult>& cells);
std::string csv_report(const thermo::Database& db, const ReportContext& ctx, const std::vector<ReportItem>& items);

// A transfer in mg per litre of the water (mol/kgw x molar mass x kg of water per litre).
double transfer_mg_per_l(const thermo::Database& db, const equilibrium::SpeciationResult& r,
                         const equilibrium::PhaseTransfer& t);

// Converts plain results (waters) to report items.
std::vector<ReportItem> items_of(const std::vector<equilibrium::SpeciationResult>& results);

// The sweep as a plot and as a CSV table (through plot.hpp).
std::string sweep_svg(const process::SweepOutcome& sweep, const std::string& title);
std::string sweep_csv(const process::SweepOutcome& sweep);

std::string text_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results);
// Throws std::logic_error if a number to be written is not finite (a bug, never shown as NaN).
std::string json_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results);
std::string csv_report(const thermo::Database& db, const ReportContext& ctx,
                       const std::vector<equilibrium::SpeciationResult>& results);

}  // namespace deltag::io
