#include "solver/studies/answer_bands.hpp"

#include "solver/core/parallel_tasks.hpp"
#include "solver/core/text.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/weldability/haz_hardness.hpp"

#include <chrono>
#include <cmath>
#include <memory>
#include <omp.h>

namespace heatbead {

namespace {

std::string mm(double metres) { return format_text("%.2f mm", metres * 1e3); }

// The arc efficiency moved by its spread: up, unless that passes 1 (submerged arc's factor is 1),
// then down. A net power given moves by the same share of itself as the efficiency it stands for.
BandVariant efficiency_variant(const Case& c) {
    BandVariant v{{"arc_efficiency", "arc efficiency", "", c.bands.arc_efficiency_spread_source}, c, false};
    auto& p = v.c.procedure;
    const double eta = net_power(c.procedure) / electrical_power(c.procedure);
    const double spread = c.bands.arc_efficiency_spread;
    const double moved = eta + spread <= 1 ? eta + spread : eta - spread;
    if (p.net_power) {
        p.net_power = *p.net_power * moved / eta;
    } else {
        p.arc_efficiency = moved;
    }
    v.input.moved = format_text("%.2f to %.2f", eta, moved);
    return v;
}

// One or two of the source's dimensions grown by the spread.
BandVariant source_variant(const Case& c, std::string key, std::string label, std::vector<double SourceShape::*> dims) {
    BandVariant v{{std::move(key), std::move(label), "", c.bands.source_spread_source}, c, false};
    std::string moved;
    for (const auto dim : dims) {
        v.c.source.*dim *= 1 + c.bands.source_spread;
        moved += (moved.empty() ? "" : ", ") + mm(c.source.*dim) + " to " + mm(v.c.source.*dim);
    }
    v.input.moved = moved;
    return v;
}

// The whole grid at twice the spacing: the finest, the coarsest floor and along the weld.
BandVariant grid_variant(const Case& c) {
    BandVariant v{{"grid", "grid", "", ""}, c, true};
    auto& g = v.c.grid;
    auto& h = g.cross_section;
    h.finest *= band_grid_ratio;
    h.coarsest = std::max(h.coarsest, h.finest);
    g.along_weld *= band_grid_ratio;
    v.input.moved = "finest " + mm(c.grid.cross_section.finest) + " to " + mm(h.finest) + ", along the weld " +
                    mm(c.grid.along_weld) + " to " + mm(g.along_weld);
    v.input.source = format_text("Roache's grid convergence index, safety factor %.0f, order %.0f", band_grid_safety,
                                 band_grid_order);
    return v;
}

}  // namespace

std::vector<BandVariant> band_variants(const Case& c) {
    return {efficiency_variant(c),
            source_variant(c, "source_half_width", "source half-width", {&SourceShape::half_width}),
            source_variant(c, "source_depth", "source depth", {&SourceShape::depth}),
            source_variant(c, "source_lengths", "source front and rear lengths",
                           {&SourceShape::front_length, &SourceShape::rear_length}),
            grid_variant(c)};
}

Band combine_band(double value, const std::vector<double>& answers, const std::vector<BandVariant>& variants,
                  ModelScatter scatter) {
    Band b;
    b.value = value;
    b.scatter = scatter;
    if (!std::isfinite(value)) {
        b.reason = "no value";
        return b;
    }
    double sum = 0;
    for (std::size_t i = 0; i < variants.size(); ++i) {
        const double shift = answers[i] - value;
        b.shifts.push_back(shift);
        if (!std::isfinite(shift)) {
            if (b.reason.empty()) b.reason = "the run with the " + variants[i].input.label + " moved has none";
            continue;
        }
        if (variants[i].coarse) {
            // |E| = F_s·|f_h − f_2h|/(2^p − 1): the shift is f_2h − f_h.
            b.grid = band_grid_safety * std::abs(shift) / (std::pow(band_grid_ratio, band_grid_order) - 1);
        } else {
            sum += shift * shift;
        }
    }
    if (!b.ok()) return b;
    b.inputs = std::sqrt(sum);
    b.low = value - std::hypot(b.inputs, scatter.below) - b.grid;
    b.high = value + std::hypot(b.inputs, scatter.above) + b.grid;
    return b;
}

AnswerBands make_bands(const Case& c, const mesh::Grid& grid, const Material& material, const Answers& nominal,
                       const std::map<std::string, ModelScatter>& scatter, const EvaluateRun& evaluate, int jobs,
                       int threads) {
    const auto start = std::chrono::steady_clock::now();
    const std::vector<BandVariant> variants = band_variants(c);
    std::vector<std::unique_ptr<mesh::Grid>> own(variants.size());
    for (std::size_t i = 0; i < variants.size(); ++i)
        if (variants[i].coarse) own[i] = std::make_unique<mesh::Grid>(mesh::build_grid(variants[i].c.joint, variants[i].c.grid));
    std::vector<Answers> answers(variants.size());
    // A queue: each worker takes the next variant as it finishes one (the coarse grid's is last and short).
    std::atomic<std::size_t> next{0};
    const std::size_t workers = std::min(variants.size(), static_cast<std::size_t>(std::max(jobs, 1)));
    run_side_by_side(0, workers, [&](std::size_t) {
        omp_set_num_threads(std::max(threads, 1));
        for (std::size_t i = next++; i < variants.size(); i = next++)
            answers[i] = evaluate(variants[i].c, own[i] ? *own[i] : grid, material);
    });
    AnswerBands out;
    for (const auto& v : variants) out.inputs.push_back(v.input);
    for (const auto& [key, value] : nominal) {
        std::vector<double> values;
        for (const auto& a : answers) {
            const auto it = a.find(key);
            values.push_back(it == a.end() ? no_value : it->second);
        }
        const auto s = scatter.find(key);
        out.bands[key] = combine_band(value, values, variants, s == scatter.end() ? ModelScatter{} : s->second);
    }
    out.runs = variants.size();
    out.wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    return out;
}

ModelScatter hardness_model_scatter(double judged, double duren, double yurioka) {
    const double widest = std::max(duren_scatter, yurioka_scatter);
    if (!std::isfinite(judged)) return {widest, widest};
    double top = judged + widest, bottom = judged - widest;
    bool any = false;
    for (const auto& [estimate, scatter] : {std::pair{duren, duren_scatter}, std::pair{yurioka, yurioka_scatter}}) {
        if (!std::isfinite(estimate)) continue;
        top = any ? std::max(top, estimate + scatter) : estimate + scatter;
        bottom = any ? std::min(bottom, estimate - scatter) : estimate - scatter;
        any = true;
    }
    return {judged - bottom, top - judged};
}

Answers run_answers(const post::Summary& s) {
    Answers a;
    for (const auto& [key, name] : banded_answers) {
        const post::SummaryItem* i = s.find(std::string(key));
        if (i) a[i->key] = i->missing() ? no_value : *i->value;
    }
    return a;
}

Answers evaluate_run(const Case& c, const mesh::Grid& grid, const Material& material, const std::atomic<bool>& interrupt) {
    PreparedRun run = prepare_run(c, grid, material);
    const RunResult result = run.sim->run(interrupt);
    if (!result.completed || interrupt.load()) throw BandsInterrupted();
    return run_answers(make_summary(c, result, analyse_run(c, run), 0));
}

AnswerBands run_bands(const Case& c, const mesh::Grid& grid, const Material& material, const post::Summary& nominal,
                      int jobs, int threads, const std::atomic<bool>& interrupt) {
    const auto value = [&](const char* key) {
        const post::SummaryItem* i = nominal.find(key);
        return i && !i->missing() ? *i->value : no_value;
    };
    const ModelScatter scatter = hardness_model_scatter(value("haz_hardness_max"), value("haz_hardness_duren"),
                                                  value("haz_hardness_yurioka"));
    return make_bands(c, grid, material, run_answers(nominal), {{"haz_hardness_max", scatter}},
                      [&](const Case& v, const mesh::Grid& g, const Material& m) { return evaluate_run(v, g, m, interrupt); },
                      jobs, threads);
}

void add_bands(post::Summary& s, const AnswerBands* bands) {
    for (const auto& [key, name] : banded_answers) {
        post::SummaryItem* i = s.find(std::string(key));
        if (!i) continue;
        i->banded = true;
        if (!bands) {
            i->no_band = "bands turned off (bands.enabled = false)";
            continue;
        }
        const auto it = bands->bands.find(i->key);
        if (it == bands->bands.end()) continue;
        const Band& b = it->second;
        if (b.ok()) i->low = b.low, i->high = b.high;
        else i->no_band = b.reason;
    }
}

namespace {

// A shift in the item's unit and decimals, signed; "none" where the run had no value.
std::string shift_text(double shift, int decimals) {
    return std::isfinite(shift) ? format_text("%+.*f", decimals, shift) : std::string("none");
}

}  // namespace

post::BandsView bands_view(const std::vector<std::string>& names, const std::vector<const post::Summary*>& summaries,
                           const std::vector<const AnswerBands*>& bands, std::string note) {
    post::BandsView view;
    view.note = std::move(note);
    const AnswerBands* any = nullptr;
    for (const auto* b : bands) any = any ? any : b;
    if (!any) return view;
    view.columns = {"answer"};
    if (names.size() > 1) view.columns.push_back("run");
    view.columns.push_back("value (band)");
    for (const auto& input : any->inputs)
        view.columns.push_back(input.label + (names.size() == 1 ? " (" + input.moved + ")" : "") +
                               (input.key == "grid" ? ": |error|" : ""));
    view.columns.push_back("model scatter");
    for (const auto& [key, name] : banded_answers) {
        post::BandedAnswer answer;
        answer.key = std::string(key);
        answer.name = std::string(name);
        for (std::size_t r = 0; r < summaries.size(); ++r) {
            const post::SummaryItem* i = summaries[r]->find(answer.key);
            if (!i) continue;
            answer.unit = i->unit;
            answer.runs.push_back(names[r]);
            answer.value.push_back(i->missing() ? no_value : *i->value);
            answer.low.push_back(i->has_band() ? *i->low : no_value);
            answer.high.push_back(i->has_band() ? *i->high : no_value);
            if (!bands[r]) continue;
            std::vector<std::string> row{answer.name};
            if (names.size() > 1) row.push_back(names[r]);
            row.push_back(post::display(*i) + (i->has_band() || i->missing() ? "" : " (no band: " + i->no_band + ")"));
            const auto it = bands[r]->bands.find(answer.key);
            const Band* b = it == bands[r]->bands.end() ? nullptr : &it->second;
            for (std::size_t v = 0; v < bands[r]->inputs.size(); ++v) {
                const bool grid = bands[r]->inputs[v].key == "grid";
                row.push_back(!b || v >= b->shifts.size() ? "none"
                              : grid && b->ok()           ? format_text("%.*f", i->decimals, b->grid)
                                                          : shift_text(b->shifts[v], i->decimals));
            }
            row.push_back(!b || (b->scatter.below == 0 && b->scatter.above == 0)
                              ? ""
                              : format_text("-%.*f, +%.*f", i->decimals, b->scatter.below, i->decimals, b->scatter.above));
            view.rows.push_back(std::move(row));
        }
        if (!answer.runs.empty()) view.answers.push_back(std::move(answer));
    }
    return view;
}

post::BandFacts band_facts(const Case& c) {
    post::BandFacts f;
    f.enabled = c.bands.enabled;
    f.runs = band_variants(c).size();
    f.efficiency_spread = c.bands.arc_efficiency_spread;
    f.efficiency_source = c.bands.arc_efficiency_spread_source;
    f.source_spread = c.bands.source_spread;
    f.source_source = c.bands.source_spread_source;
    f.hardness = c.base.composition.has_value();
    f.duren_scatter = duren_scatter;
    f.yurioka_scatter = yurioka_scatter;
    f.grid_ratio = band_grid_ratio;
    f.grid_order = band_grid_order;
    f.grid_safety = band_grid_safety;
    return f;
}

}  // namespace heatbead
