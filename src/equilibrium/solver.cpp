// Speciation: unknowns are log10 of the free molality of each component species (and of H+
// when the pH comes from the charge balance), log10 of the ionic strength and log10 of the
// water activity. Residuals: a mass (or alkalinity, or charge) balance per component, the
// definition of I, and the water activity. The Jacobian is analytic, assembled with Eigen,
// and KINSOL's Newton method with line search solves the system.
#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sundials/sundials_linearsolver.h>
#include <sunmatrix/sunmatrix_dense.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <cstring>
#include <functional>
#include <limits>
#include <memory>
#include <optional>
#include <sstream>

#include "deltag/constants.hpp"
#include "deltag/speciation.hpp"
#include "deltag/water_properties.hpp"
#include "equilibrium/probe.hpp"
#include "equilibrium/system.hpp"

namespace deltag::equilibrium {

namespace {

using Eigen::Index;
using Eigen::MatrixXd;
using Eigen::VectorXd;
constexpr double ln10 = constants::ln10;

enum class Equation { mass, alkalinity, charge, ionic_strength, water, phase };

// A mineral or gas held at its target: one unknown (the amount moved into the water) and one
// equation (its SI, or log p, at the target).
struct PhaseUnknown {
    Eigen::RowVectorXd nu;   // dissolution coefficients over the system's columns
    double log_k = 0.0;      // of the dissolution in components, at the temperature
    double target = 0.0;     // SI or log10 p
    double alkalinity = 0.0; // equivalents one mole brings (PhaseEntry::alkalinity)
    int unknown = -1;
};

// A gas of a closed headspace: its moles follow from the water, n = (V/RT) 10^(log p).
struct ClosedGas {
    Eigen::RowVectorXd nu;
    double log_k = 0.0;
    double mol_per_atm = 0.0;  // V / (R T)
    double alkalinity = 0.0;   // equivalents one mole brings (PhaseEntry::alkalinity)
};

struct Problem {
    const ChemicalSystem* sys = nullptr;
    std::size_t n = 0;                     // unknowns
    std::vector<Equation> equation;        // per unknown
    std::vector<double> target;            // per unknown (totals, alkalinity, charge imbalance)
    std::vector<double> scale;             // per unknown, residual divisor
    std::vector<int> column_of_unknown;    // -1 for I, w and phases
    std::vector<int> phase_of_unknown;     // index into phases, or -1
    std::vector<int> species_of_column;    // index into sys->species of each column's own species (-1)
    // The species whose log10 molality is a component column's unknown: its own species, or
    // (switched basis) the species of the same element that dominates, e.g. NH4+ for nitrate
    // at a low pe. Only species made of that one component (once), H+, e-, H2O and the
    // element's own electrons qualify, so a switched column depends on unswitched ones only.
    std::vector<int> basis_of_column;
    std::vector<std::vector<int>> basis_candidates;  // per column: the species that qualify
    int i_unknown = -1, w_unknown = -1, h_unknown = -1;
    double log_a_h_fixed = 0.0, log_a_e_fixed = 0.0;
    MatrixXd weights;                      // species x unknowns, for mass/alkalinity/charge rows
    MatrixXd coupling;                     // unknowns x unknowns: d(balance residual)/d(phase amount)
    VectorXd z2;                           // charge squared per species
    std::vector<PhaseUnknown> phases;
    std::vector<ClosedGas> closed;
    MatrixXd closed_weight;                // unknowns x closed gases: d(residual)/d(gas moles)

    // Sparse structure, from compile_structure(): per species its columns with their
    // coefficients, its balance rows with their weights divided by the row's scale, and the
    // unknowns other than I its log10 molality depends on (through switched columns too).
    // Rows of species k: [start[k], start[k+1]) of the flat arrays; no allocation per solve.
    struct Entry {
        int index;
        double value;
    };
    std::vector<int> col_start, row_start, dep_start;
    std::vector<Entry> col_entries, row_entries;
    std::vector<int> dep_entries;
    std::vector<int> dla_pattern_start, dla_pattern;  // per column: unknowns its log a depends on

    // Work arrays, sized once by make_layout.
    mutable VectorXd log_m, m, lg, dlg, la, dla;
    mutable MatrixXd dla_du;               // d log10 a(column) / d u
    mutable std::vector<double> lg_buf, dlg_buf;
    mutable VectorXd lin, phase_part, gas_moles, g_row;

    // The last residual evaluation, reused when asked again at the same point with the same
    // equations (after KINSOL stops, the acceptance check, the carried state, the active set
    // and the result all look at the same point). `stamp` changes whenever the equations do.
    mutable std::vector<double> memo_u, memo_f;
    mutable const void* memo_model = nullptr;
    mutable std::uint64_t memo_stamp = 0;
    mutable bool memo_valid = false;
    std::uint64_t stamp = 1;
    // What compile_structure() last compiled: the balances' version and the basis.
    std::uint64_t weights_version = 1, compiled_weights = 0;
    std::vector<int> compiled_basis;
    void equations_changed() { ++stamp; }

    // The balances as make_layout built them; refer_electrons_to_basis() derives the ones in
    // use from these for the current basis.
    MatrixXd weights0, coupling0, closed_weight0;
    std::vector<double> target0, scale0;
    bool balances_referred = false;        // weights etc. differ from the *0 ones

    bool switched(std::size_t c) const { return basis_of_column[c] != species_of_column[c]; }
    void evaluate(const double* u, double* f, double* jac) const;
    void refer_electrons_to_basis();
    void compile_structure();
};

// An electron balance counts e- against the component species (NO3-, SO4^2-, Fe^2+). When
// an element lives as another redox state (NH4+ for nitrate at a low pe), nearly all of the
// electron total is that element's, and the balance becomes a small difference of large
// terms: Newton then has to find the pe from cancellation (iteration limits, 500+
// iterations seen). Subtracting the element's own balance, times the e- its basis species
// carries per atom, counts the electrons against the basis species instead (NH4+ carries
// none): the same equations, well conditioned, with the scale of what is left.
void Problem::refer_electrons_to_basis() {
    const ChemicalSystem& s = *sys;
    // Most waters have no electron balance, or no switched element in it: nothing to do, and
    // no copies (this runs before every Newton leg).
    // The column of an electron balance row, or -1.
    auto electron_column = [&](std::size_t e) {
        const int ce = column_of_unknown[e];
        if (ce < 0 || equation[e] != Equation::mass) return -1;
        const auto role = s.columns[static_cast<std::size_t>(ce)].role;
        return role == ComponentColumn::Role::electron_unknown || role == ComponentColumn::Role::split_electron ? ce : -1;
    };
    bool wanted = false;
    for (std::size_t e = 0; e < n && !wanted; ++e) {
        const int ce = electron_column(e);
        if (ce < 0) continue;
        for (std::size_t c = 0; c < s.columns.size() && !wanted; ++c)
            wanted = switched(c) && s.nu(basis_of_column[c], ce) != 0.0;
    }
    if (!wanted && !balances_referred) {
        compile_structure();
        return;
    }
    balances_referred = wanted;
    ++weights_version;
    weights = weights0;
    target = target0;
    scale = scale0;
    coupling = coupling0;
    closed_weight = closed_weight0;
    for (std::size_t e = 0; e < n; ++e) {
        const int ce = electron_column(e);
        if (ce < 0) continue;
        const Index r = static_cast<Index>(e);
        VectorXd w = weights0.col(r);
        double t = target0[e];
        Eigen::RowVectorXd cpl = coupling0.row(r) * scale0[e];
        // (An n x 0 matrix has no storage: Eigen's row() of it is undefined behaviour.)
        const bool closed_gases = closed_weight0.cols() > 0;
        Eigen::RowVectorXd cls = closed_gases ? Eigen::RowVectorXd(closed_weight0.row(r) * scale0[e]) : Eigen::RowVectorXd();
        bool changed = false;
        for (std::size_t c = 0; c < s.columns.size(); ++c) {
            if (!switched(c)) continue;
            const int k = basis_of_column[c];
            const int rc = s.columns[c].unknown;
            if (rc < 0 || equation[static_cast<std::size_t>(rc)] != Equation::mass) continue;
            const double factor = s.nu(k, ce) / s.nu(k, static_cast<Index>(c));
            if (factor == 0.0) continue;
            w -= factor * weights0.col(rc);
            t -= factor * target0[static_cast<std::size_t>(rc)];
            cpl -= factor * coupling0.row(rc) * scale0[static_cast<std::size_t>(rc)];
            if (closed_gases) cls -= factor * closed_weight0.row(rc) * scale0[static_cast<std::size_t>(rc)];
            changed = true;
        }
        if (!changed) continue;
        scale[e] = std::max({std::abs(t), 1e-6 * scale0[e], 1e-14});
        weights.col(r) = w;
        target[e] = t;
        coupling.row(r) = cpl / scale[e];
        if (closed_gases) closed_weight.row(r) = cls / scale[e];
    }
    compile_structure();
}

// The sparse lists evaluate() runs on, for the current basis and balances. Runs at the start
// of every Newton leg (after the basis is chosen); reuses its storage.
void Problem::compile_structure() {
    // Nothing to do when neither the basis nor the balances changed since the last time.
    if (compiled_weights == weights_version && compiled_basis == basis_of_column) return;
    const ChemicalSystem& s = *sys;
    const Index ns = static_cast<Index>(s.species.size());
    const Index nc = static_cast<Index>(s.columns.size());
    if (col_start.empty()) {  // the system's stoichiometry: fixed for the problem's life
        for (Index k = 0; k < ns; ++k) {
            col_start.push_back(static_cast<int>(col_entries.size()));
            for (Index c = 0; c < nc; ++c)
                if (s.nu(k, c) != 0.0) col_entries.push_back({static_cast<int>(c), s.nu(k, c)});
        }
        col_start.push_back(static_cast<int>(col_entries.size()));
    }
    if (compiled_weights != weights_version) {
        row_start.clear();
        row_entries.clear();
        for (Index k = 0; k < ns; ++k) {
            row_start.push_back(static_cast<int>(row_entries.size()));
            for (std::size_t e = 0; e < n; ++e) {
                const double w = weights(k, static_cast<Index>(e));
                if (w != 0.0) row_entries.push_back({static_cast<int>(e), w / scale[e]});
            }
        }
        row_start.push_back(static_cast<int>(row_entries.size()));
    }
    compiled_weights = weights_version;
    compiled_basis = basis_of_column;
    // Which unknowns each column's log activity moves with (I aside): its own unknown, the
    // water's, or for a switched column those of its basis species' other columns too.
    std::vector<std::vector<int>> pattern(static_cast<std::size_t>(nc));
    for (Index c = 0; c < nc; ++c) {
        const ComponentColumn& col = s.columns[c];
        auto& pc = pattern[static_cast<std::size_t>(c)];
        if (col.role == ComponentColumn::Role::water) pc.push_back(w_unknown);
        else if (col.unknown >= 0) pc.push_back(col.unknown);
    }
    for (Index c = 0; c < nc; ++c) {
        if (!switched(static_cast<std::size_t>(c))) continue;
        const int k = basis_of_column[static_cast<std::size_t>(c)];
        auto& pc = pattern[static_cast<std::size_t>(c)];
        for (Index c2 = 0; c2 < nc; ++c2)
            if (c2 != c && s.nu(k, c2) != 0.0)
                for (const int j : pattern[static_cast<std::size_t>(c2)]) pc.push_back(j);
    }
    dla_pattern_start.clear();
    dla_pattern.clear();
    for (auto& pc : pattern) {
        std::sort(pc.begin(), pc.end());
        pc.erase(std::unique(pc.begin(), pc.end()), pc.end());
        dla_pattern_start.push_back(static_cast<int>(dla_pattern.size()));
        dla_pattern.insert(dla_pattern.end(), pc.begin(), pc.end());
    }
    dla_pattern_start.push_back(static_cast<int>(dla_pattern.size()));
    dep_start.clear();
    dep_entries.clear();
    std::vector<int> dep;
    for (Index k = 0; k < ns; ++k) {
        dep_start.push_back(static_cast<int>(dep_entries.size()));
        dep.clear();
        for (int q = col_start[static_cast<std::size_t>(k)]; q < col_start[static_cast<std::size_t>(k) + 1]; ++q) {
            const int c = col_entries[static_cast<std::size_t>(q)].index;
            dep.insert(dep.end(), pattern[static_cast<std::size_t>(c)].begin(), pattern[static_cast<std::size_t>(c)].end());
        }
        std::sort(dep.begin(), dep.end());
        dep.erase(std::unique(dep.begin(), dep.end()), dep.end());
        dep_entries.insert(dep_entries.end(), dep.begin(), dep.end());
    }
    dep_start.push_back(static_cast<int>(dep_entries.size()));
    dla_du.setZero();  // rows of columns no longer switched keep no stale entries
    equations_changed();
}

void Problem::evaluate(const double* u, double* f, double* jac) const {
    if (!jac && memo_valid && memo_stamp == stamp && memo_model == sys->model.get() &&
        std::equal(u, u + n, memo_u.begin())) {
        std::copy(memo_f.begin(), memo_f.end(), f);
        return;
    }
    const ChemicalSystem& s = *sys;
    const Index ns = static_cast<Index>(s.species.size());
    const double log_i = u[i_unknown];
    const double ionic = std::exp(ln10 * std::clamp(log_i, -20.0, 2.0));
    s.model->log_gamma(ionic, s.params, lg_buf, dlg_buf);
    for (Index k = 0; k < ns; ++k) {
        lg(k) = lg_buf[static_cast<std::size_t>(k)];
        dlg(k) = dlg_buf[static_cast<std::size_t>(k)];
    }
    // Log activity of each column, its d/dI part and (for the Jacobian) its d/du. Unswitched
    // columns first; a switched column follows from its basis species and the others.
    const Index nc = static_cast<Index>(s.columns.size());
    for (Index c = 0; c < nc; ++c) {
        const ComponentColumn& col = s.columns[c];
        const int k = species_of_column[c];
        switch (col.role) {
            case ComponentColumn::Role::unknown:
            case ComponentColumn::Role::proton_unknown:
                if (switched(static_cast<std::size_t>(c))) continue;
                la(c) = u[col.unknown] + lg(k);
                dla(c) = dlg(k);
                if (jac) dla_du(c, col.unknown) = 1.0;
                break;
            case ComponentColumn::Role::electron_unknown:
            case ComponentColumn::Role::split_electron:
                la(c) = u[col.unknown];
                dla(c) = 0.0;
                if (jac) dla_du(c, col.unknown) = 1.0;
                break;
            case ComponentColumn::Role::proton_fixed:
                la(c) = log_a_h_fixed;
                dla(c) = 0.0;
                break;
            case ComponentColumn::Role::water:
                la(c) = u[w_unknown];
                dla(c) = 0.0;
                if (jac) dla_du(c, w_unknown) = 1.0;
                break;
            case ComponentColumn::Role::electron_fixed:
                la(c) = log_a_e_fixed;
                dla(c) = 0.0;
                break;
        }
    }
    for (Index c = 0; c < nc; ++c) {
        if (!switched(static_cast<std::size_t>(c))) continue;
        const int k = basis_of_column[static_cast<std::size_t>(c)];
        const double self = s.nu(k, c);
        double v = u[s.columns[c].unknown] + lg(k) - s.log_k(k), dv = dlg(k);
        if (jac) {
            for (int q = dla_pattern_start[c]; q < dla_pattern_start[c + 1]; ++q) dla_du(c, dla_pattern[q]) = 0.0;
            dla_du(c, s.columns[c].unknown) = 1.0;
        }
        for (int q = col_start[k]; q < col_start[k + 1]; ++q) {
            const auto [c2, w] = col_entries[static_cast<std::size_t>(q)];
            if (c2 == c) continue;
            v -= w * la(c2);
            dv -= w * dla(c2);
            if (jac)
                for (int r = dla_pattern_start[c2]; r < dla_pattern_start[c2 + 1]; ++r)
                    dla_du(c, dla_pattern[r]) -= w * dla_du(c2, dla_pattern[r]);
        }
        la(c) = v / self;
        dla(c) = dv / self;
        if (jac)
            for (int q = dla_pattern_start[c]; q < dla_pattern_start[c + 1]; ++q) dla_du(c, dla_pattern[q]) /= self;
    }
    // Molalities and the balances, over each species' own columns and rows.
    lin.setZero();
    double half_z2m = 0.0, sum_m = 0.0;
    for (Index k = 0; k < ns; ++k) {
        double v = s.log_k(k) - lg(k);
        for (int q = col_start[k]; q < col_start[k + 1]; ++q) v += col_entries[q].value * la(col_entries[q].index);
        log_m(k) = v;
        const double mk = std::exp(ln10 * std::clamp(v, -300.0, 50.0));
        m(k) = mk;
        for (int q = row_start[k]; q < row_start[k + 1]; ++q) lin(row_entries[q].index) += row_entries[q].value * mk;
        half_z2m += 0.5 * z2(k) * mk;
        sum_m += mk;
    }
    // Phase amounts move the balances (coupling is zero outside the phase columns).
    phase_part.setZero();
    for (const auto& ph : phases) phase_part += coupling.col(ph.unknown) * u[ph.unknown];
    for (std::size_t q = 0; q < closed.size(); ++q) {
        const double log_p = closed[q].nu.dot(la) - closed[q].log_k;
        gas_moles(static_cast<Index>(q)) = closed[q].mol_per_atm * std::exp(ln10 * std::clamp(log_p, -300.0, 30.0));
    }
    if (!closed.empty()) phase_part += closed_weight * gas_moles;
    for (std::size_t e = 0; e < n; ++e) {
        const Index r = static_cast<Index>(e);
        switch (equation[e]) {
            case Equation::mass:
            case Equation::alkalinity:
            case Equation::charge:
                f[e] = lin(r) - target[e] / scale[e] + phase_part(r);
                break;
            case Equation::ionic_strength:
                f[e] = half_z2m / ionic - 1.0;
                break;
            case Equation::water:
                f[e] = u[w_unknown] + constants::water_molar_mass_kg * sum_m / ln10;
                break;
            case Equation::phase: {
                const PhaseUnknown& ph = phases[static_cast<std::size_t>(phase_of_unknown[e])];
                f[e] = ph.nu.dot(la) - ph.log_k - ph.target;
                break;
            }
        }
    }
    if (!jac) {
        memo_u.assign(u, u + n);
        memo_f.assign(f, f + n);
        memo_stamp = stamp;
        memo_model = s.model.get();
        memo_valid = true;
        return;
    }
    memo_valid = false;  // the work arrays now hold this point; the memo may be elsewhere
    // J = d f / d u, species by species: d m_k / d u_j = m_k ln10 G(k, j), with G = d log m / d u
    // non-zero only on the species' dependencies and on I.
    Eigen::Map<MatrixXd> J(jac, static_cast<Index>(n), static_cast<Index>(n));
    J.setZero();
    const double di = ionic * ln10;  // d I / d log10 I
    const double water_per_m = constants::water_molar_mass_kg / ln10;
    for (Index k = 0; k < ns; ++k) {
        if (log_m(k) > 50.0 || log_m(k) < -300.0) continue;  // outside the clamp it does not move
        double g_i = -dlg(k);
        for (int q = col_start[k]; q < col_start[k + 1]; ++q) g_i += col_entries[q].value * dla(col_entries[q].index);
        g_i *= di;
        for (int q = dep_start[k]; q < dep_start[k + 1]; ++q) {
            const int j = dep_entries[q];
            double g = 0.0;
            for (int r = col_start[k]; r < col_start[k + 1]; ++r) g += col_entries[r].value * dla_du(col_entries[r].index, j);
            g_row(j) = g;
        }
        const double dm = m(k) * ln10;
        auto add_row = [&](Index e, double w) {
            const double a = w * dm;
            for (int q = dep_start[k]; q < dep_start[k + 1]; ++q) J(e, dep_entries[q]) += a * g_row(dep_entries[q]);
            J(e, i_unknown) += a * g_i;
        };
        for (int q = row_start[k]; q < row_start[k + 1]; ++q) add_row(row_entries[q].index, row_entries[q].value);
        add_row(i_unknown, 0.5 * z2(k) / ionic);
        add_row(w_unknown, water_per_m);
    }
    J(i_unknown, i_unknown) -= half_z2m / ionic * ln10;
    J(w_unknown, w_unknown) += 1.0;
    for (const auto& ph : phases) J.col(ph.unknown) += coupling.col(ph.unknown);
    for (std::size_t e = 0; e < n; ++e) {
        const Index r = static_cast<Index>(e);
        switch (equation[e]) {
            case Equation::mass:
            case Equation::alkalinity:
            case Equation::charge:
                for (std::size_t q = 0; q < closed.size(); ++q) {
                    const double w = closed_weight(r, static_cast<Index>(q));
                    if (w == 0.0) continue;
                    // d n/du = n ln10 d(log p)/du, with d(log p)/du as for a phase row.
                    const double k = w * gas_moles(static_cast<Index>(q)) * ln10;
                    J.row(r) += k * (closed[q].nu * dla_du);
                    J(r, i_unknown) += k * closed[q].nu.dot(dla) * di;
                }
                break;
            case Equation::phase: {
                const PhaseUnknown& ph = phases[static_cast<std::size_t>(phase_of_unknown[e])];
                J.row(r) = ph.nu * dla_du;
                J(r, i_unknown) += ph.nu.dot(dla) * di;
                break;
            }
            default: break;
        }
    }
}

// --- KINSOL glue -------------------------------------------------------------------------

struct KinsolUserData {
    const Problem* problem = nullptr;
    std::string last_message;
};

int kin_residual(N_Vector u, N_Vector f, void* user) {
    auto* d = static_cast<KinsolUserData*>(user);
    d->problem->evaluate(N_VGetArrayPointer(u), N_VGetArrayPointer(f), nullptr);
    const double* fv = N_VGetArrayPointer(f);
    for (std::size_t i = 0; i < d->problem->n; ++i)
        if (!std::isfinite(fv[i])) return 1;  // recoverable: the line search backs off
    return 0;
}

int kin_jacobian(N_Vector u, N_Vector /*fu*/, SUNMatrix J, void* user, N_Vector scratch, N_Vector) {
    auto* d = static_cast<KinsolUserData*>(user);
    const std::size_t n = d->problem->n;
    // A SUNDIALS dense matrix is column-major with leading dimension n, as Eigen's.
    double* jac = SUNDenseMatrix_Data(J);
    d->problem->evaluate(N_VGetArrayPointer(u), N_VGetArrayPointer(scratch), jac);
    for (std::size_t i = 0; i < n * n; ++i)
        if (!std::isfinite(jac[i])) return 1;
    return 0;
}

// The linear solver behind KINSOL's SUNLinearSolver interface: Eigen's LU with partial
// pivoting on storage sized once, so a Newton iteration allocates nothing.
struct EigenLu {
    explicit EigenLu(Index size) : lu(size), copy(size), n(size) {}
    Eigen::PartialPivLU<MatrixXd> lu;
    VectorXd copy;  // the right-hand side, when KINSOL solves in place
    Index n;
};

SUNLinearSolver_Type eigen_lu_type(SUNLinearSolver) { return SUNLINEARSOLVER_DIRECT; }
SUNLinearSolver_ID eigen_lu_id(SUNLinearSolver) { return SUNLINEARSOLVER_CUSTOM; }

int eigen_lu_setup(SUNLinearSolver S, SUNMatrix A) {
    auto* c = static_cast<EigenLu*>(S->content);
    c->lu.compute(Eigen::Map<const MatrixXd>(SUNDenseMatrix_Data(A), c->n, c->n));
    // A zero or non-finite pivot: singular, which KINSOL may recover from (a fresh Jacobian).
    const auto pivots = c->lu.matrixLU().diagonal();
    for (Index i = 0; i < c->n; ++i)
        if (!(std::abs(pivots(i)) > 0.0) || !std::isfinite(pivots(i))) return SUNLS_LUFACT_FAIL;
    return SUNLS_SUCCESS;
}

int eigen_lu_solve(SUNLinearSolver S, SUNMatrix, N_Vector x, N_Vector b, realtype) {
    auto* c = static_cast<EigenLu*>(S->content);
    Eigen::Map<VectorXd> xv(N_VGetArrayPointer(x), c->n);
    if (x == b) {
        c->copy = xv;
        xv = c->lu.solve(c->copy);
    } else {
        xv = c->lu.solve(Eigen::Map<const VectorXd>(N_VGetArrayPointer(b), c->n));
    }
    return SUNLS_SUCCESS;
}

int eigen_lu_free(SUNLinearSolver S) {
    if (!S) return 0;
    delete static_cast<EigenLu*>(S->content);
    S->content = nullptr;
    SUNLinSolFreeEmpty(S);
    return 0;
}

SUNLinearSolver make_eigen_lu(Index n, SUNContext ctx) {
    SUNLinearSolver S = SUNLinSolNewEmpty(ctx);
    if (!S) return nullptr;
    S->ops->gettype = eigen_lu_type;
    S->ops->getid = eigen_lu_id;
    S->ops->setup = eigen_lu_setup;
    S->ops->solve = eigen_lu_solve;
    S->ops->free = eigen_lu_free;
    S->content = new EigenLu(n);
    return S;
}

void kin_silent_errors(int /*code*/, const char* /*module*/, const char* /*function*/, char* msg, void* user) {
    // The library never prints: keep KINSOL's message for the summary.
    static_cast<KinsolUserData*>(user)->last_message = msg ? msg : "";
}

std::string kinsol_flag_text(int flag) {
    switch (flag) {
        case KIN_SUCCESS: return "residual below tolerance";
        case KIN_INITIAL_GUESS_OK: return "start already satisfied the equations";
        case KIN_STEP_LT_STPTOL: return "step smaller than the step tolerance";
        case KIN_LINESEARCH_NONCONV: return "line search could not reduce the residual";
        case KIN_MAXITER_REACHED: return "iteration limit reached";
        case KIN_MXNEWT_5X_EXCEEDED: return "five maximum-length Newton steps in a row";
        case KIN_LINESEARCH_BCFAIL: return "line search could not satisfy the beta condition";
        case KIN_LINSOLV_NO_RECOVERY: return "linear solver failed (singular Jacobian)";
        case KIN_LSETUP_FAIL: return "Jacobian factorisation failed";
        case KIN_SYSFUNC_FAIL: return "residual function failed";
        case KIN_REPTD_SYSFUNC_ERR: return "residual not finite, repeatedly";
        default: return "KINSOL flag " + std::to_string(flag);
    }
}

struct AttemptOutcome {
    bool converged = false;
    double residual = std::numeric_limits<double>::infinity();
    long iterations = 0, evaluations = 0;
    std::string reason;
    std::string message;  // KINSOL's own message, caught by kin_silent_errors; "" if it gave none
};

// The convergence measure: each balance relative to the size of its own terms (so a total
// that only a mineral brings in is judged against what dissolved, not against the fixed
// scale the Newton iteration uses), the other equations as they are.
double max_abs_residual(const Problem& p, const std::vector<double>& u) {
    std::vector<double> f(p.n);
    p.evaluate(u.data(), f.data(), nullptr);
    std::vector<double> size(p.n, 0.0);  // sum of |terms| of each balance
    for (Index k = 0; k < p.m.size(); ++k)
        for (int q = p.row_start[static_cast<std::size_t>(k)]; q < p.row_start[static_cast<std::size_t>(k) + 1]; ++q) {
            const auto& entry = p.row_entries[static_cast<std::size_t>(q)];
            size[static_cast<std::size_t>(entry.index)] += std::abs(entry.value) * p.m(k);
        }
    double r = 0.0;
    for (std::size_t e = 0; e < p.n; ++e) {
        double v = f[e];
        if (p.equation[e] == Equation::mass || p.equation[e] == Equation::alkalinity || p.equation[e] == Equation::charge) {
            const double denom = std::max({size[e] * p.scale[e], std::abs(p.target[e]), 1e-300});
            v = f[e] * p.scale[e] / denom;
        }
        r = std::max(r, std::isfinite(v) ? std::abs(v) : std::numeric_limits<double>::infinity());
    }
    return r;
}

// The acceptance on our own measure (max_abs_residual): accept_factor times the tolerance.
bool meets_tolerance(double residual, const SolverOptions& opt) {
    return std::isfinite(residual) && residual <= std::max(opt.tolerance, 1e-300) * opt.accept_factor;
}

// KINSOL's memory, vectors, matrix and linear solver for systems of one size, made once per
// thread and size and reused by every solve after it (making them anew cost about a tenth of
// a solve). Nothing here is shared between threads.
class NewtonWorkspace {
public:
    explicit NewtonWorkspace(std::size_t size) : n(size) {
        if (SUNContext_Create(nullptr, &ctx) != 0) return;
        const auto m = static_cast<sunindextype>(n);
        x = N_VNew_Serial(m, ctx);
        scale = N_VNew_Serial(m, ctx);
        J = SUNDenseMatrix(m, m, ctx);
        LS = make_eigen_lu(static_cast<Index>(n), ctx);
        mem = KINCreate(ctx);
        if (!x || !scale || !J || !LS || !mem) return;
        N_VConst(1.0, scale);
        ok = KINInit(mem, kin_residual, x) == KIN_SUCCESS && KINSetErrHandlerFn(mem, kin_silent_errors, &data) == KIN_SUCCESS &&
             KINSetUserData(mem, &data) == KIN_SUCCESS && KINSetLinearSolver(mem, LS, J) == KIN_SUCCESS &&
             KINSetJacFn(mem, kin_jacobian) == KIN_SUCCESS &&
             KINSetMaxSetupCalls(mem, 1) == KIN_SUCCESS &&  // exact Newton: a fresh Jacobian every iteration
             KINSetPrintLevel(mem, 0) == KIN_SUCCESS;
    }
    NewtonWorkspace(const NewtonWorkspace&) = delete;
    NewtonWorkspace& operator=(const NewtonWorkspace&) = delete;
    ~NewtonWorkspace() {
        if (mem) KINFree(&mem);
        if (LS) SUNLinSolFree(LS);
        if (J) SUNMatDestroy(J);
        if (scale) N_VDestroy(scale);
        if (x) N_VDestroy(x);
        if (ctx) SUNContext_Free(&ctx);
    }

    std::size_t n;
    bool ok = false;
    SUNContext ctx = nullptr;
    N_Vector x = nullptr, scale = nullptr;
    SUNMatrix J = nullptr;
    SUNLinearSolver LS = nullptr;
    void* mem = nullptr;
    KinsolUserData data;
};

NewtonWorkspace& workspace_for(std::size_t n) {
    thread_local std::vector<std::unique_ptr<NewtonWorkspace>> by_size;
    if (by_size.size() <= n) by_size.resize(n + 1);
    if (!by_size[n] || !by_size[n]->ok) by_size[n] = std::make_unique<NewtonWorkspace>(n);
    return *by_size[n];
}

// One KINSOL run from u (updated in place).
AttemptOutcome run_kinsol(const Problem& p, std::vector<double>& u, const SolverOptions& opt) {
    AttemptOutcome out;
    NewtonWorkspace& w = workspace_for(p.n);
    if (!w.ok) {
        out.reason = "could not set up KINSOL";
        return out;
    }
    void* mem = w.mem;
    w.data.problem = &p;
    w.data.last_message.clear();
    std::copy(u.begin(), u.end(), N_VGetArrayPointer(w.x));
    KINSetFuncNormTol(mem, opt.tolerance);
    KINSetScaledStepTol(mem, opt.step_tolerance);
    KINSetNumMaxIters(mem, opt.max_iterations);
    KINSetMaxNewtonStep(mem, opt.max_step_log10 * std::sqrt(static_cast<double>(p.n)));
    int flag = KINSol(mem, w.x, KIN_LINESEARCH, w.scale, w.scale);
    long iterations = 0, evaluations = 0;
    auto tally = [&] {
        long nni = 0, nfe = 0;
        KINGetNumNonlinSolvIters(mem, &nni);
        KINGetNumFuncEvals(mem, &nfe);
        iterations += nni;
        evaluations += nfe;
    };
    tally();
    const double* xv = N_VGetArrayPointer(w.x);
    std::vector<double> candidate(xv, xv + p.n);
    double r = max_abs_residual(p, candidate);
    // KINSOL's norm can meet its tolerance while a balance, judged against the size of its
    // own terms, does not yet: tighten and go on from there.
    for (int tighten = 0; tighten < 2 && (flag == KIN_SUCCESS || flag == KIN_INITIAL_GUESS_OK) && !meets_tolerance(r, opt);
         ++tighten) {
        KINSetFuncNormTol(mem, opt.tolerance * std::pow(1e-4, tighten + 1));
        flag = KINSol(mem, w.x, KIN_LINESEARCH, w.scale, w.scale);
        tally();
        candidate.assign(xv, xv + p.n);
        r = max_abs_residual(p, candidate);
    }
    out.iterations = iterations;
    out.evaluations = evaluations;
    out.residual = r;
    out.reason = kinsol_flag_text(flag);
    out.message = w.data.last_message;
    if ((flag == KIN_SUCCESS || flag == KIN_INITIAL_GUESS_OK) && !meets_tolerance(r, opt))
        out.reason = "the Newton residual met its tolerance but a balance, against the size of its own terms, did not";
    // Accept on our own measure: KINSOL may stop on a tiny step with the residual already met.
    out.converged = meets_tolerance(r, opt);
    if (out.converged || std::isfinite(r)) u = candidate;
    w.data.problem = nullptr;
    return out;
}

const std::string& component_name(const thermo::Database& db, std::size_t j) { return db.species()[j].name; }

}  // namespace

std::string_view verdict_text(Verdict v) {
    switch (v) {
        case Verdict::precipitation_favoured: return "precipitation favoured";
        case Verdict::dissolution_favoured: return "dissolution favoured";
        case Verdict::at_equilibrium: return "at equilibrium";
    }
    return "";
}

std::string SolveSummary::brief() const {
    std::ostringstream o;
    o << (converged ? "converged" : "not converged") << " in " << iterations << " iterations ("
      << attempts << (attempts == 1 ? " attempt" : " attempts") << "), max scaled residual "
      << residual_norm << ", " << stop_reason;
    return o.str();
}

std::string SolveSummary::full() const {
    std::ostringstream o;
    o << "method: " << method << "\n"
      << "converged: " << (converged ? "yes" : "no") << "\n"
      << "attempts: " << attempts << "\n"
      << "Newton iterations: " << iterations << "\n"
      << "residual evaluations: " << residual_evaluations << "\n"
      << "max scaled residual: " << residual_norm << "\n"
      << "stopped because: " << stop_reason << "\n";
    if (!kinsol_message.empty()) o << "KINSOL's last message: " << kinsol_message << "\n";
    o << "time: " << seconds * 1e6 << " us\n";
    return o.str();
}

const SpeciesResult* SpeciationResult::find(std::string_view name) const {
    for (const auto& s : species)
        if (s.name == name) return &s;
    return nullptr;
}

namespace {

void validate_input(const thermo::Database& db, const SpeciationInput& in) {
    const SourceLocation here{in.label.empty() ? std::string("speciation input") : in.label, 0, 0};
    if (const std::string p = thermo::temperature_problem(in.temperature_c); !p.empty())
        throw InputError(here, "temperature_c", p);
    if (in.ph && (!std::isfinite(*in.ph) || *in.ph < 0.0 || *in.ph > 14.0))
        throw InputError(here, "pH", "expected a pH within 0-14");
    if (in.pe && !std::isfinite(*in.pe)) throw InputError(here, "pe", "expected a finite pe");
    if (in.pe && !db.electron()) throw InputError(here, "pe", "the database has no electron component \"e-\"");
    if (in.electron_total && (in.pe || !db.electron() || !std::isfinite(*in.electron_total)))
        throw InputError(here, "electron_total",
                         "a conserved electron total needs the database's e- and no fixed pe, and must be finite");
    std::vector<bool> seen(db.component_count(), false);
    for (const auto& c : in.components) {
        if (c.component >= db.component_count())
            throw InputError(here, "components", "component index out of range");
        const auto& s = db.species()[c.component];
        if (s.role != thermo::ComponentRole::ordinary)
            throw InputError(here, s.name, "'" + s.name + "' is set by pH, pe or the water itself, not by a total");
        if (seen[c.component]) throw InputError(here, s.name, "component given twice");
        seen[c.component] = true;
        if (!std::isfinite(c.value)) throw InputError(here, s.name, "expected a finite amount");
        if (c.kind == ComponentInput::Kind::total && c.value <= 0.0 &&
            !(in.charge_balance_component && *in.charge_balance_component == c.component))
            throw InputError(here, s.name, "expected a positive total (leave a component out when it is absent)");
    }
    if (!in.ph)
        for (const auto& c : in.components)
            if (c.kind == ComponentInput::Kind::alkalinity)
                throw InputError(here, "pH",
                                 "the pH cannot come from the charge balance when the alkalinity is given "
                                 "(the alkalinity already fixes the charge balance): give a pH or a carbonate total");
    if (!std::isfinite(in.charge_imbalance_eq))
        throw InputError(here, "charge_imbalance_eq", "expected a finite charge imbalance");
    for (std::size_t a = 0; a < in.minerals.size(); ++a) {
        const auto& m = in.minerals[a];
        if (m.mineral >= db.minerals().size()) throw InputError(here, "minerals", "mineral index out of range");
        const std::string& name = db.minerals()[m.mineral].name;
        if (!std::isfinite(m.target_si)) throw InputError(here, name, "expected a finite target saturation index");
        if (m.on_hand_mol_per_kgw && !(std::isfinite(*m.on_hand_mol_per_kgw) && *m.on_hand_mol_per_kgw >= 0.0))
            throw InputError(here, name, "expected an amount of solid on hand >= 0 mol/kgw");
        if (!m.may_form && !m.may_dissolve)
            throw InputError(here, name, "a solid that may neither form nor dissolve takes no part; set may_form or may_dissolve");
        for (std::size_t b = 0; b < a; ++b)
            if (in.minerals[b].mineral == m.mineral) throw InputError(here, name, "mineral listed twice");
    }
    for (std::size_t a = 0; a < in.gases.size(); ++a) {
        const auto& g = in.gases[a];
        if (g.gas >= db.gases().size()) throw InputError(here, "gases", "gas index out of range");
        const std::string& name = db.gases()[g.gas].name;
        if (!std::isfinite(g.log_partial_pressure_atm)) throw InputError(here, name, "expected a finite log10 partial pressure");
        for (std::size_t b = 0; b < a; ++b)
            if (in.gases[b].gas == g.gas) throw InputError(here, name, "gas listed twice");
    }
    for (const auto& sp : in.redox_splits) {
        if (!db.electron()) throw InputError(here, "redox state", "the database has no e- for redox states given apart");
        if (sp.component >= db.component_count() || db.species()[sp.component].role != thermo::ComponentRole::ordinary)
            throw InputError(here, "redox state", "redox states apart need an ordinary component");
        if (!std::isfinite(sp.electron_total)) throw InputError(here, "redox state", "expected a finite electron total");
        bool present = false;
        for (const auto& c : in.components) present = present || c.component == sp.component;
        if (!present)
            throw InputError(here, db.species()[sp.component].name, "redox states given apart for an element with no total");
    }
    if (in.headspace) {
        const Headspace& h = *in.headspace;
        if (!(std::isfinite(h.volume_l_per_kgw) && h.volume_l_per_kgw > 0))
            throw InputError(here, "headspace", "expected a headspace volume > 0 L per kg of water");
        if (h.temperature_c && !thermo::accepted_temperature_c.contains(*h.temperature_c))
            throw InputError(here, "headspace", "headspace temperature: " + thermo::temperature_problem(*h.temperature_c));
        if (h.gases.empty()) throw InputError(here, "headspace", "a headspace needs at least one gas with its starting partial pressure");
        for (std::size_t a = 0; a < h.gases.size(); ++a) {
            const auto& g = h.gases[a];
            if (g.gas >= db.gases().size()) throw InputError(here, "headspace", "gas index out of range");
            const std::string& name = db.gases()[g.gas].name;
            if (!std::isfinite(g.log_partial_pressure_atm))
                throw InputError(here, name, "expected a finite log10 partial pressure");
            for (std::size_t b = 0; b < a; ++b)
                if (h.gases[b].gas == g.gas) throw InputError(here, name, "gas listed twice in the headspace");
            for (const auto& fixed : in.gases)
                if (fixed.gas == g.gas)
                    throw InputError(here, name, "'" + name + "' is both held at a fixed pressure and part of the closed headspace");
        }
    }
    if (in.charge_balance_component) {
        if (!in.ph)
            throw InputError(here, "charge_balance",
                             "a charge balance on '" + component_name(db, *in.charge_balance_component) +
                                 "' needs a measured pH");
        if (*in.charge_balance_component >= db.component_count() ||
            db.species()[*in.charge_balance_component].role != thermo::ComponentRole::ordinary ||
            db.species()[*in.charge_balance_component].formula.charge == 0)
            throw InputError(here, "charge_balance", "the charge balance must be closed on a charged component");
        for (const auto& c : in.components)
            if (c.component == *in.charge_balance_component && c.kind != ComponentInput::Kind::total)
                throw InputError(here, "charge_balance", "the charge balance cannot adjust an alkalinity");
    }
}

}  // namespace

namespace {

// Where each requested mineral stands in the active-set iteration.
struct MineralState {
    MineralTarget spec;
    enum class Status { at_target, exhausted, blocked } status = Status::at_target;
    double xi = 0.0;  // mol/kgw moved into the water
};

struct Layout {
    Problem p;
    std::vector<int> mineral_unknown;  // per MineralState: unknown index, or -1 when fixed
    std::vector<int> gas_unknown;
};

// Builds the unknowns, equations and weights for the current active set.
Layout make_layout(const thermo::Database& db, ChemicalSystem& sys, const SpeciationInput& input,
                   const std::vector<MineralState>& minerals) {
    Layout L;
    Problem& p = L.p;
    p.sys = &sys;
    const std::size_t ncol = sys.columns.size();
    p.species_of_column.assign(ncol, -1);
    for (std::size_t c = 0; c < ncol; ++c) {
        sys.columns[c].unknown = -1;
        for (std::size_t k = 0; k < sys.species.size(); ++k)
            if (sys.species[k] == sys.columns[c].component) p.species_of_column[c] = static_cast<int>(k);
    }
    auto phase_row = [&](const thermo::PhaseEntry& ph) {
        Eigen::RowVectorXd nu = Eigen::RowVectorXd::Zero(static_cast<Index>(ncol));
        for (const auto& [j, v] : ph.dissolution) nu(sys.column_for(j, ph.dissolution)) = v;
        return nu;
    };
    // Fixed phase amounts (exhausted or blocked minerals) add to the totals.
    std::vector<double> extra(db.component_count(), 0.0);
    double extra_alk = 0.0;
    for (const auto& ms : minerals) {
        if (ms.status == MineralState::Status::at_target || ms.xi == 0.0) continue;
        for (const auto& [j, v] : db.minerals()[ms.spec.mineral].dissolution) extra[j] += v * ms.xi;
        // The phase's own count (a redox phase brings other than its components' sum:
        // ferrihydrite +1, not the +3 of Fe^2+ + e- - 3 H+ ...).
        extra_alk += ms.xi * db.minerals()[ms.spec.mineral].alkalinity;
    }
    // The gas a closed headspace holds at the start belongs to the totals.
    if (input.headspace) {
        const double t_k = input.headspace->temperature_c.value_or(input.temperature_c) + constants::zero_celsius_k;
        const double mol_per_atm = input.headspace->volume_l_per_kgw / (constants::gas_constant / 101325.0 * 1000.0 * t_k);
        for (const auto& g : input.headspace->gases) {
            const double n0 = mol_per_atm * std::pow(10.0, g.log_partial_pressure_atm);
            for (const auto& [j, v] : db.gases()[g.gas].dissolution) extra[j] += v * n0;
            extra_alk += n0 * db.gases()[g.gas].alkalinity;
        }
    }

    double charge_scale = 1e-7;
    for (const auto& c : input.components)
        charge_scale += std::abs(c.value) * std::max(1, std::abs(db.species()[c.component].formula.charge));
    if (input.ph) charge_scale += std::pow(10.0, -*input.ph) + std::pow(10.0, *input.ph - 14.0);
    charge_scale += std::abs(input.charge_imbalance_eq);

    for (std::size_t c = 0; c < ncol; ++c) {
        ComponentColumn& col = sys.columns[c];
        if (!col.free()) continue;
        col.unknown = static_cast<int>(p.n++);
        p.column_of_unknown.push_back(static_cast<int>(c));
        p.phase_of_unknown.push_back(-1);
        const bool charge_row = col.role == ComponentColumn::Role::proton_unknown ||
                                (input.charge_balance_component && *input.charge_balance_component == col.component);
        if (col.role == ComponentColumn::Role::proton_unknown) p.h_unknown = col.unknown;
        if (charge_row) {
            p.equation.push_back(Equation::charge);
            p.target.push_back(input.charge_imbalance_eq);
            p.scale.push_back(charge_scale);
            continue;
        }
        if (col.role == ComponentColumn::Role::split_electron) {
            double t = 0.0;
            for (const auto& sp : input.redox_splits)
                if (sp.component == col.split_of) t = sp.electron_total;
            p.equation.push_back(Equation::mass);
            p.target.push_back(t);
            p.scale.push_back(std::max(std::abs(t), 1e-12));
            continue;
        }
        if (col.role == ComponentColumn::Role::electron_unknown) {
            // Electrons conserved: sum(nu_e m) = the electron total (negative for an oxidised water).
            const double t = *input.electron_total + extra[col.component];
            p.equation.push_back(Equation::mass);
            p.target.push_back(t);
            p.scale.push_back(std::max(std::abs(t), 1e-10));
            continue;
        }
        const ComponentInput* ci = nullptr;
        for (const auto& x : input.components)
            if (x.component == col.component) ci = &x;
        if (ci && ci->kind == ComponentInput::Kind::alkalinity) {
            p.equation.push_back(Equation::alkalinity);
            p.target.push_back(ci->value + extra_alk);
            p.scale.push_back(std::max(std::abs(ci->value), 1e-9));
        } else {
            // A component that only a phase brings in has a zero total of its own.
            const double t = (ci ? ci->value : 0.0) + extra[col.component];
            p.equation.push_back(Equation::mass);
            p.target.push_back(t);
            p.scale.push_back(t > 0 ? t : 1e-6);
        }
    }
    auto add_special = [&](Equation eq) {
        p.equation.push_back(eq);
        p.target.push_back(0.0);
        p.scale.push_back(1.0);
        p.column_of_unknown.push_back(-1);
        p.phase_of_unknown.push_back(-1);
        return static_cast<int>(p.n++);
    };
    p.i_unknown = add_special(Equation::ionic_strength);
    p.w_unknown = add_special(Equation::water);
    auto add_phase = [&](const thermo::PhaseEntry& ph, double target) {
        PhaseUnknown pu;
        pu.nu = phase_row(ph);
        pu.log_k = ph.log_k(input.temperature_c);
        pu.target = target;
        pu.alkalinity = ph.alkalinity;
        pu.unknown = add_special(Equation::phase);
        p.phase_of_unknown.back() = static_cast<int>(p.phases.size());
        p.phases.push_back(pu);
        return pu.unknown;
    };
    L.mineral_unknown.assign(minerals.size(), -1);
    for (std::size_t a = 0; a < minerals.size(); ++a)
        if (minerals[a].status == MineralState::Status::at_target)
            L.mineral_unknown[a] = add_phase(db.minerals()[minerals[a].spec.mineral], minerals[a].spec.target_si);
    for (const auto& g : input.gases) L.gas_unknown.push_back(add_phase(db.gases()[g.gas], g.log_partial_pressure_atm));
    if (input.headspace) {
        const double t_k = input.headspace->temperature_c.value_or(input.temperature_c) + constants::zero_celsius_k;
        const double r_l_atm = constants::gas_constant / 101325.0 * 1000.0;  // L atm / (mol K)
        for (const auto& g : input.headspace->gases) {
            ClosedGas cg;
            cg.nu = phase_row(db.gases()[g.gas]);
            cg.log_k = db.gases()[g.gas].log_k(input.temperature_c);
            cg.mol_per_atm = input.headspace->volume_l_per_kgw / (r_l_atm * t_k);
            cg.alkalinity = db.gases()[g.gas].alkalinity;
            p.closed.push_back(cg);
        }
    }
    if (input.ph) p.log_a_h_fixed = -*input.ph;
    if (input.pe) p.log_a_e_fixed = -*input.pe;

    const Index ns = static_cast<Index>(sys.species.size());
    const Index nu = static_cast<Index>(p.n);
    p.weights = MatrixXd::Zero(ns, nu);
    p.coupling = MatrixXd::Zero(nu, nu);
    p.z2 = sys.charge.array().square();
    for (std::size_t e = 0; e < p.n; ++e) {
        const Index col = static_cast<Index>(e);
        switch (p.equation[e]) {
            case Equation::mass: p.weights.col(col) = sys.nu.col(p.column_of_unknown[e]); break;
            case Equation::alkalinity: p.weights.col(col) = sys.alkalinity; break;
            case Equation::charge: p.weights.col(col) = sys.charge; break;
            default: break;
        }
    }
    // Gas moles in a closed headspace count with the water: residual (sum + nu n - T)/scale.
    p.closed_weight = MatrixXd::Zero(nu, static_cast<Index>(p.closed.size()));
    for (std::size_t q = 0; q < p.closed.size(); ++q)
        for (std::size_t e = 0; e < p.n; ++e) {
            const Index r = static_cast<Index>(e);
            if (p.equation[e] == Equation::mass)
                p.closed_weight(r, static_cast<Index>(q)) = p.closed[q].nu(p.column_of_unknown[e]) / p.scale[e];
            else if (p.equation[e] == Equation::alkalinity)
                p.closed_weight(r, static_cast<Index>(q)) = p.closed[q].alkalinity / p.scale[e];
        }
    // A phase amount xi adds nu * xi to the totals: residual (sum - T - nu xi)/scale.
    for (const auto& ph : p.phases) {
        for (std::size_t e = 0; e < p.n; ++e) {
            const Index r = static_cast<Index>(e);
            if (p.equation[e] == Equation::mass)
                p.coupling(r, ph.unknown) = -ph.nu(p.column_of_unknown[e]) / p.scale[e];
            else if (p.equation[e] == Equation::alkalinity)
                p.coupling(r, ph.unknown) = -ph.alkalinity / p.scale[e];
        }
    }
    p.log_m.resize(ns);
    p.m.resize(ns);
    p.lg.resize(ns);
    p.dlg.resize(ns);
    p.la.resize(static_cast<Index>(ncol));
    p.dla.resize(static_cast<Index>(ncol));
    p.dla_du.resize(static_cast<Index>(ncol), nu);
    p.lin.resize(nu);
    p.phase_part.resize(nu);
    p.g_row.setZero(nu);
    p.gas_moles.resize(static_cast<Index>(p.closed.size()));
    p.basis_of_column = p.species_of_column;
    p.basis_candidates.assign(ncol, {});
    for (std::size_t c = 0; c < ncol; ++c) {
        if (sys.columns[c].role != ComponentColumn::Role::unknown || p.species_of_column[c] < 0) continue;
        for (Index k = 0; k < ns; ++k) {
            if (sys.nu(k, static_cast<Index>(c)) != 1.0 || k == p.species_of_column[c]) continue;
            bool only_this_element = true;
            for (std::size_t c2 = 0; c2 < ncol; ++c2)
                if (c2 != c && sys.nu(k, static_cast<Index>(c2)) != 0.0 && sys.columns[c2].role == ComponentColumn::Role::unknown)
                    only_this_element = false;
            if (only_this_element) p.basis_candidates[c].push_back(static_cast<int>(k));
        }
    }
    p.lg_buf.resize(static_cast<std::size_t>(ns));
    p.dlg_buf.resize(static_cast<std::size_t>(ns));
    p.weights0 = p.weights;
    p.coupling0 = p.coupling;
    p.closed_weight0 = p.closed_weight;
    p.target0 = p.target;
    p.scale0 = p.scale;
    p.compile_structure();
    return L;
}

// The phase rule: the phases held at a target must fix independent combinations of the
// activities that are free to move. Throws InputError naming the conflict.
void check_phase_rule(const thermo::Database& db, const ChemicalSystem& sys, const SpeciationInput& input,
                      const Layout& L) {
    const Problem& p = L.p;
    std::vector<int> free_cols;
    for (std::size_t c = 0; c < sys.columns.size(); ++c)
        if (sys.columns[c].unknown >= 0) free_cols.push_back(static_cast<int>(c));
    std::vector<std::string> names;
    std::vector<Eigen::VectorXd> rows;
    auto add = [&](const std::string& name, const PhaseUnknown& ph) {
        Eigen::VectorXd r(static_cast<Index>(free_cols.size()));
        for (std::size_t k = 0; k < free_cols.size(); ++k) r(static_cast<Index>(k)) = ph.nu(free_cols[k]);
        // Is r a combination of the rows before it?
        if (!rows.empty()) {
            MatrixXd A(r.size(), static_cast<Index>(rows.size()));
            for (std::size_t k = 0; k < rows.size(); ++k) A.col(static_cast<Index>(k)) = rows[k];
            const Eigen::VectorXd coef = A.colPivHouseholderQr().solve(r);
            if ((A * coef - r).norm() <= 1e-9 * std::max(1.0, r.norm())) {
                std::string with;
                for (std::size_t k = 0; k < rows.size(); ++k)
                    if (std::abs(coef(static_cast<Index>(k))) > 1e-9) with += (with.empty() ? "" : ", ") + names[k];
                const SourceLocation here{input.label.empty() ? std::string("equilibrium input") : input.label, 0, 0};
                throw InputError(here, name,
                                 "over-constrained: '" + name + "' cannot be held at its target together with " +
                                     (with.empty() ? std::string("the fixed pH") : with) +
                                     " (they fix the same combination of activities; the phase rule allows at most " +
                                     std::to_string(free_cols.size()) + " fixed phases here): hold fewer phases");
            }
        }
        rows.push_back(r);
        names.push_back(name);
    };
    for (std::size_t a = 0; a < L.mineral_unknown.size(); ++a)
        if (L.mineral_unknown[a] >= 0)
            add(db.minerals()[input.minerals[a].mineral].name,
                p.phases[static_cast<std::size_t>(p.phase_of_unknown[static_cast<std::size_t>(L.mineral_unknown[a])])]);
    for (std::size_t a = 0; a < L.gas_unknown.size(); ++a)
        add(db.gases()[input.gases[a].gas].name,
            p.phases[static_cast<std::size_t>(p.phase_of_unknown[static_cast<std::size_t>(L.gas_unknown[a])])]);
}

// What the solver knows between attempts and layouts, independent of the basis: per column
// the log10 molality of the component's own species (log10 a(e-) for electron columns),
// log10 I and log10 a_w. NaN where nothing is known yet.
struct CarriedState {
    std::vector<double> column;
    double log_i = std::numeric_limits<double>::quiet_NaN();
    double log_w = std::numeric_limits<double>::quiet_NaN();
    std::vector<double> phase;  // per unknown: the amount of a phase unknown (NaN elsewhere or unknown)
};

bool is_component_column(const ComponentColumn& col) {
    return col.role == ComponentColumn::Role::unknown || col.role == ComponentColumn::Role::proton_unknown;
}

// Log activities of the columns that are not components (H+, e-, water, an element's own
// electrons): from the state where known, else from the guesses. Component columns: NaN.
VectorXd guessed_log_activities(const Problem& p, const CarriedState& st, double ph_guess, double pe_guess) {
    const ChemicalSystem& s = *p.sys;
    const Index nc = static_cast<Index>(s.columns.size());
    VectorXd la = VectorXd::Constant(nc, std::numeric_limits<double>::quiet_NaN());
    for (Index c = 0; c < nc; ++c) {
        const double known = st.column[static_cast<std::size_t>(c)];
        switch (s.columns[c].role) {
            case ComponentColumn::Role::proton_fixed: la(c) = p.log_a_h_fixed; break;
            case ComponentColumn::Role::electron_fixed: la(c) = p.log_a_e_fixed; break;
            case ComponentColumn::Role::water: la(c) = std::isfinite(st.log_w) ? st.log_w : 0.0; break;
            case ComponentColumn::Role::proton_unknown: la(c) = std::isfinite(known) ? known : -ph_guess; break;
            case ComponentColumn::Role::electron_unknown: la(c) = std::isfinite(known) ? known : -pe_guess; break;
            // pe 8: between the Fe(II)- and Fe(III)-dominated ranges of natural waters.
            case ComponentColumn::Role::split_electron: la(c) = std::isfinite(known) ? known : -8.0; break;
            case ComponentColumn::Role::unknown: break;
        }
    }
    return la;
}

// Basis choice: for each component column, the species that holds most of the element at the
// given activities of H+, e- and water (its own species unless another is ahead by more
// than a decade, so the basis does not flip back and forth near a boundary).
void choose_basis(Problem& p, const VectorXd& la) {
    const ChemicalSystem& s = *p.sys;
    const Index nc = static_cast<Index>(s.columns.size());
    for (Index c = 0; c < nc; ++c) {
        const auto cu = static_cast<std::size_t>(c);
        if (s.columns[c].role != ComponentColumn::Role::unknown || p.species_of_column[cu] < 0) continue;
        auto score = [&](int k) {
            double v = s.log_k(k);
            for (Index c2 = 0; c2 < nc; ++c2)
                if (c2 != c && s.nu(k, c2) != 0.0) v += s.nu(k, c2) * la(c2);
            return v;
        };
        int best = p.basis_of_column[cu];
        const double current = score(best);
        double best_score = current;
        for (const int k : p.basis_candidates[cu]) {
            const double v = score(k);
            if (v > best_score) {
                best_score = v;
                best = k;
            }
        }
        if (best_score > current + 1.0) p.basis_of_column[cu] = best;
    }
}

// The unknowns for the current basis from a carried state; where the state knows nothing,
// the basis species of a component holds its whole total. Phase amounts are left at 0.
std::vector<double> to_unknowns(const Problem& p, const SpeciationInput& input, const CarriedState& st,
                                double ph_guess, double pe_guess) {
    const ChemicalSystem& s = *p.sys;
    const thermo::Database& db = *s.db;
    std::vector<double> u(p.n, 0.0);
    const VectorXd la_fixed = guessed_log_activities(p, st, ph_guess, pe_guess);
    // Ionic strength and water activity: known, or estimated from the totals.
    double i_est = 0.0, sum = 0.0;
    std::vector<double> own_guess(s.columns.size(), std::numeric_limits<double>::quiet_NaN());
    for (std::size_t e = 0; e < p.n; ++e) {
        const int c = p.column_of_unknown[e];
        if (c < 0 || !is_component_column(s.columns[static_cast<std::size_t>(c)])) continue;
        const std::size_t comp = s.columns[static_cast<std::size_t>(c)].component;
        double guess = 1e-7;
        if (static_cast<int>(e) == p.h_unknown) guess = std::pow(10.0, -ph_guess);
        else if (p.equation[e] == Equation::mass) guess = p.target[e] > 0 ? p.target[e] : 1e-5;  // 1e-5: brought in by a phase
        else if (p.equation[e] == Equation::alkalinity) guess = std::max(std::abs(p.target[e]), 1e-6);
        else {
            for (const auto& x : input.components)
                if (x.component == comp && x.value > 0) guess = x.value;
            if (guess <= 1e-7) guess = 1e-4;
        }
        own_guess[static_cast<std::size_t>(c)] = std::log10(guess);
        const int z = db.species()[comp].formula.charge;
        i_est += 0.5 * z * z * guess;
        sum += guess;
    }
    const double log_i = std::isfinite(st.log_i) ? st.log_i : std::log10(std::max(i_est, 1e-7));
    u[static_cast<std::size_t>(p.i_unknown)] = log_i;
    u[static_cast<std::size_t>(p.w_unknown)] =
        std::isfinite(st.log_w) ? st.log_w : -constants::water_molar_mass_kg * sum / ln10;
    // Activity coefficients at that ionic strength convert between own and basis species.
    s.model->log_gamma(std::exp(ln10 * std::clamp(log_i, -20.0, 2.0)), s.params, p.lg_buf, p.dlg_buf);
    const auto lg = [&](int k) { return p.lg_buf[static_cast<std::size_t>(k)]; };
    for (std::size_t e = 0; e < p.n; ++e) {
        const int ci = p.column_of_unknown[e];
        if (ci < 0) continue;
        const auto c = static_cast<std::size_t>(ci);
        const ComponentColumn& col = s.columns[c];
        if (!is_component_column(col)) {
            u[e] = la_fixed(ci);
            continue;
        }
        const double known = st.column[c];
        if (!p.switched(c)) {
            u[e] = std::isfinite(known) ? known : own_guess[c];
            continue;
        }
        const int k = p.basis_of_column[c];
        if (!std::isfinite(known)) {
            u[e] = own_guess[c];  // the basis species holds the total
            continue;
        }
        // log m(basis) = log K + nu_c la(c) + sum nu la(others) - lg(basis).
        double v = s.log_k(k) + s.nu(k, ci) * (known + lg(p.species_of_column[c])) - lg(k);
        for (Index c2 = 0; c2 < static_cast<Index>(s.columns.size()); ++c2)
            if (c2 != ci && s.nu(k, c2) != 0.0) v += s.nu(k, c2) * la_fixed(c2);
        u[e] = v;
    }
    return u;
}

// The carried state at the unknowns u of the current basis.
CarriedState from_unknowns(const Problem& p, const std::vector<double>& u) {
    const ChemicalSystem& s = *p.sys;
    std::vector<double> f(p.n);
    p.evaluate(u.data(), f.data(), nullptr);
    CarriedState st;
    st.column.assign(s.columns.size(), std::numeric_limits<double>::quiet_NaN());
    for (std::size_t c = 0; c < s.columns.size(); ++c) {
        const ComponentColumn& col = s.columns[c];
        const Index ci = static_cast<Index>(c);
        if (is_component_column(col)) st.column[c] = p.la(ci) - p.lg(p.species_of_column[c]);
        else if (col.role == ComponentColumn::Role::electron_unknown || col.role == ComponentColumn::Role::split_electron)
            st.column[c] = p.la(ci);
    }
    st.log_i = u[static_cast<std::size_t>(p.i_unknown)];
    st.log_w = u[static_cast<std::size_t>(p.w_unknown)];
    st.phase.assign(p.n, std::numeric_limits<double>::quiet_NaN());
    for (std::size_t e = 0; e < p.n; ++e)
        if (p.phase_of_unknown[e] >= 0) st.phase[e] = u[e];
    return st;
}

void count(SolveSummary& summary, const AttemptOutcome& o) {
    summary.attempts += 1;
    summary.iterations += static_cast<int>(o.iterations);
    summary.residual_evaluations += static_cast<int>(o.evaluations);
    if (!o.message.empty()) summary.kinsol_message = o.message;
}

// A first pe for a water whose electrons are conserved (the pe is an unknown):
// - a gas held at its pressure that fixes the electron activity (O2(g), H2(g)) gives it
//   directly at the pH guess, whatever an earlier solve said;
// - otherwise, with no earlier pe, the pe at which the electrons add up to their total when
//   each element is shared among its own species as their log K, the pH guess and the pe say
//   (unit activity coefficients; O2(aq) and H2(aq) from water). The electrons fall as the pe
//   rises, so a bisection finds it. A start 10 pe units off the answer costs Newton hundreds
//   of iterations on a poised water (nitrogen all ammonium, sulfur all sulfate).
std::optional<double> first_pe(const Problem& p, const SpeciationInput& input, const CarriedState& st) {
    const ChemicalSystem& s = *p.sys;
    const Index nc = static_cast<Index>(s.columns.size());
    Index ce = -1, ch = -1, cw = -1;
    for (Index c = 0; c < nc; ++c) {
        const auto role = s.columns[c].role;
        if (role == ComponentColumn::Role::electron_unknown) ce = c;
        if (role == ComponentColumn::Role::proton_fixed || role == ComponentColumn::Role::proton_unknown) ch = c;
        if (role == ComponentColumn::Role::water) cw = c;
    }
    if (ce < 0 || ch < 0) return std::nullopt;
    double ph = input.ph.value_or(7.0);
    if (!input.ph && std::isfinite(st.column[static_cast<std::size_t>(ch)])) ph = -st.column[static_cast<std::size_t>(ch)];
    auto only_water_columns = [&](const Eigen::RowVectorXd& nu) {
        for (Index c = 0; c < nc; ++c)
            if (nu(c) != 0.0 && c != ce && c != ch && c != cw) return false;
        return nu(ce) != 0.0;
    };
    for (const auto& ph_unknown : p.phases) {
        if (!only_water_columns(ph_unknown.nu)) continue;
        // target = nu . la - log K, with la(H+) = -pH and la(H2O) = 0.
        const double la_e = (ph_unknown.target + ph_unknown.log_k + ph_unknown.nu(ch) * ph) / ph_unknown.nu(ce);
        if (std::isfinite(la_e)) return -la_e;
    }
    if (std::isfinite(st.column[static_cast<std::size_t>(ce)])) return std::nullopt;
    std::size_t row = p.n;
    for (std::size_t e = 0; e < p.n; ++e)
        if (p.column_of_unknown[e] == ce) row = e;
    if (row == p.n) return std::nullopt;
    const double target = p.target0[row];
    const Index ns = static_cast<Index>(s.species.size());
    auto electrons_at = [&](double pe) {
        double total = 0.0;
        auto score = [&](Index k) { return s.log_k(k) - s.nu(k, ch) * ph - s.nu(k, ce) * pe; };
        for (Index k = 0; k < ns; ++k)  // O2(aq), H2(aq): from water alone
            if (only_water_columns(s.nu.row(k))) total += s.nu(k, ce) * std::pow(10.0, std::min(score(k), 5.0));
        for (Index c = 0; c < nc; ++c) {
            const auto cu = static_cast<std::size_t>(c);
            const int own = p.species_of_column[cu];
            if (s.columns[c].role != ComponentColumn::Role::unknown || own < 0) continue;
            const std::size_t e = static_cast<std::size_t>(s.columns[c].unknown);
            if (p.equation[e] != Equation::mass || !(p.target0[e] > 0)) continue;
            std::vector<int> ks = p.basis_candidates[cu];
            ks.push_back(own);
            double top = -std::numeric_limits<double>::infinity();
            for (const int k : ks) top = std::max(top, score(k));
            double weight = 0.0, sum = 0.0;
            for (const int k : ks) {
                const double w = std::pow(10.0, score(k) - top);
                weight += w;
                sum += w * s.nu(k, ce);
            }
            total += p.target0[e] * sum / weight;
        }
        return total;
    };
    double lo = -15.0, hi = 25.0;
    if (electrons_at(lo) < target || electrons_at(hi) > target) return std::nullopt;
    for (int it = 0; it < 50; ++it) {
        const double mid = 0.5 * (lo + hi);
        (electrons_at(mid) > target ? lo : hi) = mid;
    }
    return 0.5 * (lo + hi);
}

// One attempt: choose the basis at the state, start from it, and run KINSOL; when it stops
// short with a finite residual (too many long steps, iteration limit, a stalled line
// search), take the point it reached as the new state, choose the basis again there and
// carry on, while that keeps reducing the residual. `st` and `u` hold the last point.
AttemptOutcome attempt(Problem& p, const SpeciationInput& input, CarriedState& st, std::vector<double>& u,
                       double ph_guess, double pe_guess, const std::vector<double>& phase_start,
                       const SolverOptions& options, SolveSummary& summary) {
    AttemptOutcome best;
    std::vector<int> best_basis = p.basis_of_column;
    const int legs = std::max(options.max_legs, 1);
    for (int leg = 0; leg < legs; ++leg) {
        choose_basis(p, guessed_log_activities(p, st, ph_guess, pe_guess));
        p.refer_electrons_to_basis();
        std::vector<double> trial = to_unknowns(p, input, st, ph_guess, pe_guess);
        for (std::size_t e = 0; e < p.n; ++e)
            if (p.phase_of_unknown[e] >= 0)
                trial[e] = e < st.phase.size() && std::isfinite(st.phase[e]) ? st.phase[e] : phase_start[e];
        // Short legs first (25, 50, 100, ... iterations): a basis that fits the water badly
        // is replaced early, from the point reached, rather than after the whole budget.
        SolverOptions leg_options = options;
        leg_options.max_iterations = std::min(options.max_iterations, std::max(options.first_leg_iterations, 1) << std::min(leg, 20));
        const bool last_leg = leg == legs - 1;
        if (last_leg) leg_options.max_iterations = options.max_iterations;
        AttemptOutcome o = run_kinsol(p, trial, leg_options);
        count(summary, o);
        // Carry on from a leg that ran out of iterations while still improving; from one that
        // stopped otherwise only when it at least halved the residual.
        const bool out_of_iterations = leg_options.max_iterations < options.max_iterations && o.iterations >= leg_options.max_iterations;
        const double needed = out_of_iterations ? 1.0 : 0.5;
        const bool better = o.converged || (std::isfinite(o.residual) && o.residual < needed * best.residual);
        if (!better) break;
        best = o;
        u = trial;
        best_basis = p.basis_of_column;
        st = from_unknowns(p, u);
        if (o.converged) break;
    }
    p.basis_of_column = best_basis;  // u belongs to this basis
    p.refer_electrons_to_basis();
    return best;
}

// Attempts on one layout: from the carried state; then (fallback) from default starts at
// several pH guesses, each through an ideal-solution solve continued to the activity model.
AttemptOutcome solve_layout(ChemicalSystem& sys, const SpeciationInput& input, Problem& p, CarriedState& st,
                            std::vector<double>& u, const std::vector<double>& phase_start, double pe_guess,
                            const SolverOptions& options, SolveSummary& summary) {
    const double ph0 = input.ph.value_or(7.0);
    AttemptOutcome outcome = attempt(p, input, st, u, ph0, pe_guess, phase_start, options, summary);
    if (outcome.converged || !options.allow_fallback) return outcome;
    const std::vector<double> ph_guesses =
        input.ph ? std::vector<double>{*input.ph} : options.fallback_ph_starts;
    for (double ph_guess : ph_guesses) {
        CarriedState fresh;
        fresh.column.assign(sys.columns.size(), std::numeric_limits<double>::quiet_NaN());
        std::vector<double> v;
        std::unique_ptr<activity::ActivityModel> real = std::move(sys.model);
        sys.model = activity::make_model(activity::ModelKind::ideal, input.temperature_c);
        SolverOptions loose = options;
        loose.max_step_log10 = options.fallback_max_step_log10;
        AttemptOutcome ideal = attempt(p, input, fresh, v, ph_guess, pe_guess, phase_start, loose, summary);
        sys.model = std::move(real);
        if (!std::isfinite(ideal.residual)) continue;
        fresh.log_i = std::isfinite(fresh.log_i) ? fresh.log_i : st.log_i;
        AttemptOutcome full = attempt(p, input, fresh, v, ph_guess, pe_guess, phase_start, loose, summary);
        if (full.converged || full.residual < outcome.residual) {
            outcome = full;
            u = v;
            st = fresh;
        }
        if (outcome.converged) {
            if (summary.method.find("fallback") == std::string::npos)
                summary.method += "; fallback: ideal-solution start, damped steps";
            break;
        }
    }
    return outcome;
}

// When a solve fails, some inputs have no solution at all; say so as bad input (with what
// to change) instead of a convergence failure. Two such cases are checked, each by one more
// solve of a simpler water:
// - a charge balance on an analyte that would need a negative amount of it (the water
//   with that analyte at a trace shows a charge excess of the analyte's own sign);
// - a measured pH with a total alkalinity smaller than what the water's other bases
//   (hydroxide, silicate, hydroxo complexes) carry at that pH, so carbonate would be negative.
void explain_no_solution(const thermo::Database& db, const SpeciationInput& input, const SolverOptions& options) {
    const SourceLocation here{input.label.empty() ? std::string("speciation input") : input.label, 0, 0};
    SolverOptions quiet = options;
    quiet.allow_fallback = true;
    if (input.ph) {
        for (const auto& c : input.components) {
            if (c.kind != ComponentInput::Kind::alkalinity) continue;
            // The water without its carbonate (and without closing the charge balance, which
            // does not change what the other bases carry at a fixed pH).
            SpeciationInput trial = input;
            std::erase_if(trial.components, [&](const ComponentInput& x) { return x.component == c.component; });
            trial.charge_balance_component.reset();
            SpeciationResult r;
            try {
                r = speciate(db, trial, quiet);
            } catch (const std::exception&) {
                break;
            }
            if (r.alkalinity_eq >= c.value) {
                // Name the bases that carry most of it.
                std::vector<std::pair<double, std::string>> bases;
                for (const auto& sr : r.species)
                    if (const double a = db.species()[sr.species].alkalinity * sr.molality; a > 0) bases.emplace_back(a, sr.name);
                std::sort(bases.begin(), bases.end(), std::greater<>());
                std::ostringstream o;
                o.precision(3);
                o << "the total alkalinity given (" << c.value * 1000.0 << " meq/kgw) is not more than the "
                  << r.alkalinity_eq * 1000.0 << " meq/kgw that the water's other bases carry at pH " << *input.ph
                  << " without any carbonate (";
                for (std::size_t b = 0; b < std::min<std::size_t>(bases.size(), 3); ++b)
                    o << (b ? ", " : "") << bases[b].second << " " << bases[b].first * 1000.0 << " meq/kgw";
                o << "), so no amount of carbonate fits: check the pH, the alkalinity and those analytes";
                throw NoSolutionError(here, "Alkalinity", o.str());
            }
            break;
        }
    }
    if (input.charge_balance_component) {
        const std::size_t j = *input.charge_balance_component;
        SpeciationInput trial = input;
        trial.charge_balance_component.reset();
        for (auto& c : trial.components)
            if (c.component == j) c.value = 1e-12;
        SpeciationResult r;
        try {
            r = speciate(db, trial, quiet);
        } catch (const std::exception&) {
            return;
        }
        // Charge per mole of the element at this pH and redox level, and the excess to close.
        double charge_per_mol = 0.0, total = 0.0;
        for (const auto& sr : r.species) {
            const auto& sp = db.species()[sr.species];
            for (const auto& [k, v] : sp.formation)
                if (k == j) {
                    charge_per_mol += v * sr.molality * sp.formula.charge;
                    total += v * sr.molality;
                }
        }
        if (!(total > 0)) return;
        charge_per_mol /= total;
        const double excess_eq = (r.cations_meq - r.anions_meq) / 1000.0 - input.charge_imbalance_eq;
        const double needed = -excess_eq / charge_per_mol;
        if (needed < 0 && std::isfinite(needed)) {
            std::ostringstream o;
            o.precision(3);
            o << "closing the charge balance on '" << component_name(db, j) << "' would need a negative amount ("
              << needed * 1000.0 << " mmol/kgw): without it the water has " << std::abs(excess_eq) * 1000.0 << " meq/kgw more "
              << (excess_eq > 0 ? "cations" : "anions") << " than " << (excess_eq > 0 ? "anions" : "cations")
              << ", and at this pH and redox level it carries a charge of " << charge_per_mol
              << " per mole; balance on an ion of the other charge, or check the analysis";
            throw NoSolutionError(here, "charge_balance", o.str());
        }
        // At a fixed pH and alkalinity, the analyte's own hydroxo species (MgOH+ at a high pH)
        // count as alkalinity and leave less room for carbonate: find the most of it the
        // alkalinity allows (bisection on the water without carbonate), and whether the
        // balance closes before that.
        const ComponentInput* alk = nullptr;
        for (const auto& c : input.components)
            if (c.kind == ComponentInput::Kind::alkalinity) alk = &c;
        if (!input.ph || !alk || !(needed > 0) || !std::isfinite(needed)) return;
        auto water_with = [&](double amount, bool carbonate) {
            SpeciationInput t = input;
            t.charge_balance_component.reset();
            for (auto& c : t.components)
                if (c.component == j) c.value = amount;
            if (!carbonate)
                std::erase_if(t.components, [&](const ComponentInput& x) { return x.component == alk->component; });
            return speciate(db, t, quiet);
        };
        try {
            auto room = [&](double amount) { return water_with(amount, false).alkalinity_eq < alk->value; };
            double lo = 0.0, hi = 2.0 * needed;
            if (room(hi)) return;  // the alkalinity is no limit here
            for (int it = 0; it < 30; ++it) {
                const double mid = 0.5 * (lo + hi);
                (room(mid) ? lo : hi) = mid;
            }
            const SpeciationResult at_most = water_with(lo, true);
            const double left = (at_most.cations_meq - at_most.anions_meq) / 1000.0 - input.charge_imbalance_eq;
            if (left * excess_eq > 0) {
                std::ostringstream o;
                o.precision(3);
                o << "closing the charge balance on '" << component_name(db, j) << "' has no solution at this pH and "
                  << "alkalinity: its species count as alkalinity, so at most " << lo * 1000.0
                  << " mmol/kgw of it leave room for any carbonate, and with that much the water still has "
                  << std::abs(left) * 1000.0 << " meq/kgw more " << (left > 0 ? "cations" : "anions")
                  << "; balance on another ion, or check the pH and the alkalinity";
                throw NoSolutionError(here, "charge_balance", o.str());
            }
        } catch (const NoSolutionError&) {
            throw;
        } catch (const std::exception&) {
        }
        return;
    }
}

}  // namespace

namespace {

// A fixed redox level beyond the stability of water: the O2 (or H2) pressure it implies.
// Above 1 atm the water would give off the gas (a warning); above 100 atm no water is at
// that level (boilers and oxygenation stay well below), so the level is refused: a pe of 20
// at pH 7 would put 10^25 atm of oxygen and hundreds of mol/kg of O2(aq) in the answer. ORP
// electrodes in chlorinated water read the oxidant, not the O2/H2O couple; pe and Eh
// readings beyond the lines are usually a wrong sign, unit or reference electrode.
void check_redox_level(const SpeciationInput& input, SpeciationResult& res) {
    constexpr double warn_log_atm = 0.0, refuse_log_atm = 2.0;
    for (const auto& sat : res.saturation) {
        if (!sat.is_gas || (sat.phase != "O2(g)" && sat.phase != "H2(g)")) continue;
        const bool oxygen = sat.phase == "O2(g)";
        if (sat.si <= warn_log_atm) continue;
        std::ostringstream o;
        o.precision(3);
        o << "the redox level pe " << *input.pe << " at pH " << res.ph << " lies "
          << (oxygen ? "above the O2/H2O line" : "below the H2O/H2 line") << " of water stability: it implies "
          << (oxygen ? "an oxygen" : "a hydrogen") << " partial pressure of 10^" << sat.si << " atm";
        if (sat.si > refuse_log_atm) {
            o << ", which no water holds; check the reading's sign, unit and reference electrode (an ORP electrode "
                 "in chlorinated water reads the oxidant, not the water's O2/H2O level)";
            const SourceLocation here{input.label.empty() ? std::string("speciation input") : input.label, 0, 0};
            throw NoSolutionError(here, "pe", o.str());
        }
        o << "; the water would give off " << (oxygen ? "oxygen" : "hydrogen");
        res.warnings.push_back(o.str());
    }
}

// The whole solve; `probe` (tests only) receives the final problem at the solution.
// Systems built for the embedded database, kept per thread for the next solve with the same
// columns, temperature and activity model (building one scans the whole database and
// evaluates every log K(T)). A solve borrows its system and gives it back when it is done; a
// solve nested in another (explain_no_solution) builds its own. A user's database is not
// cached: it may be freed and another loaded at the same address.
struct CachedSystem {
    double temperature_c;
    activity::ModelKind model;
    std::vector<ComponentColumn> columns;
    std::shared_ptr<ChemicalSystem> system;
};
constexpr std::size_t system_cache_size = 16;
thread_local std::vector<CachedSystem> system_cache;  // most recently used last

bool same_columns(const std::vector<ComponentColumn>& a, const std::vector<ComponentColumn>& b) {
    if (a.size() != b.size()) return false;
    for (std::size_t c = 0; c < a.size(); ++c)
        if (a[c].component != b[c].component || a[c].role != b[c].role || a[c].split_of != b[c].split_of) return false;
    return true;
}

struct BorrowedSystem {
    BorrowedSystem(const thermo::Database& db, const SpeciationInput& input)
        : cacheable(&db == &thermo::Database::embedded()), exceptions(std::uncaught_exceptions()) {
        std::vector<ComponentColumn> columns = system_columns(db, input);
        if (cacheable)
            for (auto it = system_cache.begin(); it != system_cache.end(); ++it)
                if (it->temperature_c == input.temperature_c && it->model == input.activity_model &&
                    same_columns(it->columns, columns)) {
                    system = std::move(it->system);
                    system_cache.erase(it);
                    break;
                }
        if (!system) system = std::make_shared<ChemicalSystem>(build_system(db, input, columns));
        temperature_c = input.temperature_c;
        model = input.activity_model;
        key_columns = std::move(columns);
    }
    BorrowedSystem(const BorrowedSystem&) = delete;
    BorrowedSystem& operator=(const BorrowedSystem&) = delete;
    ~BorrowedSystem() {
        // Not after an exception (the fallback may have swapped the activity model), and not
        // while a probe still holds it.
        if (!cacheable || std::uncaught_exceptions() > exceptions || system.use_count() != 1) return;
        if (system_cache.size() >= system_cache_size) system_cache.erase(system_cache.begin());
        system_cache.push_back({temperature_c, model, std::move(key_columns), std::move(system)});
    }

    bool cacheable;
    int exceptions;
    double temperature_c = 0.0;
    activity::ModelKind model{};
    std::vector<ComponentColumn> key_columns;
    std::shared_ptr<ChemicalSystem> system;
};

SpeciationResult speciate_impl(const thermo::Database& db, const SpeciationInput& input, const SolverOptions& options,
                               const SpeciationResult* start, internal::EquationProbe* probe) {
    const auto t_begin = std::chrono::steady_clock::now();
    validate_input(db, input);
    BorrowedSystem borrowed(db, input);
    const std::shared_ptr<ChemicalSystem>& sys_holder = borrowed.system;
    ChemicalSystem& sys = *sys_holder;

    std::vector<MineralState> minerals;
    for (const auto& m : input.minerals) {
        MineralState ms;
        ms.spec = m;
        // A mineral that cannot dissolve (no solid on hand) and may not form is inert.
        if (m.on_hand_mol_per_kgw && *m.on_hand_mol_per_kgw == 0.0 && !m.may_form)
            ms.status = MineralState::Status::blocked;
        minerals.push_back(ms);
    }

    // Values carried from one layout to the next (by column, and per phase).
    const std::size_t ncol = sys.columns.size();
    CarriedState carried;
    carried.column.assign(ncol, std::numeric_limits<double>::quiet_NaN());
    std::vector<double> mineral_xi(minerals.size(), 0.0), gas_xi(input.gases.size(), 0.0);
    // log10 a(e-) = -pe; with the electrons conserved, start from the earlier pe or a
    // moderately oxidising one.
    double pe_guess = start && start->pe ? *start->pe : 4.0;
    if (start) {
        for (std::size_t c = 0; c < ncol; ++c) {
            if (sys.columns[c].role == ComponentColumn::Role::electron_unknown) {
                if (start->pe) carried.column[c] = -*start->pe;
                continue;
            }
            if (sys.columns[c].role == ComponentColumn::Role::split_electron) {
                for (const auto& [k, la] : start->split_electron_log_activity)
                    if (k == sys.columns[c].split_of) carried.column[c] = la;
                continue;
            }
            if (const SpeciesResult* sr = start->find(db.species()[sys.columns[c].component].name); sr && sr->molality > 0)
                carried.column[c] = std::log10(sr->molality);
        }
        carried.log_i = std::log10(std::max(start->ionic_strength, 1e-7));
        carried.log_w = std::log10(std::max(start->water_activity, 1e-3));
        for (std::size_t a = 0; a < minerals.size(); ++a)
            for (const auto& t : start->transfers)
                if (t.phase == db.minerals()[minerals[a].spec.mineral].name) mineral_xi[a] = t.moles;
    }

    SolveSummary summary;
    summary.method = "KINSOL Newton with line search, analytic Jacobian, dominant-species basis";
    Layout L;
    std::vector<double> u;
    AttemptOutcome outcome;
    int round = 0;
    for (;; ++round) {
        L = make_layout(db, sys, input, minerals);
        if (round == 0) {
            check_phase_rule(db, sys, input, L);
            if (const auto pe0 = first_pe(L.p, input, carried)) {
                pe_guess = *pe0;
                for (std::size_t c = 0; c < ncol; ++c)
                    if (sys.columns[c].role == ComponentColumn::Role::electron_unknown) carried.column[c] = -*pe0;
            }
        }
        Problem& p = L.p;
        // Phase amounts: what earlier rounds (or a warm start) know.
        std::vector<double> phase_start(p.n, 0.0);
        for (std::size_t a = 0; a < minerals.size(); ++a)
            if (L.mineral_unknown[a] >= 0) phase_start[static_cast<std::size_t>(L.mineral_unknown[a])] = mineral_xi[a];
        for (std::size_t a = 0; a < gas_xi.size(); ++a) phase_start[static_cast<std::size_t>(L.gas_unknown[a])] = gas_xi[a];
        carried.phase.clear();

        outcome = solve_layout(sys, input, p, carried, u, phase_start, pe_guess, options, summary);
        if (!outcome.converged) break;

        // Carry the solution forward.
        for (std::size_t a = 0; a < minerals.size(); ++a)
            if (L.mineral_unknown[a] >= 0) mineral_xi[a] = u[static_cast<std::size_t>(L.mineral_unknown[a])];
        for (std::size_t a = 0; a < gas_xi.size(); ++a) gas_xi[a] = u[static_cast<std::size_t>(L.gas_unknown[a])];

        // Active set: release minerals that went past what they may do; take back those
        // whose saturation now asks for them.
        std::vector<double> f(p.n);
        p.evaluate(u.data(), f.data(), nullptr);
        bool released = false;
        for (std::size_t a = 0; a < minerals.size(); ++a) {
            MineralState& ms = minerals[a];
            if (ms.status != MineralState::Status::at_target) continue;
            const double xi = mineral_xi[a];
            if (ms.spec.on_hand_mol_per_kgw && xi > *ms.spec.on_hand_mol_per_kgw) {
                ms.status = MineralState::Status::exhausted;
                ms.xi = *ms.spec.on_hand_mol_per_kgw;
                released = true;
            } else if ((!ms.spec.may_form && xi < 0) || (!ms.spec.may_dissolve && xi > 0)) {
                ms.status = MineralState::Status::blocked;
                ms.xi = 0.0;
                released = true;
            }
        }
        bool taken_back = false;
        if (!released) {
            // SI of each released mineral at the current solution.
            for (std::size_t a = 0; a < minerals.size(); ++a) {
                MineralState& ms = minerals[a];
                if (ms.status == MineralState::Status::at_target) continue;
                const thermo::PhaseEntry& ph = db.minerals()[ms.spec.mineral];
                double si = -ph.log_k(input.temperature_c) - ms.spec.target_si;
                for (const auto& [j, v] : ph.dissolution) si += v * p.la(sys.column_for(j, ph.dissolution));
                const bool may_form = ms.spec.may_form;
                const bool may_dissolve = ms.spec.may_dissolve &&
                                          (!ms.spec.on_hand_mol_per_kgw || ms.xi < *ms.spec.on_hand_mol_per_kgw);
                if ((si > options.take_back_si && may_form) || (si < -options.take_back_si && may_dissolve)) {
                    ms.status = MineralState::Status::at_target;
                    mineral_xi[a] = ms.xi;
                    taken_back = true;
                }
            }
        }
        if (!released && !taken_back) break;
        if (round + 1 >= options.max_active_set_rounds) {
            outcome.converged = false;
            outcome.reason = "the set of minerals at their targets kept changing";
            break;
        }
    }

    summary.converged = outcome.converged;
    summary.residual_norm = std::isfinite(outcome.residual) ? outcome.residual : -1.0;
    summary.stop_reason = outcome.reason;
    if (!outcome.converged) {
        if (options.allow_fallback) explain_no_solution(db, input, options);
        std::string subject = input.label.empty() ? std::string("speciation") : "water '" + input.label + "'";
        std::string hint = "check the analysis (units, charge balance, pH) or try another activity_model";
        if (input.charge_balance_component)
            hint = "the charge balance on '" + component_name(db, *input.charge_balance_component) +
                   "' may not close with this analysis: check the analysis, or balance on another ion";
        else if (!input.minerals.empty() || !input.gases.empty())
            hint = "check that the minerals and gases requested can coexist with this water";
        throw ConvergenceError(subject, outcome.residual, outcome.reason, hint);
    }

    // Result.
    const Problem& p = L.p;
    std::vector<double> f(p.n);
    p.evaluate(u.data(), f.data(), nullptr);
    if (probe) {
        static const char* const names[] = {"mass", "alkalinity", "charge", "ionic strength", "water", "phase"};
        probe->n = p.n;
        probe->solution = u;
        probe->closed_gases = p.closed.size();
        for (std::size_t e = 0; e < p.n; ++e) {
            std::string k = names[static_cast<int>(p.equation[e])];
            bool sw = false;
            if (const int c = p.column_of_unknown[e]; c >= 0) {
                const auto role = sys.columns[static_cast<std::size_t>(c)].role;
                if (role == ComponentColumn::Role::electron_unknown) k = "electrons";
                if (role == ComponentColumn::Role::split_electron) k = "split electrons";
                sw = p.switched(static_cast<std::size_t>(c));
            }
            if (p.phase_of_unknown[e] >= 0) {
                k = "gas";
                for (const int mu : L.mineral_unknown)
                    if (mu == static_cast<int>(e)) k = "mineral";
            }
            probe->kind.push_back(k);
            probe->switched.push_back(sw);
        }
        auto problem = std::make_shared<Problem>(p);
        probe->evaluate = [problem, sys_holder](const double* x, double* fx, double* jac) {
            problem->evaluate(x, fx, jac);
        };
    }
    const Index ns = static_cast<Index>(sys.species.size());
    SpeciationResult res;
    res.label = input.label;
    res.temperature_c = input.temperature_c;
    res.pe = input.pe;
    res.activity_model = input.activity_model;
    res.kg_water_per_litre = input.kg_water_per_litre;
    res.ionic_strength = std::pow(10.0, u[static_cast<std::size_t>(p.i_unknown)]);
    res.water_activity = std::pow(10.0, u[static_cast<std::size_t>(p.w_unknown)]);
    res.component_totals.assign(db.component_count(), 0.0);
    res.component_present.assign(db.component_count(), false);
    res.component_log_activity.assign(db.component_count(), std::numeric_limits<double>::quiet_NaN());
    for (Index k = 0; k < ns; ++k) {
        const std::size_t idx = sys.species[static_cast<std::size_t>(k)];
        const thermo::Species& s = db.species()[idx];
        SpeciesResult sr;
        sr.species = idx;
        sr.name = s.name;
        sr.molality = p.m(k);
        sr.log_gamma = p.lg(k);
        sr.activity = p.m(k) * std::pow(10.0, p.lg(k));
        res.species.push_back(sr);
        for (const auto& [el, nat] : s.formula.elements)
            if (el != "H" && el != "O") res.element_totals[el] += nat * sr.molality;
        res.alkalinity_eq += s.alkalinity * sr.molality;
        const double zm = s.formula.charge * sr.molality * 1000.0;
        if (zm > 0) res.cations_meq += zm;
        else res.anions_meq -= zm;
    }
    for (std::size_t c = 0; c < ncol; ++c) {
        const std::size_t comp = sys.columns[c].component;
        if (sys.columns[c].role == ComponentColumn::Role::split_electron) {
            res.split_electron_log_activity.emplace_back(sys.columns[c].split_of, p.la(static_cast<Index>(c)));
            continue;
        }
        res.component_present[comp] = true;
        res.component_totals[comp] = sys.nu.col(static_cast<Index>(c)).dot(p.m);
        res.component_log_activity[comp] = p.la(static_cast<Index>(c));
    }
    res.ph = -res.component_log_activity[db.proton()];
    if (input.electron_total && db.electron()) res.pe = -res.component_log_activity[*db.electron()];
    res.charge_balance_error_percent = charge_balance_error_percent(res.cations_meq, res.anions_meq);

    for (std::size_t a = 0; a < minerals.size(); ++a) {
        const MineralState& ms = minerals[a];
        PhaseTransfer t;
        t.phase = db.minerals()[ms.spec.mineral].name;
        t.moles = ms.status == MineralState::Status::at_target ? mineral_xi[a] : ms.xi;
        t.at_target = ms.status == MineralState::Status::at_target;
        t.exhausted = ms.status == MineralState::Status::exhausted;
        t.blocked = ms.status == MineralState::Status::blocked;
        res.transfers.push_back(t);
    }
    for (std::size_t a = 0; a < input.gases.size(); ++a) {
        PhaseTransfer t;
        t.phase = db.gases()[input.gases[a].gas].name;
        t.is_gas = true;
        t.moles = gas_xi[a];
        t.at_target = true;
        res.transfers.push_back(t);
    }
    if (input.headspace) {
        for (std::size_t q = 0; q < p.closed.size(); ++q) {
            const auto& g = input.headspace->gases[q];
            PhaseTransfer t;
            t.phase = db.gases()[g.gas].name;
            t.is_gas = true;
            t.headspace = true;
            const double log_p = p.closed[q].nu.dot(p.la) - p.closed[q].log_k;
            t.gas_moles_per_kgw = p.closed[q].mol_per_atm * std::pow(10.0, log_p);
            t.moles = p.closed[q].mol_per_atm * std::pow(10.0, g.log_partial_pressure_atm) - t.gas_moles_per_kgw;
            res.transfers.push_back(t);
        }
    }

    res.warnings = sys.warnings;
    if (res.ionic_strength > sys.model->max_ionic_strength()) {
        std::ostringstream o;
        o << "ionic strength " << res.ionic_strength << " mol/kgw is beyond the range of the "
          << activity::model_name(input.activity_model) << " model (up to about "
          << sys.model->max_ionic_strength() << " mol/kgw)";
        res.warnings.push_back(o.str());
    }
    const bool balance_imposed = !input.ph || input.charge_balance_component;
    if (!balance_imposed && input.minerals.empty() && input.gases.empty()) {
        if (!charge_balance_acceptable(res.cations_meq, res.anions_meq)) {
            std::ostringstream o;
            o.precision(3);
            o << "charge-balance error " << res.charge_balance_error_percent
              << " % is outside the Standard Methods 1030 E acceptance for this water: check the analysis";
            res.warnings.push_back(o.str());
        }
    }
    summary.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t_begin).count();
    res.summary = summary;
    res.saturation = saturation_indices(db, res);
    if (input.pe) check_redox_level(input, res);
    for (const auto& t : res.transfers) {
        if (!t.exhausted && !t.blocked) continue;
        double si = 0.0, target = 0.0;
        const MineralTarget* spec = nullptr;
        for (const auto& sat : res.saturation)
            if (sat.phase == t.phase) si = sat.si;
        for (const auto& m : input.minerals)
            if (db.minerals()[m.mineral].name == t.phase) {
                target = m.target_si;
                spec = &m;
            }
        std::ostringstream o;
        o.precision(3);
        if (t.exhausted)
            o << t.phase << ": all of the " << t.moles * 1000 << " mmol/kgw available dissolved; the water stays "
              << (si < -default_si_tolerance ? "undersaturated" : "near saturation") << " (SI " << si << ")";
        else
            o << t.phase << ": held back, "
              << (si > target ? "it may not form (may_form = false)"
                  : spec && spec->may_dissolve ? "none of it on hand to dissolve"
                                               : "it may not dissolve (may_dissolve = false)")
              << " (SI " << si << ", held at " << target << ")";
        res.warnings.push_back(o.str());
    }
    return res;
}

std::atomic<std::uint64_t> speciations_run{0};

}  // namespace

std::uint64_t speciation_count() { return speciations_run.load(std::memory_order_relaxed); }

SpeciationResult speciate(const thermo::Database& db, const SpeciationInput& input,
                          const SolverOptions& options, const SpeciationResult* start) {
    speciations_run.fetch_add(1, std::memory_order_relaxed);
    return speciate_impl(db, input, options, start, nullptr);
}

namespace internal {

EquationProbe probe_equations(const thermo::Database& db, const SpeciationInput& input,
                              const SolverOptions& options) {
    EquationProbe probe;
    (void)speciate_impl(db, input, options, nullptr, &probe);
    return probe;
}

}  // namespace internal

}  // namespace deltag::equilibrium
