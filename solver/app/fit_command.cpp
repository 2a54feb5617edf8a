#include "solver/app/fit_command.hpp"

#include "solver/app/interrupt.hpp"

#include "solver/studies/run_setup.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "solver/studies/how_computed.hpp"
#include "post/compare_report.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/core/text.hpp"
#include "solver/studies/fit_measurements.hpp"
#include "solver/app/run_files.hpp"
#include "solver/studies/source_fit.hpp"
#include "solver/core/units.hpp"

#include <nlohmann/json.hpp>
#include <toml++/toml.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <sstream>
#include <thread>

namespace heatbead {

namespace {

bool is_length(const std::string& name) { return name != "arc_efficiency"; }

std::string shown(const std::string& name, double v) {
    return is_length(name) ? format_text("%.2f mm", v * 1e3) : format_text("%.3f", v);
}

// The case's resolved listing with the fitted source and efficiency: a case file that reads back.
std::string fitted_case_toml(const LoadedCase& loaded, const FitResult& fit) {
    toml::table t = toml::parse(loaded.resolved_toml);
    const Case& c = fit.fitted;
    if (auto* procedure = t["procedure"].as_table()) {
        procedure->insert_or_assign("arc_efficiency", c.procedure.arc_efficiency);
        procedure->erase("net_power");
    }
    toml::table* source = t["source"].as_table();
    if (!source) source = t.insert_or_assign("source", toml::table{}).first->second.as_table();
    source->insert_or_assign("shape", "given");
    source->insert_or_assign("origin", c.source.origin_at_root ? "root" : "face");
    source->insert_or_assign("half_width", units::format(c.source.half_width, "mm", units::Dimension::length));
    source->insert_or_assign("depth", units::format(c.source.depth, "mm", units::Dimension::length));
    source->insert_or_assign("front_length", units::format(c.source.front_length, "mm", units::Dimension::length));
    source->insert_or_assign("rear_length", units::format(c.source.rear_length, "mm", units::Dimension::length));
    std::ostringstream os;
    os << "# " << loaded.value.file << " with its heat source fitted by `heatbead fit` (" << fit.runs << " runs).\n";
    os << toml::toml_formatter(t) << "\n";
    return os.str();
}

nlohmann::json to_json(const FitResult& f) {
    nlohmann::json j;
    for (const auto& u : f.unknowns) {
        j["unknowns"].push_back({{"name", u.name}, {"start", u.start}, {"fitted", u.value}, {"low_95", u.low},
                                 {"high_95", u.high}, {"unit", is_length(u.name) ? "m" : "1"}});
    }
    for (std::size_t i = 0; i < f.labels.size(); ++i) {
        j["measurements"].push_back({{"what", f.labels[i]}, {"measured", f.measured[i]}, {"uncertainty", f.uncertainty[i]},
                                     {"before", f.before.values[i]}, {"after", f.after.values[i]}});
    }
    j["misfit_before"] = f.before.misfit;
    j["misfit_after"] = f.after.misfit;
    j["runs"] = f.runs;
    j["iterations"] = f.iterations;
    j["warnings"] = f.warnings;
    j["caution"] = post::fit_caution;
    return j;
}

// The predicted lines before and after the fit on one drawing, with the measurements as the table.
post::CompareReportInput report_input(const Case& c, const Measurements& m, const FitResult& f) {
    post::CompareReportInput r;
    r.title = "Heat source fitted: " + std::filesystem::path(c.file).stem().string();
    r.created = now_utc();
    r.plates = plate_outlines(c.joint);
    for (const auto& [name, p] : {std::pair{"start", &f.before}, std::pair{"fitted", &f.after}}) {
        post::ComparedProcedure proc;
        proc.name = name;
        proc.case_file = c.file;
        proc.bead = bead_outline(c.joint);
        proc.fusion_line = curves(p->fusion_line);
        proc.haz_line = curves(p->haz_line);
        r.procedures.push_back(std::move(proc));
    }
    for (const auto& u : f.unknowns) {
        r.rows.push_back({u.name, {shown(u.name, u.start), shown(u.name, u.value) + " (" + shown(u.name, u.low) + " to " +
                                                               shown(u.name, u.high) + ")"}});
    }
    for (std::size_t i = 0; i < f.labels.size(); ++i) {
        const bool temperature = f.labels[i].rfind("thermocouple", 0) == 0, area = f.labels[i] == "fused_area";
        const double scale = temperature ? 1 : area ? 1e6 : 1e3;
        const char* unit = temperature ? " degC" : area ? " mm2" : " mm";
        const auto with_unit = [&](double v) { return format_text("%.3g%s", v * scale, unit); };
        r.rows.push_back({f.labels[i] + " (measured " + with_unit(f.measured[i]) + ")",
                          {with_unit(f.before.values[i]), with_unit(f.after.values[i])}});
    }
    if (!m.boundary.empty()) {
        // The digitised boundary, drawn as a line of its own beside the predicted ones.
        post::ComparedProcedure measured;
        measured.name = "measured boundary";
        measured.case_file = m.file;
        measured.fusion_line.push_back({m.boundary});
        r.procedures.push_back(std::move(measured));
        for (auto& row : r.rows) row.second.push_back("");  // the table's columns are start and fitted
    }
    r.differences.push_back(
        format_text("The misfit fell from %.4g to %.4g in %d runs.", f.before.misfit, f.after.misfit, f.runs));
    r.warnings = f.warnings;
    r.caution = post::fit_caution;
    post::MethodFacts facts = method_facts(c);
    facts.bands = post::fit_makes_no_bands;
    r.how_computed = post::how_computed(facts);
    return r;
}

}  // namespace

int fit_command(const LoadedCase& loaded, const FitOptions& o) {
    const Case& c = loaded.value;
    const Measurements m = read_measurements(o.measured, c);
    const int cores = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
    const int jobs = o.jobs > 0 ? o.jobs : cores;
    const int threads = o.threads > 0 ? o.threads : std::max(1, cores / jobs);
    const std::filesystem::path out = o.out_dir.empty() ? std::filesystem::path("results") / std::filesystem::path(c.file).stem()
                                                        : std::filesystem::path(o.out_dir);
    if (!o.quiet) {
        std::printf("heatbead fit  %s to %s: %zu unknowns, %zu section measurements, %zu thermocouples\n", c.file.c_str(),
                    m.file.c_str(), m.unknowns.size(), m.section.size(), m.thermocouples.size());
        std::fflush(stdout);
    }
    const auto start = std::chrono::steady_clock::now();
    const FitResult fit = fit_source(c, m, jobs, threads, interrupt_flag(), [&](const std::string& line) {
        if (!o.quiet) std::printf("  %s\n", line.c_str()), std::fflush(stdout);
    });
    const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    const auto fitted_file = out / (std::filesystem::path(c.file).stem().string() + ".fitted.toml");
    const std::string text = fitted_case_toml(loaded, fit);
    post::write_file_atomically(fitted_file, text);
    post::write_file_atomically(out / "fit.json", to_json(fit).dump(2) + "\n");
    post::write_compare_report(out / "fit.html", report_input(c, m, fit));
    load_case(fitted_file.string());  // the calibrated case must read back as a case
    if (!o.quiet) {
        std::printf("%-16s %12s %12s   %s\n", "unknown", "start", "fitted", "approximate 95 % interval");
        for (const auto& u : fit.unknowns) {
            std::printf("%-16s %12s %12s   %s to %s\n", u.name.c_str(), shown(u.name, u.start).c_str(),
                        shown(u.name, u.value).c_str(), shown(u.name, u.low).c_str(), shown(u.name, u.high).c_str());
        }
        std::printf("%-28s %12s %12s %12s\n", "measurement", "measured", "before", "after");
        for (std::size_t i = 0; i < fit.labels.size() && i < 12; ++i) {
            const bool area = fit.labels[i] == "fused_area", temperature = fit.labels[i].rfind("thermocouple", 0) == 0;
            const double scale = temperature ? 1 : area ? 1e6 : 1e3;
            std::printf("%-28s %12.3g %12.3g %12.3g %s\n", fit.labels[i].c_str(), fit.measured[i] * scale,
                        fit.before.values[i] * scale, fit.after.values[i] * scale, temperature ? "degC" : area ? "mm2" : "mm");
        }
        std::printf("Misfit      %.4g before, %.4g after (sum of squared residuals over uncertainties)\n", fit.before.misfit,
                    fit.after.misfit);
        std::printf("Runs        %d in %.0f s, %d iterations\n", fit.runs, wall, fit.iterations);
        for (const auto& w : fit.warnings) std::printf("Warning     %s\n", w.c_str());
        std::printf("Files       %s, %s, fit.html\n", fitted_file.string().c_str(), (out / "fit.json").string().c_str());
        std::printf("Caution     %s\n", post::fit_caution);
    }
    return exit_code::ok;
}

}  // namespace heatbead
