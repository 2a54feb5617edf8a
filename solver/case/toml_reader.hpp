// Reading a TOML case file key by key, with units, bounds and messages a user can act on.
//
// The schema lives in the code that calls these accessors (case_reader.cpp): each accessor
// declares the key it reads, so unknown keys can be reported with the nearest valid one, and
// records the value it resolved (given or default), so the resolved case can be printed and read
// back. Errors are collected, not thrown one by one: a user fixes all of them in one go.
#pragma once

#include "solver/core/units.hpp"

#include <toml++/toml.h>

#include <array>
#include <limits>
#include <map>
#include <memory>
#include <optional>
#include <set>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

// One problem found in a case: where (file:line or the --set option), which key, what is wrong.
struct Diagnostic {
    std::string origin;   // "case.toml:12" or "--set joint.length=..."
    std::string key;      // dotted key path, empty for file-level problems
    std::string value;    // the value given, as written in TOML; empty when absent
    std::string message;  // what is wrong and what is allowed
    std::string text() const;
};

// Thrown when a case cannot be used; holds every problem found.
class CaseError : public std::runtime_error {
public:
    explicit CaseError(std::vector<Diagnostic> diagnostics);
    const std::vector<Diagnostic>& diagnostics() const { return diagnostics_; }

private:
    std::vector<Diagnostic> diagnostics_;
};

// A command-line override `--set key.path=value`.
struct Override {
    std::string key_path;
    std::string value;
};
Override parse_override(std::string_view argument);

// Allowed interval of a quantity in internal units.
struct Bounds {
    double lo = -std::numeric_limits<double>::infinity();
    double hi = std::numeric_limits<double>::infinity();
    bool lo_open = false, hi_open = false;
    static Bounds positive() { return {0, std::numeric_limits<double>::infinity(), true, false}; }
    static Bounds non_negative() { return {0, std::numeric_limits<double>::infinity(), false, false}; }
    static Bounds closed(double lo, double hi) { return {lo, hi, false, false}; }
    bool contains(double v) const;
};

class Section;

// The parsed file with overrides applied; collects diagnostics and the resolved listing.
class CaseDocument {
public:
    // Parses `path` (TOML syntax errors become a CaseError naming line and column) and applies
    // the overrides.
    CaseDocument(const std::string& path, const std::vector<Override>& overrides);

    Section section(std::string_view name, bool required);

    // Problems found by cross-checks after reading (they name a key, maybe in another section).
    void error(std::string_view key_path, std::string message);
    void warn(std::string message) { warnings_.push_back(std::move(message)); }

    // Reports unknown keys and sections, then throws CaseError if anything is wrong.
    void finish();

    const std::string& path() const { return path_; }
    const std::vector<std::string>& warnings() const { return warnings_; }
    // The case as read, every default filled in, in the documented default units; parses back
    // to the same case.
    std::string resolved_toml() const;

private:
    friend class Section;
    struct Entry {
        std::string section, key, rendered, comment;
    };
    std::string origin(const toml::node* node, std::string_view key_path) const;
    void add_error(const toml::node* node, std::string key_path, std::string message);
    void open_section(const std::string& section);
    void declare(const std::string& section, const std::string& key);
    void record(const std::string& section, const std::string& key, std::string rendered,
                std::string comment);
    void report_unknown(const toml::table& table, const std::string& prefix);
    std::string suggestion(const std::string& section, const std::string& key) const;

    std::string path_;
    toml::table root_;
    std::map<std::string, std::string> overridden_;  // key path -> "--set key=value"
    std::vector<Diagnostic> errors_;
    std::vector<std::string> warnings_;
    std::map<std::string, std::set<std::string>> known_;  // section path -> keys declared
    std::vector<std::string> section_order_;
    std::vector<Entry> resolved_;
};

// Accessors for the keys of one [section]. Each returns a usable placeholder after an error, so
// reading goes on and every problem is reported at once.
class Section {
public:
    bool present() const { return table_ != nullptr; }
    const std::string& name() const { return name_; }

    // A quantity: a bare number in `unit`, or a string "value unit". `fallback` (internal units)
    // is used when the key is absent; without one the key is required.
    double quantity(std::string_view key, units::Dimension dim, std::string_view unit,
                    std::optional<double> fallback, Bounds bounds = {});
    // A quantity that may be absent altogether.
    std::optional<double> optional_quantity(std::string_view key, units::Dimension dim,
                                            std::string_view unit, Bounds bounds = {});
    // A plain number without unit (ratios, efficiencies, per cent of composition).
    double number(std::string_view key, std::optional<double> fallback, Bounds bounds = {});
    // One of a fixed set of words.
    std::string choice(std::string_view key, std::span<const std::string_view> allowed,
                       std::optional<std::string_view> fallback);
    std::string text(std::string_view key, std::string_view fallback);
    long integer(std::string_view key, long lo, long hi, std::optional<long> fallback);
    // A TOML boolean (true or false).
    bool flag(std::string_view key, bool fallback);
    // A list of words, each from `allowed`.
    std::vector<std::string> choice_list(std::string_view key,
                                         std::span<const std::string_view> allowed,
                                         std::vector<std::string> fallback);
    // A list of points, each a list of three quantities.
    std::vector<std::array<double, 3>> points(std::string_view key, units::Dimension dim,
                                              std::string_view unit);
    Section subsection(std::string_view key, bool required);

    // A problem with a key of this section found by a cross-check.
    void error(std::string_view key, std::string message);
    bool has(std::string_view key) const;
    // The key holds a word (a string starting with a letter), not a quantity such as "300 degC":
    // for keys that take either, e.g. "auto" or a temperature.
    bool holds_word(std::string_view key) const;
    std::string key_path(std::string_view key) const;

private:
    friend class CaseDocument;
    Section(CaseDocument& doc, std::string name, const toml::table* table)
        : doc_(&doc), name_(std::move(name)), table_(table) {}
    const toml::node* find(std::string_view key);
    void missing(std::string_view key, std::string_view what);

    CaseDocument* doc_;
    std::string name_;
    const toml::table* table_;
};

// A file named inside an input file (a property table, a waveform, a trace): relative names are
// taken from the folder of `input_file`, absolute ones as they are.
std::string path_beside(const std::string& name, const std::string& input_file);

// Renders a TOML node as it would be written in a case file (for messages).
std::string render(const toml::node& node);
// Levenshtein distance, for "did you mean" suggestions.
std::size_t edit_distance(std::string_view a, std::string_view b);

}  // namespace heatbead
