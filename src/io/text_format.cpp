// Shared text, number and CSV helpers of the writers (see text_format.hpp).
#include "io/text_format.hpp"

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <stdexcept>

namespace deltag::io::text {

std::size_t code_points(std::string_view s) {
    return static_cast<std::size_t>(
        std::count_if(s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}

double text_width(std::string_view s, double font_size, bool bold) {
    return (bold ? 0.66 : 0.6) * font_size * static_cast<double>(code_points(s));
}

std::size_t chars_for_width(double width, double font_size) {
    if (!(width > 0.0) || !(font_size > 0.0)) return 8;
    return std::max<std::size_t>(8, static_cast<std::size_t>(width / (0.6 * font_size)));
}

std::vector<std::string> wrap(std::string_view text, std::size_t max_chars) {
    std::vector<std::string> lines;
    std::size_t start = 0;
    while (start <= text.size()) {
        const std::size_t nl = text.find('\n', start);
        const std::string_view para = text.substr(start, nl == std::string_view::npos ? std::string_view::npos : nl - start);
        std::string line;
        std::size_t pos = 0;
        while (pos < para.size()) {
            const std::size_t sp = para.find(' ', pos);
            const std::string_view word = para.substr(pos, sp == std::string_view::npos ? std::string_view::npos : sp - pos);
            if (!word.empty()) {
                if (!line.empty() && code_points(line) + 1 + code_points(word) > max_chars) {
                    lines.push_back(line);
                    line.clear();
                }
                if (!line.empty()) line += ' ';
                line += word;
            }
            if (sp == std::string_view::npos) break;
            pos = sp + 1;
        }
        lines.push_back(line);
        if (nl == std::string_view::npos) break;
        start = nl + 1;
    }
    while (!lines.empty() && lines.back().empty()) lines.pop_back();
    return lines;
}

namespace {

void need_finite(double v) {
    if (!std::isfinite(v)) throw std::logic_error("internal error: a non-finite number reached a writer");
}

std::string strip_minus_of_zero(std::string s) {
    if (!s.empty() && s.front() == '-' && s.find_first_not_of("-0.") == std::string::npos) s.erase(0, 1);
    return s;
}

std::string strip_trailing_zeros(std::string s) {
    if (s.find('.') == std::string::npos) return s;
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
    return s;
}

}  // namespace

std::string fixed(double v, int decimals) {
    need_finite(v);
    std::array<char, 400> buf{};  // fixed notation of the largest double needs 309 digits
    auto [end, ec] = std::to_chars(buf.data(), buf.data() + buf.size(), v, std::chars_format::fixed, decimals);
    if (ec != std::errc()) throw std::logic_error("internal error: number does not fit its buffer");
    return strip_minus_of_zero(std::string(buf.data(), end));
}

std::string trimmed(double v, int max_decimals) { return strip_minus_of_zero(strip_trailing_zeros(fixed(v, max_decimals))); }

std::string coord(double v) { return trimmed(v, 2); }

std::string round_trip(double v) {
    need_finite(v);
    std::array<char, 64> buf{};
    auto [end, ec] = std::to_chars(buf.data(), buf.data() + buf.size(), v);
    if (ec != std::errc()) throw std::logic_error("internal error: number does not fit its buffer");
    return strip_minus_of_zero(std::string(buf.data(), end));
}

std::string csv_number(double v) {
    if (!std::isfinite(v)) return {};
    std::array<char, 64> buf{};
    auto [end, ec] = std::to_chars(buf.data(), buf.data() + buf.size(), v, std::chars_format::general, 15);
    if (ec != std::errc()) throw std::logic_error("internal error: number does not fit its buffer");
    std::string s(buf.data(), end);
    // %g style already drops trailing zeros; "-0" (and "-0e+00" cannot occur) becomes "0".
    return s == "-0" ? std::string("0") : s;
}

std::string typographic_minus(std::string s) {
    if (!s.empty() && s.front() == '-') s.replace(0, 1, "\u2212");
    return s;
}

std::string drop_negative_zeros(std::string_view t) {
    constexpr std::string_view kMinus = "\u2212";
    auto digit = [](char c) { return c >= '0' && c <= '9'; };
    auto word_char = [&](char c) { return digit(c) || (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || c == '.' || c == '_'; };
    std::string out;
    out.reserve(t.size());
    std::size_t i = 0;
    while (i < t.size()) {
        std::size_t sign_len = 0;
        if (t[i] == '-' || t[i] == '+') sign_len = 1;
        else if (t.substr(i, kMinus.size()) == kMinus) sign_len = kMinus.size();
        // A sign that follows a letter, digit, point or slash belongs to a word, an exponent
        // or a path.
        if (sign_len == 0 || (i > 0 && (word_char(t[i - 1]) || t[i - 1] == '/'))) {
            out += t[i++];
            continue;
        }
        std::size_t j = i + sign_len;
        bool zero = j < t.size() && t[j] == '0';
        if (zero) {
            ++j;
            if (j < t.size() && t[j] == '.') {
                ++j;
                while (j < t.size() && t[j] == '0') ++j;
            }
            if (j < t.size() && (t[j] == 'e' || t[j] == 'E')) {  // an exponent: e+00, e-05
                std::size_t k = j + 1;
                if (k < t.size() && (t[k] == '+' || t[k] == '-')) ++k;
                const std::size_t digits_from = k;
                while (k < t.size() && digit(t[k])) ++k;
                if (k > digits_from) j = k;
            }
            // The zero run must end the number: no digit, point or letter after it.
            zero = j >= t.size() || !word_char(t[j]);
        }
        if (zero) {
            // In a right-aligned column (two spaces of padding before) the sign's place stays
            // blank, so the column keeps its width; in running text the sign simply goes.
            if (i >= 2 && t[i - 1] == ' ' && t[i - 2] == ' ') out += ' ';
            out.append(t.substr(i + sign_len, j - i - sign_len));
            i = j;
        } else {
            out.append(t.substr(i, sign_len));
            i += sign_len;
        }
    }
    return out;
}

std::string csv_field(std::string_view s) {
    if (s.find_first_of(",\"\r\n") == std::string_view::npos) return std::string(s);
    std::string q = "\"";
    for (char c : s) {
        if (c == '"') q += '"';
        q += c;
    }
    return q + "\"";
}

}  // namespace deltag::io::text
