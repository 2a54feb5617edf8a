#include "post/how_computed.hpp"

#include "post/text.hpp"

#include <algorithm>

namespace heatbead::post {

namespace {

std::string integrator_words(const std::string& name) {
    if (name == "explicit") return "explicit: forward Euler at the stable step, finite volumes in enthalpy form";
    if (name == "rkl2")
        return "rkl2: Runge-Kutta-Legendre super-time-stepping, second order (Meyer, Balsara & Aslam 2014), finite "
               "volumes in enthalpy form";
    return name;
}

// The model's known limits, in one row: the first two always hold, the source's only while it is the
// rule of thumb, the hardness ones only where hardness is estimated.
std::pair<std::string, std::string> known_limits(const MethodFacts& f) {
    std::string s = "heat flows by conduction only: no weld-pool flow or arc pressure (an optional liquid "
                    "conductivity factor stands in for them), so peaks under the arc run well above a real pool, "
                    "while HAZ cooling is much less sensitive to this; the bead laid has the shape asked for, scaled "
                    "to the wire's deposit, where a real bead's shape follows the current, voltage, angles and position";
    if (f.source_from_procedure)
        s += "; the source's shape is a rule of thumb from the bead and the transfer mode, not a calibration: fusion "
             "depths are uncertain until the source is fitted to a macro-section (heatbead fit)";
    if (f.hardness)
        s += "; hardness is estimated at the station's probes from their own cooling, by coefficients from memory "
             "to be checked against the papers and a hardness survey; no model of hydrogen diffusion, restraint or "
             "residual stress: the time above 100 degC is the only hydrogen criterion";
    return {"known limits", s};
}

}  // namespace

const char* const fit_makes_no_bands =
    "no bands: the fit's table gives each fitted unknown's approximate 95 % interval instead";

const char* const method_not_recorded =
    "not recorded by the program that wrote this page; heatbead check on the case file lists the grid, the "
    "integrator and the source";

std::string bands_words(const BandFacts& b) {
    if (!b.enabled) return "no bands: turned off (bands.enabled = false, or --no-bands)";
    std::string s = format_text("each headline answer carries a band from %zu extra full runs: one per input moved by "
                                "its spread (arc efficiency ±%.2f, %s; the source's half-width, depth, and front and "
                                "rear lengths together, each ±%.0f %%, %s) and one on a grid of %.0f times the spacing. "
                                "Band = answer ± (root-sum-square of the shifts",
                                b.runs, b.efficiency_spread, b.efficiency_source.c_str(), b.source_spread * 100,
                                b.source_source.c_str(), b.grid_ratio);
    if (b.hardness)
        s += format_text(", with the hardness formulas' own scatter: wide enough to hold Düren's estimate ±%.0f HV and "
                         "Yurioka's ±%.0f HV",
                         b.duren_scatter, b.yurioka_scatter);
    return s + format_text(" + |grid error|), the grid error by Roache's grid convergence index (a Richardson "
                           "estimate, order %.0f, safety factor %.0f for two grids)",
                           b.grid_order, b.grid_safety);
}

MethodRows how_computed(const MethodFacts& f) {
    MethodRows rows{{"grid", f.grid}, {"integrator", integrator_words(f.integrator)}, {"heat source", f.source}};
    if (f.hardness) {
        rows.push_back({"hardness model", f.hardness_model});
        rows.push_back({"hardness limit", f.hardness_limit});
    }
    rows.push_back({"how sure", f.bands});
    rows.push_back(known_limits(f));
    return rows;
}

MethodRows merge_how_computed(const std::vector<std::pair<std::string, MethodRows>>& runs) {
    struct Seen {
        std::pair<std::string, std::string> row;
        std::vector<std::string> runs;
    };
    std::vector<Seen> seen;
    for (const auto& [name, rows] : runs) {
        for (const auto& row : rows) {
            auto it = std::find_if(seen.begin(), seen.end(), [&](const Seen& s) { return s.row == row; });
            if (it == seen.end()) it = seen.insert(seen.end(), Seen{row, {}});
            if (it->runs.empty() || it->runs.back() != name) it->runs.push_back(name);
        }
    }
    MethodRows out;
    for (const auto& s : seen) {
        if (s.runs.size() == runs.size()) {
            out.push_back(s.row);
            continue;
        }
        std::string names;
        for (const auto& r : s.runs) names += (names.empty() ? "" : ", ") + r;
        out.push_back({s.row.first + " (" + names + ")", s.row.second});
    }
    return out;
}

std::string how_computed_brief(const MethodFacts& f) {
    std::string s = "grid " + f.grid + "; " + f.integrator + "; source " +
                    (f.source_from_procedure ? "from the procedure's rule of thumb (not calibrated)" : "given");
    if (f.hardness) s += "; hardness " + f.hardness_brief;
    return s + "; conduction only";
}

}  // namespace heatbead::post
