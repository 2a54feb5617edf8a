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
    bool missing() const;  // neither a text nor a finite value
};

// The item as shown on screen and in the report: its text, its value with unit, or "none (reason)".
std::string display(const SummaryItem& item);

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
    std::string to_json() const;  // {key: {value, unit, label[, reason]}, notes: [...]}; value null when missing
    std::string to_csv() const;   // key,value,unit,label,reason

private:
    std::vector<SummaryItem> items_;
    std::vector<std::pair<std::string, std::string>> notes_;
};

}  // namespace heatbead::post
