#include "solver/app/run_command.hpp"

#include "solver/app/interrupt.hpp"

#include "mesh/grid.hpp"
#include "post/hdf5_results.hpp"
#include "post/atomic_file.hpp"
#include "post/vtk_output.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/app/run_files.hpp"
#include "solver/app/check.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/app/progress.hpp"
#include "solver/numerics/run_estimate.hpp"
#include "solver/studies/run_setup.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <optional>
#include <omp.h>

namespace heatbead {

namespace {

post::RunRecord make_record(const PreparedRun& run, const LoadedCase& loaded, const RunResult& result,
                            const RunAnalysis& analysis) {
    const Simulation& sim = *run.sim;
    post::RunRecord rec;
    rec.grid = &sim.grid();
    rec.cells = &sim.cells();
    const auto& h = run.history();
    rec.fields.push_back({"peak_temperature", "degC", "highest temperature the cell reached", h.peak()});
    rec.fields.push_back({"time_of_peak", "s", "time at which the cell reached its peak", h.time_of_peak()});
    for (std::size_t n = 0; n < post::ThermalHistory::levels.size(); ++n) {
        const int level = static_cast<int>(post::ThermalHistory::levels[n]);
        rec.fields.push_back({"last_below_" + std::to_string(level), "s",
                              "last time the cell cooled through " + std::to_string(level) + " degC (NaN: never)",
                              h.last_below(n)});
    }
    rec.fields.push_back({"t8_5", "s", "cooling time from 800 to 500 degC (NaN: did not pass both)", analysis.t8_5});
    rec.fields.push_back({"final_temperature", "degC", "temperature when the run stopped", sim.temperature()});
    for (const auto& p : analysis.probes) rec.probes.push_back({p.name, p.position, p.time, p.temperature});
    const Case& c = loaded.value;
    const auto& e = result.energy;
    rec.scalars = {
        {"heat_input", heat_input(c.procedure), "J/m", "net arc power / travel speed"},
        {"net_power", net_power(c.procedure), "W", "arc efficiency x U x I, or the given net power"},
        {"arc_energy", e.arc, "J", "energy the arc put in"},
        {"stored_energy", e.stored, "J", "rise of stored enthalpy over the initial temperature"},
        {"lost_energy", e.lost, "J", "convection and radiation through free surfaces"},
        {"energy_balance_error", e.error(), "1", "(arc - stored - lost) / arc"},
        {"end_time", result.end_time, "s", "simulated time when the run stopped"},
        {"steps", static_cast<double>(result.steps), "1", "accepted time steps"},
    };
    rec.resolved_case = loaded.resolved_toml;
    rec.warnings = c.warnings;
    rec.stop_reason = result.stop_reason;
    rec.program_version = HEATBEAD_VERSION;
    return rec;
}

}  // namespace

int run_command(const LoadedCase& loaded, const RunOptions& options) {
    // Handlers first: a Ctrl-C while the grid is built must also end cleanly.
    catch_interrupts();
    const Case& c = loaded.value;
    if (options.threads > 0) omp_set_num_threads(options.threads);
    const std::filesystem::path out = options.out_dir.empty()
                                          ? std::filesystem::path("results") / std::filesystem::path(c.file).stem()
                                          : std::filesystem::path(options.out_dir);

    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    PreparedRun prepared = prepare_run(c, grid, material);
    Simulation& sim = *prepared.sim;
    const auto wants = [&](std::string_view kind) {
        return std::find(c.output.files.begin(), c.output.files.end(), kind) != c.output.files.end();
    };
    // Temperature snapshots go to a folder that only gets its final name once the run completed.
    const auto series_dir = out / "temperature_series", series_partial = out / "temperature_series.partial";
    std::optional<post::VtkSeries> series;
    double next_snapshot = 0;
    if (wants("vtk")) {
        std::filesystem::remove_all(series_partial);
        series.emplace(series_partial, "temperature");
        sim.add_observer([&](double t, std::span<const double> T) {
            if (t + 1e-12 < next_snapshot) return;
            series->add(t, grid, sim.cells(), sim.active(), {{"temperature", T}});
            next_snapshot = t + c.output.snapshot_interval;
        });
    }

    const RunEstimate estimate = estimate_run(c, grid, material);
    ProgressPrinter progress(options.quiet, estimate.simulated_time);
    const auto start = std::chrono::steady_clock::now();
    const RunResult result =
        sim.run(interrupt_flag(), [&](double t, double x, double dt, double hot) { progress.update(t, x, dt, hot); });
    const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    progress.finish();
    if (!result.completed || interrupt_flag().load()) {
        std::error_code ignored;
        std::filesystem::remove_all(series_partial, ignored);
        if (std::filesystem::is_directory(out, ignored) && std::filesystem::is_empty(out, ignored)) {
            std::filesystem::remove(out, ignored);
        }
        std::fprintf(stderr, "heatbead: run %s at t = %.2f s; nothing was written\n",
                     interrupt_flag().load() ? "interrupted" : result.stop_reason.c_str(), result.end_time);
        return exit_code::run_failed;
    }

    const RunAnalysis analysis = analyse_run(c, prepared);
    const post::Summary summary = make_summary(c, result, analysis, wall);
    std::vector<std::string> written;
    if (wants("hdf5")) {
        const auto file = out / "results.h5";
        post::write_hdf5_results(file, make_record(prepared, loaded, result, analysis));
        written.push_back(file.string());
    }
    if (wants("summary")) {
        post::write_file_atomically(out / "summary.json", summary.to_json());
        post::write_file_atomically(out / "summary.csv", summary.to_csv());
        post::write_file_atomically(out / "probes.csv", probes_csv(analysis));
        post::write_file_atomically(out / "along_weld.csv", along_weld_csv(analysis));
        written.push_back((out / "summary.json").string() + ", summary.csv, probes.csv, along_weld.csv");
    }

    if (wants("contours")) {
        post::write_file_atomically(out / "section_lines.csv", section_lines_csv(analysis));
        written.push_back((out / "section_lines.csv").string());
    }
    if (series) {
        series->finish();
        std::filesystem::remove_all(series_dir);
        std::filesystem::rename(series_partial, series_dir);
        write_vtk_results(out, c, prepared, analysis);
        written.push_back((series_dir / "temperature.pvd").string() + ", fields.vtu, section_lines.vtp");
    }
    if (wants("report")) {
        std::vector<std::string> notes;
        if (analysis.section.lack_of_fusion_flange) notes.push_back("lack of fusion into the flange predicted");
        if (analysis.section.lack_of_fusion_web) notes.push_back("lack of fusion into the web predicted");
        if (!analysis.section.root_fused) notes.push_back("the root is not fused");
        post::write_report(out / "report.html", make_report_input(c, prepared, analysis, summary, notes));
        written.push_back((out / "report.html").string());
    }

    const double error = result.energy.error();
    if (!options.quiet) {
        std::printf("heatbead run  %s  (%zu solid cells, %s, %zu steps, stopped at %.1f s: %s)\n", c.file.c_str(),
                    sim.cells().size(), c.solver.integrator.c_str(), result.steps, result.end_time,
                    result.stop_reason.c_str());
        std::printf("%s", summary.to_text().c_str());
        if (std::abs(error) > 0.01) std::printf("Energy      ** BALANCE ERROR ABOVE 1 %% **\n");
        if (material.parameters().liquid_conductivity_factor > 1) {
            std::printf("Material    %s\n", material.description().c_str());
        }
        for (const auto& w : c.warnings) std::printf("Warning     %s\n", w.c_str());
        for (const auto& f : written) std::printf("Files       %s\n", f.c_str());
        std::printf("Caution     %s\n", planning_caution);
    }
    if (std::abs(error) > 0.01) {
        std::fprintf(stderr, "heatbead: the energy balance is off by %.2f %% (more than 1 %%): the results are "
                             "not trustworthy; refine the grid or reduce solver.max_temperature_change\n",
                     error * 100);
        return exit_code::outside_validity;
    }
    return exit_code::ok;
}

}  // namespace heatbead
