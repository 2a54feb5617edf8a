#include "solver/app/cli.hpp"

#include "post/atomic_file.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/app/bench.hpp"
#include "solver/app/check.hpp"
#include "solver/app/compare_command.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/app/fit_command.hpp"
#include "solver/app/preheat_command.hpp"
#include "solver/app/run_command.hpp"
#include "solver/app/sweep_command.hpp"

#include <CLI/CLI.hpp>

#include <filesystem>
#include <iostream>
#include <thread>

namespace heatbead {

namespace {

struct CommonOptions {
    std::string case_path;
    std::vector<std::string> sets;
    std::string format = "text";
    std::string out_dir;
    bool quiet = false;
    bool no_bands = false;
};

// --no-bands is --set bands.enabled=false: the case key and the flag are one switch.
constexpr const char* bands_off = "bands.enabled=false";

void add_no_bands(CLI::App& cmd, bool& no_bands) {
    cmd.add_flag("--no-bands", no_bands, "skip the extra runs that band the headline answers (" + std::string(bands_off) + ")");
}

void add_case_options(CLI::App& cmd, CommonOptions& o) {
    cmd.add_option("case", o.case_path, "case file (TOML)")->required();
    cmd.add_option("--set", o.sets, "override a case key, e.g. --set procedure.current=\"280 A\" (repeatable)")
        ->type_size(1)
        ->allow_extra_args(false);
    cmd.add_option("--out", o.out_dir, "folder for the files written");
    cmd.add_flag("--quiet", o.quiet, "print nothing but errors");
}

LoadedCase load(const CommonOptions& o) {
    std::vector<Override> overrides;
    for (const auto& s : o.sets) overrides.push_back(parse_override(s));
    if (o.no_bands) overrides.push_back(parse_override(bands_off));
    return load_case(o.case_path, overrides);
}

// Every case with the same overrides; the problems of all of them are reported together.
std::vector<LoadedCase> load_all(const std::vector<std::string>& paths, const std::vector<std::string>& sets) {
    std::vector<Override> overrides;
    for (const auto& s : sets) overrides.push_back(parse_override(s));
    std::vector<LoadedCase> cases;
    std::vector<Diagnostic> problems;
    for (const auto& path : paths) {
        try {
            cases.push_back(load_case(path, overrides));
        } catch (const CaseError& e) {
            problems.insert(problems.end(), e.diagnostics().begin(), e.diagnostics().end());
        }
    }
    if (!problems.empty()) throw CaseError(std::move(problems));
    return cases;
}

int check_command(const CommonOptions& o, bool resolved) {
    const LoadedCase loaded = load(o);
    const CheckReport report = make_check_report(loaded.value);
    if (!o.out_dir.empty()) {
        const std::filesystem::path dir(o.out_dir);
        post::write_file_atomically(dir / "case.resolved.toml", loaded.resolved_toml);
        post::write_file_atomically(dir / "check.json", to_json(report).dump(2) + "\n");
    }
    if (o.quiet) return exit_code::ok;
    if (resolved) {
        std::cout << loaded.resolved_toml;
    } else if (o.format == "json") {
        std::cout << to_json(report).dump(2) << "\n";
    } else {
        std::cout << to_text(report);
        if (!o.out_dir.empty()) std::cout << "Files       " << o.out_dir << "/check.json, case.resolved.toml\n";
    }
    return exit_code::ok;
}

// Each subcommand: its node in the parser and the values its options fill in. CLI11 keeps the
// addresses of those values, so they stay where they are declared.
struct CheckArgs {
    CLI::App* command = nullptr;
    CommonOptions options;
    bool resolved = false;
};
// A command on one case: the options every case command has, and the command's own.
template <class Extra>
struct CaseCommandArgs {
    CLI::App* command = nullptr;
    CommonOptions options;
    Extra extra;
    // The command's own options, with --out and --quiet taken from the common ones.
    const Extra& command_options() {
        extra.out_dir = options.out_dir;
        extra.quiet = options.quiet;
        return extra;
    }
};
using RunArgs = CaseCommandArgs<RunOptions>;
using PreheatArgs = CaseCommandArgs<PreheatOptions>;
using FitArgs = CaseCommandArgs<FitOptions>;
struct CompareArgs {
    CLI::App* command = nullptr;
    std::vector<std::string> cases, sets;
    CompareOptions extra;
    bool no_preheat = false, no_bands = false;
};
struct SweepArgs {
    CLI::App* command = nullptr;
    CLI::App* merge = nullptr;
    std::string file, shard;
    SweepOptions extra;
    std::string merge_out;
    std::vector<std::string> merge_dirs;
};
struct BenchArgs {
    CLI::App* command = nullptr;
    BenchOptions options;
    std::string sweep;
};
struct Subcommands {
    CheckArgs check;
    RunArgs run;
    PreheatArgs preheat;
    CompareArgs compare;
    SweepArgs sweep;
    FitArgs fit;
    BenchArgs bench;
};

// --jobs and --threads of the commands that run several cases at a time.
void add_parallel_options(CLI::App& cmd, int& jobs, int& threads) {
    cmd.add_option("--jobs", jobs, "runs at a time (default: one per core)")->check(CLI::Range(1, 256));
    cmd.add_option("--threads", threads, "OpenMP threads per run (default: cores / jobs)")->check(CLI::Range(1, 1024));
}

void declare_check(CLI::App& app, CheckArgs& a) {
    a.command = app.add_subcommand("check", "validate a case and print the quantities to check before a run");
    add_case_options(*a.command, a.options);
    a.command->add_option("--format", a.options.format, "output format of the summary")
        ->check(CLI::IsMember({"text", "json"}));
    a.command->add_flag("--resolved", a.resolved, "print the resolved case (every default filled in) as TOML");
}

void declare_run(CLI::App& app, RunArgs& a) {
    a.command = app.add_subcommand("run", "simulate the pass and the cooling after it; write results");
    add_case_options(*a.command, a.options);
    add_no_bands(*a.command, a.options.no_bands);
    a.command->add_option("--threads", a.extra.threads, "OpenMP threads (default: all cores)")->check(CLI::Range(1, 1024));
}

void declare_preheat(CLI::App& app, PreheatArgs& a) {
    a.command = app.add_subcommand("preheat", "find the lowest preheat that keeps the HAZ within the limits of "
                                              "[preheat_search], beside the EN 1011-2 method B value");
    add_case_options(*a.command, a.options);
    add_no_bands(*a.command, a.options.no_bands);
    add_parallel_options(*a.command, a.extra.jobs, a.extra.threads);
}

void declare_compare(CLI::App& app, CompareArgs& a) {
    auto* c = a.command = app.add_subcommand("compare", "run procedures for the same joint and set them side by side");
    c->add_option("cases", a.cases, "two or more case files (TOML) for the same joint")->required()->expected(2, 64);
    c->add_option("--set", a.sets, "override a case key in every case (repeatable)")->type_size(1)->allow_extra_args(false);
    c->add_option("--out", a.extra.out_dir, "folder for the files written")->capture_default_str();
    c->add_flag("--quiet", a.extra.quiet, "print nothing but errors");
    c->add_flag("--no-preheat", a.no_preheat, "skip the preheat search of cases with a composition and hydrogen");
    add_no_bands(*c, a.no_bands);
    add_parallel_options(*c, a.extra.jobs, a.extra.threads);
}

void declare_sweep(CLI::App& app, SweepArgs& a) {
    auto* s = a.command = app.add_subcommand("sweep", "run every point of a sweep file; resumable; local workers, MPI or shards");
    s->add_option("sweep", a.file, "sweep file (TOML)");
    s->add_option("--out", a.extra.out_dir, "folder for the table, report and points (default results/<sweep>)");
    s->add_option("--jobs", a.extra.jobs, "worker processes (default 1)")->check(CLI::Range(1, 256));
    s->add_option("--threads", a.extra.threads, "OpenMP threads per point (default: cores / jobs)")->check(CLI::Range(1, 1024));
    s->add_option("--shard", a.shard, "only points i, i+n, i+2n, ... (i/n with 0 <= i < n), for job arrays");
    s->add_flag("--quiet", a.extra.quiet, "print nothing but errors");
    a.merge = s->add_subcommand("merge", "join the folders of a sharded sweep into one table");
    a.merge->add_option("out", a.merge_out, "folder for the joined table")->required();
    a.merge->add_option("shards", a.merge_dirs, "the shards' --out folders")->required();
    s->require_subcommand(0, 1);
}

void declare_fit(CLI::App& app, FitArgs& a) {
    a.command = app.add_subcommand("fit", "calibrate the heat source to a measured macro-section or thermocouple trace");
    add_case_options(*a.command, a.options);
    a.command->add_option("--measured", a.extra.measured, "the measurement file (TOML)")->required();
    add_parallel_options(*a.command, a.extra.jobs, a.extra.threads);
}

void declare_bench(CLI::App& app, BenchArgs& a) {
    a.command = app.add_subcommand("bench", "measure speed on the reference case (ratios from one run)");
    a.command->add_option("case", a.options.case_path, "reference case file")->capture_default_str();
    a.command->add_flag("--quick", a.options.quick, "small grids: checks the benchmark runs, figures not meaningful");
    a.command->add_option("--sweep", a.sweep, "instead: cases per hour of this sweep with 1 and 2 worker processes");
}

int sweep_from_command_line(SweepArgs& a) {
    if (a.file.empty()) {
        std::cerr << "heatbead sweep: give a sweep file, or `merge OUT DIR...`\n";
        return exit_code::bad_input;
    }
    if (!a.shard.empty()) {
        try {
            a.extra.shard = parse_shard(a.shard);
        } catch (const std::invalid_argument& e) {
            std::cerr << "heatbead: " << e.what() << "\n";
            return exit_code::bad_input;
        }
    }
    if (a.extra.threads == 0) {
        const int cores = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
        a.extra.threads = std::max(1, cores / a.extra.jobs);
    }
    return sweep_command(a.file, a.extra);
}

// The one subcommand parsed (merge before sweep: `sweep merge` parses both).
int dispatch(Subcommands& s) {
    if (s.check.command->parsed()) return check_command(s.check.options, s.check.resolved);
    if (s.bench.command->parsed()) {
        return s.bench.sweep.empty() ? bench_command(s.bench.options) : bench_sweep_command(s.bench.sweep);
    }
    if (s.preheat.command->parsed()) return preheat_command(load(s.preheat.options), s.preheat.command_options());
    if (s.compare.command->parsed()) {
        s.compare.extra.preheat = !s.compare.no_preheat;
        if (s.compare.no_bands) s.compare.sets.push_back(bands_off);
        return compare_command(load_all(s.compare.cases, s.compare.sets), s.compare.extra);
    }
    if (s.fit.command->parsed()) return fit_command(load(s.fit.options), s.fit.command_options());
    if (s.sweep.merge->parsed()) return sweep_merge_command(s.sweep.merge_out, s.sweep.merge_dirs, s.sweep.extra.quiet);
    if (s.sweep.command->parsed()) return sweep_from_command_line(s.sweep);
    if (s.run.command->parsed()) return run_command(load(s.run.options), s.run.command_options());
    return exit_code::ok;
}

void print_case_problems(const CaseError& e) {
    const auto& d = e.diagnostics();
    std::cerr << "heatbead: " << d.size() << (d.size() == 1 ? " problem" : " problems")
              << " in the case; nothing was computed or written:\n";
    for (const auto& item : d) std::cerr << "  " << item.text() << "\n";
}

}  // namespace

int run_command_line(int argc, char** argv) {
    CLI::App app{"heatbead: heat flow of one arc-welding pass on a fillet-welded tee joint"};
    app.require_subcommand(1);
    Subcommands s;
    declare_check(app, s.check);
    declare_run(app, s.run);
    declare_preheat(app, s.preheat);
    declare_compare(app, s.compare);
    declare_sweep(app, s.sweep);
    declare_fit(app, s.fit);
    declare_bench(app, s.bench);
    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& e) {
        const int code = app.exit(e);
        return code == 0 ? exit_code::ok : exit_code::bad_input;
    }
    try {
        return dispatch(s);
    } catch (const CaseError& e) {
        print_case_problems(e);
        return exit_code::bad_input;
    } catch (const std::exception& e) {
        std::cerr << "heatbead: " << e.what() << "\n";
        return exit_code::run_failed;
    }
}

}  // namespace heatbead
