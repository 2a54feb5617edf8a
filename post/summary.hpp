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
    std::optional<double> value;  // empty: not available (shown as "n/a")
    std::string unit;    // as printed, e.g. "mm"; empty for counts and flags
    int decimals = 2;
    std::string text;    // for yes/no and words; used instead of value when not empty
};

class Summary {
public:
    void add(SummaryItem item) { items_.push_back(std::move(item)); }
    void add_note(std::string group, std::string note) { notes_.push_back({std::move(group), std::move(note)}); }
    const std::vector<SummaryItem>& items() const { return items_; }
    // (group, note) pairs, in the order added.
    const std::vector<std::pair<std::string, std::string>>& notes() const { return notes_; }
    // One line per group: "Group      label value unit, label value unit, ..." then the notes.
    std::string to_text() const;
    std::string to_json() const;
    std::string to_csv() const;  // key,value,unit,label

private:
    std::vector<SummaryItem> items_;
    std::vector<std::pair<std::string, std::string>> notes_;
};

}  // namespace heatbead::post
