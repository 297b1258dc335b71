// Database lint: balance, sources, temperature ranges, fits against log K at 25 degC, names.
#include <cmath>
#include <map>
#include <sstream>

#include "deltag/database.hpp"
#include "chem/names.hpp"

namespace deltag::thermo {

std::vector<LintFinding> Database::lint() const {
    std::vector<LintFinding> out;
    auto error = [&](const Entry& e, const std::string& table, const std::string& msg) {
        out.push_back({LintFinding::Level::error, e.where, table + "." + e.name, msg});
    };
    auto warning = [&](const Entry& e, const std::string& table, const std::string& msg) {
        out.push_back({LintFinding::Level::warning, e.where, table + "." + e.name, msg});
    };
    std::vector<std::string> source_keys;
    for (const auto& s : sources_) source_keys.push_back(s.key);

    auto check_entry = [&](const Entry& e, const std::string& table, bool has_reaction) {
        if (e.source.empty()) {
            error(e, table, "no source: every entry names its published source");
        } else if (!find_source(e.source)) {
            std::string near = nearest_name(e.source, source_keys);
            error(e, table, "source '" + e.source + "' is not in [sources]" +
                                (near.empty() ? std::string() : " (did you mean '" + near + "'?)"));
        }
        if (!e.own_log_k.range) error(e, table, "no temperature_range_c: give the range where log K(T) holds");
        if (!has_reaction) return;
        try {
            const auto bad = chem::imbalance(chem::parse_reaction(e.reaction_text));
            if (!bad.empty())
                error(e, table, "reaction '" + e.reaction_text + "' is not balanced (right minus left: " + chem::imbalance_text(bad) + ")");
        } catch (const chem::ParseError& ex) {
            error(e, table, std::string("reaction cannot be read: ") + ex.what());
        }
        const LogKModel& m = e.own_log_k;
        if (m.form == LogKModel::Form::constant) {
            warning(e, table, "no temperature dependence (no log_k_fit or delta_h_kj_per_mol): log K is taken constant");
        } else if (m.form == LogKModel::Form::analytic || m.form == LogKModel::Form::water_ionization ||
                   m.form == LogKModel::Form::gas_solubility) {
            const double at25 = m.log_k(25.0);
            if (!std::isfinite(at25) || std::abs(at25 - m.log_k_25) > 0.02)
                error(e, table, "the temperature function gives log K = " + message_number(at25) +
                                    " at 25 degC but log_k is " + message_number(m.log_k_25) + " (allowed difference 0.02)");
        }
        if (m.range) {
            for (double t : {m.range->min_c, 0.5 * (m.range->min_c + m.range->max_c), m.range->max_c})
                if (!std::isfinite(m.log_k(t)))
                    error(e, table, "log K is not finite at " + message_number(t) + " degC");
        }
    };

    std::map<std::string, std::string> seen;  // name -> table
    auto check_name = [&](const Entry& e, const std::string& table) {
        auto [it, fresh] = seen.emplace(e.name, table);
        if (!fresh) error(e, table, "the name '" + e.name + "' is also used in [" + it->second + "]");
    };

    for (std::size_t i = 0; i < species_.size(); ++i) {
        const Species& s = species_[i];
        const std::string table = s.is_component ? "components" : "species";
        check_name(s, table);
        check_entry(s, table, !s.is_component);
        if (s.formula.charge != 0 && std::isnan(s.ion_size_angstrom) && s.role == ComponentRole::ordinary)
            warning(s, table, "charged species without ion_size_angstrom: the default 4.0 angstrom is used");
    }
    for (const auto& m : minerals_) {
        check_name(m, "minerals");
        check_entry(m, "minerals", true);
    }
    for (const auto& g : gases_) {
        check_name(g, "gases");
        check_entry(g, "gases", true);
    }
    for (const auto& e : electrodes_) {
        const std::string key = "electrodes." + e.name;
        auto err = [&](const std::string& msg) { out.push_back({LintFinding::Level::error, e.where, key, msg}); };
        if (e.source.empty()) err("no source: every entry names its published source");
        else if (!find_source(e.source)) {
            std::string near = nearest_name(e.source, source_keys);
            err("source '" + e.source + "' is not in [sources]" + (near.empty() ? std::string() : " (did you mean '" + near + "'?)"));
        }
        if (!e.range) err("no temperature_range_c: give the range where E°(T) holds");
        try {
            const auto bad = chem::imbalance(e.reaction);
            if (!bad.empty()) err("reaction '" + e.reaction_text + "' is not balanced (right minus left: " + chem::imbalance_text(bad) + ")");
        } catch (const chem::ParseError& ex) {
            err(std::string("reaction cannot be read: ") + ex.what());
        }
    }
    for (const auto& s : sources_)
        if (s.citation.size() < 10)
            out.push_back({LintFinding::Level::error, s.where, "sources." + s.key, "the citation is too short to find the source"});
    return out;
}

}  // namespace deltag::thermo
