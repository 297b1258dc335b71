#include "deltag/error.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <sstream>

namespace deltag {

std::string SourceLocation::to_string() const {
    std::ostringstream out;
    out << (file.empty() ? std::string("<input>") : file);
    if (line > 0) {
        out << ':' << line;
        if (column > 0) out << ':' << column;
    }
    return out.str();
}

namespace {
std::string compose_input(const SourceLocation& where, const std::string& key,
                          const std::string& message, const std::string& suggestion) {
    std::string s = where.to_string() + ": ";
    if (!key.empty()) s += "'" + key + "': ";
    s += message;
    if (!suggestion.empty()) s += " (did you mean '" + suggestion + "'?)";
    return s;
}

std::string compose_convergence(const std::string& subject, double residual,
                                const std::string& reason, const std::string& hint) {
    std::ostringstream out;
    out << subject << ": did not converge (" << reason << "; scaled residual " << residual << ")";
    if (!hint.empty()) out << "; " << hint;
    return out.str();
}
}  // namespace

InputError::InputError(SourceLocation where, std::string key, std::string message,
                       std::string suggestion)
    : std::runtime_error(compose_input(where, key, message, suggestion)),
      where_(std::move(where)),
      key_(std::move(key)),
      message_(std::move(message)),
      suggestion_(std::move(suggestion)) {}

ConvergenceError::ConvergenceError(std::string what_was_solved, double residual_norm,
                                   std::string reason, std::string hint)
    : std::runtime_error(compose_convergence(what_was_solved, residual_norm, reason, hint)),
      subject_(std::move(what_was_solved)),
      residual_(std::isfinite(residual_norm) ? residual_norm : -1.0),
      reason_(std::move(reason)),
      hint_(std::move(hint)) {}

std::string message_number(double v) {
    std::ostringstream out;
    out.precision(6);
    out << v;
    return out.str();
}

std::string name_list(const std::vector<std::string>& names) {
    std::string s;
    for (const auto& n : names) s += (s.empty() ? "" : ", ") + n;
    return s;
}

std::size_t edit_distance(std::string_view a, std::string_view b) {
    std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
    for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
    for (std::size_t i = 1; i <= a.size(); ++i) {
        cur[0] = i;
        for (std::size_t j = 1; j <= b.size(); ++j) {
            const bool same = std::tolower(static_cast<unsigned char>(a[i - 1])) ==
                              std::tolower(static_cast<unsigned char>(b[j - 1]));
            cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (same ? 0 : 1)});
        }
        std::swap(prev, cur);
    }
    return prev[b.size()];
}

std::string nearest_name(std::string_view name, const std::vector<std::string>& candidates) {
    std::string best;
    std::size_t best_d = static_cast<std::size_t>(-1);
    for (const auto& c : candidates) {
        const std::size_t d = edit_distance(name, c);
        if (d < best_d) {
            best_d = d;
            best = c;
        }
    }
    // Two edits, or one in three characters for long names ("Ca+2" -> "Ca^2+"); a single
    // edit for names of one or two characters, so "e-" does not suggest "Cl-".
    const std::size_t limit = name.size() <= 2 ? 1 : std::max<std::size_t>(2, (name.size() + 1) / 3);
    return best_d <= limit ? best : std::string{};
}

}  // namespace deltag
