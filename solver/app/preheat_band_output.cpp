#include "solver/app/preheat_band_output.hpp"

#include "solver/core/text.hpp"

#include <cmath>

namespace heatbead {

namespace {

// The figures of a check, by key, with the name, unit and decimals they are shown in.
struct Figure {
    const char* key;
    const char* json;
    const char* name;
    const char* unit;
    int decimals;
};
constexpr Figure figures[] = {{"hardness", "hardness_HV", "HAZ hardness (hardened probes, highest)", "HV", 0},
                              {"t8_5", "t8_5_s", "t8/5 (hardened probes, shortest)", "s", 2},
                              {"time_to_100", "time_to_100_s", "time to 100 degC (hardened probes, shortest)", "s", 0}};

nlohmann::json number(double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr); }

}  // namespace

std::vector<std::string> band_lines(const PreheatBand& b) {
    std::vector<std::string> lines;
    for (const auto& k : b.checks) lines.push_back(k.verdict);
    lines.push_back(b.words + format_text(", %.0f s", b.wall));
    return lines;
}

nlohmann::json band_json(const PreheatBand& b) {
    nlohmann::json j{{"across_band_degC", b.across ? nlohmann::json(*b.across) : nlohmann::json(nullptr)},
                     {"words", b.words},
                     {"runs", b.runs},
                     {"run_time_s", b.wall},
                     {"checks", nlohmann::json::array()}};
    for (const auto& k : b.checks) {
        nlohmann::json check{{"preheat_degC", k.preheat}, {"within", k.within}, {"verdict", k.verdict}};
        for (const auto& f : figures) {
            const Band& band = k.bands.bands.at(f.key);
            check[f.json] = {{"value", number(band.value)}, {"low", number(band.low)}, {"high", number(band.high)}};
            if (!band.ok()) check[f.json]["no_band"] = band.reason;
        }
        j["checks"].push_back(check);
    }
    return j;
}

void add_band_to_report(post::PreheatReportInput& r, const PreheatBand& b) {
    r.across = b.across;
    r.answer.push_back({"Across the band of the answers", b.words});
    for (const auto& k : b.checks) {
        const auto& bands = k.bands.bands;
        for (auto& run : r.runs) {
            if (run.preheat != k.preheat) continue;
            run.hardness_low = bands.at("hardness").low, run.hardness_high = bands.at("hardness").high;
            run.t8_5_low = bands.at("t8_5").low, run.t8_5_high = bands.at("t8_5").high;
            run.time_to_100_low = bands.at("time_to_100").low, run.time_to_100_high = bands.at("time_to_100").high;
        }
    }
    post::BandsView& view = r.bands;
    view.note = "The preheat " + b.words + ". The band at each preheat checked comes from its own extra runs.";
    view.columns = {"answer", "preheat", "value (band)"};
    for (const auto& f : figures) {
        post::BandedAnswer answer{f.key, f.name, f.unit, {}, {}, {}, {}};
        for (const auto& k : b.checks) {
            const Band& band = k.bands.bands.at(f.key);
            answer.runs.push_back(format_text("%.0f degC", k.preheat));
            answer.value.push_back(band.value), answer.low.push_back(band.low), answer.high.push_back(band.high);
            view.rows.push_back({f.name, format_text("%.0f degC", k.preheat),
                                 band.ok() ? format_text("%.*f %s (%.*f–%.*f)", f.decimals, band.value, f.unit, f.decimals,
                                                         band.low, f.decimals, band.high)
                                           : "no band: " + band.reason});
        }
        view.answers.push_back(std::move(answer));
    }
}

}  // namespace heatbead
