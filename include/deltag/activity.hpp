// Activity models behind one small interface. A model turns the ionic strength I (mol/kgw)
// and a species' charge and size parameters into log10 of its activity coefficient, with
// the derivative d(log10 gamma)/dI for the analytic Jacobian of the equilibrium solver.
#pragma once

#include <limits>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "deltag/water_properties.hpp"

namespace deltag::activity {

enum class ModelKind { ideal, davies, debye_huckel, truesdell_jones, b_dot };

// "ideal", "davies", "debye-huckel", "truesdell-jones", "b-dot".
std::string_view model_name(ModelKind kind);
// Parses a model name; returns false if unknown.
bool parse_model_name(std::string_view name, ModelKind& kind);
std::vector<std::string> model_names();

// Parameters of one aqueous species as a model needs them. NaN (the default) marks "not given"; a model
// that needs a missing parameter uses its documented default (see DEVELOPERS.md).
struct SpeciesParameters {
    int charge = 0;
    double ion_size_angstrom = std::numeric_limits<double>::quiet_NaN();  // a (extended Debye-Hueckel, B-dot)
    double tj_a_angstrom = std::numeric_limits<double>::quiet_NaN();      // Truesdell-Jones a
    double tj_b = std::numeric_limits<double>::quiet_NaN();               // Truesdell-Jones b, kg/mol
    double salting_out = std::numeric_limits<double>::quiet_NaN();        // neutral species: log10 gamma = k I, kg/mol
};

SpeciesParameters no_parameters(int charge);

class ActivityModel {
public:
    virtual ~ActivityModel() = default;
    virtual ModelKind kind() const = 0;
    // Largest ionic strength (mol/kgw) for which the model is reasonable; beyond it the
    // speciation result carries a warning.
    virtual double max_ionic_strength() const = 0;
    // log10 gamma of each species and its derivative with respect to I, at ionic strength I.
    virtual void log_gamma(double ionic_strength, std::span<const SpeciesParameters> species,
                           std::span<double> log_gamma, std::span<double> dlog_gamma_di) const = 0;
};

// Builds a model for a temperature (A, B and, for B-dot, the B-dot coefficient depend on it).
std::unique_ptr<ActivityModel> make_model(ModelKind kind, double temperature_c);
// Builds a model with given Debye-Hueckel A and B and B-dot coefficient (kg/mol; used only
// by the B-dot model), e.g. to reproduce a published calculation at fixed A and B.
std::unique_ptr<ActivityModel> make_model(ModelKind kind, const thermo::DebyeHuckelParameters& dh,
                                          double b_dot);

// Defaults used when a parameter is missing (documented in DEVELOPERS.md).
inline constexpr double default_ion_size_angstrom = 4.0;
inline constexpr double default_salting_out = 0.1;  // common practice for neutral species

// Activity of water from the total molality of solutes (ideal osmotic coefficient,
// Raoult's law in molal form): ln a_w = -M_w * sum(m). Returns ln a_w.
double ln_water_activity(double total_solute_molality);

}  // namespace deltag::activity
