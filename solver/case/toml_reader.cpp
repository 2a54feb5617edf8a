#include "solver/case/toml_reader.hpp"

#include "solver/core/text.hpp"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace heatbead {

namespace {

std::string quote(std::string_view s) {
    std::string out = "\"";
    for (char ch : s) {
        switch (ch) {
            case '"': out += "\\\""; break;
            case '\\': out += "\\\\"; break;
            case '\n': out += "\\n"; break;
            case '\t': out += "\\t"; break;
            default:
                if (static_cast<unsigned char>(ch) < 0x20) {
                    out += format_text("\\u%04x", ch);
                } else {
                    out += ch;
                }
        }
    }
    return out + "\"";
}

std::string join(const auto& words, std::string_view sep) {
    std::string out;
    for (const auto& w : words) {
        if (!out.empty()) out += sep;
        out += w;
    }
    return out;
}

std::string type_name(const toml::node& node) {
    switch (node.type()) {
        case toml::node_type::string: return "a string";
        case toml::node_type::integer: return "a whole number";
        case toml::node_type::floating_point: return "a number";
        case toml::node_type::boolean: return "true/false";
        case toml::node_type::array: return "a list";
        case toml::node_type::table: return "a section (table)";
        default: return "a date or time";
    }
}

// A few sample spellings, to show users the accepted form.
std::string example(units::Dimension dim, std::string_view unit) {
    return "e.g. " + quote("12 " + std::string(unit)) + " or a bare number in " +
           std::string(unit) + " (other units: " + join(units::unit_names(dim), ", ") + ")";
}

std::string describe(const Bounds& b, units::Dimension dim, std::string_view unit) {
    const auto f = [&](double v) { return units::format(v, unit, dim); };
    const bool has_lo = std::isfinite(b.lo), has_hi = std::isfinite(b.hi);
    if (has_lo && has_hi) {
        return (b.lo_open ? "> " : ">= ") + f(b.lo) + " and " + (b.hi_open ? "< " : "<= ") + f(b.hi);
    }
    if (has_lo) return (b.lo_open ? "> " : ">= ") + f(b.lo);
    if (has_hi) return (b.hi_open ? "< " : "<= ") + f(b.hi);
    return "any finite value";
}

}  // namespace

std::string Diagnostic::text() const {
    std::string out = origin;
    if (!key.empty()) out += ": " + key;
    if (!value.empty()) out += " = " + value;
    return out + ": " + message;
}

static std::string joined_message(const std::vector<Diagnostic>& ds) {
    std::string out;
    for (const auto& d : ds) {
        if (!out.empty()) out += '\n';
        out += d.text();
    }
    return out;
}

CaseError::CaseError(std::vector<Diagnostic> diagnostics)
    : std::runtime_error(joined_message(diagnostics)), diagnostics_(std::move(diagnostics)) {}

bool Bounds::contains(double v) const {
    if (lo_open ? !(v > lo) : !(v >= lo)) return false;
    if (hi_open ? !(v < hi) : !(v <= hi)) return false;
    return true;
}

std::string path_beside(const std::string& name, const std::string& input_file) {
    const std::filesystem::path f(name);
    return (f.is_relative() ? std::filesystem::path(input_file).parent_path() / f : f).string();
}

std::size_t edit_distance(std::string_view a, std::string_view b) {
    std::vector<std::size_t> row(b.size() + 1);
    for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
    for (std::size_t i = 1; i <= a.size(); ++i) {
        std::size_t diag = row[0];
        row[0] = i;
        for (std::size_t j = 1; j <= b.size(); ++j) {
            const std::size_t up = row[j];
            row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] == b[j - 1] ? 0 : 1)});
            diag = up;
        }
    }
    return row[b.size()];
}

std::string render(const toml::node& node) {
    if (auto s = node.as_string()) return quote(s->get());
    if (auto arr = node.as_array()) {
        std::string out = "[";
        for (std::size_t i = 0; i < arr->size(); ++i) out += (i ? ", " : "") + render((*arr)[i]);
        return out + "]";
    }
    if (node.is_table()) return "{...}";
    std::ostringstream os;
    node.visit([&](const auto& v) { os << v; });
    return os.str();
}

Override parse_override(std::string_view argument) {
    const auto fail = [&](std::string message) {
        throw CaseError({{"--set " + std::string(argument), "", "", std::move(message)}});
    };
    const auto eq = argument.find('=');
    if (eq == std::string_view::npos) fail("expected key.path=value, e.g. --set bead.leg_flange=\"8 mm\"");
    std::string key(argument.substr(0, eq));
    std::string value(argument.substr(eq + 1));
    const auto valid_char = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.'; };
    if (key.empty() || !std::all_of(key.begin(), key.end(), valid_char) || key.front() == '.' ||
        key.back() == '.' || key.find("..") != std::string::npos) {
        fail("the key path must be section.key with letters, digits and _, e.g. joint.length");
    }
    if (value.empty()) fail("no value after '='");
    return {key, value};
}

CaseDocument::CaseDocument(const std::string& path, const std::vector<Override>& overrides)
    : path_(path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw CaseError({{path, "", "", std::string("cannot open the case file: ") + std::strerror(errno)}});
    std::ostringstream text;
    text << in.rdbuf();
    try {
        root_ = toml::parse(text.str(), path);
    } catch (const toml::parse_error& e) {
        const auto& where = e.source().begin;
        throw CaseError({{path + ":" + std::to_string(where.line) + ":" + std::to_string(where.column), "", "",
                          "not valid TOML: " + std::string(e.description())}});
    }
    for (const auto& o : overrides) {
        const std::string origin = "--set " + o.key_path + "=" + o.value;
        // A value that is valid TOML (250, 1.2, true, ["hdf5"]) keeps its type; anything else
        // (12 mm, explicit) is taken as a string, so shells need no extra quoting.
        toml::table holder;
        try {
            holder = toml::parse("v = " + o.value);
        } catch (const toml::parse_error&) {
            holder.insert_or_assign("v", o.value);
        }
        toml::table* table = &root_;
        std::string_view rest = o.key_path;
        for (auto dot = rest.find('.'); dot != std::string_view::npos; dot = rest.find('.')) {
            const std::string part(rest.substr(0, dot));
            rest.remove_prefix(dot + 1);
            auto* child = table->get(part);
            if (!child) child = table->insert(part, toml::table{}).first->second.as_table();
            if (!child->is_table()) {
                throw CaseError({{origin, o.key_path, "", "\"" + part + "\" is a value, not a section"}});
            }
            table = child->as_table();
        }
        table->insert_or_assign(std::string(rest), std::move(*holder.get("v")));
        overridden_[o.key_path] = origin;
    }
}

std::string CaseDocument::origin(const toml::node* node, std::string_view key_path) const {
    if (auto it = overridden_.find(std::string(key_path)); it != overridden_.end()) return it->second;
    if (node && node->source().begin.line > 0) return path_ + ":" + std::to_string(node->source().begin.line);
    return path_;
}

void CaseDocument::add_error(const toml::node* node, std::string key_path, std::string message) {
    errors_.push_back({origin(node, key_path), key_path, node ? render(*node) : "", std::move(message)});
}

void CaseDocument::error(std::string_view key_path, std::string message) {
    const toml::node* node = root_.at_path(key_path).node();
    add_error(node, std::string(key_path), std::move(message));
}

void CaseDocument::declare(const std::string& section, const std::string& key) { known_[section].insert(key); }

void CaseDocument::open_section(const std::string& section) {
    if (std::find(section_order_.begin(), section_order_.end(), section) == section_order_.end()) {
        section_order_.push_back(section);
    }
}

void CaseDocument::record(const std::string& section, const std::string& key, std::string rendered,
                          std::string comment) {
    resolved_.push_back({section, key, std::move(rendered), std::move(comment)});
}

Section CaseDocument::section(std::string_view name, bool required) {
    const std::string n(name);
    declare("", n);
    open_section(n);
    const toml::node* node = root_.get(n);
    if (!node) {
        if (required) errors_.push_back({path_, "[" + n + "]", "", "missing section; this case needs it"});
        return Section(*this, n, nullptr);
    }
    if (!node->is_table()) {
        add_error(node, n, "must be a section [" + n + "], not " + type_name(*node));
        return Section(*this, n, nullptr);
    }
    return Section(*this, n, node->as_table());
}

std::string CaseDocument::suggestion(const std::string& section, const std::string& key) const {
    const auto close = [&](const std::string& candidate) {
        return edit_distance(key, candidate) <= std::max<std::size_t>(2, key.size() / 3);
    };
    std::string best;
    std::size_t best_d = std::string::npos;
    if (auto it = known_.find(section); it != known_.end()) {
        for (const auto& k : it->second) {
            const auto d = edit_distance(key, k);
            if (close(k) && d < best_d) best = k, best_d = d;
        }
    }
    if (!best.empty()) return "; did you mean \"" + best + "\"?";
    // The key may belong to another section: [joint] leg_flange instead of [bead] leg_flange.
    for (const auto& [other, keys] : known_) {
        if (other == section || other.empty()) continue;
        for (const auto& k : keys) {
            if (k == key || close(k)) return "; did you mean \"" + k + "\" in [" + other + "]?";
        }
    }
    if (auto it = known_.find(section); it != known_.end()) {
        return "; valid keys here: " + join(it->second, ", ");
    }
    return "";
}

void CaseDocument::report_unknown(const toml::table& table, const std::string& prefix) {
    const auto& known = known_[prefix];
    for (const auto& [k, node] : table) {
        const std::string key(k.str());
        const std::string path = prefix.empty() ? key : prefix + "." + key;
        if (!known.contains(key)) {
            const std::string what = prefix.empty() ? "unknown section [" + key + "]"
                                                    : "unknown key in [" + prefix + "]";
            add_error(&node, path, what + suggestion(prefix, key));
        } else if (node.is_table() && known_.contains(path)) {
            report_unknown(*node.as_table(), path);
        }
    }
}

void CaseDocument::finish() {
    report_unknown(root_, "");
    if (!errors_.empty()) throw CaseError(errors_);
}

std::string CaseDocument::resolved_toml() const {
    std::string out = "# Resolved case: every key with the value used, defaults filled in.\n";
    for (const auto& section : section_order_) {
        bool header = false;
        for (const auto& e : resolved_) {
            if (e.section != section) continue;
            if (!header) out += "\n[" + section + "]\n", header = true;
            out += e.key + " = " + e.rendered;
            if (!e.comment.empty()) out += "  # " + e.comment;
            out += "\n";
        }
    }
    return out;
}

// --- Section accessors ---------------------------------------------------------------------------

std::string Section::key_path(std::string_view key) const { return name_ + "." + std::string(key); }

bool Section::has(std::string_view key) const { return table_ && table_->contains(key); }

bool Section::holds_word(std::string_view key) const {
    const toml::node* node = table_ ? table_->get(key) : nullptr;
    const auto* s = node ? node->as_string() : nullptr;
    return s && !s->get().empty() && std::isalpha(static_cast<unsigned char>(s->get().front()));
}

const toml::node* Section::find(std::string_view key) {
    doc_->declare(name_, std::string(key));
    return table_ ? table_->get(key) : nullptr;
}

void Section::missing(std::string_view key, std::string_view what) {
    doc_->errors_.push_back({doc_->origin(table_, name_), key_path(key), "", "missing; required: " + std::string(what)});
}

void Section::error(std::string_view key, std::string message) {
    doc_->add_error(table_ ? table_->get(key) : nullptr, key_path(key), std::move(message));
}

double Section::quantity(std::string_view key, units::Dimension dim, std::string_view unit,
                         std::optional<double> fallback, Bounds bounds) {
    const toml::node* node = find(key);
    const std::string k(key);
    if (!node) {
        if (!fallback) {
            missing(key, std::string(units::dimension_name(dim)) + " " + describe(bounds, dim, unit) + ", " +
                             example(dim, unit));
            return std::numeric_limits<double>::quiet_NaN();
        }
        // A default that depends on a key already in error is left unresolved (no cascade).
        if (std::isfinite(*fallback)) doc_->record(name_, k, quote(units::format(*fallback, unit, dim)), "default");
        return *fallback;
    }
    const auto fail = [&](std::string message) {
        doc_->add_error(node, key_path(key), std::move(message));
        return std::numeric_limits<double>::quiet_NaN();
    };
    double value = 0;
    try {
        if (auto i = node->as_integer()) {
            value = units::to_internal(static_cast<double>(i->get()), unit, dim);
        } else if (auto f = node->as_floating_point()) {
            value = units::to_internal(f->get(), unit, dim);
        } else if (auto s = node->as_string()) {
            value = units::parse(s->get(), dim);
        } else {
            return fail("expected a " + std::string(units::dimension_name(dim)) + ", " + example(dim, unit) +
                        "; got " + type_name(*node));
        }
    } catch (const units::UnitError& e) {
        // The unit parser quotes the text it was given; the message already shows the value.
        std::string message = e.what();
        const std::string echoed = render(*node) + ": ";
        if (message.rfind(echoed, 0) == 0) message.erase(0, echoed.size());
        return fail(message);
    }
    if (!std::isfinite(value)) return fail("not a finite number");
    if (!bounds.contains(value)) return fail("out of range; allowed: " + describe(bounds, dim, unit));
    doc_->record(name_, k, quote(units::format(value, unit, dim)), "");
    return value;
}

std::optional<double> Section::optional_quantity(std::string_view key, units::Dimension dim,
                                                 std::string_view unit, Bounds bounds) {
    if (!has(key)) {
        doc_->declare(name_, std::string(key));
        return std::nullopt;
    }
    return quantity(key, dim, unit, std::nullopt, bounds);
}

double Section::number(std::string_view key, std::optional<double> fallback, Bounds bounds) {
    const toml::node* node = find(key);
    const auto show = [](double v) { return format_text("%.12g", v); };
    const auto allowed = [&] {
        if (std::isfinite(bounds.lo) && std::isfinite(bounds.hi)) {
            return "a number " + std::string(bounds.lo_open ? "above " : "from ") + show(bounds.lo) +
                   (bounds.hi_open ? " to below " : " to ") + show(bounds.hi);
        }
        return std::string("a finite number");
    };
    if (!node) {
        if (!fallback) {
            missing(key, allowed());
            return std::numeric_limits<double>::quiet_NaN();
        }
        doc_->record(name_, std::string(key), show(*fallback), "default");
        return *fallback;
    }
    const auto value = node->is_number() ? node->value<double>() : std::nullopt;
    if (!value) {
        doc_->add_error(node, key_path(key), "expected " + allowed() + " (no unit); got " + type_name(*node));
        return std::numeric_limits<double>::quiet_NaN();
    }
    if (!std::isfinite(*value) || !bounds.contains(*value)) {
        doc_->add_error(node, key_path(key), "out of range; allowed: " + allowed());
        return std::numeric_limits<double>::quiet_NaN();
    }
    doc_->record(name_, std::string(key), show(*value), "");
    return *value;
}

std::string Section::choice(std::string_view key, std::span<const std::string_view> allowed,
                            std::optional<std::string_view> fallback) {
    const toml::node* node = find(key);
    const std::string options = join(allowed, ", ");
    if (!node) {
        if (!fallback) {
            missing(key, "one of: " + options);
            return std::string(allowed.front());
        }
        doc_->record(name_, std::string(key), quote(*fallback), "default");
        return std::string(*fallback);
    }
    const auto* s = node->as_string();
    if (!s) {
        doc_->add_error(node, key_path(key), "expected a word, one of: " + options + "; got " + type_name(*node));
        return std::string(fallback.value_or(allowed.front()));
    }
    if (std::find(allowed.begin(), allowed.end(), s->get()) == allowed.end()) {
        std::string hint;
        for (auto a : allowed) {
            if (edit_distance(s->get(), a) <= std::max<std::size_t>(2, a.size() / 3)) {
                hint = "; did you mean \"" + std::string(a) + "\"?";
                break;
            }
        }
        doc_->add_error(node, key_path(key), "not allowed; use one of: " + options + hint);
        return std::string(fallback.value_or(allowed.front()));
    }
    doc_->record(name_, std::string(key), quote(s->get()), "");
    return s->get();
}

std::string Section::text(std::string_view key, std::string_view fallback) {
    const toml::node* node = find(key);
    if (!node) {
        doc_->record(name_, std::string(key), quote(fallback), "default");
        return std::string(fallback);
    }
    const auto* s = node->as_string();
    if (!s) {
        doc_->add_error(node, key_path(key), "expected text in quotes; got " + type_name(*node));
        return std::string(fallback);
    }
    doc_->record(name_, std::string(key), quote(s->get()), "");
    return s->get();
}

long Section::integer(std::string_view key, long lo, long hi, std::optional<long> fallback) {
    const toml::node* node = find(key);
    const std::string range = "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi);
    if (!node) {
        if (!fallback) {
            missing(key, range);
            return lo;
        }
        doc_->record(name_, std::string(key), std::to_string(*fallback), "default");
        return *fallback;
    }
    const auto* i = node->as_integer();
    if (!i || i->get() < lo || i->get() > hi) {
        doc_->add_error(node, key_path(key), "allowed: " + range);
        return fallback.value_or(lo);
    }
    doc_->record(name_, std::string(key), std::to_string(i->get()), "");
    return static_cast<long>(i->get());
}

bool Section::flag(std::string_view key, bool fallback) {
    const toml::node* node = find(key);
    const auto word = [](bool b) { return std::string(b ? "true" : "false"); };
    if (!node) {
        doc_->record(name_, std::string(key), word(fallback), "default");
        return fallback;
    }
    const auto* b = node->as_boolean();
    if (!b) {
        doc_->add_error(node, key_path(key), "expected true or false (no quotes); got " + type_name(*node));
        return fallback;
    }
    doc_->record(name_, std::string(key), word(b->get()), "");
    return b->get();
}

std::vector<std::string> Section::choice_list(std::string_view key, std::span<const std::string_view> allowed,
                                              std::vector<std::string> fallback) {
    const toml::node* node = find(key);
    const auto rendered = [](const std::vector<std::string>& words) {
        std::vector<std::string> q;
        for (const auto& w : words) q.push_back(quote(w));
        return "[" + join(q, ", ") + "]";
    };
    if (!node) {
        doc_->record(name_, std::string(key), rendered(fallback), "default");
        return fallback;
    }
    const std::string options = join(allowed, ", ");
    const auto* arr = node->as_array();
    if (!arr) {
        doc_->add_error(node, key_path(key), "expected a list of words from: " + options + "; got " + type_name(*node));
        return fallback;
    }
    std::vector<std::string> out;
    for (const auto& item : *arr) {
        const auto* s = item.as_string();
        if (!s || std::find(allowed.begin(), allowed.end(), s->get()) == allowed.end()) {
            doc_->add_error(node, key_path(key), render(item) + " is not allowed; each item must be one of: " + options);
            return fallback;
        }
        if (std::find(out.begin(), out.end(), s->get()) == out.end()) out.push_back(s->get());
    }
    doc_->record(name_, std::string(key), rendered(out), "");
    return out;
}

std::vector<std::array<double, 3>> Section::points(std::string_view key, units::Dimension dim,
                                                   std::string_view unit) {
    const toml::node* node = find(key);
    if (!node) {
        doc_->record(name_, std::string(key), "[]", "default");
        return {};
    }
    const std::string form = "a list of points [x, y, z], each coordinate a " + std::string(units::dimension_name(dim)) +
                             ", e.g. [[\"75 mm\", \"12 mm\", \"-1 mm\"]]";
    const auto* arr = node->as_array();
    if (!arr) {
        doc_->add_error(node, key_path(key), "expected " + form);
        return {};
    }
    std::vector<std::array<double, 3>> out;
    std::vector<std::string> shown;
    for (std::size_t p = 0; p < arr->size(); ++p) {
        const auto* point = (*arr)[p].as_array();
        if (!point || point->size() != 3) {
            doc_->add_error(node, key_path(key), "point " + std::to_string(p + 1) + " is not [x, y, z]; expected " + form);
            return {};
        }
        std::array<double, 3> xyz{};
        std::vector<std::string> coords;
        for (std::size_t c = 0; c < 3; ++c) {
            const toml::node& v = (*point)[c];
            try {
                if (v.is_number()) {
                    xyz[c] = units::to_internal(v.value<double>().value(), unit, dim);
                } else if (auto s = v.as_string()) {
                    xyz[c] = units::parse(s->get(), dim);
                } else {
                    throw units::UnitError("expected a number or a string with a unit");
                }
                if (!std::isfinite(xyz[c])) throw units::UnitError("not a finite number");
            } catch (const units::UnitError& e) {
                doc_->add_error(node, key_path(key), "point " + std::to_string(p + 1) + ", coordinate " + "xyz"[c] +
                                                         ": " + e.what());
                return {};
            }
            coords.push_back(quote(units::format(xyz[c], unit, dim)));
        }
        shown.push_back("[" + join(coords, ", ") + "]");
        out.push_back(xyz);
    }
    doc_->record(name_, std::string(key), "[" + join(shown, ", ") + "]", "");
    return out;
}

Section Section::subsection(std::string_view key, bool required) {
    const toml::node* node = find(key);
    const std::string path = key_path(key);
    doc_->open_section(path);
    if (!node) {
        if (required) missing(key, "a section [" + path + "]");
        return Section(*doc_, path, nullptr);
    }
    if (!node->is_table()) {
        doc_->add_error(node, path, "must be a section [" + path + "], not " + type_name(*node));
        return Section(*doc_, path, nullptr);
    }
    return Section(*doc_, path, node->as_table());
}

}  // namespace heatbead
