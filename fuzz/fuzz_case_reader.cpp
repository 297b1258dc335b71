// libFuzzer target: the case reader on any text (parse_case reads from memory), and each
// water it accepts turned into solver input against the embedded database. An InputError is
// the expected answer to bad input; any other exception, a crash or a sanitizer report is a
// bug (at the command line it would be exit 1, "internal error").
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "deltag/case.hpp"
#include "deltag/database.hpp"
#include "deltag/error.hpp"
#include "deltag/water.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    static const deltag::thermo::Database& db = deltag::thermo::Database::embedded();
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    try {
        const deltag::io::Case c = deltag::io::parse_case(text, "fuzz.toml");
        for (const auto& w : c.waters) {
            try {
                (void)deltag::to_speciation_input(w, db, c.activity_model);
            } catch (const deltag::InputError&) {
            }
        }
    } catch (const deltag::InputError&) {
    }
    return 0;
}
