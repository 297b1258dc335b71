// Line plots as standalone SVG documents, and the same data as a CSV table.
// Writers only format; they never solve, print or touch files.
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace deltag::io {

// One curve. x and y have the same length. A point whose x or y is not finite is not drawn
// (the line has a gap there) and is written as an empty cell in the CSV table.
struct Series {
    std::string name;
    std::vector<double> x, y;
    // The panel (y axis) the curve is drawn on, named by its axis title; "" for the plot's
    // own y axis. Quantities of different kinds (pH, SI, mg/L) go on different panels, so
    // one with a large range does not flatten the others.
    std::string panel;
};

struct LinePlot {
    std::string title;    // e.g. "Saturation against cycles of concentration"
    std::string x_label;  // with its unit, e.g. "cycles of concentration (-)"
    std::string y_label;  // with its unit, e.g. "saturation index (log units)"
    std::vector<Series> series;
    // Horizontal dashed lines with a label, e.g. {0.0, "saturation"}; always inside the y range.
    std::vector<std::pair<double, std::string>> y_reference_lines;
    std::string note;     // small text under the plot, e.g. the caution or "invented scenario"
    std::string reference_panel;  // the panel the reference lines belong to ("": the first)
};

// A complete standalone SVG document (UTF-8, no XML declaration; starts with "<svg").
// Series of more than one panel are drawn as panels stacked one above another, in the order
// the panels first appear, sharing the x range; each has its own y axis (titled by the panel
// name) and its own legend; the title heads the first, the note closes the last. A panel
// with no drawable point is left out and named in the note, unless no panel has one.
// Throws std::invalid_argument if the plot has no series, if a series' x and y differ in
// length, if no point has both coordinates finite, or if a reference line is not finite.
std::string line_plot_svg(const LinePlot& plot);

// CSV table: first column x (header x_label), then one column per series (header: its name).
// Every series must have the same x values as the first one (std::invalid_argument if not).
// Numbers are written at 15 significant digits in the shortest form (no binary noise such
// as 6.449999999999999); a non-finite value is an empty cell.
std::string series_csv(const LinePlot& plot);

}  // namespace deltag::io
