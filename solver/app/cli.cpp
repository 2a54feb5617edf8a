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
};

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

}  // namespace

int run_command_line(int argc, char** argv) {
    CLI::App app{"heatbead: heat flow of one arc-welding pass on a fillet-welded tee joint"};
    app.require_subcommand(1);
    CommonOptions options;
    bool resolved = false;
    auto* check = app.add_subcommand("check", "validate a case and print the quantities to check before a run");
    add_case_options(*check, options);
    check->add_option("--format", options.format, "output format of the summary")->check(CLI::IsMember({"text", "json"}));
    check->add_flag("--resolved", resolved, "print the resolved case (every default filled in) as TOML");

    auto* run = app.add_subcommand("run", "simulate the pass and the cooling after it; write results");
    CommonOptions run_options;
    RunOptions run_extra;
    add_case_options(*run, run_options);
    run->add_option("--threads", run_extra.threads, "OpenMP threads (default: all cores)")->check(CLI::Range(1, 1024));

    auto* preheat = app.add_subcommand("preheat", "find the lowest preheat that keeps the HAZ within the limits of "
                                                  "[preheat_search], beside the EN 1011-2 method B value");
    CommonOptions preheat_options;
    PreheatOptions preheat_extra;
    add_case_options(*preheat, preheat_options);
    preheat->add_option("--jobs", preheat_extra.jobs, "runs at a time (default: one per core)")->check(CLI::Range(1, 256));
    preheat->add_option("--threads", preheat_extra.threads, "OpenMP threads per run (default: cores / jobs)")
        ->check(CLI::Range(1, 1024));

    auto* compare = app.add_subcommand("compare", "run procedures for the same joint and set them side by side");
    std::vector<std::string> compare_cases, compare_sets;
    CompareOptions compare_extra;
    bool no_preheat = false;
    compare->add_option("cases", compare_cases, "two or more case files (TOML) for the same joint")->required()->expected(2, 64);
    compare->add_option("--set", compare_sets, "override a case key in every case (repeatable)")->type_size(1)->allow_extra_args(false);
    compare->add_option("--out", compare_extra.out_dir, "folder for the files written")->capture_default_str();
    compare->add_flag("--quiet", compare_extra.quiet, "print nothing but errors");
    compare->add_flag("--no-preheat", no_preheat, "skip the preheat search of cases with a composition and hydrogen");
    compare->add_option("--jobs", compare_extra.jobs, "runs at a time (default: one per core)")->check(CLI::Range(1, 256));
    compare->add_option("--threads", compare_extra.threads, "OpenMP threads per run (default: cores / jobs)")
        ->check(CLI::Range(1, 1024));

    auto* sweep = app.add_subcommand("sweep", "run every point of a sweep file; resumable; local workers, MPI or shards");
    std::string sweep_file, shard_text;
    SweepOptions sweep_extra;
    sweep->add_option("sweep", sweep_file, "sweep file (TOML)");
    sweep->add_option("--out", sweep_extra.out_dir, "folder for the table, report and points (default results/<sweep>)");
    sweep->add_option("--jobs", sweep_extra.jobs, "worker processes (default 1)")->check(CLI::Range(1, 256));
    sweep->add_option("--threads", sweep_extra.threads, "OpenMP threads per point (default: cores / jobs)")
        ->check(CLI::Range(1, 1024));
    sweep->add_option("--shard", shard_text, "only points i, i+n, i+2n, ... (i/n with 0 <= i < n), for job arrays");
    sweep->add_flag("--quiet", sweep_extra.quiet, "print nothing but errors");
    auto* merge = sweep->add_subcommand("merge", "join the folders of a sharded sweep into one table");
    std::string merge_out;
    std::vector<std::string> merge_dirs;
    merge->add_option("out", merge_out, "folder for the joined table")->required();
    merge->add_option("shards", merge_dirs, "the shards' --out folders")->required();
    sweep->require_subcommand(0, 1);

    auto* fit = app.add_subcommand("fit", "calibrate the heat source to a measured macro-section or thermocouple trace");
    CommonOptions fit_options;
    FitOptions fit_extra;
    add_case_options(*fit, fit_options);
    fit->add_option("--measured", fit_extra.measured, "the measurement file (TOML)")->required();
    fit->add_option("--jobs", fit_extra.jobs, "runs at a time (default: one per core)")->check(CLI::Range(1, 256));
    fit->add_option("--threads", fit_extra.threads, "OpenMP threads per run (default: cores / jobs)")->check(CLI::Range(1, 1024));

    auto* bench = app.add_subcommand("bench", "measure speed on the reference case (ratios from one run)");
    BenchOptions bench_options;
    bench->add_option("case", bench_options.case_path, "reference case file")->capture_default_str();
    bench->add_flag("--quick", bench_options.quick, "small grids: checks the benchmark runs, figures not meaningful");
    std::string bench_sweep;
    bench->add_option("--sweep", bench_sweep, "instead: cases per hour of this sweep with 1 and 2 worker processes");

    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& e) {
        const int code = app.exit(e);
        return code == 0 ? exit_code::ok : exit_code::bad_input;
    }
    try {
        if (check->parsed()) return check_command(options, resolved);
        if (bench->parsed()) return bench_sweep.empty() ? bench_command(bench_options) : bench_sweep_command(bench_sweep);
        if (preheat->parsed()) {
            preheat_extra.out_dir = preheat_options.out_dir;
            preheat_extra.quiet = preheat_options.quiet;
            return preheat_command(load(preheat_options), preheat_extra);
        }
        if (compare->parsed()) {
            compare_extra.preheat = !no_preheat;
            return compare_command(load_all(compare_cases, compare_sets), compare_extra);
        }
        if (fit->parsed()) {
            fit_extra.out_dir = fit_options.out_dir;
            fit_extra.quiet = fit_options.quiet;
            return fit_command(load(fit_options), fit_extra);
        }
        if (merge->parsed()) return sweep_merge_command(merge_out, merge_dirs, sweep_extra.quiet);
        if (sweep->parsed()) {
            if (sweep_file.empty()) {
                std::cerr << "heatbead sweep: give a sweep file, or `merge OUT DIR...`\n";
                return exit_code::bad_input;
            }
            if (!shard_text.empty()) {
                try {
                    sweep_extra.shard = parse_shard(shard_text);
                } catch (const std::invalid_argument& e) {
                    std::cerr << "heatbead: " << e.what() << "\n";
                    return exit_code::bad_input;
                }
            }
            if (sweep_extra.threads == 0) {
                const int cores = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
                sweep_extra.threads = std::max(1, cores / sweep_extra.jobs);
            }
            return sweep_command(sweep_file, sweep_extra);
        }
        if (run->parsed()) {
            run_extra.out_dir = run_options.out_dir;
            run_extra.quiet = run_options.quiet;
            return run_command(load(run_options), run_extra);
        }
    } catch (const CaseError& e) {
        const auto& d = e.diagnostics();
        std::cerr << "heatbead: " << d.size() << (d.size() == 1 ? " problem" : " problems")
                  << " in the case; nothing was computed or written:\n";
        for (const auto& item : d) std::cerr << "  " << item.text() << "\n";
        return exit_code::bad_input;
    } catch (const std::exception& e) {
        std::cerr << "heatbead: " << e.what() << "\n";
        return exit_code::run_failed;
    }
    return exit_code::ok;
}

}  // namespace heatbead
