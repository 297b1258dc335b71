// Activity models: ideal, Davies, extended Debye-Hueckel, Truesdell-Jones, B-dot.
// All give log10 gamma and its analytic derivative with respect to the ionic strength I.
#include "deltag/activity.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "deltag/constants.hpp"

namespace deltag::activity {

namespace {

constexpr std::array<std::string_view, 5> names{"ideal", "davies", "debye-huckel",
                                                "truesdell-jones", "b-dot"};
constexpr std::array<ModelKind, 5> kinds{ModelKind::ideal, ModelKind::davies,
                                         ModelKind::debye_huckel, ModelKind::truesdell_jones,
                                         ModelKind::b_dot};

// d(sqrt I)/dI = 1/(2 sqrt I) diverges at I = 0; below this floor I is taken as this value so
// the derivative stays finite (the value of log gamma changes by < 1e-9).
constexpr double min_ionic_strength = 1e-20;

// B-dot coefficient (kg/mol) of Helgeson (1969) Am. J. Sci. 267, 729, tabulated against
// temperature; values from memory. Linear in T between points, held at the end values
// outside 0-100 degC.
double b_dot_coefficient(double temperature_c) {
    static constexpr std::array<double, 4> t_c{0.0, 25.0, 60.0, 100.0};
    static constexpr std::array<double, 4> b_dot{0.0374, 0.0410, 0.0438, 0.0460};
    if (temperature_c <= t_c.front()) return b_dot.front();
    if (temperature_c >= t_c.back()) return b_dot.back();
    std::size_t i = 1;
    while (temperature_c > t_c[i]) ++i;
    const double f = (temperature_c - t_c[i - 1]) / (t_c[i] - t_c[i - 1]);
    return b_dot[i - 1] + f * (b_dot[i] - b_dot[i - 1]);
}

double given_or(double value, double fallback) { return std::isnan(value) ? fallback : value; }

struct LogGamma {
    double value;
    double d_di;
};

// -A z^2 sqrt(I) / (1 + B a sqrt(I)); with s = sqrt(I) and D = 1 + B a s,
// d/dI = -A z^2 / (2 s D^2).
LogGamma debye_huckel_term(double a_dh, double b_dh, double size, double z2, double s) {
    const double d = 1.0 + b_dh * size * s;
    return {-a_dh * z2 * s / d, -a_dh * z2 / (2.0 * s * d * d)};
}

class HueckelFamilyModel final : public ActivityModel {
public:
    HueckelFamilyModel(ModelKind kind, thermo::DebyeHuckelParameters dh, double b_dot)
        : kind_(kind), dh_(dh), b_dot_(b_dot) {}

    ModelKind kind() const override { return kind_; }

    // Common practice, not a published limit:
    //  ideal 1e-3: at I = 1e-3 a univalent ion already has log gamma ~ -0.015 (3.5 % in gamma);
    //  extended Debye-Hueckel 0.1; Davies 0.5; B-dot 1.0 (fitted to NaCl solutions);
    //  Truesdell-Jones 2.0 (its b I term is fitted up to a few mol/kg).
    double max_ionic_strength() const override {
        switch (kind_) {
            case ModelKind::ideal: return 1e-3;
            case ModelKind::davies: return 0.5;
            case ModelKind::debye_huckel: return 0.1;
            case ModelKind::truesdell_jones: return 2.0;
            case ModelKind::b_dot: return 1.0;
        }
        return 0.0;
    }

    void log_gamma(double ionic_strength, std::span<const SpeciesParameters> species,
                   std::span<double> log_gamma, std::span<double> dlog_gamma_di) const override {
        if (log_gamma.size() != species.size() || dlog_gamma_di.size() != species.size())
            throw std::invalid_argument("activity model: output spans must match the species count");
        const double i = std::max(ionic_strength, min_ionic_strength);
        for (std::size_t k = 0; k < species.size(); ++k) {
            const LogGamma g = one(i, species[k]);
            log_gamma[k] = g.value;
            dlog_gamma_di[k] = g.d_di;
        }
    }

private:
    LogGamma one(double i, const SpeciesParameters& p) const {
        if (kind_ == ModelKind::ideal) return {0.0, 0.0};
        if (p.charge == 0) {
            // Neutral species: log gamma = k I (salting out), k defaulting to common practice.
            const double k = given_or(p.salting_out, default_salting_out);
            return {k * i, k};
        }
        const double z2 = static_cast<double>(p.charge) * static_cast<double>(p.charge);
        const double s = std::sqrt(i);
        const double size = given_or(p.ion_size_angstrom, default_ion_size_angstrom);
        switch (kind_) {
            case ModelKind::davies: {
                // Davies (1962), Ion Association: -A z^2 (sqrt I / (1 + sqrt I) - 0.3 I).
                const double d = 1.0 + s;
                return {-dh_.a * z2 * (s / d - 0.3 * i), -dh_.a * z2 * (1.0 / (2.0 * s * d * d) - 0.3)};
            }
            case ModelKind::debye_huckel:
                // Extended Debye-Hueckel: -A z^2 sqrt I / (1 + B a sqrt I).
                return debye_huckel_term(dh_.a, dh_.b, size, z2, s);
            case ModelKind::truesdell_jones: {
                // Truesdell & Jones (1974) J. Res. U.S. Geol. Surv. 2, 233:
                // -A z^2 sqrt I / (1 + B a sqrt I) + b I, with the species' own a and b; a missing
                // a falls back to the ion size, a missing b to 0 (extended Debye-Hueckel).
                const double a_tj = given_or(p.tj_a_angstrom, size);
                const double b_tj = given_or(p.tj_b, 0.0);
                const LogGamma g = debye_huckel_term(dh_.a, dh_.b, a_tj, z2, s);
                return {g.value + b_tj * i, g.d_di + b_tj};
            }
            case ModelKind::b_dot: {
                // Helgeson (1969) Am. J. Sci. 267, 729: -A z^2 sqrt I / (1 + B a sqrt I) + Bdot I.
                const LogGamma g = debye_huckel_term(dh_.a, dh_.b, size, z2, s);
                return {g.value + b_dot_ * i, g.d_di + b_dot_};
            }
            case ModelKind::ideal: break;
        }
        return {0.0, 0.0};
    }

    ModelKind kind_;
    thermo::DebyeHuckelParameters dh_;
    double b_dot_;
};

}  // namespace

std::string_view model_name(ModelKind kind) {
    for (std::size_t k = 0; k < kinds.size(); ++k)
        if (kinds[k] == kind) return names[k];
    return {};
}

bool parse_model_name(std::string_view name, ModelKind& kind) {
    for (std::size_t k = 0; k < names.size(); ++k) {
        if (names[k] == name) {
            kind = kinds[k];
            return true;
        }
    }
    return false;
}

std::vector<std::string> model_names() { return {names.begin(), names.end()}; }

SpeciesParameters no_parameters(int charge) {
    constexpr double nan = std::numeric_limits<double>::quiet_NaN();
    return {charge, nan, nan, nan, nan};
}

std::unique_ptr<ActivityModel> make_model(ModelKind kind, const thermo::DebyeHuckelParameters& dh,
                                          double b_dot) {
    return std::make_unique<HueckelFamilyModel>(kind, dh, b_dot);
}

std::unique_ptr<ActivityModel> make_model(ModelKind kind, double temperature_c) {
    return make_model(kind, thermo::debye_huckel_parameters(temperature_c),
                      b_dot_coefficient(temperature_c));
}

// Raoult's law in molal form with an ideal osmotic coefficient: ln a_w = -M_w sum(m).
double ln_water_activity(double total_solute_molality) {
    return -constants::water_molar_mass_kg * total_solute_molality;
}

}  // namespace deltag::activity
