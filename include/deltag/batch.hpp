// A lab's sample set through one case: every row of a samples file (CSV) becomes the case's
// template water with the row's values, and is speciated and taken through the case's steps.
// A bad or unsolvable row never stops the others: each sample gives its rows with a status.
// Rows come back in input order whatever the thread count, and the same numbers. Nothing here
// prints or writes a file; the command line (deltag batch) writes what this returns.
#pragma once

#include <cstdio>
#include <functional>
#include <istream>
#include <memory>
#include <string_view>
#include <optional>
#include <string>
#include <vector>

#include "deltag/run.hpp"

namespace deltag {

struct BatchOptions {
    std::string water;      // the template water of the case; "" = its only water
    std::string database;   // replaces the case's database ("" keeps it)
    unsigned threads = 1;   // samples solved at once (at least 1)
};

// A mineral's saturation in one result.
struct BatchPhase {
    std::string name;
    double si = 0.0;
    double delta_g_kj_per_mol = 0.0;
};

// One row of the output: a sample's water, or the result of one of the case's steps on it.
struct BatchRow {
    std::string sample;
    std::string result;     // the water's name or the step's label
    std::string status;     // "ok", "bad input" or "no convergence"
    std::string message;    // why not ok; for an ok row, the warnings of the result ("" if none)
    // The figures (absent: not ok, or no answer for that figure).
    std::optional<double> temperature_c, ph, ionic_strength, tds_mg_per_l, hardness_mg_per_l_caco3,
        alkalinity_mg_per_l_caco3, conductance_us_per_cm, langelier, ryznar, ccpp_mg_per_l_caco3;
    std::vector<BatchPhase> phases;  // minerals, in the database's order
};

// How many samples came through: a sample counts as solved when all its rows are ok, as bad
// input when one of them is, else as not converged.
struct BatchSummary {
    std::size_t samples = 0, solved = 0, bad_input = 0, no_convergence = 0;
};

// "1,998 solved, 1 bad input, 1 did not converge" (parts with nothing to count left out,
// except the solved).
std::string summary_line(const BatchSummary& s);

// Runs every sample of `samples` (CSV text read as it goes) through the case at `case_path`.
// The header is read and checked first: an unknown or repeated column, a unit that does not
// fit, or a case without the template water throws InputError (file, line, column, the header
// cell as key, the nearest valid name) before anything is solved. Then rows are handed to
// `sink` in input order, one sample's rows at a time; at most a bounded window of samples
// (16 per thread) is held at once. `samples_name` names the file in messages.
BatchSummary run_batch(const std::string& case_path, std::istream& samples, const std::string& samples_name,
                       const BatchOptions& options, const std::function<void(const std::vector<BatchRow>&)>& sink);

// The output table: columns sample, result, status, message, the figures, the indices, then
// SI and ΔG of every mineral in any row (units in the headers).
std::vector<std::string> batch_columns(const std::vector<std::string>& phases);
// The minerals of any row, in first-seen order.
void collect_phases(const std::vector<BatchRow>& rows, std::vector<std::string>& phases);
// The header line and the rows as CSV (RFC 4180, CRLF-free: "\n" line ends).
std::string batch_csv_header(const std::vector<std::string>& phases);
std::string batch_csv_row(const BatchRow& row, const std::vector<std::string>& phases);
// A JSON array of objects, one per row, keyed by the column names; an empty cell is null.
std::string batch_json_open();
std::string batch_json_row(const BatchRow& row, const std::vector<std::string>& phases, bool first);
std::string batch_json_close();

// The whole output table of a batch, kept in a scratch file (an unnamed temporary file the
// system removes) rather than in memory: rows are added as they come, the mineral columns
// grow with them, and the table is written in pieces once the last row is in, with every
// column known. Memory stays that of one row and the list of minerals.
class BatchTable {
public:
    BatchTable();  // throws std::runtime_error if no scratch file can be made
    void add(const std::vector<BatchRow>& rows);
    const std::vector<std::string>& phases() const { return phases_; }
    std::size_t size() const { return rows_; }
    // The table as CSV or as JSON (an array of objects), piece by piece.
    void write(bool json, const std::function<void(std::string_view)>& out);

private:
    std::unique_ptr<std::FILE, int (*)(std::FILE*)> scratch_;
    std::vector<std::string> phases_;
    std::size_t rows_ = 0;
};

}  // namespace deltag
