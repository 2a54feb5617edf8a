// The numbers a run reports, kept once and shown three ways: the screen summary, JSON and CSV.
// Whatever is printed on screen is in the files, with the same unit.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace heatbead::post {

struct SummaryItem {
    std::string group;   // screen line it belongs to, e.g. "Fusion"
    std::string key;     // machine name, e.g. "penetration_flange"
    std::string label;   // words on screen, e.g. "flange penetration"
    std::optional<double> value;  // empty (or NaN): no value
    std::string unit;    // as printed, e.g. "mm"; empty for counts and flags
    int decimals = 2;
    std::string text;    // for yes/no and words; used instead of value when not empty
    std::string reason = "";  // why there is no value, e.g. "no HAZ probe reached 800 degC": shown in its place
    // A headline answer carries a band (solver/studies/answer_bands.hpp): its low and high ends, or,
    // where it has none, why not. Items that are not banded have neither.
    bool banded = false;
    std::optional<double> low = std::nullopt, high = std::nullopt;
    std::string no_band = "";
    bool missing() const;  // neither a text nor a finite value
    bool has_band() const;  // banded, with both ends finite
};

// The item as shown on screen and in the report: its text, its value with unit and its band
// ("1.30 mm (1.10–1.60)"), or "none (reason)".
std::string display(const SummaryItem& item);
// " (1.10–1.60)" with the item's decimals, or "" when it has no band.
std::string band_text(const SummaryItem& item);

// An item without a value: its key and why.
struct MissingOutput {
    std::string key, reason;
};

// "missing t8_5_min, t8_5_max (no HAZ probe reached 800 degC); haz_hardness_max (...)": what a row
// of a table lacks and why, keys with the same reason named together; empty when nothing is missing.
std::string missing_text(const std::vector<MissingOutput>& missing);

class Summary {
public:
    void add(SummaryItem item) { items_.push_back(std::move(item)); }
    void add_note(std::string group, std::string note) { notes_.push_back({std::move(group), std::move(note)}); }
    const std::vector<SummaryItem>& items() const { return items_; }
    // (group, note) pairs, in the order added.
    const std::vector<std::pair<std::string, std::string>>& notes() const { return notes_; }
    // The items without a value, in order.
    std::vector<MissingOutput> missing() const;
    // One line per group: "Group      label value unit, label value unit, ..." then the notes. An item
    // without a value shows "none (reason)"; the same reason again on the line shows "none".
    std::string to_text() const;
    // {key: {value, unit, label[, reason][, low, high[, no_band]]}, notes: [...]}; value null when missing,
    // low and high on banded items only (null, with no_band, where the band could not be made).
    std::string to_json() const;
    // key,value,low,high,unit,label,reason: low and high empty without a band; the reason says why a value
    // is missing, or for a banded item without a band, "no band: " and why.
    std::string to_csv() const;
    // The item `key`, or null.
    SummaryItem* find(const std::string& key);
    const SummaryItem* find(const std::string& key) const;

private:
    std::vector<SummaryItem> items_;
    std::vector<std::pair<std::string, std::string>> notes_;
};

}  // namespace heatbead::post
