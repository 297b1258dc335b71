// SVG line plots and their CSV tables: nice ticks, escaping, gaps for non-finite values,
// the legend, reference lines and every error path. All plot data here are invented numbers
// for layout checks, not results; expected ticks are worked out by hand from the 1-2-5 rule
// with five target intervals.
#include <doctest/doctest.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <string>

#include "deltag/plot.hpp"
#include "io/svg_axes.hpp"

using deltag::io::AxisScale;
using deltag::io::LinePlot;
using deltag::io::Series;
using deltag::io::line_plot_svg;
using deltag::io::nice_scale;
using deltag::io::series_csv;
using deltag::io::tick_label;

namespace {

constexpr double nan_value = std::numeric_limits<double>::quiet_NaN();
constexpr double inf_value = std::numeric_limits<double>::infinity();

std::size_t count(const std::string& text, const std::string& what) {
    std::size_t n = 0;
    for (auto p = text.find(what); p != std::string::npos; p = text.find(what, p + what.size())) ++n;
    return n;
}

std::string lower(std::string s) {
    std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    return s;
}

void check_ticks(const AxisScale& s, double low, double high, double step) {
    CHECK(s.low == doctest::Approx(low));
    CHECK(s.high == doctest::Approx(high));
    CHECK(s.step == doctest::Approx(step));
    REQUIRE(!s.ticks.empty());
    CHECK(s.ticks.front() == s.low);
    CHECK(s.ticks.back() == s.high);
    CHECK(s.ticks.size() == static_cast<std::size_t>(std::llround((high - low) / step)) + 1);
    for (std::size_t i = 1; i < s.ticks.size(); ++i) CHECK(s.ticks[i] - s.ticks[i - 1] == doctest::Approx(step));
}

// Invented scenario: two curves against cycles of concentration, one value missing.
LinePlot sample_plot() {
    LinePlot p;
    p.title = "Saturation against cycles of concentration";
    p.x_label = "cycles of concentration (-)";
    p.y_label = "saturation index (log units)";
    p.series = {Series{"Calcite", {1, 2, 3, 4, 5}, {-0.4, 0.1, 0.5, 0.8, 1.0}},
                Series{"Gypsum", {1, 2, 3, 4, 5}, {-2.3, -1.7, nan_value, -1.1, -0.9}}};
    p.y_reference_lines = {{0.0, "saturation"}};
    p.note = "invented scenario";
    return p;
}

// The value of attribute `name` in the first element that starts with `tag` after `from`.
double attribute(const std::string& svg, const std::string& tag, const std::string& name, std::size_t from = 0) {
    const auto t = svg.find(tag, from);
    REQUIRE(t != std::string::npos);
    const auto a = svg.find(" " + name + "=\"", t);
    REQUIRE(a != std::string::npos);
    return std::stod(svg.substr(a + name.size() + 3));
}

// The d attribute of the first path after position `from`.
std::string first_path(const std::string& svg, std::size_t from) {
    REQUIRE(from != std::string::npos);
    const auto d = svg.find("<path d=\"", from);
    REQUIRE(d != std::string::npos);
    const auto start = d + 9;
    return svg.substr(start, svg.find('"', start) - start);
}

}  // namespace

TEST_CASE("nice_scale: 1-2-5 steps covering the data") {
    check_ticks(nice_scale(0.0, 4.1), 0.0, 5.0, 1.0);      // 4.1/5 = 0.82 -> step 1
    check_ticks(nice_scale(-2.3, 0.7), -3.0, 1.0, 1.0);    // 3.0/5 = 0.6 -> step 1
    check_ticks(nice_scale(0.0, 0.35), 0.0, 0.4, 0.1);     // 0.07 -> 0.1
    check_ticks(nice_scale(0.0, 9.0), 0.0, 10.0, 2.0);     // 1.8 -> 2
    check_ticks(nice_scale(0.0, 20.0), 0.0, 20.0, 5.0);    // 4 -> 5
    check_ticks(nice_scale(0.0, 2.5e7), 0.0, 2.5e7, 5e6);  // large values
    check_ticks(nice_scale(0.7, -2.3), -3.0, 1.0, 1.0);    // bounds in either order
    // Ticks are the doubles nearest the decimal values, so labels and comparisons are exact.
    CHECK(nice_scale(0.0, 0.35).ticks[3] == 0.3);
}

TEST_CASE("nice_scale: negative, tiny and constant ranges") {
    check_ticks(nice_scale(-7.2, -3.1), -8.0, -3.0, 1.0);
    check_ticks(nice_scale(-0.052, -0.011), -0.06, -0.01, 0.01);  // 0.0082 -> 0.01
    // A tiny range: 1e-6 wide, step 2e-7.
    check_ticks(nice_scale(1.0, 1.000001), 1.0, 1.000001, 2e-7);
    check_ticks(nice_scale(3e-9, 7e-9), 3e-9, 7e-9, 1e-9);
    // Constant: widened by 10 % of the value on each side, or to -1..1 around zero.
    const auto c = nice_scale(2.5, 2.5);
    CHECK(c.low < 2.5);
    CHECK(c.high > 2.5);
    check_ticks(c, 2.2, 2.8, 0.1);
    check_ticks(nice_scale(0.0, 0.0), -1.0, 1.0, 0.5);
    check_ticks(nice_scale(-40.0, -40.0), -44.0, -36.0, 2.0);  // -44..-36, 1.6 -> 2
}

TEST_CASE("nice_scale: margin widens the range but never across zero") {
    check_ticks(nice_scale(0.0, 4.0, 0.04), 0.0, 5.0, 1.0);  // 4.16 -> up to 5, low stays at 0
    CHECK(nice_scale(0.0, 4.0, 0.0).high == 4.0);
    CHECK(nice_scale(-4.0, 0.0, 0.05).high == 0.0);
    CHECK(nice_scale(-4.0, -1.0, 0.05).high <= 0.0);
    const auto s = nice_scale(-2.0, 1.0, 0.04);  // -2.12 .. 1.12
    CHECK(s.low < -2.0);
    CHECK(s.high > 1.0);
}

TEST_CASE("nice_scale: errors") {
    CHECK_THROWS_AS(nice_scale(nan_value, 1.0), std::invalid_argument);
    CHECK_THROWS_AS(nice_scale(0.0, inf_value), std::invalid_argument);
    CHECK_THROWS_AS(nice_scale(0.0, 1.0, 0.0, 0), std::invalid_argument);
}

TEST_CASE("tick_label: decimals follow the step") {
    CHECK(tick_label(2.0, 1.0, 5.0) == "2");
    CHECK(tick_label(-2.5, 0.5, 3.0) == "-2.5");
    CHECK(tick_label(1.0, 0.5, 3.0) == "1.0");
    CHECK(tick_label(0.002, 0.001, 0.005) == "0.002");
    CHECK(tick_label(-1e-17, 0.1, 1.0) == "0.0");  // rounding noise is zero, never "-0.0"
    CHECK(tick_label(1.0000002, 2e-7, 1.000001) == "1.0000002");
    CHECK(tick_label(5e6, 5e6, 2.5e7) == "5e6");
    CHECK(tick_label(1.5e-5, 5e-6, 5e-5) == "1.5e-5");
    CHECK(tick_label(5e-6, 5e-6, 5e-5) == "5e-6");
    CHECK(tick_label(0.0, 5e-6, 5e-5) == "0");
    CHECK_THROWS_AS(tick_label(1.0, 0.0, 1.0), std::invalid_argument);
}

TEST_CASE("line_plot_svg: a standalone document with title, axis titles, legend and note") {
    const std::string svg = line_plot_svg(sample_plot());
    CHECK(svg.rfind("<svg xmlns=\"http://www.w3.org/2000/svg\"", 0) == 0);
    std::string trimmed = svg;
    while (!trimmed.empty() && std::isspace(static_cast<unsigned char>(trimmed.back()))) trimmed.pop_back();
    CHECK(trimmed.size() >= 6);
    CHECK(trimmed.substr(trimmed.size() - 6) == "</svg>");
    CHECK(count(svg, "<svg") == 1);
    CHECK(count(svg, "<g>") + count(svg, "<g ") == count(svg, "</g>"));
    CHECK(count(svg, "<text") == count(svg, "</text>"));
    for (const char* s : {"Saturation against cycles of concentration", "cycles of concentration (-)",
                          "saturation index (log units)", ">Calcite<", ">Gypsum<", "invented scenario"})
        CHECK_MESSAGE(svg.find(s) != std::string::npos, s);
    // Tick labels of both axes: x 1..5 step 1; y -2.3..1.0 widened by 4 % is -2.43..1.13,
    // 3.56 / 5 = 0.71 -> step 1, so -3 .. 2.
    for (const char* s : {">1</text>", ">5</text>", ">-3</text>", ">2</text>"})
        CHECK_MESSAGE(svg.find(s) != std::string::npos, s);
    // Okabe-Ito colours for the first two series, and the second one dashed.
    CHECK(svg.find("stroke=\"#0072B2\"") != std::string::npos);
    CHECK(svg.find("stroke=\"#D55E00\" stroke-width=\"2\" stroke-linejoin=\"round\" stroke-dasharray") !=
          std::string::npos);
}

TEST_CASE("line_plot_svg: the legend sits outside the plot area on the right") {
    const std::string svg = line_plot_svg(sample_plot());
    const double area_x = attribute(svg, "<clipPath", "x");
    const double area_w = attribute(svg, "<clipPath", "width");
    const auto legend = svg.find("class=\"legend\"");
    REQUIRE(legend != std::string::npos);
    const double legend_x = attribute(svg, "<rect", "x", legend);
    const double legend_w = attribute(svg, "<rect", "width", legend);
    CHECK(legend_x > area_x + area_w);
    CHECK(legend_x + legend_w <= attribute(svg, "<svg", "width"));
}

TEST_CASE("line_plot_svg: a legend name longer than a line is shown whole, inside its box") {
    // Before, the box was capped at about 200 px, so a long unbreakable name ran out of it.
    LinePlot p = sample_plot();
    const std::string name = "Hydroxyapatite-Ca5(PO4)3OH-calculated";  // ASCII, no space
    p.series[1].name = name;
    const std::string svg = line_plot_svg(p);
    CHECK(svg.find(">" + name + "</text>") != std::string::npos);
    const auto legend = svg.find("class=\"legend\"");
    REQUIRE(legend != std::string::npos);
    const double legend_x = attribute(svg, "<rect", "x", legend);
    const double legend_w = attribute(svg, "<rect", "width", legend);
    // The text starts past the sample (10 + 30 + 8 px) and needs 0.6 em per character at 12 px.
    CHECK(legend_w >= 10.0 + 30.0 + 8.0 + 0.6 * 12.0 * static_cast<double>(name.size()));
    CHECK(legend_x + legend_w <= attribute(svg, "<svg", "width"));
    CHECK(legend_x > attribute(svg, "<clipPath", "x") + attribute(svg, "<clipPath", "width"));
}

TEST_CASE("line_plot_svg: series of different panels are stacked, each with its own y axis") {
    // Invented: pH 7.6-8.4 and CCPP -20..140 mg/L against cycles. On one axis the pH would
    // be a flat line near zero; on panels each has its own range.
    LinePlot p;
    p.title = "Cycles (invented)";
    p.x_label = "cycles of concentration (-)";
    p.note = "invented scenario";
    p.series = {Series{"pH", {1, 2, 3}, {7.6, 8.0, 8.4}, "pH"},
                Series{"CCPP (mg/L as CaCO3)", {1, 2, 3}, {-20, 60, 140}, "CCPP (mg/L as CaCO3)"},
                Series{"SI Calcite", {2, 3, 4}, {-0.2, 0.3, 0.6}, "saturation index (log units)"}};
    p.y_reference_lines = {{0.0, "saturation"}};
    p.reference_panel = "saturation index (log units)";
    const std::string svg = line_plot_svg(p);
    CHECK(count(svg, "<svg") == 4);  // the document and three panels
    CHECK(count(svg, "<svg x=\"0\" y=\"") == 3);
    CHECK(count(svg, "id=\"deltag-plot-area-1\"") == 1);
    CHECK(count(svg, "id=\"deltag-plot-area-3\"") == 1);
    CHECK(count(svg, "url(#deltag-plot-area-2)") == 1);
    // Each panel has its own axis title; the pH panel's ticks are tenths, not tens of mg/L.
    const auto ph_panel = svg.find("<svg x=\"0\" y=\"0\"");
    const auto ccpp_panel = svg.find("<svg x=\"0\" y=\"", ph_panel + 1);
    const auto si_panel = svg.find("<svg x=\"0\" y=\"", ccpp_panel + 1);
    REQUIRE(si_panel != std::string::npos);
    const std::string ph_part = svg.substr(ph_panel, ccpp_panel - ph_panel);
    const std::string si_part = svg.substr(si_panel);
    CHECK(ph_part.find(">8.2</text>") != std::string::npos);
    CHECK(ph_part.find(">Cycles (invented)</text>") != std::string::npos);  // title on the first
    CHECK(si_part.find(">saturation index (log units)</text>") != std::string::npos);
    CHECK(si_part.find(">0.4</text>") != std::string::npos);
    // The reference line only on its panel; the note closes the last panel.
    CHECK(count(svg, ">saturation</text>") == 1);
    CHECK(si_part.find(">saturation</text>") != std::string::npos);
    CHECK(si_part.find(">invented scenario</text>") != std::string::npos);
    // The panels share the x range (1 to 4), though pH stops at 3: same tick labels each.
    CHECK(count(svg, ">4</text>") >= 3);
    // The plot areas line up under one another (same left edge and width), though the tick
    // labels ("8.2", "140", "0.4") and legends differ in width.
    for (const char* id : {"deltag-plot-area-2", "deltag-plot-area-3"}) {
        const auto at = svg.find(std::string("id=\"") + id);
        CHECK(attribute(svg, "<rect", "x", at) == doctest::Approx(attribute(svg, "<clipPath", "x")));
        CHECK(attribute(svg, "<rect", "width", at) == doctest::Approx(attribute(svg, "<clipPath", "width")));
    }
    // The outer height is the sum of the panels'.
    double sum = 0.0;
    for (auto at = svg.find("<svg x=\"0\""); at != std::string::npos; at = svg.find("<svg x=\"0\"", at + 1))
        sum += attribute(svg, "<svg", "height", at);
    CHECK(attribute(svg, "<svg", "height") == doctest::Approx(sum));
}

TEST_CASE("line_plot_svg: a panel with nothing to draw is left out and named in the note") {
    LinePlot p;
    p.title = "t";
    p.x_label = "x";
    p.note = "invented scenario";
    p.series = {Series{"pH", {1, 2}, {7.0, 7.5}, "pH"},
                Series{"Langelier index", {1, 2}, {nan_value, nan_value}, "Langelier index"}};
    const std::string svg = line_plot_svg(p);
    CHECK(count(svg, "<svg x=\"0\"") == 1);
    CHECK(svg.find("No value to draw for: Langelier index.") != std::string::npos);
    p.series[0].y = {nan_value, nan_value};
    CHECK_THROWS_WITH_AS(line_plot_svg(p), doctest::Contains("has no point with finite x and y values"),
                         std::invalid_argument);
}

TEST_CASE("line_plot_svg: XML special characters are escaped, Unicode passes through") {
    LinePlot p = sample_plot();
    p.title = "R&D <test> \"quoted\" 'single'";
    p.x_label = "CO₂ partial pressure (atm)";
    p.series[0].name = "a < b & c";
    p.y_reference_lines = {{0.0, "x > 0 & y"}};
    const std::string svg = line_plot_svg(p);
    CHECK(svg.find("R&amp;D &lt;test&gt; &quot;quoted&quot; &apos;single&apos;") != std::string::npos);
    CHECK(svg.find("a &lt; b &amp; c") != std::string::npos);
    CHECK(svg.find("x &gt; 0 &amp; y") != std::string::npos);
    CHECK(svg.find("CO₂ partial pressure (atm)") != std::string::npos);
    CHECK(svg.find("R&D") == std::string::npos);
    CHECK(svg.find("<test>") == std::string::npos);
    CHECK(svg.find("a < b") == std::string::npos);
}

TEST_CASE("line_plot_svg: non-finite values leave a gap and are never written") {
    LinePlot p = sample_plot();
    p.series[0].y[4] = inf_value;
    p.series.push_back(Series{"Barite", {1, 2, 3, 4, 5}, {0.2, nan_value, 0.3, nan_value, -inf_value}});
    p.series.push_back(Series{"Halite", {1, nan_value, 3, 4, 5}, {-5.0, -4.8, -4.6, -4.5, -4.4}});
    const std::string svg = line_plot_svg(p);
    CHECK(lower(svg).find("nan") == std::string::npos);
    CHECK(lower(svg).find("inf") == std::string::npos);
    // Gypsum (NaN at the third point) is drawn as two pieces: two moves, two segments.
    const std::string gypsum = first_path(svg, svg.find("class=\"series-2\""));
    CHECK(count(gypsum, "M") == 2);
    CHECK(count(gypsum, "L") == 2);
    // Barite's two finite points are isolated: no segment, but each has a marker (triangles).
    const auto b = svg.find("class=\"series-3\"");
    REQUIRE(b != std::string::npos);
    const std::string barite = svg.substr(b, svg.find("class=\"series-4\"") - b);
    const std::string barite_line = first_path(svg, b);
    CHECK(count(barite_line, "M") == 2);
    CHECK(count(barite_line, "L") == 0);
    CHECK(count(barite, "<path d=") == 3);  // the (invisible) line and two markers
    // Halite misses an x value: also two pieces.
    const std::string halite = first_path(svg, svg.find("class=\"series-4\""));
    CHECK(count(halite, "M") == 2);
}

TEST_CASE("line_plot_svg: reference lines are drawn, labelled and inside the y range") {
    LinePlot p = sample_plot();
    p.series = {Series{"Calcite", {1, 2, 3}, {1.2, 1.5, 1.9}}};  // all above the line at 0
    const std::string svg = line_plot_svg(p);
    const auto r = svg.find("class=\"reference-lines\"");
    REQUIRE(r != std::string::npos);
    CHECK(svg.find("stroke-dasharray=\"7 4\"", r) != std::string::npos);
    CHECK(svg.find(">saturation</text>", r) != std::string::npos);
    // The y axis reaches down to 0 so the line is visible: a tick labelled 0.0 exists.
    CHECK(svg.find(">0.0</text>") != std::string::npos);
    // Its y coordinate lies between the plot area's top and bottom.
    const double top = attribute(svg, "<clipPath", "y");
    const double bottom = top + attribute(svg, "<clipPath", "height");
    const double y = attribute(svg, "<line", "y1", r);
    CHECK(y >= top);
    CHECK(y <= bottom);
}

TEST_CASE("line_plot_svg: a reference label moves away from crowded curves") {
    LinePlot p = sample_plot();
    // Right half: curves just above and just below the line at 0; left half far from it.
    p.series = {Series{"above", {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, {-3, -3, -3, -3, -3, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1}},
                Series{"below", {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, {3, 3, 3, 3, 3, -0.1, -0.1, -0.1, -0.1, -0.1, -0.1}}};
    const std::string svg = line_plot_svg(p);
    const double left = attribute(svg, "<clipPath", "x");
    const double width = attribute(svg, "<clipPath", "width");
    const auto labels = svg.find("class=\"reference-labels\"");
    REQUIRE(labels != std::string::npos);
    CHECK(svg.find(">saturation</text>", labels) != std::string::npos);
    CHECK(attribute(svg, "<text", "x", labels) < left + 0.5 * width);
    // With the right end free (the sample plot's curves end away from 0), it stays there.
    const std::string plain = line_plot_svg(sample_plot());
    const auto plain_labels = plain.find("class=\"reference-labels\"");
    REQUIRE(plain_labels != std::string::npos);
    CHECK(attribute(plain, "<text", "x", plain_labels) >
          attribute(plain, "<clipPath", "x") + 0.5 * attribute(plain, "<clipPath", "width"));
}

TEST_CASE("line_plot_svg: a constant series and a single point get a sensible range") {
    LinePlot p = sample_plot();
    p.y_reference_lines.clear();
    p.series = {Series{"flat", {1, 2, 3}, {0.25, 0.25, 0.25}}};
    const std::string svg = line_plot_svg(p);
    // 0.25 +- 0.025, widened by 4 %: 0.223..0.277, 0.0108 -> step 0.02, ticks 0.22 .. 0.28.
    for (const char* s : {">0.22</text>", ">0.24</text>", ">0.26</text>", ">0.28</text>"})
        CHECK_MESSAGE(svg.find(s) != std::string::npos, s);
    p.series = {Series{"one point", {4.0}, {-1.0}}};
    const std::string one = line_plot_svg(p);
    CHECK(one.find("<circle") != std::string::npos);
    CHECK(lower(one).find("nan") == std::string::npos);
}

TEST_CASE("line_plot_svg: many series stay distinguishable") {
    LinePlot p = sample_plot();
    p.series.clear();
    for (int i = 0; i < 9; ++i)
        p.series.push_back(Series{"series " + std::to_string(i), {0, 1, 2}, {0.0 + i, 1.0 + i, 0.5 + i}});
    const std::string svg = line_plot_svg(p);
    for (const char* c : {"#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7", "#000000"})
        CHECK_MESSAGE(svg.find("stroke=\"" + std::string(c) + "\"") != std::string::npos, c);
    CHECK(count(svg, "<g>") + count(svg, "<g ") == count(svg, "</g>"));
    // The ninth series repeats the first colour but not its dash pattern (first is solid).
    const auto s9 = svg.find("class=\"series-9\"");
    REQUIRE(s9 != std::string::npos);
    const std::string ninth = svg.substr(s9, svg.find("</g>", s9) - s9);
    CHECK(ninth.find("#0072B2") != std::string::npos);
    CHECK(ninth.find("stroke-dasharray") != std::string::npos);
}

TEST_CASE("line_plot_svg: errors") {
    LinePlot p = sample_plot();
    p.series.clear();
    CHECK_THROWS_WITH_AS(line_plot_svg(p), doctest::Contains("has no series"), std::invalid_argument);
    p.series = {Series{"empty", {}, {}}, Series{"all NaN", {1, 2}, {nan_value, nan_value}},
                Series{"x missing", {nan_value}, {1.0}}};
    CHECK_THROWS_WITH_AS(line_plot_svg(p), doctest::Contains("no point with finite x and y"), std::invalid_argument);
    p.series = {Series{"short", {1, 2, 3}, {1, 2}}};
    CHECK_THROWS_WITH_AS(line_plot_svg(p), doctest::Contains("'short' has 3 x values but 2 y values"),
                         std::invalid_argument);
    p = sample_plot();
    p.y_reference_lines = {{nan_value, "limit"}};
    CHECK_THROWS_WITH_AS(line_plot_svg(p), doctest::Contains("reference line 'limit'"), std::invalid_argument);
}

TEST_CASE("series_csv: header, rows, quoting and empty cells") {
    LinePlot p = sample_plot();
    p.series[1].name = "Gypsum, \"fine\"";
    p.series[0].y[0] = 0.1;
    const std::string csv = series_csv(p);
    CHECK(csv ==
          "cycles of concentration (-),Calcite,\"Gypsum, \"\"fine\"\"\"\n"
          "1,0.1,-2.3\n"
          "2,0.1,-1.7\n"
          "3,0.5,\n"
          "4,0.8,-1.1\n"
          "5,1,-0.9\n");
    CHECK(lower(csv).find("nan") == std::string::npos);
    p.x_label.clear();
    CHECK(series_csv(p).rfind("x,Calcite,", 0) == 0);
}

TEST_CASE("series_csv: numbers without binary noise, and no -0") {
    // A sweep that steps pH 6.35 by 0.1 lands on 6.449999999999999; the table says 6.45
    // (before, the shortest round-trip text wrote every noisy digit).
    LinePlot p;
    p.x_label = "pH";
    p.series = {Series{"SI Calcite", {6.35, 6.35 + 0.1, 0.1 * 3}, {-0.0, 0.1 + 0.2, 1e-300}}};
    const std::string csv = series_csv(p);
    CHECK(csv == "pH,SI Calcite\n6.35,0\n6.45,0.3\n0.3,1e-300\n");
}

TEST_CASE("series_csv: errors") {
    LinePlot p = sample_plot();
    p.series[1].x[2] = 3.5;
    CHECK_THROWS_WITH_AS(series_csv(p), doctest::Contains("'Gypsum' does not have the same x values as series 'Calcite'"),
                         std::invalid_argument);
    p = sample_plot();
    p.series[1].x.pop_back();
    p.series[1].y.pop_back();
    CHECK_THROWS_AS(series_csv(p), std::invalid_argument);
    p.series[1].y.pop_back();
    CHECK_THROWS_WITH_AS(series_csv(p), doctest::Contains("4 x values but 3 y values"), std::invalid_argument);
    p.series.clear();
    CHECK_THROWS_WITH_AS(series_csv(p), doctest::Contains("no series"), std::invalid_argument);
}
