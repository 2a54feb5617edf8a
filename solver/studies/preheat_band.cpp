#include "solver/studies/preheat_band.hpp"

#include "solver/core/text.hpp"
#include "solver/studies/run_setup.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>

namespace heatbead {

namespace {

// The half-width of a band above (or below) its value; 0 where there is none.
double above(const Band& b) { return b.ok() ? b.high - b.value : 0; }
double below(const Band& b) { return b.ok() ? b.value - b.low : 0; }

const Band& band_of(const PreheatBandCheck& k, const char* key) { return k.bands.bands.at(key); }

// The bands at k.preheat against the case's limits: the hardness band's top within the hardness
// limit, the t8/5 band's bottom above the shortest allowed, the time-to-100 °C band's bottom above
// its limit (a preheat of 100 °C or more meets that one, as the search has it).
void judge(PreheatBandCheck& k, const PreheatSearchSpec& limits) {
    std::vector<std::string> met, missed;
    const auto against = [&](const char* what, const Band& b, const char* unit, int decimals, bool at_most, double limit) {
        if (!b.ok()) {
            missed.push_back(std::string(what) + " has no band (" + b.reason + ")");
            return;
        }
        const bool ok = at_most ? b.high <= limit : b.low >= limit;
        (ok ? met : missed)
            .push_back(format_text("%s %.*f %s (%.*f–%.*f) %s %s %.*f %s", what, decimals, b.value, unit, decimals, b.low,
                                   decimals, b.high, ok ? "within" : "NOT within", at_most ? "at most" : "at least",
                                   decimals, limit, unit));
    };
    against("hardness", band_of(k, "hardness"), "HV", 0, true, limits.hardness_limit);
    if (limits.min_t8_5) against("t8/5", band_of(k, "t8_5"), "s", 2, false, *limits.min_t8_5);
    if (limits.min_time_to_100 && k.preheat < 100)
        against("time to 100 degC", band_of(k, "time_to_100"), "s", 0, false, *limits.min_time_to_100);
    k.within = missed.empty();
    const auto& words = k.within ? met : missed;
    k.verdict = format_text("at %.0f degC: ", k.preheat);
    for (std::size_t i = 0; i < words.size(); ++i) k.verdict += (i ? "; " : "") + words[i];
}

class PreheatBandSearch {
public:
    PreheatBandSearch(const Case& c, int jobs, int threads, const std::atomic<bool>& interrupt)
        : c_(c), jobs_(jobs), threads_(threads), interrupt_(interrupt), grid_(mesh::build_grid(c.joint, c.grid)),
          material_(make_material(c.base)) {}

    // The band at the preheat of `nominal`, a trial of the nominal case.
    PreheatBandCheck check(const PreheatTrial& nominal) {
        PreheatBandCheck k;
        k.preheat = nominal.preheat;
        k.nominal = trial_answers(nominal);
        k.bands = make_bands(
            c_, grid_, material_, k.nominal,
            {{"hardness", hardness_model_scatter(nominal.hardness, nominal.hardness_duren, nominal.hardness_yurioka)}},
            [&](const Case& v, const mesh::Grid& g, const Material& m) {
                return trial_answers(run_preheat_trial(v, g, m, k.preheat, threads_, interrupt_));
            },
            jobs_, threads_);
        judge(k, c_.preheat_search);
        return k;
    }

    // The lowest preheat above `last`'s that meets the limits tightened by `last`'s half-widths; its
    // trial, or none up to the search's highest.
    std::optional<PreheatTrial> worst_side(const PreheatBandCheck& last, std::vector<PreheatTrial>& trials) {
        Case w = c_;
        auto& l = w.preheat_search;
        l.hardness_limit -= above(band_of(last, "hardness"));
        if (l.min_t8_5) *l.min_t8_5 += below(band_of(last, "t8_5"));
        if (l.min_time_to_100) *l.min_time_to_100 += below(band_of(last, "time_to_100"));
        l.lowest = last.preheat + l.resolution;
        if (l.lowest > l.highest) return std::nullopt;
        const PreheatAnswer a = find_preheat(w, jobs_, threads_, interrupt_);
        trials.insert(trials.end(), a.trials.begin(), a.trials.end());
        if (!a.found) return std::nullopt;
        const auto at = std::find_if(a.trials.begin(), a.trials.end(), [&](const auto& t) { return t.preheat == *a.found; });
        return *at;
    }

private:
    const Case& c_;
    const int jobs_, threads_;
    const std::atomic<bool>& interrupt_;
    const mesh::Grid grid_;
    const Material material_;
};

}  // namespace

Answers trial_answers(const PreheatTrial& t) {
    return {{"hardness", t.hardness}, {"t8_5", t.t8_5}, {"time_to_100", t.time_to_100}};
}

PreheatBand band_preheat(const Case& c, const PreheatAnswer& nominal, int jobs, int threads,
                         const std::atomic<bool>& interrupt) {
    PreheatBand out;
    if (!nominal.found) {
        out.words = "no band: no preheat meets the limits at the nominal values";
        return out;
    }
    const auto start = std::chrono::steady_clock::now();
    PreheatBandSearch search(c, jobs, threads, interrupt);
    const auto at_found = std::find_if(nominal.trials.begin(), nominal.trials.end(),
                                       [&](const auto& t) { return t.preheat == *nominal.found; });
    out.checks.push_back(search.check(*at_found));
    while (!out.checks.back().within && static_cast<int>(out.checks.size()) < max_band_checks) {
        const auto next = search.worst_side(out.checks.back(), out.trials);
        if (!next) break;
        out.checks.push_back(search.check(*next));
    }
    if (out.checks.back().within) out.across = out.checks.back().preheat;
    for (const auto& k : out.checks) out.runs += k.bands.runs;
    out.runs += out.trials.size();
    out.wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const double highest = c.preheat_search.highest;
    if (out.across) {
        out.words = format_text("across the band %.0f degC, verified by its band there (%zu extra runs)", *out.across,
                                out.runs);
    } else if (static_cast<int>(out.checks.size()) >= max_band_checks) {
        out.words = format_text("not verified across the band after %d bands (%zu extra runs)", max_band_checks, out.runs);
    } else {
        out.words = format_text("not met across the band up to %.0f degC (preheat_search.highest; %zu extra runs)",
                                highest, out.runs);
    }
    return out;
}

}  // namespace heatbead
