// Every plausible water solves: a fixed-seed corpus of generated lab analyses (see
// water_corpus.hpp for what "plausible" means here), each solved from its lab units, with
// conservation and the charge balance checked on each result.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdlib>
#include <map>
#include <sstream>
#include <string>

#include "deltag/speciation.hpp"
#include "deltag/water.hpp"
#include "water_corpus.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

constexpr std::uint64_t corpus_seed = 20261202;
constexpr std::size_t corpus_size = 2400;

// DELTAG_CORPUS_SEED and DELTAG_CORPUS_SIZE run another corpus by hand (the suite always runs
// the fixed one above).
std::uint64_t env_or(const char* name, std::uint64_t fallback) {
    const char* v = std::getenv(name);
    return v && *v ? std::strtoull(v, nullptr, 10) : fallback;
}

activity::ModelKind model_for(std::size_t i, corpus::Kind k) {
    if (k == corpus::Kind::brackish) return i % 2 ? activity::ModelKind::b_dot : activity::ModelKind::truesdell_jones;
    const activity::ModelKind models[] = {activity::ModelKind::truesdell_jones, activity::ModelKind::davies,
                                          activity::ModelKind::debye_huckel, activity::ModelKind::b_dot};
    return models[i % 4];
}

std::string describe(const corpus::Generated& g) {
    std::ostringstream o;
    const auto& w = g.water;
    o << w.name << " T=" << w.temperature_c;
    if (w.ph) o << " pH=" << *w.ph;
    if (!w.charge_balance.empty()) o << " balance=" << w.charge_balance;
    if (w.pe) o << " pe=" << *w.pe;
    if (w.eh_mv) o << " eh_mv=" << *w.eh_mv << " vs " << w.eh_reference;
    if (w.dissolved_oxygen_mg_per_l) o << " DO=" << *w.dissolved_oxygen_mg_per_l;
    o << " |";
    for (const auto& a : w.analytes) o << " " << a.name << "=" << a.value << (a.unit.empty() ? "" : a.unit) << (a.as.empty() ? "" : " as " + a.as);
    return o.str();
}

}  // namespace

TEST_CASE("every water of the generated corpus solves, conserving its totals and its charge balance") {
    const auto waters = corpus::generate(env_or("DELTAG_CORPUS_SIZE", corpus_size), env_or("DELTAG_CORPUS_SEED", corpus_seed));
    std::map<std::string, int> failed_by_kind, count_by_kind;
    int failures = 0, shown = 0;
    for (std::size_t i = 0; i < waters.size(); ++i) {
        const corpus::Generated& g = waters[i];
        const std::string kind = corpus::kind_name(g.kind);
        count_by_kind[kind] += 1;
        SpeciationInput in;
        try {
            in = to_speciation_input(g.water, core(), model_for(i, g.kind));
        } catch (const InputError& e) {
            FAIL_CHECK("generator made an input deltag refuses: " << describe(g) << ": " << std::string(e.what()));
            continue;
        }
        SpeciationResult r;
        try {
            r = speciate(core(), in);
        } catch (const InputError& e) {
            ++failures;
            failed_by_kind[kind] += 1;
            if (shown++ < 400) MESSAGE("refused as having no solution: " << describe(g) << "\n  " << std::string(e.what()));
            continue;
        } catch (const ConvergenceError& e) {
            ++failures;
            failed_by_kind[kind] += 1;
            if (shown++ < 400) MESSAGE("did not solve: " << describe(g) << "\n  " << std::string(e.what()));
            continue;
        }
        CAPTURE(describe(g));
        // Conservation: each given total comes back from the species.
        for (const auto& c : in.components) {
            if (c.kind == ComponentInput::Kind::total &&
                !(in.charge_balance_component && *in.charge_balance_component == c.component)) {
                const double back = r.component_totals[c.component];
                CHECK(std::abs(back - c.value) <= 1e-9 * c.value);
            }
            if (c.kind == ComponentInput::Kind::alkalinity) CHECK(std::abs(r.alkalinity_eq - c.value) <= 1e-9 * std::abs(c.value) + 1e-15);
        }
        // Charge: balanced waters close to round-off of their ion sums.
        if (!in.ph || in.charge_balance_component) {
            const double sum = r.cations_meq + r.anions_meq;
            CHECK(std::abs(r.cations_meq - r.anions_meq) <= 1e-8 * sum + 1e-12);
        }
        // Every number finite.
        CHECK(std::isfinite(r.ph));
        CHECK(std::isfinite(r.ionic_strength));
        if (r.pe) CHECK(std::isfinite(*r.pe));
        bool finite = true;
        for (const auto& s : r.species) finite = finite && std::isfinite(s.molality) && std::isfinite(s.log_gamma);
        for (const auto& s : r.saturation) finite = finite && std::isfinite(s.si) && std::isfinite(s.delta_g_kj_per_mol);
        CHECK(finite);
    }
    std::ostringstream o;
    for (const auto& [k, n] : count_by_kind) o << " " << k << " " << failed_by_kind[k] << "/" << n;
    MESSAGE("corpus failures by kind:" << o.str());
    CHECK(failures == 0);
}
