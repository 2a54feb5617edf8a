#include "solver/run_command.hpp"

#include "mesh/grid.hpp"
#include "post/hdf5_results.hpp"
#include "post/station_metrics.hpp"
#include "solver/check.hpp"
#include "solver/exit_codes.hpp"
#include "solver/procedure.hpp"
#include "solver/progress.hpp"
#include "solver/run_estimate.hpp"
#include "solver/run_setup.hpp"

#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <omp.h>

namespace heatbead {

std::atomic<bool>& interrupt_flag() {
    static std::atomic<bool> flag{false};
    return flag;
}

namespace {

extern "C" void on_signal(int) { interrupt_flag().store(true); }

post::RunRecord make_record(const Simulation& sim, const LoadedCase& loaded, const RunResult& result,
                            std::vector<std::vector<double>>& keep) {
    post::RunRecord rec;
    rec.grid = &sim.grid();
    rec.cells = &sim.cells();
    const auto& h = sim.history();
    rec.fields.push_back({"peak_temperature", "degC", "highest temperature the cell reached", h.peak()});
    rec.fields.push_back({"time_of_peak", "s", "time at which the cell reached its peak", h.time_of_peak()});
    for (std::size_t n = 0; n < post::ThermalHistory::levels.size(); ++n) {
        const int level = static_cast<int>(post::ThermalHistory::levels[n]);
        rec.fields.push_back({"last_below_" + std::to_string(level), "s",
                              "last time the cell cooled through " + std::to_string(level) + " degC (NaN: never)",
                              h.last_below(n)});
    }
    keep.emplace_back(sim.temperature().begin(), sim.temperature().end());
    rec.fields.push_back({"final_temperature", "degC", "temperature when the run stopped", keep.back()});
    for (const auto& p : sim.probes()) rec.probes.push_back({p.name, p.position, p.time, p.temperature});
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
    std::signal(SIGINT, on_signal);
    std::signal(SIGTERM, on_signal);
    const Case& c = loaded.value;
    if (options.threads > 0) omp_set_num_threads(options.threads);
    const std::filesystem::path out = options.out_dir.empty()
                                          ? std::filesystem::path("results") / std::filesystem::path(c.file).stem()
                                          : std::filesystem::path(options.out_dir);

    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    Simulation sim(grid, material, make_losses(c), make_passes(c), make_settings(c));
    for (std::size_t i = 0; i < c.output.probes.size(); ++i) sim.add_probe("user_" + std::to_string(i + 1), c.output.probes[i]);

    const RunEstimate estimate = estimate_run(c, grid, material);
    ProgressPrinter progress(options.quiet, estimate.simulated_time);
    const auto start = std::chrono::steady_clock::now();
    const RunResult result =
        sim.run(interrupt_flag(), [&](double t, double x, double dt, double hot) { progress.update(t, x, dt, hot); });
    const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    progress.finish();
    if (!result.completed || interrupt_flag().load()) {
        std::fprintf(stderr, "heatbead: run %s at t = %.2f s; nothing was written\n",
                     interrupt_flag().load() ? "interrupted" : result.stop_reason.c_str(), result.end_time);
        return exit_code::run_failed;
    }

    std::vector<std::vector<double>> keep;
    const auto results_file = out / "results.h5";
    post::write_hdf5_results(results_file, make_record(sim, loaded, result, keep));

    const double error = result.energy.error();
    if (!options.quiet) {
        std::printf("heatbead run  %s\n", c.file.c_str());
        std::printf("Heat input  %.3f kJ/mm (net power %.0f W at %.2f mm/s)\n", heat_input(c.procedure) * 1e-6,
                    net_power(c.procedure), c.procedure.travel_speed * 1e3);
        std::printf("Grid        %zu solid cells (%zu x %zu x %zu grid), finest %.2f mm\n", sim.cells().size(),
                    grid.x.cells(), grid.y.cells(), grid.z.cells(), c.grid.cross_section.finest * 1e3);
        std::printf("Material    %s\n", material.description().c_str());
        std::printf("Integrator  %s: %zu steps (%zu rejected), %zu stages, %.3g cell updates\n",
                    c.solver.integrator.c_str(), result.steps, result.rejected, result.stages, result.cell_updates);
        std::printf("Stopped     at %.1f s: %s\n", result.end_time, result.stop_reason.c_str());
        std::printf("Energy      arc %.1f kJ = stored %.1f kJ + lost %.1f kJ; balance error %+.3f %%%s\n",
                    result.energy.arc * 1e-3, result.energy.stored * 1e-3, result.energy.lost * 1e-3, error * 100,
                    std::abs(error) > 0.01 ? "  ** ABOVE 1 % **" : "");
        std::printf("Hottest     %.0f degC at the end; run time %.2f s on %d threads\n", result.max_temperature, wall,
                    omp_get_max_threads());
        const auto m = post::station_metrics(grid, sim.cells(), sim.history(), c.output.station, c.base.solidus);
        char penetration[32] = "none", t85[32] = "n/a";
        if (m.penetration) std::snprintf(penetration, sizeof penetration, "%.2f mm", *m.penetration * 1e3);
        if (m.t8_5) std::snprintf(t85, sizeof t85, "%.2f s", *m.t8_5);
        std::printf("Station     x = %.1f mm: flange penetration %s, HAZ t8/5 (median of %zu cells) %s\n",
                    c.output.station * 1e3, penetration, m.haz_cells, t85);
        for (const auto& w : c.warnings) std::printf("Warning     %s\n", w.c_str());
        std::printf("Files       %s\n", results_file.string().c_str());
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
