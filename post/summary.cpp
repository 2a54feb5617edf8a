#include "post/summary.hpp"

#include "post/text.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>

namespace heatbead::post {

namespace {
std::string shown(const SummaryItem& i) {
    if (!i.text.empty()) return i.text;
    if (!i.value || std::isnan(*i.value)) return "n/a";
    const std::string value = format_text("%.*f", i.decimals, *i.value);
    return i.unit.empty() ? value : value + " " + i.unit;
}

std::string csv_field(const std::string& s) {
    if (s.find_first_of(",\"\n") == std::string::npos) return s;
    std::string out = "\"";
    for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
    return out + "\"";
}
}  // namespace

std::string Summary::to_text() const {
    std::vector<std::string> groups;
    for (const auto& i : items_) {
        if (std::find(groups.begin(), groups.end(), i.group) == groups.end()) groups.push_back(i.group);
    }
    std::string out;
    for (const auto& g : groups) {
        std::string line;
        for (const auto& i : items_) {
            if (i.group != g) continue;
            line += (line.empty() ? "" : ", ") + i.label + " " + shown(i);
        }
        out += format_text("%-12s", g.c_str()) + line + "\n";
    }
    for (const auto& [g, note] : notes_) {
        out += format_text("%-12s", g.c_str()) + note + "\n";
    }
    return out;
}

std::string Summary::to_json() const {
    nlohmann::json j = nlohmann::json::object();
    for (const auto& i : items_) {
        nlohmann::json v;
        if (!i.text.empty()) v["value"] = i.text;
        else if (i.value && !std::isnan(*i.value)) v["value"] = *i.value;
        else v["value"] = nullptr;
        v["unit"] = i.unit;
        v["label"] = i.label;
        j[i.key] = v;
    }
    nlohmann::json notes = nlohmann::json::array();
    for (const auto& [g, note] : notes_) notes.push_back({{"group", g}, {"note", note}});
    j["notes"] = notes;
    return j.dump(2) + "\n";
}

std::string Summary::to_csv() const {
    std::string out = "key,value,unit,label\n";
    for (const auto& i : items_) {
        std::string v = !i.text.empty() ? i.text : (i.value && !std::isnan(*i.value) ? nlohmann::json(*i.value).dump() : "");
        out += csv_field(i.key) + "," + csv_field(v) + "," + csv_field(i.unit) + "," + csv_field(i.label) + "\n";
    }
    return out;
}

}  // namespace heatbead::post
