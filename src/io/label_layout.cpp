// Greedy candidate placement of point labels (see label_layout.hpp).
#include "io/label_layout.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>

namespace deltag::io::layout {

bool overlap(const Box& a, const Box& b) { return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1; }

bool segment_crosses(double ax, double ay, double bx, double by, const Box& b) {
    // Liang-Barsky clipping against the box; a segment that only touches an edge or a corner
    // (zero length inside) does not cross it.
    double t0 = 0.0, t1 = 1.0;
    const double dx = bx - ax, dy = by - ay;
    auto edge = [&](double den, double numer) {  // keeps den * t <= numer
        if (den == 0.0) return numer > 0.0;
        const double t = numer / den;
        if (den > 0.0) t1 = std::min(t1, t);
        else t0 = std::max(t0, t);
        return t0 < t1;
    };
    if (!(edge(-dx, ax - b.x0) && edge(dx, b.x1 - ax) && edge(-dy, ay - b.y0) && edge(dy, b.y1 - ay))) return false;
    return std::hypot(dx, dy) * (t1 - t0) > 1e-9;
}

namespace {

struct Candidate {
    Box box;
    bool leader = false;
};

// The box of a label of size w x h whose nearest side lies `gap` from (x, y) in direction
// (ux, uy) (a unit vector): right of the point for (1, 0), above it for (0, -1), and so on.
Box box_towards(double x, double y, double ux, double uy, double gap, double w, double h) {
    const double cx = x + ux * gap + 0.5 * w * (std::abs(ux) < 1e-9 ? 0.0 : (ux > 0 ? 1.0 : -1.0));
    const double cy = y + uy * gap + 0.5 * h * (std::abs(uy) < 1e-9 ? 0.0 : (uy > 0 ? 1.0 : -1.0));
    return Box{cx - 0.5 * w, cy - 0.5 * h, cx + 0.5 * w, cy + 0.5 * h};
}

bool inside(const Box& b, const Box& frame) {
    return b.x0 >= frame.x0 && b.x1 <= frame.x1 && b.y0 >= frame.y0 && b.y1 <= frame.y1;
}

}  // namespace

std::vector<PlacedLabel> place_point_labels(const std::vector<LabelRequest>& points, const Box& frame, double dot_radius,
                                            const std::vector<Box>& avoid) {
    std::vector<Box> dots;
    for (const auto& p : points) dots.push_back(Box{p.x - dot_radius, p.y - dot_radius, p.x + dot_radius, p.y + dot_radius});
    std::vector<Box> labels;  // placed so far
    struct Segment {
        double ax, ay, bx, by;
    };
    std::vector<Segment> leaders;
    std::vector<PlacedLabel> out(points.size());

    constexpr double pi = 3.14159265358979323846;
    const double gap = dot_radius + 3.0;
    for (std::size_t i = 0; i < points.size(); ++i) {
        const LabelRequest& p = points[i];
        const double w = p.width, h = p.height;
        std::vector<Candidate> candidates;
        // Next to the dot: right, left, the four diagonals (just above or below the right and
        // left places, so they can all be taken together), above, below.
        const double d = std::sqrt(0.5) * gap, lift = std::max(d, 0.5 * h);
        candidates.push_back({box_towards(p.x, p.y, 1.0, 0.0, gap, w, h), false});
        candidates.push_back({box_towards(p.x, p.y, -1.0, 0.0, gap, w, h), false});
        for (const double sy : {-1.0, 1.0})
            for (const double sx : {1.0, -1.0}) {
                const double x0 = sx > 0 ? p.x + d : p.x - d - w, y0 = sy < 0 ? p.y - lift - h : p.y + lift;
                candidates.push_back({Box{x0, y0, x0 + w, y0 + h}, false});
            }
        candidates.push_back({box_towards(p.x, p.y, 0.0, -1.0, gap, w, h), false});
        candidates.push_back({box_towards(p.x, p.y, 0.0, 1.0, gap, w, h), false});
        // Further out, with a leader: rings a label height apart, 16 directions each.
        const double step = std::max(h, 8.0);
        for (int ring = 1; ring <= 12; ++ring)
            for (int k = 0; k < 16; ++k) {
                // Right and left first, then turning towards above and below.
                const int order[16] = {0, 8, 1, 15, 7, 9, 2, 14, 6, 10, 3, 13, 5, 11, 4, 12};
                const double a = 2.0 * pi * order[k] / 16.0;
                candidates.push_back({box_towards(p.x, p.y, std::cos(a), -std::sin(a), gap + step * ring, w, h), true});
            }
        for (const Candidate& c : candidates) {
            if (!inside(c.box, frame)) continue;
            bool free = true;
            for (const Box& b : dots) free = free && !overlap(c.box, b);
            for (const Box& b : labels) free = free && !overlap(c.box, b);
            for (const Box& b : avoid) free = free && !overlap(c.box, b);
            for (const Segment& s : leaders) free = free && !segment_crosses(s.ax, s.ay, s.bx, s.by, c.box);
            if (!free) continue;
            PlacedLabel placed{true, c.box, c.leader};
            if (c.leader) {
                // From the dot's edge to the nearest point of the box.
                const double nx = std::clamp(p.x, c.box.x0, c.box.x1), ny = std::clamp(p.y, c.box.y0, c.box.y1);
                const double len = std::hypot(nx - p.x, ny - p.y);
                placed.leader_x0 = p.x + (nx - p.x) / len * dot_radius;
                placed.leader_y0 = p.y + (ny - p.y) / len * dot_radius;
                placed.leader_x1 = nx;
                placed.leader_y1 = ny;
                // Dots that cover this dot's edge cannot be missed; the others must be.
                for (std::size_t j = 0; j < dots.size() && free; ++j) {
                    const Box& o = dots[j];
                    const bool covers_start = placed.leader_x0 >= o.x0 && placed.leader_x0 <= o.x1 &&
                                              placed.leader_y0 >= o.y0 && placed.leader_y0 <= o.y1;
                    if (j != i && !covers_start) free = !segment_crosses(placed.leader_x0, placed.leader_y0, nx, ny, o);
                }
                for (const Box& b : labels) free = free && !segment_crosses(placed.leader_x0, placed.leader_y0, nx, ny, b);
                for (const Box& b : avoid) free = free && !segment_crosses(placed.leader_x0, placed.leader_y0, nx, ny, b);
                if (!free) continue;
                leaders.push_back({placed.leader_x0, placed.leader_y0, nx, ny});
            }
            labels.push_back(c.box);
            out[i] = placed;
            break;
        }
    }
    return out;
}

}  // namespace deltag::io::layout
