// Loads a deltag database (schema: databases/README.md) and rewrites every species, mineral
// and gas in terms of the components.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <functional>
#include <limits>
#include <map>
#include <regex>
#include <sstream>

#include "deltag/database.hpp"
#include "chem/names.hpp"
#include "thermo/toml_util.hpp"

namespace deltag::thermo {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// An entry as read, before its reaction is resolved into components.
struct RawEntry {
    Entry entry;
    chem::Reaction reaction;
    std::string key_prefix;      // "species.\"CaHCO3+\"" for messages
    SourceLocation reaction_where;
    double ion_size = nan, tj_a = nan, tj_b = nan, salting_out = nan, alkalinity = 0.0;
    std::optional<double> alkalinity_override;
};

const std::vector<std::string> top_keys = {"database", "sources", "components", "species",
                                           "minerals", "gases", "analytes", "electrodes"};
const std::vector<std::string> common_keys = {"reaction", "log_k", "log_k_fit", "delta_h_kj_per_mol",
                                              "delta_cp_j_per_mol_k", "temperature_range_c", "source",
                                              "from_memory", "note", "ion_size_angstrom",
                                              "truesdell_jones", "salting_out", "log_k_model", "henry_abc"};

}  // namespace

class DatabaseLoader {
public:
    DatabaseLoader(std::string_view text, const std::string& origin) : origin_(origin) {
        root_ = tomlu::parse(text, origin);
    }

    Database load() {
        db_.origin_ = origin_;
        tomlu::TableReader top(root_, origin_, "");
        if (const toml::table* t = top.table("database")) {
            tomlu::TableReader r(*t, origin_, "database");
            db_.name_ = r.string("name").value_or("");
            (void)r.string("description");
            (void)r.string("version");
            r.finish({"name", "description", "version"});
        }
        if (const toml::table* t = top.table("sources")) read_sources(*t);
        const toml::table* comps = top.table("components");
        if (!comps) throw InputError(top.table_location(), "components", "missing: the database needs a [components] table");
        read_components(*comps);
        if (const toml::table* t = top.table("species")) read_entries(*t, "species", species_raw_);
        if (const toml::table* t = top.table("minerals")) read_entries(*t, "minerals", minerals_raw_);
        if (const toml::table* t = top.table("gases")) read_entries(*t, "gases", gases_raw_);
        const toml::table* analytes = top.table("analytes");
        if (const toml::table* t = top.table("electrodes")) read_electrodes(*t);
        top.finish(top_keys);

        resolve_species();
        resolve_phases(minerals_raw_, db_.minerals_, /*gas=*/false);
        resolve_phases(gases_raw_, db_.gases_, /*gas=*/true);
        if (analytes) read_analytes(*analytes);
        return std::move(db_);
    }

private:
    template <class F>
    auto guard_formula(const SourceLocation& at, const std::string& key, F&& f) {
        try {
            return f();
        } catch (const chem::ParseError& e) {
            throw InputError(at, key, std::string("cannot read formula: ") + e.what());
        }
    }

    void read_sources(const toml::table& t) {
        for (const auto& [k, v] : t) {
            const std::string key(k.str());
            const std::string prefix = tomlu::join_key("sources", key);
            if (!v.is_table()) throw InputError(tomlu::where(v.source(), origin_), prefix, "expected a table with a citation");
            tomlu::TableReader r(*v.as_table(), origin_, prefix);
            Source s;
            s.key = key;
            s.citation = r.require_string("citation", "the full citation (authors, year, title, journal)");
            s.where = tomlu::where(k.source(), origin_);
            r.finish({"citation"});
            db_.sources_.push_back(std::move(s));
        }
    }

    // Fields shared by components, species, minerals and gases.
    void read_common(tomlu::TableReader& r, RawEntry& raw) {
        Entry& e = raw.entry;
        e.source = r.string("source").value_or("");
        e.from_memory = r.boolean("from_memory").value_or(false);
        e.note = r.string("note").value_or("");
        if (auto range = r.numbers("temperature_range_c", 2)) {
            if (!((*range)[0] < (*range)[1]))
                r.fail("temperature_range_c", "expected [min, max] with min < max");
            e.own_log_k.range = TemperatureRange{(*range)[0], (*range)[1]};
        }
        raw.ion_size = r.number("ion_size_angstrom").value_or(nan);
        if (auto tj = r.numbers("truesdell_jones", 2)) {
            raw.tj_a = (*tj)[0];
            raw.tj_b = (*tj)[1];
        }
        raw.salting_out = r.number("salting_out").value_or(nan);
    }

    void read_log_k(tomlu::TableReader& r, RawEntry& raw) {
        LogKModel& m = raw.entry.own_log_k;
        m.log_k_25 = r.require_number("log_k", "log10 K of the reaction at 25 degC");
        m.form = LogKModel::Form::constant;
        if (auto dh = r.number("delta_h_kj_per_mol")) {
            m.form = LogKModel::Form::van_t_hoff;
            m.delta_h_kj_per_mol = *dh;
        }
        if (auto dcp = r.number("delta_cp_j_per_mol_k")) {
            if (m.form != LogKModel::Form::van_t_hoff)
                r.fail("delta_cp_j_per_mol_k", "delta_cp_j_per_mol_k needs delta_h_kj_per_mol");
            m.delta_cp_j_per_mol_k = *dcp;
        }
        if (auto fit = r.numbers("log_k_fit", 5)) {
            m.form = LogKModel::Form::analytic;
            std::copy(fit->begin(), fit->end(), m.fit.begin());
        }
        const std::vector<std::string> models = {"water-ionization", "henry-iapws"};
        if (auto model = r.string("log_k_model")) {
            if (*model == "water-ionization") {
                m.form = LogKModel::Form::water_ionization;
                // The Kw formulation is for H2O = H+ + OH- as written; any other reaction would
                // silently take the wrong log K.
                const chem::Reaction& rx = raw.reaction;
                const bool ionization = rx.terms.size() == 3 && rx.coefficient("H2O") == -1.0 &&
                                        rx.coefficient("H+") == 1.0 && rx.coefficient("OH-") == 1.0;
                if (!ionization)
                    r.fail("log_k_model", "\"water-ionization\" is only for the reaction \"H2O = OH- + H+\"");
            } else if (*model == "henry-iapws") {
                m.form = LogKModel::Form::gas_solubility;
                // The guideline's Henry's constant is for X(g) = X(aq) as written.
                const chem::Reaction& rx = raw.reaction;
                bool dissolution = rx.terms.size() == 2;
                if (dissolution) {
                    const auto& lhs = rx.terms[0].coefficient < 0 ? rx.terms[0] : rx.terms[1];
                    const auto& rhs = rx.terms[0].coefficient < 0 ? rx.terms[1] : rx.terms[0];
                    const chem::Formula fg = chem::parse_formula(lhs.species);
                    const chem::Formula fa = chem::parse_formula(rhs.species);
                    dissolution = lhs.coefficient == -1.0 && rhs.coefficient == 1.0 && fg.phase == chem::Phase::gas &&
                                  fa.phase != chem::Phase::gas && fa.elements == fg.elements && fa.charge == 0;
                }
                if (!dissolution)
                    r.fail("log_k_model", "\"henry-iapws\" is only for a gas dissolving as itself, e.g. \"O2(g) = O2(aq)\"");
                auto abc = r.numbers("henry_abc", 3);
                if (!abc) r.fail("henry_abc", "\"henry-iapws\" needs henry_abc = [A, B, C] of the guideline's Table 2");
                std::copy(abc->begin(), abc->end(), m.henry.begin());
            } else {
                r.fail("log_k_model", "expected \"water-ionization\" or \"henry-iapws\"", nearest_name(*model, models));
            }
        } else if (r.has("henry_abc")) {
            r.fail("henry_abc", "henry_abc belongs to log_k_model = \"henry-iapws\"");
        }
    }

    void read_components(const toml::table& t) {
        std::vector<RawEntry> raws;
        for (const auto& [k, v] : t) {
            const std::string key(k.str());
            const std::string prefix = tomlu::join_key("components", key);
            const SourceLocation at = tomlu::where(k.source(), origin_);
            if (!v.is_table()) throw InputError(at, prefix, "expected a table");
            tomlu::TableReader r(*v.as_table(), origin_, prefix);
            RawEntry raw;
            raw.entry.name = key;
            raw.entry.where = at;
            raw.entry.formula = guard_formula(at, prefix, [&] { return chem::parse_formula(key); });
            read_common(r, raw);
            raw.alkalinity = r.number("alkalinity").value_or(0.0);
            r.finish({"source", "from_memory", "note", "temperature_range_c", "ion_size_angstrom",
                      "truesdell_jones", "salting_out", "alkalinity"});
            raws.push_back(std::move(raw));
        }
        std::stable_sort(raws.begin(), raws.end(), [](const RawEntry& a, const RawEntry& b) {
            return a.entry.where.line < b.entry.where.line;
        });
        for (auto& raw : raws) {
            Species s;
            static_cast<Entry&>(s) = raw.entry;
            s.is_component = true;
            s.formation = {{db_.species_.size(), 1.0}};
            LogKModel zero;
            zero.range = raw.entry.own_log_k.range;
            s.log_k.terms = {{1.0, zero}};
            s.ion_size_angstrom = raw.ion_size;
            s.tj_a_angstrom = raw.tj_a;
            s.tj_b = raw.tj_b;
            s.salting_out = raw.salting_out;
            s.alkalinity = raw.alkalinity;
            if (s.name == "H2O") s.role = ComponentRole::water;
            else if (s.name == "H+") s.role = ComponentRole::proton;
            else if (s.formula.is_electron()) s.role = ComponentRole::electron;
            index_[s.name] = db_.species_.size();
            db_.species_.push_back(std::move(s));
        }
        db_.component_count_ = db_.species_.size();
        auto find = [&](const char* n) { return index_.count(n) ? std::optional<std::size_t>(index_[n]) : std::nullopt; };
        const SourceLocation at = tomlu::where(t.source(), origin_);
        if (!find("H2O")) throw InputError(at, "components", "the components must include \"H2O\" (water)");
        if (!find("H+")) throw InputError(at, "components", "the components must include \"H+\" (the proton)");
        db_.water_ = *find("H2O");
        db_.proton_ = *find("H+");
        db_.electron_ = find("e-");
    }

    void read_entries(const toml::table& t, const std::string& table_name, std::vector<RawEntry>& out) {
        const bool mineral = table_name == "minerals";
        for (const auto& [k, v] : t) {
            const std::string key(k.str());
            const std::string prefix = tomlu::join_key(table_name, key);
            const SourceLocation at = tomlu::where(k.source(), origin_);
            if (!v.is_table()) throw InputError(at, prefix, "expected a table");
            tomlu::TableReader r(*v.as_table(), origin_, prefix);
            RawEntry raw;
            raw.key_prefix = prefix;
            raw.entry.name = key;
            raw.entry.where = at;
            if (mineral) {
                const std::string f = r.require_string("formula", "the mineral's chemical formula, e.g. \"CaCO3\"");
                raw.entry.formula = guard_formula(r.location("formula"), prefix + ".formula",
                                                  [&] { return chem::parse_formula(f); });
            } else {
                raw.entry.formula = guard_formula(at, prefix, [&] { return chem::parse_formula(key); });
            }
            raw.entry.reaction_text = r.require_string("reaction", "the reaction, e.g. \"A + 2 B = C\"");
            raw.reaction_where = r.location("reaction");
            try {
                raw.reaction = chem::parse_reaction(raw.entry.reaction_text);
            } catch (const chem::ParseError& e) {
                SourceLocation w = raw.reaction_where;
                throw InputError(w, prefix + ".reaction", std::string("cannot read reaction: ") + e.what());
            }
            read_common(r, raw);
            read_log_k(r, raw);
            std::vector<std::string> allowed = common_keys;
            if (mineral) allowed.push_back("formula");
            // A redox species' alkalinity does not follow from its formation (the electron
            // has no proton count of its own): give it, and species written from it inherit it.
            // A phase may give the alkalinity it brings when it dissolves.
            if (auto alk = r.number("alkalinity")) raw.alkalinity_override = *alk;
            allowed.push_back("alkalinity");
            r.finish(allowed);
            out.push_back(std::move(raw));
        }
        std::stable_sort(out.begin(), out.end(), [](const RawEntry& a, const RawEntry& b) {
            return a.entry.where.line < b.entry.where.line;
        });
    }

    // Names in reactions: exact, or with a trailing (aq)/(l) mark dropped ("H2O(l)" -> "H2O").
    std::string canonical(const std::string& name) const {
        if (index_.count(name) || species_raw_index_.count(name)) return name;
        for (std::string_view mark : {"(aq)", "(l)"}) {
            if (name.size() > mark.size() && name.compare(name.size() - mark.size(), mark.size(), mark) == 0) {
                std::string s = name.substr(0, name.size() - mark.size());
                if (index_.count(s) || species_raw_index_.count(s)) return s;
            }
        }
        return name;
    }

    std::vector<std::string> known_names() const {
        std::vector<std::string> v;
        for (const auto& [n, i] : index_) v.push_back(n);
        for (const auto& [n, i] : species_raw_index_) v.push_back(n);
        return v;
    }

    struct Resolved {
        std::map<std::size_t, double> stoich;
        LogKFunction log_k;
    };

    // Adds weight * log a(name), expanded into components, to `out`. log a(species) =
    // log K_f + sum(nu * log a(component)); the log K_f part goes to the same side with
    // `logk_sign` = +1 (a species defined by the expansion) or to the other side with -1
    // (a phase whose dissolution log K is fixed and the expansion is of its products).
    void expand_term(const RawEntry& raw, const std::string& name, double weight, Resolved& out,
                     std::vector<std::string>& stack, double logk_sign = 1.0) {
        const std::string c = canonical(name);
        if (auto it = index_.find(c); it != index_.end() && it->second < db_.component_count_) {
            out.stoich[it->second] += weight;
            return;
        }
        if (auto it = species_raw_index_.find(c); it != species_raw_index_.end()) {
            const Resolved& sub = resolve_one(it->second, stack);
            for (const auto& [j, v] : sub.stoich) out.stoich[j] += weight * v;
            out.log_k.add(logk_sign * weight, sub.log_k);
            return;
        }
        // A gas in a species' reaction ("O2(g) = O2(aq)"): log p(gas) expanded like a species,
        // from the gas's own reaction.
        if (auto it = gas_raw_index_.find(name); it != gas_raw_index_.end()) {
            const Resolved& sub = resolve_gas(it->second, stack);
            for (const auto& [j, v] : sub.stoich) out.stoich[j] += weight * v;
            out.log_k.add(logk_sign * weight, sub.log_k);
            return;
        }
        throw InputError(raw.reaction_where, raw.key_prefix + ".reaction",
                         "unknown species '" + name + "' in the reaction; every species must be a component or defined in [species]",
                         nearest_name(name, known_names()));
    }

    // Alkalinity of a species (or of a gas named in a species' reaction), from its reaction as
    // written: alk(s) = sum_{i != s} (-nu_i/nu_s) alk(i), each term with its own alkalinity
    // (a component's, or a species' given or derived one), unless the entry gives its own.
    // So a species written from a redox species with a given alkalinity (FeOH^2+ from Fe^3+)
    // counts from that reference level. The reactions were checked by the log K resolution,
    // which runs first, so no cycle or unknown name is met here.
    double alkalinity_of(const RawEntry& raw, std::vector<std::string>& stack) {
        if (raw.alkalinity_override) return *raw.alkalinity_override;
        if (auto it = alkalinity_memo_.find(raw.key_prefix); it != alkalinity_memo_.end()) return it->second;
        stack.push_back(raw.entry.name);
        const double nu_s = self_coefficient(raw, raw.entry.name);
        double alk = 0.0;
        for (const auto& term : raw.reaction.terms) {
            if (canonical(term.species) == raw.entry.name || term.species == raw.entry.name) continue;
            alk += -term.coefficient / nu_s * term_alkalinity(raw, term.species, stack);
        }
        stack.pop_back();
        alkalinity_memo_[raw.key_prefix] = alk;
        return alk;
    }

    double term_alkalinity(const RawEntry& raw, const std::string& name, std::vector<std::string>& stack) {
        const std::string c = canonical(name);
        if (auto it = index_.find(c); it != index_.end() && it->second < db_.component_count_)
            return db_.species_[it->second].alkalinity;
        if (auto it = species_raw_index_.find(c); it != species_raw_index_.end())
            return alkalinity_of(species_raw_[it->second], stack);
        if (auto it = gas_raw_index_.find(name); it != gas_raw_index_.end())
            return alkalinity_of(gases_raw_[it->second], stack);
        throw InputError(raw.reaction_where, raw.key_prefix + ".reaction", "unknown species '" + name + "' in the reaction",
                         nearest_name(name, known_names()));
    }

    // Resolves a species entry: log a(s) = log K/nu_s + sum_{i != s} (-nu_i/nu_s) log a(i).
    const Resolved& resolve_one(std::size_t raw_index, std::vector<std::string>& stack) {
        return resolve_entry(species_raw_[raw_index], resolved_[raw_index], stack);
    }
    // The same for a gas named in a species' reaction: log p(gas) in components.
    const Resolved& resolve_gas(std::size_t raw_index, std::vector<std::string>& stack) {
        return resolve_entry(gases_raw_[raw_index], gases_resolved_[raw_index], stack);
    }

    const Resolved& resolve_entry(const RawEntry& raw, std::optional<Resolved>& slot, std::vector<std::string>& stack) {
        if (slot) return *slot;
        if (std::find(stack.begin(), stack.end(), raw.entry.name) != stack.end()) {
            std::string chain;
            for (const auto& s : stack) chain += s + " -> ";
            throw InputError(raw.reaction_where, raw.key_prefix + ".reaction",
                             "species are defined in a cycle: " + chain + raw.entry.name);
        }
        stack.push_back(raw.entry.name);
        const double nu_s = self_coefficient(raw, raw.entry.name);
        Resolved r;
        r.log_k.terms.emplace_back(1.0 / nu_s, raw.entry.own_log_k);
        for (const auto& term : raw.reaction.terms) {
            if (canonical(term.species) == raw.entry.name) continue;
            expand_term(raw, term.species, -term.coefficient / nu_s, r, stack);
        }
        stack.pop_back();
        slot = std::move(r);
        return *slot;
    }

    double self_coefficient(const RawEntry& raw, const std::string& self) const {
        double nu = 0.0;
        for (const auto& term : raw.reaction.terms)
            if (canonical(term.species) == self || term.species == self) nu += term.coefficient;
        if (nu == 0.0)
            throw InputError(raw.reaction_where, raw.key_prefix + ".reaction",
                             "the reaction must contain '" + self + "' itself (on either side)");
        return nu;
    }

    void resolve_species() {
        for (std::size_t i = 0; i < species_raw_.size(); ++i) {
            const std::string& n = species_raw_[i].entry.name;
            if (!species_raw_index_.count(n)) species_raw_index_[n] = i;
        }
        for (std::size_t i = 0; i < gases_raw_.size(); ++i) {
            const std::string& n = gases_raw_[i].entry.name;
            if (!gas_raw_index_.count(n)) gas_raw_index_[n] = i;
        }
        for (std::size_t i = 0; i < species_raw_.size(); ++i) {
            std::vector<std::string> stack;
            const Resolved& r = resolve_one(i, stack);
            const RawEntry& raw = species_raw_[i];
            Species s;
            static_cast<Entry&>(s) = raw.entry;
            s.formation.assign(r.stoich.begin(), r.stoich.end());
            std::erase_if(s.formation, [](const auto& p) { return std::abs(p.second) < 1e-12; });
            s.log_k = r.log_k;
            s.ion_size_angstrom = raw.ion_size;
            s.tj_a_angstrom = raw.tj_a;
            s.tj_b = raw.tj_b;
            s.salting_out = raw.salting_out;
            std::vector<std::string> alk_stack;
            s.alkalinity = alkalinity_of(raw, alk_stack);
            if (!index_.count(s.name)) index_[s.name] = db_.species_.size();
            db_.species_.push_back(std::move(s));
        }
    }

    void resolve_phases(std::vector<RawEntry>& raws, std::vector<PhaseEntry>& out, bool gas) {
        for (auto& raw : raws) {
            // The phase's own term: the gas by its key; the mineral by its formula with or
            // without a solid mark.
            std::string self;
            double nu = 0.0;
            const std::string f = raw.entry.formula.text;
            const std::string fa = chem::ascii_form(f);
            for (const auto& term : raw.reaction.terms) {
                const std::string ta = chem::ascii_form(term.species);
                const bool mine = gas ? term.species == raw.entry.name
                                      : (ta == fa || ta == fa + "(s)" || ta == fa + "(cr)");
                if (mine) {
                    self = term.species;
                    nu += term.coefficient;
                }
            }
            if (nu == 0.0)
                throw InputError(raw.reaction_where, raw.key_prefix + ".reaction",
                                 gas ? "the reaction must contain the gas '" + raw.entry.name + "'"
                                     : "the reaction must contain the mineral as '" + f + "(s)'");
            // Dissolution: phase = sum(coef * component); log K_diss = log K / (-nu).
            Resolved r;
            const double w = -1.0 / nu;
            r.log_k.terms.emplace_back(w, raw.entry.own_log_k);
            std::vector<std::string> stack;
            for (const auto& term : raw.reaction.terms) {
                if (term.species == self) continue;
                expand_term(raw, term.species, term.coefficient * w, r, stack, -1.0);
            }
            PhaseEntry p;
            static_cast<Entry&>(p) = raw.entry;
            p.dissolution.assign(r.stoich.begin(), r.stoich.end());
            std::erase_if(p.dissolution, [](const auto& q) { return std::abs(q.second) < 1e-12; });
            p.log_k = r.log_k;
            p.log_k_as_written.terms = {{w, raw.entry.own_log_k}};
            if (raw.alkalinity_override) {
                p.alkalinity = *raw.alkalinity_override;
            } else {
                std::vector<std::string> alk_stack{raw.entry.name};
                for (const auto& term : raw.reaction.terms)
                    if (term.species != self) p.alkalinity += term.coefficient * w * term_alkalinity(raw, term.species, alk_stack);
            }
            out.push_back(std::move(p));
        }
    }

    void read_electrodes(const toml::table& t) {
        for (const auto& [k, v] : t) {
            const std::string key(k.str());
            const std::string prefix = tomlu::join_key("electrodes", key);
            const SourceLocation at = tomlu::where(k.source(), origin_);
            if (!v.is_table()) throw InputError(at, prefix, "expected a table");
            tomlu::TableReader r(*v.as_table(), origin_, prefix);
            Electrode e;
            e.name = key;
            e.where = at;
            e.reaction_text = r.require_string("reaction", "the reduction, e.g. \"Cu^2+ + 2 e- = Cu(s)\"");
            try {
                e.reaction = chem::parse_reaction(e.reaction_text);
            } catch (const chem::ParseError& ex) {
                r.fail("reaction", std::string("cannot read reaction: ") + ex.what());
            }
            double electrons = 0.0;
            for (const auto& term : e.reaction.terms)
                if (chem::parse_formula(term.species).is_electron()) electrons -= term.coefficient;
            if (!(electrons > 0))
                r.fail("reaction", "an electrode reaction is a reduction with the electrons on the left, e.g. \"Cu^2+ + 2 e- = Cu(s)\"");
            e.e0_v = r.require_number("e0_v", "the standard potential at 25 degC in V vs SHE");
            e.de0_dt_v_per_k = r.number("de0_dt_mv_per_k").value_or(0.0) / 1000.0;
            if (r.has("e0_polynomial_v")) {
                if (r.has("de0_dt_mv_per_k"))
                    r.fail("e0_polynomial_v", "give either e0_polynomial_v or de0_dt_mv_per_k, not both");
                const toml::node* node = v.as_table()->get("e0_polynomial_v");
                const toml::array* arr = node ? node->as_array() : nullptr;
                std::size_t n = arr ? arr->size() : 0;
                if (n < 2 || n > 6)
                    r.fail("e0_polynomial_v", "expected 2 to 6 numbers [a0, a1, ...]: E°(t) = a0 + a1 t + a2 t^2 + ..., t in degC");
                auto poly = r.numbers("e0_polynomial_v", n);
                e.e0_polynomial_v.assign(poly->begin(), poly->end());
                const double at25 = e.e0_at(25.0);
                if (std::abs(at25 - e.e0_v) > 0.1e-3)
                    r.fail("e0_polynomial_v", "the polynomial gives " + message_number(at25) + " V at 25 degC but e0_v is " +
                                                  message_number(e.e0_v) + " V (allowed difference 0.1 mV)");
                e.de0_dt_v_per_k = (e.e0_at(26.0) - e.e0_at(24.0)) / 2.0;
            }
            if (auto range = r.numbers("temperature_range_c", 2)) {
                if (!((*range)[0] < (*range)[1])) r.fail("temperature_range_c", "expected [min, max] with min < max");
                e.range = TemperatureRange{(*range)[0], (*range)[1]};
            }
            e.source = r.string("source").value_or("");
            e.from_memory = r.boolean("from_memory").value_or(false);
            e.note = r.string("note").value_or("");
            r.finish({"reaction", "e0_v", "de0_dt_mv_per_k", "e0_polynomial_v", "temperature_range_c", "source",
                      "from_memory", "note"});
            db_.electrodes_.push_back(std::move(e));
        }
        std::stable_sort(db_.electrodes_.begin(), db_.electrodes_.end(),
                         [](const Electrode& a, const Electrode& b) { return a.where.line < b.where.line; });
    }

    void read_analytes(const toml::table& t) {
        std::vector<std::string> comps;
        for (std::size_t j = 0; j < db_.component_count_; ++j) comps.push_back(db_.species_[j].name);
        for (const auto& [k, v] : t) {
            const std::string key(k.str());
            const std::string prefix = tomlu::join_key("analytes", key);
            const SourceLocation at = tomlu::where(k.source(), origin_);
            if (!v.is_table()) throw InputError(at, prefix, "expected a table");
            tomlu::TableReader r(*v.as_table(), origin_, prefix);
            Analyte a;
            a.name = key;
            a.where = at;
            const std::string comp = r.require_string("component", "the component this analyte gives, e.g. \"Ca^2+\"");
            auto it = index_.find(comp);
            if (it == index_.end() || it->second >= db_.component_count_)
                r.fail("component", "'" + comp + "' is not a component of the database", nearest_name(comp, comps));
            a.component = it->second;
            const std::string kind = r.string("kind").value_or("total");
            if (kind == "total") a.kind = Analyte::Kind::total;
            else if (kind == "alkalinity") a.kind = Analyte::Kind::alkalinity;
            else if (kind == "redox_state") a.kind = Analyte::Kind::redox_state;
            else r.fail("kind", "expected \"total\", \"alkalinity\" or \"redox_state\"",
                        nearest_name(kind, {"total", "alkalinity", "redox_state"}));
            if (a.kind == Analyte::Kind::redox_state) {
                // Named by element and signed oxidation state, "Fe +3": a case file gives it
                // in the element's table, Fe = { "+3" = ... }.
                static const std::regex state_name(R"([A-Z][a-z]? [+-][0-9]+)");
                if (!std::regex_match(key, state_name))
                    throw InputError(at, prefix,
                                     "an analyte of kind \"redox_state\" is named by its element and its signed "
                                     "oxidation state, such as \"Fe +3\"; found \"" + key + "\"");
                a.electrons = r.require_number("electrons", "the e- per atom in the formation of this state's species (Fe +3: -1)");
            }
            else if (r.has("electrons"))
                r.fail("electrons", "electrons belongs to an analyte of kind \"redox_state\"");
            const std::string mf = r.string("mass_formula").value_or(key);
            a.mass_formula = guard_formula(r.location("mass_formula"), prefix + ".mass_formula",
                                           [&] { return chem::parse_formula(mf); });
            r.finish({"component", "kind", "mass_formula", "electrons"});
            // Components per formula unit of the mass formula, by the component's first
            // element other than H and O (SiO2 -> H4SiO4: 1).
            const chem::Formula& cf = db_.species_[a.component].formula;
            a.per_component = 1.0;
            for (const auto& [el, n] : cf.elements) {
                if (el == "H" || el == "O") continue;
                const double in_mass = a.mass_formula.atoms(el);
                if (in_mass > 0) a.per_component = in_mass / n;
                break;
            }
            db_.analytes_.push_back(std::move(a));
        }
    }

    std::string origin_;
    toml::table root_;
    Database db_;
    std::map<std::string, std::size_t> index_;  // name -> index in db_.species_
    std::vector<RawEntry> species_raw_, minerals_raw_, gases_raw_;
    std::map<std::string, std::size_t> species_raw_index_;
    std::map<std::size_t, std::optional<Resolved>> resolved_, gases_resolved_;
    std::map<std::string, std::size_t> gas_raw_index_;
    std::map<std::string, double> alkalinity_memo_;  // key prefix -> derived alkalinity
};

Database Database::parse(std::string_view toml_text, const std::string& origin) {
    return DatabaseLoader(toml_text, origin).load();
}

Database Database::load_file(const std::string& path) {
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec))
        throw InputError(SourceLocation{path, 0, 0}, "", "cannot read a directory as a database file");
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(SourceLocation{path, 0, 0}, "", "cannot open the database file");
    std::ostringstream ss;
    ss << in.rdbuf();
    return parse(ss.str(), path);
}

const Database& Database::embedded() {
    static const Database db = parse(embedded_core_text(), "core.toml (embedded)");
    return db;
}

namespace {
template <class T>
std::optional<std::size_t> find_by_name(const std::vector<T>& v, std::string_view name) {
    for (std::size_t i = 0; i < v.size(); ++i)
        if (v[i].name == name) return i;
    return std::nullopt;
}
template <class T>
std::vector<std::string> names_of(const std::vector<T>& v) {
    std::vector<std::string> out;
    for (const auto& e : v) out.push_back(e.name);
    return out;
}
}  // namespace

std::optional<std::size_t> Database::find_species(std::string_view name) const {
    if (auto i = find_by_name(species_, name)) return i;
    // Accept "H2O(l)" for "H2O" and "Ca^2+(aq)" for "Ca^2+".
    for (std::string_view mark : {"(aq)", "(l)"})
        if (name.size() > mark.size() && name.substr(name.size() - mark.size()) == mark)
            return find_by_name(species_, name.substr(0, name.size() - mark.size()));
    return std::nullopt;
}
std::optional<std::size_t> Database::find_mineral(std::string_view name) const { return find_by_name(minerals_, name); }
std::optional<std::size_t> Database::find_gas(std::string_view name) const { return find_by_name(gases_, name); }
std::optional<std::size_t> Database::find_analyte(std::string_view name) const { return find_by_name(analytes_, name); }
const Source* Database::find_source(std::string_view key) const {
    for (const auto& s : sources_)
        if (s.key == key) return &s;
    return nullptr;
}
std::vector<std::string> Database::species_names() const { return names_of(species_); }
std::vector<std::string> Database::mineral_names() const { return names_of(minerals_); }
std::vector<std::string> Database::gas_names() const { return names_of(gases_); }
std::vector<std::string> Database::analyte_names() const { return names_of(analytes_); }

}  // namespace deltag::thermo
