// Speciates a water through the installed deltag package: pure water at 25 degC must have
// pH 6.998 +- 0.003, half of pKw 13.995 (Bandura & Lvov 2006, J. Phys. Chem. Ref. Data 35,
// 15; value from memory, as in tests/test_speciation.cpp), called piece by piece and as a
// case through run_case_text. Exit 0 when both do.
#include <cmath>
#include <cstdio>
#include <string>

#include "deltag/database.hpp"
#include "deltag/process.hpp"
#include "deltag/run.hpp"
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
    const CaseRun run = run_case_text("[water.pure]\ntemperature_c = 25\n", "consumer case", ".");
    const double ph_case = run.waters.at(0).result.ph;
    const bool report_ok = report(run, "json").find("\"pure\"") != std::string::npos;
    std::printf("pure water at 25 degC: pH %.4f, as a case %.4f (expected 6.998 +- 0.003)\n", state.result.ph, ph_case);
    return std::abs(state.result.ph - 6.998) <= 0.003 && r.summary.converged && std::abs(ph_case - 6.998) <= 0.003 && report_ok
               ? 0
               : 1;
}
