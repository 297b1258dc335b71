// Eh-pH (Pourbaix) diagrams of one element: where each dissolved species predominates and
// where each solid (oxide, hydroxide, carbonate, ...) or the metal itself is stable, over a
// rectangle of pH and Eh. The regions are computed exactly from the reactions of the
// database, as convex polygons; nothing is sampled on a grid.
//
// Method. For the element's component (e.g. Fe^2+ for Fe) every candidate k defines the log
// activity of the component it needs at a point (pH, pe): a dissolved species at the chosen
// dissolved activity, a solid at saturation. Each is linear in (pH, pe):
//     f_k(pH, pe) = c0 + c_pH * pH + c_pe * pe.
// The predominant or stable form at a point is the one that needs the lowest activity of the
// component, so region k = {f_k <= f_j for every j} within the rectangle: the rectangle
// clipped by one half-plane per other candidate. The diagram is computed in (pH, pe) and
// reported in (pH, Eh) with Eh = pe * RT ln10 / F at the diagram's temperature.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/database.hpp"
#include "deltag/error.hpp"
#include "deltag/speciation.hpp"

namespace deltag::electro {

// A point of a diagram: pH and Eh in volts against the standard hydrogen electrode.
struct PhEh {
    double ph = 0.0;
    double eh_v = 0.0;
};

// A water (a measurement, a process stream) to mark on the diagram.
struct WaterPoint {
    std::string label;
    double ph = 7.0;
    double eh_v = 0.0;
};

struct DiagramSpec {
    std::string label;      // the diagram's name, used in error keys ("diagram.LABEL.element")
    std::string element;    // element symbol, "Fe"
    // The component that carries the element. Empty: the one ordinary component whose
    // formula contains the element (an error names the choices if there are several).
    std::string component;
    // Default 25 degC, or the water's temperature when a water is given (giving both with
    // different values is an error).
    std::optional<double> temperature_c;
    // log10 activity of every dissolved species of the element at its boundaries. With a
    // water it is a log10 molality (mol/kgw): a = gamma * m with the water's gamma.
    double log_activity = -6.0;
    double ph_min = 0.0, ph_max = 14.0;
    double eh_min_v = -1.5, eh_max_v = 1.5;
    // A speciated water: its activity coefficients, water activity and temperature apply.
    // Not owned; must outlive the call. If the water has a pe it is drawn as a point.
    const equilibrium::SpeciationResult* water = nullptr;
    // With a water: also consider species and solids that need other components (ligands:
    // carbonate, sulfate, chloride, ...) at the water's free activities of those
    // components, held fixed over the whole diagram.
    bool ligands = false;
    // Species or minerals (database names) not to consider, e.g. to draw a diagram with a
    // fresh hydroxide instead of the aged oxide.
    std::vector<std::string> leave_out;
    std::vector<SourceLocation> leave_out_where;  // per name of leave_out, for errors (else `where`)
    // Drawn as marked dots with their labels. The water's own point is not added again when
    // a point of the same label is listed here.
    std::vector<WaterPoint> points;
    bool shading = true;             // pictures: immunity / passivation / corrosion classes
    SourceLocation where;            // where the request came from, for error messages
};

enum class RegionKind { aqueous, solid, metal };

// "dissolved", "solid", "metal".
std::string_view region_kind_name(RegionKind kind);
// The corrosion engineer's class of a region: "corrosion" (dissolved), "passivation"
// (solid), "immunity" (metal).
std::string_view corrosion_class(RegionKind kind);

struct Region {
    std::string name;         // database name: "Fe^2+", "Hematite", "Iron"
    std::string formula;      // ASCII formula: "Fe^2+", "Fe2O3", "Fe"
    RegionKind kind = RegionKind::aqueous;
    std::vector<PhEh> polygon;  // convex, counter-clockwise, no repeated vertex
    PhEh label_point;           // centroid (inside, since the polygon is convex)
    double area = 0.0;          // in pH x V
};

// A stretch of line where two neighbouring regions meet.
struct Boundary {
    std::string region_a, region_b;
    PhEh from, to;
};

// A water-stability line Eh = e0_v + slope_v_per_ph * pH, at a gas pressure of 1 atm.
struct WaterLine {
    std::string name;            // "H2/H2O", "O2/H2O"
    std::string reaction;        // as a reduction, ASCII
    double e0_v = 0.0;           // Eh at pH 0 (with the water activity of the diagram)
    double slope_v_per_ph = 0.0; // -RT ln10 / F
    bool visible = false;        // the line crosses the rectangle
    PhEh from, to;               // the part inside the rectangle (when visible)
};

// One candidate: what it needs of the component, as a linear function of (pH, pe).
struct DiagramCandidate {
    std::string name;
    std::string formula;
    RegionKind kind = RegionKind::aqueous;
    double c0 = 0.0, c_ph = 0.0, c_pe = 0.0;  // f = c0 + c_ph * pH + c_pe * pe (log10 a)
};

struct DiagramResult {
    std::string label;
    std::string element;
    std::string component;
    std::string database;          // the database's name
    double temperature_c = 25.0;
    double log_activity = -6.0;    // as given (log10 activity, or log10 molality with a water)
    bool molality = false;         // true with a water
    std::string water_label;       // the water's label, when a water was given
    double water_activity = 1.0;
    double ph_min = 0.0, ph_max = 14.0, eh_min_v = -1.5, eh_max_v = 2.0;
    double nernst_slope_v = 0.0;   // RT ln10 / F at the temperature
    std::optional<double> o2_e0_v; // E°(O2/H2O) at the temperature, from the database's O2(g)

    std::vector<DiagramCandidate> candidates;  // every form considered, in database order
    std::vector<Region> regions;               // the forms that have a region, same order
    std::vector<Boundary> boundaries;
    std::vector<WaterLine> water_lines;        // H2/H2O, then O2/H2O when the database has O2(g)
    std::vector<WaterPoint> points;            // the spec's points, then the water (if it has a pe)
    bool shading = false;
    std::vector<std::string> left_out;        // the spec's leave_out, so pictures and reports can say so
    std::vector<std::string> warnings;

    const Region* find(std::string_view name) const;
    // The region containing the point (on a boundary: the first in order); nullptr outside.
    const Region* region_at(double ph, double eh_v) const;
};

// Computes the diagram. Throws InputError (spec.where, key "diagram[.LABEL].KEY") for an
// unknown element (nearest symbol suggested), an element that no component of the database
// contains, an ambiguous or unknown component, a database without the electron component,
// an empty or non-finite pH or Eh range, a non-finite activity, an unknown name in
// leave_out (nearest name suggested), a temperature that differs from the water's, or a
// water point that is not finite.
DiagramResult eh_ph_diagram(const thermo::Database& db, const DiagramSpec& spec);

}  // namespace deltag::electro
