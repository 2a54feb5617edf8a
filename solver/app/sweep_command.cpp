#include "solver/app/sweep_command.hpp"

#include "solver/app/interrupt.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/hdf5_results.hpp"
#include "post/summary.hpp"
#include "post/sweep_report.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/core/exit_codes.hpp"
#include "solver/core/text.hpp"
#include "solver/app/run_command.hpp"
#include "solver/app/run_files.hpp"
#include "solver/studies/how_computed.hpp"
#include "solver/studies/sweep_plan.hpp"

#include <mpi.h>
#include <nlohmann/json.hpp>
#include <toml++/toml.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <cstdlib>
#include <fcntl.h>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <set>
#include <sstream>
#include <sys/prctl.h>
#include <sys/wait.h>
#include <unistd.h>

namespace heatbead {

namespace fs = std::filesystem;

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// One point to run: its overrides and identity.
struct Job {
    SweepPoint point;
    std::vector<Override> overrides;
    std::string hash, resolved;
};

// A finished point, everything its table row needs (kept as points/<hash>/row.json).
nlohmann::json axis_cells(const SweepPlan& plan, const Job& job) {
    // The value of each axis key as the resolved case states it, in the key's documented unit.
    const toml::table resolved = toml::parse(job.resolved);
    nlohmann::json cells = nlohmann::json::array();
    for (const auto& axis : plan.axes) {
        const toml::node* n = resolved.at_path(axis.key).node();
        double value = nan;
        std::string unit, text = n ? render(*n) : "";
        if (n && n->is_number()) value = n->value<double>().value_or(nan);
        if (auto s = n ? n->value<std::string>() : std::nullopt) {
            char* end = nullptr;
            value = std::strtod(s->c_str(), &end);
            if (end == s->c_str()) value = nan;
            unit = std::string(end);
            unit.erase(0, unit.find_first_not_of(' '));
        }
        cells.push_back({{"key", axis.key}, {"value", std::isfinite(value) ? nlohmann::json(value) : nlohmann::json(nullptr)},
                         {"unit", unit}, {"text", text}});
    }
    return cells;
}

nlohmann::json outputs_of(const fs::path& dir) {
    std::ifstream in(dir / "summary.json");
    nlohmann::json outputs = nlohmann::json::array();
    if (!in) return outputs;
    const nlohmann::json summary = nlohmann::json::parse(in, nullptr, false);
    if (summary.is_discarded()) return outputs;
    for (const auto& [key, item] : summary.items()) {
        if (key == "notes" || !item.is_object()) continue;
        nlohmann::json output{{"key", key}, {"unit", item.value("unit", "")}, {"value", item["value"]}};
        if (item.contains("reason")) output["reason"] = item["reason"];
        outputs.push_back(std::move(output));
        // A band (points run with bands.enabled = true) becomes two columns of its own.
        for (const char* end : {"low", "high"}) {
            if (item.contains(end) && !item[end].is_null())
                outputs.push_back({{"key", key + "_" + end}, {"unit", item.value("unit", "")}, {"value", item[end]}});
        }
    }
    return outputs;
}

std::string last_line(const fs::path& file) {
    std::ifstream in(file);
    std::string line, last;
    while (std::getline(in, line)) {
        if (!line.empty()) last = line;
    }
    return last;
}

// The outputs of a row that have no value, with why (post::missing_text names them).
std::vector<post::MissingOutput> missing_outputs(const nlohmann::json& outputs) {
    std::vector<post::MissingOutput> missing;
    for (const auto& o : outputs) {
        if (o["value"].is_null()) missing.push_back({o["key"].get<std::string>(), o.value("reason", "")});
    }
    return missing;
}

nlohmann::json make_row(const SweepPlan& plan, const Job& job, const fs::path& dir, int code) {
    nlohmann::json row;
    row["index"] = job.point.index;
    row["hash"] = job.hash;
    row["axes"] = axis_cells(plan, job);
    const bool written = code == exit_code::ok || code == exit_code::outside_validity;
    std::string status = code == exit_code::ok ? "ok" : code == exit_code::outside_validity ? "outside validity" : "failed";
    row["error"] = code == exit_code::ok ? "" : last_line(dir / "log.txt");
    if (row["error"] == "" && code != exit_code::ok) row["error"] = "exit code " + std::to_string(code);
    row["outputs"] = written ? outputs_of(dir) : nlohmann::json::array();
    // A point whose outputs are missing is not ok: its status names them and why.
    if (const std::string missing = post::missing_text(missing_outputs(row["outputs"])); !missing.empty()) {
        status = status == "ok" ? missing : status + "; " + missing;
    }
    row["status"] = status;
    return row;
}

// Computed, whatever it gave: a point that failed runs again on the next run of the sweep.
bool done(const nlohmann::json& row) { return row.contains("status") && row["status"] != "failed"; }

// Rows found in `dir`/points/*/row.json, by hash.
std::map<std::string, nlohmann::json> rows_in(const fs::path& dir) {
    std::map<std::string, nlohmann::json> rows;
    std::error_code ec;
    if (!fs::is_directory(dir / "points", ec)) return rows;
    for (const auto& entry : fs::directory_iterator(dir / "points")) {
        std::ifstream in(entry.path() / "row.json");
        if (!in) continue;
        nlohmann::json row = nlohmann::json::parse(in, nullptr, false);
        if (!row.is_discarded() && row.contains("hash")) rows[row["hash"].get<std::string>()] = row;
    }
    return rows;
}

std::string header_name(const std::string& key, const std::string& unit) { return unit.empty() ? key : key + " [" + unit + "]"; }

std::string csv_cell(const std::string& s) {
    if (s.find_first_of(",\"\n") == std::string::npos) return s;
    std::string out = "\"";
    for (char ch : s) out += ch == '"' ? std::string("\"\"") : ch == '\n' ? std::string(" ") : std::string(1, ch);
    return out + "\"";
}

std::string cell_text(const nlohmann::json& v) {
    if (v.is_null()) return "";
    if (v.is_string()) return v.get<std::string>();
    if (v.is_number()) return format_text("%.10g", v.get<double>());
    return v.dump();
}

// The table's columns: axes first (from any row), then every output any row has, in first-seen order.
struct Columns {
    std::vector<std::pair<std::string, std::string>> axes, outputs;  // key, unit
};

Columns columns_of(const std::vector<nlohmann::json>& rows) {
    Columns c;
    std::set<std::string> seen;
    for (const auto& r : rows) {
        if (c.axes.empty()) {
            for (const auto& a : r["axes"]) c.axes.emplace_back(a["key"].get<std::string>(), a.value("unit", ""));
        }
        for (const auto& o : r["outputs"]) {
            const std::string key = o["key"].get<std::string>();
            if (seen.insert(key).second) c.outputs.emplace_back(key, o.value("unit", ""));
        }
    }
    return c;
}

const nlohmann::json& output_value(const nlohmann::json& row, const std::string& key) {
    static const nlohmann::json none;
    for (const auto& o : row["outputs"]) {
        if (o["key"] == key) return o["value"];
    }
    return none;
}

std::string table_csv(const std::vector<nlohmann::json>& rows, const Columns& c) {
    std::string out = "point,hash,status,error";
    for (const auto& [k, u] : c.axes) out += "," + csv_cell(header_name(k, u));
    for (const auto& [k, u] : c.outputs) out += "," + csv_cell(header_name(k, u));
    out += "\n";
    for (const auto& r : rows) {
        out += std::to_string(r["index"].get<std::size_t>()) + "," + r["hash"].get<std::string>() + "," +
               csv_cell(r["status"].get<std::string>()) + "," + csv_cell(r["error"].get<std::string>());
        for (const auto& a : r["axes"]) out += "," + csv_cell(a["value"].is_null() ? a.value("text", "") : cell_text(a["value"]));
        for (const auto& [k, u] : c.outputs) out += "," + csv_cell(cell_text(output_value(r, k)));
        out += "\n";
    }
    return out;
}

post::TableRecord table_h5(const std::vector<nlohmann::json>& rows, const Columns& c, const std::string& sweep_text,
                           const std::string& base_case) {
    post::TableRecord t;
    t.program_version = HEATBEAD_VERSION;
    post::NumberColumn index{"point", "1", "index of the point in the sweep", {}};
    post::TextColumn hash{"hash", "hash of the point's resolved case (its identity)", {}},
        status{"status", "ok, outside validity or failed; and the outputs missing, with why", {}},
        error{"error", "why the point failed (empty when it did not)", {}};
    for (const auto& r : rows) {
        index.values.push_back(static_cast<double>(r["index"].get<std::size_t>()));
        hash.values.push_back(r["hash"]), status.values.push_back(r["status"]), error.values.push_back(r["error"]);
    }
    t.numbers.push_back(std::move(index));
    t.texts = {std::move(hash), std::move(status), std::move(error)};
    for (std::size_t a = 0; a < c.axes.size(); ++a) {
        post::NumberColumn col{c.axes[a].first, c.axes[a].second.empty() ? "1" : c.axes[a].second, "input axis", {}};
        for (const auto& r : rows) col.values.push_back(r["axes"][a]["value"].is_number() ? r["axes"][a]["value"].get<double>() : nan);
        t.numbers.push_back(std::move(col));
    }
    for (const auto& [k, u] : c.outputs) {
        bool numeric = true;
        for (const auto& r : rows) numeric = numeric && !output_value(r, k).is_string();
        if (numeric) {
            post::NumberColumn col{k, u.empty() ? "1" : u, "summary output", {}};
            for (const auto& r : rows) col.values.push_back(output_value(r, k).is_number() ? output_value(r, k).get<double>() : nan);
            t.numbers.push_back(std::move(col));
        } else {
            post::TextColumn col{k, "summary output", {}};
            for (const auto& r : rows) col.values.push_back(cell_text(output_value(r, k)));
            t.texts.push_back(std::move(col));
        }
    }
    t.documents = {{"sweep", "the sweep file", sweep_text}, {"base_case", "the base case as resolved, every default filled in", base_case}};
    return t;
}

constexpr const char* main_outputs[] = {"penetration_flange", "penetration_web", "t8_5_min", "fused_area",
                                        "haz_width_flange", "haz_hardness_max"};

post::SweepReportInput report_of(const std::vector<nlohmann::json>& rows, const Columns& c, const std::string& sweep_file,
                                 std::size_t total, const post::MethodRows& how) {
    post::SweepReportInput r;
    r.how_computed = how;
    r.title = "Sweep: " + fs::path(sweep_file).stem().string();
    r.sweep_file = sweep_file;
    r.created = now_utc();
    r.points_total = total;
    r.caution = post::sweep_caution;
    for (const auto& [k, u] : c.axes) r.axes.push_back({k, u});
    for (const char* key : main_outputs) {
        for (const auto& [k, u] : c.outputs) {
            if (k == key) r.outputs.push_back({k, u});
        }
    }
    const auto band_end = [](const nlohmann::json& row, const std::string& key) {
        const auto& v = output_value(row, key);
        return v.is_number() ? v.get<double>() : nan;
    };
    for (const auto& row : rows) {
        if (!done(row)) {
            post::SweepReportInput::Failure f;
            for (const auto& a : row["axes"]) f.axis_values.push_back(a.value("text", ""));
            f.error = row["error"];
            r.failures.push_back(std::move(f));
            continue;
        }
        if (row["status"] != "ok" && row["status"] != "outside validity") {
            post::SweepReportInput::Incomplete point;
            for (const auto& a : row["axes"]) point.axis_values.push_back(a.value("text", ""));
            point.status = row["status"];
            r.incomplete.push_back(std::move(point));
        }
        std::vector<double> values;
        for (const auto& a : row["axes"]) values.push_back(a["value"].is_number() ? a["value"].get<double>() : nan);
        std::vector<double> lows, highs;
        for (const auto& o : r.outputs) {
            const auto& v = output_value(row, o.name);
            values.push_back(v.is_number() ? v.get<double>() : nan);
            lows.push_back(band_end(row, o.name + "_low")), highs.push_back(band_end(row, o.name + "_high"));
        }
        r.rows.push_back(std::move(values));
        r.lows.push_back(std::move(lows)), r.highs.push_back(std::move(highs));
    }
    return r;
}

std::vector<nlohmann::json> sorted_rows(const fs::path& dir) {
    std::vector<nlohmann::json> rows;
    for (auto& [hash, row] : rows_in(dir)) rows.push_back(row);
    std::sort(rows.begin(), rows.end(), [](const auto& a, const auto& b) { return a["index"] < b["index"]; });
    return rows;
}

// table.csv of `dir` from every row there (after each point: cheap, and always whole).
void write_table_csv(const fs::path& dir) {
    const auto rows = sorted_rows(dir);
    post::write_file_atomically(dir / "table.csv", table_csv(rows, columns_of(rows)));
}

// table.csv, table.h5 and report.html of `dir` from every row there.
void write_outputs(const fs::path& dir, const std::string& sweep_text, const std::string& base_case,
                   const std::string& sweep_file, std::size_t total, const post::MethodRows& how) {
    const auto rows = sorted_rows(dir);
    const Columns c = columns_of(rows);
    post::write_file_atomically(dir / "table.csv", table_csv(rows, c));
    post::write_hdf5_table(dir / "table.h5", table_h5(rows, c, sweep_text, base_case));
    post::write_sweep_report(dir / "report.html", report_of(rows, c, sweep_file, total, how));
}

void log_line(const fs::path& dir, const std::string& line) {
    std::ofstream log(dir / "sweep.log", std::ios::app);
    log << line << "\n";
}

// The arguments of `heatbead run` for one point.
std::vector<std::string> run_arguments(const SweepPlan& plan, const Job& job, const fs::path& dir, int threads) {
    std::vector<std::string> args{"heatbead", "run", plan.base};
    for (const auto& o : job.overrides) args.insert(args.end(), {"--set", o.key_path + "=" + o.value});
    if (!plan.full_outputs) args.insert(args.end(), {"--set", "output.files=[\"summary\",\"contours\"]"});
    args.insert(args.end(), {"--out", dir.string(), "--quiet", "--threads", std::to_string(threads)});
    return args;
}

// Starts one worker process; it dies with the sweep (PR_SET_PDEATHSIG), so a killed sweep leaves no
// orphan computing a point the next run will compute again.
pid_t start_worker(const std::vector<std::string>& args, const fs::path& dir) {
    fs::create_directories(dir);
    const std::string exe = fs::read_symlink("/proc/self/exe").string();
    const std::string log = (dir / "log.txt").string();
    std::vector<char*> argv;
    for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    const pid_t parent = getpid();
    const pid_t pid = fork();
    if (pid == 0) {
        prctl(PR_SET_PDEATHSIG, SIGKILL);
        if (getppid() != parent) _exit(127);  // the sweep died between fork and prctl
        const int fd = open(log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
        if (fd >= 0) {
            dup2(fd, STDOUT_FILENO);
            dup2(fd, STDERR_FILENO);
            close(fd);
        }
        execv(exe.c_str(), argv.data());
        _exit(127);
    }
    if (pid < 0) throw std::runtime_error("cannot start a worker process");
    return pid;
}

struct Progress {
    bool quiet, terminal;
    std::size_t total, done = 0, failed = 0, skipped = 0;
    std::chrono::steady_clock::time_point start = std::chrono::steady_clock::now();
    void show(const std::string& last) {
        if (quiet) return;
        const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        const std::size_t ran = done + failed, left = total - skipped - ran;
        const double eta = ran ? elapsed / double(ran) * double(left) : nan;
        const std::string line =
            format_text("sweep %zu/%zu done, %zu failed, %zu from before; %s%s", done + skipped, total, failed, skipped,
                        std::isfinite(eta) ? ("about " + std::to_string(int(eta)) + " s left").c_str() : "",
                        last.empty() ? "" : ("; last: " + last).c_str());
        if (terminal) std::printf("\r%-120s", line.c_str());
        else std::printf("%s\n", line.c_str());
        std::fflush(stdout);
    }
    void finish() {
        if (!quiet && terminal) std::printf("\n");
    }
};

void record(const SweepPlan& plan, const Job& job, const fs::path& out, int code, Progress& progress) {
    const fs::path dir = out / "points" / job.hash;
    nlohmann::json row = make_row(plan, job, dir, code);
    post::write_file_atomically(dir / "row.json", row.dump(1) + "\n");
    post::write_file_atomically(dir / "case.toml", job.resolved);
    log_line(out, "done " + job.hash + " point " + std::to_string(job.point.index) + " " + row["status"].get<std::string>());
    (done(row) ? progress.done : progress.failed) += 1;
    progress.show("point " + std::to_string(job.point.index) + " " + row["status"].get<std::string>());
}

int exit_status(int status) {
    if (WIFEXITED(status)) return WEXITSTATUS(status);
    return exit_code::run_failed;
}

// Local workers: up to `jobs` processes at a time, the next point to whichever finishes.
void run_local(const SweepPlan& plan, const std::vector<Job>& jobs, const fs::path& out, const SweepOptions& o,
               Progress& progress, const std::function<void()>& on_row) {
    std::map<pid_t, const Job*> running;
    std::size_t next = 0;
    while (next < jobs.size() || !running.empty()) {
        while (!interrupt_flag().load() && next < jobs.size() && running.size() < static_cast<std::size_t>(o.jobs)) {
            const Job& job = jobs[next++];
            const fs::path dir = out / "points" / job.hash;
            log_line(out, "start " + job.hash + " point " + std::to_string(job.point.index));
            running[start_worker(run_arguments(plan, job, dir, o.threads), dir)] = &job;
        }
        if (running.empty()) break;
        int status = 0;
        const pid_t pid = waitpid(-1, &status, 0);
        if (pid < 0) {
            if (errno == EINTR) {
                // Ctrl-C or SIGTERM: pass it on; the workers stop and write nothing.
                for (const auto& [p, job] : running) kill(p, SIGINT);
                continue;
            }
            break;
        }
        const auto it = running.find(pid);
        if (it == running.end()) continue;
        const Job& job = *it->second;
        running.erase(it);
        const int code = exit_status(status);
        if (interrupt_flag().load() && code == exit_code::run_failed) {
            fs::remove_all(out / "points" / job.hash);  // interrupted, not failed: no row
            continue;
        }
        record(plan, job, out, code, progress);
        on_row();
    }
}

enum Tag { tag_request = 1, tag_job = 2, tag_result = 3 };

// MPI: rank 0 hands out points from its queue and records results; other ranks run points.
void run_mpi_master(const SweepPlan& plan, const std::vector<Job>& jobs, const fs::path& out, Progress& progress,
                    const std::function<void()>& on_row, int size) {
    std::size_t next = 0;
    int stopped = 0;
    std::map<int, const Job*> busy;
    while (stopped < size - 1) {
        int message[2];
        MPI_Status status;
        MPI_Recv(message, 2, MPI_INT, MPI_ANY_SOURCE, MPI_ANY_TAG, MPI_COMM_WORLD, &status);
        const int rank = status.MPI_SOURCE;
        if (status.MPI_TAG == tag_result) {
            const Job& job = *busy.at(rank);
            busy.erase(rank);
            record(plan, job, out, message[1], progress);
            on_row();
        }
        int reply = -1;
        if (!interrupt_flag().load() && next < jobs.size()) {
            reply = static_cast<int>(next);
            busy[rank] = &jobs[next];
            log_line(out, "start " + jobs[next].hash + " point " + std::to_string(jobs[next].point.index) + " rank " +
                              std::to_string(rank));
            ++next;
        } else {
            ++stopped;
        }
        MPI_Send(&reply, 1, MPI_INT, rank, tag_job, MPI_COMM_WORLD);
    }
}

void run_mpi_worker(const SweepPlan& plan, const std::vector<Job>& jobs, const fs::path& out, int threads) {
    int message[2] = {0, 0};
    MPI_Send(message, 2, MPI_INT, 0, tag_request, MPI_COMM_WORLD);
    for (;;) {
        int index = -1;
        MPI_Recv(&index, 1, MPI_INT, 0, tag_job, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
        if (index < 0) return;
        const Job& job = jobs[static_cast<std::size_t>(index)];
        const fs::path dir = out / "points" / job.hash;
        fs::create_directories(dir);
        int code = exit_code::run_failed;
        std::string error;
        try {
            std::vector<Override> o = job.overrides;
            if (!plan.full_outputs) o.push_back({"output.files", "[\"summary\",\"contours\"]"});
            code = run_command(load_case(plan.base, o), RunOptions{dir.string(), true, threads});
        } catch (const std::exception& e) {
            error = e.what();
        }
        if (!error.empty()) post::write_file_atomically(dir / "log.txt", error + "\n");
        message[0] = index, message[1] = code;
        MPI_Send(message, 2, MPI_INT, 0, tag_result, MPI_COMM_WORLD);
    }
}

// Started by mpirun (OpenMPI sets these for every rank)?
bool under_mpirun() { return std::getenv("OMPI_COMM_WORLD_SIZE") != nullptr || std::getenv("PMIX_RANK") != nullptr; }

}  // namespace

std::pair<int, int> parse_shard(const std::string& text) {
    int i = -1, n = 0;
    char tail = 0;
    if (std::sscanf(text.c_str(), "%d/%d%c", &i, &n, &tail) != 2 || n < 1 || i < 0 || i >= n) {
        throw std::invalid_argument("--shard " + text + ": expected i/n with 0 <= i < n, e.g. 0/4");
    }
    return {i, n};
}

int sweep_command(const std::string& sweep_file, const SweepOptions& o) {
    // Without SA_RESTART, so a wait for workers returns at Ctrl-C or SIGTERM and can pass it on.
    catch_interrupts(false);
    const SweepPlan plan = read_sweep_plan(sweep_file);
    fs::path out = o.out_dir.empty() ? fs::path("results") / fs::path(sweep_file).stem() : fs::path(o.out_dir);

    int rank = 0, size = 1;
    const bool mpi = under_mpirun();
    if (mpi) {
        MPI_Init(nullptr, nullptr);
        MPI_Comm_rank(MPI_COMM_WORLD, &rank);
        MPI_Comm_size(MPI_COMM_WORLD, &size);
    }
    // Every point's case, resolved, and its identity (every rank needs the same list).
    std::vector<Job> all;
    for (const auto& p : plan.points) {
        if (o.shard && static_cast<int>(p.index % static_cast<std::size_t>(o.shard->second)) != o.shard->first) continue;
        Job job{p, point_overrides(plan, p), "", ""};
        job.resolved = load_case(plan.base, job.overrides).resolved_toml;
        job.hash = text_hash(job.resolved);
        all.push_back(std::move(job));
    }
    const LoadedCase base = load_case(plan.base, base_overrides(plan));
    const std::string& base_case = base.resolved_toml;
    const post::MethodRows how = post::how_computed(method_facts(base.value));
    std::map<std::string, nlohmann::json> before = rows_in(out);
    std::vector<Job> pending;
    for (const auto& j : all) {
        const auto it = before.find(j.hash);
        if (it == before.end() || !done(it->second)) pending.push_back(j);
    }
    int code = exit_code::ok;
    if (rank == 0) {
        fs::create_directories(out / "points");
        post::write_file_atomically(out / "sweep.toml", plan.text);
        post::write_file_atomically(out / "base.resolved.toml", base_case);
        Progress progress{o.quiet, isatty(STDOUT_FILENO) != 0, all.size()};
        progress.skipped = all.size() - pending.size();
        if (!o.quiet) {
            std::printf("heatbead sweep  %s: %zu points (%s), %zu to run, %s\n", sweep_file.c_str(), all.size(),
                        plan.combine.c_str(), pending.size(),
                        mpi && size > 1 ? ("on " + std::to_string(size - 1) + " MPI ranks").c_str()
                                        : (std::to_string(o.jobs) + " worker process" + (o.jobs == 1 ? "" : "es")).c_str());
            std::fflush(stdout);
        }
        const auto on_row = [&] { write_table_csv(out); };
        if (mpi && size > 1) run_mpi_master(plan, pending, out, progress, on_row, size);
        else run_local(plan, pending, out, o, progress, on_row);
        progress.finish();
        write_outputs(out, plan.text, base_case, sweep_file, all.size(), how);
        if (!o.quiet) {
            std::printf("Points      %zu done (%zu this run, %zu from before), %zu failed\n", progress.done + progress.skipped,
                        progress.done, progress.skipped, progress.failed);
            std::printf("Files       %s, table.h5, report.html, sweep.log, points/\n", (out / "table.csv").string().c_str());
            std::printf("Caution     %s\n", post::sweep_caution);
        }
        if (interrupt_flag().load()) {
            std::fprintf(stderr, "heatbead: sweep interrupted; the points finished are in %s; run it again to go on\n",
                         (out / "table.csv").string().c_str());
            code = exit_code::run_failed;
        }
    } else {
        run_mpi_worker(plan, pending, out, o.threads);
    }
    if (mpi) MPI_Finalize();
    return code;
}

namespace {
// How the merged sweep was computed, from its resolved base case (the shards share it); none when
// it does not read back from where it was written (a property table beside the original case).
post::MethodRows merged_how_computed(const fs::path& out) {
    try {
        return post::how_computed(method_facts(load_case((out / "base.resolved.toml").string()).value));
    } catch (const CaseError&) {
        return {};
    }
}
}  // namespace

int sweep_merge_command(const std::string& out_dir, const std::vector<std::string>& shard_dirs, bool quiet) {
    const fs::path out(out_dir);
    std::size_t rows = 0;
    std::string sweep_text, base_case, sweep_file;
    for (const auto& d : shard_dirs) {
        const fs::path dir(d);
        if (!fs::is_regular_file(dir / "sweep.toml")) {
            throw CaseError({{d, "", "", "not a sweep's folder (no sweep.toml in it); give the --out folders of the shards"}});
        }
        std::ifstream s(dir / "sweep.toml"), b(dir / "base.resolved.toml");
        std::stringstream st, bt;
        st << s.rdbuf(), bt << b.rdbuf();
        if (sweep_text.empty()) sweep_text = st.str(), base_case = bt.str(), sweep_file = (dir / "sweep.toml").string();
        else if (st.str() != sweep_text) throw CaseError({{d, "", "", "its sweep file differs from " + shard_dirs.front() + "'s"}});
        for (const auto& [hash, row] : rows_in(dir)) {
            const fs::path target = out / "points" / hash;
            fs::create_directories(target);
            fs::copy(dir / "points" / hash, target, fs::copy_options::recursive | fs::copy_options::overwrite_existing);
            ++rows;
        }
    }
    post::write_file_atomically(out / "sweep.toml", sweep_text);
    post::write_file_atomically(out / "base.resolved.toml", base_case);
    write_outputs(out, sweep_text, base_case, sweep_file, rows_in(out).size(), merged_how_computed(out));
    if (!quiet) std::printf("Merged      %zu points from %zu folders into %s\n", rows, shard_dirs.size(), (out / "table.csv").string().c_str());
    return exit_code::ok;
}

}  // namespace heatbead
