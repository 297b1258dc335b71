// The writers' shared helpers (src/io/text_format.hpp): CSV quoting per RFC 4180, numbers
// without negative zero or binary noise, and the text measuring and wrapping the SVG writers
// share. Expected strings are worked out by hand from the rules each helper states.
#include <doctest/doctest.h>

#include <cmath>
#include <limits>
#include <stdexcept>
#include <string>

#include "io/text_format.hpp"

namespace text = deltag::io::text;

TEST_CASE("CSV fields are quoted per RFC 4180 section 2") {
    // Rule 6: fields with a comma, a double quote, CR or LF are enclosed in double quotes.
    CHECK(text::csv_field("well-7") == "well-7");
    CHECK(text::csv_field("") == "");
    CHECK(text::csv_field("a,b") == "\"a,b\"");
    CHECK(text::csv_field("line\nbreak") == "\"line\nbreak\"");
    CHECK(text::csv_field("cr\rhere") == "\"cr\rhere\"");  // the run report's old quoter missed CR
    // Rule 7: a double quote inside a quoted field is escaped by another double quote.
    CHECK(text::csv_field("the \"east\" well") == "\"the \"\"east\"\" well\"");
    CHECK(text::csv_field("\"") == "\"\"\"\"");
    // Spaces and non-ASCII text need no quotes.
    CHECK(text::csv_field("SI Calcite") == "SI Calcite");
    CHECK(text::csv_field("ΔG kJ/mol") == "ΔG kJ/mol");
}

TEST_CASE("CSV numbers: 15 significant digits, shortest form, no binary noise, no -0") {
    CHECK(text::csv_number(6.35 + 0.1) == "6.45");  // the sum is 6.449999999999999
    CHECK(text::csv_number(0.1 + 0.2) == "0.3");    // the sum is 0.30000000000000004
    CHECK(text::csv_number(14.0) == "14");
    CHECK(text::csv_number(7.2) == "7.2");
    CHECK(text::csv_number(-0.0) == "0");
    CHECK(text::csv_number(1.0 / 3.0) == "0.333333333333333");
    CHECK(text::csv_number(-2.5e-12) == "-2.5e-12");
    CHECK(text::csv_number(0.0123456789012) == "0.0123456789012");  // precision kept (not 6 digits)
    CHECK(text::csv_number(std::numeric_limits<double>::quiet_NaN()).empty());
    CHECK(text::csv_number(std::numeric_limits<double>::infinity()).empty());
}

TEST_CASE("fixed and trimmed numbers: a value that rounds to zero prints as zero, unsigned") {
    CHECK(text::fixed(-0.001, 2) == "0.00");
    CHECK(text::fixed(-0.0, 3) == "0.000");
    CHECK(text::fixed(-0.004, 2) == "0.00");
    CHECK(text::fixed(-0.02, 2) == "-0.02");
    CHECK(text::fixed(1.5, 0) == "2");
    CHECK(text::trimmed(-3.35243e-08, 6) == "0");  // a dose search that met its SI target
    CHECK(text::trimmed(8.29999997, 6) == "8.3");
    CHECK(text::trimmed(250.0, 6) == "250");
    CHECK(text::trimmed(-0.125, 6) == "-0.125");
    CHECK(text::coord(-0.001) == "0");
    CHECK(text::coord(12.346) == "12.35");
    CHECK(text::coord(12.5) == "12.5");
    CHECK(text::round_trip(-0.0) == "0");
    CHECK(text::round_trip(6.35 + 0.1) == "6.449999999999999");  // exact on purpose
    CHECK_THROWS_AS(text::fixed(std::numeric_limits<double>::quiet_NaN(), 2), std::logic_error);
    CHECK_THROWS_AS(text::coord(std::numeric_limits<double>::infinity()), std::logic_error);
    CHECK_THROWS_AS(text::round_trip(std::numeric_limits<double>::quiet_NaN()), std::logic_error);
    CHECK(text::typographic_minus("-0.5") == "\u22120.5");
    CHECK(text::typographic_minus("0.5") == "0.5");
}

TEST_CASE("drop_negative_zeros: signed zeros in a finished text lose their sign, nothing else") {
    CHECK(text::drop_negative_zeros("SI -0.00 here") == "SI 0.00 here");
    CHECK(text::drop_negative_zeros("(-0.000)") == "(0.000)");
    CHECK(text::drop_negative_zeros("(\u22120.00)") == "(0.00)");
    CHECK(text::drop_negative_zeros("balance +0.00 %") == "balance 0.00 %");
    CHECK(text::drop_negative_zeros("x -0") == "x 0");
    CHECK(text::drop_negative_zeros("-0.000e+00 mol") == "0.000e+00 mol");
    // In a right-aligned column the sign's place stays blank, so the column keeps its width.
    CHECK(text::drop_negative_zeros("Calcite     -0.000\n") == "Calcite      0.000\n");
    // Not zeros, or not signs of a number: left alone.
    CHECK(text::drop_negative_zeros("SI -0.01, -0.5, -05") == "SI -0.01, -0.5, -05");
    CHECK(text::drop_negative_zeros("1.234e-05 and 2.0e+00") == "1.234e-05 and 2.0e+00");
    CHECK(text::drop_negative_zeros("run-0 and /tmp/-0/case.toml") == "run-0 and /tmp/-0/case.toml");
    CHECK(text::drop_negative_zeros("ΔG° = -nFE°, -0x") == "ΔG° = -nFE°, -0x");
    CHECK(text::drop_negative_zeros("") == "");
    CHECK(text::drop_negative_zeros("-") == "-");
}

TEST_CASE("text measuring and wrapping shared by the plot and the diagram") {
    CHECK(text::code_points("pH") == 2);
    CHECK(text::code_points("Ca²⁺ −0.5") == 9);  // multi-byte characters count once
    CHECK(text::text_width("abcd", 10.0) == doctest::Approx(24.0));
    CHECK(text::text_width("abcd", 10.0, true) == doctest::Approx(26.4));
    CHECK(text::chars_for_width(120.0, 10.0) == 20);
    CHECK(text::chars_for_width(10.0, 10.0) == 8);  // never fewer than 8
    CHECK(text::chars_for_width(-5.0, 10.0) == 8);

    CHECK(text::wrap("", 10).empty());
    CHECK(text::wrap("\n\n", 10).empty());  // blank lines at the end are dropped
    const auto w = text::wrap("saturation index of calcite", 12);
    REQUIRE(w.size() == 3);
    CHECK(w[0] == "saturation");
    CHECK(w[1] == "index of");
    CHECK(w[2] == "calcite");
    // A word longer than the line stays whole, never cut.
    const auto longword = text::wrap("hydroxyapatite ok", 5);
    REQUIRE(longword.size() == 2);
    CHECK(longword[0] == "hydroxyapatite");
    // '\n' always breaks; a blank line between paragraphs is kept.
    const auto paras = text::wrap("corrosion\n\ndissolved species", 40);
    REQUIRE(paras.size() == 3);
    CHECK(paras[0] == "corrosion");
    CHECK(paras[1].empty());
    CHECK(paras[2] == "dissolved species");
    // Code points, not bytes, decide the width: ten 2-byte letters fit ten characters.
    CHECK(text::wrap("ΔΔΔΔΔ ΔΔΔΔ", 10).size() == 1);
}
