// Calibrating the heat source to measurements: weighted least squares of the misfit between a
// full run's predictions and what was measured, over the unknowns the user picks (arc efficiency
// and Goldak dimensions), minimised by Levenberg–Marquardt (Marquardt 1963) with forward-difference
// Jacobians whose runs go in parallel. Unknowns are fitted as θ = ln(p/p₀), so they stay positive
// and steps are relative; each is kept within [p₀/4, 4p₀] (efficiency within 0.3–1).
//
// Residual of a section measurement: (predicted − measured)/uncertainty; of a thermocouple: at up
// to 40 of its samples, (T_predicted(t) − T_measured(t))/uncertainty, T_predicted interpolated in
// the recorded probe cycle. Approximate 95 % intervals come from the covariance s²·(JᵀJ)⁻¹ at the
// solution (s² the misfit per degree of freedom when there are more residuals than unknowns, else
// 1); an unknown whose Jacobian column is tiny, or two whose columns are nearly parallel, are
// reported as not identifiable from the data given. Cases finer than 1 mm are fitted on twice
// their spacing first, then refined on their own grid (at most 4 more iterations).
#pragma once

#include "mesh/grid.hpp"
#include "post/cross_section.hpp"
#include "solver/case/case.hpp"
#include "solver/studies/fit_measurements.hpp"
#include "solver/physics/material.hpp"

#include <atomic>
#include <functional>
#include <string>
#include <vector>

namespace heatbead {

struct Prediction {
    std::vector<double> values;  // per residual: the predicted quantity (m, m², °C)
    std::vector<double> residuals;
    double misfit = 0;           // Σ residual²
    std::vector<post::Polyline> fusion_line, haz_line;  // the station's solidus and Ac1 lines
};

struct FittedUnknown {
    std::string name;
    double start = 0, value = 0, low = 0, high = 0;  // internal units; low/high: approximate 95 % interval
};

struct FitResult {
    std::vector<FittedUnknown> unknowns;
    std::vector<std::string> labels;     // per residual: "penetration_flange", "thermocouple at 12.0 s", ...
    std::vector<double> measured, uncertainty;
    Prediction before, after;
    int runs = 0, iterations = 0;
    std::vector<std::string> warnings;   // identifiability and stops
    Case fitted;                         // the case with the fitted source (shape "given") and efficiency
};

// The unknown's current value in a case, and a case with it set (the source becomes "given").
double unknown_value(const Case& c, const std::string& name);
void set_unknown(Case& c, const std::string& name, double value);

// Fits; `jobs` runs at a time, `threads` each; `interrupt` stops it (polled every step of every run);
// `progress` gets a line per iteration.
FitResult fit_source(const Case& c, const Measurements& m, int jobs, int threads, const std::atomic<bool>& interrupt,
                     const std::function<void(const std::string&)>& progress = {});

}  // namespace heatbead
