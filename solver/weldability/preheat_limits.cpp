#include "solver/weldability/preheat_limits.hpp"

#include "solver/core/text.hpp"

#include <algorithm>
#include <stdexcept>

namespace heatbead {

namespace {
constexpr const char* method = "AWS D1.1 hardness-control method (annex on alternative preheat methods, from memory)";
}  // namespace

HardnessLimit hardness_limit_for(std::optional<double> hydrogen) {
    if (!hydrogen) {
        return {general_hardness_limit,
                std::string(method) + ": 350 HV, the general limit, for the filler's diffusible hydrogen is not given"};
    }
    if (*hydrogen <= low_hydrogen_max) {
        return {low_hydrogen_hardness_limit,
                std::string(method) + format_text(": 400 HV with a low-hydrogen filler (%g ml/100 g, at most 5)", *hydrogen)};
    }
    return {general_hardness_limit,
            std::string(method) + format_text(": 350 HV; 400 HV needs diffusible hydrogen at most 5 ml/100 g (this "
                                              "filler: %g)",
                                              *hydrogen)};
}

PreheatCeiling preheat_ceiling(SteelType type, std::optional<double> tempering) {
    if (type == SteelType::c_mn) {
        return {highest_judged_preheat,
                "a C-Mn or normalised steel (base_metal.steel_type \"c_mn\") is not softened by preheat, so the "
                "search may go to 400 degC, the highest heatbead judges"};
    }
    if (!tempering) throw std::invalid_argument("a quenched-and-tempered steel needs its tempering temperature");
    if (*tempering >= highest_judged_preheat) {
        return {highest_judged_preheat,
                format_text("400 degC, the highest heatbead judges, below the steel's %.0f degC tempering temperature",
                            *tempering)};
    }
    return {*tempering, format_text("the %.0f degC tempering temperature of this quenched-and-tempered steel "
                                    "(base_metal.tempering_temperature): held above it, the plate is tempered again",
                                    *tempering)};
}

}  // namespace heatbead
