// Eh-pH diagrams as standalone SVG pictures and as CSV tables of their boundary lines.
// Writers only format; they never solve, print or touch files.
#pragma once

#include <string>

#include "deltag/diagram.hpp"

namespace deltag::io {

// A complete standalone SVG document (UTF-8, starts with "<svg"): the regions filled with
// light tints and named inside, the boundaries as solid lines, the two water-stability lines
// dashed and labelled, the water points as marked dots, axes pH and Eh (V vs SHE) with a pe
// scale on the right, a legend, a title with the element, temperature and activity, and a
// note. With DiagramResult::shading the regions are marked by class (immunity, passivation,
// corrosion) with tints and hatching. Throws std::invalid_argument for a diagram with no
// region and std::logic_error for a non-finite coordinate.
std::string diagram_svg(const electro::DiagramResult& diagram);

// CSV table, one row per boundary segment, then one per visible water-stability line:
//   region_a,region_b,ph_1,eh_1_v,ph_2,eh_2_v
// A water line is written as the boundary between liquid water and the gas
// ("H2O,H2(g),..." and "O2(g),H2O,..."). Names are the database's ASCII names; numbers are
// the shortest text that reads back to the same double. Throws std::logic_error for a
// non-finite number.
std::string diagram_csv(const electro::DiagramResult& diagram);

}  // namespace deltag::io
