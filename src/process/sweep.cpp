// Sweeps: one input of one step varied over a range; at each point the steps run again
// from the start (later steps depend on earlier ones) and the outputs are recorded at the
// chosen step.
#include <cmath>
#include <limits>
#include <sstream>

#include "deltag/process.hpp"
#include "chem/names.hpp"

namespace deltag::process {

namespace {

// One recorded value; a point without one (an index with no answer there) gets NaN, the
// gap marker of SweepOutcome, and the reason.
struct Value {
    Value(double value, std::string reason = {}) : v(value), why_not(std::move(reason)) {}
    double v = 0.0;
    std::string why_not;  // non-empty: no value at this point
};

Value output_value(const thermo::Database& db, const StepOutcome& o, const std::string& name,
                   const SourceLocation& where) {
    const auto& r = o.state.result;
    const auto& ix = o.state.indices;
    const double nan = std::numeric_limits<double>::quiet_NaN();
    if (name == "pH") return {r.ph};
    if (name == "ionic_strength") return {r.ionic_strength};
    if (name == "alkalinity") return {r.alkalinity_eq * 1000.0 * r.kg_water_per_litre};
    if (name == "langelier") return ix.available ? Value{ix.langelier} : Value{nan, ix.why_not};
    if (name == "ryznar") return ix.available ? Value{ix.ryznar} : Value{nan, ix.why_not};
    if (name == "ccpp") return ix.ccpp_available ? Value{ix.ccpp_mg_per_l} : Value{nan, ix.ccpp_why_not};
    const auto colon = name.find(':');
    const std::string head = name.substr(0, colon), tail = colon == std::string::npos ? "" : name.substr(colon + 1);
    if (head == "si") {
        if (!db.find_mineral(tail) && !db.find_gas(tail)) {
            std::vector<std::string> all = db.mineral_names();
            for (auto& g : db.gas_names()) all.push_back(g);
            throw InputError(where, "outputs", "'" + tail + "' is not a mineral or gas of the database", nearest_name(tail, all));
        }
        for (const auto& s : r.saturation)
            if (s.phase == tail) return {s.si};
        return {nan, "the saturation of " + tail + " is not defined (its components are absent)"};
    }
    if (head == "transfer") {
        if (!db.find_mineral(tail) && !db.find_gas(tail)) {
            std::vector<std::string> all = db.mineral_names();
            for (auto& g : db.gas_names()) all.push_back(g);
            throw InputError(where, "outputs", "'" + tail + "' is not a mineral or gas of the database", nearest_name(tail, all));
        }
        for (const auto& t : r.transfers)
            if (t.phase == tail) return {t.moles * 1000.0};
        return {0.0};
    }
    if (head == "total") {
        if (!chem::atomic_weight(tail))
            throw InputError(where, "outputs", "'" + tail + "' is not an element symbol", nearest_name(tail, chem::element_symbols()));
        auto it = r.element_totals.find(tail);
        return {it == r.element_totals.end() ? 0.0 : it->second * 1000.0};
    }
    throw InputError(where, "outputs", "unknown output '" + name + "'");
}

std::string number(double v) {
    std::ostringstream o;
    o.precision(4);
    o << v;
    return o.str();
}

std::string output_label(const std::string& name) {
    if (name == "alkalinity") return "alkalinity (meq/L)";
    if (name == "ionic_strength") return "ionic strength (mol/kgw)";
    if (name == "langelier") return "Langelier index";
    if (name == "ryznar") return "Ryznar index";
    if (name == "ccpp") return "CCPP (mg/L as CaCO3)";
    if (name.rfind("si:", 0) == 0) return "SI " + name.substr(3);
    if (name.rfind("transfer:", 0) == 0) return name.substr(9) + " transfer (mmol/kgw)";
    if (name.rfind("total:", 0) == 0) return "total " + name.substr(6) + " (mmol/kgw)";
    return name;
}

}  // namespace

SweepOutcome run_sweep(const thermo::Database& db, const std::vector<WaterState>& waters,
                       const std::vector<Step>& steps, const Sweep& sweep) {
    std::size_t varied = steps.size(), recorded = steps.size();
    for (std::size_t k = 0; k < steps.size(); ++k) {
        if (steps[k].label == sweep.step) varied = k;
        if (steps[k].label == (sweep.at.empty() ? sweep.step : sweep.at)) recorded = k;
    }
    std::vector<std::string> labels;
    for (const auto& s : steps) labels.push_back(s.label);
    if (varied == steps.size())
        throw InputError(sweep.step_where, "step", "no step is labelled '" + sweep.step + "'", nearest_name(sweep.step, labels));
    if (recorded == steps.size())
        throw InputError(sweep.at_where, "at", "no step is labelled '" + sweep.at + "'", nearest_name(sweep.at, labels));
    if (recorded < varied)
        throw InputError(sweep.at_where, "at", "the step '" + sweep.at + "' comes before the varied step '" + sweep.step +
                                                   "': it does not depend on the sweep");
    SweepOutcome out;
    out.label = sweep.label;
    switch (sweep.variable) {
        case Sweep::Variable::temperature_c: out.x_label = "temperature (°C)"; break;
        case Sweep::Variable::dose: {
            const auto* d = std::get_if<DoseStep>(&steps[varied].action);
            out.x_label = "dose of " + (d ? d->reagent : std::string("reagent")) + " (" +
                          (d && d->amount ? d->amount->unit : std::string("mmol/kgw")) + ")";
            break;
        }
        case Sweep::Variable::factor: out.x_label = "concentration factor (cycles)"; break;
        case Sweep::Variable::fraction: out.x_label = "fraction of " + sweep.fraction_of + " (-)"; break;
    }
    for (const auto& o : sweep.outputs) out.series.emplace_back(output_label(o), std::vector<double>{});
    const std::vector<Step> upto(steps.begin(), steps.begin() + static_cast<std::ptrdiff_t>(recorded) + 1);
    for (int i = 0; i < sweep.points; ++i) {
        const double x = sweep.from + (sweep.to - sweep.from) * i / (sweep.points - 1);
        std::vector<Step> variant = upto;
        Step& s = variant[varied];
        if (auto* t = std::get_if<TemperatureStep>(&s.action); t && sweep.variable == Sweep::Variable::temperature_c)
            t->temperature_c = x;
        else if (auto* d = std::get_if<DoseStep>(&s.action); d && sweep.variable == Sweep::Variable::dose && d->amount)
            d->amount->value = x;
        else if (auto* c = std::get_if<ConcentrateStep>(&s.action); c && sweep.variable == Sweep::Variable::factor)
            c->factor = x;
        else if (auto* b = std::get_if<BlendStep>(&s.action); b && sweep.variable == Sweep::Variable::fraction) {
            // The named water takes fraction x, the others share 1 - x in their proportions.
            double others = 0.0;
            bool found = false;
            for (const auto& [n, f] : b->parts) {
                if (n == sweep.fraction_of) found = true;
                else others += f;
            }
            if (!found)
                throw InputError(sweep.where, "fraction_of", "'" + sweep.fraction_of + "' is not one of the blended waters");
            for (auto& [n, f] : b->parts) f = n == sweep.fraction_of ? x : (others > 0 ? f / others * (1.0 - x) : 0.0);
            std::erase_if(b->parts, [](const auto& p) { return p.second <= 0.0; });
        } else {
            throw InputError(sweep.variable_where, "variable", "the step '" + s.label + "' has no such input to vary");
        }
        const std::vector<StepOutcome> res = run_steps(db, waters, variant);
        out.x.push_back(x);
        for (std::size_t k = 0; k < sweep.outputs.size(); ++k) {
            const SourceLocation at = k < sweep.output_where.size() ? sweep.output_where[k] : sweep.where;
            const Value v = output_value(db, res.back(), sweep.outputs[k], at);
            out.series[k].second.push_back(v.v);
            if (!v.why_not.empty())
                out.notes.push_back("no " + out.series[k].first + " at " + out.x_label + " = " + number(x) + ": " + v.why_not);
        }
    }
    return out;
}

}  // namespace deltag::process
