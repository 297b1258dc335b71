// Speciation of a 10-component water (Ca, Mg, Na, K, Cl, SO4, carbonate, silica, F, NO3 plus
// H+ from the charge balance), from a cold start and from a warm start (the solution at a
// slightly different temperature); a dose `until` a Langelier target, a sweep point with
// indices and a one-water run on an invented cooling tower (bench_waters.hpp). Wall times
// here; instruction counts from scripts/bench (callgrind). Run: ./build/benchmarks/bench_speciation
#include <benchmark/benchmark.h>

#include "bench_waters.hpp"
#include "deltag/process.hpp"
#include "deltag/run.hpp"
#include "deltag/speciation.hpp"

using namespace deltag;
using namespace deltag::equilibrium;

namespace {

const thermo::Database& core() { return thermo::Database::embedded(); }
using bench::ten_component_water;

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

// Speciations per operation, a counter next to the time.
void count_speciations(benchmark::State& state, std::uint64_t before, double units) {
    state.counters["speciations"] =
        benchmark::Counter(static_cast<double>(equilibrium::speciation_count() - before) / units,
                           benchmark::Counter::kAvgIterations);
}

CaseRun tower(const char* text) {
    RunOptions o;
    o.waters_and_steps_only = true;
    return run_case_text(text, "bench tower (invented)", ".", o);
}

void dose_until_langelier(benchmark::State& state) {
    const CaseRun k = tower(bench::tower_dose_case_text());
    const auto before = equilibrium::speciation_count();
    for (auto _ : state) benchmark::DoNotOptimize(process::run_steps(core(), k.waters, k.case_file.steps));
    count_speciations(state, before, 1.0);
}

void sweep_point(benchmark::State& state) {
    const CaseRun k = tower(bench::tower_sweep_case_text());
    const process::Sweep& sw = k.case_file.sweeps.at(0);
    const auto before = equilibrium::speciation_count();
    for (auto _ : state) benchmark::DoNotOptimize(process::run_sweep(core(), k.waters, k.case_file.steps, sw));
    count_speciations(state, before, sw.points);
    state.counters["points"] = sw.points;
}

void one_water_run(benchmark::State& state) {
    // A whole one-water run in process, database loaded: reading the case, the speciation,
    // indices and what the water will do.
    for (auto _ : state)
        benchmark::DoNotOptimize(run_case_text(bench::tower_dose_case_text(), "bench tower (invented)", "."));
}

}  // namespace

BENCHMARK(cold_start)->Unit(benchmark::kMicrosecond)->Repetitions(5)->ReportAggregatesOnly(true);
BENCHMARK(warm_start)->Unit(benchmark::kMicrosecond)->Repetitions(5)->ReportAggregatesOnly(true);
BENCHMARK(dose_until_langelier)->Unit(benchmark::kMillisecond);
BENCHMARK(sweep_point)->Unit(benchmark::kMillisecond);
BENCHMARK(one_water_run)->Unit(benchmark::kMillisecond);
BENCHMARK_MAIN();
