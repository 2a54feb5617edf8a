#include "solver/studies/sweep_plan.hpp"

#include "solver/core/text.hpp"
#include "solver/studies/run_setup.hpp"

#include <toml++/toml.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <numeric>
#include <random>
#include <sstream>

namespace heatbead {

namespace {

constexpr std::string_view top_keys[] = {"base", "combine", "samples", "seed", "outputs", "set", "axes"};
constexpr std::string_view axis_keys[] = {"key", "values", "from", "to", "step", "count", "log", "unit"};

struct Reader {
    std::string path;
    std::vector<Diagnostic> problems;

    std::string where(const toml::node* node) const {
        if (node && node->source().begin) return path + ":" + std::to_string(node->source().begin.line);
        return path;
    }
    void fail(const toml::node* node, std::string key, std::string message) {
        problems.push_back({where(node), std::move(key), node ? render(*node) : "", std::move(message)});
    }
};

// A TOML value as --set takes it: strings quoted, numbers as they are.
std::string as_override(const toml::node& node) {
    if (auto s = node.as_string()) return "\"" + s->get() + "\"";
    if (auto i = node.as_integer()) return std::to_string(i->get());
    if (auto f = node.as_floating_point()) return format_text("%.10g", f->get());
    if (auto b = node.as_boolean()) return b->get() ? "true" : "false";
    if (node.is_array()) return render(node);
    return "";
}

// A numeric range of an axis: from, to, and step or count (log: geometric with count).
std::vector<std::string> range_values(Reader& r, const toml::table& t, const std::string& prefix) {
    const auto number = [&](std::string_view k) -> std::optional<double> {
        const toml::node* n = t.get(k);
        if (!n) return std::nullopt;
        if (auto v = n->value<double>(); v && std::isfinite(*v)) return *v;
        r.fail(n, prefix + std::string(k), "expected a plain number (give the unit with `unit`)");
        return std::nullopt;
    };
    const auto from = number("from"), to = number("to"), step = number("step");
    const toml::node* count_node = t.get("count");
    std::optional<long> count;
    if (count_node) {
        if (auto c = count_node->value<long>(); c && *c >= 1 && *c <= 100000) count = *c;
        else r.fail(count_node, prefix + "count", "expected a whole number from 1 to 100000");
    }
    const bool log = t.get("log") && t.get("log")->value<bool>().value_or(false);
    std::string unit;
    if (const toml::node* u = t.get("unit")) {
        if (auto s = u->value<std::string>()) unit = *s;
        else r.fail(u, prefix + "unit", "expected a unit as text, e.g. \"mm/s\"");
    }
    if (!from || !to) {
        r.fail(t.get(from ? "to" : "from"), prefix + (from ? "to" : "from"),
               "missing: an axis needs `values`, or a range with `from`, `to` and `step` or `count`");
        return {};
    }
    if (step.has_value() == count.has_value()) {
        r.fail(t.get("step") ? t.get("step") : t.get("from"), prefix + "step",
               "give exactly one of `step` (a difference) and `count` (how many values)");
        return {};
    }
    std::vector<double> v;
    if (log) {
        if (!count || *from <= 0 || *to <= 0) {
            r.fail(t.get("log"), prefix + "log", "a log range needs `count` and positive `from` and `to`");
            return {};
        }
        for (long i = 0; i < *count; ++i) v.push_back(*from * std::pow(*to / *from, *count == 1 ? 0.0 : double(i) / double(*count - 1)));
    } else if (count) {
        for (long i = 0; i < *count; ++i) v.push_back(*count == 1 ? *from : *from + (*to - *from) * double(i) / double(*count - 1));
    } else {
        if (!(*step > 0) || (*to - *from) / *step > 100000) {
            r.fail(t.get("step"), prefix + "step", "must be positive and give at most 100000 values");
            return {};
        }
        for (double x = *from; x <= *to + 1e-9 * std::abs(*step); x += *step) v.push_back(x);
        if (*to < *from) std::reverse(v.begin(), v.end());
    }
    std::vector<std::string> out;
    for (double x : v) out.push_back(unit.empty() ? format_text("%.10g", x) : format_text("\"%.10g %s\"", x, unit.c_str()));
    return out;
}

void check_known(Reader& r, const toml::table& t, std::span<const std::string_view> known, const std::string& prefix) {
    for (const auto& [k, node] : t) {
        if (std::find(known.begin(), known.end(), k.str()) != known.end()) continue;
        std::string allowed;
        for (auto a : known) allowed += (allowed.empty() ? "" : ", ") + std::string(a);
        r.fail(&node, prefix + std::string(k.str()), "unknown key; allowed: " + allowed);
    }
}

// Latin hypercube: each axis's range (or list) cut into `n` strata, one sample in each, strata
// shuffled independently per axis (McKay, Beckman & Conover 1979).
void latin_hypercube(SweepPlan& plan, std::size_t n, unsigned seed) {
    std::mt19937_64 rng(seed);
    std::uniform_real_distribution<double> unit(0.0, 1.0);
    std::vector<std::vector<std::size_t>> strata(plan.axes.size());
    for (auto& s : strata) {
        s.resize(n);
        std::iota(s.begin(), s.end(), 0);
        std::shuffle(s.begin(), s.end(), rng);
    }
    for (std::size_t i = 0; i < n; ++i) {
        SweepPoint p{i, {}};
        for (std::size_t a = 0; a < plan.axes.size(); ++a) {
            const auto& values = plan.axes[a].values;
            const double u = (static_cast<double>(strata[a][i]) + unit(rng)) / static_cast<double>(n);
            p.values.push_back(values[std::min(values.size() - 1, static_cast<std::size_t>(u * static_cast<double>(values.size())))]);
        }
        plan.points.push_back(std::move(p));
    }
}

}  // namespace

std::string text_hash(const std::string& text) {
    std::uint64_t h = 14695981039346656037ull;  // FNV-1a offset basis and prime (Fowler, Noll, Vo)
    for (unsigned char ch : text) h = (h ^ ch) * 1099511628211ull;
    return format_text("%016llx", static_cast<unsigned long long>(h));
}

std::vector<Override> base_overrides(const SweepPlan& plan) {
    std::vector<Override> o{{"bands.enabled", "false"}};
    o.insert(o.end(), plan.fixed.begin(), plan.fixed.end());
    return o;
}

std::vector<Override> point_overrides(const SweepPlan& plan, const SweepPoint& point) {
    std::vector<Override> o = base_overrides(plan);
    for (std::size_t a = 0; a < plan.axes.size(); ++a) o.push_back({plan.axes[a].key, point.values[a]});
    return o;
}

SweepPlan read_sweep_plan(const std::string& path) {
    SweepPlan plan;
    plan.file = path;
    Reader r{path, {}};
    std::ifstream in(path);
    if (!in) throw CaseError({{path, "", "", "cannot open the sweep file"}});
    std::stringstream text;
    text << in.rdbuf();
    plan.text = text.str();
    toml::table root;
    try {
        root = toml::parse(plan.text, path);
    } catch (const toml::parse_error& e) {
        throw CaseError({{path + ":" + std::to_string(e.source().begin.line), "", "", std::string(e.description())}});
    }
    check_known(r, root, top_keys, "");
    if (auto base = root["base"].value<std::string>()) {
        plan.base = path_beside(*base, path);
    } else {
        r.fail(root.get("base"), "base", "missing or not text: the base case file, relative to the sweep file");
    }
    const std::string combine = root["combine"].value_or(std::string("grid"));
    if (combine != "grid" && combine != "zip" && combine != "sample") {
        r.fail(root.get("combine"), "combine", "not allowed; use one of: grid, zip, sample");
    }
    plan.combine = combine;
    const std::string outputs = root["outputs"].value_or(std::string("summary"));
    if (outputs != "summary" && outputs != "full") r.fail(root.get("outputs"), "outputs", "not allowed; use one of: summary, full");
    plan.full_outputs = outputs == "full";
    if (auto set = root["set"].as_table()) {
        for (const auto& [k, node] : *set) plan.fixed.push_back({std::string(k.str()), as_override(node)});
    }
    const toml::table* axes = root["axes"].as_table();
    if (!axes || axes->empty()) r.fail(root.get("axes"), "axes", "missing: give at least one [axes.NAME] table with `key` and values");
    if (axes) {
        for (const auto& [name, node] : *axes) {
            const std::string prefix = "axes." + std::string(name.str()) + ".";
            const toml::table* t = node.as_table();
            if (!t) {
                r.fail(&node, "axes." + std::string(name.str()), "expected a table with `key` and values");
                continue;
            }
            check_known(r, *t, axis_keys, prefix);
            SweepAxis axis{std::string(name.str()), (*t)["key"].value_or(std::string()), {}};
            if (axis.key.empty()) r.fail(t->get("key"), prefix + "key", "missing: the case key this axis varies, e.g. \"procedure.current\"");
            if (const toml::array* list = (*t)["values"].as_array()) {
                for (const auto& v : *list) {
                    const std::string o = as_override(v);
                    if (o.empty()) r.fail(&v, prefix + "values", "each value must be a number or text");
                    else axis.values.push_back(o);
                }
                if (list->empty()) r.fail(t->get("values"), prefix + "values", "empty axis: give at least one value");
            } else {
                axis.values = range_values(r, *t, prefix);
            }
            plan.axes.push_back(std::move(axis));
        }
    }
    long samples = 0;
    if (combine == "sample") {
        const toml::node* n = root.get("samples");
        samples = n ? n->value<long>().value_or(0) : 0;
        if (samples < 1 || samples > 100000) r.fail(n, "samples", "a Latin hypercube needs a sample size from 1 to 100000");
    }
    if (combine == "zip") {
        for (const auto& a : plan.axes) {
            if (!plan.axes.empty() && !a.values.empty() && a.values.size() != plan.axes.front().values.size()) {
                r.fail(axes->get(a.name), "axes." + a.name,
                       "zipped axes must have the same number of values: " + std::to_string(a.values.size()) + " here, " +
                           std::to_string(plan.axes.front().values.size()) + " in axes." + plan.axes.front().name);
            }
        }
    }
    // Each axis key must be one of the base case's: read the base case with the axis's first value.
    if (r.problems.empty()) {
        for (const auto& a : plan.axes) {
            try {
                std::vector<Override> o = plan.fixed;
                o.push_back({a.key, a.values.front()});
                load_case(plan.base, o);
            } catch (const CaseError& e) {
                const toml::node* key_node = (*axes->get(a.name)->as_table()).get("key");
                for (const auto& d : e.diagnostics()) {
                    r.problems.push_back({r.where(key_node), "axes." + a.name + ".key", a.key,
                                          "with " + a.values.front() + " in " + plan.base + ": " + d.message});
                }
            }
        }
    }
    if (!r.problems.empty()) throw CaseError(std::move(r.problems));
    if (combine == "grid") {
        std::size_t total = 1;
        for (const auto& a : plan.axes) total *= a.values.size();
        for (std::size_t i = 0; i < total; ++i) {
            SweepPoint p{i, {}};
            std::size_t rest = i;
            // The last axis varies fastest.
            std::vector<std::string> values(plan.axes.size());
            for (std::size_t a = plan.axes.size(); a-- > 0;) {
                values[a] = plan.axes[a].values[rest % plan.axes[a].values.size()];
                rest /= plan.axes[a].values.size();
            }
            p.values = std::move(values);
            plan.points.push_back(std::move(p));
        }
    } else if (combine == "zip") {
        for (std::size_t i = 0; i < plan.axes.front().values.size(); ++i) {
            SweepPoint p{i, {}};
            for (const auto& a : plan.axes) p.values.push_back(a.values[i]);
            plan.points.push_back(std::move(p));
        }
    } else {
        latin_hypercube(plan, static_cast<std::size_t>(samples), static_cast<unsigned>(root["seed"].value_or(1L)));
    }
    return plan;
}

}  // namespace heatbead
