// A sample set through one case (include/deltag/batch.hpp).
#include "deltag/batch.hpp"

#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <deque>
#include <mutex>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <set>
#include <stdexcept>
#include <thread>

#include "deltag/case.hpp"
#include "deltag/figures.hpp"
#include "deltag/water.hpp"
#include "chem/names.hpp"
#include "io/text_format.hpp"

namespace fs = std::filesystem;

namespace deltag {

namespace {

// ---- the samples file: RFC 4180 records, read one at a time --------------------------------

class CsvReader {
public:
    CsvReader(std::istream& in, std::string name) : in_(in), name_(std::move(name)) {}

    // The next record's fields; false at the end of the input. `line` is where it starts.
    bool next(std::vector<std::string>& fields, int& line) {
        fields.clear();
        int c = in_.get();
        if (first_) {
            first_ = false;
            // A UTF-8 byte order mark, as spreadsheets write it, is not part of the header.
            if (c == 0xEF && in_.peek() == 0xBB) {
                in_.get();
                if (in_.get() != 0xBF) throw InputError(SourceLocation{name_, 1, 1}, "samples", "the file starts with a broken byte order mark");
                c = in_.get();
            }
        }
        if (c == EOF) return false;
        line = line_;
        std::string field;
        bool quoted = false, was_quoted = false;
        for (;; c = in_.get()) {
            if (quoted) {
                if (c == EOF)
                    throw InputError(SourceLocation{name_, line, 0}, "samples",
                                     "a quoted field opened on this line is never closed (a missing \")");
                if (c == '"') {
                    if (in_.peek() == '"') {
                        in_.get();
                        field += '"';
                    } else {
                        quoted = false;
                    }
                } else {
                    if (c == '\n') ++line_;
                    field += static_cast<char>(c);
                }
                continue;
            }
            if (c == EOF || c == '\n' || c == '\r') {
                if (c == '\r' && in_.peek() == '\n') in_.get();
                if (c != EOF) ++line_;
                fields.push_back(was_quoted ? field : trim(field));
                return true;
            }
            if (c == delimiter_) {
                fields.push_back(was_quoted ? field : trim(field));
                field.clear();
                was_quoted = false;
                continue;
            }
            if (c == '"' && trim(field).empty() && !was_quoted) {
                quoted = was_quoted = true;
                field.clear();
                continue;
            }
            field += static_cast<char>(c);
        }
    }

    // The header decides the delimiter: semicolon when it has more semicolons than commas
    // (outside quotes), as spreadsheets in decimal-comma locales export.
    void detect_delimiter() {
        std::string head;
        std::streampos start = in_.tellg();
        std::getline(in_, head);
        in_.clear();
        in_.seekg(start);
        std::size_t commas = 0, semicolons = 0;
        bool q = false;
        for (char ch : head) {
            if (ch == '"') q = !q;
            else if (!q && ch == ',') ++commas;
            else if (!q && ch == ';') ++semicolons;
        }
        delimiter_ = semicolons > commas ? ';' : ',';
    }
    char delimiter() const { return delimiter_; }

    static std::string trim(const std::string& s) {
        const auto b = s.find_first_not_of(" \t");
        if (b == std::string::npos) return {};
        return s.substr(b, s.find_last_not_of(" \t") - b + 1);
    }

private:
    std::istream& in_;
    std::string name_;
    char delimiter_ = ',';
    bool first_ = true;
    int line_ = 1;
};

// ---- the header -----------------------------------------------------------------------------

enum class Setting { none, sample, temperature, ph, pe, eh_mv, dissolved_oxygen, density, measured_tds, measured_conductance };

struct SettingName {
    std::vector<std::string> names;   // as a lab writes it, and the case key
    Setting setting;
    std::vector<std::string> units;   // the unit it may carry in parentheses ("" = none)
    double lo, hi;                    // the case reader's range for the key
    const char* what;
};

// The water settings a column may give. Ranges as the case reader checks them.
const std::vector<SettingName>& settings() {
    static const std::vector<SettingName> s = {
        {{"Temperature", "temperature_c"}, Setting::temperature, {"", "°C", "degC", "C"}, 0.0, 100.0, "a temperature in °C"},
        {{"pH"}, Setting::ph, {""}, 0.0, 14.0, "a pH"},
        {{"pe"}, Setting::pe, {""}, -20.0, 20.0, "a pe"},
        {{"Eh", "eh_mv"}, Setting::eh_mv, {"", "mV", "mV vs SHE"}, -1500.0, 1500.0, "an Eh in mV against the standard hydrogen electrode"},
        {{"Dissolved oxygen", "DO", "dissolved_oxygen_mg_per_l"}, Setting::dissolved_oxygen, {"", "mg/L"}, 0.0, 100.0,
         "a dissolved oxygen in mg/L"},
        {{"Density", "density_kg_per_l"}, Setting::density, {"", "kg/L"}, 0.9, 1.5, "a solution density in kg/L"},
        {{"Measured TDS", "measured_tds_mg_per_l"}, Setting::measured_tds, {"", "mg/L"}, 0.0, 1e6, "a measured dissolved solids in mg/L"},
        {{"Measured conductance", "measured_conductance_25c_us_per_cm"}, Setting::measured_conductance, {"", "µS/cm", "uS/cm"}, 0.0, 1e6,
         "a measured specific conductance at 25 °C in µS/cm"},
    };
    return s;
}

struct Column {
    std::string header;               // as written
    int column = 0;                   // 1-based
    Setting setting = Setting::none;
    const SettingName* spec = nullptr;
    std::string analyte, unit, as;    // an analyte column
};

// "Ca (mg/L)" -> name "Ca", inside "mg/L"; "pH" -> "pH", "".
void split_header(const std::string& cell, std::string& name, std::string& inside) {
    const auto open = cell.find('(');
    if (open != std::string::npos && !cell.empty() && cell.back() == ')') {
        name = CsvReader::trim(cell.substr(0, open));
        inside = CsvReader::trim(cell.substr(open + 1, cell.size() - open - 2));
    } else {
        name = CsvReader::trim(cell);
        inside.clear();
    }
}

std::string lower(std::string s) {
    for (auto& ch : s) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
    return s;
}

// Reads the header and checks every column against the settings, the unit table and the
// database (through the case's own reading of an analyte).
std::vector<Column> read_header(const std::vector<std::string>& cells, const std::string& file, const WaterAnalysis& tmpl,
                                const thermo::Database& db, activity::ModelKind model) {
    std::vector<Column> cols;
    std::vector<std::string> known = {"sample"};
    for (const auto& s : settings()) known.insert(known.end(), s.names.begin(), s.names.end());
    std::map<std::string, int> seen;  // what a column gives -> its column
    std::string unused, inside0;
    if (std::none_of(cells.begin(), cells.end(), [&](const std::string& h) {
            split_header(h, unused, inside0);
            return lower(unused) == "sample";
        }))
        throw InputError(SourceLocation{file, 1, 1}, "sample",
                         "the header has no 'sample' column; add one that names each row (unique names)", "sample");
    for (std::size_t i = 0; i < cells.size(); ++i) {
        Column c;
        c.header = cells[i];
        c.column = static_cast<int>(i + 1);
        const SourceLocation at{file, 1, c.column};
        std::string name, inside;
        split_header(c.header, name, inside);
        if (name.empty())
            throw InputError(at, "column " + std::to_string(c.column),
                             "the header cell is empty; every column needs a name (sample, a water setting or an analyte)");
        std::string what;
        if (lower(name) == "sample") {
            if (!inside.empty()) throw InputError(at, c.header, "the sample column takes no unit; write it as 'sample'", "sample");
            c.setting = Setting::sample;
            what = "sample";
        }
        for (const auto& s : settings()) {
            if (c.setting != Setting::none) break;
            if (std::none_of(s.names.begin(), s.names.end(), [&](const std::string& n) { return lower(n) == lower(name); })) continue;
            // "pH" and "pe" are case-sensitive in the case format; a lab's "PH" means pH.
            if (std::find(s.units.begin(), s.units.end(), inside) == s.units.end()) {
                std::vector<std::string> units;
                for (const auto& u : s.units)
                    if (!u.empty()) units.push_back(u);
                throw InputError(at, c.header,
                                 "'" + name + "' takes " +
                                     (units.empty() ? std::string("no unit") : "the unit " + name_list(units)) + ", found '" + inside + "'",
                                 units.empty() ? s.names.front() : s.names.front() + " (" + units.front() + ")");
            }
            c.setting = s.setting;
            c.spec = &s;
            what = s.names.front();
        }
        if (c.setting == Setting::none) {
            // An analyte, as the case format names it, with its unit and "as".
            c.analyte = name;
            const auto as_at = inside.find(" as ");
            c.unit = CsvReader::trim(as_at == std::string::npos ? inside : inside.substr(0, as_at));
            if (as_at != std::string::npos) c.as = CsvReader::trim(inside.substr(as_at + 4));
            if (!c.unit.empty() && !is_concentration_unit(c.unit))
                throw InputError(at, c.header,
                                 "unknown concentration unit '" + c.unit + "'; expected one of: " + name_list(concentration_units()),
                                 nearest_name(c.unit, concentration_units()));
            // The database says whether the analyte and its "as" exist: read a one-analyte
            // water the way the case reads its waters.
            WaterAnalysis probe = tmpl;
            probe.analytes.clear();
            probe.ph = 7.0;
            probe.charge_balance.clear();
            probe.pe.reset();
            probe.eh_mv.reset();
            probe.dissolved_oxygen_mg_per_l.reset();
            AnalyteValue a;
            a.name = c.analyte;
            a.value = 1.0;
            a.unit = c.unit;
            a.as = c.as;
            a.where = at;
            a.key = c.header;
            probe.analytes.push_back(a);
            try {
                (void)to_speciation_input(probe, db, model);
            } catch (const InputError& e) {
                std::string suggestion = e.suggestion();
                if (suggestion.empty() && !c.unit.empty() && c.as.empty() && c.unit.find(' ') != std::string::npos)
                    suggestion = name + " (mg/L as ...)";
                const std::string also = c.unit.empty() && c.as.empty() ? "; or a water setting (" + name_list(known) + ")" : "";
                throw InputError(at, c.header, "column '" + c.header + "': " + e.message() + also, suggestion);
            }
            what = "analyte " + c.analyte;
        }
        if (auto it = seen.find(what); it != seen.end())
            throw InputError(at, c.header,
                             "column '" + c.header + "' repeats column " + std::to_string(it->second) + " ('" +
                                 cells[static_cast<std::size_t>(it->second - 1)] + "'); give each value once");
        seen[what] = c.column;
        cols.push_back(std::move(c));
    }
    return cols;
}

// ---- a sample -------------------------------------------------------------------------------

struct Sample {
    std::size_t index = 0;
    int line = 0;
    std::string name;
    std::vector<std::string> fields;
    std::string bad;                  // a problem found while reading the row
    std::vector<BatchRow> rows;       // filled by a worker
};

std::string number_form_hint(const std::string& text) {
    if (text.find(',') != std::string::npos) return " (a decimal comma? write numbers with a decimal point: 0.05)";
    return {};
}

// A number cell: the whole cell a decimal number.
std::optional<double> parse_number(const std::string& text) {
    if (text.empty()) return std::nullopt;
    char* end = nullptr;
    const double v = std::strtod(text.c_str(), &end);
    if (end != text.c_str() + text.size() || !std::isfinite(v)) return std::nullopt;
    // strtod also reads "inf", "nan" and hex: only plain decimals.
    if (text.find_first_not_of("0123456789.eE+-") != std::string::npos) return std::nullopt;
    return v;
}

struct Context {
    const io::Case* case_file = nullptr;
    const thermo::Database* db = nullptr;
    std::size_t water_index = 0;
    std::vector<process::WaterState> other_waters;  // the case's other waters, solved once
    std::vector<Column> cols;
    std::string file;
    std::vector<std::string> step_labels;
};

// The template water with a row's values.
WaterAnalysis sample_water(const Context& x, const Sample& s) {
    const WaterAnalysis& tmpl = x.case_file->waters[x.water_index];
    WaterAnalysis w = tmpl;
    w.analytes.clear();
    w.ph.reset();
    w.measured = {};
    const bool balance_default = tmpl.charge_balance == "pH" && !tmpl.ph;
    for (const auto& c : x.cols) {
        const std::string& text = s.fields[static_cast<std::size_t>(c.column - 1)];
        const SourceLocation at{x.file, s.line, c.column};
        if (c.setting == Setting::sample) continue;
        if (c.setting == Setting::none) {
            if (text.empty()) continue;  // not measured
            AnalyteValue a;
            a.name = c.analyte;
            a.unit = c.unit;
            a.as = c.as;
            a.where = at;
            a.key = c.header;
            if (text.front() == '<') {
                a.value = io::below_detection_limit_of(text, at, c.header);
                a.below_detection = true;
            } else if (auto v = parse_number(text)) {
                if (*v < 0) throw InputError(at, c.header, "expected a concentration of zero or more, found " + text);
                a.value = *v;
            } else {
                throw InputError(at, c.header,
                                 "expected a concentration (a number) or a value below the detection limit such as <0.05, found '" +
                                     text + "'" + number_form_hint(text));
            }
            w.analytes.push_back(std::move(a));
            continue;
        }
        if (text.empty()) continue;  // not measured: the template's value stays (pH: none)
        const auto v = parse_number(text);
        if (!v) throw InputError(at, c.header, "expected " + std::string(c.spec->what) + ", found '" + text + "'" + number_form_hint(text));
        if (*v < c.spec->lo || *v > c.spec->hi)
            throw InputError(at, c.header,
                             "expected " + std::string(c.spec->what) + " from " + message_number(c.spec->lo) + " to " +
                                 message_number(c.spec->hi) + ", found " + text);
        switch (c.setting) {
            case Setting::temperature: w.temperature_c = *v; break;
            case Setting::ph: w.ph = *v; break;
            case Setting::pe: w.pe = *v; w.eh_mv.reset(); w.dissolved_oxygen_mg_per_l.reset(); break;
            case Setting::eh_mv: w.eh_mv = *v; w.eh_where = at; w.pe.reset(); w.dissolved_oxygen_mg_per_l.reset(); break;
            case Setting::dissolved_oxygen:
                w.dissolved_oxygen_mg_per_l = *v;
                w.dissolved_oxygen_where = at;
                w.pe.reset();
                w.eh_mv.reset();
                break;
            case Setting::density: w.density_kg_per_l = *v; break;
            case Setting::measured_tds: w.measured.tds_mg_per_l = *v; break;
            case Setting::measured_conductance: w.measured.conductance_25c_us_per_cm = *v; break;
            default: break;
        }
    }
    // pH and the charge balance, by the case format's rule: a measured pH is used; without
    // one the pH comes from the charge balance.
    if (w.ph && (balance_default || tmpl.charge_balance == "pH")) w.charge_balance.clear();
    if (!w.ph) {
        if (!tmpl.charge_balance.empty() && tmpl.charge_balance != "pH")
            throw InputError(SourceLocation{x.file, s.line, 0}, "pH",
                             "the case balances charge on " + tmpl.charge_balance + ", which needs a measured pH; this sample has none");
        w.charge_balance = "pH";
    }
    if (!w.charge_balance.empty() && w.charge_balance != "pH" &&
        std::none_of(w.analytes.begin(), w.analytes.end(), [&](const AnalyteValue& a) { return a.name == w.charge_balance; }))
        throw InputError(SourceLocation{x.file, s.line, 0}, w.charge_balance,
                         "the case balances charge on " + w.charge_balance + ", which this sample does not give");
    if (w.analytes.empty()) throw InputError(SourceLocation{x.file, s.line, 0}, "samples", "no analyte is given for this sample");
    return w;
}

std::string warnings_of(const equilibrium::SpeciationResult& r) {
    std::string m;
    for (const auto& w : r.warnings) {
        if (!m.empty()) m += " | ";
        m += w;
    }
    for (auto& ch : m)
        if (ch == '\n' || ch == '\r') ch = ' ';
    return m;
}

// Every number written is finite: a figure that is not is left empty.
std::optional<double> finite(double v) { return std::isfinite(v) ? std::optional<double>(v) : std::nullopt; }

BatchRow row_of(const thermo::Database& db, const std::string& sample, const std::string& result, const process::WaterState& st,
                const LabMeasurements* measured) {
    BatchRow r;
    r.sample = sample;
    r.result = result;
    r.status = "ok";
    r.message = warnings_of(st.result);
    const auto& res = st.result;
    const process::WaterFigures f = process::water_figures(db, res, &st.indices, measured);
    r.temperature_c = finite(res.temperature_c);
    r.ph = finite(res.ph);
    r.ionic_strength = finite(res.ionic_strength);
    r.tds_mg_per_l = finite(f.tds_calculated_mg_per_l);
    r.hardness_mg_per_l_caco3 = finite(f.hardness_total);
    r.alkalinity_mg_per_l_caco3 = finite(f.alkalinity_total_m);
    r.conductance_us_per_cm = finite(f.specific_conductance_us_per_cm);
    if (st.indices.available) {
        r.langelier = finite(st.indices.langelier);
        r.ryznar = finite(st.indices.ryznar);
    }
    if (st.indices.ccpp_available) r.ccpp_mg_per_l_caco3 = finite(st.indices.ccpp_mg_per_l);
    for (const auto& s : res.saturation)
        if (!s.is_gas && std::isfinite(s.si) && std::isfinite(s.delta_g_kj_per_mol))
            r.phases.push_back({s.phase, s.si, s.delta_g_kj_per_mol});
    return r;
}

void solve(const Context& x, Sample& s) {
    const std::string& wname = x.case_file->waters[x.water_index].name;
    auto fail_all = [&](const std::string& status, const std::string& message) {
        s.rows.clear();
        for (std::size_t i = 0; i <= x.step_labels.size(); ++i) {
            BatchRow r;
            r.sample = s.name;
            r.result = i == 0 ? wname : x.step_labels[i - 1];
            r.status = status;
            r.message = message;
            s.rows.push_back(std::move(r));
        }
    };
    auto text = [](const InputError& e) {
        std::string m = e.message();
        if (!e.suggestion().empty()) m += " (did you mean '" + e.suggestion() + "'?)";
        return e.key().empty() ? m : e.key() + ": " + m;
    };
    if (!s.bad.empty()) return fail_all("bad input", s.bad);
    const thermo::Database& db = *x.db;
    process::WaterState water;
    WaterAnalysis w;
    try {
        w = sample_water(x, s);
        const equilibrium::SpeciationInput in = to_speciation_input(w, db, x.case_file->activity_model);
        equilibrium::SpeciationResult r = equilibrium::speciate(db, in);
        describe_lab_input(in, r, db);
        water = process::state_from_result(r, in, db);
    } catch (const InputError& e) {
        return fail_all("bad input", text(e));
    } catch (const ConvergenceError& e) {
        return fail_all("no convergence", e.what());
    } catch (const std::exception& e) {
        return fail_all("no convergence", std::string("internal error (please report): ") + e.what());
    }
    s.rows.push_back(row_of(db, s.name, wname, water, &w.measured));
    if (x.step_labels.empty()) return;
    std::vector<process::WaterState> waters = x.other_waters;
    waters.insert(waters.begin() + static_cast<std::ptrdiff_t>(x.water_index), water);
    std::string status, message;
    std::vector<process::StepOutcome> steps;
    try {
        steps = process::run_steps(db, waters, x.case_file->steps);
    } catch (const InputError& e) {
        status = "bad input";
        message = text(e);
    } catch (const ConvergenceError& e) {
        status = "no convergence";
        message = e.what();
    } catch (const std::exception& e) {
        status = "no convergence";
        message = std::string("internal error (please report): ") + e.what();
    }
    for (std::size_t i = 0; i < x.step_labels.size(); ++i) {
        if (status.empty()) {
            s.rows.push_back(row_of(db, s.name, steps[i].label, steps[i].state, nullptr));
        } else {
            BatchRow r;
            r.sample = s.name;
            r.result = x.step_labels[i];
            r.status = status;
            r.message = message;
            s.rows.push_back(std::move(r));
        }
    }
}

std::string with_thousands(std::size_t n) {
    std::string s = std::to_string(n), out;
    for (std::size_t i = 0; i < s.size(); ++i) {
        if (i > 0 && (s.size() - i) % 3 == 0) out += ',';
        out += s[i];
    }
    return out;
}

}  // namespace

std::string summary_line(const BatchSummary& s) {
    std::string line = with_thousands(s.solved) + " solved";
    if (s.bad_input) line += ", " + with_thousands(s.bad_input) + " bad input";
    if (s.no_convergence) line += ", " + with_thousands(s.no_convergence) + " did not converge";
    return line;
}

BatchSummary run_batch(const std::string& case_path, std::istream& samples, const std::string& samples_name,
                       const BatchOptions& options, const std::function<void(const std::vector<BatchRow>&)>& sink) {
    const io::Case cf = io::read_case(case_path);
    const SourceLocation cmd{"command line", 0, 0};
    Context x;
    x.case_file = &cf;
    x.file = samples_name;
    if (options.water.empty()) {
        if (cf.waters.size() != 1) {
            std::vector<std::string> names;
            for (const auto& w : cf.waters) names.push_back(w.name);
            throw InputError(cmd, "--water",
                             "the case has " + std::to_string(cf.waters.size()) + " waters (" + name_list(names) +
                                 "); name the template with --water NAME",
                             names.empty() ? std::string() : names.front());
        }
    } else {
        auto it = std::find_if(cf.waters.begin(), cf.waters.end(), [&](const WaterAnalysis& w) { return w.name == options.water; });
        if (it == cf.waters.end()) {
            std::vector<std::string> names;
            for (const auto& w : cf.waters) names.push_back(w.name);
            throw InputError(cmd, "--water", "the case has no water called '" + options.water + "'", nearest_name(options.water, names));
        }
        x.water_index = static_cast<std::size_t>(it - cf.waters.begin());
    }
    const DatabaseChoice dbc = case_database(cf, fs::path(case_path).parent_path().string(), options.database);
    x.db = dbc.db;
    for (const auto& st : cf.steps) x.step_labels.push_back(st.label);
    // The case's other waters (a blend partner, say) are the same for every sample.
    for (std::size_t i = 0; i < cf.waters.size(); ++i) {
        if (i == x.water_index) continue;
        const equilibrium::SpeciationInput in = to_speciation_input(cf.waters[i], *x.db, cf.activity_model);
        equilibrium::SpeciationResult r = equilibrium::speciate(*x.db, in);
        describe_lab_input(in, r, *x.db);
        x.other_waters.push_back(process::state_from_result(r, in, *x.db));
    }

    CsvReader reader(samples, samples_name);
    reader.detect_delimiter();
    std::vector<std::string> header;
    int line = 0;
    if (!reader.next(header, line) || (header.size() == 1 && header[0].empty()))
        throw InputError(SourceLocation{samples_name, 1, 0}, "samples", "the samples file is empty; expected a header row (sample, ...)");
    x.cols = read_header(header, samples_name, cf.waters[x.water_index], *x.db, cf.activity_model);
    std::size_t sample_col = 0;
    for (const auto& c : x.cols)
        if (c.setting == Setting::sample) sample_col = static_cast<std::size_t>(c.column - 1);

    const unsigned threads = std::max(1u, options.threads);
    const std::size_t window = 16 * static_cast<std::size_t>(threads);
    BatchSummary summary;
    std::set<std::string> names;  // sample names seen, for uniqueness
    std::size_t index = 0;
    // The next sample of the file, checked for its length and name; false at the end.
    auto read_sample = [&](Sample& s) {
        for (;;) {
            if (!reader.next(s.fields, s.line)) return false;
            if (!std::all_of(s.fields.begin(), s.fields.end(), [](const std::string& f) { return f.empty(); })) break;  // blank line
        }
        s.index = index++;
        if (s.fields.size() != header.size()) {
            s.bad = "the row has " + std::to_string(s.fields.size()) + " fields, the header " + std::to_string(header.size()) +
                    (reader.delimiter() == ';' ? " (separated by semicolons)" : " (separated by commas)");
            s.name = sample_col < s.fields.size() ? s.fields[sample_col] : std::string();
        } else {
            s.name = s.fields[sample_col];
            if (s.name.empty()) s.bad = "the sample has no name (the sample column is empty)";
            else if (!names.insert(s.name).second) s.bad = "the sample name '" + s.name + "' is used by an earlier row; names must be unique";
        }
        if (s.name.empty()) s.name = "line " + std::to_string(s.line);
        return true;
    };
    auto deliver = [&](const Sample& s) {
        ++summary.samples;
        bool bad = false, unconverged = false;
        for (const auto& r : s.rows) {
            bad = bad || r.status == "bad input";
            unconverged = unconverged || r.status == "no convergence";
        }
        if (bad) ++summary.bad_input;
        else if (unconverged) ++summary.no_convergence;
        else ++summary.solved;
        sink(s.rows);
    };
    if (threads == 1) {
        for (Sample s; read_sample(s); s = Sample{}) {
            solve(x, s);
            deliver(s);
        }
        return summary;
    }
    // Worker threads take the samples of a sliding window in turn; this thread reads the file
    // into the window and hands finished samples on in input order. Each sample's numbers
    // depend only on the sample, so the thread count changes nothing but the time.
    struct Slot {
        Sample s;
        bool taken = false, done = false;
    };
    std::deque<Slot> q;       // q.front() is the next to hand on
    std::size_t base = 0;     // the window position of q.front()
    std::size_t next = 0;     // the window position of the next sample to take
    bool input_done = false, stop = false;
    std::mutex m;
    std::condition_variable cv;
    auto work = [&] {
        std::unique_lock<std::mutex> lock(m);
        for (;;) {
            cv.wait(lock, [&] { return stop || next < base + q.size() || input_done; });
            if (stop) return;
            if (next >= base + q.size()) {
                if (input_done) return;
                continue;
            }
            Slot& slot = q[next - base];  // a deque keeps its elements in place as it grows at the back
            ++next;
            slot.taken = true;
            lock.unlock();
            solve(x, slot.s);
            lock.lock();
            slot.done = true;
            cv.notify_all();
        }
    };
    std::vector<std::thread> pool;
    auto finish = [&] {
        {
            std::lock_guard<std::mutex> lock(m);
            stop = true;
        }
        cv.notify_all();
        for (auto& t : pool) t.join();
    };
    try {
        for (unsigned t = 0; t < threads; ++t) pool.emplace_back(work);
        std::unique_lock<std::mutex> lock(m);
        for (;;) {
            // Fill the window (the file read without the lock).
            while (!input_done && q.size() < window) {
                lock.unlock();
                Sample s;
                const bool got = read_sample(s);
                lock.lock();
                if (got) q.push_back(Slot{std::move(s)});
                else input_done = true;
                cv.notify_all();
            }
            // Hand on what is finished, in order.
            while (!q.empty() && q.front().done) {
                Sample s = std::move(q.front().s);
                q.pop_front();
                ++base;
                lock.unlock();
                deliver(s);
                lock.lock();
            }
            if (input_done && q.empty()) break;
            if (!q.empty() && !q.front().done && (input_done || q.size() >= window))
                cv.wait(lock, [&] { return q.front().done; });
        }
    } catch (...) {
        finish();
        throw;
    }
    finish();
    return summary;
}

// ---- the output table -----------------------------------------------------------------------

namespace {
const std::vector<std::string> fixed_columns = {"sample",
                                                "result",
                                                "status",
                                                "message",
                                                "temperature (°C)",
                                                "pH",
                                                "ionic strength (mol/kgw)",
                                                "TDS calculated (mg/L)",
                                                "total hardness (mg/L as CaCO3)",
                                                "alkalinity (mg/L as CaCO3)",
                                                "specific conductance 25 °C (µS/cm)",
                                                "Langelier index",
                                                "Ryznar index",
                                                "CCPP (mg/L as CaCO3)"};

// The cells of a row after the four text columns: numbers in the shortest form of 15
// significant digits; "" for an empty cell.
std::vector<std::string> number_cells(const BatchRow& r, const std::vector<std::string>& phases) {
    auto num = [](const std::optional<double>& v) { return v ? io::text::csv_number(*v) : std::string(); };
    std::vector<std::string> c = {num(r.temperature_c),
                                  num(r.ph),
                                  num(r.ionic_strength),
                                  num(r.tds_mg_per_l),
                                  num(r.hardness_mg_per_l_caco3),
                                  num(r.alkalinity_mg_per_l_caco3),
                                  num(r.conductance_us_per_cm),
                                  num(r.langelier),
                                  num(r.ryznar),
                                  num(r.ccpp_mg_per_l_caco3)};
    for (const auto& p : phases) {
        auto it = std::find_if(r.phases.begin(), r.phases.end(), [&](const BatchPhase& b) { return b.name == p; });
        c.push_back(it == r.phases.end() ? std::string() : io::text::csv_number(it->si));
        c.push_back(it == r.phases.end() ? std::string() : io::text::csv_number(it->delta_g_kj_per_mol));
    }
    return c;
}
}  // namespace

std::vector<std::string> batch_columns(const std::vector<std::string>& phases) {
    std::vector<std::string> c = fixed_columns;
    for (const auto& p : phases) {
        c.push_back("SI " + p);
        c.push_back("ΔG " + p + " (kJ/mol)");
    }
    return c;
}

void collect_phases(const std::vector<BatchRow>& rows, std::vector<std::string>& phases) {
    for (const auto& r : rows)
        for (const auto& p : r.phases)
            if (std::find(phases.begin(), phases.end(), p.name) == phases.end()) phases.push_back(p.name);
}

std::string batch_csv_header(const std::vector<std::string>& phases) {
    std::string out;
    for (const auto& c : batch_columns(phases)) {
        if (!out.empty()) out += ',';
        out += io::text::csv_field(c);
    }
    return out + "\n";
}

std::string batch_csv_row(const BatchRow& r, const std::vector<std::string>& phases) {
    std::string out = io::text::csv_field(r.sample);
    for (const std::string* s : {&r.result, &r.status, &r.message}) {
        out += ',';
        out += io::text::csv_field(*s);
    }
    for (const auto& c : number_cells(r, phases)) {
        out += ',';
        out += c;
    }
    return out + "\n";
}

std::string batch_json_open() { return "[\n"; }
std::string batch_json_close() { return "]\n"; }

std::string batch_json_row(const BatchRow& r, const std::vector<std::string>& phases, bool first) {
    const std::vector<std::string> cols = batch_columns(phases);
    const std::vector<std::string> nums = number_cells(r, phases);
    auto str = [](const std::string& s) { return nlohmann::json(s).dump(); };
    std::string out = first ? "  {" : ",\n  {";
    out += str(cols[0]) + ": " + str(r.sample) + ", " + str(cols[1]) + ": " + str(r.result) + ", " + str(cols[2]) + ": " +
           str(r.status) + ", " + str(cols[3]) + ": " + str(r.message);
    for (std::size_t i = 0; i < nums.size(); ++i) out += ", " + str(cols[i + 4]) + ": " + (nums[i].empty() ? "null" : nums[i]);
    out += "}";
    return out;
}

// ---- the scratch file of a table -------------------------------------------------------------

namespace {

void put(std::FILE* f, const void* p, std::size_t n) {
    if (n && std::fwrite(p, 1, n, f) != n) throw std::runtime_error("cannot write the batch's scratch file");
}
void get(std::FILE* f, void* p, std::size_t n) {
    if (n && std::fread(p, 1, n, f) != n) throw std::runtime_error("cannot read the batch's scratch file");
}
void put_string(std::FILE* f, const std::string& s) {
    const std::uint64_t n = s.size();
    put(f, &n, sizeof n);
    put(f, s.data(), s.size());
}
std::string get_string(std::FILE* f) {
    std::uint64_t n = 0;
    get(f, &n, sizeof n);
    std::string s(static_cast<std::size_t>(n), '\0');
    get(f, s.data(), s.size());
    return s;
}
void put_number(std::FILE* f, const std::optional<double>& v) {
    const unsigned char has = v ? 1 : 0;
    put(f, &has, 1);
    if (v) put(f, &*v, sizeof(double));
}
std::optional<double> get_number(std::FILE* f) {
    unsigned char has = 0;
    get(f, &has, 1);
    if (!has) return std::nullopt;
    double v = 0;
    get(f, &v, sizeof v);
    return v;
}

// The figures of a row in column order, for the scratch file.
std::vector<std::optional<double>*> figures_of(BatchRow& r) {
    return {&r.temperature_c, &r.ph, &r.ionic_strength, &r.tds_mg_per_l, &r.hardness_mg_per_l_caco3,
            &r.alkalinity_mg_per_l_caco3, &r.conductance_us_per_cm, &r.langelier, &r.ryznar, &r.ccpp_mg_per_l_caco3};
}

}  // namespace

BatchTable::BatchTable() : scratch_(std::tmpfile(), &std::fclose) {
    if (!scratch_) throw std::runtime_error("cannot make a scratch file for the batch's table");
}

void BatchTable::add(const std::vector<BatchRow>& rows) {
    collect_phases(rows, phases_);
    std::FILE* f = scratch_.get();
    for (BatchRow r : rows) {
        for (const std::string* s : {&r.sample, &r.result, &r.status, &r.message}) put_string(f, *s);
        for (auto* v : figures_of(r)) put_number(f, *v);
        const std::uint64_t n = r.phases.size();
        put(f, &n, sizeof n);
        for (const auto& p : r.phases) {
            put_string(f, p.name);
            put(f, &p.si, sizeof(double));
            put(f, &p.delta_g_kj_per_mol, sizeof(double));
        }
        ++rows_;
    }
}

void BatchTable::write(bool json, const std::function<void(std::string_view)>& out) {
    std::FILE* f = scratch_.get();
    if (std::fflush(f) != 0 || std::fseek(f, 0, SEEK_SET) != 0) throw std::runtime_error("cannot read the batch's scratch file");
    out(json ? batch_json_open() : batch_csv_header(phases_));
    for (std::size_t i = 0; i < rows_; ++i) {
        BatchRow r;
        for (std::string* s : {&r.sample, &r.result, &r.status, &r.message}) *s = get_string(f);
        for (auto* v : figures_of(r)) *v = get_number(f);
        std::uint64_t n = 0;
        get(f, &n, sizeof n);
        for (std::uint64_t k = 0; k < n; ++k) {
            BatchPhase p;
            p.name = get_string(f);
            get(f, &p.si, sizeof(double));
            get(f, &p.delta_g_kj_per_mol, sizeof(double));
            r.phases.push_back(std::move(p));
        }
        out(json ? batch_json_row(r, phases_, i == 0) : batch_csv_row(r, phases_));
    }
    if (json && rows_) out("\n");
    if (json) out(batch_json_close());
    // Left at the end, so more rows could follow.
    std::fseek(f, 0, SEEK_END);
}

}  // namespace deltag
