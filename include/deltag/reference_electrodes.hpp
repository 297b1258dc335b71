// Reference electrodes and the Eh/pe conversion. Data of the water-properties layer, so a
// lab water's electrode reading can be converted where the analysis is read.
#pragma once

#include <string>
#include <vector>

#include "deltag/error.hpp"

namespace deltag::electro {

struct ReferenceElectrode {
    std::string name;            // "SCE", "Ag/AgCl(sat KCl)", ...
    double e_25_v = 0.0;         // vs SHE at 25 degC
    double de_dt_v_per_k = 0.0;  // temperature coefficient at 25 degC
    std::string source;
    // Ag/AgCl in a KCl solution of fixed concentration: E(T) = E°(AgCl/Ag, T) - (RT/F) ln a(Cl-)
    // with a(Cl-) held at its 25 degC value, i.e. E°(T) + (E_25 - E°_25) T/298.15, E°(T) of
    // Bates & Bower (1954). Otherwise E(T) = E_25 + dE/dT (T - 25).
    bool silver_chloride_fixed_chloride = false;
};

// E° of the silver-silver chloride electrode, AgCl(s) + e- = Ag(s) + Cl-, V vs SHE:
// Bates & Bower (1954) J. Res. Natl. Bur. Stand. 53, 283, 0-95 degC (the same polynomial as
// the database's AgCl/Ag electrode; a test keeps the two equal).
double silver_chloride_e0_v(double temperature_c);

const std::vector<ReferenceElectrode>& reference_electrodes();
std::vector<std::string> reference_names();
// Potential of a reference electrode vs SHE at a temperature. Throws InputError with the
// nearest name for an unknown electrode.
double reference_v(const std::string& name, double temperature_c, const SourceLocation& where);
// A potential measured against `from`, expressed against `to`.
double convert_v(double value_v, const std::string& from, const std::string& to, double temperature_c,
                 const SourceLocation& where);

// pe = F Eh / (RT ln10) and back.
double pe_from_eh(double eh_v, double temperature_c);
double eh_from_pe(double pe, double temperature_c);

}  // namespace deltag::electro
