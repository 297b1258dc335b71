// libFuzzer target: the database loader on any TOML text, then the lint of what it loaded.
// An InputError is the expected answer to a bad database; any other exception, a crash or a
// sanitizer report is a bug.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "deltag/database.hpp"
#include "deltag/error.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string_view text(reinterpret_cast<const char*>(data), size);
    try {
        const deltag::thermo::Database db = deltag::thermo::Database::parse(text, "fuzz.toml");
        (void)db.lint();
    } catch (const deltag::InputError&) {
    }
    return 0;
}
