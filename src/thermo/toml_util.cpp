#include "thermo/toml_util.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <sstream>
#include "chem/names.hpp"

namespace deltag::tomlu {

SourceLocation where(const toml::source_region& region, const std::string& file) {
    return SourceLocation{file, static_cast<int>(region.begin.line), static_cast<int>(region.begin.column)};
}

toml::table parse(std::string_view text, const std::string& origin) {
    try {
        return toml::parse(text, origin);
    } catch (const toml::parse_error& e) {
        throw InputError(where(e.source(), origin), "", "not valid TOML: " + std::string(e.description()));
    }
}

std::string join_key(std::string_view prefix, std::string_view key) {
    const bool bare = !key.empty() && std::all_of(key.begin(), key.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
    std::string k = bare ? std::string(key) : "\"" + std::string(key) + "\"";
    if (prefix.empty()) return k;
    return std::string(prefix) + "." + k;
}

std::string type_name(const toml::node& node) {
    switch (node.type()) {
        case toml::node_type::table: return "a table";
        case toml::node_type::array: return "an array";
        case toml::node_type::string: return "a string";
        case toml::node_type::integer: return "an integer";
        case toml::node_type::floating_point: return "a number";
        case toml::node_type::boolean: return "a boolean";
        case toml::node_type::date:
        case toml::node_type::time:
        case toml::node_type::date_time: return "a date or time";
        default: return "nothing";
    }
}

TableReader::TableReader(const toml::table& table, std::string file, std::string prefix)
    : table_(table), file_(std::move(file)), prefix_(std::move(prefix)) {}

bool TableReader::has(std::string_view key) const { return table_.contains(key); }

const toml::node* TableReader::node(std::string_view key) {
    const toml::node* n = table_.get(key);
    if (n) used_.emplace_back(key);
    return n;
}

SourceLocation TableReader::location(std::string_view key) const {
    if (const toml::node* n = table_.get(key)) return where(n->source(), file_);
    return table_location();
}

SourceLocation TableReader::table_location() const { return where(table_.source(), file_); }

void TableReader::fail(std::string_view key, const std::string& message,
                       const std::string& suggestion) const {
    throw InputError(location(key), dotted(key), message, suggestion);
}

std::optional<double> TableReader::number(std::string_view key) {
    const toml::node* n = node(key);
    if (!n) return std::nullopt;
    std::optional<double> v;
    if (n->is_integer()) v = static_cast<double>(n->as_integer()->get());
    else if (n->is_floating_point()) v = n->as_floating_point()->get();
    else fail(key, "expected a number, found " + type_name(*n));
    if (!std::isfinite(*v)) fail(key, "expected a finite number");
    return v;
}

std::optional<std::string> TableReader::string(std::string_view key) {
    const toml::node* n = node(key);
    if (!n) return std::nullopt;
    if (!n->is_string()) fail(key, "expected a string, found " + type_name(*n));
    return n->as_string()->get();
}

std::optional<bool> TableReader::boolean(std::string_view key) {
    const toml::node* n = node(key);
    if (!n) return std::nullopt;
    if (!n->is_boolean()) fail(key, "expected true or false, found " + type_name(*n));
    return n->as_boolean()->get();
}

const toml::table* TableReader::table(std::string_view key) {
    const toml::node* n = node(key);
    if (!n) return nullptr;
    if (!n->is_table()) fail(key, "expected a table, found " + type_name(*n));
    return n->as_table();
}

const toml::array* TableReader::array(std::string_view key) {
    const toml::node* n = node(key);
    if (!n) return nullptr;
    if (!n->is_array()) fail(key, "expected an array, found " + type_name(*n));
    return n->as_array();
}

std::optional<std::vector<double>> TableReader::numbers(std::string_view key, std::size_t count) {
    const toml::array* a = array(key);
    if (!a) return std::nullopt;
    std::ostringstream expected;
    expected << "expected an array of " << count << " numbers";
    if (a->size() != count) fail(key, expected.str() + ", found " + std::to_string(a->size()) + " elements");
    std::vector<double> out;
    for (const auto& el : *a) {
        if (el.is_integer()) out.push_back(static_cast<double>(el.as_integer()->get()));
        else if (el.is_floating_point()) out.push_back(el.as_floating_point()->get());
        else fail(key, expected.str() + ", found " + type_name(el) + " in it");
        if (!std::isfinite(out.back())) fail(key, expected.str() + " (finite)");
    }
    return out;
}

double TableReader::require_number(std::string_view key, std::string_view what) {
    auto v = number(key);
    if (!v) throw InputError(table_location(), dotted(key), "missing: expected " + std::string(what));
    return *v;
}

std::string TableReader::require_string(std::string_view key, std::string_view what) {
    auto v = string(key);
    if (!v) throw InputError(table_location(), dotted(key), "missing: expected " + std::string(what));
    return *v;
}

void TableReader::finish(const std::vector<std::string>& allowed) const {
    for (const auto& [k, v] : table_) {
        const std::string_view key = k.str();
        if (std::find(used_.begin(), used_.end(), key) != used_.end()) continue;
        const std::string list = name_list(allowed);
        throw InputError(where(k.source(), file_), dotted(key),
                         "unknown key; expected one of: " + list, nearest_name(key, allowed));
    }
}

}  // namespace deltag::tomlu
