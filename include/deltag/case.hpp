// A case file: title, database choice, activity model, the waters, and the process steps
// and sweeps to run on them.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/activity.hpp"
#include "deltag/diagram.hpp"
#include "deltag/process.hpp"
#include "deltag/water.hpp"

namespace deltag::io {

// A [[cell]]: two half-reactions, each in a water (its speciated activities) or at given
// activities, at the water's temperature (or a given one).
struct CellElectrode {
    std::string half_reaction;                     // "Cu^2+ + 2 e- = Cu(s)"
    SourceLocation half_reaction_where;
    std::string water;                             // a water or step label; "" for none
    SourceLocation water_where;
    std::vector<std::pair<std::string, double>> activities;  // overrides: species -> activity (gas: atm)
    std::vector<SourceLocation> activity_where;
    std::optional<double> temperature_c;           // default: the water's, else 25
    // Dissolved species of the electrode's metal at this activity (metal_ion_activity; 1e-6
    // is the customary corrosion convention); unset: from the water or given.
    std::optional<double> metal_ion_activity;
};

struct CellSpec {
    std::string label;                             // default "cell N"
    CellElectrode cathode, anode;
    SourceLocation where;
};

// A [[diagram]]: an Eh-pH diagram of one element. The diagram itself is described once, by
// electro::DiagramSpec (one set of defaults); the case adds what names other parts of the
// case (the water and the points, by label) and where the files go. The spec's water and
// points are filled in when the case runs (deltag::run_case).
struct DiagramCase {
    electro::DiagramSpec spec;                     // label (default "diagram N"), element, ranges, ...
    SourceLocation element_where;
    std::string water;                             // activity coefficients, T and ligands from this water
    SourceLocation water_where;
    std::vector<std::string> points;               // waters (or steps) drawn as points
    std::vector<SourceLocation> point_where;
    std::string svg_path, csv_path;                // relative to the case file; "" = default names
};

struct Case {
    std::string path;                 // the file read ("" when parsed from text)
    std::string title;
    std::string database = "core";    // "core" or a path (relative to the case file)
    SourceLocation database_where;
    activity::ModelKind activity_model = activity::ModelKind::davies;
    std::vector<WaterAnalysis> waters;  // in file order
    std::vector<process::Step> steps;   // [[step]] in file order; every label filled in
    std::vector<process::Sweep> sweeps; // [[sweep]] in file order; every label filled in
    std::vector<CellSpec> cells;        // [[cell]] in file order
    std::vector<DiagramCase> diagrams;  // [[diagram]] in file order
};

// The kinds of step a [[step]] table may be (process::step_kinds, in that order) and the
// keys each takes. The case reader checks steps against it; its messages and the README's
// list of keys (a test checks) come from it.
struct StepKindKeys {
    std::string kind;
    std::vector<std::string> keys;
};
const std::vector<StepKindKeys>& step_keys();

// Reads and validates a case file. Throws InputError (file, line, column, key, what was
// expected, nearest valid name) on any problem; never returns a partly read case.
Case read_case(const std::string& path);
Case parse_case(std::string_view toml_text, const std::string& origin);

// A value below the detection limit as a lab writes it, "<0.05": returns the limit. Anything
// else is an InputError at `where` and `key` (the case reader's own rule and messages).
double below_detection_limit_of(const std::string& text, const SourceLocation& where, const std::string& key);

}  // namespace deltag::io
