#include "solver/studies/fit_measurements.hpp"

#include "solver/case/number_table.hpp"
#include "solver/case/toml_reader.hpp"
#include "solver/core/text.hpp"

#include <string_view>

namespace heatbead {

namespace {

using units::Dimension;
constexpr double mm = 1e-3;
constexpr std::string_view length_keys[] = {"penetration_flange", "penetration_web", "fused_leg_flange",
                                            "fused_leg_web",      "haz_width_flange", "haz_width_web"};
constexpr std::string_view unknown_names[] = {"arc_efficiency", "half_width", "depth", "front_length", "rear_length"};

// The rows of the table `file` that `key` of `s` names (a path beside the measurement file `path`);
// none when it is not given or cannot be read, and the problem recorded at `key`.
std::vector<NumberRow> table_rows(Section& s, std::string_view key, const std::string& file, const std::string& path,
                                  const NumberTableLayout& layout) {
    if (file.empty()) {
        s.error(key, "missing: a file of rows " + std::string(layout.header));
        return {};
    }
    try {
        return read_number_table(path_beside(file, path), layout, 2);
    } catch (const NumberTableError& e) {
        s.error(key, e.what());
        return {};
    }
}

}  // namespace

Measurements read_measurements(const std::string& path, const Case& c) {
    CaseDocument doc(path, {});
    Measurements m;
    m.file = path;
    auto section = doc.section("section", false);
    auto uncertainty = doc.section("uncertainty", false);
    // Penetration may be negative (a fusion line short of the plate) but not beyond a plate's thickness.
    const Bounds depth = Bounds::closed(-50 * mm, 100 * mm), size{0, 500 * mm, true, false};
    for (auto key : length_keys) {
        const bool signed_value = std::string_view(key).starts_with("penetration");
        const auto v = section.optional_quantity(key, Dimension::length, "mm", signed_value ? depth : size);
        const double u = uncertainty.quantity(key, Dimension::length, "mm", 0.2 * mm, Bounds{0, 50 * mm, true, false});
        if (v) m.section.push_back({std::string(key), *v, u});
    }
    if (section.has("fused_area_mm2")) {
        const double area = section.number("fused_area_mm2", std::nullopt, Bounds{0, 1e5, true, false});
        const double u = uncertainty.number("fused_area_mm2", 2.0, Bounds{0, 1e4, true, false});
        m.section.push_back({"fused_area", area * mm * mm, u * mm * mm});
    } else {
        uncertainty.number("fused_area_mm2", 2.0, Bounds{0, 1e4, true, false});
    }
    auto tc = doc.section("thermocouple", false);
    if (tc.present()) {
        ThermocoupleTrace t;
        t.position = {tc.quantity("x", Dimension::length, "mm", std::nullopt),
                      tc.quantity("y", Dimension::length, "mm", std::nullopt),
                      tc.quantity("z", Dimension::length, "mm", std::nullopt)};
        const auto& [x, y, z] = t.position;
        if (std::isfinite(x) && std::isfinite(y) && std::isfinite(z) &&
            (x < 0 || x > c.joint.weld_length || mesh::material_at(c.joint, y, z) == mesh::Tag::empty)) {
            tc.error("x", format_text("the thermocouple at (%.1f, %.1f, %.1f) mm", x / mm, y / mm, z / mm) +
                              " is not inside the plates or the bead of " + c.file);
        }
        t.uncertainty = tc.quantity("uncertainty", Dimension::temperature, "degC", 15.0, Bounds{0, 500, true, false});
        static constexpr std::string_view trace_names[] = {"time", "temperature"};
        for (const auto& row : table_rows(tc, "trace", tc.text("trace", ""), path,
                                          {"thermocouple trace", trace_names, "time_s, temperature_degC"})) {
            t.time.push_back(row.cells[0].value);
            t.temperature.push_back(row.cells[1].value);
        }
        m.thermocouples.push_back(std::move(t));
    }
    auto boundary = doc.section("boundary", false);
    if (boundary.present()) {
        const std::string points = boundary.text("points", "");
        m.boundary_uncertainty = boundary.quantity("uncertainty", Dimension::length, "mm", 0.2 * mm, Bounds{0, 10 * mm, true, false});
        static constexpr std::string_view point_names[] = {"y", "z"};
        for (const auto& row : table_rows(boundary, "points", points, path, {"fusion boundary", point_names, "y_mm, z_mm"})) {
            m.boundary.push_back({row.cells[0].value * mm, row.cells[1].value * mm});
        }
    }
    auto fit = doc.section("fit", false);
    m.unknowns = fit.choice_list("unknowns", unknown_names, {"arc_efficiency", "depth", "half_width"});
    m.iterations = static_cast<int>(fit.integer("iterations", 1, 100, 12));
    if (m.unknowns.empty()) fit.error("unknowns", "give at least one unknown");
    if (m.section.empty() && m.thermocouples.empty() && m.boundary.empty()) {
        doc.error("section", "nothing measured: give section dimensions, a [thermocouple] and/or a [boundary]");
    }
    doc.finish();
    return m;
}

}  // namespace heatbead
