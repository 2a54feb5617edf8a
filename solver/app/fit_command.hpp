// `heatbead fit CASE --measured MEAS.toml`: calibrates the heat source to a measured macro-section
// and/or thermocouple trace (solver/studies/source_fit.hpp) and writes the calibrated case as a new TOML
// file any other command can use (<case>.fitted.toml), fit.json, and fit.html (the predicted
// fusion and HAZ lines before and after the fit, overlaid on the joint).
#pragma once

#include "solver/case/case_reader.hpp"

#include <string>

namespace heatbead {

struct FitOptions {
    std::string measured;  // the measurement file
    std::string out_dir;   // default: results/<case name>
    bool quiet = false;
    int jobs = 0, threads = 0;
};

int fit_command(const LoadedCase& loaded, const FitOptions& options);

}  // namespace heatbead
