#include "solver/app/preheat_command.hpp"

#include "solver/app/interrupt.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/preheat_report.hpp"
#include "solver/weldability/carbon_equivalent.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/core/text.hpp"
#include "solver/weldability/haz_hardness.hpp"
#include "solver/studies/preheat_search.hpp"
#include "solver/app/run_command.hpp"
#include "solver/app/run_files.hpp"
#include "solver/app/preheat_band_output.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/how_computed.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <thread>

namespace heatbead {

namespace {

// A figure, or "n/a" where the run gave none (NaN).
std::string or_na(const char* format, double v) { return std::isfinite(v) ? format_text(format, v) : "n/a"; }

std::vector<PreheatTrial> by_preheat(std::vector<PreheatTrial> trials) {
    std::sort(trials.begin(), trials.end(), [](const auto& a, const auto& b) { return a.preheat < b.preheat; });
    return trials;
}

// The standard's value as a preheat to apply: never below the search's lowest (no preheat).
double standard_applied(const PreheatAnswer& a, const Case& c) {
    return std::max(a.standard.formula, c.preheat_search.lowest);
}

// The recommended minimum: the higher of the simulation's answer and the standard's value when the
// standard's inputs lie inside its validity (then neither concern, hardness or hydrogen, is left out).
std::optional<double> recommended(const PreheatAnswer& a, const Case& c) {
    if (!a.found) return std::nullopt;
    if (!a.standard.outside_validity.empty()) return a.found;
    return std::max(*a.found, std::ceil(standard_applied(a, c) / 5) * 5);
}

std::string limits_text(const Case& c) {
    const auto& l = c.preheat_search;
    std::string s = "hardness at most " + format_text("%.0f HV", l.hardness_limit) + " (" + l.hardness_limit_source + ")";
    if (l.min_t8_5) s += ", t8/5 at least " + format_text("%.2g s", *l.min_t8_5);
    if (l.min_time_to_100) s += ", time to 100 degC at least " + format_text("%.0f s", *l.min_time_to_100);
    return s + " at every hardened HAZ probe of the station";
}

// The search's verdict when nothing passed: how far it looked, why it stopped there, and what the
// highest preheat tried misses and by how much.
std::string not_met_text(const PreheatAnswer& a, const Case& c) {
    const auto trials = by_preheat(a.trials);
    const auto& top = trials.back();
    return "not met up to " + format_text("%.0f degC", a.searched_to) + ", " + c.preheat_search.highest_reason +
           "; at " + format_text("%.0f degC", top.preheat) + ": " + top.verdict;
}

// The range the search looked through, in stages, and why it ends where it does.
std::string searched_text(const PreheatAnswer& a, const Case& c) {
    const auto& spec = c.preheat_search;
    std::string s = format_text("%.0f to ", spec.lowest);
    if (a.searched_to > usual_preheat_top && !spec.highest_given && spec.lowest < usual_preheat_top) {
        s += format_text("%.0f °C, where nothing passed, then on to ", usual_preheat_top);
    }
    s += format_text("%.0f °C", a.searched_to);
    if (a.searched_to < spec.highest) return s + format_text(" (it would have gone on to %.0f °C had nothing passed: ", spec.highest) + spec.highest_reason + ")";
    return s + ": " + spec.highest_reason;
}

// Plain words on what each answer rests on and why they differ here.
std::string explanation(const PreheatAnswer& a, const Case& c) {
    const auto trials = by_preheat(a.trials);
    const auto& in = a.standard_input;
    std::string s;
    if (!a.found) {
        const auto& top = trials.back();
        s = "In the simulation the limits are " + not_met_text(a, c) + ".";
        const double needed = critical_t8_5(*c.base.composition, c.preheat_search.hardness_limit, top.preheat);
        if (std::isfinite(needed) && needed > 0 && std::isfinite(top.t8_5)) {
            s += " For " + format_text("%.0f HV", c.preheat_search.hardness_limit) + " this steel needs a t8/5 of about " +
                 format_text("%.1f s", needed) + " (hardness formulas); this joint gives " + format_text("%.1f s", top.t8_5) + " there.";
        }
        if (c.preheat_search.highest_given) {
            return s + " No higher preheat was tried: raise preheat_search.highest to search further, up to what the "
                       "steel tolerates.";
        }
        return s + " Preheat up to what this steel tolerates does not bring this joint within the limits: a higher "
                   "heat input, a steel of lower carbon equivalent or a heat treatment under the governing code are "
                   "the usual next steps.";
    }
    const auto at_found = std::find_if(trials.begin(), trials.end(), [&](const auto& t) { return t.preheat == *a.found; });
    s = "The simulation sets preheat by the hardness of the coarse-grained HAZ at this joint's own cooling: at " +
        format_text("%.0f degC", *a.found) + " the hardest probe (" + at_found->hardest_probe + ") reaches " +
        format_text("%.0f HV", at_found->hardness) + " with t8/5 " + format_text("%.2f s", at_found->t8_5) + ".";
    if (at_found != trials.begin()) {
        const auto below = std::prev(at_found);
        s += " At " + format_text("%.0f degC", below->preheat) + " it misses: " + below->verdict + ".";
    }
    const double needed = critical_t8_5(*c.base.composition, c.preheat_search.hardness_limit, *a.found);
    if (std::isfinite(needed) && needed > 0) {
        s += " For " + format_text("%.0f HV", c.preheat_search.hardness_limit) + " this steel needs a t8/5 of about " +
             format_text("%.1f s", needed) + " (hardness formulas); a higher heat input lengthens t8/5 too.";
    }
    s += " EN 1011-2 method B is an empirical fit to hydrogen-cracking tests: it sets preheat from CET " +
         format_text("%.2f", a.standard.cet) + ", plate thickness " + format_text("%.0f mm", in.thickness) + ", diffusible hydrogen " +
         format_text("%.0f ml/100 g", in.hydrogen) + " and heat input " + format_text("%.2f kJ/mm", in.heat_input) +
         ", with no model of this joint's heat flow; the simulation has no model of hydrogen or restraint.";
    const double standard = standard_applied(a, c);
    const double difference = *a.found - standard;
    if (std::abs(difference) <= 20) {
        s += " Here the two agree within 20 degC.";
    } else if (difference > 0) {
        s += " Here the simulation asks for more: this joint's HAZ cools fast enough that hardness, not hydrogen, "
             "governs; the standard's fit does not see the heat flowing into both plates of a tee. The hardness "
             "limit is " + c.preheat_search.hardness_limit_source + "; the governing code sets the limit "
             "(preheat_search.hardness_limit).";
    } else {
        s += " Here the standard asks for more: at this hydrogen level and thickness it guards against hydrogen "
             "cracking in a HAZ that is not too hard, which a hardness limit alone does not see. Keep the "
             "standard's value unless a qualified procedure shows otherwise.";
    }
    if (!a.standard.outside_validity.empty()) {
        s += " The standard's inputs lie outside its formula's validity (see the warnings): its value is for "
             "orientation only.";
    }
    return s;
}

std::string runs_csv(const std::vector<PreheatTrial>& trials) {
    std::string out = "preheat [degC],hardness [HV],hardest probe,Duren [HV],Yurioka [HV],t8/5 [s],time to 100 degC [s],meets hardness,"
                      "meets t8/5,meets time to 100 degC,passes,verdict,energy balance error [%],run time [s]\n";
    const auto num = [](double v, const char* format) { return std::isfinite(v) ? format_text(format, v) : std::string(); };
    const auto yes = [](bool b) { return std::string(b ? "yes" : "no"); };
    for (const auto& t : by_preheat(trials)) {
        std::string verdict = t.verdict;
        std::replace(verdict.begin(), verdict.end(), ',', ';');
        out += num(t.preheat, "%.1f") + "," + num(t.hardness, "%.1f") + "," + t.hardest_probe + "," +
               num(t.hardness_duren, "%.1f") + "," + num(t.hardness_yurioka, "%.1f") + "," + num(t.t8_5, "%.3f") + "," + num(t.time_to_100, "%.1f") + "," + yes(t.meets_hardness) + "," +
               yes(t.meets_t8_5) + "," + yes(t.meets_time_to_100) + "," + yes(t.passes) + ",\"" + verdict + "\"," +
               num(t.energy_error * 100, "%.4f") + "," + num(t.wall_seconds, "%.1f") + "\n";
    }
    return out;
}

std::vector<std::string> warnings(const PreheatAnswer& a, const Case& c) {
    std::vector<std::string> w;
    for (const auto& v : a.standard.outside_validity) w.push_back("EN 1011-2 method B: " + v);
    for (const auto& v : hardness_validity(*c.base.composition)) w.push_back("hardness estimate: " + v);
    if (a.found) {
        if (auto hot = unusual_preheat_warning(*a.found); !hot.empty()) w.push_back("the simulation's answer: " + hot);
        const auto trials = by_preheat(a.trials);
        const auto at = std::find_if(trials.begin(), trials.end(), [&](const auto& t) { return t.preheat == *a.found; });
        if (auto gap = hardness_disagreement(at->hardness_duren, at->hardness_yurioka); !gap.empty()) {
            w.push_back("at " + format_text("%.0f degC", *a.found) + ", " + at->hardest_probe + ": " + gap);
        }
    }
    if (!a.monotone) {
        w.push_back("the limits were not met monotonically with preheat (a higher preheat failed where a lower one "
                    "passed): the answer is the lowest pass above every failure; refine the grid and check");
    }
    for (const auto& t : a.trials) {
        if (std::abs(t.energy_error) > 0.01) {
            w.push_back("the run at " + format_text("%.0f degC", t.preheat) + " has an energy balance error of " +
                        format_text("%.2f %%", t.energy_error * 100) + ": refine the grid");
        }
    }
    for (const auto& x : c.warnings) w.push_back(x);
    return w;
}

nlohmann::json to_json(const PreheatAnswer& a, const Case& c) {
    nlohmann::json j;
    const auto value = [](std::optional<double> v) { return v ? nlohmann::json(*v) : nlohmann::json(nullptr); };
    const auto finite = [](double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr); };
    j["case"] = c.file;
    j["limits"] = {{"hardness_limit_HV", c.preheat_search.hardness_limit},
                   {"hardness_limit_source", c.preheat_search.hardness_limit_source},
                   {"min_t8_5_s", value(c.preheat_search.min_t8_5)},
                   {"min_time_to_100_s", value(c.preheat_search.min_time_to_100)}};
    j["search"] = {{"lowest_degC", c.preheat_search.lowest},
                   {"highest_degC", c.preheat_search.highest},
                   {"highest_reason", c.preheat_search.highest_reason},
                   {"searched_to_degC", a.searched_to}};
    j["simulation_preheat_degC"] = value(a.found);
    j["not_met"] = a.found ? nlohmann::json(nullptr) : nlohmann::json(not_met_text(a, c));
    j["standard"] = {{"method", "EN 1011-2:2001 Annex C.3 method B"},
                     {"preheat_degC", a.standard.formula},
                     {"cet", a.standard.cet},
                     {"thickness_mm", a.standard_input.thickness},
                     {"diffusible_hydrogen_ml_per_100g", a.standard_input.hydrogen},
                     {"heat_input_kJ_per_mm", a.standard_input.heat_input},
                     {"outside_validity", a.standard.outside_validity}};
    j["recommended_minimum_degC"] = value(recommended(a, c));
    const auto ce = carbon_equivalents(*c.base.composition);
    j["carbon_equivalents"] = {{"CE_IIW", ce.iiw}, {"Pcm", ce.pcm}, {"CEN", ce.cen}, {"CET", ce.cet}};
    j["critical_t8_5_s"] = finite(critical_t8_5(*c.base.composition, c.preheat_search.hardness_limit, c.preheat_search.lowest));
    j["explanation"] = explanation(a, c);
    j["runs"] = nlohmann::json::array();
    for (const auto& t : by_preheat(a.trials)) {
        j["runs"].push_back({{"preheat_degC", t.preheat}, {"hardness_HV", finite(t.hardness)},
                             {"hardest_probe", t.hardest_probe}, {"hardness_duren_HV", finite(t.hardness_duren)},
                             {"hardness_yurioka_HV", finite(t.hardness_yurioka)}, {"t8_5_s", finite(t.t8_5)},
                             {"time_to_100_s", finite(t.time_to_100)}, {"passes", t.passes}, {"verdict", t.verdict},
                             {"energy_balance_error", t.energy_error}, {"run_time_s", t.wall_seconds}});
    }
    j["warnings"] = warnings(a, c);
    j["caution"] = post::preheat_caution;
    return j;
}

post::PreheatReportInput report_input(const PreheatAnswer& a, const Case& c) {
    post::PreheatReportInput r;
    r.title = "Preheat: " + std::filesystem::path(c.file).stem().string();
    r.case_file = c.file;
    r.created = now_utc();
    const auto rec = recommended(a, c);
    r.answer = {{"Limits", limits_text(c)},
                {"Searched", searched_text(a, c)},
                {"Simulation (lowest preheat meeting the limits)", a.found ? format_text("%.0f °C", *a.found) : not_met_text(a, c)},
                {"EN 1011-2 method B", format_text("%.0f °C", a.standard.formula) +
                                           (a.standard.formula < c.preheat_search.lowest ? " (no preheat)" : "")},
                {"Recommended minimum preheat and interpass", rec ? format_text("%.0f °C", *rec) : "none: see below"}};
    r.explanation = explanation(a, c);
    const auto& comp = *c.base.composition;
    const auto ce = carbon_equivalents(comp);
    r.inputs = {{"Composition (mass %)", format_text("C %.3g", comp.C) + format_text(", Mn %.3g", comp.Mn) + format_text(", Si %.3g", comp.Si) +
                                             format_text(", Cr %.3g", comp.Cr) + format_text(", Mo %.3g", comp.Mo) + format_text(", V %.3g", comp.V) +
                                             format_text(", Ni %.3g", comp.Ni) + format_text(", Cu %.3g", comp.Cu) +
                                             format_text(", Nb %.3g", comp.Nb) + format_text(", B %.3g", comp.B)},
                {"Carbon equivalents", format_text("CE(IIW) %.3f", ce.iiw) + format_text(", Pcm %.3f", ce.pcm) + format_text(", CEN %.3f", ce.cen) +
                                           format_text(", CET %.3f", ce.cet)},
                {"Plate thickness for the standard", format_text("%.1f mm (the thicker plate)", a.standard_input.thickness)},
                {"Diffusible hydrogen", format_text("%.1f ml/100 g", a.standard_input.hydrogen)},
                {"Heat input (EN 1011-1)", format_text("%.3f kJ/mm", a.standard_input.heat_input)},
                {"Hardness estimate", "the higher of Düren (1986) from t8/5, bounded by the Maynier et al. (1978) "
                                      "phase hardnesses, and Yurioka et al. (1987) from t8/5 (coefficients of both from memory)"}};
    for (const auto& t : a.trials) {
        r.runs.push_back({t.preheat, t.hardness, t.hardest_probe, t.hardness_duren, t.hardness_yurioka, t.t8_5,
                          t.time_to_100, t.passes, t.verdict});
    }
    r.hardness_limit = c.preheat_search.hardness_limit;
    r.min_t8_5 = c.preheat_search.min_t8_5;
    r.min_time_to_100 = c.preheat_search.min_time_to_100;
    if (a.found) {
        const double needed = critical_t8_5(*c.base.composition, c.preheat_search.hardness_limit, *a.found);
        if (std::isfinite(needed) && needed > 0) r.critical_t8_5 = needed;
    }
    r.found = a.found;
    r.standard = standard_applied(a, c);
    r.warnings = warnings(a, c);
    r.caution = post::preheat_caution;
    return r;
}

void print_round(const std::vector<PreheatTrial>& trials, std::size_t from) {
    for (std::size_t i = from; i < trials.size(); ++i) {
        const auto& t = trials[i];
        std::printf("  %6.0f degC  %5s HV (Duren %3s, Yurioka %3s)  %-20s  t8/5 %6s s  to 100 degC %7s s  %s\n", t.preheat,
                    or_na("%.0f", t.hardness).c_str(), or_na("%.0f", t.hardness_duren).c_str(),
                    or_na("%.0f", t.hardness_yurioka).c_str(), t.hardest_probe.c_str(), or_na("%.2f", t.t8_5).c_str(),
                    or_na("%.0f", t.time_to_100).c_str(), t.passes ? "pass" : ("FAIL: " + t.verdict).c_str());
    }
    std::fflush(stdout);
}

}  // namespace

int preheat_command(const LoadedCase& loaded, const PreheatOptions& options) {
    catch_interrupts();
    const Case& c = loaded.value;
    require_preheat_inputs(c);
    const std::filesystem::path out = options.out_dir.empty()
                                          ? std::filesystem::path("results") / std::filesystem::path(c.file).stem()
                                          : std::filesystem::path(options.out_dir);
    const int cores = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
    const int jobs = options.jobs > 0 ? options.jobs : cores;
    const int threads = options.threads > 0 ? options.threads : std::max(1, cores / jobs);
    if (!options.quiet) {
        std::printf("heatbead preheat  %s  (%d run%s at a time, %d thread%s each)\n", c.file.c_str(), jobs,
                    jobs == 1 ? "" : "s", threads, threads == 1 ? "" : "s");
        std::printf("Limits      %s\n", limits_text(c).c_str());
        const auto& spec = c.preheat_search;
        if (!spec.highest_given && spec.lowest < usual_preheat_top && spec.highest > usual_preheat_top) {
            std::printf("Searching   %.0f to %.0f degC in steps of %.0f K; if nothing passes, on to %.0f degC (%s)\n",
                        spec.lowest, usual_preheat_top, spec.resolution, spec.highest, spec.highest_reason.c_str());
        } else {
            std::printf("Searching   %.0f to %.0f degC in steps of %.0f K (%s)\n", spec.lowest, spec.highest,
                        spec.resolution, spec.highest_reason.c_str());
        }
        std::fflush(stdout);
    }
    const auto runs_file = out / "preheat_runs.csv";
    std::size_t printed = 0;
    const auto on_round = [&](const std::vector<PreheatTrial>& trials) {
        post::write_file_atomically(runs_file, runs_csv(trials));
        if (!options.quiet) print_round(trials, printed);
        printed = trials.size();
    };
    const auto start = std::chrono::steady_clock::now();
    PreheatAnswer answer;
    double wall = 0;  // s the search took (the band's runs are timed apart)
    std::optional<PreheatBand> band;
    try {
        answer = find_preheat(c, jobs, threads, interrupt_flag(), on_round);
        wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        if (c.bands.enabled && answer.found) {
            if (!options.quiet) {
                std::printf("Bands       the band at %.0f degC, then the search against its worst side\n", *answer.found);
                std::fflush(stdout);
            }
            band = band_preheat(c, answer, jobs, threads, interrupt_flag());
        }
    } catch (const SearchInterrupted&) {
        std::fprintf(stderr, "heatbead: preheat search interrupted; the %zu runs finished are in %s, no answer was "
                             "written\n", printed, runs_file.string().c_str());
        return exit_code::run_failed;
    }
    nlohmann::json json = to_json(answer, c);
    json["band"] = band ? band_json(*band) : nlohmann::json(nullptr);
    if (!band) json["no_band"] = c.bands.enabled ? "no preheat meets the limits at the nominal values" : "bands.enabled = false";
    post::write_file_atomically(out / "preheat.json", json.dump(2) + "\n");
    post::PreheatReportInput report = report_input(answer, c);
    if (band) add_band_to_report(report, *band);
    report.how_computed = post::how_computed(method_facts(c));
    post::write_preheat_report(out / "preheat.html", report);

    if (!options.quiet) {
        const auto& in = answer.standard_input;
        const auto ce = carbon_equivalents(*c.base.composition);
        const auto rec = recommended(answer, c);
        std::printf("Runs        %zu in %.0f s\n", answer.trials.size(), wall);
        std::printf("Simulation  %s\n", answer.found ? ("lowest preheat meeting the limits: " + format_text("%.0f degC", *answer.found)).c_str()
                                                     : not_met_text(answer, c).c_str());
        if (band) {
            for (const auto& line : band_lines(*band)) std::printf("Band        %s\n", line.c_str());
        }
        std::printf("Standard    EN 1011-2 method B (CET %.3f, d %.0f mm, HD %.0f ml/100g, Q %.2f kJ/mm): %.0f degC%s\n",
                    answer.standard.cet, in.thickness, in.hydrogen, in.heat_input, answer.standard.formula,
                    answer.standard.formula < c.preheat_search.lowest ? " (no preheat)" : "");
        std::printf("Recommended %s\n", rec ? ("minimum preheat and interpass " + format_text("%.0f degC", *rec)).c_str()
                                            : format_text("none: the limits are not met up to %.0f degC (above)", answer.searched_to).c_str());
        std::printf("Carbon eq.  CE(IIW) %.3f, Pcm %.3f, CEN %.3f, CET %.3f\n", ce.iiw, ce.pcm, ce.cen, ce.cet);
        std::printf("Why         %s\n", explanation(answer, c).c_str());
        for (const auto& w : warnings(answer, c)) std::printf("Warning     %s\n", w.c_str());
        std::printf("Files       %s, preheat.html, preheat_runs.csv\n", (out / "preheat.json").string().c_str());
        std::printf("Caution     %s\n", post::preheat_caution);
        std::printf("Method      %s\n", post::how_computed_brief(method_facts(c)).c_str());
    }
    for (const auto& t : answer.trials) {
        if (std::abs(t.energy_error) > 0.01) return exit_code::outside_validity;
    }
    return exit_code::ok;
}

}  // namespace heatbead
