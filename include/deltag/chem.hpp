// Chemical formulas and reactions in deltag's ASCII notation (see the interface contract):
// "Ca^2+", "Fe(OH)2+", "CO2(aq)", "CaSO4*2H2O", "e-"; reactions "A + 2 B = C + D".
#pragma once

#include <map>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace deltag::chem {

// IUPAC phase marks; none when the formula carries no mark.
enum class Phase { none, aqueous, gas, solid, liquid };

std::string_view phase_mark(Phase p);  // "", "(aq)", "(g)", "(s)", "(l)"

// A formula or reaction that cannot be read. column is 1-based within the text.
class ParseError : public std::invalid_argument {
public:
    ParseError(std::string text, int column, std::string message);
    const std::string& text() const noexcept { return text_; }
    int column() const noexcept { return column_; }
    const std::string& message() const noexcept { return message_; }

private:
    std::string text_;
    int column_ = 0;
    std::string message_;
};

struct Formula {
    std::string text;                       // as written
    std::map<std::string, double> elements;  // element symbol -> atoms per formula unit
    int charge = 0;
    Phase phase = Phase::none;

    // Only the electron ("e-" or "e^-") parses with no elements.
    bool is_electron() const { return elements.empty() && charge == -1; }
    double molar_mass() const;  // g/mol from IUPAC standard atomic weights; electrons weigh 0
    double atoms(std::string_view element) const;
};

// Parses one formula. Throws ParseError on malformed text or an unknown element symbol.
// Formula::text keeps the text as written.
Formula parse_formula(std::string_view text);

// The ASCII form of a formula: the printed hydrate dot U+00B7 becomes '*'. Two spellings of
// one formula compare equal after this.
std::string ascii_form(std::string_view text);

// Standard atomic weight (IUPAC 2021, abridged conventional values), g/mol.
// Returns nullopt for a symbol that is not an element.
std::optional<double> atomic_weight(std::string_view symbol);
const std::vector<std::string>& element_symbols();

struct ReactionTerm {
    double coefficient = 0.0;  // signed: negative on the left-hand side, positive on the right
    std::string species;  // the formula text as written (without the coefficient)
};

struct Reaction {
    std::string text;
    std::vector<ReactionTerm> terms;

    // Coefficient of a species, summed over both sides (right-hand side positive); 0 if absent.
    double coefficient(std::string_view species) const;
};

// Parses "A + 2 B = C + D". Coefficients stand apart ("2 H2O") or attached ("2H2O", "4e-");
// the separating '+' must have white space on both sides. Throws ParseError.
Reaction parse_reaction(std::string_view text);

// Element and charge imbalance of a reaction: right-hand side minus left-hand side, per
// element, with the key "charge" for charge. Entries with |value| < tolerance are omitted,
// so an empty map means balanced. Throws ParseError if a term's formula cannot be read.
std::map<std::string, double> imbalance(const Reaction& reaction, double tolerance = 1e-9);

// The imbalance for a message: "H +1, charge +1".
std::string imbalance_text(const std::map<std::string, double>& imbalance);

// Unicode form for text reports: "Ca^2+" -> "Ca²⁺", "SO4^2-" -> "SO₄²⁻".
std::string pretty(std::string_view ascii_formula);

}  // namespace deltag::chem
