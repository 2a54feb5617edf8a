// What `heatbead preheat` (and compare's preheat row) shows of the preheat across the band
// (solver/studies/preheat_band.hpp): the screen lines, the JSON, and the report's marks.
#pragma once

#include "post/preheat_report.hpp"
#include "solver/studies/preheat_band.hpp"

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

namespace heatbead {

// "Band" lines for the screen: the band at each preheat checked, then the answer across it.
std::vector<std::string> band_lines(const PreheatBand& band);
// {across_band_degC, words, runs, run_time_s, checks: [{preheat_degC, within, verdict, hardness_HV: {value, low,
// high}, t8_5_s: {...}, time_to_100_s: {...}}]}.
nlohmann::json band_json(const PreheatBand& band);
// Puts the bands on the report's runs at the preheats checked, the answer across the band, a row in the answer
// table and the "How sure" section.
void add_band_to_report(post::PreheatReportInput& report, const PreheatBand& band);

}  // namespace heatbead
