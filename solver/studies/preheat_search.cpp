#include "solver/studies/preheat_search.hpp"

#include "solver/core/parallel_tasks.hpp"
#include "solver/core/text.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/case/toml_reader.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <limits>
#include <map>
#include <omp.h>

namespace heatbead {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// The case as run at `preheat`: preheat and interpass at least that, and a stop that lets the HAZ
// cool through 500 °C and, for a hydrogen-diffusion limit, through 100 °C or long enough. The
// automatic stop (stop_plan) does both; a stop given in the case is raised clear of the preheat,
// and for a hydrogen-diffusion limit the automatic one replaces it.
Case at_preheat(const Case& base, double preheat) {
    Case c = base;
    c.temperatures.preheat = preheat;
    c.temperatures.interpass = std::max(c.temperatures.interpass, preheat);
    auto& stop = c.solver.stop_temperature;
    if (stop) stop = std::max(*stop, preheat + stop_margin);
    if (const auto& need = c.preheat_search.min_time_to_100; need && preheat < 100) {
        stop.reset();
        c.solver.time_limit += *need + hold_margin;
    }
    return c;
}

void judge(PreheatTrial& t, const Case& c, const RunAnalysis& a, double end_time) {
    const auto& limits = c.preheat_search;
    t.hardness = t.t8_5 = t.time_to_100 = t.hardness_duren = t.hardness_yurioka = nan;
    double held_above_100 = std::numeric_limits<double>::infinity();  // s since the peak, for probes still above
    for (const auto& p : a.probes) {
        if (std::isnan(p.hardness)) continue;
        if (std::isnan(t.hardness) || p.hardness > t.hardness) {
            t.hardness = p.hardness, t.hardest_probe = p.name;
            t.hardness_duren = p.hardness_duren, t.hardness_yurioka = p.hardness_yurioka;
        }
        t.t8_5 = std::isnan(t.t8_5) ? p.figures.t8_5 : std::min(t.t8_5, p.figures.t8_5);
        if (std::isfinite(p.figures.time_to_100)) {
            t.time_to_100 = std::isnan(t.time_to_100) ? p.figures.time_to_100 : std::min(t.time_to_100, p.figures.time_to_100);
        } else {
            held_above_100 = std::min(held_above_100, end_time - p.figures.time_of_peak);
        }
    }
    std::vector<std::string> missed;
    if (std::isnan(t.hardness)) {
        missed.push_back("no HAZ probe at the station reached Ac3 (no fusion line?): nothing to judge");
    } else {
        t.meets_hardness = t.hardness <= limits.hardness_limit;
        if (!t.meets_hardness) {
            missed.push_back(format_text("hardness %.0f HV, %.0f HV over the %.0f HV limit", t.hardness,
                                         t.hardness - limits.hardness_limit, limits.hardness_limit));
        }
        t.meets_t8_5 = !limits.min_t8_5 || t.t8_5 >= *limits.min_t8_5;
        if (!t.meets_t8_5) {
            missed.push_back(format_text("t8/5 %.2f s, %.2f s short of the %.2f s asked", t.t8_5, *limits.min_t8_5 - t.t8_5,
                                         *limits.min_t8_5));
        }
        // Held at or above 100 °C (preheat of 100 °C or more) counts as meeting a hydrogen-diffusion time.
        const double shortest = std::isnan(t.time_to_100) ? held_above_100 : std::min(t.time_to_100, held_above_100);
        t.meets_time_to_100 = !limits.min_time_to_100 || t.preheat >= 100 || shortest >= *limits.min_time_to_100;
        if (!t.meets_time_to_100) {
            missed.push_back(format_text("time to 100 degC %.0f s, %.0f s short of the %.0f s asked", shortest,
                                         *limits.min_time_to_100 - shortest, *limits.min_time_to_100));
        }
    }
    t.passes = missed.empty();
    if (t.passes) {
        t.verdict = "meets every limit";
    } else {
        for (std::size_t i = 0; i < missed.size(); ++i) t.verdict += (i ? "; " : "") + missed[i];
    }
}

}  // namespace

PreheatTrial run_preheat_trial(const Case& base, const mesh::Grid& grid, const Material& material, double preheat,
                               int threads, const std::atomic<bool>& interrupt) {
    const auto start = std::chrono::steady_clock::now();
    omp_set_num_threads(std::max(threads, 1));
    const Case c = at_preheat(base, preheat);
    PreparedRun run = prepare_run(c, grid, material);
    const RunResult result = run.sim->run(interrupt);
    if (!result.completed || interrupt.load()) throw SearchInterrupted();
    PreheatTrial t;
    t.preheat = preheat;
    judge(t, c, analyse_run(c, run), result.end_time);
    t.energy_error = result.energy.error();
    t.wall_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    return t;
}

StandardPreheatInput standard_preheat_input(const Case& c) {
    StandardPreheatInput in;
    in.composition = c.base.composition.value_or(Composition{});
    in.thickness = std::max(c.joint.flange_thickness, c.joint.web_thickness) * 1e3;
    in.hydrogen = c.filler.diffusible_hydrogen.value_or(nan);
    in.heat_input = heat_input(c.procedure) * 1e-6;
    return in;
}

void require_preheat_inputs(const Case& c) {
    std::vector<Diagnostic> missing;
    if (!c.base.composition) {
        missing.push_back({c.file, "base_metal.composition", "",
                           "needed for the HAZ hardness and the carbon equivalents: add a [base_metal.composition] "
                           "table with C, Mn, Si, Cr, Mo, V, Ni, Cu, Nb and B in mass per cent (C required, any "
                           "other left out counts as 0)"});
    }
    if (!c.filler.diffusible_hydrogen) {
        missing.push_back({c.file, "filler.diffusible_hydrogen", "",
                           "needed for the standard method's preheat: the consumable's diffusible hydrogen, e.g. "
                           "\"5 ml/100g\", or its designator such as \"H5\" or \"scale D\""});
    }
    if (!missing.empty()) throw CaseError(std::move(missing));
}

PreheatAnswer find_preheat(const Case& c, int jobs, int threads_per_trial, const std::atomic<bool>& interrupt,
                           const std::function<void(const std::vector<PreheatTrial>&)>& on_trial) {
    require_preheat_inputs(c);
    PreheatAnswer answer;
    answer.standard_input = standard_preheat_input(c);
    answer.standard = en1011_method_b(answer.standard_input);
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    const auto& spec = c.preheat_search;
    // Each preheat is run once, whichever stage asks for it.
    std::map<double, bool> passed_at;
    const auto test = [&](const std::vector<double>& candidates) {
        std::vector<double> fresh;
        for (double p : candidates) {
            if (!passed_at.contains(p)) fresh.push_back(p);
        }
        std::vector<PreheatTrial> done(fresh.size());
        run_side_by_side(0, fresh.size(), [&](std::size_t i) {
            done[i] = run_preheat_trial(c, grid, material, fresh[i], threads_per_trial, interrupt);
        });
        for (auto& t : done) {
            passed_at[t.preheat] = t.passes;
            answer.trials.push_back(std::move(t));
        }
        if (on_trial && !fresh.empty()) on_trial(answer.trials);
        std::vector<bool> passed;
        for (double p : candidates) passed.push_back(passed_at.at(p));
        return passed;
    };
    const bool staged = !spec.highest_given && spec.lowest < usual_preheat_top && spec.highest > usual_preheat_top;
    std::vector<Ladder> stages{{spec.lowest, staged ? usual_preheat_top : spec.highest, spec.resolution}};
    if (staged) stages.push_back({usual_preheat_top, spec.highest, spec.resolution});
    for (const Ladder& ladder : stages) {
        answer.search = find_lowest_passing(ladder, static_cast<std::size_t>(std::max(jobs, 1)), test);
        answer.monotone = answer.monotone && answer.search.monotone;
        answer.searched_to = ladder.highest;
        if (answer.search.lowest_passing) {
            answer.found = ladder.at(*answer.search.lowest_passing);
            break;
        }
    }
    return answer;
}

}  // namespace heatbead
