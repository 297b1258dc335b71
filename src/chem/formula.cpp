#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdlib>
#include <utility>

#include "deltag/chem.hpp"
#include "deltag/error.hpp"

namespace deltag::chem {

namespace {

// IUPAC Commission on Isotopic Abundances and Atomic Weights, "Standard atomic weights of
// the elements 2021" (Pure Appl. Chem. 2022), abridged to five significant figures
// (conventional values for elements with an interval). Written from memory of the table.
const std::vector<std::pair<std::string, double>>& weight_table() {
    static const std::vector<std::pair<std::string, double>> table = {
        {"H", 1.008},     {"He", 4.0026},   {"Li", 6.94},     {"Be", 9.0122},
        {"B", 10.81},     {"C", 12.011},    {"N", 14.007},    {"O", 15.999},
        {"F", 18.998},    {"Ne", 20.180},   {"Na", 22.990},   {"Mg", 24.305},
        {"Al", 26.982},   {"Si", 28.085},   {"P", 30.974},    {"S", 32.06},
        {"Cl", 35.45},    {"Ar", 39.95},    {"K", 39.098},    {"Ca", 40.078},
        {"Sc", 44.956},   {"Ti", 47.867},   {"V", 50.942},    {"Cr", 51.996},
        {"Mn", 54.938},   {"Fe", 55.845},   {"Co", 58.933},   {"Ni", 58.693},
        {"Cu", 63.546},   {"Zn", 65.38},    {"Ga", 69.723},   {"Ge", 72.630},
        {"As", 74.922},   {"Se", 78.971},   {"Br", 79.904},   {"Kr", 83.798},
        {"Rb", 85.468},   {"Sr", 87.62},    {"Y", 88.906},    {"Zr", 91.224},
        {"Nb", 92.906},   {"Mo", 95.95},    {"Ru", 101.07},   {"Rh", 102.91},
        {"Pd", 106.42},   {"Ag", 107.87},   {"Cd", 112.41},   {"In", 114.82},
        {"Sn", 118.71},   {"Sb", 121.76},   {"Te", 127.60},   {"I", 126.90},
        {"Xe", 131.29},   {"Cs", 132.91},   {"Ba", 137.33},   {"La", 138.91},
        {"Ce", 140.12},   {"Nd", 144.24},   {"Hf", 178.49},   {"Ta", 180.95},
        {"W", 183.84},    {"Re", 186.21},   {"Os", 190.23},   {"Ir", 192.22},
        {"Pt", 195.08},   {"Au", 196.97},   {"Hg", 200.59},   {"Tl", 204.38},
        {"Pb", 207.2},    {"Bi", 208.98},   {"Th", 232.04},   {"U", 238.03},
    };
    return table;
}

class FormulaReader {
public:
    explicit FormulaReader(std::string_view text) : text_(text) {}

    Formula read() {
        Formula f;
        f.text = std::string(text_);
        if (text_.empty()) fail(0, "empty formula");
        std::string_view body = text_;

        // Phase mark at the very end: (aq) (g) (s) (l) (cr).
        static const std::pair<std::string_view, Phase> marks[] = {
            {"(aq)", Phase::aqueous}, {"(g)", Phase::gas},   {"(s)", Phase::solid},
            {"(cr)", Phase::solid},   {"(l)", Phase::liquid}};
        for (const auto& [mark, phase] : marks) {
            if (body.size() > mark.size() && body.substr(body.size() - mark.size()) == mark) {
                f.phase = phase;
                body.remove_suffix(mark.size());
                break;
            }
        }

        // Electron.
        if (body == "e-" || body == "e^-") {
            f.charge = -1;
            return f;
        }

        // Charge: "^N+" / "^N-" / "^+" / "^-" or a trailing run of + or - signs.
        std::size_t caret = body.rfind('^');
        if (caret != std::string_view::npos) {
            std::string_view q = body.substr(caret + 1);
            if (q.empty()) fail(static_cast<int>(caret) + 1, "'^' must be followed by a charge such as 2+ or 3-");
            const char sign = q.back();
            if (sign != '+' && sign != '-')
                fail(static_cast<int>(caret) + 1, "a charge ends with + or -");
            std::string_view digits = q.substr(0, q.size() - 1);
            int magnitude = 1;
            if (!digits.empty()) {
                for (char c : digits)
                    if (!std::isdigit(static_cast<unsigned char>(c)))
                        fail(static_cast<int>(caret) + 2, "the charge magnitude must be a whole number");
                if (digits.size() > 2) fail(static_cast<int>(caret) + 2, "a charge of more than 99 is not a chemical charge");
                magnitude = std::atoi(std::string(digits).c_str());
                if (magnitude == 0) fail(static_cast<int>(caret) + 2, "a charge of zero is written without '^'");
            }
            f.charge = sign == '+' ? magnitude : -magnitude;
            body = body.substr(0, caret);
        } else {
            // "Ca++" is accepted as +2; mixed signs ("Ca+-") are refused.
            char first_sign = 0;
            while (!body.empty() && (body.back() == '+' || body.back() == '-')) {
                if (first_sign && body.back() != first_sign)
                    fail(static_cast<int>(body.size()), "mixed + and - signs in the charge");
                first_sign = body.back();
                f.charge += body.back() == '+' ? 1 : -1;
                body.remove_suffix(1);
            }
        }
        if (body.empty()) fail(0, "no elements before the charge");

        // Hydrate parts separated by '*' (or U+00B7 middle dot), each with a leading count.
        std::size_t start = 0;
        while (start <= body.size()) {
            std::size_t star = body.find('*', start);
            std::string_view part = body.substr(start, star == std::string_view::npos ? std::string_view::npos : star - start);
            if (part.empty()) fail(static_cast<int>(start) + 1, "empty part around '*'");
            double mult = 1.0;
            std::size_t i = 0;
            if (start > 0) mult = read_number(part, i, static_cast<int>(start), 1.0);
            std::map<std::string, double> counts;
            std::size_t pos = i;
            read_group(part, pos, counts, static_cast<int>(start), 0);
            if (pos != part.size()) fail(static_cast<int>(start + pos) + 1, "unexpected character");
            for (auto& [el, n] : counts) f.elements[el] += n * mult;
            if (star == std::string_view::npos) break;
            start = star + 1;
        }
        return f;
    }

private:
    [[noreturn]] void fail(int column, const std::string& message) const {
        throw ParseError(std::string(text_), column, message);
    }

    double read_number(std::string_view s, std::size_t& i, int offset, double dflt) const {
        std::size_t j = i;
        while (j < s.size() && (std::isdigit(static_cast<unsigned char>(s[j])) || s[j] == '.')) ++j;
        if (j == i) return dflt;
        const std::string num(s.substr(i, j - i));
        char* end = nullptr;
        const double v = std::strtod(num.c_str(), &end);
        // Counts of real formulas stay far below a million; a longer run of digits would
        // overflow to infinity (or, nested, to an infinite molar mass).
        constexpr double max_count = 1e6;
        if (end != num.c_str() + num.size() || !(v > 0) || !(v <= max_count))
            fail(offset + static_cast<int>(i) + 1,
                 "bad count '" + (num.size() > 24 ? num.substr(0, 24) + "..." : num) + "' (expected a number above 0 and up to 1e6)");
        i = j;
        return v;
    }

    // Reads element symbols, counts and parenthesised groups until ')' or the end.
    void read_group(std::string_view s, std::size_t& i, std::map<std::string, double>& out,
                    int offset, int depth) const {
        bool any = false;
        while (i < s.size()) {
            const char c = s[i];
            if (c == ')' || c == ']') {
                if (depth == 0) fail(offset + static_cast<int>(i) + 1, std::string("unmatched '") + c + "'");
                break;
            }
            if (c == '(' || c == '[') {
                const char close = c == '(' ? ')' : ']';
                // Real formulas nest two or three groups; a limit keeps counts finite (1e6 at
                // most per level) and the recursion shallow.
                constexpr int max_depth = 8;
                if (depth >= max_depth)
                    fail(offset + static_cast<int>(i) + 1, "groups nested more than 8 deep");
                ++i;
                std::map<std::string, double> inner;
                read_group(s, i, inner, offset, depth + 1);
                if (i >= s.size() || s[i] != close)
                    fail(offset + static_cast<int>(i) + 1, std::string("missing '") + close + "'");
                ++i;
                const double n = read_number(s, i, offset, 1.0);
                for (auto& [el, k] : inner) out[el] += k * n;
                any = true;
                continue;
            }
            if (std::isupper(static_cast<unsigned char>(c))) {
                std::size_t j = i + 1;
                while (j < s.size() && std::islower(static_cast<unsigned char>(s[j]))) ++j;
                std::string sym(s.substr(i, j - i));
                if (!atomic_weight(sym))
                    fail(offset + static_cast<int>(i) + 1, "unknown element '" + sym + "'");
                i = j;
                const double n = read_number(s, i, offset, 1.0);
                out[sym] += n;
                any = true;
                continue;
            }
            fail(offset + static_cast<int>(i) + 1, std::string("unexpected character '") + c + "'");
        }
        if (!any) fail(offset + static_cast<int>(i) + 1, "expected an element symbol");
    }

    std::string_view text_;
};

std::string trim(std::string_view s) {
    std::size_t a = 0, b = s.size();
    while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
    while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
    return std::string(s.substr(a, b - a));
}

}  // namespace

std::string ascii_form(std::string_view text) {
    // The middle dot U+00B7 of printed hydrates is read as '*'.
    std::string t(text);
    for (std::size_t p = t.find("\u00b7"); p != std::string::npos; p = t.find("\u00b7", p)) t.replace(p, 2, "*");
    return t;
}

ParseError::ParseError(std::string text, int column, std::string message)
    : std::invalid_argument("'" + text + "'" + (column > 0 ? " at column " + std::to_string(column) : std::string()) +
                            ": " + message),
      text_(std::move(text)),
      column_(column),
      message_(std::move(message)) {}

std::string_view phase_mark(Phase p) {
    switch (p) {
        case Phase::aqueous: return "(aq)";
        case Phase::gas: return "(g)";
        case Phase::solid: return "(s)";
        case Phase::liquid: return "(l)";
        case Phase::none: break;
    }
    return "";
}

std::optional<double> atomic_weight(std::string_view symbol) {
    for (const auto& [sym, w] : weight_table())
        if (sym == symbol) return w;
    return std::nullopt;
}

const std::vector<std::string>& element_symbols() {
    static const std::vector<std::string> symbols = [] {
        std::vector<std::string> v;
        for (const auto& [sym, w] : weight_table()) v.push_back(sym);
        return v;
    }();
    return symbols;
}

double Formula::molar_mass() const {
    double m = 0.0;
    for (const auto& [el, n] : elements) m += n * *atomic_weight(el);
    return m;
}

double Formula::atoms(std::string_view element) const {
    auto it = elements.find(std::string(element));
    return it == elements.end() ? 0.0 : it->second;
}

Formula parse_formula(std::string_view text) {
    const std::string written = trim(text);
    if (written.empty()) throw ParseError(std::string(text), 0, "empty formula");
    Formula f = FormulaReader(ascii_form(written)).read();
    f.text = written;  // the text as written, middle dot and all
    return f;
}

double Reaction::coefficient(std::string_view species) const {
    double c = 0.0;
    for (const auto& t : terms)
        if (t.species == species) c += t.coefficient;
    return c;
}

Reaction parse_reaction(std::string_view text) {
    Reaction r;
    r.text = trim(text);
    const std::size_t eq = r.text.find('=');
    if (eq == std::string::npos) throw ParseError(r.text, 0, "a reaction needs '=' between its two sides");
    if (r.text.find('=', eq + 1) != std::string::npos)
        throw ParseError(r.text, static_cast<int>(r.text.find('=', eq + 1)) + 1, "more than one '='");

    auto read_side = [&](std::string_view side, std::size_t offset, double sign) {
        // Split on white space; "+" tokens separate terms; a pure number is a coefficient.
        std::vector<std::pair<std::string, std::size_t>> tokens;
        std::size_t i = 0;
        while (i < side.size()) {
            while (i < side.size() && std::isspace(static_cast<unsigned char>(side[i]))) ++i;
            std::size_t j = i;
            while (j < side.size() && !std::isspace(static_cast<unsigned char>(side[j]))) ++j;
            if (j > i) tokens.emplace_back(std::string(side.substr(i, j - i)), offset + i);
            i = j;
        }
        if (tokens.empty()) throw ParseError(r.text, static_cast<int>(offset) + 1, "a side of the reaction is empty");
        bool expect_term = true;
        double pending = 0.0;
        bool have_pending = false;
        for (const auto& [tok, pos] : tokens) {
            if (tok == "+") {
                if (expect_term) throw ParseError(r.text, static_cast<int>(pos) + 1, "'+' where a species was expected");
                expect_term = true;
                continue;
            }
            if (!expect_term) throw ParseError(r.text, static_cast<int>(pos) + 1, "missing ' + ' between species");
            // Leading number: coefficient, alone or attached.
            std::size_t k = 0;
            while (k < tok.size() && (std::isdigit(static_cast<unsigned char>(tok[k])) || tok[k] == '.')) ++k;
            double coef = 1.0;
            if (k > 0) {
                char* end = nullptr;
                const std::string num = tok.substr(0, k);
                coef = std::strtod(num.c_str(), &end);
                if (end != num.c_str() + num.size() || !(coef > 0))
                    throw ParseError(r.text, static_cast<int>(pos) + 1, "bad coefficient '" + num + "'");
            }
            if (k == tok.size()) {
                if (have_pending) throw ParseError(r.text, static_cast<int>(pos) + 1, "two coefficients in a row");
                pending = coef;
                have_pending = true;
                continue;
            }
            if (have_pending) {
                if (k > 0) throw ParseError(r.text, static_cast<int>(pos) + 1, "two coefficients in a row");
                coef = pending;
                have_pending = false;
            }
            const std::string species = tok.substr(k);
            try {
                (void)parse_formula(species);
            } catch (const ParseError& e) {
                throw ParseError(r.text, static_cast<int>(pos + k) + 1, "species '" + species + "': " + e.message());
            }
            r.terms.push_back({sign * coef, species});
            expect_term = false;
        }
        if (have_pending) throw ParseError(r.text, static_cast<int>(offset + side.size()), "a coefficient without a species");
        if (expect_term) throw ParseError(r.text, static_cast<int>(offset + side.size()), "the side ends with '+'");
    };
    read_side(std::string_view(r.text).substr(0, eq), 0, -1.0);
    read_side(std::string_view(r.text).substr(eq + 1), eq + 1, +1.0);
    return r;
}

std::map<std::string, double> imbalance(const Reaction& reaction, double tolerance) {
    std::map<std::string, double> sum;
    for (const auto& t : reaction.terms) {
        const Formula f = parse_formula(t.species);
        for (const auto& [el, n] : f.elements) sum[el] += t.coefficient * n;
        sum["charge"] += t.coefficient * f.charge;
    }
    for (auto it = sum.begin(); it != sum.end();) {
        if (std::abs(it->second) < tolerance) it = sum.erase(it);
        else ++it;
    }
    return sum;
}

std::string imbalance_text(const std::map<std::string, double>& imbalance) {
    std::string what;
    for (const auto& [k, v] : imbalance) what += (what.empty() ? "" : ", ") + k + " " + (v > 0 ? "+" : "") + message_number(v);
    return what;
}

std::string pretty(std::string_view s) {
    static const char* sub[] = {"₀", "₁", "₂", "₃", "₄", "₅", "₆", "₇", "₈", "₉"};
    static const char* sup[] = {"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"};
    std::string out;
    std::size_t i = 0;
    const std::size_t caret = s.rfind('^');
    // A bracket or phase mark at the end is copied as it is.
    std::size_t body_end = s.size();
    for (std::string_view mark : {"(aq)", "(g)", "(s)", "(l)", "(cr)"})
        if (s.size() > mark.size() && s.substr(s.size() - mark.size()) == mark) body_end = s.size() - mark.size();
    bool after_star = false;
    for (; i < body_end; ++i) {
        const char c = s[i];
        if (caret != std::string_view::npos && i == caret) {
            for (std::size_t j = caret + 1; j < body_end; ++j) {
                const char q = s[j];
                if (std::isdigit(static_cast<unsigned char>(q))) out += sup[q - '0'];
                else if (q == '+') out += "⁺";
                else if (q == '-') out += "⁻";
            }
            i = body_end;
            break;
        }
        if (c == '*') {
            out += "·";
            after_star = true;
            continue;
        }
        if (std::isdigit(static_cast<unsigned char>(c)) && !after_star && i > 0) {
            out += sub[c - '0'];
            continue;
        }
        if (!std::isdigit(static_cast<unsigned char>(c)) && c != '.') after_star = false;
        if ((c == '+' || c == '-') && caret == std::string_view::npos && i > 0 &&
            s.find_first_not_of(c, i) >= body_end) {
            // A trailing run of signs: "Ca++" -> "Ca²⁺".
            const std::size_t n = body_end - i;
            if (n > 1) out += sup[n % 10];
            out += c == '+' ? "⁺" : "⁻";
            break;
        }
        out += c;
    }
    out += std::string(s.substr(body_end));
    return out;
}

}  // namespace deltag::chem
