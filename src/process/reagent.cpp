// A reagent formula as database components: CaCl2 -> Ca^2+ + 2 Cl-; NaOH -> Na+ + H2O - H+;
// CO2 -> HCO3- + H+ - H2O. Each element other than H and O goes to the component that
// carries it; O and H balance with water and protons; electrons balance the charge, which
// makes NaOCl -> Na+ + Cl- + H2O - 2 H+ - 2 e- an oxidant.
#include <cmath>
#include <sstream>

#include "deltag/process.hpp"

namespace deltag::process {

namespace {
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
    out.water = o_left;               // H2O units
    out.protons = h_left - 2.0 * o_left;  // H+ units
    // What the charge still lacks is carried by electrons (e- has charge -1): an oxidant
    // (NaOCl, KMnO4, H2O2) takes electrons from the water, a reductant (Na2SO3) gives them.
    out.electrons = charge + out.protons;
    if (std::abs(out.electrons) < 1e-9) out.electrons = 0.0;
    if (out.components.empty() && out.electrons == 0.0)
        throw InputError(where, "reagent", "'" + text + "' brings nothing but water, hydrogen and oxygen");
    return out;
}

}  // namespace deltag::process
