#include "post/summary.hpp"

#include "post/text.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>

namespace heatbead::post {

bool SummaryItem::missing() const { return text.empty() && !(value && std::isfinite(*value)); }

bool SummaryItem::has_band() const {
    return banded && !missing() && low && high && std::isfinite(*low) && std::isfinite(*high);
}

std::string missing_text(const std::vector<MissingOutput>& missing) {
    std::string out;
    for (std::size_t n = 0; n < missing.size(); ++n) {
        const bool same_as_before = n > 0 && missing[n].reason == missing[n - 1].reason;
        out += n == 0 ? "missing " : same_as_before ? ", " : "; ";
        out += missing[n].key;
        const bool last_of_reason = n + 1 == missing.size() || missing[n + 1].reason != missing[n].reason;
        if (last_of_reason) out += " (" + (missing[n].reason.empty() ? std::string("no reason given") : missing[n].reason) + ")";
    }
    return out;
}

std::string band_text(const SummaryItem& i) {
    if (!i.has_band()) return "";
    return " (" + format_text("%.*f", i.decimals, *i.low) + "–" + format_text("%.*f", i.decimals, *i.high) + ")";
}

std::string display(const SummaryItem& i) {
    if (!i.text.empty()) return i.text;
    if (i.missing()) return i.reason.empty() ? "none" : "none (" + i.reason + ")";
    const std::string value = format_text("%.*f", i.decimals, *i.value);
    return (i.unit.empty() ? value : value + " " + i.unit) + band_text(i);
}

namespace {
// The item as the screen shows it; `reason_shown` is the reason already given on this line.
std::string shown(const SummaryItem& i, const std::string& reason_shown) {
    return i.missing() && !i.reason.empty() && i.reason == reason_shown ? "none" : display(i);
}

std::string csv_field(const std::string& s) {
    if (s.find_first_of(",\"\n") == std::string::npos) return s;
    std::string out = "\"";
    for (char c : s) out += c == '"' ? std::string("\"\"") : std::string(1, c);
    return out + "\"";
}
}  // namespace

std::vector<MissingOutput> Summary::missing() const {
    std::vector<MissingOutput> out;
    for (const auto& i : items_) {
        if (i.missing()) out.push_back({i.key, i.reason});
    }
    return out;
}

std::string Summary::to_text() const {
    std::vector<std::string> groups;
    for (const auto& i : items_) {
        if (std::find(groups.begin(), groups.end(), i.group) == groups.end()) groups.push_back(i.group);
    }
    std::string out;
    for (const auto& g : groups) {
        std::string line, reason_shown;
        for (const auto& i : items_) {
            if (i.group != g) continue;
            line += (line.empty() ? "" : ", ") + i.label + " " + shown(i, reason_shown);
            if (i.missing()) reason_shown = i.reason;
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
        else if (!i.missing()) v["value"] = *i.value;
        else v["value"] = nullptr;
        v["unit"] = i.unit;
        v["label"] = i.label;
        if (i.missing()) v["reason"] = i.reason;
        if (i.banded) {
            v["low"] = i.has_band() ? nlohmann::json(*i.low) : nlohmann::json(nullptr);
            v["high"] = i.has_band() ? nlohmann::json(*i.high) : nlohmann::json(nullptr);
            if (!i.has_band()) v["no_band"] = i.missing() ? i.reason : i.no_band;
        }
        j[i.key] = v;
    }
    nlohmann::json notes = nlohmann::json::array();
    for (const auto& [g, note] : notes_) notes.push_back({{"group", g}, {"note", note}});
    j["notes"] = notes;
    return j.dump(2) + "\n";
}

std::string Summary::to_csv() const {
    std::string out = "key,value,low,high,unit,label,reason\n";
    for (const auto& i : items_) {
        std::string v = !i.text.empty() ? i.text : (!i.missing() ? nlohmann::json(*i.value).dump() : "");
        const std::string low = i.has_band() ? nlohmann::json(*i.low).dump() : "";
        const std::string high = i.has_band() ? nlohmann::json(*i.high).dump() : "";
        const std::string why = i.missing() ? i.reason : i.banded && !i.has_band() ? "no band: " + i.no_band : "";
        out += csv_field(i.key) + "," + csv_field(v) + "," + low + "," + high + "," + csv_field(i.unit) + "," +
               csv_field(i.label) + "," + csv_field(why) + "\n";
    }
    return out;
}

SummaryItem* Summary::find(const std::string& key) {
    for (auto& i : items_)
        if (i.key == key) return &i;
    return nullptr;
}

const SummaryItem* Summary::find(const std::string& key) const { return const_cast<Summary*>(this)->find(key); }

}  // namespace heatbead::post
