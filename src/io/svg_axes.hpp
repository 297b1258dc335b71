// Axis scales, tick labels and XML escaping shared by the SVG writers (plot_svg.cpp,
// diagram_svg.cpp); internal, not part of the public API. Defined in plot_svg.cpp.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace deltag::io {

// Axis scale with "nice" ticks (steps of 1, 2 or 5 times a power of ten). The data range,
// widened by margin_fraction of its span on each side (never across zero when the data do
// not cross it), is covered by [low, high], both multiples of step. A zero-width range is
// widened around its value. Shared by the plot and diagram writers.
struct AxisScale {
    double low = 0.0, high = 1.0, step = 1.0;
    std::vector<double> ticks;  // low, low + step, ..., high
};
// Throws std::invalid_argument for a non-finite bound or target_intervals < 1.
AxisScale nice_scale(double data_low, double data_high, double margin_fraction = 0.0,
                     int target_intervals = 5);
// Tick label for value on an axis with the given step: fixed decimals enough for the step
// ("0", "0.5", "-2.5", "0.002"), or "1.5e-7" style when the axis magnitude is very large or
// very small.
std::string tick_label(double value, double step, double axis_magnitude);

// XML text escaping for the SVG writers (& < > " '; control characters dropped).
std::string xml_escape(std::string_view text);

}  // namespace deltag::io
