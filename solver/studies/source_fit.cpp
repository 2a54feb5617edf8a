#include "solver/studies/source_fit.hpp"

#include "solver/studies/least_squares.hpp"
#include "solver/core/parallel_tasks.hpp"
#include "solver/core/text.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"

#include <Eigen/Dense>
#include <omp.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <limits>
#include <map>
#include <optional>
#include <stdexcept>

namespace heatbead {

namespace {

// The predicted section quantity by its summary key.
double section_value(const post::CrossSection& x, const std::string& key) {
    if (key == "penetration_flange") return x.penetration_flange;
    if (key == "penetration_web") return x.penetration_web;
    if (key == "fused_leg_flange") return x.fused_leg_flange;
    if (key == "fused_leg_web") return x.fused_leg_web;
    if (key == "haz_width_flange") return x.haz_width_flange;
    if (key == "haz_width_web") return x.haz_width_web;
    if (key == "fused_area") return x.fused_area;
    throw std::invalid_argument("no section quantity " + key);
}

// Distance from a point to the nearest segment of any of the lines [m] (infinite without lines).
double distance_to(const std::vector<post::Polyline>& lines, const std::array<double, 2>& p) {
    double best = std::numeric_limits<double>::infinity();
    for (const auto& line : lines) {
        for (std::size_t i = 1; i < line.points.size(); ++i) {
            const auto& a = line.points[i - 1];
            const auto& b = line.points[i];
            const double dy = b[0] - a[0], dz = b[1] - a[1], len2 = dy * dy + dz * dz;
            const double u = len2 > 0 ? std::clamp(((p[0] - a[0]) * dy + (p[1] - a[1]) * dz) / len2, 0.0, 1.0) : 0.0;
            best = std::min(best, std::hypot(p[0] - a[0] - u * dy, p[1] - a[1] - u * dz));
        }
    }
    return best;
}

double interpolate(const std::vector<double>& t, const std::vector<double>& v, double at) {
    if (t.empty()) return std::nan("");
    if (at <= t.front()) return v.front();
    if (at >= t.back()) return v.back();
    const auto j = static_cast<std::size_t>(std::upper_bound(t.begin(), t.end(), at) - t.begin());
    const double w = (at - t[j - 1]) / (t[j] - t[j - 1]);
    return v[j - 1] + w * (v[j] - v[j - 1]);
}

// Which thermocouple samples are compared: up to 40, evenly spread.
std::vector<std::size_t> compared_samples(const ThermocoupleTrace& t) {
    std::vector<std::size_t> out;
    const std::size_t n = t.time.size(), take = std::min<std::size_t>(n, 40);
    for (std::size_t i = 0; i < take; ++i) out.push_back(take == 1 ? 0 : i * (n - 1) / (take - 1));
    return out;
}

struct Problem {
    const Case& base;
    const Measurements& m;
    const mesh::Grid& grid;
    const Material& material;
    std::vector<double> start, low, high;  // per unknown
    std::vector<double> measured, uncertainty;
    std::vector<std::string> labels;
    int threads = 1;
    const std::atomic<bool>& interrupt;
    std::atomic<int> runs{0};

    Case case_at(const std::vector<double>& theta) const {
        Case c = base;
        for (std::size_t j = 0; j < theta.size(); ++j) set_unknown(c, m.unknowns[j], start[j] * std::exp(theta[j]));
        for (const auto& tc : m.thermocouples) c.output.probes.push_back(tc.position);
        return c;
    }

    Prediction predict(const std::vector<double>& theta) {
        ++runs;
        omp_set_num_threads(threads);
        const Case c = case_at(theta);
        PreparedRun run = prepare_run(c, grid, material);
        const RunResult result = run.sim->run(interrupt);
        if (!result.completed || interrupt.load()) throw std::runtime_error("the fit was interrupted");
        const RunAnalysis a = analyse_run(c, run);
        Prediction p;
        p.fusion_line = a.section.fusion_line, p.haz_line = a.section.ac1_line;
        for (const auto& s : m.section) p.values.push_back(section_value(a.section, s.key));
        const auto& probes = run.sim->probes();
        for (std::size_t k = 0; k < m.thermocouples.size(); ++k) {
            const auto& probe = probes[probes.size() - m.thermocouples.size() + k];
            for (std::size_t i : compared_samples(m.thermocouples[k])) {
                p.values.push_back(interpolate(probe.time, probe.temperature, m.thermocouples[k].time[i]));
            }
        }
        // A digitised boundary point's predicted value is its distance from the predicted fusion
        // line (measured: 0); 20 mm stands in when no line was predicted at all.
        for (const auto& b : m.boundary) p.values.push_back(std::min(distance_to(a.section.fusion_line, b), 20e-3));
        for (std::size_t i = 0; i < p.values.size(); ++i) {
            p.residuals.push_back((p.values[i] - measured[i]) / uncertainty[i]);
            p.misfit += p.residuals.back() * p.residuals.back();
        }
        return p;
    }

    // Predictions at several points, `jobs` runs at a time.
    std::vector<Prediction> predict_all(const std::vector<std::vector<double>>& thetas, int jobs) {
        std::vector<Prediction> out(thetas.size());
        for (std::size_t first = 0; first < thetas.size(); first += static_cast<std::size_t>(jobs)) {
            run_side_by_side(first, std::min(thetas.size(), first + static_cast<std::size_t>(jobs)),
                             [&](std::size_t i) { out[i] = predict(thetas[i]); });
        }
        return out;
    }
};

}  // namespace

double unknown_value(const Case& c, const std::string& name) {
    if (name == "arc_efficiency") return c.procedure.arc_efficiency;
    if (name == "half_width") return c.source.half_width;
    if (name == "depth") return c.source.depth;
    if (name == "front_length") return c.source.front_length;
    if (name == "rear_length") return c.source.rear_length;
    throw std::invalid_argument("unknown " + name);
}

void set_unknown(Case& c, const std::string& name, double value) {
    if (name == "arc_efficiency") {
        c.procedure.arc_efficiency = value;
        c.procedure.net_power.reset();
        c.procedure.arc_efficiency_source = "fitted to measurements";
        return;
    }
    c.source.from_procedure = false;
    c.source.rule = "fitted to measurements";
    if (name == "half_width") c.source.half_width = value;
    else if (name == "depth") c.source.depth = value;
    else if (name == "front_length") c.source.front_length = value;
    else if (name == "rear_length") c.source.rear_length = value;
    else throw std::invalid_argument("unknown " + name);
}

namespace {

// The fit on the grid of `c`, from θ = `theta` (ln of value over the case's value; empty: 0).
FitResult fit_on_grid(const Case& c, const Measurements& m, std::vector<double> theta, int iterations, int jobs,
                      int threads, const std::atomic<bool>& interrupt,
                      const std::function<void(const std::string&)>& progress) {
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    Problem pb{c, m, grid, material, {}, {}, {}, {}, {}, {}, std::max(threads, 1), interrupt, {}};
    for (const auto& name : m.unknowns) {
        const double p0 = unknown_value(c, name);
        pb.start.push_back(p0);
        pb.low.push_back(name == "arc_efficiency" ? 0.3 : p0 / 4);
        pb.high.push_back(name == "arc_efficiency" ? 1.0 : p0 * 4);
    }
    for (const auto& s : m.section) {
        pb.labels.push_back(s.key), pb.measured.push_back(s.value), pb.uncertainty.push_back(s.uncertainty);
    }
    for (const auto& tc : m.thermocouples) {
        for (std::size_t i : compared_samples(tc)) {
            pb.labels.push_back("thermocouple at " + format_text("%.1f s", tc.time[i]));
            pb.measured.push_back(tc.temperature[i]), pb.uncertainty.push_back(tc.uncertainty);
        }
    }
    for (std::size_t i = 0; i < m.boundary.size(); ++i) {
        pb.labels.push_back("boundary point " + std::to_string(i + 1));
        pb.measured.push_back(0), pb.uncertainty.push_back(m.boundary_uncertainty);
    }
    const std::size_t n = m.unknowns.size(), rows = pb.measured.size();
    FitResult out;
    out.labels = pb.labels, out.measured = pb.measured, out.uncertainty = pb.uncertainty;
    // Every prediction made, by θ, and the first (the start): both ends are reported.
    std::map<std::vector<double>, Prediction> seen;
    std::optional<Prediction> first;
    const ResidualBatch residuals = [&](const std::vector<std::vector<double>>& thetas) {
        const auto preds = pb.predict_all(thetas, jobs);
        if (!first) first = preds.front();
        std::vector<std::vector<double>> out_r;
        for (std::size_t i = 0; i < thetas.size(); ++i) {
            seen[thetas[i]] = preds[i];
            out_r.push_back(preds[i].residuals);
        }
        return out_r;
    };
    std::vector<double> low, high;
    for (std::size_t j = 0; j < n; ++j) low.push_back(std::log(pb.low[j] / pb.start[j])), high.push_back(std::log(pb.high[j] / pb.start[j]));
    theta.resize(n, 0.0);
    const LeastSquaresFit ls = levenberg_marquardt(residuals, theta, low, high, iterations, 0.05, [&](int i, double misfit) {
        if (progress) progress("iteration " + std::to_string(i) + ": misfit " + format_text("%.4g", misfit));
    });
    theta = ls.theta;
    out.iterations = ls.iterations;
    out.before = *first;
    out.after = seen.at(theta);
    out.runs = pb.runs.load();
    const Prediction& current = out.after;
    const Eigen::MatrixXd& J = ls.jacobian;
    const Eigen::MatrixXd A = J.transpose() * J;
    const double dof = rows > n ? double(rows - n) : 0;
    const double s2 = dof > 0 ? current.misfit / dof : 1.0;
    const Eigen::MatrixXd cov = s2 * A.completeOrthogonalDecomposition().pseudoInverse();
    double largest = 0;
    for (std::size_t j = 0; j < n; ++j) largest = std::max(largest, J.col(Eigen::Index(j)).norm());
    for (std::size_t j = 0; j < n; ++j) {
        const double p = pb.start[j] * std::exp(theta[j]);
        const double sigma = std::sqrt(std::max(cov(Eigen::Index(j), Eigen::Index(j)), 0.0));
        out.unknowns.push_back({m.unknowns[j], pb.start[j], p, p * std::exp(-1.96 * sigma), p * std::exp(1.96 * sigma)});
        const double norm = J.col(Eigen::Index(j)).norm();
        if (norm < 1e-3 * largest || norm < 1e-6) {
            out.warnings.push_back(m.unknowns[j] + " is not identifiable from these measurements: they do not change "
                                                   "when it does (fix it, or add a measurement it moves)");
        }
        if (std::abs(theta[j] - std::log(pb.low[j] / pb.start[j])) < 1e-9 || std::abs(theta[j] - std::log(pb.high[j] / pb.start[j])) < 1e-9) {
            out.warnings.push_back(m.unknowns[j] + " ended on its bound: the data pull it further than allowed");
        }
        for (std::size_t k = j + 1; k < n; ++k) {
            const double nk = J.col(Eigen::Index(k)).norm();
            if (norm > 0 && nk > 0 && std::abs(J.col(Eigen::Index(j)).dot(J.col(Eigen::Index(k)))) / (norm * nk) > 0.995) {
                out.warnings.push_back(m.unknowns[j] + " and " + m.unknowns[k] +
                                       " move the measurements alike: not separately identifiable from these data");
            }
        }
        if (m.unknowns[j] == "front_length" && m.thermocouples.empty()) {
            out.warnings.push_back("front_length is barely seen by a cross-section (common practice, no source): a "
                                   "thermocouple trace or a longitudinal section pins it down");
        }
    }
    if (rows <= n) out.warnings.push_back("no more measurements than unknowns: the intervals are not meaningful");
    out.fitted = pb.case_at(theta);
    out.fitted.output.probes = c.output.probes;
    return out;
}

}  // namespace

FitResult fit_source(const Case& c, const Measurements& m, int jobs, int threads, const std::atomic<bool>& interrupt,
                     const std::function<void(const std::string&)>& progress) {
    // Fine grids are fitted coarse first (twice the spacing: a quarter of the cells), then refined
    // on the case's own grid from there, where a few iterations correct the coarse grid's bias.
    const double finest = c.grid.cross_section.finest;
    if (finest >= 0.99e-3) return fit_on_grid(c, m, {}, m.iterations, jobs, threads, interrupt, progress);
    Case coarse = c;
    coarse.grid.cross_section.finest = 2 * finest;
    coarse.grid.cross_section.coarsest = std::max(coarse.grid.cross_section.coarsest, 2 * finest);
    coarse.grid.along_weld = 2 * c.grid.along_weld;
    if (progress) progress("first on a grid of " + format_text("%.2f mm", 2 * finest * 1e3));
    const FitResult first = fit_on_grid(coarse, m, {}, m.iterations, jobs, threads, interrupt, progress);
    std::vector<double> theta;
    for (const auto& u : first.unknowns) theta.push_back(std::log(u.value / u.start));
    if (progress) progress("then on the case's grid of " + format_text("%.2f mm", finest * 1e3));
    FitResult out = fit_on_grid(c, m, theta, std::min(m.iterations, 4), jobs, threads, interrupt, progress);
    for (std::size_t j = 0; j < out.unknowns.size(); ++j) out.unknowns[j].start = first.unknowns[j].start;
    out.before = first.before;
    out.runs += first.runs;
    out.iterations += first.iterations;
    out.warnings.push_back("the misfit before the fit is the coarse grid's, where the fit started");
    return out;
}

}  // namespace heatbead
