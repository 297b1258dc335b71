// A case file: title, database choice, activity model, the waters, and the process steps
// and sweeps to run on them.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "deltag/activity.hpp"
#include "deltag/process.hpp"
#include "deltag/water.hpp"

namespace deltag::io {

struct Case {
    std::string path;                 // the file read ("" when parsed from text)
    std::string title;
    std::string database = "core";    // "core" or a path (relative to the case file)
    SourceLocation database_where;
    activity::ModelKind activity_model = activity::ModelKind::davies;
    std::vector<WaterAnalysis> waters;  // in file order
    std::vector<process::Step> steps;   // [[step]] in file order; every label filled in
    std::vector<process::Sweep> sweeps; // [[sweep]] in file order; every label filled in
};

// Reads and validates a case file. Throws InputError (file, line, column, key, what was
// expected, nearest valid name) on any problem; never returns a partly read case.
Case read_case(const std::string& path);
Case parse_case(std::string_view toml_text, const std::string& origin);

}  // namespace deltag::io
