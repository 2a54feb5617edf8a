#include "solver/app/compare_command.hpp"

#include "solver/app/interrupt.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/compare_report.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/core/parallel_tasks.hpp"
#include "solver/core/text.hpp"
#include "solver/studies/preheat_search.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/app/run_command.hpp"
#include "solver/app/run_files.hpp"
#include "solver/studies/answer_bands.hpp"
#include "solver/studies/how_computed.hpp"
#include "solver/studies/preheat_band.hpp"
#include "solver/studies/run_setup.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <map>
#include <memory>
#include <omp.h>
#include <thread>

namespace heatbead {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// A figure, or "n/a" where the runs gave none (NaN).
std::string or_na(const char* format, double v) { return std::isfinite(v) ? format_text(format, v) : "n/a"; }

// The summary item `key`, if the run has one.
const post::SummaryItem* item(const post::Summary& s, const std::string& key) {
    for (const auto& i : s.items())
        if (i.key == key) return &i;
    return nullptr;
}

// A summary figure (NaN where the run has none).
double summary_value(const post::Summary& s, const std::string& key) {
    const post::SummaryItem* i = item(s, key);
    return i && !i->missing() && i->value ? *i->value : std::numeric_limits<double>::quiet_NaN();
}

// One case's run and what it means.
struct Outcome {
    std::string name;
    const Case* c = nullptr;
    RunResult result;
    RunAnalysis analysis;
    post::Summary summary;
    double wall = 0;
    std::optional<PreheatAnswer> preheat;
    std::optional<AnswerBands> bands;         // none: turned off for this case
    std::optional<PreheatBand> preheat_band;  // none: off, or no preheat found
};

// Figures the table and the words use, NaN where not available.
struct Figures {
    double heat_input, deposited, leg_flange, leg_web, pen_flange, pen_web, past_root, fused, dilution;
    double haz_flange, haz_web, t85_lo, t85_hi, rate_540, peak_lo, peak_hi, hardness, preheat, standard;
    bool root_fused;
};

Figures figures_of(const Outcome& o) {
    const auto& x = o.analysis.section;
    const auto& c = *o.c;
    Figures f{};
    f.heat_input = heat_input(c.procedure) * 1e-6;
    const auto d = deposition(c.procedure);
    f.deposited = d ? d->area * 1e6 : nan;
    f.leg_flange = x.fused_leg_flange * 1e3, f.leg_web = x.fused_leg_web * 1e3;
    f.pen_flange = x.penetration_flange * 1e3, f.pen_web = x.penetration_web * 1e3;
    // How far the fusion reaches past the root corner along the bisector (actual − design throat).
    f.past_root = (x.actual_throat - x.design_throat) * 1e3;
    f.fused = x.fused_area * 1e6, f.dilution = x.dilution * 100;
    f.haz_flange = x.haz_width_flange * 1e3, f.haz_web = x.haz_width_web * 1e3;
    f.root_fused = x.root_fused;
    // The cooling figures at the HAZ probes, as the run's summary gives them.
    f.t85_lo = summary_value(o.summary, "t8_5_min"), f.t85_hi = summary_value(o.summary, "t8_5_max");
    f.rate_540 = summary_value(o.summary, "cooling_rate_540");
    f.peak_lo = summary_value(o.summary, "haz_peak_min"), f.peak_hi = summary_value(o.summary, "haz_peak_max");
    const ProbeResult* hardest = o.analysis.hardest();
    f.hardness = hardest ? hardest->hardness : nan;
    f.preheat = o.preheat && o.preheat->found ? *o.preheat->found : nan;
    f.standard = o.preheat ? o.preheat->standard.formula : nan;
    return f;
}

// A summary figure in `format`, or in its place why the run has none.
std::string summary_cell(const Outcome& o, const char* key, const char* format) {
    const post::SummaryItem* i = item(o.summary, key);
    if (!i) return "not computed";
    return i->missing() ? "none (" + i->reason + ")" : format_text(format, *i->value) + post::band_text(*i);
}

// The band of a summary figure, " (1.10–1.60)", or "".
std::string band_of(const Outcome& o, const char* key) {
    const post::SummaryItem* i = item(o.summary, key);
    return i ? post::band_text(*i) : "";
}

// Two summary figures as a range "lo-hi", or why the run has none.
std::string summary_range(const Outcome& o, const char* lo, const char* hi, const char* lo_format, const char* hi_format) {
    const post::SummaryItem *a = item(o.summary, lo), *b = item(o.summary, hi);
    if (!a || !b || a->missing() || b->missing()) return summary_cell(o, a && !a->missing() ? hi : lo, "%g");
    const bool banded = a->has_band() || b->has_band();
    return format_text(lo_format, *a->value) + post::band_text(*a) + (banded ? " to " : "-") +
           format_text(hi_format, *b->value) + post::band_text(*b);
}

// "complete", or what the run's summary lacks and why.
std::string outputs_status(const Outcome& o) {
    const auto missing = o.summary.missing();
    return missing.empty() ? "complete" : post::missing_text(missing);
}

// The table: one row per quantity (its label, then one cell per case), as the report page takes it.
using Rows = decltype(post::CompareReportInput::rows);

Rows table(const std::vector<Outcome>& outcomes) {
    Rows rows;
    const auto row = [&](std::string label, auto cell) {
        std::vector<std::string> cells;
        for (const auto& o : outcomes) cells.push_back(cell(o, figures_of(o)));
        rows.emplace_back(std::move(label), std::move(cells));
    };
    row("procedure", [](const Outcome& o, const Figures&) {
        const auto& p = o.c->procedure;
        return std::string(to_string(p.process)) + (p.transfer == Transfer::none ? "" : " " + std::string(to_string(p.transfer))) +
               ", " + or_na("%.0f A", p.current) + ", " + or_na("%.1f V", p.voltage) + ", " + or_na("%.1f mm/s", p.travel_speed * 1e3);
    });
    row("heat input", [](const Outcome&, const Figures& f) { return or_na("%.3f kJ/mm", f.heat_input); });
    row("deposited area", [](const Outcome& o, const Figures& f) {
        return std::isfinite(f.deposited) ? format_text("%.1f mm2", f.deposited)
                                          : "not computed (" + missing_wire_data(o.c->procedure) + ")";
    });
    const auto legs = [](const mesh::Fillet& b) {
        return or_na("%.1f", b.leg_flange * 1e3) + " x " + or_na("%.1f mm", b.leg_web * 1e3);
    };
    row("legs asked (flange x web)", [&](const Outcome& o, const Figures&) { return legs(o.c->bead.asked); });
    row("legs laid (flange x web)", [&](const Outcome& o, const Figures&) {
        return legs(mesh::fillet_of(o.c->joint)) + (o.c->bead.from_wire ? " (from the wire)" : " (as asked)");
    });
    row("fused legs (flange x web)", [](const Outcome&, const Figures& f) { return or_na("%.1f", f.leg_flange) + " x " + or_na("%.1f mm", f.leg_web); });
    row("penetration into flange", [](const Outcome& o, const Figures& f) { return or_na("%.2f mm", f.pen_flange) + band_of(o, "penetration_flange"); });
    row("penetration into web", [](const Outcome& o, const Figures& f) { return or_na("%.2f mm", f.pen_web) + band_of(o, "penetration_web"); });
    row("fusion past the root", [](const Outcome&, const Figures& f) { return or_na("%.2f mm", f.past_root); });
    row("root fused", [](const Outcome&, const Figures& f) { return std::string(f.root_fused ? "yes" : "NO"); });
    row("fused area, dilution", [](const Outcome& o, const Figures& f) {
        return or_na("%.1f mm2", f.fused) + band_of(o, "fused_area") + ", " + or_na("%.0f %%", f.dilution);
    });
    row("HAZ width (flange, web)", [](const Outcome&, const Figures& f) { return or_na("%.2f", f.haz_flange) + ", " + or_na("%.2f mm", f.haz_web); });
    row("t8/5 at the HAZ probes", [](const Outcome& o, const Figures&) { return summary_range(o, "t8_5_min", "t8_5_max", "%.2f", "%.2f s"); });
    row("fastest cooling at 540 degC", [](const Outcome& o, const Figures&) { return summary_cell(o, "cooling_rate_540", "%.0f K/s"); });
    row("peak at the HAZ probes", [](const Outcome& o, const Figures&) { return summary_range(o, "haz_peak_min", "haz_peak_max", "%.0f", "%.0f degC"); });
    row("HAZ hardness (max)", [](const Outcome& o, const Figures&) {
        return o.c->base.composition ? summary_cell(o, "haz_hardness_max", "%.0f HV")
                                     : std::string("not estimated (no composition in the case)");
    });
    row("lowest preheat (simulation)", [](const Outcome& o, const Figures& f) {
        if (!o.preheat) return std::string("not searched");
        if (!o.preheat->found) return "not met up to " + or_na("%.0f degC", o.preheat->searched_to);
        const std::string across = !o.preheat_band           ? ""
                                   : o.preheat_band->across ? "; across the band " + or_na("%.0f degC", *o.preheat_band->across)
                                                            : "; across the band: not met";
        return or_na("%.0f degC", f.preheat) + across;
    });
    row("preheat EN 1011-2 method B", [](const Outcome& o, const Figures& f) {
        return o.preheat ? or_na("%.0f degC", f.standard) : std::string("not computed");
    });
    row("run time", [](const Outcome& o, const Figures&) { return or_na("%.1f s", o.wall); });
    row("outputs", [](const Outcome& o, const Figures&) { return outputs_status(o); });
    return rows;
}

std::string percent_more(double a, double b) { return or_na("%.0f %%", 100 * (a / b - 1)); }

// The differences of each case against the first, in words a welder uses.
std::vector<std::string> differences(const std::vector<Outcome>& outcomes) {
    std::vector<std::string> out;
    const Figures base = figures_of(outcomes.front());
    const std::string& a = outcomes.front().name;
    const bool all_root = std::all_of(outcomes.begin(), outcomes.end(), [](const Outcome& o) { return o.analysis.section.root_fused; });
    const bool no_root = std::none_of(outcomes.begin(), outcomes.end(), [](const Outcome& o) { return o.analysis.section.root_fused; });
    if (all_root) out.push_back(outcomes.size() == 2 ? "Both fuse the root." : "All fuse the root.");
    if (no_root) out.push_back("None fuses the root.");
    for (std::size_t i = 1; i < outcomes.size(); ++i) {
        const Figures f = figures_of(outcomes[i]);
        const std::string& b = outcomes[i].name;
        const auto deeper = [&](double fb, double fa, const char* where) {
            const double d = fb - fa;
            if (!std::isfinite(d) || std::abs(d) < 0.05) return std::string();
            return b + " fuses " + or_na("%.1f mm", std::abs(d)) + (d > 0 ? " deeper " : " less deep ") + where + " than " + a;
        };
        for (const auto& s : {deeper(f.pen_flange, base.pen_flange, "into the flange"),
                              deeper(f.pen_web, base.pen_web, "into the web"),
                              deeper(f.past_root, base.past_root, "past the root")}) {
            if (!s.empty()) out.push_back(s + ".");
        }
        if (!all_root && !no_root && f.root_fused != base.root_fused) {
            out.push_back((f.root_fused ? b : a) + " fuses the root; " + (f.root_fused ? a : b) + " does not.");
        }
        if (std::abs(f.heat_input / base.heat_input - 1) >= 0.03) {
            out.push_back(b + "'s heat input is " + percent_more(std::max(f.heat_input, base.heat_input), std::min(f.heat_input, base.heat_input)) +
                          (f.heat_input > base.heat_input ? " higher" : " lower") + " (" + or_na("%.2f", f.heat_input) + " against " +
                          or_na("%.2f kJ/mm", base.heat_input) + ").");
        }
        if (std::isfinite(f.rate_540) && std::isfinite(base.rate_540) && std::abs(f.rate_540 / base.rate_540 - 1) >= 0.05) {
            const bool b_faster = f.rate_540 > base.rate_540;
            out.push_back((b_faster ? b : a) + "'s HAZ cools " +
                          percent_more(std::max(f.rate_540, base.rate_540), std::min(f.rate_540, base.rate_540)) +
                          " faster at 540 degC (t8/5 " + or_na("%.1f", b_faster ? f.t85_lo : base.t85_lo) + " against " +
                          or_na("%.1f s", b_faster ? base.t85_lo : f.t85_lo) + ").");
        }
        if (std::isfinite(f.preheat) && std::isfinite(base.preheat) && f.preheat != base.preheat) {
            // The limit follows each case's filler hydrogen unless set, so it may differ.
            const double la = outcomes.front().c->preheat_search.hardness_limit, lb = outcomes[i].c->preheat_search.hardness_limit;
            out.push_back(b + " needs " + or_na("%.0f degC", std::abs(f.preheat - base.preheat)) +
                          (f.preheat > base.preheat ? " more" : " less") + " preheat than " + a +
                          (la == lb ? std::string(" for the same hardness limit.")
                                    : " (hardness limits " + or_na("%.0f HV", lb) + " and " + or_na("%.0f HV", la) + ")."));
        }
    }
    return out;
}

std::vector<std::string> warnings(const std::vector<Outcome>& outcomes) {
    std::vector<std::string> out;
    for (const auto& o : outcomes) {
        for (const auto& w : o.c->warnings) out.push_back(o.name + ": " + w);
        for (const auto& [group, note] : o.summary.notes()) out.push_back(o.name + ": " + note);
        if (!o.summary.missing().empty()) out.push_back(o.name + ": " + outputs_status(o));
        if (std::abs(o.result.energy.error()) > 0.01) out.push_back(o.name + ": energy balance off by more than 1 %");
    }
    return out;
}

// The joint must be the same for every case (the bead and the procedure may differ).
void require_same_joint(const std::vector<LoadedCase>& cases) {
    const auto& a = cases.front().value;
    std::vector<Diagnostic> problems;
    for (std::size_t i = 1; i < cases.size(); ++i) {
        const auto& b = cases[i].value;
        const auto differ = [&](const char* key, double va, double vb, double scale, const char* unit) {
            if (std::abs(va - vb) <= 1e-9 * std::max(1.0, std::abs(va))) return;
            problems.push_back({b.file, std::string("joint.") + key, or_na("%.4g", vb * scale) + " " + unit,
                                "differs from " + a.file + "'s " + or_na("%.4g", va * scale) + " " + unit +
                                    "; compare procedures on the same joint (plates, offset, gap and sides alike)"});
        };
        differ("flange_thickness", a.joint.flange_thickness, b.joint.flange_thickness, 1e3, "mm");
        differ("flange_width", a.joint.flange_width, b.joint.flange_width, 1e3, "mm");
        differ("web_thickness", a.joint.web_thickness, b.joint.web_thickness, 1e3, "mm");
        differ("web_height", a.joint.web_height, b.joint.web_height, 1e3, "mm");
        differ("web_offset", a.joint.web_offset, b.joint.web_offset, 1e3, "mm");
        differ("root_gap", a.joint.root_gap, b.joint.root_gap, 1e3, "mm");
        differ("sides", a.joint.sides, b.joint.sides, 1, "");
    }
    if (!problems.empty()) throw CaseError(std::move(problems));
}

// Short names: the file stems, made unique with a number where two agree.
std::vector<std::string> names_of(const std::vector<LoadedCase>& cases) {
    std::vector<std::string> names;
    std::map<std::string, int> seen;
    for (const auto& l : cases) {
        std::string n = std::filesystem::path(l.value.file).stem().string();
        if (++seen[n] > 1) n += " (" + std::to_string(seen[n]) + ")";
        names.push_back(n);
    }
    return names;
}

// A key for grids: cases with the same joint, bead and grid settings mesh alike.
std::string grid_key(const Case& c) {
    const auto& j = c.joint;
    const auto& g = c.grid;
    std::string key;
    for (double v : {j.flange_thickness, j.flange_width, j.web_thickness, j.web_height, j.weld_length, j.web_offset,
                     j.root_gap, double(j.sides), j.leg_flange, j.leg_web, double(static_cast<int>(j.face)), j.convexity,
                     g.cross_section.finest, g.cross_section.coarsest, g.cross_section.growth, g.refine_margin,
                     g.along_weld}) {
        key += format_text("%.17g ", v);
    }
    return key;
}

// Each banded answer's value, low and high (null where there is no band, with why).
nlohmann::json bands_json(const Outcome& o) {
    nlohmann::json j = nlohmann::json::object();
    const auto num = [](const std::optional<double>& v) { return v && std::isfinite(*v) ? nlohmann::json(*v) : nlohmann::json(nullptr); };
    for (const auto& i : o.summary.items()) {
        if (!i.banded) continue;
        j[i.key] = {{"value", num(i.value)}, {"low", num(i.has_band() ? i.low : std::nullopt)},
                    {"high", num(i.has_band() ? i.high : std::nullopt)}, {"unit", i.unit}};
        if (!i.has_band()) j[i.key]["no_band"] = i.missing() ? i.reason : i.no_band;
    }
    return j;
}

nlohmann::json to_json(const std::vector<Outcome>& outcomes, const Rows& rows, const std::vector<std::string>& words) {
    nlohmann::json j;
    j["cases"] = nlohmann::json::array();
    for (const auto& o : outcomes) {
        const Figures f = figures_of(o);
        const auto num = [](double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr); };
        // Beside each figure left null, why the run has none.
        nlohmann::json reasons = nlohmann::json::object();
        for (const auto& m : o.summary.missing()) reasons[m.key] = m.reason;
        j["cases"].push_back({{"name", o.name},
                              {"case", o.c->file},
                              {"heat_input_kJ_per_mm", num(f.heat_input)},
                              {"deposited_area_mm2", num(f.deposited)},
                              {"leg_flange_asked_mm", o.c->bead.asked.leg_flange * 1e3},
                              {"leg_web_asked_mm", o.c->bead.asked.leg_web * 1e3},
                              {"leg_flange_laid_mm", o.c->joint.leg_flange * 1e3},
                              {"leg_web_laid_mm", o.c->joint.leg_web * 1e3},
                              {"bead_laid_from_wire", o.c->bead.from_wire},
                              {"fused_leg_flange_mm", num(f.leg_flange)},
                              {"fused_leg_web_mm", num(f.leg_web)},
                              {"penetration_flange_mm", num(f.pen_flange)},
                              {"penetration_web_mm", num(f.pen_web)},
                              {"fusion_past_root_mm", num(f.past_root)},
                              {"root_fused", f.root_fused},
                              {"fused_area_mm2", num(f.fused)},
                              {"dilution_percent", num(f.dilution)},
                              {"haz_width_flange_mm", num(f.haz_flange)},
                              {"haz_width_web_mm", num(f.haz_web)},
                              {"t8_5_min_s", num(f.t85_lo)},
                              {"t8_5_max_s", num(f.t85_hi)},
                              {"cooling_rate_540_K_per_s", num(f.rate_540)},
                              {"haz_peak_min_degC", num(f.peak_lo)},
                              {"haz_peak_max_degC", num(f.peak_hi)},
                              {"haz_hardness_max_HV", num(f.hardness)},
                              {"lowest_preheat_degC", num(f.preheat)},
                              {"lowest_preheat_across_band_degC",
                               o.preheat_band && o.preheat_band->across ? nlohmann::json(*o.preheat_band->across) : nlohmann::json(nullptr)},
                              {"bands", bands_json(o)},
                              {"standard_preheat_degC", num(f.standard)},
                              {"energy_balance_error", o.result.energy.error()},
                              {"run_time_s", o.wall},
                              {"status", o.summary.missing().empty() ? "ok" : outputs_status(o)},
                              {"reasons", reasons}});
    }
    j["table"] = nlohmann::json::array();
    for (const auto& [label, cells] : rows) j["table"].push_back({{"quantity", label}, {"values", cells}});
    j["differences"] = words;
    j["warnings"] = warnings(outcomes);
    j["caution"] = post::compare_caution;
    return j;
}

std::string csv_cell(std::string s) {
    if (s.find_first_of(",\"") == std::string::npos) return s;
    std::string out = "\"";
    for (char ch : s) out += ch == '"' ? std::string("\"\"") : std::string(1, ch);
    return out + "\"";
}

std::string to_csv(const std::vector<Outcome>& outcomes, const Rows& rows) {
    std::string out = "quantity";
    for (const auto& o : outcomes) out += "," + csv_cell(o.name);
    out += "\n";
    for (const auto& [label, cells] : rows) {
        out += csv_cell(label);
        for (const auto& cell : cells) out += "," + csv_cell(cell);
        out += "\n";
    }
    return out;
}

post::CompareReportInput report_input(const std::vector<Outcome>& outcomes, const Rows& rows,
                                      const std::vector<std::string>& words) {
    post::CompareReportInput r;
    r.title = "Procedures compared:";
    for (const auto& o : outcomes) r.title += " " + o.name + (&o == &outcomes.back() ? "" : " /");
    r.created = now_utc();
    r.plates = plate_outlines(outcomes.front().c->joint);
    for (const auto& o : outcomes) {
        post::ComparedProcedure p;
        p.name = o.name;
        p.case_file = o.c->file;
        p.bead = bead_outline(o.c->joint);
        p.fusion_line = curves(o.analysis.section.fusion_line);
        p.haz_line = curves(o.analysis.section.ac1_line);
        // The cycle 0.5 mm beyond the fusion line (or the surface) under the flange leg's middle.
        for (const auto& probe : o.analysis.probes) {
            if (probe.name == "haz_flange_mid_0.5mm") p.cycle = {probe.name, probe.time, probe.temperature};
        }
        r.procedures.push_back(std::move(p));
    }
    r.rows = rows;
    r.differences = words;
    r.warnings = warnings(outcomes);
    r.caution = post::compare_caution;
    std::vector<std::string> names;
    std::vector<const post::Summary*> summaries;
    std::vector<const AnswerBands*> bands;
    std::vector<std::pair<std::string, post::MethodRows>> methods;
    for (const auto& o : outcomes) {
        names.push_back(o.name), summaries.push_back(&o.summary), bands.push_back(o.bands ? &*o.bands : nullptr);
        methods.emplace_back(o.name, post::how_computed(method_facts(*o.c)));
    }
    r.bands = bands_view(names, summaries, bands, "");
    r.how_computed = post::merge_how_computed(methods);
    return r;
}

// `heatbead compare`, one step per part of the procedure; run() reads as that procedure.
class CompareCommand {
public:
    CompareCommand(const std::vector<LoadedCase>& cases, const CompareOptions& options);

    int run();

private:
    void share_grids();
    void print_start() const;
    void run_cases();
    void run_case(std::size_t i);
    void print_ran(std::size_t first, std::size_t last) const;
    void band_answers();
    void search_preheats();
    void write_files(const Rows& rows, const std::vector<std::string>& words) const;
    void print_table(const Rows& rows, const std::vector<std::string>& words) const;
    int balance_status() const;

    const std::vector<LoadedCase>& cases_;
    const CompareOptions& options_;
    const std::vector<std::string> names_;
    const int jobs_, threads_;  // runs at a time, OpenMP threads per run
    const std::filesystem::path out_;
    // Grids once per distinct joint and grid (grid_key), materials once per case.
    std::map<std::string, std::unique_ptr<mesh::Grid>> grids_;
    std::vector<std::unique_ptr<Material>> materials_;
    std::vector<Outcome> outcomes_;
};

int cores() { return static_cast<int>(std::max(1u, std::thread::hardware_concurrency())); }

CompareCommand::CompareCommand(const std::vector<LoadedCase>& cases, const CompareOptions& options)
    : cases_(cases),
      options_(options),
      names_(names_of(cases)),
      jobs_(options.jobs > 0 ? options.jobs : cores()),
      threads_(options.threads > 0 ? options.threads : std::max(1, cores() / jobs_)),
      out_(options.out_dir),
      outcomes_(cases.size()) {}

int CompareCommand::run() {
    share_grids();
    print_start();
    run_cases();
    band_answers();
    search_preheats();
    if (interrupt_flag().load()) {
        std::fprintf(stderr, "heatbead: comparison interrupted; nothing was written\n");
        return exit_code::run_failed;
    }
    const Rows rows = table(outcomes_);
    const std::vector<std::string> words = differences(outcomes_);
    write_files(rows, words);
    print_table(rows, words);
    return balance_status();
}

void CompareCommand::share_grids() {
    for (const auto& l : cases_) {
        auto& g = grids_[grid_key(l.value)];
        if (!g) g = std::make_unique<mesh::Grid>(mesh::build_grid(l.value.joint, l.value.grid));
        materials_.push_back(std::make_unique<Material>(make_material(l.value.base)));
    }
}

void CompareCommand::print_start() const {
    if (options_.quiet) return;
    std::printf("heatbead compare  %zu procedures, %zu grid%s, %d run%s at a time\n", cases_.size(), grids_.size(),
                grids_.size() == 1 ? "" : "s", jobs_, jobs_ == 1 ? "" : "s");
    std::fflush(stdout);
}

// In batches of `jobs` cases side by side; an interrupt ends the batch in flight and the ones after it.
void CompareCommand::run_cases() {
    const auto batch = static_cast<std::size_t>(jobs_);
    for (std::size_t first = 0; first < cases_.size(); first += batch) {
        const std::size_t last = std::min(cases_.size(), first + batch);
        run_side_by_side(first, last, [this](std::size_t i) { run_case(i); });
        if (interrupt_flag().load()) break;
        print_ran(first, last);
    }
}

// On a thread of its own: touches only outcome i and reads the shared grids.
void CompareCommand::run_case(std::size_t i) {
    omp_set_num_threads(threads_);
    const Case& c = cases_[i].value;
    const auto start = std::chrono::steady_clock::now();
    PreparedRun run = prepare_run(c, *grids_.at(grid_key(c)), *materials_[i]);
    Outcome& o = outcomes_[i];
    o.name = names_[i];
    o.c = &c;
    o.result = run.sim->run(interrupt_flag());
    if (!o.result.completed || interrupt_flag().load()) return;
    o.analysis = analyse_run(c, run);
    o.wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    o.summary = make_summary(c, o.result, o.analysis, o.wall);
}

void CompareCommand::print_ran(std::size_t first, std::size_t last) const {
    if (options_.quiet) return;
    for (std::size_t i = first; i < last; ++i) std::printf("  ran %-28s %.1f s\n", names_[i].c_str(), outcomes_[i].wall);
    std::fflush(stdout);
}

// Each case's extra runs, `jobs` at a time; a case with bands turned off gets none.
void CompareCommand::band_answers() {
    try {
        for (std::size_t i = 0; i < outcomes_.size(); ++i) {
            Outcome& o = outcomes_[i];
            if (interrupt_flag().load()) return;
            if (o.c->bands.enabled) {
                o.bands = run_bands(*o.c, *grids_.at(grid_key(*o.c)), *materials_[i], o.summary, jobs_, threads_, interrupt_flag());
                if (!options_.quiet) {
                    std::printf("  bands %-26s %zu extra runs, %.1f s\n", o.name.c_str(), o.bands->runs, o.bands->wall);
                    std::fflush(stdout);
                }
            }
            add_bands(o.summary, o.bands ? &*o.bands : nullptr);
        }
    } catch (const BandsInterrupted&) {
    }
}

// Only for cases with a composition and the filler's hydrogen, unless --no-preheat.
void CompareCommand::search_preheats() {
    try {
        for (auto& o : outcomes_) {
            if (interrupt_flag().load()) break;
            const Case& c = *o.c;
            if (!options_.preheat || !c.base.composition || !c.filler.diffusible_hydrogen) continue;
            o.preheat = find_preheat(c, jobs_, threads_, interrupt_flag());
            if (c.bands.enabled && o.preheat->found) o.preheat_band = band_preheat(c, *o.preheat, jobs_, threads_, interrupt_flag());
            if (!options_.quiet) {
                std::printf("  preheat %-24s %s (%zu runs)\n", o.name.c_str(),
                            o.preheat->found ? or_na("%.0f degC", *o.preheat->found).c_str() : "none found",
                            o.preheat->trials.size());
                std::fflush(stdout);
            }
        }
    } catch (const SearchInterrupted&) {
    }
}

void CompareCommand::write_files(const Rows& rows, const std::vector<std::string>& words) const {
    post::write_file_atomically(out_ / "compare.json", to_json(outcomes_, rows, words).dump(2) + "\n");
    post::write_file_atomically(out_ / "compare.csv", to_csv(outcomes_, rows));
    post::write_compare_report(out_ / "compare.html", report_input(outcomes_, rows, words));
}

// Columns as wide as their widest entry, so the table reads straight down.
void CompareCommand::print_table(const Rows& rows, const std::vector<std::string>& words) const {
    if (options_.quiet) return;
    std::size_t label_width = 0;
    std::vector<std::size_t> width(names_.size());
    for (std::size_t i = 0; i < names_.size(); ++i) width[i] = names_[i].size() + 2;
    for (const auto& [label, cells] : rows) {
        label_width = std::max(label_width, label.size() + 2);
        for (std::size_t i = 0; i < cells.size(); ++i) width[i] = std::max(width[i], cells[i].size() + 2);
    }
    const auto print_row = [&](const std::string& label, const std::vector<std::string>& cells) {
        std::printf("%-*s", static_cast<int>(label_width), label.c_str());
        for (std::size_t i = 0; i < cells.size(); ++i) std::printf("%-*s", static_cast<int>(width[i]), cells[i].c_str());
        std::printf("\n");
    };
    print_row("", names_);
    for (const auto& [label, cells] : rows) print_row(label, cells);
    for (const auto& w : words) std::printf("Difference  %s\n", w.c_str());
    for (const auto& w : warnings(outcomes_)) std::printf("Warning     %s\n", w.c_str());
    std::printf("Files       %s, compare.csv, compare.html\n", (out_ / "compare.json").string().c_str());
    std::printf("Caution     %s\n", post::compare_caution);
    for (const auto& o : outcomes_)
        std::printf("Method      %s: %s\n", o.name.c_str(), post::how_computed_brief(method_facts(*o.c)).c_str());
}

// Results whose energy balance is off by more than 1 % are written, but the exit code says so.
int CompareCommand::balance_status() const {
    for (const auto& o : outcomes_) {
        if (std::abs(o.result.energy.error()) > 0.01) return exit_code::outside_validity;
    }
    return exit_code::ok;
}

}  // namespace

int compare_command(const std::vector<LoadedCase>& cases, const CompareOptions& options) {
    catch_interrupts();
    if (cases.size() < 2) throw std::invalid_argument("compare needs at least two case files");
    require_same_joint(cases);
    CompareCommand command(cases, options);
    return command.run();
}

}  // namespace heatbead
