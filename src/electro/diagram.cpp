// Eh-pH diagrams: the candidate forms of an element as linear functions of (pH, pe), the
// regions as the domain rectangle clipped by half-planes (Sutherland-Hodgman against one
// line at a time), the boundaries between neighbouring regions and the water-stability lines.
#include <algorithm>
#include <cmath>
#include <map>
#include <memory>
#include <set>
#include <sstream>

#include "deltag/activity.hpp"
#include "deltag/chem.hpp"
#include "deltag/constants.hpp"
#include "deltag/diagram.hpp"
#include "deltag/water_properties.hpp"
#include "chem/names.hpp"

namespace deltag::electro {

namespace {

// A point in the working plane: x = pH, y = pe.
struct P2 {
    double x = 0.0, y = 0.0;
};

struct Linear {
    double c0 = 0.0, cx = 0.0, cy = 0.0;
    double at(const P2& p) const { return c0 + cx * p.x + cy * p.y; }
};

std::string num(double v, int precision = 6) {
    std::ostringstream o;
    o.precision(precision);
    o << v;
    return o.str();
}

std::string join(const std::vector<std::string>& names, std::size_t max_listed = 8) {
    std::string s;
    for (std::size_t i = 0; i < names.size() && i < max_listed; ++i) s += (i ? ", " : "") + names[i];
    if (names.size() > max_listed) s += " and " + std::to_string(names.size() - max_listed) + " more";
    return s;
}

std::string key_of(const DiagramSpec& spec, std::string_view key) {
    std::string k = "diagram.";
    if (!spec.label.empty()) k += spec.label + ".";
    return k + std::string(key);
}

double signed_area(const std::vector<P2>& poly) {
    double a = 0.0;
    for (std::size_t i = 0; i < poly.size(); ++i) {
        const P2& p = poly[i];
        const P2& q = poly[(i + 1) % poly.size()];
        a += p.x * q.y - q.x * p.y;
    }
    return 0.5 * a;
}

// Keeps the part of a convex polygon where g <= 0. Values within eps of zero count as on
// the line. If the whole polygon lies on the line (g is the same function on both sides of a
// tie), it is kept when keep_on_tie, else dropped, so identical candidates do not overlap.
std::vector<P2> clip(const std::vector<P2>& poly, const Linear& g, double eps, bool keep_on_tie) {
    if (poly.empty()) return {};
    std::vector<double> v(poly.size());
    bool all_zero = true, all_inside = true, all_outside = true;
    for (std::size_t i = 0; i < poly.size(); ++i) {
        double gi = g.at(poly[i]);
        if (std::abs(gi) <= eps) gi = 0.0;
        v[i] = gi;
        all_zero = all_zero && gi == 0.0;
        all_inside = all_inside && gi <= 0.0;
        all_outside = all_outside && gi >= 0.0;
    }
    if (all_zero) return keep_on_tie ? poly : std::vector<P2>{};
    if (all_inside) return poly;
    if (all_outside) return {};  // at most an edge or a vertex on the line: no area
    std::vector<P2> out;
    for (std::size_t i = 0; i < poly.size(); ++i) {
        const std::size_t j = (i + 1) % poly.size();
        const P2& p = poly[i];
        const P2& q = poly[j];
        if (v[i] <= 0.0) out.push_back(p);
        if ((v[i] < 0.0 && v[j] > 0.0) || (v[i] > 0.0 && v[j] < 0.0)) {
            const double t = v[i] / (v[i] - v[j]);
            out.push_back(P2{p.x + t * (q.x - p.x), p.y + t * (q.y - p.y)});
        }
    }
    return out;
}

// Drops vertices that repeat the previous one (within tol in both coordinates).
void tidy(std::vector<P2>& poly, double tol_x, double tol_y) {
    std::vector<P2> out;
    for (const P2& p : poly) {
        if (!out.empty() && std::abs(p.x - out.back().x) <= tol_x && std::abs(p.y - out.back().y) <= tol_y) continue;
        out.push_back(p);
    }
    while (out.size() > 1 && std::abs(out.front().x - out.back().x) <= tol_x &&
           std::abs(out.front().y - out.back().y) <= tol_y)
        out.pop_back();
    poly = std::move(out);
}

// Point in a convex counter-clockwise polygon, allowing `tol` (in the polygon's units
// scaled by the edge length) outside.
template <class Pt, class X, class Y>
bool inside_convex(const std::vector<Pt>& poly, double px, double py, double tol, X xof, Y yof) {
    if (poly.size() < 3) return false;
    for (std::size_t i = 0; i < poly.size(); ++i) {
        const Pt& a = poly[i];
        const Pt& b = poly[(i + 1) % poly.size()];
        const double ex = xof(b) - xof(a), ey = yof(b) - yof(a);
        const double len = std::hypot(ex, ey);
        if (len == 0.0) continue;
        const double cross = ex * (py - yof(a)) - ey * (px - xof(a));
        if (cross < -tol * len) return false;
    }
    return true;
}

// Tolerance for "g = 0" on the domain: a tiny fraction of the size of g's terms there.
double zero_tolerance(const Linear& g, double x_mag, double y_mag) {
    const double scale = std::max({1.0, std::abs(g.c0), std::abs(g.cx) * x_mag, std::abs(g.cy) * y_mag});
    return 1e-10 * scale;
}

// log10 activity coefficient of species i in the water: the water's own value when the
// species took part in its speciation, else the water's activity model at its ionic strength.
class WaterGamma {
public:
    WaterGamma(const thermo::Database& db, const equilibrium::SpeciationResult* water, double temperature_c)
        : db_(db), water_(water), temperature_c_(temperature_c) {}

    double log_gamma(std::size_t i) {
        if (!water_) return 0.0;
        for (const auto& s : water_->species)
            if (s.species == i) return s.log_gamma;
        if (!model_) model_ = activity::make_model(water_->activity_model, temperature_c_);
        const thermo::Species& sp = db_.species()[i];
        const activity::SpeciesParameters p{sp.formula.charge, sp.ion_size_angstrom, sp.tj_a_angstrom, sp.tj_b,
                                            sp.salting_out};
        double lg = 0.0, dlg = 0.0;
        model_->log_gamma(water_->ionic_strength, std::span<const activity::SpeciesParameters>(&p, 1),
                          std::span<double>(&lg, 1), std::span<double>(&dlg, 1));
        from_model_.push_back(sp.name);
        return lg;
    }
    const std::vector<std::string>& from_model() const { return from_model_; }

private:
    const thermo::Database& db_;
    const equilibrium::SpeciationResult* water_;
    double temperature_c_;
    std::unique_ptr<activity::ActivityModel> model_;
    std::vector<std::string> from_model_;
};

// Water line Eh = e0 + slope pH, clipped to the rectangle.
WaterLine water_line(std::string name, std::string reaction, double e0, double slope, double ph_min, double ph_max,
                     double eh_min, double eh_max) {
    WaterLine w;
    w.name = std::move(name);
    w.reaction = std::move(reaction);
    w.e0_v = e0;
    w.slope_v_per_ph = slope;
    double lo = ph_min, hi = ph_max;
    if (slope != 0.0) {
        const double p1 = (eh_min - e0) / slope, p2 = (eh_max - e0) / slope;
        lo = std::max(ph_min, std::min(p1, p2));
        hi = std::min(ph_max, std::max(p1, p2));
    } else if (e0 < eh_min || e0 > eh_max) {
        hi = lo - 1.0;
    }
    w.visible = hi > lo;
    if (w.visible) {
        w.from = PhEh{lo, std::clamp(e0 + slope * lo, eh_min, eh_max)};
        w.to = PhEh{hi, std::clamp(e0 + slope * hi, eh_min, eh_max)};
    }
    return w;
}

}  // namespace

std::string_view region_kind_name(RegionKind kind) {
    switch (kind) {
        case RegionKind::aqueous: return "dissolved";
        case RegionKind::solid: return "solid";
        case RegionKind::metal: return "metal";
    }
    return "dissolved";
}

std::string_view corrosion_class(RegionKind kind) {
    switch (kind) {
        case RegionKind::aqueous: return "corrosion";
        case RegionKind::solid: return "passivation";
        case RegionKind::metal: return "immunity";
    }
    return "corrosion";
}

const Region* DiagramResult::find(std::string_view name) const {
    for (const auto& r : regions)
        if (r.name == name) return &r;
    return nullptr;
}

const Region* DiagramResult::region_at(double ph, double eh_v) const {
    const double tol = 1e-9 * std::max(ph_max - ph_min, 1.0);
    for (const auto& r : regions)
        if (inside_convex(r.polygon, ph, eh_v, tol, [](const PhEh& p) { return p.ph; },
                          [](const PhEh& p) { return p.eh_v; }))
            return &r;
    return nullptr;
}

DiagramResult eh_ph_diagram(const thermo::Database& db, const DiagramSpec& spec) {
    const SourceLocation& where = spec.where;
    const auto& species = db.species();

    // ---- the request
    if (!chem::atomic_weight(spec.element))
        throw InputError(where, key_of(spec, "element"),
                         "'" + spec.element + "' is not an element symbol (expected e.g. \"Fe\", \"Cu\", \"Zn\")",
                         nearest_name(spec.element, chem::element_symbols()));
    auto check_range = [&](double lo, double hi, std::string_view lo_key, std::string_view hi_key,
                           std::string_view what) {
        if (!std::isfinite(lo)) throw InputError(where, key_of(spec, lo_key), std::string(what) + " lower bound is not a finite number");
        if (!std::isfinite(hi)) throw InputError(where, key_of(spec, hi_key), std::string(what) + " upper bound is not a finite number");
        if (!(lo < hi))
            throw InputError(where, key_of(spec, lo_key),
                             std::string(what) + " range is empty: " + std::string(lo_key) + " = " + num(lo) +
                                 " must be below " + std::string(hi_key) + " = " + num(hi));
    };
    check_range(spec.ph_min, spec.ph_max, "ph_min", "ph_max", "the pH");
    check_range(spec.eh_min_v, spec.eh_max_v, "eh_min_v", "eh_max_v", "the Eh");
    if (!std::isfinite(spec.log_activity))
        throw InputError(where, key_of(spec, "log_activity"), "the log10 activity of the dissolved species is not a finite number");
    if (!db.electron())
        throw InputError(where, key_of(spec, "element"),
                         "database '" + db.name() + "' has no electron component (e-): an Eh-pH diagram needs redox reactions");
    const equilibrium::SpeciationResult* water = spec.water;
    if (water && water->component_log_activity.size() != db.component_count())
        throw InputError(where, key_of(spec, "water"),
                         "water '" + water->label + "' was not speciated with database '" + db.name() +
                             "' (its components do not match)");

    double temperature_c = spec.temperature_c.value_or(25.0);
    if (water) {
        if (spec.temperature_c && std::abs(*spec.temperature_c - water->temperature_c) > 1e-9)
            throw InputError(where, key_of(spec, "temperature_c"),
                             "temperature_c = " + num(*spec.temperature_c) + " differs from the temperature of water '" +
                                 water->label + "' (" + num(water->temperature_c) +
                                 " degC); leave it out to draw the diagram at the water's temperature");
        temperature_c = water->temperature_c;
    }
    if (const std::string problem = thermo::temperature_problem(temperature_c); !problem.empty())
        throw InputError(where, key_of(spec, "temperature_c"), problem);

    // The component carrying the element.
    std::vector<std::size_t> carriers;
    for (std::size_t j = 0; j < db.component_count(); ++j)
        if (species[j].role == thermo::ComponentRole::ordinary && species[j].formula.atoms(spec.element) > 0.0)
            carriers.push_back(j);
    std::vector<std::string> carrier_names;
    for (std::size_t j : carriers) carrier_names.push_back(species[j].name);
    std::size_t m_comp = 0;
    if (!spec.component.empty()) {
        const auto it = std::find_if(carriers.begin(), carriers.end(),
                                     [&](std::size_t j) { return species[j].name == spec.component; });
        if (it == carriers.end()) {
            std::vector<std::string> all;
            for (std::size_t j = 0; j < db.component_count(); ++j) all.push_back(species[j].name);
            throw InputError(where, key_of(spec, "component"),
                             "'" + spec.component + "' is not a component of database '" + db.name() + "' that contains " +
                                 spec.element +
                                 (carrier_names.empty() ? std::string(" (none does)") : " (those are: " + join(carrier_names) + ")"),
                             nearest_name(spec.component, carrier_names.empty() ? all : carrier_names));
        }
        m_comp = *it;
    } else {
        if (carriers.empty())
            throw InputError(where, key_of(spec, "element"),
                             "no component of database '" + db.name() + "' contains " + spec.element +
                                 ": the database has no species of this element");
        if (carriers.size() > 1)
            throw InputError(where, key_of(spec, "component"),
                             "several components of database '" + db.name() + "' contain " + spec.element + " (" +
                                 join(carrier_names) + "): name the one to draw in component");
        m_comp = carriers.front();
    }

    // Names to leave out.
    std::set<std::string> leave_out;
    {
        std::vector<std::string> names = db.species_names();
        for (const auto& n : db.mineral_names()) names.push_back(n);
        for (std::size_t i = 0; i < spec.leave_out.size(); ++i) {
            const std::string& n = spec.leave_out[i];
            if (!db.find_species(n) && !db.find_mineral(n))
                throw InputError(i < spec.leave_out_where.size() ? spec.leave_out_where[i] : where, key_of(spec, "leave_out"),
                                 "'" + n + "' is neither a species nor a mineral of database '" + db.name() + "'",
                                 nearest_name(n, names));
            leave_out.insert(n);
        }
    }

    for (const auto& p : spec.points)
        if (!std::isfinite(p.ph) || !std::isfinite(p.eh_v))
            throw InputError(where, key_of(spec, "points"), "water point '" + p.label + "' has a pH or Eh that is not a finite number");

    DiagramResult res;
    res.label = spec.label;
    res.element = spec.element;
    res.component = species[m_comp].name;
    res.database = db.name();
    res.temperature_c = temperature_c;
    res.log_activity = spec.log_activity;
    res.molality = water != nullptr;
    res.water_label = water ? water->label : std::string();
    res.water_activity = water ? water->water_activity : 1.0;
    res.ph_min = spec.ph_min;
    res.ph_max = spec.ph_max;
    res.eh_min_v = spec.eh_min_v;
    res.eh_max_v = spec.eh_max_v;
    res.shading = spec.shading;
    res.left_out = spec.leave_out;
    const double slope = constants::nernst_slope_v(temperature_c + constants::zero_celsius_k);
    res.nernst_slope_v = slope;
    const double log_aw = water ? std::log10(water->water_activity) : 0.0;
    if (!std::isfinite(log_aw))
        throw InputError(where, key_of(spec, "water"), "water '" + water->label + "' has a water activity that is not positive");

    if (carriers.size() > 1) {
        std::vector<std::string> others;
        for (std::size_t j : carriers)
            if (j != m_comp) others.push_back(species[j].name);
        res.warnings.push_back("forms of " + spec.element + " built on the other components that contain it (" +
                               join(others) + ") are not in this diagram");
    }

    // Free activities of the ligand components, from the water.
    std::map<std::size_t, double> ligand_log_a;
    if (water && spec.ligands)
        for (std::size_t j = 0; j < db.component_count(); ++j) {
            if (j == m_comp || species[j].role != thermo::ComponentRole::ordinary) continue;
            if (j < water->component_present.size() && water->component_present[j] &&
                std::isfinite(water->component_log_activity[j]))
                ligand_log_a[j] = water->component_log_activity[j];
        }

    // ---- candidates
    const std::size_t water_c = db.water(), proton_c = db.proton(), electron_c = *db.electron();
    WaterGamma gamma(db, water, temperature_c);
    std::vector<Linear> funcs;
    std::vector<std::string> need_ligands, outside_range, constant_in_t, used_ligands;
    std::set<std::size_t> ligands_used;
    const bool away_from_25 = std::abs(temperature_c - 25.0) > 0.5;

    // Splits a stoichiometry into the element's coefficient, H+, H2O, e- and ligand terms.
    // Returns false if it needs a component that is not available.
    struct Split {
        double m = 0.0, h = 0.0, w = 0.0, e = 0.0, ligand_sum = 0.0;
        std::vector<std::size_t> ligands;
    };
    auto split = [&](const thermo::Stoichiometry& st, Split& s, std::vector<std::size_t>& missing) {
        for (const auto& [j, v] : st) {
            if (j == m_comp) s.m += v;
            else if (j == proton_c) s.h += v;
            else if (j == water_c) s.w += v;
            else if (j == electron_c) s.e += v;
            else if (auto it = ligand_log_a.find(j); it != ligand_log_a.end()) {
                s.ligand_sum += v * it->second;
                s.ligands.push_back(j);
            } else {
                missing.push_back(j);
            }
        }
        return missing.empty();
    };
    auto note_temperature = [&](const std::string& name, const thermo::LogKFunction& f) {
        if (!f.range().contains(temperature_c)) outside_range.push_back(name);
        if (away_from_25 && !f.temperature_dependent()) constant_in_t.push_back(name);
    };

    for (std::size_t i = 0; i < species.size(); ++i) {
        const thermo::Species& sp = species[i];
        if (sp.is_component && i != m_comp) continue;
        Split s;
        std::vector<std::size_t> missing;
        const bool ok = split(sp.formation, s, missing);
        if (s.m <= 0.0) continue;  // not a form of this element's component
        if (leave_out.count(sp.name)) continue;
        if (!ok) {
            need_ligands.push_back(sp.name);
            continue;
        }
        for (std::size_t j : s.ligands) ligands_used.insert(j);
        if (i != m_comp) note_temperature(sp.name, sp.log_k);  // the component's own log K is 0
        // Several atoms of the element: the species carries the dissolved amount between its
        // atoms, a(species) = a_d / nu.
        const double log_a = spec.log_activity + gamma.log_gamma(i) - std::log10(s.m);
        DiagramCandidate c;
        c.name = sp.name;
        c.formula = sp.formula.text;
        c.kind = RegionKind::aqueous;
        c.c0 = (log_a - sp.log_k(temperature_c) - s.w * log_aw - s.ligand_sum) / s.m;
        c.c_ph = s.h / s.m;  // log a(H+) = -pH
        c.c_pe = s.e / s.m;  // log a(e-) = -pe
        res.candidates.push_back(c);
    }
    for (const auto& mineral : db.minerals()) {
        Split s;
        std::vector<std::size_t> missing;
        const bool ok = split(mineral.dissolution, s, missing);
        if (s.m <= 0.0) continue;
        if (leave_out.count(mineral.name)) continue;
        if (!ok) {
            need_ligands.push_back(mineral.name);
            continue;
        }
        for (std::size_t j : s.ligands) ligands_used.insert(j);
        note_temperature(mineral.name, mineral.log_k);
        DiagramCandidate c;
        c.name = mineral.name;
        c.formula = mineral.formula.text;
        const auto& els = mineral.formula.elements;
        const bool pure = els.size() == 1 && els.begin()->first == spec.element && mineral.formula.charge == 0;
        c.kind = pure ? RegionKind::metal : RegionKind::solid;
        // Dissolution: log K = sum nu_j log a_j at saturation (solid at unit activity).
        c.c0 = (mineral.log_k(temperature_c) - s.w * log_aw - s.ligand_sum) / s.m;
        c.c_ph = s.h / s.m;
        c.c_pe = s.e / s.m;
        res.candidates.push_back(c);
    }
    if (res.candidates.empty())
        throw InputError(where, key_of(spec, "leave_out"),
                         "nothing is left to draw: every form of " + spec.element + " is in leave_out");
    for (const auto& c : res.candidates) funcs.push_back(Linear{c.c0, c.c_ph, c.c_pe});

    // ---- regions
    const double pe_min = spec.eh_min_v / slope, pe_max = spec.eh_max_v / slope;
    const double x_mag = std::max(std::abs(spec.ph_min), std::abs(spec.ph_max));
    const double y_mag = std::max(std::abs(pe_min), std::abs(pe_max));
    const double span_x = spec.ph_max - spec.ph_min, span_y = pe_max - pe_min;
    const std::vector<P2> rect = {{spec.ph_min, pe_min}, {spec.ph_max, pe_min}, {spec.ph_max, pe_max}, {spec.ph_min, pe_max}};
    const double rect_area = span_x * span_y;
    const std::size_t n = funcs.size();
    std::vector<std::vector<P2>> polys(n);
    for (std::size_t k = 0; k < n; ++k) {
        std::vector<P2> poly = rect;
        for (std::size_t j = 0; j < n && !poly.empty(); ++j) {
            if (j == k) continue;
            const Linear g{funcs[k].c0 - funcs[j].c0, funcs[k].cx - funcs[j].cx, funcs[k].cy - funcs[j].cy};
            poly = clip(poly, g, zero_tolerance(g, x_mag, y_mag), k < j);
            tidy(poly, 1e-12 * span_x, 1e-12 * span_y);
        }
        if (poly.size() < 3 || signed_area(poly) <= 1e-12 * rect_area) poly.clear();
        polys[k] = std::move(poly);
    }

    // ---- boundaries: an edge of region k on the line f_k = f_j whose midpoint is on region j
    const double edge_tol = 1e-7 * std::max(span_x, span_y);
    auto to_eh = [&](const P2& p) { return PhEh{p.x, p.y * slope}; };
    for (std::size_t k = 0; k < n; ++k) {
        const auto& pk = polys[k];
        for (std::size_t e = 0; e < pk.size(); ++e) {
            const P2& a = pk[e];
            const P2& b = pk[(e + 1) % pk.size()];
            if (std::hypot((b.x - a.x) / span_x, (b.y - a.y) / span_y) < 1e-9) continue;
            const P2 mid{0.5 * (a.x + b.x), 0.5 * (a.y + b.y)};
            for (std::size_t j = k + 1; j < n; ++j) {
                if (polys[j].empty()) continue;
                const Linear g{funcs[k].c0 - funcs[j].c0, funcs[k].cx - funcs[j].cx, funcs[k].cy - funcs[j].cy};
                const double tol = 1e3 * zero_tolerance(g, x_mag, y_mag);
                if (std::abs(g.at(a)) > tol || std::abs(g.at(b)) > tol) continue;
                if (!inside_convex(polys[j], mid.x, mid.y, edge_tol, [](const P2& p) { return p.x; },
                                   [](const P2& p) { return p.y; }))
                    continue;
                res.boundaries.push_back(Boundary{res.candidates[k].name, res.candidates[j].name, to_eh(a), to_eh(b)});
                break;
            }
        }
    }

    for (std::size_t k = 0; k < n; ++k) {
        if (polys[k].empty()) continue;
        Region r;
        r.name = res.candidates[k].name;
        r.formula = res.candidates[k].formula;
        r.kind = res.candidates[k].kind;
        for (const P2& p : polys[k]) r.polygon.push_back(to_eh(p));
        // Centroid and area in (pH, Eh).
        double a2 = 0.0, cx = 0.0, cy = 0.0;
        const PhEh o = r.polygon.front();  // relative to a vertex, for accuracy
        for (std::size_t i = 0; i < r.polygon.size(); ++i) {
            const PhEh& p = r.polygon[i];
            const PhEh& q = r.polygon[(i + 1) % r.polygon.size()];
            const double px = p.ph - o.ph, py = p.eh_v - o.eh_v, qx = q.ph - o.ph, qy = q.eh_v - o.eh_v;
            const double cr = px * qy - qx * py;
            a2 += cr;
            cx += (px + qx) * cr;
            cy += (py + qy) * cr;
        }
        r.area = 0.5 * a2;
        r.label_point = PhEh{o.ph + cx / (3.0 * a2), o.eh_v + cy / (3.0 * a2)};
        res.regions.push_back(std::move(r));
    }

    // ---- water-stability lines
    // H2/H2O: 2 H+ + 2 e- = H2(g) has log K = 0 at every temperature by convention (SHE).
    res.water_lines.push_back(water_line("H2/H2O", "2 H+ + 2 e- = H2(g)", 0.0, -slope, spec.ph_min, spec.ph_max,
                                         spec.eh_min_v, spec.eh_max_v));
    // O2/H2O from the database's O2(g): its dissolution O2(g) = sum nu_j j in H2O, H+, e-.
    {
        const thermo::PhaseEntry* o2 = nullptr;
        for (const auto& g : db.gases()) {
            const auto& els = g.formula.elements;
            if (els.size() == 1 && els.begin()->first == "O" && std::abs(els.begin()->second - 2.0) < 1e-12 &&
                g.formula.charge == 0) {
                o2 = &g;
                break;
            }
        }
        bool done = false;
        if (o2) {
            double nw = 0.0, nh = 0.0, ne = 0.0;
            bool only_water = true;
            for (const auto& [j, v] : o2->dissolution) {
                if (j == water_c) nw += v;
                else if (j == proton_c) nh += v;
                else if (j == electron_c) ne += v;
                else only_water = false;
            }
            if (only_water && ne != 0.0) {
                const double k_o2 = o2->log_k(temperature_c);
                // log K = nw log a_w - nh pH - ne pe at p(O2) = 1, so pe = (nw log a_w - log K)/ne - (nh/ne) pH.
                res.o2_e0_v = -(slope * k_o2) / ne;
                res.water_lines.push_back(water_line("O2/H2O", "O2(g) + 4 H+ + 4 e- = 2 H2O",
                                                     slope * (nw * log_aw - k_o2) / ne, -slope * nh / ne, spec.ph_min,
                                                     spec.ph_max, spec.eh_min_v, spec.eh_max_v));
                note_temperature(o2->name, o2->log_k);
                done = true;
            }
        }
        if (!done)
            res.warnings.push_back("database '" + db.name() +
                                   "' has no O2(g) formed from water alone: the O2/H2O line is not drawn");
    }

    // ---- points
    res.points = spec.points;
    const std::string water_point = water && !water->label.empty() ? water->label : std::string("water");
    if (water && water->pe &&
        std::none_of(res.points.begin(), res.points.end(), [&](const WaterPoint& p) { return p.label == water_point; }))
        res.points.push_back(WaterPoint{water_point, water->ph,
                                        *water->pe * slope});
    for (const auto& p : res.points)
        if (p.ph < spec.ph_min || p.ph > spec.ph_max || p.eh_v < spec.eh_min_v || p.eh_v > spec.eh_max_v)
            res.warnings.push_back("water point '" + p.label + "' (pH " + num(p.ph, 4) + ", Eh " + num(p.eh_v, 4) +
                                   " V) lies outside the diagram");

    // ---- warnings
    if (!spec.leave_out.empty())
        res.warnings.push_back("left out as asked (leave_out): " + join(spec.leave_out) +
                               "; the regions drawn are those of the remaining forms");
    if (!need_ligands.empty()) {
        std::string why = !water ? std::string("give a water and set ligands = true to include them")
                                 : !spec.ligands ? std::string("set ligands = true to include them at the water's activities")
                                                 : std::string("their other components are not in water '" + water->label + "'");
        res.warnings.push_back("left out " + std::to_string(need_ligands.size()) + " form(s) of " + spec.element +
                               " that need other components (" + join(need_ligands) + "): " + why);
    }
    for (std::size_t j : ligands_used) used_ligands.push_back(species[j].name + " (log a " + num(ligand_log_a[j], 4) + ")");
    if (!used_ligands.empty())
        res.warnings.push_back("ligand activities held at the values of water '" + water->label + "' over the whole diagram: " +
                               join(used_ligands) + "; the forms with them are valid near that water's pH and Eh");
    if (std::none_of(res.candidates.begin(), res.candidates.end(),
                     [](const DiagramCandidate& c) { return c.kind != RegionKind::aqueous; }))
        res.warnings.push_back("database '" + db.name() + "' has no solid of " + spec.element +
                               ": the diagram shows dissolved species only");
    if (res.candidates.size() == 1)
        res.warnings.push_back("only one form of " + spec.element + " (" + res.candidates.front().name + ") is known");
    if (!outside_range.empty())
        res.warnings.push_back("temperature " + num(temperature_c) + " degC is outside the stated range of log K for " +
                               join(outside_range) + "; values are extrapolated");
    if (!constant_in_t.empty())
        res.warnings.push_back("log K taken as constant (the database gives no temperature dependence) for " +
                               join(constant_in_t));
    if (!gamma.from_model().empty())
        res.warnings.push_back("activity coefficients of " + join(gamma.from_model()) +
                               " (not in the speciation of water '" + water->label +
                               "') from its activity model at its ionic strength");
    return res;
}

}  // namespace deltag::electro
