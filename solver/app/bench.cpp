#include "solver/app/bench.hpp"

#include "post/cross_section.hpp"
#include "post/haz_cooling.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/case/case_reader.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/numerics/integrators.hpp"
#include "solver/studies/answer_bands.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/app/sweep_command.hpp"

#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <unistd.h>
#include <cstdio>
#include <omp.h>
#include <sys/resource.h>

namespace heatbead {

namespace {

using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }

// STREAM-style triad a = b + s·c over arrays far larger than the caches; best of `repeats`
// [bytes/s], counting 24 bytes per element (two reads, one write; write-allocate not counted,
// as STREAM does).
double triad_bandwidth(std::size_t n, int repeats) {
    std::vector<double> a(n), b(n), c(n);
#pragma omp parallel for schedule(static)
    for (std::size_t i = 0; i < n; ++i) a[i] = 0, b[i] = 1, c[i] = 2;
    double best = 0;
    for (int r = 0; r < repeats; ++r) {
        const auto start = Clock::now();
        const double s = 0.5 + r;
#pragma omp parallel for schedule(static)
        for (std::size_t i = 0; i < n; ++i) a[i] = b[i] + s * c[i];
        best = std::max(best, 24.0 * static_cast<double>(n) / seconds_since(start));
    }
    if (a[n / 2] < 0) std::printf(" ");  // keeps the loop from being optimised away
    return best;
}

// Bytes one RKL2 stage moves per cell, counted from the arrays its single fused sweep streams:
//   read T(j−1), gx, gy, gz, gloss, active          8 + 32 + 1
//   read Y(j−1), Y(j−2), Y0, L0                     32
//   write Y(j) and T(j)                             16
// Neighbour values and the section's neighbour table are reused from cache.
constexpr double bytes_per_stage = 8 + 32 + 1 + 32 + 16;

struct ReferenceRun {
    double finest = 0, wall = 0, end_time = 0;
    std::size_t cells = 0, steps = 0, stages = 0;
    std::optional<double> penetration, t8_5;  // flange penetration at the station [m]; HAZ median t8/5 [s]
    double energy_error = 0;
};

// `uniform`: the same spacing everywhere, along the weld too (the textbook grid); otherwise the
// case's grading with the default along-weld spacing.
ReferenceRun run_reference(const std::string& path, double finest, std::string integrator, bool uniform,
                           std::optional<double> time_limit) {
    const std::string spacing = std::to_string(finest * 1e3) + " mm";
    std::vector<Override> sets{{"grid.finest", spacing}, {"solver.integrator", integrator}};
    if (uniform) {
        sets.push_back({"grid.coarsest", spacing});
        sets.push_back({"grid.along_weld", spacing});
        sets.push_back({"grid.growth", "1"});
    }
    if (time_limit) sets.push_back({"solver.time_limit", std::to_string(*time_limit) + " s"});
    const Case c = load_case(path, sets).value;
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    RunSettings settings = make_settings(c);
    // The textbook baseline updates every cell every step.
    settings.skip_cold_blocks = !uniform;
    Simulation sim(grid, material, make_losses(c), make_passes(c), settings);
    const RecordedHistory recorded = record_history(sim, c.temperatures.preheat);
    std::atomic<bool> stop{false};
    const auto start = Clock::now();
    const RunResult r = sim.run(stop);
    ReferenceRun out;
    out.wall = seconds_since(start);
    out.finest = finest, out.end_time = r.end_time, out.cells = sim.cells().size();
    out.steps = r.steps, out.stages = r.stages, out.energy_error = r.energy.error();
    const auto section = post::measure_cross_section(c.joint, grid, sim.cells(), recorded.history->peak(), c.output.station,
                                                     1, section_levels(c));
    out.penetration = section.penetration_flange;
    out.t8_5 = post::haz_cooling(sim.cells(), *recorded.history, section.slice, c.base.solidus).t8_5;
    return out;
}

// Cell updates per second of full RKL2 stages on the reference grid, all cells active.
double kernel_rate(const std::string& path, double finest, int stages) {
    const Case c = load_case(path, {{"grid.finest", std::to_string(finest * 1e3) + " mm"}}).value;
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const Material material = make_material(c.base);
    ConductionOperator op(grid, cells, material, make_losses(c));
    const std::size_t n = cells.size();
    std::vector<double> T(n), H(n);
    for (std::size_t i = 0; i < n; ++i) T[i] = 20 + 800 * std::exp(-static_cast<double>(i % cells.ns) / 500.0);
    for (std::size_t i = 0; i < n; ++i) H[i] = material.enthalpy(T[i]);
    std::vector<std::uint8_t> active(n, 1);
    op.prepare(T, active, {}, std::nan(""), 1);
    RungeKuttaLegendre2 rkl(n);
    const double sd = stages;
    const double dt = op.stable_step() * (sd * sd + sd - 2) / 4 * 0.999;
    rkl.step(op, H, T, dt);  // warm-up
    const auto start = Clock::now();
    const int repeats = 3;
    for (int r = 0; r < repeats; ++r) rkl.step(op, H, T, dt);
    const double s = static_cast<double>(rkl.stages(dt, op.stable_step()));
    return repeats * s * static_cast<double>(n) / seconds_since(start);
}

double peak_memory_bytes() {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return static_cast<double>(usage.ru_maxrss) * 1024.0;  // Linux reports kilobytes
}

// The cost of a band on this machine, measured in this process: one run of the case as `heatbead
// run` makes it (run, analysis, summary) on every thread and again on one thread (as each of the
// band's runs has it), then the band's extra runs side by side, one per core, as `heatbead run`
// makes them. Both ratios are printed: on a loaded machine threads of one run wait on each other
// more than runs side by side do.
double timed_run(const Case& c, const mesh::Grid& grid, const Material& material, int threads, post::Summary& summary) {
    omp_set_num_threads(threads);
    const std::atomic<bool> never{false};
    const auto start = Clock::now();
    PreparedRun run = prepare_run(c, grid, material);
    const RunResult result = run.sim->run(never);
    summary = make_summary(c, result, analyse_run(c, run), 0);
    return seconds_since(start);
}

void bench_band(const std::string& path, double finest) {
    const Case c = load_case(path, {{"grid.finest", std::to_string(finest * 1e3) + " mm"}}).value;
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    const int cores = omp_get_max_threads();
    post::Summary summary;
    const double one = timed_run(c, grid, material, cores, summary);
    const double single = timed_run(c, grid, material, 1, summary);
    const int jobs = std::min(cores, static_cast<int>(band_variants(c).size()));
    const std::atomic<bool> never{false};
    const AnswerBands bands = run_bands(c, grid, material, summary, jobs, std::max(1, cores / jobs), never);
    omp_set_num_threads(cores);
    std::printf("  one run at %.2f mm with its analysis: %.2f s on %d threads, %.2f s on 1\n", finest * 1e3, one, cores,
                single);
    std::printf("  its band: %zu extra runs, %d at a time: %.2f s = %.1fx the run on %d threads, %.1fx the run on 1\n",
                bands.runs, jobs, bands.wall, bands.wall / one, cores, bands.wall / single);
    const auto& t = bands.bands.at("t8_5_min");
    const auto& p = bands.bands.at("penetration_flange");
    std::printf("  t8/5 %.2f s (%.2f-%.2f), flange penetration %.2f mm (%.2f-%.2f)\n", t.value, t.low, t.high,
                p.value, p.low, p.high);
}

void print_run(const char* label, const ReferenceRun& r) {
    std::printf("  %-26s %5.2f mm  %8zu cells  %4zu steps  %5zu stages  %7.2f s wall", label, r.finest * 1e3, r.cells,
                r.steps, r.stages, r.wall);
    if (r.penetration) std::printf("  penetration %.2f mm", *r.penetration * 1e3);
    if (r.t8_5) std::printf("  t8/5 %.2f s", *r.t8_5);
    std::printf("\n");
}

}  // namespace

int bench_command(const BenchOptions& o) {
    // The answer's spacing, half of it (for convergence), and the spacing the baseline uses.
    const double coarse = o.quick ? 2e-3 : 0.7e-3, half = coarse / 2, fine = o.quick ? 1e-3 : 0.5e-3;
    std::printf("heatbead bench  %s  (%d threads%s)\n", o.case_path.c_str(), omp_get_max_threads(),
                o.quick ? ", quick: small grids, figures not meaningful" : "");

    std::printf("Reference case, rkl2 on the graded grid\n");
    // The process's peak resident memory only grows, so reading it after each run gives that run's.
    const ReferenceRun a = run_reference(o.case_path, coarse, "rkl2", false, std::nullopt);
    const double memory_a = peak_memory_bytes();
    print_run("answer", a);
    const ReferenceRun b = run_reference(o.case_path, half, "rkl2", false, std::nullopt);
    const double memory_b = peak_memory_bytes();
    print_run("half the spacing", b);
    // The quick bench's half spacing is the baseline's: that run is not made twice.
    const ReferenceRun e = fine == half ? b : run_reference(o.case_path, fine, "rkl2", false, std::nullopt);
    if (fine != half) print_run("baseline's finest spacing", e);
    const bool have = a.t8_5 && b.t8_5 && a.penetration && b.penetration;
    const double dt85 = have ? std::abs(*a.t8_5 / *b.t8_5 - 1) : NAN;
    const double dpen = have ? std::abs(*a.penetration - *b.penetration) : NAN;
    const bool converged = have && dt85 <= 0.02 && dpen <= 0.1e-3;
    std::printf("  answer vs half its spacing: t8/5 differs %.1f %%, penetration %.3f mm -> %s\n", dt85 * 100,
                dpen * 1e3,
                converged ? "converged (t8/5 <= 2 %, penetration <= 0.1 mm)"
                          : "NOT converged; the half-spacing run is the answer (its own convergence unmeasured)");
    const ReferenceRun& answer = converged ? a : b;
    std::printf("  time to answer: %.2f s at %.2f mm finest spacing; peak memory of that run %.0f MB\n", answer.wall,
                answer.finest * 1e3, (converged ? memory_a : memory_b) / 1e6);

    std::printf("Kernel\n");
    const double triad = triad_bandwidth(o.quick ? (1u << 22) : (1u << 25), 5);
    const double rate = kernel_rate(o.case_path, fine, 20);
    const double bandwidth = rate * bytes_per_stage;
    std::printf("  %.3g cell updates/s x %.0f B = %.2f GB/s; triad %.2f GB/s; ratio %.0f %%\n", rate, bytes_per_stage,
                bandwidth / 1e9, triad / 1e9, 100 * bandwidth / triad);

    // Baseline: forward Euler on a uniform grid at the fine spacing, every cell every step. It is
    // run for a window of simulated time and scaled to the reference run's simulated time:
    // forward Euler's cost is proportional to simulated time (a constant stable step).
    const double window = o.quick ? 0.2 : 1.0;
    const ReferenceRun base = run_reference(o.case_path, fine, "explicit", true, window);
    const double base_full = base.wall * e.end_time / base.end_time;
    std::printf("Baseline: explicit, uniform %.2f mm, %zu cells: %.2f s for %.2f s simulated -> %.0f s for %.1f s\n",
                fine * 1e3, base.cells, base.wall, base.end_time, base_full, e.end_time);
    std::printf("  speed ratio at equal finest spacing (%.2f mm): %.1fx (rkl2 graded %.2f s vs explicit uniform %.0f s)\n",
                fine * 1e3, base_full / e.wall, e.wall, base_full);
    std::printf("  speed ratio to the converged answer: %.1fx\n", base_full / answer.wall);
    std::printf("Energy balance errors: %.2e, %.2e, %.2e\n", a.energy_error, b.energy_error, e.energy_error);
    std::printf("Band of the answers, at the answer's spacing\n");
    bench_band(o.case_path, coarse);
    return exit_code::ok;
}

int bench_sweep_command(const std::string& sweep_file) {
    std::printf("heatbead bench --sweep  %s\n", sweep_file.c_str());
    double rate[3] = {0, 0, 0};
    std::size_t points = 0;
    for (int jobs : {1, 2}) {
        const auto out = std::filesystem::temp_directory_path() / ("heatbead_bench_sweep_" + std::to_string(::getpid()) +
                                                                    "_" + std::to_string(jobs));
        std::filesystem::remove_all(out);
        SweepOptions o;
        o.out_dir = out.string();
        o.quiet = true;
        o.jobs = jobs;
        o.threads = 1;
        const auto start = std::chrono::steady_clock::now();
        const int code = sweep_command(sweep_file, o);
        const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        std::ifstream table(out / "table.csv");
        std::string line;
        points = 0;
        for (std::getline(table, line); std::getline(table, line);) ++points;
        std::filesystem::remove_all(out);
        if (code != 0) return code;
        rate[jobs] = static_cast<double>(points) / seconds * 3600;
        std::printf("  %d worker process%s: %zu points in %.1f s = %.0f cases per hour\n", jobs, jobs == 1 ? "" : "es",
                    points, seconds, rate[jobs]);
    }
    std::printf("Parallel efficiency from 1 to 2 processes: %.0f %% (aim 85 %%)\n", 100 * rate[2] / (2 * rate[1]));
    return 0;
}

}  // namespace heatbead
