// A reagent formula as database components: CaCl2 -> Ca^2+ + 2 Cl-; NaOH -> Na+ + H2O - H+;
// CO2 -> HCO3- + H+ - H2O. Each element other than H and O goes to the component that
// carries it; O and H balance with water and protons; the charge must then balance, which
// fails for a reagent whose element is at a redox state the database does not hold.
#include <cmath>
#include <sstream>

#include "deltag/process.hpp"

namespace deltag::process {

namespace {
std::string fmt_num(double v) {
    std::ostringstream o;
    o.precision(6);
    o << v;
    return o.str();
}
}  // namespace

ReagentSplit split_reagent(const thermo::Database& db, const std::string& text, const SourceLocation& where) {
    chem::Formula f;
    try {
        f = chem::parse_formula(text);
    } catch (const chem::ParseError& e) {
        throw InputError(where, "reagent", std::string("cannot read the reagent formula: ") + e.what());
    }
    if (f.charge != 0)
        throw InputError(where, "reagent", "a reagent is a neutral substance; '" + text + "' has a charge");
    ReagentSplit out;
    out.molar_mass_g = f.molar_mass();
    double o_left = f.atoms("O"), h_left = f.atoms("H"), charge = 0.0;
    for (const auto& [el, n] : f.elements) {
        if (el == "H" || el == "O") continue;
        std::optional<std::size_t> carrier;
        for (std::size_t j = 0; j < db.component_count(); ++j) {
            const thermo::Species& c = db.species()[j];
            if (c.role == thermo::ComponentRole::ordinary && c.formula.atoms(el) > 0) {
                carrier = j;
                break;
            }
        }
        if (!carrier)
            throw InputError(where, "reagent",
                             "no component of the database '" + db.name() + "' carries " + el + " (in '" + text + "')");
        const thermo::Species& c = db.species()[*carrier];
        for (const auto& [el2, n2] : c.formula.elements)
            if (el2 != el && el2 != "H" && el2 != "O")
                throw InputError(where, "reagent",
                                 "the component " + c.name + " carries both " + el + " and " + el2 +
                                     "; deltag cannot split '" + text + "' onto it");
        const double k = n / c.formula.atoms(el);
        out.components.emplace_back(*carrier, k);
        o_left -= k * c.formula.atoms("O");
        h_left -= k * c.formula.atoms("H");
        charge += k * c.formula.charge;
    }
    if (out.components.empty())
        throw InputError(where, "reagent", "'" + text + "' brings nothing but water, hydrogen and oxygen");
    out.water = o_left;               // H2O units
    out.protons = h_left - 2.0 * o_left;  // H+ units
    charge += out.protons;
    if (std::abs(charge) > 1e-9) {
        std::string comps;
        for (const auto& [j, k] : out.components) comps += (comps.empty() ? "" : ", ") + db.species()[j].name;
        throw InputError(where, "reagent",
                         "'" + text + "' does not split onto the components " + comps + " without " + fmt_num(charge) +
                             " electrons: an element is at a redox state the database does not hold");
    }
    return out;
}

}  // namespace deltag::process
