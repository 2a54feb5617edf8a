#include "solver/app/run_command.hpp"

#include "solver/app/interrupt.hpp"

#include "mesh/grid.hpp"
#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/hdf5_results.hpp"
#include "post/vtk_output.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/app/run_files.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/app/progress.hpp"
#include "solver/numerics/run_estimate.hpp"
#include "solver/studies/answer_bands.hpp"
#include "solver/studies/how_computed.hpp"
#include "solver/studies/run_setup.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <optional>
#include <omp.h>
#include <thread>

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

// `heatbead run`, one step per part of the procedure; run() reads as that procedure. The snapshot
// observer holds `this`, so a command is built in place and never copied.
class RunCommand {
public:
    RunCommand(const LoadedCase& loaded, const RunOptions& options);
    RunCommand(const RunCommand&) = delete;
    RunCommand& operator=(const RunCommand&) = delete;

    int run();

private:
    bool wants(std::string_view kind) const;
    void start_snapshots();
    void simulate();
    bool failed() const;
    int clean_up_failure() const;
    void analyse();
    bool make_bands();
    void write_hdf5();
    void write_tables();
    void write_section_lines();
    void write_vtk();
    void write_report();
    void print_summary() const;
    int balance_status() const;

    const LoadedCase& loaded_;
    const Case& c_;
    const RunOptions& options_;
    const std::filesystem::path out_;
    // Temperature snapshots go to a folder that only gets its final name once the run completed.
    const std::filesystem::path series_dir_, series_partial_;
    const mesh::Grid grid_;
    const Material material_;
    PreparedRun prepared_;
    std::optional<post::VtkSeries> series_;
    double next_snapshot_ = 0;
    RunResult result_;
    double wall_ = 0;  // s the run took
    RunAnalysis analysis_;
    post::Summary summary_;
    std::optional<AnswerBands> bands_;  // none: turned off
    std::vector<std::string> written_;  // what the screen lists under "Files"
};

RunCommand::RunCommand(const LoadedCase& loaded, const RunOptions& options)
    : loaded_(loaded),
      c_(loaded.value),
      options_(options),
      out_(options.out_dir.empty() ? std::filesystem::path("results") / std::filesystem::path(c_.file).stem()
                                   : std::filesystem::path(options.out_dir)),
      series_dir_(out_ / "temperature_series"),
      series_partial_(out_ / "temperature_series.partial"),
      grid_(mesh::build_grid(c_.joint, c_.grid)),
      material_(make_material(c_.base)),
      prepared_(prepare_run(c_, grid_, material_)) {}

int RunCommand::run() {
    start_snapshots();
    simulate();
    if (failed()) return clean_up_failure();
    analyse();
    if (!make_bands()) return clean_up_failure();
    write_hdf5();
    write_tables();
    write_section_lines();
    write_vtk();
    write_report();
    print_summary();
    return balance_status();
}

bool RunCommand::wants(std::string_view kind) const {
    return std::find(c_.output.files.begin(), c_.output.files.end(), kind) != c_.output.files.end();
}

void RunCommand::start_snapshots() {
    if (!wants("vtk")) return;
    std::filesystem::remove_all(series_partial_);
    series_.emplace(series_partial_, "temperature");
    Simulation& sim = *prepared_.sim;
    sim.add_observer([this, &sim](double t, std::span<const double> T) {
        if (t + 1e-12 < next_snapshot_) return;
        series_->add(t, grid_, sim.cells(), sim.active(), {{"temperature", T}});
        next_snapshot_ = t + c_.output.snapshot_interval;
    });
}

void RunCommand::simulate() {
    const RunEstimate estimate = estimate_run(c_, grid_, material_);
    const StopPlan stop = stop_plan(c_);
    ProgressPrinter progress(options_.quiet,
                             {estimate.simulated_time, stop.rule.temperature, stop.base, c_.solver.time_limit});
    const auto start = std::chrono::steady_clock::now();
    result_ = prepared_.sim->run(interrupt_flag(),
                                 [&](double t, double x, double dt, double hot) { progress.update(t, x, dt, hot); });
    wall_ = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    progress.finish();
}

bool RunCommand::failed() const { return !result_.completed || interrupt_flag().load(); }

// Nothing of a failed run stays behind: not the partial snapshots, nor an output folder left empty.
int RunCommand::clean_up_failure() const {
    std::error_code ignored;
    std::filesystem::remove_all(series_partial_, ignored);
    if (std::filesystem::is_directory(out_, ignored) && std::filesystem::is_empty(out_, ignored)) {
        std::filesystem::remove(out_, ignored);
    }
    std::fprintf(stderr, "heatbead: run %s at t = %.2f s; nothing was written\n",
                 interrupt_flag().load() ? "interrupted" : result_.stop_reason.c_str(), result_.end_time);
    return exit_code::run_failed;
}

void RunCommand::analyse() {
    analysis_ = analyse_run(c_, prepared_);
    summary_ = make_summary(c_, result_, analysis_, wall_);
}

// The extra runs side by side, as many at a time as the run had threads (one per core by default).
bool RunCommand::make_bands() {
    if (c_.bands.enabled) {
        const int cores = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
        const int total = options_.threads > 0 ? options_.threads : cores;
        const int jobs = std::min(total, static_cast<int>(band_variants(c_).size()));
        if (!options_.quiet) {
            std::printf("Bands       running %zu extra runs, %d at a time\n", band_variants(c_).size(), jobs);
            std::fflush(stdout);
        }
        try {
            bands_ = run_bands(c_, grid_, material_, summary_, jobs, std::max(1, total / jobs), interrupt_flag());
        } catch (const BandsInterrupted&) {
            return false;
        }
    }
    add_bands(summary_, bands_ ? &*bands_ : nullptr);
    return true;
}

void RunCommand::write_hdf5() {
    if (!wants("hdf5")) return;
    const auto file = out_ / "results.h5";
    post::write_hdf5_results(file, make_record(prepared_, loaded_, result_, analysis_));
    written_.push_back(file.string());
}

void RunCommand::write_tables() {
    if (!wants("summary")) return;
    post::write_file_atomically(out_ / "summary.json", summary_.to_json());
    post::write_file_atomically(out_ / "summary.csv", summary_.to_csv());
    post::write_file_atomically(out_ / "probes.csv", probes_csv(analysis_));
    post::write_file_atomically(out_ / "along_weld.csv", along_weld_csv(analysis_));
    written_.push_back((out_ / "summary.json").string() + ", summary.csv, probes.csv, along_weld.csv");
}

void RunCommand::write_section_lines() {
    if (!wants("contours")) return;
    post::write_file_atomically(out_ / "section_lines.csv", section_lines_csv(analysis_));
    written_.push_back((out_ / "section_lines.csv").string());
}

// The snapshot folder takes its final name, then the fields and section lines go beside it.
void RunCommand::write_vtk() {
    if (!series_) return;
    series_->finish();
    std::filesystem::remove_all(series_dir_);
    std::filesystem::rename(series_partial_, series_dir_);
    write_vtk_results(out_, c_, prepared_, analysis_);
    written_.push_back((series_dir_ / "temperature.pvd").string() + ", fields.vtu, section_lines.vtp");
}

void RunCommand::write_report() {
    if (!wants("report")) return;
    // The summary's notes (lack of fusion, cold lap, probes from a plate surface, hardness) and the root.
    std::vector<std::string> notes;
    for (const auto& [group, note] : summary_.notes()) notes.push_back(note);
    if (!analysis_.section.root_fused) notes.push_back("the root is not fused");
    post::ReportInput input = make_report_input(c_, prepared_, analysis_, summary_, notes);
    input.bands = bands_view({"this run"}, {&summary_}, {bands_ ? &*bands_ : nullptr}, "");
    input.how_computed = post::how_computed(method_facts(c_, prepared_.sim->cells().size()));
    post::write_report(out_ / "report.html", input);
    written_.push_back((out_ / "report.html").string());
}

void RunCommand::print_summary() const {
    if (options_.quiet) return;
    std::printf("heatbead run  %s  (%zu solid cells, %s, %zu steps, stopped at %.1f s: %s)\n", c_.file.c_str(),
                prepared_.sim->cells().size(), c_.solver.integrator.c_str(), result_.steps, result_.end_time,
                result_.stop_reason.c_str());
    std::printf("%s", summary_.to_text().c_str());
    if (std::abs(result_.energy.error()) > 0.01) std::printf("Energy      ** BALANCE ERROR ABOVE 1 %% **\n");
    if (material_.parameters().liquid_conductivity_factor > 1) {
        std::printf("Material    %s\n", material_.description().c_str());
    }
    if (bands_) {
        std::printf("Bands       %zu extra runs in %.1f s (%.1f x this run): the bands shown in brackets\n", bands_->runs,
                    bands_->wall, bands_->wall / std::max(wall_, 1e-9));
    } else {
        std::printf("Bands       none: bands.enabled = false\n");
    }
    for (const auto& w : c_.warnings) std::printf("Warning     %s\n", w.c_str());
    for (const auto& f : written_) std::printf("Files       %s\n", f.c_str());
    std::printf("Caution     %s\n", post::planning_caution);
    std::printf("Method      %s\n", post::how_computed_brief(method_facts(c_, prepared_.sim->cells().size())).c_str());
}

// Results whose energy balance is off by more than 1 % are written, but the exit code says so.
int RunCommand::balance_status() const {
    const double error = result_.energy.error();
    if (std::abs(error) <= 0.01) return exit_code::ok;
    std::fprintf(stderr, "heatbead: the energy balance is off by %.2f %% (more than 1 %%): the results are "
                         "not trustworthy; refine the grid or reduce solver.max_temperature_change\n",
                 error * 100);
    return exit_code::outside_validity;
}

}  // namespace

int run_command(const LoadedCase& loaded, const RunOptions& options) {
    // Handlers first: a Ctrl-C while the grid is built must also end cleanly.
    catch_interrupts();
    if (options.threads > 0) omp_set_num_threads(options.threads);
    RunCommand command(loaded, options);
    return command.run();
}

}  // namespace heatbead
