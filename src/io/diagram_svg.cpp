// Eh-pH diagrams as standalone SVG, and their boundary lines as CSV. Standard library only.
//
// Look: title and a subtitle line top left; a square plot area framed in dark grey, pH
// across, Eh (V vs SHE) up the left with a pe scale on the right; regions filled with light
// tints (sky blue for dissolved species, orange for solids, grey for the metal, from the
// Okabe-Ito colours; neighbours of one kind alternate between shades), each named inside
// itself with a white halo; boundaries solid near-black; the two water-stability lines
// dashed blue with their labels written along them; water points as black dots with a white
// ring, their labels beside them where no two overlap (else further out, with a thin
// leader). With shading the three corrosion classes get their own tint and hatching: plain
// blue (immunity), green hatched one way (passivation), vermillion hatched the other way
// (corrosion). Legend in a box right of the pe scale; a small grey note at the bottom.
#include "deltag/diagram_io.hpp"

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstddef>
#include <limits>
#include <map>
#include <stdexcept>
#include <string_view>

#include "deltag/chem.hpp"
#include "deltag/plot.hpp"
#include "io/label_layout.hpp"
#include "io/svg_axes.hpp"
#include "io/text_format.hpp"

namespace deltag::io {

namespace {

using electro::DiagramResult;
using electro::Region;
using electro::RegionKind;

constexpr double kWidth = 900.0;
constexpr double kPlotLeft = 78.0, kPlotTop = 78.0, kPlotSize = 500.0;
constexpr double kTitleSize = 16.0, kSubtitleSize = 12.0, kAxisTitleSize = 13.0, kTickSize = 11.0,
                 kLegendSize = 12.0, kNoteSize = 10.5, kWaterLabelSize = 10.5, kPointLabelSize = 11.0;
constexpr std::string_view kFont = "DejaVu Sans, Liberation Sans, Arial, sans-serif";
constexpr std::string_view kIdPrefix = "deltag-eh-ph-";

// Okabe-Ito based colours.
constexpr std::string_view kBoundary = "#1A1A1A";
constexpr std::string_view kWaterLine = "#0072B2";
constexpr std::array<std::string_view, 3> kAqueousTints = {"#DCEEF9", "#EAF5FC", "#C6E3F5"};
constexpr std::array<std::string_view, 3> kSolidTints = {"#FBE5BF", "#FCEED4", "#F6D59B"};
constexpr std::array<std::string_view, 3> kMetalTints = {"#DCDCDC", "#ECECEC", "#CBCBCB"};
struct ClassStyle {
    std::string_view tint, hatch;  // hatch colour; empty: no hatch
    double angle;
};
constexpr ClassStyle kCorrosion{"#F7DCCB", "#D55E00", -45.0};
constexpr ClassStyle kPassivation{"#D3EDE3", "#009E73", 45.0};
constexpr ClassStyle kImmunity{"#D2E4F1", "", 0.0};

using text::coord;
using text::fixed;
using text::text_width;
using text::wrap;
std::string minus(std::string s) { return text::typographic_minus(std::move(s)); }

std::string superscript(std::string_view s) {
    static const char* sup[] = {"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"};
    std::string out;
    for (char c : s) {
        if (c >= '0' && c <= '9') out += sup[c - '0'];
        else if (c == '-') out += "⁻";
        else out += c;
    }
    return out;
}

// 10^x as "10⁻⁶", or "3.2 × 10⁻⁶" when x is not an integer.
std::string power_of_ten(double log10_value) {
    const double r = std::round(log10_value);
    if (std::abs(log10_value - r) < 1e-9) return "10" + superscript(std::to_string(static_cast<long long>(r)));
    const double e = std::floor(log10_value);
    const double mant = std::pow(10.0, log10_value - e);
    return fixed(mant, 2) + " × 10" + superscript(std::to_string(static_cast<long long>(e)));
}

std::string temperature_text(double t) {
    const double r = std::round(t * 10.0) / 10.0;
    return minus(std::abs(r - std::round(r)) < 1e-9 ? fixed(r, 0) : fixed(r, 1)) + " °C";
}

// ---- geometry -----------------------------------------------------------------------------

struct Px {
    double x = 0.0, y = 0.0;
};

// Signed distance from p to the interior side of each edge of a convex polygon, minimum
// over edges (positive inside). Works for either orientation.
double clearance(const std::vector<Px>& poly, Px p) {
    double area2 = 0.0;
    for (std::size_t i = 0; i < poly.size(); ++i) {
        const Px& a = poly[i];
        const Px& b = poly[(i + 1) % poly.size()];
        area2 += a.x * b.y - b.x * a.y;
    }
    const double orient = area2 >= 0.0 ? 1.0 : -1.0;
    double best = std::numeric_limits<double>::infinity();
    for (std::size_t i = 0; i < poly.size(); ++i) {
        const Px& a = poly[i];
        const Px& b = poly[(i + 1) % poly.size()];
        const double ex = b.x - a.x, ey = b.y - a.y;
        const double len = std::hypot(ex, ey);
        if (len < 1e-9) continue;
        best = std::min(best, orient * (ex * (p.y - a.y) - ey * (p.x - a.x)) / len);
    }
    return best;
}

// The corners of a w x h box centred at c, turned by angle_deg (SVG rotate: clockwise on
// screen).
std::array<Px, 4> box_corners(Px c, double w, double h, double angle_deg) {
    const double a = angle_deg * 3.14159265358979323846 / 180.0;
    const double ux = std::cos(a), uy = std::sin(a);
    std::array<Px, 4> out{};
    std::size_t k = 0;
    for (double sx : {-0.5, 0.5})
        for (double sy : {-0.5, 0.5})
            out[k++] = Px{c.x + sx * w * ux - sy * h * uy, c.y + sx * w * uy + sy * h * ux};
    return out;
}

// The smallest clearance of the corners of a box.
double box_clearance(const std::vector<Px>& poly, const std::array<Px, 4>& corners) {
    double m = std::numeric_limits<double>::infinity();
    for (const Px& p : corners) m = std::min(m, clearance(poly, p));
    return m;
}

struct Obstacle {
    double x0, y0, x1, y1;
};

bool overlaps(const Obstacle& a, const Obstacle& b) {
    return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
}

// Whether the segment p-q meets the box (Liang-Barsky clipping).
bool segment_hits(Px p, Px q, const Obstacle& b) {
    double t0 = 0.0, t1 = 1.0;
    const double dx = q.x - p.x, dy = q.y - p.y;
    auto edge = [&](double den, double numer) {  // keeps den * t <= numer
        if (den == 0.0) return numer >= 0.0;
        const double t = numer / den;
        if (den > 0.0) t1 = std::min(t1, t);
        else t0 = std::max(t0, t);
        return t0 <= t1;
    };
    return edge(-dx, p.x - b.x0) && edge(dx, b.x1 - p.x) && edge(-dy, p.y - b.y0) && edge(dy, b.y1 - p.y);
}

// ---- SVG pieces ---------------------------------------------------------------------------

std::string text_svg(double x, double y, std::string_view anchor, double size, std::string_view extra,
                     std::string_view content) {
    std::string t = "<text x=\"" + coord(x) + "\" y=\"" + coord(y) + "\" font-size=\"" + coord(size) + "\"";
    if (anchor != "start") t += " text-anchor=\"" + std::string(anchor) + "\"";
    if (!extra.empty()) t += " " + std::string(extra);
    return t + ">" + xml_escape(content) + "</text>\n";
}

std::string line_svg(double x1, double y1, double x2, double y2, std::string_view extra = {}) {
    std::string s = "<line x1=\"" + coord(x1) + "\" y1=\"" + coord(y1) + "\" x2=\"" + coord(x2) + "\" y2=\"" +
                    coord(y2) + "\"";
    if (!extra.empty()) s += " " + std::string(extra);
    return s + "/>\n";
}

std::string path_of(const std::vector<Px>& pts, bool close) {
    std::string d;
    for (std::size_t i = 0; i < pts.size(); ++i) {
        d += i ? 'L' : 'M';
        d += coord(pts[i].x);
        d += ' ';
        d += coord(pts[i].y);
    }
    if (close) d += "Z";
    return d;
}

std::string display_name(const Region& r) {
    return r.kind == RegionKind::aqueous ? chem::pretty(r.name) : r.name;
}

// The second label line: the formula of a solid or metal when it differs from the name.
std::string display_formula(const Region& r) {
    if (r.kind == RegionKind::aqueous || r.formula.empty() || r.formula == r.name) return {};
    return chem::pretty(r.formula);
}

// The class names of electro::corrosion_class, kept here so the writer needs no code of the
// electro layer (only its header's types).
std::string class_name(RegionKind k) {
    switch (k) {
        case RegionKind::aqueous: return "corrosion";
        case RegionKind::solid: return "passivation";
        case RegionKind::metal: return "immunity";
    }
    return "corrosion";
}

std::string class_fill_id(RegionKind k) { return std::string(kIdPrefix) + "class-" + class_name(k); }

const ClassStyle& class_style(RegionKind k) {
    switch (k) {
        case RegionKind::aqueous: return kCorrosion;
        case RegionKind::solid: return kPassivation;
        case RegionKind::metal: return kImmunity;
    }
    return kCorrosion;
}

const std::array<std::string_view, 3>& tints(RegionKind k) {
    switch (k) {
        case RegionKind::aqueous: return kAqueousTints;
        case RegionKind::solid: return kSolidTints;
        case RegionKind::metal: return kMetalTints;
    }
    return kAqueousTints;
}

std::string fill_of(const DiagramResult& d, RegionKind k, std::size_t variant) {
    if (!d.shading) return std::string(tints(k)[variant % 3]);
    const ClassStyle& cs = class_style(k);
    if (cs.hatch.empty()) return std::string(cs.tint);
    return "url(#" + class_fill_id(k) + ")";
}

std::string pattern_defs() {
    std::string o;
    for (RegionKind k : {RegionKind::aqueous, RegionKind::solid}) {
        const ClassStyle& cs = class_style(k);
        o += "<pattern id=\"" + class_fill_id(k) +
             "\" patternUnits=\"userSpaceOnUse\" width=\"7\" height=\"7\" patternTransform=\"rotate(" + coord(cs.angle) +
             ")\"><rect width=\"7\" height=\"7\" fill=\"" + std::string(cs.tint) + "\"/><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"7\" stroke=\"" +
             std::string(cs.hatch) + "\" stroke-opacity=\"0.45\" stroke-width=\"1.2\"/></pattern>\n";
    }
    return o;
}

}  // namespace

// ---- CSV ----------------------------------------------------------------------------------

std::string diagram_csv(const DiagramResult& d) {
    auto field = [](const std::string& s) { return text::csv_field(s); };
    // Numbers at 15 significant digits (no binary noise); a non-finite one is a bug upstream.
    auto round_trip = [](double v) {
        if (!std::isfinite(v)) throw std::logic_error("internal error: non-finite number in an Eh-pH diagram table");
        return text::csv_number(v);
    };
    std::string out = "region_a,region_b,ph_1,eh_1_v,ph_2,eh_2_v\n";
    auto row = [&](const std::string& a, const std::string& b, electro::PhEh p, electro::PhEh q) {
        out += field(a) + "," + field(b) + "," + round_trip(p.ph) + "," + round_trip(p.eh_v) + "," + round_trip(q.ph) +
               "," + round_trip(q.eh_v) + "\n";
    };
    for (const auto& b : d.boundaries) row(b.region_a, b.region_b, b.from, b.to);
    for (const auto& w : d.water_lines) {
        if (!w.visible) continue;
        if (w.name == "H2/H2O") row("H2O", "H2(g)", w.from, w.to);
        else if (w.name == "O2/H2O") row("O2(g)", "H2O", w.from, w.to);
        else row(w.name, "H2O", w.from, w.to);
    }
    return out;
}

// ---- SVG ----------------------------------------------------------------------------------

std::string diagram_svg(const DiagramResult& d) {
    if (d.regions.empty()) throw std::invalid_argument("Eh-pH diagram of '" + d.element + "' has no region to draw");
    for (double v : {d.ph_min, d.ph_max, d.eh_min_v, d.eh_max_v, d.nernst_slope_v, d.temperature_c, d.log_activity})
        if (!std::isfinite(v)) throw std::logic_error("internal error: non-finite range in an Eh-pH diagram");
    if (!(d.ph_min < d.ph_max) || !(d.eh_min_v < d.eh_max_v) || !(d.nernst_slope_v > 0.0))
        throw std::invalid_argument("Eh-pH diagram of '" + d.element + "' has an empty range");

    const double left = kPlotLeft, top = kPlotTop, right = kPlotLeft + kPlotSize, bottom = kPlotTop + kPlotSize;
    auto px = [&](double ph) { return left + (ph - d.ph_min) / (d.ph_max - d.ph_min) * (right - left); };
    auto py = [&](double eh) { return bottom - (eh - d.eh_min_v) / (d.eh_max_v - d.eh_min_v) * (bottom - top); };
    auto to_px = [&](const electro::PhEh& p) { return Px{px(p.ph), py(p.eh_v)}; };

    // ---- ticks: nice steps, only the ticks inside the range (the frame is the range).
    auto inner_ticks = [](double lo, double hi, int intervals) {
        const AxisScale s = nice_scale(lo, hi, 0.0, intervals);
        std::vector<double> t;
        const double tol = 1e-9 * (hi - lo);
        for (double v : s.ticks)
            if (v >= lo - tol && v <= hi + tol) t.push_back(v);
        return std::make_pair(t, s.step);
    };
    const auto [xticks, xstep] = inner_ticks(d.ph_min, d.ph_max, 7);
    const auto [yticks, ystep] = inner_ticks(d.eh_min_v, d.eh_max_v, 7);
    const double pe_lo = d.eh_min_v / d.nernst_slope_v, pe_hi = d.eh_max_v / d.nernst_slope_v;
    const auto [peticks, pestep] = inner_ticks(pe_lo, pe_hi, 6);
    const double xmag = std::max(std::abs(d.ph_min), std::abs(d.ph_max));
    const double ymag = std::max(std::abs(d.eh_min_v), std::abs(d.eh_max_v));
    const double pemag = std::max(std::abs(pe_lo), std::abs(pe_hi));

    // ---- legend content
    struct LegendItem {
        enum class Sample { fill, line, dashed, dot } sample;
        std::string fill;
        std::string text;
    };
    std::vector<LegendItem> legend;
    {
        std::vector<RegionKind> kinds;
        for (RegionKind k : {RegionKind::metal, RegionKind::solid, RegionKind::aqueous})
            if (std::any_of(d.regions.begin(), d.regions.end(), [&](const Region& r) { return r.kind == k; }))
                kinds.push_back(k);
        const std::string act = d.molality ? "at " + power_of_ten(d.log_activity) + " mol/kgw each"
                                           : "at a = " + power_of_ten(d.log_activity) + " each";
        for (RegionKind k : kinds) {
            std::string text;
            if (d.shading) {
                text = k == RegionKind::metal ? "immunity\nthe metal is stable"
                       : k == RegionKind::solid ? "passivation\na solid is stable"
                                                : "corrosion\ndissolved species\n" + act;
            } else {
                text = k == RegionKind::metal ? "metal"
                       : k == RegionKind::solid ? "solid"
                                                : "dissolved species\n" + act;
            }
            legend.push_back({LegendItem::Sample::fill, fill_of(d, k, 0), text});
        }
        legend.push_back({LegendItem::Sample::line, "", "boundary between forms"});
        if (std::any_of(d.water_lines.begin(), d.water_lines.end(), [](const electro::WaterLine& w) { return w.visible; }))
            legend.push_back({LegendItem::Sample::dashed, "", "water stability limits\n(H₂, O₂ at 1 atm)"});
        if (!d.points.empty()) legend.push_back({LegendItem::Sample::dot, "", d.points.size() == 1 ? "water" : "waters"});
    }
    constexpr double kLegendPad = 10.0, kSampleW = 26.0, kLegendLine = 15.0, kLegendGap = 8.0, kLegendTextMax = 200.0;
    const double legend_x = right + 62.0;
    const double legend_w = kWidth - legend_x - 14.0;
    std::vector<std::vector<std::string>> legend_lines;
    double legend_h = 2.0 * kLegendPad - kLegendGap + 18.0;  // with a heading
    for (const auto& it : legend) {
        auto lines = wrap(it.text, text::chars_for_width(std::min(kLegendTextMax, legend_w - 3.0 * kLegendPad - kSampleW), kLegendSize));
        legend_h += kLegendLine * static_cast<double>(lines.size()) + kLegendGap;
        legend_lines.push_back(std::move(lines));
    }

    std::string body;  // the plot, its labels, the axes and the legend, under the title block
    // ---- regions, with shades alternating between neighbours of one kind
    std::map<std::string, std::size_t> index;
    for (std::size_t i = 0; i < d.regions.size(); ++i) index[d.regions[i].name] = i;
    std::vector<std::vector<std::size_t>> neighbours(d.regions.size());
    for (const auto& b : d.boundaries) {
        auto ia = index.find(b.region_a), ib = index.find(b.region_b);
        if (ia == index.end() || ib == index.end()) continue;
        neighbours[ia->second].push_back(ib->second);
        neighbours[ib->second].push_back(ia->second);
    }
    std::vector<std::size_t> variant(d.regions.size(), 0);
    for (std::size_t i = 0; i < d.regions.size(); ++i) {
        std::array<bool, 3> used{};
        for (std::size_t j : neighbours[i])
            if (j < i && d.regions[j].kind == d.regions[i].kind) used[variant[j]] = true;
        std::size_t v = 0;
        while (v < 2 && used[v]) ++v;
        variant[i] = v;
    }
    std::vector<std::vector<Px>> pixel_polys;
    body += "<g class=\"regions\" clip-path=\"url(#" + std::string(kIdPrefix) + "area)\">\n";
    for (std::size_t i = 0; i < d.regions.size(); ++i) {
        const Region& r = d.regions[i];
        std::vector<Px> pp;
        for (const auto& p : r.polygon) pp.push_back(to_px(p));
        const std::string fill = fill_of(d, r.kind, variant[i]);
        body += "<path class=\"region " + class_name(r.kind) + "\" d=\"" + path_of(pp, true) +
             "\" fill=\"" + fill + "\" stroke=\"" + (fill.rfind("url(", 0) == 0 ? std::string(class_style(r.kind).tint) : fill) +
             "\" stroke-width=\"0.6\"><title>" + xml_escape(display_name(r)) + "</title></path>\n";
        pixel_polys.push_back(std::move(pp));
    }
    body += "</g>\n";

    // ---- grid over the tints, faint
    body += "<g class=\"grid\" stroke=\"#000000\" stroke-opacity=\"0.08\" stroke-width=\"1\">\n";
    for (double t : xticks) body += line_svg(px(t), top, px(t), bottom);
    for (double t : yticks) body += line_svg(left, py(t), right, py(t));
    body += "</g>\n";

    // ---- boundaries
    body += "<g class=\"boundaries\" stroke=\"" + std::string(kBoundary) +
         "\" stroke-width=\"1.7\" stroke-linecap=\"round\" clip-path=\"url(#" + std::string(kIdPrefix) + "area)\">\n";
    for (const auto& b : d.boundaries) {
        const Px a = to_px(b.from), c = to_px(b.to);
        body += line_svg(a.x, a.y, c.x, c.y);
    }
    body += "</g>\n";

    // ---- water lines
    std::vector<Obstacle> taken;  // label boxes placed so far (pixels)
    body += "<g class=\"water-lines\" stroke=\"" + std::string(kWaterLine) +
         "\" stroke-width=\"1.6\" stroke-dasharray=\"8 5\" clip-path=\"url(#" + std::string(kIdPrefix) + "area)\">\n";
    for (const auto& w : d.water_lines) {
        if (!w.visible) continue;
        const Px a = to_px(w.from), c = to_px(w.to);
        body += line_svg(a.x, a.y, c.x, c.y);
    }
    body += "</g>\n";
    // ---- water points (placed before region labels so labels can avoid them). Their labels
    // go where they overlap no other label, dot or the frame (label_layout.hpp); a label
    // displaced from its dot gets a leader line; one with no room is named in the note.
    std::string points_svg, leaders_svg;
    std::vector<std::string> unplaced_points;
    {
        constexpr double kDotRadius = 4.6, kDotClear = 6.0, kLabelHeight = 15.0;
        std::vector<const electro::WaterPoint*> drawn;
        std::vector<layout::LabelRequest> requests;
        for (const auto& p : d.points) {
            if (p.ph < d.ph_min || p.ph > d.ph_max || p.eh_v < d.eh_min_v || p.eh_v > d.eh_max_v) continue;
            drawn.push_back(&p);
            requests.push_back({px(p.ph), py(p.eh_v), text_width(p.label, kPointLabelSize, true) + 4.0, kLabelHeight});
        }
        const auto placed =
            layout::place_point_labels(requests, layout::Box{left + 2.0, top + 2.0, right - 2.0, bottom - 2.0}, kDotClear);
        for (std::size_t i = 0; i < drawn.size(); ++i) {
            const double x = requests[i].x, y = requests[i].y;
            points_svg += "<circle cx=\"" + coord(x) + "\" cy=\"" + coord(y) + "\" r=\"" + coord(kDotRadius) +
                          "\" fill=\"#000000\" stroke=\"#FFFFFF\" stroke-width=\"1.6\"/>\n";
            taken.push_back(Obstacle{x - kDotClear, y - kDotClear, x + kDotClear, y + kDotClear});
        }
        for (std::size_t i = 0; i < drawn.size(); ++i) {
            const layout::PlacedLabel& l = placed[i];
            if (!l.placed) {
                unplaced_points.push_back("'" + drawn[i]->label + "' (pH " + minus(fixed(drawn[i]->ph, 2)) + ", Eh " +
                                          minus(fixed(drawn[i]->eh_v, 2)) + " V)");
                continue;
            }
            if (l.leader) {
                leaders_svg += line_svg(l.leader_x0, l.leader_y0, l.leader_x1, l.leader_y1);
                // Region and water-line labels keep off the leader too.
                taken.push_back(Obstacle{std::min(l.leader_x0, l.leader_x1) - 1.0, std::min(l.leader_y0, l.leader_y1) - 1.0,
                                         std::max(l.leader_x0, l.leader_x1) + 1.0, std::max(l.leader_y0, l.leader_y1) + 1.0});
            }
            points_svg += text_svg(l.box.x0 + 2.0, 0.5 * (l.box.y0 + l.box.y1) + 4.0, "start", kPointLabelSize,
                                   "font-weight=\"bold\" fill=\"#000000\" stroke=\"#FFFFFF\" stroke-width=\"3\" "
                                   "stroke-linejoin=\"round\" paint-order=\"stroke\"",
                                   drawn[i]->label);
            taken.push_back(Obstacle{l.box.x0, l.box.y0, l.box.x1, l.box.y1});
        }
    }

    // Segments a label should not cross: boundaries and water lines, in pixels.
    struct Seg {
        Px a, b;
        bool water;
    };
    std::vector<Seg> segs;
    for (const auto& bd : d.boundaries) segs.push_back({to_px(bd.from), to_px(bd.to), false});
    for (const auto& w : d.water_lines)
        if (w.visible) segs.push_back({to_px(w.from), to_px(w.to), true});

    // Water-line labels written along their line: O2 preferably above its line near the left
    // end, H2 below its line near the right end; the place crossing fewest lines and labels wins.
    std::string water_labels;
    for (const auto& w : d.water_lines) {
        if (!w.visible) continue;
        const std::string text = w.name == "H2/H2O" ? "H₂/H₂O" : w.name == "O2/H2O" ? "O₂/H₂O" : w.name;
        const Px a = to_px(w.from), c = to_px(w.to);
        const double len = std::hypot(c.x - a.x, c.y - a.y);
        const double tw = text_width(text, kWaterLabelSize) + 4.0, th = 13.0;
        if (len < tw + 12.0) continue;
        const double ux = (c.x - a.x) / len, uy = (c.y - a.y) / len;
        const double nx = uy, ny = -ux;  // the normal pointing up the screen
        const double angle = std::atan2(uy, ux) * 180.0 / 3.14159265358979323846;
        const bool o2 = w.name != "H2/H2O";
        const double pref_t = o2 ? 0.08 : 0.92, pref_side = o2 ? 1.0 : -1.0;
        double best = std::numeric_limits<double>::infinity();
        Px best_c{};
        Obstacle best_box{};
        for (int k = 0; k <= 48; ++k) {
            const double along = 6.0 + 0.5 * tw + (len - 12.0 - tw) * k / 48.0;
            for (double side : {1.0, -1.0}) {
                const Px ctr{a.x + ux * along + nx * side * (2.5 + 0.5 * th), a.y + uy * along + ny * side * (2.5 + 0.5 * th)};
                const Obstacle local{-0.5 * tw, -0.5 * th, 0.5 * tw, 0.5 * th};
                auto to_local = [&](Px p) { return Px{(p.x - ctr.x) * ux + (p.y - ctr.y) * uy, (p.x - ctr.x) * nx + (p.y - ctr.y) * ny}; };
                double hits = 0.0;
                for (const auto& sg : segs)
                    if (segment_hits(to_local(sg.a), to_local(sg.b), local)) hits += 1.0;
                // Axis-aligned bounds of the turned box: inside the plot, clear of the points.
                const double hx = 0.5 * (tw * std::abs(ux) + th * std::abs(nx)), hy = 0.5 * (tw * std::abs(uy) + th * std::abs(ny));
                const Obstacle box{ctr.x - hx, ctr.y - hy, ctr.x + hx, ctr.y + hy};
                if (box.x0 < left + 2.0 || box.x1 > right - 2.0 || box.y0 < top + 2.0 || box.y1 > bottom - 2.0) hits += 10.0;
                for (const auto& t : taken)
                    if (overlaps(box, t)) hits += 1.0;
                const double score = 100.0 * hits + 10.0 * std::abs(along / len - pref_t) + (side != pref_side ? 2.0 : 0.0);
                if (score < best) {
                    best = score;
                    best_c = ctr;
                    best_box = box;
                }
            }
        }
        water_labels += "<text x=\"0\" y=\"" + coord(0.36 * kWaterLabelSize) + "\" font-size=\"" + coord(kWaterLabelSize) +
                        "\" text-anchor=\"middle\" transform=\"translate(" + coord(best_c.x) + " " + coord(best_c.y) +
                        ") rotate(" + coord(angle) + ")\">" + xml_escape(text) + "</text>\n";
        taken.push_back(best_box);
    }

    // ---- region labels: the largest clearance inside the region, trying smaller text, then
    // text turned along a narrow region, for small regions
    std::string labels_svg;
    std::vector<std::string> unlabelled;
    for (std::size_t i = 0; i < d.regions.size(); ++i) {
        const Region& r = d.regions[i];
        const auto& poly = pixel_polys[i];
        const std::string name = display_name(r);
        const std::string formula = display_formula(r);
        // The direction of the region's longest edge, for text along a band.
        double band = 0.0, longest = 0.0;
        for (std::size_t k = 0; k < poly.size(); ++k) {
            const Px& p = poly[k];
            const Px& q = poly[(k + 1) % poly.size()];
            const double len = std::hypot(q.x - p.x, q.y - p.y);
            if (len > longest) {
                longest = len;
                band = std::atan2(q.y - p.y, q.x - p.x) * 180.0 / 3.14159265358979323846;
            }
        }
        while (band > 90.0) band -= 180.0;
        while (band <= -90.0) band += 180.0;
        if (band > 89.0 || band < -89.0) band = -90.0;  // vertical text reads upwards
        std::vector<double> turned = {-90.0};
        if (std::abs(band) > 8.0 && std::abs(band + 90.0) > 1.0) turned.insert(turned.begin(), band);
        struct Layout {
            double name_size, formula_size;
            bool with_formula;
            double angle;
        };
        std::vector<Layout> layouts;
        if (!formula.empty()) layouts.push_back({12.5, 10.5, true, 0.0});
        layouts.push_back({12.5, 0.0, false, 0.0});
        if (!formula.empty()) layouts.push_back({10.5, 9.0, true, 0.0});
        layouts.push_back({10.5, 0.0, false, 0.0});
        layouts.push_back({9.0, 0.0, false, 0.0});
        for (double a : turned) layouts.push_back({10.5, 0.0, false, a});
        for (double a : turned) layouts.push_back({9.0, 0.0, false, a});
        layouts.push_back({8.0, 0.0, false, 0.0});
        for (double a : turned) layouts.push_back({8.0, 0.0, false, a});
        double minx = std::numeric_limits<double>::infinity(), maxx = -minx, miny = minx, maxy = -minx;
        for (const Px& p : poly) {
            minx = std::min(minx, p.x);
            maxx = std::max(maxx, p.x);
            miny = std::min(miny, p.y);
            maxy = std::max(maxy, p.y);
        }
        const Px centroid = to_px(r.label_point);
        bool placed = false;
        Px best_c = centroid;
        Layout best_l = layouts.back();
        for (const Layout& l : layouts) {
            const double w = std::max(text_width(name, l.name_size, true), l.with_formula ? text_width(formula, l.formula_size) : 0.0) + 4.0;
            const double h = l.name_size * 1.15 + (l.with_formula ? l.formula_size * 1.2 : 0.0) + 2.0;
            double score_here = -std::numeric_limits<double>::infinity(), clear_here = score_here;
            Px c_here = centroid;
            constexpr int kGrid = 24;
            for (int gx = -1; gx <= kGrid; ++gx)
                for (int gy = 0; gy <= kGrid; ++gy) {
                    if (gx < 0 && gy > 0) continue;  // gx = -1: the centroid itself
                    const Px c = gx < 0 ? centroid
                                        : Px{minx + (maxx - minx) * gx / kGrid, miny + (maxy - miny) * gy / kGrid};
                    const auto corners = box_corners(c, w, h, l.angle);
                    double cl = box_clearance(poly, corners);
                    // Keep clear of the frame, the water-line labels, the water points and the
                    // labels placed before.
                    Obstacle box{c.x, c.y, c.x, c.y};
                    for (const Px& q : corners) {
                        cl = std::min({cl, q.x - left, right - q.x, q.y - top, bottom - q.y});
                        box = Obstacle{std::min(box.x0, q.x), std::min(box.y0, q.y), std::max(box.x1, q.x), std::max(box.y1, q.y)};
                    }
                    for (const auto& t : taken)
                        if (overlaps(box, t)) cl = std::min(cl, -1.0);
                    // Enough clearance is as good as more; then nearer the centroid is better,
                    // and off the water lines.
                    double score = std::min(cl, 14.0) - 0.02 * std::hypot(c.x - centroid.x, c.y - centroid.y);
                    for (const auto& sg : segs)
                        if (sg.water && segment_hits(sg.a, sg.b, box)) score -= 6.0;
                    if (score > score_here) {
                        score_here = score;
                        clear_here = cl;
                        c_here = c;
                    }
                }
            if (clear_here >= 1.5) {
                best_c = c_here;
                best_l = l;
                placed = true;
                break;
            }
        }
        if (!placed) {
            // Too small for any layout: named in the note with where it is, not inside.
            double lo_ph = r.polygon.front().ph, hi_ph = lo_ph, lo_eh = r.polygon.front().eh_v, hi_eh = lo_eh;
            for (const auto& p : r.polygon) {
                lo_ph = std::min(lo_ph, p.ph);
                hi_ph = std::max(hi_ph, p.ph);
                lo_eh = std::min(lo_eh, p.eh_v);
                hi_eh = std::max(hi_eh, p.eh_v);
            }
            unlabelled.push_back(name + " (pH " + minus(fixed(lo_ph, 2)) + "–" + minus(fixed(hi_ph, 2)) + ", Eh " +
                                 minus(fixed(lo_eh, 2)) + " to " + minus(fixed(hi_eh, 2)) + " V)");
            continue;
        }
        const double h = best_l.name_size * 1.15 + (best_l.with_formula ? best_l.formula_size * 1.2 : 0.0);
        const double base = best_c.y - 0.5 * h + best_l.name_size * 0.9;
        const std::string halo =
            "stroke=\"#FFFFFF\" stroke-opacity=\"0.85\" stroke-width=\"3\" stroke-linejoin=\"round\" paint-order=\"stroke\"";
        const std::string turn = best_l.angle == 0.0 ? std::string()
                                                     : " transform=\"rotate(" + coord(best_l.angle) + " " + coord(best_c.x) +
                                                           " " + coord(best_c.y) + ")\"";
        labels_svg += text_svg(best_c.x, base, "middle", best_l.name_size, "font-weight=\"bold\" " + halo + turn, name);
        if (best_l.with_formula)
            labels_svg += text_svg(best_c.x, base + best_l.formula_size * 1.2, "middle", best_l.formula_size,
                                   "fill=\"#333333\" " + halo + turn, formula);
        const double w = text_width(name, best_l.name_size, true) + 4.0;
        Obstacle box{best_c.x, best_c.y, best_c.x, best_c.y};
        for (const Px& q : box_corners(best_c, w, h, best_l.angle))
            box = Obstacle{std::min(box.x0, q.x), std::min(box.y0, q.y), std::max(box.x1, q.x), std::max(box.y1, q.y)};
        taken.push_back(box);
    }
    body += "<g class=\"region-labels\" fill=\"#1A1A1A\">\n" + labels_svg + "</g>\n";
    body += "<g class=\"water-line-labels\" fill=\"" + std::string(kWaterLine) + "\" font-style=\"italic\">\n" + water_labels +
         "</g>\n";
    if (!leaders_svg.empty())
        body += "<g class=\"water-point-leaders\" stroke=\"#333333\" stroke-width=\"0.9\">\n" + leaders_svg + "</g>\n";
    if (!points_svg.empty()) body += "<g class=\"water-points\">\n" + points_svg + "</g>\n";

    // ---- frame and axes
    body += "<g class=\"axes\" fill=\"#333333\">\n<g stroke=\"#333333\" stroke-width=\"1\">\n";
    body += "<rect x=\"" + coord(left) + "\" y=\"" + coord(top) + "\" width=\"" + coord(kPlotSize) + "\" height=\"" +
         coord(kPlotSize) + "\" fill=\"none\"/>\n";
    for (double t : xticks) body += line_svg(px(t), bottom, px(t), bottom + 5.0);
    for (double t : yticks) body += line_svg(left - 5.0, py(t), left, py(t));
    for (double t : peticks) body += line_svg(right, py(t * d.nernst_slope_v), right + 5.0, py(t * d.nernst_slope_v));
    body += "</g>\n";
    for (double t : xticks) body += text_svg(px(t), bottom + 18.0, "middle", kTickSize, "", minus(tick_label(t, xstep, xmag)));
    for (double t : yticks) body += text_svg(left - 8.0, py(t) + 4.0, "end", kTickSize, "", minus(tick_label(t, ystep, ymag)));
    for (double t : peticks)
        body += text_svg(right + 8.0, py(t * d.nernst_slope_v) + 4.0, "start", kTickSize, "",
                      minus(tick_label(t, pestep, pemag)));
    body += text_svg(0.5 * (left + right), bottom + 40.0, "middle", kAxisTitleSize, "fill=\"#1A1A1A\"", "pH");
    {
        const double cx = 24.0, cy = 0.5 * (top + bottom);
        body += text_svg(cx, cy, "middle", kAxisTitleSize,
                      "fill=\"#1A1A1A\" transform=\"rotate(-90 " + coord(cx) + " " + coord(cy) + ")\"", "Eh (V vs SHE)");
        const double rx = right + 44.0;
        body += text_svg(rx, cy, "middle", kAxisTitleSize,
                      "fill=\"#1A1A1A\" transform=\"rotate(-90 " + coord(rx) + " " + coord(cy) + ")\"",
                      "pe = Eh F / (RT ln 10)");
    }
    body += "</g>\n";

    // ---- legend
    {
        const double lx = legend_x, ly = top;
        body += "<g class=\"legend\">\n<rect x=\"" + coord(lx) + "\" y=\"" + coord(ly) + "\" width=\"" + coord(legend_w) +
             "\" height=\"" + coord(legend_h) + "\" rx=\"3\" fill=\"#FFFFFF\" stroke=\"#C8C8C8\" stroke-width=\"1\"/>\n";
        body += text_svg(lx + kLegendPad, ly + kLegendPad + 10.0, "start", kLegendSize, "font-weight=\"bold\" fill=\"#1A1A1A\"",
                      d.shading ? "Key: corrosion classes" : "Key");
        double y = ly + kLegendPad + 10.0 + 18.0 + 9.0;
        for (std::size_t i = 0; i < legend.size(); ++i) {
            const auto& it = legend[i];
            const double mid = y - 4.0, sx = lx + kLegendPad;
            switch (it.sample) {
                case LegendItem::Sample::fill:
                    body += "<rect x=\"" + coord(sx) + "\" y=\"" + coord(mid - 7.0) + "\" width=\"" + coord(kSampleW) +
                         "\" height=\"14\" fill=\"" + it.fill + "\" stroke=\"#555555\" stroke-width=\"0.8\"/>\n";
                    break;
                case LegendItem::Sample::line:
                    body += line_svg(sx, mid, sx + kSampleW, mid,
                                  "stroke=\"" + std::string(kBoundary) + "\" stroke-width=\"1.7\"");
                    break;
                case LegendItem::Sample::dashed:
                    body += line_svg(sx, mid, sx + kSampleW, mid,
                                  "stroke=\"" + std::string(kWaterLine) + "\" stroke-width=\"1.6\" stroke-dasharray=\"8 5\"");
                    break;
                case LegendItem::Sample::dot:
                    body += "<circle cx=\"" + coord(sx + 0.5 * kSampleW) + "\" cy=\"" + coord(mid) +
                         "\" r=\"4.6\" fill=\"#000000\" stroke=\"#FFFFFF\" stroke-width=\"1.6\"/>\n";
                    break;
            }
            for (const auto& line : legend_lines[i]) {
                body += text_svg(sx + kSampleW + 8.0, y, "start", kLegendSize, "fill=\"#1A1A1A\"", line);
                y += kLegendLine;
            }
            y += kLegendGap;
        }
        body += "</g>\n";
    }
    // ---- title, subtitle, note
    const std::string title = "Eh–pH diagram of " + d.element + " at " + temperature_text(d.temperature_c);
    std::string subtitle;
    if (d.molality)
        subtitle = "in water '" + d.water_label + "': dissolved " + d.element + " species at " +
                   power_of_ten(d.log_activity) + " mol/kgw each, with the water's activity coefficients; a(H₂O) = " +
                   fixed(d.water_activity, 4);
    else
        subtitle = "dissolved " + d.element + " species at activity " + power_of_ten(d.log_activity) +
                   " each; solids, metal and water at unit activity";
    std::string note = "Lines: two dissolved species at equal activity, or a solid at saturation (database '" + d.database +
                       "', component " + chem::pretty(d.component) + "). Dashed: H₂/H₂O and O₂/H₂O at 1 atm";
    if (d.o2_e0_v) note += ", E°(O₂/H₂O) = " + fixed(*d.o2_e0_v, 3) + " V at this temperature";
    note += ".";
    if (!d.left_out.empty()) {
        note += " Left out as asked:";
        for (std::size_t i = 0; i < d.left_out.size(); ++i) note += (i ? ", " : " ") + d.left_out[i];
        note += ".";
    }
    std::vector<std::string> outside;
    for (const auto& p : d.points)
        if (p.ph < d.ph_min || p.ph > d.ph_max || p.eh_v < d.eh_min_v || p.eh_v > d.eh_max_v) outside.push_back(p.label);
    if (!outside.empty()) {
        note += " Outside the diagram, not drawn:";
        for (std::size_t i = 0; i < outside.size(); ++i) note += (i ? ", '" : " '") + outside[i] + "'";
        note += ".";
    }
    if (!unplaced_points.empty()) {
        note += " No room to name beside their dots:";
        for (std::size_t i = 0; i < unplaced_points.size(); ++i) note += (i ? "; " : " ") + unplaced_points[i];
        note += ".";
    }
    if (!unlabelled.empty()) {
        note += " Too small to name inside:";
        for (std::size_t i = 0; i < unlabelled.size(); ++i) note += (i ? "; " : " ") + unlabelled[i];
        note += ".";
    }
    const auto subtitle_lines = wrap(subtitle, text::chars_for_width(kWidth - 40.0, kSubtitleSize));
    const auto note_lines = wrap(note, text::chars_for_width(kWidth - 40.0, kNoteSize));
    const double title_block = 28.0 + 16.0 * static_cast<double>(subtitle_lines.size());
    const double shift = std::max(0.0, title_block + 24.0 - top);  // more subtitle lines push the plot down
    const double note_top = bottom + shift + 58.0;
    const double height =
        std::max(note_top + 13.0 * static_cast<double>(note_lines.size()) + 10.0, top + shift + legend_h + 20.0);

    std::string o;
    o += "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + coord(kWidth) + "\" height=\"" + coord(height) +
         "\" viewBox=\"0 0 " + coord(kWidth) + " " + coord(height) + "\" font-family=\"" + std::string(kFont) +
         "\" role=\"img\">\n";
    o += "<title>" + xml_escape(title) + "</title>\n<desc>" + xml_escape(subtitle + ". " + note) + "</desc>\n";
    o += "<defs>\n<clipPath id=\"" + std::string(kIdPrefix) + "area\"><rect x=\"" + coord(left) + "\" y=\"" + coord(top) +
         "\" width=\"" + coord(kPlotSize) + "\" height=\"" + coord(kPlotSize) + "\"/></clipPath>\n";
    if (d.shading) o += pattern_defs();
    o += "</defs>\n";
    o += "<rect width=\"" + coord(kWidth) + "\" height=\"" + coord(height) + "\" fill=\"#FFFFFF\"/>\n";

    o += "<g class=\"title\" fill=\"#1A1A1A\">\n";
    o += text_svg(20.0, 28.0, "start", kTitleSize, "font-weight=\"bold\"", title);
    for (std::size_t i = 0; i < subtitle_lines.size(); ++i)
        o += text_svg(20.0, 48.0 + 16.0 * static_cast<double>(i), "start", kSubtitleSize, "fill=\"#333333\"",
                      subtitle_lines[i]);
    o += "</g>\n";
    if (shift > 0.0) o += "<g transform=\"translate(0 " + coord(shift) + ")\">\n";

    o += body;
    if (shift > 0.0) o += "</g>\n";

    // ---- note
    o += "<g class=\"note\" fill=\"#555555\">\n";
    for (std::size_t i = 0; i < note_lines.size(); ++i)
        o += text_svg(20.0, note_top + 13.0 * static_cast<double>(i), "start", kNoteSize, "", note_lines[i]);
    o += "</g>\n</svg>\n";
    return o;
}

}  // namespace deltag::io
