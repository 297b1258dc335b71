// One operation, measured once: scripts/bench runs this under callgrind with collection off
// at the start, and the client requests below switch it on around the operation alone, so the
// count excludes start-up and the warm-up run before it. Outside valgrind the requests do
// nothing. Prints the operation, how many speciations it took and how many units (solves,
// sweep points) it stands for, one line:
//   cold speciations=1 units=1
// Modes: cold, warm (the benchmark's 10-component water), dose (a dose `until` a Langelier
// target), sweep (a sweep with indices; units = points), outlook (what a water will do),
// water (a water as a run reads it: speciation, indices).
#include <cstdio>
#include <cstring>
#include <string>

#if __has_include(<valgrind/callgrind.h>)
#include <valgrind/callgrind.h>
#define DELTAG_MEASURE_ON() CALLGRIND_TOGGLE_COLLECT
#define DELTAG_MEASURE_OFF() CALLGRIND_TOGGLE_COLLECT
#else
#define DELTAG_MEASURE_ON() ((void)0)
#define DELTAG_MEASURE_OFF() ((void)0)
#endif

#include "bench_waters.hpp"
#include "deltag/outlook.hpp"
#include "deltag/process.hpp"
#include "deltag/run.hpp"
#include "deltag/speciation.hpp"

using namespace deltag;

namespace {

template <class F>
int measure(const char* mode, int units, F&& op) {
    op();  // warm-up: the database, caches
    const auto before = equilibrium::speciation_count();
    DELTAG_MEASURE_ON();
    op();
    DELTAG_MEASURE_OFF();
    const auto n = equilibrium::speciation_count() - before;
    std::printf("%s speciations=%llu units=%d\n", mode, static_cast<unsigned long long>(n), units);
    return 0;
}

}  // namespace

int main(int argc, char** argv) {
    if (argc != 2) {
        std::fprintf(stderr, "usage: deltag_measure cold|warm|dose|sweep|outlook|water\n");
        return 2;
    }
    const std::string mode = argv[1];
    const thermo::Database& db = thermo::Database::embedded();
    if (mode == "cold") {
        const auto in = bench::ten_component_water(25.0);
        return measure("cold", 1, [&] { (void)equilibrium::speciate(db, in); });
    }
    if (mode == "warm") {
        const auto previous = equilibrium::speciate(db, bench::ten_component_water(24.0));
        const auto in = bench::ten_component_water(25.0);
        return measure("warm", 1, [&] { (void)equilibrium::speciate(db, in, {}, &previous); });
    }
    if (mode == "dose" || mode == "sweep" || mode == "outlook" || mode == "water") {
        RunOptions o;
        o.waters_and_steps_only = true;
        const CaseRun k = run_case_text(mode == "sweep" ? bench::tower_sweep_case_text() : bench::tower_dose_case_text(),
                                        "bench tower (invented)", ".", o);
        if (mode == "dose")
            return measure("dose", 1, [&] { (void)process::run_steps(db, k.waters, k.case_file.steps); });
        if (mode == "sweep") {
            const process::Sweep& sw = k.case_file.sweeps.at(0);
            return measure("sweep", sw.points, [&] { (void)process::run_sweep(db, k.waters, k.case_file.steps, sw); });
        }
        if (mode == "outlook")
            return measure("outlook", 1, [&] { (void)process::mineral_outlook(db, k.waters.at(0)); });
        const equilibrium::SpeciationInput& in = k.waters.at(0).basis;
        return measure("water", 1, [&] {
            const auto r = equilibrium::speciate(db, in);
            (void)process::state_from_result(r, in, db);
        });
    }
    std::fprintf(stderr, "deltag_measure: unknown mode '%s'\n", mode.c_str());
    return 2;
}
