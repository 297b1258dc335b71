// Typed errors of the deltag library. Library code never prints or exits: it throws one
// of these, and the command-line program turns them into messages and exit codes
// (InputError -> 2, ConvergenceError -> 3).
#pragma once

#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace deltag {

// Where a value came from: a file (case file, database, samples file) and a position in it.
// line and column are 1-based; 0 means unknown.
struct SourceLocation {
    std::string file;
    int line = 0;
    int column = 0;

    std::string to_string() const;  // "file:line:column", shortest form that is known
};

// Bad input: a case file, a database, a samples file or a command-line value.
class InputError : public std::runtime_error {
public:
    // key: the key (or name) that is wrong, dotted as in the file ("water.makeup.analytes.Ca");
    // message: what is wrong and what was expected; suggestion: nearest valid name, if any.
    InputError(SourceLocation where, std::string key, std::string message,
               std::string suggestion = {});

    const SourceLocation& where() const noexcept { return where_; }
    const std::string& key() const noexcept { return key_; }
    const std::string& message() const noexcept { return message_; }
    const std::string& suggestion() const noexcept { return suggestion_; }

private:
    SourceLocation where_;
    std::string key_;
    std::string message_;
    std::string suggestion_;
};

// Bad input of a particular kind: a water (or a trial water inside a search) for which no
// solution exists, found when a solve fails (a charge balance that would need a negative
// amount, an alkalinity below what the water's other bases carry). A search over trial
// waters catches it as "no answer here"; at the command line it is bad input (exit 2).
class NoSolutionError : public InputError {
public:
    using InputError::InputError;
};

// A calculation that did not converge. Carries what was being solved, the residual reached
// and a hint on what to try.
class ConvergenceError : public std::runtime_error {
public:
    ConvergenceError(std::string what_was_solved, double residual_norm, std::string reason,
                     std::string hint);

    const std::string& subject() const noexcept { return subject_; }
    double residual_norm() const noexcept { return residual_; }
    const std::string& reason() const noexcept { return reason_; }
    const std::string& hint() const noexcept { return hint_; }

private:
    std::string subject_;
    double residual_ = 0.0;
    std::string reason_;
    std::string hint_;
};

// A number for a message: 6 significant digits, no trailing zeros (7.85, 120, 0.0001,
// 1.23457e+06); -0 prints as 0.
std::string message_number(double v);

// Names joined for a message: "a, b, c".
std::string name_list(const std::vector<std::string>& names);

}  // namespace deltag
