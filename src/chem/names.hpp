// Nearest-name suggestions for error messages (internal: every layer's messages use them; not
// part of the public API). Defined in src/chem/error.cpp.
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace deltag {

// Levenshtein distance, case-insensitive.
std::size_t edit_distance(std::string_view a, std::string_view b);

// The candidate closest to `name` by edit distance, or "" when nothing is reasonably close
// (more than one edit for names of up to two characters, else more than
// max(2, (|name| + 1)/3) edits). A candidate that is `name` with its charge written another
// way ("Cu2+", "Cu+2", "Cu++" for "Cu^2+") comes first; a formula of other elements than a
// formula `name` ("SO4" for "PO4") is never suggested; a candidate that is `name` with a
// phase mark ("CO2(g)" for "CO2") is suggested.
std::string nearest_name(std::string_view name, const std::vector<std::string>& candidates);

// For a phase (a mineral or a gas) named wrongly: the first phase whose formula `name` is
// ("Calcite" for "CaCO3"), else the nearest name. `phases` holds (name, formula) pairs.
std::string nearest_phase(std::string_view name, const std::vector<std::pair<std::string, std::string>>& phases);

}  // namespace deltag
