// Line plots as standalone SVG, and their data as CSV. Standard library only.
//
// Look: title top left; plot area with light horizontal grid lines and fainter vertical ones,
// axis lines left and bottom with outward ticks; legend outside the plot area on the right;
// a small grey note at the bottom. Colours are the Okabe-Ito set, ordered so the strongest
// come first and the yellow (low contrast on white) last; every series also has its own dash
// pattern and marker shape, so the curves stay apart in grey print.
#include "deltag/plot.hpp"

#include "io/svg_axes.hpp"
#include "io/text_format.hpp"

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstddef>
#include <limits>
#include <stdexcept>
#include <string_view>

namespace deltag::io {

namespace {

constexpr std::array<std::string_view, 8> kColours = {"#0072B2", "#D55E00", "#009E73", "#E69F00",
                                                      "#CC79A7", "#56B4E9", "#000000", "#F0E442"};
constexpr std::array<std::string_view, 6> kDashes = {"", "10 4", "2 3.5", "10 3 2 3", "5 3", "10 3 2 3 2 3"};
constexpr int kMarkerShapes = 6;

constexpr double kWidth = 720.0;
constexpr double kMinHeight = 480.0;
constexpr double kTitleSize = 16.0, kLabelSize = 13.0, kTickSize = 11.0, kLegendSize = 12.0,
                 kNoteSize = 10.5;
constexpr std::string_view kFont = "DejaVu Sans, Liberation Sans, Arial, sans-serif";

using text::chars_for_width;
using text::coord;
using text::csv_field;
using text::fixed;
using text::text_width;
using text::wrap;

double pow10(int e) { return std::pow(10.0, static_cast<double>(e)); }

void check_lengths(const LinePlot& plot) {
    for (const auto& s : plot.series)
        if (s.x.size() != s.y.size())
            throw std::invalid_argument("plot series '" + s.name + "' has " + std::to_string(s.x.size()) +
                                        " x values but " + std::to_string(s.y.size()) + " y values");
}

// ---- SVG pieces ---------------------------------------------------------------------------

struct Style {
    std::string_view colour;
    std::string_view dash;
    int marker;
};

Style style_of(std::size_t i) {
    return Style{kColours[i % kColours.size()], kDashes[(i + i / kMarkerShapes) % kDashes.size()],
                 static_cast<int>(i % kMarkerShapes)};
}

// A marker of radius about r at (x, y); fill and outline come from the enclosing group.
std::string marker_svg(int shape, double x, double y, double r) {
    auto poly = [&](std::initializer_list<std::pair<double, double>> pts) {
        std::string d = "<path d=\"";
        bool first = true;
        for (const auto& [dx, dy] : pts) {
            d += first ? "M" : "L";
            d += coord(x + dx * r) + " " + coord(y + dy * r);
            first = false;
        }
        return d + "Z\"/>";
    };
    switch (shape) {
        case 0: return "<circle cx=\"" + coord(x) + "\" cy=\"" + coord(y) + "\" r=\"" + coord(r) + "\"/>";
        case 1: return poly({{-0.85, -0.85}, {0.85, -0.85}, {0.85, 0.85}, {-0.85, 0.85}});
        case 2: return poly({{0, -1.15}, {1.05, 0.8}, {-1.05, 0.8}});
        case 3: return poly({{0, -1.2}, {1.1, 0}, {0, 1.2}, {-1.1, 0}});
        case 4: return poly({{0, 1.15}, {1.05, -0.8}, {-1.05, -0.8}});
        default:
            return poly({{-0.35, -1.1}, {0.35, -1.1}, {0.35, -0.35}, {1.1, -0.35}, {1.1, 0.35}, {0.35, 0.35},
                         {0.35, 1.1}, {-0.35, 1.1}, {-0.35, 0.35}, {-1.1, 0.35}, {-1.1, -0.35}, {-0.35, -0.35}});
    }
}

std::string text_svg(double x, double y, std::string_view anchor, double size, std::string_view extra,
                     std::string_view content) {
    std::string t = "<text x=\"" + coord(x) + "\" y=\"" + coord(y) + "\" font-size=\"" + coord(size) + "\"";
    if (anchor != "start") t += " text-anchor=\"" + std::string(anchor) + "\"";
    if (!extra.empty()) t += " " + std::string(extra);
    return t + ">" + xml_escape(content) + "</text>\n";
}

std::string line_svg(double x1, double y1, double x2, double y2) {
    return "<line x1=\"" + coord(x1) + "\" y1=\"" + coord(y1) + "\" x2=\"" + coord(x2) + "\" y2=\"" + coord(y2) +
           "\"/>\n";
}

bool finite_point(const Series& s, std::size_t i) { return std::isfinite(s.x[i]) && std::isfinite(s.y[i]); }

}  // namespace

// ---- scales -------------------------------------------------------------------------------

AxisScale nice_scale(double data_low, double data_high, double margin_fraction, int target_intervals) {
    if (!std::isfinite(data_low) || !std::isfinite(data_high))
        throw std::invalid_argument("axis range has a non-finite bound");
    if (target_intervals < 1) throw std::invalid_argument("axis needs at least one tick interval");
    double lo = std::min(data_low, data_high), hi = std::max(data_low, data_high);
    const double magnitude = std::max(std::abs(lo), std::abs(hi));
    if (hi - lo <= magnitude * 1e-9) {  // constant (to display precision): widen around the value
        const double centre = 0.5 * (lo + hi);
        const double half = centre == 0.0 ? 1.0 : 0.1 * std::abs(centre);
        lo = centre - half;
        hi = centre + half;
    }
    const double margin = std::max(0.0, margin_fraction) * (hi - lo);
    double plo = lo - margin, phi = hi + margin;
    if (lo >= 0.0 && plo < 0.0) plo = 0.0;
    if (hi <= 0.0 && phi > 0.0) phi = 0.0;
    const double raw = (phi - plo) / target_intervals;
    if (!std::isfinite(raw) || raw <= 0.0) throw std::invalid_argument("axis range is too large to draw");

    int exponent = static_cast<int>(std::floor(std::log10(raw)));
    const double f = raw / pow10(exponent);
    double nice = f <= 1.0 + 1e-9 ? 1.0 : f <= 2.0 + 1e-9 ? 2.0 : f <= 5.0 + 1e-9 ? 5.0 : 10.0;
    if (nice == 10.0) {
        nice = 1.0;
        ++exponent;
    }
    // Values are (integer * nice) scaled by the power of ten, dividing for negative powers so
    // that e.g. 0.3 is the double nearest 0.3, not 3 * 0.1.
    auto value = [&](double k) { return exponent >= 0 ? k * nice * pow10(exponent) : k * nice / pow10(-exponent); };
    AxisScale s;
    s.step = value(1.0);
    // Tolerance in units of a step: rounding noise only (a few ulps of the quotient).
    auto tol = [](double q) { return 1e-9 + 1e-14 * std::abs(q); };
    const double q0 = plo / s.step, q1 = phi / s.step;
    const double i0 = std::floor(q0 + tol(q0)), i1 = std::ceil(q1 - tol(q1));
    for (double k = i0; k <= i1 + 0.5; k += 1.0) {
        const double v = value(k);
        s.ticks.push_back(v == 0.0 ? 0.0 : v);  // no -0
    }
    s.low = s.ticks.front();
    s.high = s.ticks.back();
    return s;
}

std::string tick_label(double value, double step, double axis_magnitude) {
    if (!std::isfinite(value) || !std::isfinite(step) || step <= 0.0)
        throw std::invalid_argument("tick label needs a finite value and a positive step");
    if (std::abs(value) < step * 1e-6) value = 0.0;
    const bool scientific = axis_magnitude >= 1e6 || (axis_magnitude > 0.0 && axis_magnitude < 1e-3);
    if (!scientific) {
        const int decimals = std::max(0, static_cast<int>(std::ceil(-std::log10(step) - 1e-9)));
        return fixed(value, decimals);
    }
    if (value == 0.0) return "0";
    const int e = static_cast<int>(std::floor(std::log10(std::abs(value)) + 1e-9));
    const int decimals = std::max(0, static_cast<int>(std::ceil(std::log10(pow10(e) / step) - 1e-9)));
    std::string mantissa = fixed(value / pow10(e), decimals);
    if (mantissa.find('.') != std::string::npos) {
        while (mantissa.back() == '0') mantissa.pop_back();
        if (mantissa.back() == '.') mantissa.pop_back();
    }
    return mantissa + "e" + std::to_string(e);
}

// ---- CSV ----------------------------------------------------------------------------------

std::string series_csv(const LinePlot& plot) {
    if (plot.series.empty()) throw std::invalid_argument("plot has no series to write as CSV");
    check_lengths(plot);
    const auto& x = plot.series.front().x;
    for (const auto& s : plot.series) {
        bool same = s.x.size() == x.size();
        for (std::size_t i = 0; same && i < x.size(); ++i)
            same = s.x[i] == x[i] || (std::isnan(s.x[i]) && std::isnan(x[i]));
        if (!same)
            throw std::invalid_argument("CSV needs one x column: series '" + s.name +
                                        "' does not have the same x values as series '" +
                                        plot.series.front().name + "'");
    }
    // Numbers at 15 significant digits: no binary noise such as 6.450000000000001.
    auto cell = [](double v) { return text::csv_number(v); };
    std::string out = csv_field(plot.x_label.empty() ? std::string("x") : plot.x_label);
    for (const auto& s : plot.series) {
        out += ',';
        out += csv_field(s.name);
    }
    out += '\n';
    for (std::size_t i = 0; i < x.size(); ++i) {
        out += cell(x[i]);
        for (const auto& s : plot.series) {
            out += ',';
            out += cell(s.y[i]);
        }
        out += '\n';
    }
    return out;
}

// ---- SVG ----------------------------------------------------------------------------------

namespace {

// The frame of one panel: what the caller asks for (minimum height, and the least left margin
// and legend width, so stacked panels line their plot areas up) and what was drawn.
struct PanelFrame {
    double min_height = kMinHeight, min_plot_left = 0.0, min_legend_w = 0.0;
    double height = 0.0, plot_left = 0.0, legend_w = 0.0;  // out
};

// One panel: a whole SVG document, its clip path under clip_id.
std::string panel_svg(const LinePlot& plot, const std::string& clip_id, PanelFrame& frame) {

    // Data ranges: x over every finite x (so the whole swept range shows even where a value
    // is missing), y over every drawable point and every reference line.
    constexpr double inf = std::numeric_limits<double>::infinity();
    double xmin = inf, xmax = -inf, ymin = inf, ymax = -inf;
    std::size_t drawable = 0;
    for (const auto& s : plot.series)
        for (std::size_t i = 0; i < s.x.size(); ++i) {
            if (std::isfinite(s.x[i])) {
                xmin = std::min(xmin, s.x[i]);
                xmax = std::max(xmax, s.x[i]);
            }
            if (finite_point(s, i)) {
                ++drawable;
                ymin = std::min(ymin, s.y[i]);
                ymax = std::max(ymax, s.y[i]);
            }
        }
    if (drawable == 0)
        throw std::invalid_argument("plot '" + plot.title + "' has no point with finite x and y values");
    for (const auto& [y, label] : plot.y_reference_lines) {
        if (!std::isfinite(y))
            throw std::invalid_argument("reference line '" + label + "' of plot '" + plot.title + "' is not finite");
        ymin = std::min(ymin, y);
        ymax = std::max(ymax, y);
    }
    const AxisScale xs = nice_scale(xmin, xmax, 0.0);
    const AxisScale ys = nice_scale(ymin, ymax, 0.04);
    const double xmag = std::max(std::abs(xs.low), std::abs(xs.high));
    const double ymag = std::max(std::abs(ys.low), std::abs(ys.high));
    std::vector<std::string> xlabels, ylabels;
    for (double t : xs.ticks) xlabels.push_back(tick_label(t, xs.step, xmag));
    for (double t : ys.ticks) ylabels.push_back(tick_label(t, ys.step, ymag));

    // ---- layout
    const auto title_lines = wrap(plot.title, chars_for_width(kWidth - 40.0, kTitleSize));
    const auto note_lines = wrap(plot.note, chars_for_width(kWidth - 40.0, kNoteSize));

    constexpr double kLegendTextMax = 190.0, kSample = 30.0, kLegendPad = 10.0, kLegendLine = 15.0,
                     kLegendGap = 7.0;
    std::vector<std::vector<std::string>> legend_names;
    double legend_text_w = 0.0, legend_h = kLegendPad * 2.0 - kLegendGap;
    for (const auto& s : plot.series) {
        auto lines = wrap(s.name.empty() ? std::string("(unnamed)") : s.name,
                          chars_for_width(kLegendTextMax, kLegendSize));
        if (lines.empty()) lines.emplace_back("(unnamed)");
        for (const auto& l : lines) legend_text_w = std::max(legend_text_w, text_width(l, kLegendSize));
        legend_h += kLegendLine * static_cast<double>(lines.size()) + kLegendGap;
        legend_names.push_back(std::move(lines));
    }
    // As wide as its widest line: names are wrapped at words, and a word longer than a line is
    // never cut, so the box grows to hold it (the plot area gives way).
    const double legend_w = std::max(frame.min_legend_w, kLegendPad + kSample + 8.0 + legend_text_w + kLegendPad);
    frame.legend_w = legend_w;

    double tick_w = 0.0;
    for (const auto& l : ylabels) tick_w = std::max(tick_w, text_width(l, kTickSize));
    const double plot_left = std::max(frame.min_plot_left, 26.0 + 10.0 + tick_w + 8.0);
    frame.plot_left = plot_left;
    const double plot_right = kWidth - 16.0 - legend_w - 18.0;
    const double plot_top = title_lines.empty() ? 22.0 : 30.0 + 20.0 * static_cast<double>(title_lines.size());
    const auto xtitle_lines = wrap(plot.x_label, chars_for_width(plot_right - plot_left, kLabelSize));
    const double below = 22.0 + 17.0 * static_cast<double>(std::max<std::size_t>(1, xtitle_lines.size())) +
                         (note_lines.empty() ? 8.0 : 14.0 + 13.0 * static_cast<double>(note_lines.size()));
    const double height = std::max(frame.min_height, plot_top + std::max(240.0, legend_h) + below);
    frame.height = height;
    const double plot_bottom = height - below;

    auto px = [&](double x) { return plot_left + (x - xs.low) / (xs.high - xs.low) * (plot_right - plot_left); };
    auto py = [&](double y) { return plot_bottom - (y - ys.low) / (ys.high - ys.low) * (plot_bottom - plot_top); };

    // ---- document
    std::string o;
    o += "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + coord(kWidth) + "\" height=\"" + coord(height) +
         "\" viewBox=\"0 0 " + coord(kWidth) + " " + coord(height) + "\" font-family=\"" + std::string(kFont) +
         "\" role=\"img\">\n";
    if (!plot.title.empty() || clip_id == "deltag-plot-area") o += "<title>" + xml_escape(plot.title) + "</title>\n";
    if (!plot.note.empty()) o += "<desc>" + xml_escape(plot.note) + "</desc>\n";
    o += "<defs><clipPath id=\"" + clip_id + "\"><rect x=\"" + coord(plot_left) + "\" y=\"" + coord(plot_top) +
         "\" width=\"" + coord(plot_right - plot_left) + "\" height=\"" + coord(plot_bottom - plot_top) +
         "\"/></clipPath></defs>\n";
    o += "<rect width=\"" + coord(kWidth) + "\" height=\"" + coord(height) + "\" fill=\"#FFFFFF\"/>\n";

    // Title.
    o += "<g class=\"title\" fill=\"#1A1A1A\" font-weight=\"bold\">\n";
    for (std::size_t i = 0; i < title_lines.size(); ++i)
        o += text_svg(20.0, 26.0 + 20.0 * static_cast<double>(i), "start", kTitleSize, "", title_lines[i]);
    o += "</g>\n";

    // Plot area and grid.
    o += "<g class=\"grid\">\n<rect x=\"" + coord(plot_left) + "\" y=\"" + coord(plot_top) + "\" width=\"" +
         coord(plot_right - plot_left) + "\" height=\"" + coord(plot_bottom - plot_top) + "\" fill=\"#F7F7F4\"/>\n";
    o += "<g stroke=\"#EBEBEB\" stroke-width=\"1\">\n";
    for (double t : xs.ticks) o += line_svg(px(t), plot_top, px(t), plot_bottom);
    o += "</g>\n<g stroke=\"#DADADA\" stroke-width=\"1\">\n";
    for (double t : ys.ticks) o += line_svg(plot_left, py(t), plot_right, py(t));
    o += "</g>\n</g>\n";

    // Axes: lines, ticks, tick labels, titles.
    o += "<g class=\"axes\" fill=\"#333333\">\n<g stroke=\"#333333\" stroke-width=\"1\">\n";
    o += line_svg(plot_left, plot_bottom, plot_right, plot_bottom);
    o += line_svg(plot_left, plot_bottom, plot_left, plot_top);
    for (double t : xs.ticks) o += line_svg(px(t), plot_bottom, px(t), plot_bottom + 5.0);
    for (double t : ys.ticks) o += line_svg(plot_left - 5.0, py(t), plot_left, py(t));
    o += "</g>\n";
    for (std::size_t i = 0; i < xs.ticks.size(); ++i)
        o += text_svg(px(xs.ticks[i]), plot_bottom + 18.0, "middle", kTickSize, "", xlabels[i]);
    for (std::size_t i = 0; i < ys.ticks.size(); ++i)
        o += text_svg(plot_left - 8.0, py(ys.ticks[i]) + 4.0, "end", kTickSize, "", ylabels[i]);
    for (std::size_t i = 0; i < xtitle_lines.size(); ++i)
        o += text_svg(0.5 * (plot_left + plot_right), plot_bottom + 38.0 + 17.0 * static_cast<double>(i), "middle",
                      kLabelSize, "fill=\"#1A1A1A\"", xtitle_lines[i]);
    {
        const double cx = 24.0, cy = 0.5 * (plot_top + plot_bottom);
        o += text_svg(cx, cy, "middle", kLabelSize,
                      "fill=\"#1A1A1A\" transform=\"rotate(-90 " + coord(cx) + " " + coord(cy) + ")\"", plot.y_label);
    }
    o += "</g>\n";

    // Reference lines under the series; their labels come after the series, on top.
    if (!plot.y_reference_lines.empty()) {
        o += "<g class=\"reference-lines\" stroke=\"#4D4D4D\" stroke-width=\"1.3\" stroke-dasharray=\"7 4\">\n";
        for (const auto& ref : plot.y_reference_lines) o += line_svg(plot_left, py(ref.first), plot_right, py(ref.first));
        o += "</g>\n";
    }

    // Series: the line (with gaps at non-finite points), then the markers.
    o += "<g class=\"series\">\n";
    for (std::size_t si = 0; si < plot.series.size(); ++si) {
        const Series& s = plot.series[si];
        const Style st = style_of(si);
        std::string d;
        bool pen = false;
        std::vector<std::size_t> points;
        for (std::size_t i = 0; i < s.x.size(); ++i) {
            if (!finite_point(s, i)) {
                pen = false;
                continue;
            }
            d += (pen ? "L" : (d.empty() ? "M" : " M")) + coord(px(s.x[i])) + " " + coord(py(s.y[i]));
            pen = true;
            points.push_back(i);
        }
        o += "<g class=\"series-" + std::to_string(si + 1) + "\">\n";
        if (!d.empty()) {
            o += "<path d=\"" + d + "\" fill=\"none\" stroke=\"" + std::string(st.colour) +
                 "\" stroke-width=\"2\" stroke-linejoin=\"round\"";
            if (!st.dash.empty()) o += " stroke-dasharray=\"" + std::string(st.dash) + "\"";
            o += " clip-path=\"url(#" + clip_id + ")\"/>\n";  // markers are not clipped: a point on
                                                                  // the frame stays whole
        }
        // Markers: at most about 24 per series, staggered between series so they do not sit
        // on top of each other; an isolated point always gets one.
        const std::size_t every = std::max<std::size_t>(1, (points.size() + 23) / 24);
        const std::size_t offset = every * si / plot.series.size();
        o += "<g fill=\"" + std::string(st.colour) + "\" stroke=\"#222222\" stroke-width=\"0.7\">\n";
        for (std::size_t j = 0; j < points.size(); ++j) {
            const std::size_t i = points[j];
            const bool isolated = (i == 0 || !finite_point(s, i - 1)) && (i + 1 >= s.x.size() || !finite_point(s, i + 1));
            if ((j + every - offset) % every == 0 || isolated)
                o += marker_svg(st.marker, px(s.x[i]), py(s.y[i]), 4.0) + "\n";
        }
        o += "</g>\n</g>\n";
    }
    o += "</g>\n";

    // Reference labels on a pale patch, at whichever end of the line (above or below it)
    // crosses the fewest drawn curves.
    if (!plot.y_reference_lines.empty()) {
        auto crowding = [&](double rx, double ry, double rw, double rh) {
            std::size_t hits = 0;
            auto inside = [&](double x, double y) { return x >= rx && x <= rx + rw && y >= ry && y <= ry + rh; };
            for (const auto& s : plot.series)
                for (std::size_t i = 0; i < s.x.size(); ++i) {
                    if (!finite_point(s, i)) continue;
                    const double x1 = px(s.x[i]), y1 = py(s.y[i]);
                    hits += inside(x1, y1) ? 4 : 0;  // a marker weighs more than a stretch of line
                    if (i + 1 >= s.x.size() || !finite_point(s, i + 1)) continue;
                    const double x2 = px(s.x[i + 1]), y2 = py(s.y[i + 1]);
                    const double n = std::ceil(std::hypot(x2 - x1, y2 - y1) / 3.0);
                    for (double k = 1.0; k < n; k += 1.0)
                        hits += inside(x1 + (x2 - x1) * k / n, y1 + (y2 - y1) * k / n) ? 1 : 0;
                }
            return hits;
        };
        o += "<g class=\"reference-labels\" fill=\"#333333\" font-style=\"italic\">\n";
        for (const auto& [y, label] : plot.y_reference_lines) {
            if (label.empty()) continue;
            const double yy = py(y), w = text_width(label, kTickSize) + 6.0, h = 14.0;
            double best_x = plot_right - 4.0 - w, best_base = yy - 5.0;
            std::size_t best = std::numeric_limits<std::size_t>::max();
            for (double base : {yy - 5.0, yy + 14.0}) {
                if (base - 10.5 < plot_top || base + 3.5 > plot_bottom) continue;
                for (double x : {plot_right - 4.0 - w, plot_left + 4.0}) {
                    const std::size_t c = crowding(x - 3.0, base - 13.5, w + 6.0, h + 6.0);
                    if (c < best) {
                        best = c;
                        best_x = x;
                        best_base = base;
                    }
                }
            }
            o += "<rect x=\"" + coord(best_x) + "\" y=\"" + coord(best_base - 10.5) + "\" width=\"" + coord(w) +
                 "\" height=\"" + coord(h) + "\" fill=\"#FFFFFF\" fill-opacity=\"0.85\"/>\n";
            o += text_svg(best_x + 3.0, best_base, "start", kTickSize, "", label);
        }
        o += "</g>\n";
    }

    // Legend, outside the plot area on the right.
    {
        const double lx = plot_right + 18.0, ly = plot_top;
        o += "<g class=\"legend\">\n<rect x=\"" + coord(lx) + "\" y=\"" + coord(ly) + "\" width=\"" +
             coord(legend_w) + "\" height=\"" + coord(legend_h) +
             "\" rx=\"3\" fill=\"#FFFFFF\" stroke=\"#C8C8C8\" stroke-width=\"1\"/>\n";
        double y = ly + kLegendPad + 9.0;
        for (std::size_t si = 0; si < plot.series.size(); ++si) {
            const Style st = style_of(si);
            const double mid = y - 4.0;
            o += "<path d=\"M" + coord(lx + kLegendPad) + " " + coord(mid) + "H" + coord(lx + kLegendPad + kSample) +
                 "\" stroke=\"" + std::string(st.colour) + "\" stroke-width=\"2\"";
            if (!st.dash.empty()) o += " stroke-dasharray=\"" + std::string(st.dash) + "\"";
            o += "/>\n<g fill=\"" + std::string(st.colour) + "\" stroke=\"#222222\" stroke-width=\"0.7\">" +
                 marker_svg(st.marker, lx + kLegendPad + 0.5 * kSample, mid, 4.0) + "</g>\n";
            for (const auto& line : legend_names[si]) {
                o += text_svg(lx + kLegendPad + kSample + 8.0, y, "start", kLegendSize, "fill=\"#1A1A1A\"", line);
                y += kLegendLine;
            }
            y += kLegendGap;
        }
        o += "</g>\n";
    }

    // Note.
    if (!note_lines.empty()) {
        o += "<g class=\"note\" fill=\"#555555\">\n";
        double y = plot_bottom + 22.0 + 17.0 * static_cast<double>(std::max<std::size_t>(1, xtitle_lines.size())) + 14.0;
        for (const auto& line : note_lines) {
            o += text_svg(20.0, y, "start", kNoteSize, "", line);
            y += 13.0;
        }
        o += "</g>\n";
    }
    o += "</svg>\n";
    return o;
}

bool drawable(const Series& s) {
    for (std::size_t i = 0; i < s.x.size(); ++i)
        if (finite_point(s, i)) return true;
    return false;
}

}  // namespace

std::string line_plot_svg(const LinePlot& plot) {
    if (plot.series.empty()) throw std::invalid_argument("plot '" + plot.title + "' has no series");
    check_lengths(plot);
    std::vector<std::string> panels;
    for (const auto& s : plot.series)
        if (std::find(panels.begin(), panels.end(), s.panel) == panels.end()) panels.push_back(s.panel);
    PanelFrame single;
    if (panels.size() < 2) return panel_svg(plot, "deltag-plot-area", single);

    // Panels stacked one above another, each a nested SVG document of its own.
    const std::string& ref_panel = plot.reference_panel.empty() ? panels.front() : plot.reference_panel;
    std::vector<LinePlot> parts;
    std::vector<std::string> empty;
    for (const auto& name : panels) {
        LinePlot p;
        p.x_label = plot.x_label;
        p.y_label = name.empty() ? plot.y_label : name;
        for (const auto& s : plot.series)
            if (s.panel == name) p.series.push_back(s);
        if (name == ref_panel) p.y_reference_lines = plot.y_reference_lines;
        if (std::none_of(p.series.begin(), p.series.end(), drawable)) {
            empty.push_back(p.y_label);
            continue;
        }
        parts.push_back(std::move(p));
    }
    if (parts.empty())
        throw std::invalid_argument("plot '" + plot.title + "' has no point with finite x and y values");
    // The x range is shared: every panel gets the x extremes of the whole plot as an invisible
    // (non-finite y) point, so the axes line up.
    double xmin = std::numeric_limits<double>::infinity(), xmax = -xmin;
    for (const auto& s : plot.series)
        for (double x : s.x)
            if (std::isfinite(x)) {
                xmin = std::min(xmin, x);
                xmax = std::max(xmax, x);
            }
    std::string note = plot.note;
    if (!empty.empty()) {
        std::string names;
        for (const auto& e : empty) names += (names.empty() ? "" : "; ") + e;
        note = "No value to draw for: " + names + ". " + note;
    }
    parts.front().title = plot.title;
    parts.back().note = note;
    // The shared x range rides on the first series of each panel as a gap point at each end
    // (not drawn, not in any table).
    for (LinePlot& p : parts) {
        p.series.front().x.insert(p.series.front().x.begin(), xmin);
        p.series.front().y.insert(p.series.front().y.begin(), std::numeric_limits<double>::quiet_NaN());
        p.series.front().x.push_back(xmax);
        p.series.front().y.push_back(std::numeric_limits<double>::quiet_NaN());
    }
    // Two passes: the first finds the widest tick labels and legend, the second draws every
    // panel with them, so the plot areas line up under one another.
    PanelFrame shared;
    shared.min_height = 300.0;
    for (std::size_t k = 0; k < parts.size(); ++k) {
        PanelFrame f = shared;
        (void)panel_svg(parts[k], "deltag-plot-area", f);
        shared.min_plot_left = std::max(shared.min_plot_left, f.plot_left);
        shared.min_legend_w = std::max(shared.min_legend_w, f.legend_w);
    }
    std::string body;
    double y = 0.0;
    for (std::size_t k = 0; k < parts.size(); ++k) {
        PanelFrame f = shared;
        std::string svg = panel_svg(parts[k], "deltag-plot-area-" + std::to_string(k + 1), f);
        const std::string head = "<svg xmlns=\"http://www.w3.org/2000/svg\" ";
        svg.replace(0, head.size(), "<svg x=\"0\" y=\"" + coord(y) + "\" ");
        body += svg;
        y += f.height;
    }
    std::string o = "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + coord(kWidth) + "\" height=\"" + coord(y) +
                    "\" viewBox=\"0 0 " + coord(kWidth) + " " + coord(y) + "\" font-family=\"" + std::string(kFont) +
                    "\" role=\"img\">\n";
    o += "<title>" + xml_escape(plot.title) + "</title>\n";
    if (!note.empty()) o += "<desc>" + xml_escape(note) + "</desc>\n";
    return o + body + "</svg>\n";
}

// Escapes XML special characters; control characters are dropped (tab and newline become a
// space). Shared by the plot and diagram writers.
std::string xml_escape(std::string_view s) {
    std::string out;
    out.reserve(s.size());
    for (char c : s) {
        switch (c) {
            case '&': out += "&amp;"; break;
            case '<': out += "&lt;"; break;
            case '>': out += "&gt;"; break;
            case '"': out += "&quot;"; break;
            case '\'': out += "&apos;"; break;
            default:
                // Control characters are not allowed in XML 1.0 (tab is; it becomes a space).
                if (static_cast<unsigned char>(c) < 0x20) {
                    if (c == '\t' || c == '\n') out += ' ';
                } else {
                    out += c;
                }
        }
    }
    return out;
}

}  // namespace deltag::io
