// Speciates a water through the installed deltag package: pure water at 25 degC must have
// pH 6.998 +- 0.003, half of pKw 13.995 (Bandura & Lvov 2006, J. Phys. Chem. Ref. Data 35,
// 15; value from memory, as in tests/test_speciation.cpp). Exit 0 when it does.
#include <cmath>
#include <cstdio>

#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water.hpp"

int main() {
    using namespace deltag;
    const thermo::Database& db = thermo::Database::embedded();
    WaterAnalysis water;
    water.name = "pure";
    water.temperature_c = 25.0;  // no analytes: pure water, pH from the charge balance
    const equilibrium::SpeciationInput in = to_speciation_input(water, db, activity::ModelKind::davies);
    const equilibrium::SpeciationResult r = equilibrium::speciate(db, in);
    const process::WaterState state = process::state_from_result(r, in, db);
    std::printf("pure water at 25 degC: pH %.4f (expected 6.998 +- 0.003)\n", state.result.ph);
    return std::abs(state.result.ph - 6.998) <= 0.003 && r.summary.converged ? 0 : 1;
}
