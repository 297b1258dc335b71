// libFuzzer target: the formula and reaction parser on any text. A ParseError is the
// expected answer to bad text; any other exception, a crash or a sanitizer report is a bug.
// A formula that parses has a finite molar mass (counts are bounded, and so is nesting).
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "deltag/chem.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    using namespace deltag::chem;
    try {
        const Formula f = parse_formula(text);
        if (!std::isfinite(f.molar_mass())) __builtin_trap();
        (void)pretty(text);
        (void)ascii_form(text);
    } catch (const ParseError&) {
    }
    try {
        const Reaction r = parse_reaction(text);
        (void)imbalance_text(imbalance(r));
    } catch (const ParseError&) {
    }
    return 0;
}
