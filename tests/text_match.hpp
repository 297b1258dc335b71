// Matching phrases in a report whose lines are wrapped to the page: flat() turns every run of
// spaces and line breaks into one space, so a phrase matches wherever the wrap fell.
#pragma once

#include <string>
#include <string_view>

inline std::string flat(std::string_view text) {
    std::string out;
    bool space = false;
    for (char c : text) {
        if (c == ' ' || c == '\n' || c == '\t') {
            space = true;
            continue;
        }
        if (space && !out.empty()) out += ' ';
        space = false;
        out += c;
    }
    return out;
}
