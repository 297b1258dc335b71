// Speciation: unknowns are log10 of the free molality of each component species (and of H+
// when the pH comes from the charge balance), log10 of the ionic strength and log10 of the
// water activity. Residuals: a mass (or alkalinity, or charge) balance per component, the
// definition of I, and the water activity. The Jacobian is analytic, assembled with Eigen,
// and KINSOL's Newton method with line search solves the system.
#include <kinsol/kinsol.h>
#include <nvector/nvector_serial.h>
#include <sunlinsol/sunlinsol_dense.h>
#include <sunmatrix/sunmatrix_dense.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstring>
#include <limits>
#include <sstream>

#include "deltag/constants.hpp"
#include "deltag/speciation.hpp"
#include "equilibrium/system.hpp"

namespace deltag::equilibrium {

namespace {

using Eigen::Index;
using Eigen::MatrixXd;
using Eigen::VectorXd;
constexpr double ln10 = constants::ln10;

enum class Equation { mass, alkalinity, charge, ionic_strength, water };

struct Problem {
    const ChemicalSystem* sys = nullptr;
    std::size_t n = 0;                     // unknowns
    std::vector<Equation> equation;        // per unknown
    std::vector<double> target;            // per unknown (totals, alkalinity)
    std::vector<double> scale;             // per unknown, residual divisor
    std::vector<int> column_of_unknown;    // -1 for I and w
    std::vector<int> species_of_column;    // index into sys->species of each column's own species (-1)
    int i_unknown = -1, w_unknown = -1, h_unknown = -1;
    double log_a_h_fixed = 0.0, log_a_e_fixed = 0.0;
    MatrixXd weights;                      // species x unknowns, for mass/alkalinity/charge rows
    VectorXd z2;                           // charge squared per species

    // Work arrays.
    mutable VectorXd log_m, m, lg, dlg;
    mutable MatrixXd g;                    // d log10 m / d u
    std::vector<double> lg_buf, dlg_buf;

    void evaluate(const double* u, double* f, double* jac) const;
};

void Problem::evaluate(const double* u, double* f, double* jac) const {
    const ChemicalSystem& s = *sys;
    const Index ns = static_cast<Index>(s.species.size());
    const double log_i = u[i_unknown];
    const double ionic = std::pow(10.0, std::clamp(log_i, -20.0, 2.0));
    auto& lgb = const_cast<std::vector<double>&>(lg_buf);
    auto& dlgb = const_cast<std::vector<double>&>(dlg_buf);
    s.model->log_gamma(ionic, s.params, lgb, dlgb);
    for (Index k = 0; k < ns; ++k) {
        lg(k) = lgb[k];
        dlg(k) = dlgb[k];
    }
    // Log activity of each column and its d/dI part.
    const Index nc = static_cast<Index>(s.columns.size());
    VectorXd la(nc), dla(nc);
    for (Index c = 0; c < nc; ++c) {
        const ComponentColumn& col = s.columns[c];
        const int k = species_of_column[c];
        switch (col.role) {
            case ComponentColumn::Role::unknown:
            case ComponentColumn::Role::proton_unknown:
                la(c) = u[col.unknown] + lg(k);
                dla(c) = dlg(k);
                break;
            case ComponentColumn::Role::proton_fixed:
                la(c) = log_a_h_fixed;
                dla(c) = 0.0;
                break;
            case ComponentColumn::Role::water:
                la(c) = u[w_unknown];
                dla(c) = 0.0;
                break;
            case ComponentColumn::Role::electron_fixed:
                la(c) = log_a_e_fixed;
                dla(c) = 0.0;
                break;
        }
    }
    log_m = s.log_k + s.nu * la - lg;
    const VectorXd dlogm_di = s.nu * dla - dlg;  // per unit I
    for (Index k = 0; k < ns; ++k) {
        const double v = log_m(k);
        m(k) = std::exp(ln10 * std::clamp(v, -300.0, 50.0));
    }
    // Residuals.
    const VectorXd lin = weights.transpose() * m;
    const double half_z2m = 0.5 * z2.dot(m);
    const double sum_m = m.sum();
    for (std::size_t e = 0; e < n; ++e) {
        switch (equation[e]) {
            case Equation::mass:
            case Equation::alkalinity:
            case Equation::charge:
                f[e] = (lin(static_cast<Index>(e)) - target[e]) / scale[e];
                break;
            case Equation::ionic_strength:
                f[e] = half_z2m / ionic - 1.0;
                break;
            case Equation::water:
                f[e] = u[w_unknown] + constants::water_molar_mass_kg * sum_m / ln10;
                break;
        }
    }
    if (!jac) return;
    // G = d log m / d u.
    g.setZero();
    for (Index c = 0; c < nc; ++c) {
        const ComponentColumn& col = s.columns[c];
        if (col.role == ComponentColumn::Role::unknown || col.role == ComponentColumn::Role::proton_unknown)
            g.col(col.unknown) += s.nu.col(c);
        else if (col.role == ComponentColumn::Role::water)
            g.col(w_unknown) += s.nu.col(c);
    }
    g.col(i_unknown) += dlogm_di * (ionic * ln10);
    // Species outside the clamp do not move.
    for (Index k = 0; k < ns; ++k)
        if (log_m(k) > 50.0 || log_m(k) < -300.0) g.row(k).setZero();
    // dm/du = diag(m ln10) G.
    const MatrixXd dm = (m * ln10).asDiagonal() * g;
    Eigen::Map<MatrixXd> J(jac, static_cast<Index>(n), static_cast<Index>(n));
    J.noalias() = weights.transpose() * dm;
    for (std::size_t e = 0; e < n; ++e) {
        const Index r = static_cast<Index>(e);
        switch (equation[e]) {
            case Equation::mass:
            case Equation::alkalinity:
            case Equation::charge:
                J.row(r) /= scale[e];
                break;
            case Equation::ionic_strength:
                J.row(r) = (0.5 * z2.transpose() * dm) / ionic;
                J(r, i_unknown) -= half_z2m / ionic * ln10;
                break;
            case Equation::water:
                J.row(r) = dm.colwise().sum() * (constants::water_molar_mass_kg / ln10);
                J(r, w_unknown) += 1.0;
                break;
        }
    }
}

// --- KINSOL glue -------------------------------------------------------------------------

struct KinsolUserData {
    const Problem* problem;
    std::vector<double> jac_buffer;
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

int kin_jacobian(N_Vector u, N_Vector /*fu*/, SUNMatrix J, void* user, N_Vector, N_Vector) {
    auto* d = static_cast<KinsolUserData*>(user);
    const std::size_t n = d->problem->n;
    d->jac_buffer.resize(n * n);
    std::vector<double> f(n);
    d->problem->evaluate(N_VGetArrayPointer(u), f.data(), d->jac_buffer.data());
    // Both Eigen and SUNDIALS dense matrices are column-major with leading dimension n.
    std::memcpy(SUNDenseMatrix_Data(J), d->jac_buffer.data(), n * n * sizeof(double));
    for (double v : d->jac_buffer)
        if (!std::isfinite(v)) return 1;
    return 0;
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
};

double max_abs_residual(const Problem& p, const std::vector<double>& u) {
    std::vector<double> f(p.n);
    p.evaluate(u.data(), f.data(), nullptr);
    double r = 0.0;
    for (double v : f) r = std::max(r, std::isfinite(v) ? std::abs(v) : std::numeric_limits<double>::infinity());
    return r;
}

// One KINSOL run from u (updated in place).
AttemptOutcome run_kinsol(const Problem& p, std::vector<double>& u, const SolverOptions& opt) {
    AttemptOutcome out;
    SUNContext ctx = nullptr;
    if (SUNContext_Create(nullptr, &ctx) != 0) {
        out.reason = "could not create a SUNDIALS context";
        return out;
    }
    const auto n = static_cast<sunindextype>(p.n);
    N_Vector x = N_VNew_Serial(n, ctx);
    N_Vector scale = N_VNew_Serial(n, ctx);
    SUNMatrix J = SUNDenseMatrix(n, n, ctx);
    SUNLinearSolver LS = SUNLinSol_Dense(x, J, ctx);
    void* mem = KINCreate(ctx);
    KinsolUserData data{&p, {}, {}};
    std::copy(u.begin(), u.end(), N_VGetArrayPointer(x));
    N_VConst(1.0, scale);

    int flag = KINInit(mem, kin_residual, x);
    if (flag == KIN_SUCCESS) {
        KINSetErrHandlerFn(mem, kin_silent_errors, &data);
        KINSetUserData(mem, &data);
        KINSetLinearSolver(mem, LS, J);
        KINSetJacFn(mem, kin_jacobian);
        KINSetFuncNormTol(mem, opt.tolerance);
        KINSetScaledStepTol(mem, opt.step_tolerance);
        KINSetNumMaxIters(mem, opt.max_iterations);
        KINSetMaxSetupCalls(mem, 1);  // exact Newton: a fresh Jacobian every iteration
        KINSetMaxNewtonStep(mem, opt.max_step_log10 * std::sqrt(static_cast<double>(p.n)));
        KINSetPrintLevel(mem, 0);
        flag = KINSol(mem, x, KIN_LINESEARCH, scale, scale);
        long nni = 0, nfe = 0;
        KINGetNumNonlinSolvIters(mem, &nni);
        KINGetNumFuncEvals(mem, &nfe);
        out.iterations = nni;
        out.evaluations = nfe;
    }
    const double* xv = N_VGetArrayPointer(x);
    std::vector<double> candidate(xv, xv + p.n);
    const double r = max_abs_residual(p, candidate);
    out.residual = r;
    out.reason = kinsol_flag_text(flag);
    // Accept on our own measure: KINSOL may stop on a tiny step with the residual already met.
    out.converged = std::isfinite(r) && r <= std::max(opt.tolerance, 1e-300) * 10.0;
    if (out.converged || std::isfinite(r)) u = candidate;

    KINFree(&mem);
    SUNLinSolFree(LS);
    SUNMatDestroy(J);
    N_VDestroy(scale);
    N_VDestroy(x);
    SUNContext_Free(&ctx);
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
      << "stopped because: " << stop_reason << "\n"
      << "time: " << seconds * 1e6 << " us\n";
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
    if (!std::isfinite(in.temperature_c) || in.temperature_c < 0.0 || in.temperature_c > 100.0)
        throw InputError(here, "temperature_c", "expected a temperature within 0-100 degC");
    if (in.ph && (!std::isfinite(*in.ph) || *in.ph < 0.0 || *in.ph > 14.0))
        throw InputError(here, "pH", "expected a pH within 0-14");
    if (in.pe && !std::isfinite(*in.pe)) throw InputError(here, "pe", "expected a finite pe");
    if (in.pe && !db.electron()) throw InputError(here, "pe", "the database has no electron component \"e-\"");
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

SpeciationResult speciate(const thermo::Database& db, const SpeciationInput& input,
                          const SolverOptions& options, const SpeciationResult* start) {
    const auto t_begin = std::chrono::steady_clock::now();
    validate_input(db, input);
    ChemicalSystem sys = build_system(db, input);

    Problem p;
    p.sys = &sys;
    const std::size_t ncol = sys.columns.size();
    p.species_of_column.assign(ncol, -1);
    for (std::size_t c = 0; c < ncol; ++c)
        for (std::size_t k = 0; k < sys.species.size(); ++k)
            if (sys.species[k] == sys.columns[c].component) p.species_of_column[c] = static_cast<int>(k);

    // Unknowns and their equations.
    double charge_scale = 1e-7;
    for (const auto& c : input.components)
        charge_scale += std::abs(c.value) * std::max(1, std::abs(db.species()[c.component].formula.charge));
    if (input.ph) charge_scale += std::pow(10.0, -*input.ph) + std::pow(10.0, *input.ph - 14.0);

    for (std::size_t c = 0; c < ncol; ++c) {
        ComponentColumn& col = sys.columns[c];
        if (col.role != ComponentColumn::Role::unknown && col.role != ComponentColumn::Role::proton_unknown) continue;
        col.unknown = static_cast<int>(p.n++);
        p.column_of_unknown.push_back(static_cast<int>(c));
        if (col.role == ComponentColumn::Role::proton_unknown) {
            p.h_unknown = col.unknown;
            p.equation.push_back(Equation::charge);
            p.target.push_back(0.0);
            p.scale.push_back(charge_scale);
            continue;
        }
        if (input.charge_balance_component && *input.charge_balance_component == col.component) {
            p.equation.push_back(Equation::charge);
            p.target.push_back(0.0);
            p.scale.push_back(charge_scale);
            continue;
        }
        const ComponentInput* ci = nullptr;
        for (const auto& x : input.components)
            if (x.component == col.component) ci = &x;
        if (ci->kind == ComponentInput::Kind::alkalinity) {
            p.equation.push_back(Equation::alkalinity);
            p.target.push_back(ci->value);
            p.scale.push_back(std::max(std::abs(ci->value), 1e-9));
        } else {
            p.equation.push_back(Equation::mass);
            p.target.push_back(ci->value);
            p.scale.push_back(ci->value);
        }
    }
    p.i_unknown = static_cast<int>(p.n++);
    p.equation.push_back(Equation::ionic_strength);
    p.target.push_back(0.0);
    p.scale.push_back(1.0);
    p.column_of_unknown.push_back(-1);
    p.w_unknown = static_cast<int>(p.n++);
    p.equation.push_back(Equation::water);
    p.target.push_back(0.0);
    p.scale.push_back(1.0);
    p.column_of_unknown.push_back(-1);
    if (input.ph) p.log_a_h_fixed = -*input.ph;
    if (input.pe) p.log_a_e_fixed = -*input.pe;

    const Index ns = static_cast<Index>(sys.species.size());
    p.weights = MatrixXd::Zero(ns, static_cast<Index>(p.n));
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
    p.log_m.resize(ns);
    p.m.resize(ns);
    p.lg.resize(ns);
    p.dlg.resize(ns);
    p.g.resize(ns, static_cast<Index>(p.n));
    p.lg_buf.resize(static_cast<std::size_t>(ns));
    p.dlg_buf.resize(static_cast<std::size_t>(ns));

    // Starting point: free = total, pH 7 (or the given one), I from the totals.
    auto default_start = [&](double ph_guess) {
        std::vector<double> u(p.n, 0.0);
        double i_est = 0.0, sum = 0.0;
        for (std::size_t e = 0; e < p.n; ++e) {
            const int c = p.column_of_unknown[e];
            if (c < 0) continue;
            const std::size_t comp = sys.columns[c].component;
            const int z = db.species()[comp].formula.charge;
            double guess = 1e-7;
            if (static_cast<int>(e) == p.h_unknown) guess = std::pow(10.0, -ph_guess);
            else if (p.equation[e] == Equation::mass) guess = p.target[e];
            else if (p.equation[e] == Equation::alkalinity) guess = std::max(std::abs(p.target[e]), 1e-6);
            else {
                for (const auto& x : input.components)
                    if (x.component == comp && x.value > 0) guess = x.value;
                if (guess <= 1e-7) guess = 1e-4;
            }
            u[e] = std::log10(guess);
            i_est += 0.5 * z * z * guess;
            sum += guess;
        }
        u[static_cast<std::size_t>(p.i_unknown)] = std::log10(std::max(i_est, 1e-7));
        u[static_cast<std::size_t>(p.w_unknown)] = -constants::water_molar_mass_kg * sum / ln10;
        return u;
    };
    auto warm_start = [&](const SpeciationResult& r) {
        std::vector<double> u = default_start(r.ph);
        for (std::size_t e = 0; e < p.n; ++e) {
            const int c = p.column_of_unknown[e];
            if (c < 0) continue;
            if (const SpeciesResult* sr = r.find(db.species()[sys.columns[c].component].name); sr && sr->molality > 0)
                u[e] = std::log10(sr->molality);
        }
        u[static_cast<std::size_t>(p.i_unknown)] = std::log10(std::max(r.ionic_strength, 1e-7));
        u[static_cast<std::size_t>(p.w_unknown)] = std::log10(std::max(r.water_activity, 1e-3));
        return u;
    };

    SolveSummary summary;
    summary.method = "KINSOL Newton with line search, analytic Jacobian";
    std::vector<double> u = start ? warm_start(*start) : default_start(input.ph.value_or(7.0));
    AttemptOutcome outcome = run_kinsol(p, u, options);
    summary.attempts = 1;
    summary.iterations = static_cast<int>(outcome.iterations);
    summary.residual_evaluations = static_cast<int>(outcome.evaluations);

    if (!outcome.converged && options.allow_fallback) {
        // Fallback 1: solve the ideal solution first, then continue to the activity model.
        const std::vector<double> ph_guesses = input.ph ? std::vector<double>{*input.ph}
                                                        : std::vector<double>{7.0, 4.0, 10.0};
        for (double ph_guess : ph_guesses) {
            std::vector<double> v = default_start(ph_guess);
            std::unique_ptr<activity::ActivityModel> real = std::move(sys.model);
            sys.model = activity::make_model(activity::ModelKind::ideal, input.temperature_c);
            SolverOptions loose = options;
            loose.max_step_log10 = 1.0;
            AttemptOutcome ideal = run_kinsol(p, v, loose);
            sys.model = std::move(real);
            summary.attempts += 1;
            summary.iterations += static_cast<int>(ideal.iterations);
            summary.residual_evaluations += static_cast<int>(ideal.evaluations);
            if (!std::isfinite(ideal.residual)) continue;
            AttemptOutcome full = run_kinsol(p, v, loose);
            summary.attempts += 1;
            summary.iterations += static_cast<int>(full.iterations);
            summary.residual_evaluations += static_cast<int>(full.evaluations);
            if (full.converged || full.residual < outcome.residual) {
                outcome = full;
                u = v;
            }
            if (outcome.converged) {
                summary.method += "; fallback: ideal-solution start, damped steps";
                break;
            }
        }
    }
    summary.converged = outcome.converged;
    summary.residual_norm = std::isfinite(outcome.residual) ? outcome.residual : -1.0;
    summary.stop_reason = outcome.reason;
    if (!outcome.converged) {
        std::string subject = input.label.empty() ? std::string("speciation") : "water '" + input.label + "'";
        std::string hint = "check the analysis (units, charge balance, pH) or try another activity_model";
        if (input.charge_balance_component)
            hint = "the charge balance on '" + component_name(db, *input.charge_balance_component) +
                   "' may need a negative amount: balance on an ion of the other charge, or check the analysis";
        throw ConvergenceError(subject, outcome.residual, outcome.reason, hint);
    }

    // Result.
    std::vector<double> f(p.n);
    p.evaluate(u.data(), f.data(), nullptr);
    SpeciationResult res;
    res.label = input.label;
    res.temperature_c = input.temperature_c;
    res.pe = input.pe;
    res.activity_model = input.activity_model;
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
        res.component_present[comp] = true;
        res.component_totals[comp] = sys.nu.col(static_cast<Index>(c)).dot(p.m);
        switch (sys.columns[c].role) {
            case ComponentColumn::Role::water: res.component_log_activity[comp] = std::log10(res.water_activity); break;
            case ComponentColumn::Role::electron_fixed: res.component_log_activity[comp] = -*input.pe; break;
            case ComponentColumn::Role::proton_fixed: res.component_log_activity[comp] = -*input.ph; break;
            default: {
                const int k = p.species_of_column[c];
                res.component_log_activity[comp] = std::log10(res.species[static_cast<std::size_t>(k)].activity);
            }
        }
    }
    res.ph = -res.component_log_activity[db.proton()];
    const double sum = res.cations_meq + res.anions_meq;
    res.charge_balance_error_percent = sum > 0 ? 100.0 * (res.cations_meq - res.anions_meq) / sum : 0.0;

    res.warnings = sys.warnings;
    if (res.ionic_strength > sys.model->max_ionic_strength()) {
        std::ostringstream o;
        o << "ionic strength " << res.ionic_strength << " mol/kgw is beyond the range of the "
          << activity::model_name(input.activity_model) << " model (up to about "
          << sys.model->max_ionic_strength() << " mol/kgw)";
        res.warnings.push_back(o.str());
    }
    const bool balance_imposed = !input.ph || input.charge_balance_component;
    if (!balance_imposed) {
        // Standard Methods 1030 E acceptance: 0.2 meq/L for anion sums up to 3 meq/L, 2 % up
        // to 10 meq/L, 5 % above (sums per kg of water here).
        const double an = res.anions_meq, diff = std::abs(res.cations_meq - res.anions_meq);
        bool bad = false;
        if (an <= 3.0) bad = diff > 0.2;
        else if (an <= 10.0) bad = std::abs(res.charge_balance_error_percent) > 2.0;
        else bad = std::abs(res.charge_balance_error_percent) > 5.0;
        if (bad) {
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
    return res;
}

}  // namespace deltag::equilibrium
