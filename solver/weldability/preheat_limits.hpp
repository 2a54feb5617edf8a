// What the preheat search aims at and how far it may go, from the filler and the steel:
//
// - The HAZ hardness limit, by the hardness-control method of AWS D1.1/D1.1M's annex "Guideline
//   on Alternative Methods for Determining Preheat" (Annex H in the 2010–2015 editions; annex,
//   clause and values from memory): a HAZ kept below a critical hardness does not crack, 350 HV in
//   general and 400 HV with a low-hydrogen filler. The method takes no restraint (restraint enters
//   the annex's other method, hydrogen control). Which fillers count as low hydrogen is ours:
//   diffusible hydrogen at most 5 ml/100 g (the H4 and H5 classes).
// - The highest preheat the steel tolerates. C–Mn and normalised structural steels are stress
//   relieved at 550–620 °C without harm (common practice, no source), so preheat does not soften
//   them: their ceiling is the highest preheat heatbead judges, 400 °C (above about 450 °C the HAZ
//   of a run no longer cools through 500 °C in time for a t8/5). A quenched-and-tempered steel
//   is tempered again, and softened, by holding above its tempering temperature: that is its
//   ceiling (from memory; steel makers' own interpass limits are often far lower, 200–250 °C).
#pragma once

#include <array>
#include <optional>
#include <string>
#include <string_view>

namespace heatbead {

inline constexpr double general_hardness_limit = 350;       // HV
inline constexpr double low_hydrogen_hardness_limit = 400;  // HV
inline constexpr double low_hydrogen_max = 5;               // ml/100 g (ours)

struct HardnessLimit {
    double hv = general_hardness_limit;
    std::string source;  // where it comes from, in words
};
// The default limit for a filler of this diffusible hydrogen [ml/100 g] (none: not given).
HardnessLimit hardness_limit_for(std::optional<double> hydrogen);

enum class SteelType { c_mn, quenched_tempered };
inline constexpr std::array<std::string_view, 2> steel_type_names{"c_mn", "quenched_tempered"};

// The highest preheat heatbead judges [°C] (see above).
inline constexpr double highest_judged_preheat = 400;

struct PreheatCeiling {
    double temperature = highest_judged_preheat;  // °C
    std::string reason;                           // why, in words
};
// The steel's ceiling; `tempering` [°C] is required for a quenched-and-tempered steel.
PreheatCeiling preheat_ceiling(SteelType type, std::optional<double> tempering);

}  // namespace heatbead
