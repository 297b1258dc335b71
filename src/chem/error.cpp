#include "deltag/error.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <optional>
#include <set>
#include <sstream>

#include "deltag/chem.hpp"
#include "chem/names.hpp"

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
    if (v == 0.0) v = 0.0;  // -0 prints as 0
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

namespace {

// A name with its charge written one way, so that the ways people write a charge meet:
// "Cu2+", "Cu+2", "Cu++" and "Cu^2+" all become "Cu2+"; "Na1+" and "Na^+" become "Na+".
std::string plain_charge(std::string_view name) {
    std::string t;
    for (char c : name)
        if (c != '^') t += c;
    const auto sign = [](char c) { return c == '+' || c == '-'; };
    const auto digit = [](char c) { return std::isdigit(static_cast<unsigned char>(c)) != 0; };
    std::size_t k = 0;  // trailing signs
    while (k < t.size() && sign(t[t.size() - 1 - k])) ++k;
    if (k >= 2 && std::all_of(t.end() - static_cast<long>(k), t.end(), [&](char c) { return c == t.back(); })) {
        const char s = t.back();  // "Cu++" -> "Cu2+"
        t = t.substr(0, t.size() - k) + std::to_string(k) + s;
    } else if (k == 0) {
        std::size_t d = 0;  // "Cu+2" -> "Cu2+"
        while (d < t.size() && digit(t[t.size() - 1 - d])) ++d;
        if (d > 0 && d < t.size() && sign(t[t.size() - 1 - d])) {
            const char s = t[t.size() - 1 - d];
            t = t.substr(0, t.size() - 1 - d) + t.substr(t.size() - d) + s;
        }
    }
    // A charge of one is written without the 1: "Na1+" -> "Na+".
    if (t.size() >= 3 && sign(t.back()) && t[t.size() - 2] == '1' && !digit(t[t.size() - 3])) t.erase(t.size() - 2, 1);
    return t;
}

// A name without a phase mark at its end: "CO2(g)" -> "CO2", "CaCO3(s)" -> "CaCO3".
std::string_view without_phase_mark(std::string_view name) {
    for (std::string_view mark : {"(g)", "(s)", "(l)", "(aq)"})
        if (name.size() > mark.size() && name.substr(name.size() - mark.size()) == mark)
            return name.substr(0, name.size() - mark.size());
    return name;
}

// The elements of a name that reads as a chemical formula; nothing for other names.
std::optional<std::set<std::string>> formula_elements(std::string_view name) {
    try {
        const chem::Formula f = chem::parse_formula(name);
        std::set<std::string> out;
        for (const auto& [el, n] : f.elements)
            if (n > 0) out.insert(el);
        if (out.empty()) return std::nullopt;
        return out;
    } catch (const std::exception&) {
        return std::nullopt;
    }
}

// Letters that look alike in many fonts, where a slip of the eye rather than of the mind
// gives a formula of other elements: capital I and small l ("CI-" for "Cl-"), O and 0.
std::string look_alike(std::string_view name) {
    std::string t(name);
    for (char& c : t) {
        if (c == 'I') c = 'l';
        if (c == '0') c = 'O';
    }
    return t;
}

}  // namespace

std::string nearest_name(std::string_view name, const std::vector<std::string>& candidates) {
    // The same species with its charge written another way ("Cu2+" for "Cu^2+"), or the
    // same substance without its phase mark ("CO2" where a gas, "CO2(g)", is expected).
    const std::string plain = plain_charge(name);
    for (const auto& c : candidates)
        if (plain_charge(c) == plain) return c;
    for (const auto& c : candidates)
        if (without_phase_mark(c) == without_phase_mark(name)) return c;
    // A formula is not suggested in place of one of other elements: a one-letter slip
    // between formulas ("PO4" -> "SO4", "Mn" -> "Mg") names another substance, and would
    // lead the user astray rather than to what was meant; except for letters that look
    // alike ("CI-", capital i, is "Cl-").
    const auto elements = formula_elements(name);
    std::string best;
    std::size_t best_d = static_cast<std::size_t>(-1);
    for (const auto& c : candidates) {
        const std::size_t d = edit_distance(name, c);
        if (d >= best_d) continue;
        if (elements && look_alike(name) != look_alike(c)) {
            const auto other = formula_elements(c);
            if (other && *other != *elements) continue;
        }
        best_d = d;
        best = c;
    }
    // Two edits, or one in three characters for long names ("Ca+2" -> "Ca^2+"); a single
    // edit for names of one or two characters, so "e-" does not suggest "Cl-".
    const std::size_t limit = name.size() <= 2 ? 1 : std::max<std::size_t>(2, (name.size() + 1) / 3);
    return best_d <= limit ? best : std::string{};
}

std::string nearest_phase(std::string_view name, const std::vector<std::pair<std::string, std::string>>& phases) {
    // A formula for a named phase: "CaCO3" where a mineral is expected is Calcite (or the
    // first mineral of that formula in the list).
    for (const auto& [phase, formula] : phases)
        if (!formula.empty() && without_phase_mark(formula) == without_phase_mark(name)) return phase;
    std::vector<std::string> names;
    for (const auto& p : phases) names.push_back(p.first);
    return nearest_name(name, names);
}

}  // namespace deltag
