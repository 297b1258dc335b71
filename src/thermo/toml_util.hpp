// Internal: reading TOML tables with typed accessors that turn every problem into an
// InputError carrying file, line, column, the dotted key, what was expected and the
// nearest valid name. Shared by the database loader and the case reader.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include <toml++/toml.h>

#include "deltag/error.hpp"

namespace deltag::tomlu {

SourceLocation where(const toml::source_region& region, const std::string& file);

// Parses a whole document; a syntax error becomes an InputError at its line and column.
toml::table parse(std::string_view text, const std::string& origin);

// "a.b" joined with a key; keys that are not bare words are quoted.
std::string join_key(std::string_view prefix, std::string_view key);

std::string type_name(const toml::node& node);

// Reads the keys of one table. Every key read is remembered; finish() rejects the rest.
class TableReader {
public:
    TableReader(const toml::table& table, std::string file, std::string prefix);

    const std::string& file() const { return file_; }
    const std::string& prefix() const { return prefix_; }
    const toml::table& table() const { return table_; }

    bool has(std::string_view key) const;
    const toml::node* node(std::string_view key);  // marks the key as used

    // Typed reads: absent -> nullopt; present with the wrong type -> InputError.
    std::optional<double> number(std::string_view key);            // integer or float, finite
    std::optional<std::string> string(std::string_view key);
    std::optional<bool> boolean(std::string_view key);
    const toml::table* table(std::string_view key);
    const toml::array* array(std::string_view key);
    // A fixed-length array of numbers, e.g. [min, max].
    std::optional<std::vector<double>> numbers(std::string_view key, std::size_t count);

    // Required variants: absent -> InputError "missing".
    double require_number(std::string_view key, std::string_view what);
    std::string require_string(std::string_view key, std::string_view what);

    SourceLocation location(std::string_view key) const;  // the key's value, or the table
    SourceLocation table_location() const;
    std::string dotted(std::string_view key) const { return join_key(prefix_, key); }

    [[noreturn]] void fail(std::string_view key, const std::string& message,
                           const std::string& suggestion = {}) const;

    // Rejects keys that were never read, suggesting the nearest of `allowed`.
    void finish(const std::vector<std::string>& allowed) const;

private:
    const toml::table& table_;
    std::string file_;
    std::string prefix_;
    std::vector<std::string> used_;
};

}  // namespace deltag::tomlu
