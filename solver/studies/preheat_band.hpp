// The lowest preheat that meets the limits across the band of the answers it rests on, beside the
// one at the nominal values (solver/studies/preheat_search.hpp):
// 1. The band at the nominal answer P: the hardness, t8/5 and time to 100 °C of the hardened probes,
//    banded as solver/studies/answer_bands.hpp bands a run (the variants run at P).
// 2. The search again, against the band's worst side: each limit tightened by its answer's band
//    half-width at P (hardness limit − w_HV, min t8/5 + w_t8/5, min time to 100 °C + w_t100),
//    from the candidate after P up (more preheat never makes a HAZ harder, the search's own premise).
// 3. Verified by a run: the band at that answer, which must lie within the limits themselves. Where it
//    does not (the band widened with preheat), step 2 runs again with the half-widths found there,
//    at most `max_band_checks` bands in all.
#pragma once

#include "solver/studies/answer_bands.hpp"
#include "solver/studies/preheat_search.hpp"

#include <atomic>
#include <optional>
#include <string>
#include <vector>

namespace heatbead {

inline constexpr int max_band_checks = 3;

// The band at one preheat and whether it lies within the limits.
struct PreheatBandCheck {
    double preheat = 0;      // °C
    Answers nominal;         // "hardness" [HV], "t8_5" [s], "time_to_100" [s] of the nominal run there
    AnswerBands bands;
    bool within = false;     // every band within its limit
    std::string verdict;     // in words: the bands against the limits
};

struct PreheatBand {
    std::vector<PreheatBandCheck> checks;  // at the nominal answer, then at each worst-side answer
    std::vector<PreheatTrial> trials;      // the worst-side searches' runs
    std::optional<double> across;          // °C: the lowest preheat meeting the limits across the band, verified
    std::string words;                     // what was found, for the screen and the pages
    std::size_t runs = 0;                  // extra runs in all
    double wall = 0;                       // s
};

// Nothing to do (and `words` says why) when the nominal search found no preheat.
PreheatBand band_preheat(const Case& c, const PreheatAnswer& nominal, int jobs, int threads,
                         const std::atomic<bool>& interrupt);

// The answers a preheat trial gives, by the keys above.
Answers trial_answers(const PreheatTrial& t);

}  // namespace heatbead
