// Internal helpers shared by the writers of src/io: how text is measured and wrapped in the
// SVG pictures, how numbers are printed, and how CSV fields are quoted. One copy here, so the
// plot, the diagram and the reports cannot drift apart. Not part of the public headers.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace deltag::io::text {

// ---- text in SVG --------------------------------------------------------------------------

// Number of code points in UTF-8 text (continuation bytes are not counted).
std::size_t code_points(std::string_view s);

// Rough rendered width of text in a sans-serif font: 0.6 em per character, 0.66 em in bold.
double text_width(std::string_view s, double font_size, bool bold = false);

// How many characters fit a width at a font size (at least 8, so a narrow box still wraps
// at words rather than at every character).
std::size_t chars_for_width(double width, double font_size);

// Splits text into lines of at most max_chars code points at spaces (a longer word stays
// whole, never cut); '\n' always breaks. A blank line between paragraphs is kept; blank lines
// at the end are dropped, so empty text gives no line.
std::vector<std::string> wrap(std::string_view text, std::size_t max_chars);

// ---- numbers ------------------------------------------------------------------------------

// Fixed-point with the given decimals; a value that rounds to zero prints as 0.00, never
// -0.00. Throws std::logic_error on a non-finite value (no report prints NaN).
std::string fixed(double v, int decimals);

// Like fixed, with trailing zeros (and a bare point) dropped: 2.50 -> "2.5", 3.00 -> "3".
std::string trimmed(double v, int max_decimals);

// An SVG coordinate: two decimals at most, trailing zeros dropped, no "-0".
std::string coord(double v);

// The shortest text that reads back to the same double (no "-0").
std::string round_trip(double v);

// A number for a CSV cell: at most 15 significant digits, shortest form. 15 digits are
// exact for every decimal a user typed or a calculation means, and drop the last-bit noise of
// binary arithmetic (6.35 + 0.1 = 6.449999999999999 prints as 6.45). Non-finite: empty cell.
std::string csv_number(double v);

// A typographic minus (U+2212) in place of a leading '-'.
std::string typographic_minus(std::string s);

// Rewrites every signed printed zero in a finished text ("-0.00", "+0.00", "-0", "-0.000e+00",
// and the same with U+2212) as the unsigned zero, leaving "-0.01", "e-05" and words untouched.
// Within right-aligned columns (two spaces before the sign) the sign becomes a space, so the
// column keeps its width. The text report passes its whole text through this, so no format
// string can print -0.00.
std::string drop_negative_zeros(std::string_view text);

// ---- CSV ----------------------------------------------------------------------------------

// One field of a CSV record per RFC 4180: quoted when it holds a comma, a double quote, CR
// or LF, with each double quote doubled; otherwise as it is.
std::string csv_field(std::string_view s);

}  // namespace deltag::io::text
