// Speciation of a 10-component water (Ca, Mg, Na, K, Cl, SO4, carbonate, silica, F, NO3 plus
// H+ from the charge balance), from a cold start and from a warm start (the solution at a
// slightly different temperature). Run: ./build/benchmarks/bench_speciation
#include <benchmark/benchmark.h>

#include "deltag/speciation.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }

SpeciationInput ten_component_water(double temperature_c) {
    auto total = [](const char* n, double v) {
        return ComponentInput{*core().find_species(n), ComponentInput::Kind::total, v};
    };
    SpeciationInput in;
    in.label = "bench";
    in.temperature_c = temperature_c;
    in.activity_model = activity::ModelKind::truesdell_jones;
    in.components = {total("Ca^2+", 2.5e-3), total("Mg^2+", 1.0e-3), total("Na+", 1.2e-3), total("K+", 1e-4),
                     total("Cl-", 1.5e-3),   total("SO4^2-", 1.1e-3), total("HCO3-", 4.8e-3),
                     total("H4SiO4", 2e-4),  total("F-", 1e-5),       total("NO3-", 1e-4)};
    return in;  // pH from the charge balance
}

void cold_start(benchmark::State& state) {
    const SpeciationInput in = ten_component_water(25.0);
    int iterations = 0;
    for (auto _ : state) {
        SpeciationResult r = speciate(core(), in);
        iterations = r.summary.iterations;
        benchmark::DoNotOptimize(r);
    }
    state.counters["newton_iterations"] = iterations;
}

void warm_start(benchmark::State& state) {
    const SpeciationResult previous = speciate(core(), ten_component_water(24.0));
    const SpeciationInput in = ten_component_water(25.0);
    int iterations = 0;
    for (auto _ : state) {
        SpeciationResult r = speciate(core(), in, {}, &previous);
        iterations = r.summary.iterations;
        benchmark::DoNotOptimize(r);
    }
    state.counters["newton_iterations"] = iterations;
}

}  // namespace

BENCHMARK(cold_start)->Unit(benchmark::kMicrosecond)->Repetitions(5)->ReportAggregatesOnly(true);
BENCHMARK(warm_start)->Unit(benchmark::kMicrosecond)->Repetitions(5)->ReportAggregatesOnly(true);
BENCHMARK_MAIN();
