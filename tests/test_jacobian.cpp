// The analytic Jacobian of the speciation equations against central finite differences, for
// every kind of equation the solver builds: mass, alkalinity, charge, ionic strength, water
// activity, minerals and gases held at a target, a closed headspace (its gas moles enter the
// balances), conserved electrons, separately reported redox states, and a component whose
// unknown sits on a switched basis species (ammonium for nitrate at a low pe). A wrong
// coupling term would otherwise hide behind the line search and the fallback starts: the
// solve still converges, only more slowly.
#include <doctest/doctest.h>

#include <cmath>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "deltag/speciation.hpp"
#include "deltag/water.hpp"
#include "equilibrium/probe.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

std::size_t comp(const char* name) {
    auto i = core().find_species(name);
    REQUIRE(i.has_value());
    return *i;
}
ComponentInput total(const char* name, double v) { return {comp(name), ComponentInput::Kind::total, v}; }
std::size_t mineral(const char* name) {
    auto i = core().find_mineral(name);
    REQUIRE(i.has_value());
    return *i;
}
std::size_t gas(const char* name) {
    auto i = core().find_gas(name);
    REQUIRE(i.has_value());
    return *i;
}

// Largest mismatch between analytic and central-difference columns, relative to the size
// of the Jacobian row (rows are scaled residuals, so entries are O(1) where they matter).
struct Mismatch {
    double worst = 0.0;
    std::string where;
};

Mismatch compare_at(const internal::EquationProbe& p, const std::vector<double>& u) {
    const std::size_t n = p.n;
    std::vector<double> f(n), jac(n * n), fp(n), fm(n);
    p.evaluate(u.data(), f.data(), jac.data());
    std::vector<double> fd(n * n);
    for (std::size_t j = 0; j < n; ++j) {
        // Unknowns are log10 quantities or phase amounts in mol/kgw: a step of 1e-6 in
        // either is small against their curvature and large against rounding.
        const double h = 1e-6 * std::max(1.0, std::abs(u[j]));
        std::vector<double> up = u, um = u;
        up[j] += h;
        um[j] -= h;
        p.evaluate(up.data(), fp.data(), nullptr);
        p.evaluate(um.data(), fm.data(), nullptr);
        for (std::size_t i = 0; i < n; ++i) fd[i + j * n] = (fp[i] - fm[i]) / (2 * h);
    }
    Mismatch out;
    for (std::size_t i = 0; i < n; ++i) {
        double row = 1e-12;
        for (std::size_t j = 0; j < n; ++j) row = std::max(row, std::abs(fd[i + j * n]));
        for (std::size_t j = 0; j < n; ++j) {
            const double d = std::abs(jac[i + j * n] - fd[i + j * n]) / row;
            if (d > out.worst) {
                out.worst = d;
                out.where = "row " + std::to_string(i) + " (" + p.kind[i] + "), column " + std::to_string(j) + " (" +
                            p.kind[j] + ")";
            }
        }
    }
    return out;
}

// Checks at the solution and at two points around it (the solver meets the Jacobian away
// from the solution first); returns the kinds of equation that were checked.
std::set<std::string> check(const SpeciationInput& in) {
    const internal::EquationProbe p = internal::probe_equations(core(), in);
    REQUIRE(p.n > 0);
    std::vector<std::vector<double>> points{p.solution};
    for (const double shift : {0.15, -0.1}) {
        std::vector<double> u = p.solution;
        for (std::size_t j = 0; j < p.n; ++j) {
            const double sign = (j % 3 == 0) ? -1.0 : 1.0;
            // Phase amounts move by a small fraction of a mmol; log quantities by ~0.1 decade.
            u[j] += p.kind[j] == "mineral" || p.kind[j] == "gas" ? sign * shift * 1e-4 : sign * shift;
        }
        points.push_back(u);
    }
    for (const auto& u : points) {
        const Mismatch m = compare_at(p, u);
        CAPTURE(in.label);
        CAPTURE(m.where);
        CHECK(m.worst < 1e-6);
    }
    std::set<std::string> kinds(p.kind.begin(), p.kind.end());
    for (std::size_t e = 0; e < p.n; ++e)
        if (p.switched[e]) kinds.insert("switched basis");
    if (p.closed_gases > 0) kinds.insert("headspace");
    return kinds;
}

// An invented fresh water (mol/kgw).
std::vector<ComponentInput> fresh() {
    return {total("Ca^2+", 2.0e-3), total("Mg^2+", 0.8e-3), total("Na+", 1.5e-3), total("K+", 1e-4),
            total("Cl-", 1.6e-3),   total("SO4^2-", 0.9e-3), total("H4SiO4", 2e-4)};
}

// The waters whose equations are checked, each chosen to bring in some kinds of equation.
std::vector<SpeciationInput> waters() {
    std::vector<SpeciationInput> out;
    {   // Alkalinity at a measured pH, calcite held at saturation.
        SpeciationInput in;
        in.label = "alkalinity + calcite";
        in.ph = 7.8;
        in.activity_model = activity::ModelKind::truesdell_jones;
        in.components = fresh();
        in.components.push_back({comp("HCO3-"), ComponentInput::Kind::alkalinity, 3.5e-3});
        in.minerals = {MineralTarget{mineral("Calcite"), 0.0, std::nullopt}};
        out.push_back(in);
    }
    {   // Fixed pH, CO2 gas held, gypsum held, the charge closed on sodium, 40 degC.
        SpeciationInput in;
        in.label = "gas + gypsum";
        in.temperature_c = 40.0;
        in.ph = 7.2;
        in.components = fresh();
        in.components.push_back(total("HCO3-", 2e-3));
        in.components[0].value = 18e-3;  // calcium
        in.components[5].value = 20e-3;  // sulfate
        in.gases = {GasTarget{gas("CO2(g)"), -2.5}};
        in.minerals = {MineralTarget{mineral("Gypsum"), 0.0, std::nullopt}};
        in.charge_balance_component = comp("Na+");
        out.push_back(in);
    }
    {   // A closed headspace with carbon dioxide.
        SpeciationInput in;
        in.label = "headspace";
        in.components = fresh();
        in.components.push_back(total("HCO3-", 3e-3));
        Headspace h;
        h.volume_l_per_kgw = 0.2;
        h.gases = {GasTarget{gas("CO2(g)"), -1.5}};
        in.headspace = h;
        out.push_back(in);
    }
    {   // Nitrate at pe 1: nitrogen lives as ammonium, the unknown on a switched basis.
        SpeciationInput in;
        in.label = "nitrate at pe 1";
        in.ph = 7.0;
        in.pe = 1.0;
        in.components = fresh();
        in.components.push_back(total("HCO3-", 2e-3));
        in.components.push_back(total("NO3-", 5e-4));
        in.components.push_back(total("Fe^2+", 2e-5));
        out.push_back(in);
    }
    {   // Iron as ferrous and ferric apart, Eh reading (invented well water); then the same
        // water with its electrons conserved and the pe free, as a process step carries it.
        WaterAnalysis w;
        w.name = "well";
        w.ph = 6.9;
        w.eh_mv = 150.0;
        w.charge_balance = "Cl";
        for (const auto& [k, v] : std::map<std::string, double>{{"Ca", 60}, {"Mg", 12}, {"Na", 25}, {"Cl", 40},
                                                              {"SO4", 30}, {"Alkalinity", 180}, {"NO3", 5},
                                                              {"Fe +2", 1.5}, {"Fe +3", 0.4}, {"Mn", 0.2}}) {
            AnalyteValue a;
            a.name = k;
            a.value = v;
            if (k == "Alkalinity") a.as = "CaCO3";
            w.analytes.push_back(a);
        }
        SpeciationInput in = to_speciation_input(w, core(), activity::ModelKind::davies);
        out.push_back(in);
        const SpeciationResult r = speciate(core(), in);
        double e_total = 0.0;
        const std::size_t e = core().electron().value();
        for (const auto& s : r.species)
            for (const auto& [j, nu] : core().species()[s.species].formation)
                if (j == e) e_total += nu * s.molality;
        in.label = "well, electrons conserved";
        in.pe.reset();
        in.electron_total = e_total;
        out.push_back(in);
    }
    return out;
}

}  // namespace

TEST_CASE("analytic Jacobian equals finite differences for every kind of equation") {
    std::set<std::string> seen;
    for (const SpeciationInput& in : waters()) {
        const std::set<std::string> k = check(in);
        seen.insert(k.begin(), k.end());
    }
    for (const char* k : {"mass", "alkalinity", "charge", "ionic strength", "water", "mineral", "gas", "headspace",
                          "electrons", "split electrons", "switched basis"}) {
        CAPTURE(k);
        CHECK(seen.count(k) == 1);
    }
}
