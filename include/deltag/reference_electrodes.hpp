// Reference electrodes and the Eh/pe conversion. Data of the water-properties layer, so a
// lab water's electrode reading can be converted where the analysis is read.
#pragma once

#include <string>
#include <vector>

#include "deltag/error.hpp"

namespace deltag::electro {

struct ReferenceElectrode {
    std::string name;            // "SCE", "Ag/AgCl(sat KCl)", ...
    double e_25_v;               // vs SHE at 25 degC
    double de_dt_v_per_k;        // temperature coefficient
    std::string source;
};

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
