// Report writers: text for a terminal, JSON per the interface contract, CSV (one row per
// result). Writers only format; they never solve.
#pragma once

#include <string>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/speciation.hpp"

namespace deltag::io {

struct ReportContext {
    std::string title;
    std::string case_path;
    std::string database;      // name or path of the database used
    std::string version;
    bool verbose = false;      // text: add the full solver summary
};

// The caution every report carries.
std::string_view caution_text();

std::string text_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results);
// Throws std::logic_error if a number to be written is not finite (a bug, never shown as NaN).
std::string json_report(const thermo::Database& db, const ReportContext& ctx,
                        const std::vector<equilibrium::SpeciationResult>& results);
std::string csv_report(const thermo::Database& db, const ReportContext& ctx,
                       const std::vector<equilibrium::SpeciationResult>& results);

}  // namespace deltag::io
