// Internal: where the labels of marked points go in a picture, so that no two labels overlap
// each other, a point or the frame. Used by the Eh-pH diagram writer for its water points.
// Not part of the public headers.
#pragma once

#include <vector>

namespace deltag::io::layout {

// An axis-aligned box in pixels (y grows downwards): x0 < x1, y0 < y1.
struct Box {
    double x0 = 0.0, y0 = 0.0, x1 = 0.0, y1 = 0.0;
};

// Whether two boxes share interior area (touching edges do not count).
bool overlap(const Box& a, const Box& b);

// Whether the segment from (ax, ay) to (bx, by) passes through the inside of the box.
bool segment_crosses(double ax, double ay, double bx, double by, const Box& b);

// A marked point (the centre of its dot) and the size of its label's box.
struct LabelRequest {
    double x = 0.0, y = 0.0;
    double width = 0.0, height = 0.0;
};

struct PlacedLabel {
    bool placed = false;  // false: no free place; the caller names the point elsewhere
    Box box;              // the label's box
    // Displaced from its point (no free place next to the dot): a leader line from the dot's
    // edge to the nearest point of the box.
    bool leader = false;
    double leader_x0 = 0.0, leader_y0 = 0.0, leader_x1 = 0.0, leader_y1 = 0.0;
};

// Greedy placement, one point after the other in the given order. Each label goes to the
// first free candidate: next to its dot (right, left, the four diagonals, above, below), else
// on rings further out in 16 directions with a leader line. A candidate is free when its box
// lies inside `frame`, meets no dot (a box of `dot_radius` around every point), no label
// placed before, no box of `avoid`, and no leader line drawn before; a leader must not cross
// another label, a box of `avoid` or a dot other than those covering its own dot's edge. A label with no free candidate is left unplaced.
std::vector<PlacedLabel> place_point_labels(const std::vector<LabelRequest>& points, const Box& frame, double dot_radius,
                                            const std::vector<Box>& avoid = {});

}  // namespace deltag::io::layout
