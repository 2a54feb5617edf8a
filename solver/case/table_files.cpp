#include "solver/case/table_files.hpp"

#include "solver/case/number_table.hpp"
#include "solver/core/text.hpp"

#include <algorithm>
#include <sstream>
#include <string_view>
#include <utility>
#include <vector>

namespace heatbead {

namespace {

constexpr std::string_view columns = "temperature_degC, conductivity_W_per_mK, specific_heat_J_per_kgK";
constexpr double absolute_zero = -273.15;  // degC, definition of the Celsius scale (SI Brochure)

// One data row of the table, with where it was read.
struct Row {
    double temperature, conductivity, specific_heat;
    std::size_t line;
};

constexpr std::string_view column_names[] = {"temperature", "conductivity", "specific heat"};

// The rows, each checked: temperatures above absolute zero and increasing, k and c positive.
std::vector<Row> read_table_rows(const std::string& path) {
    std::vector<Row> rows;
    try {
        for (const NumberRow& r : read_number_table(path, {"property table", column_names, columns}, 2)) {
            const auto& c = r.cells;
            const auto fail = [&](std::size_t i, const std::string& what) { number_table_error(path, r.line, c[i].column, what); };
            const auto shown = [&](std::size_t i) { return "'" + c[i].text + "'"; };
            const Row row{c[0].value, c[1].value, c[2].value, r.line};
            if (!(row.temperature > absolute_zero))
                fail(0, "temperature " + shown(0) + " degC is not allowed; it must be above " + number_text(absolute_zero) +
                            " degC (absolute zero)");
            if (!rows.empty() && !(row.temperature > rows.back().temperature))
                fail(0, "temperature " + shown(0) + " degC is not above " + number_text(rows.back().temperature) +
                            " degC of the previous row (line " + std::to_string(rows.back().line) +
                            "); temperatures must increase strictly from row to row");
            if (!(row.conductivity > 0)) fail(1, "conductivity " + shown(1) + " W/(m K) is not allowed; it must be positive");
            if (!(row.specific_heat > 0))
                fail(2, "specific heat " + shown(2) + " J/(kg K) is not allowed; it must be positive");
            rows.push_back(row);
        }
    } catch (const NumberTableError& e) {
        throw MaterialError(e.what());
    }
    return rows;
}

// y(x) linear between the rows, held at the end values beyond them.
PropertyFunction interpolate(std::vector<double> x, std::vector<double> y) {
    return [x = std::move(x), y = std::move(y)](double t) {
        if (t <= x.front()) return y.front();
        if (t >= x.back()) return y.back();
        const std::size_t j = static_cast<std::size_t>(std::upper_bound(x.begin(), x.end(), t) - x.begin());
        const double w = (t - x[j - 1]) / (x[j] - x[j - 1]);
        return y[j - 1] + w * (y[j] - y[j - 1]);
    };
}

}  // namespace

Material read_property_table(const std::string& path, double density, const MaterialParameters& parameters) {
    const std::vector<Row> rows = read_table_rows(path);
    std::vector<double> T, k, c;
    for (const Row& r : rows) {
        T.push_back(r.temperature);
        k.push_back(r.conductivity);
        c.push_back(r.specific_heat);
    }
    const std::string name = "property table " + path + " (" + std::to_string(rows.size()) + " rows, " +
                             number_text(T.front()) + " to " + number_text(T.back()) +
                             " degC; k, c held constant outside)";
    try {
        return Material(name, density, interpolate(T, std::move(k)), interpolate(T, std::move(c)), parameters);
    } catch (const MaterialError& e) {
        throw MaterialError(path + ": " + e.what());  // the density and parameters that came with this table
    }
}

WaveformMeans read_waveform(const std::string& path) {
    static constexpr std::string_view names[] = {"time", "voltage", "current"};
    const auto rows = read_number_table(path, {"waveform", names, "time_s, voltage_V, current_A"}, 2);
    std::vector<double> t, u, i;
    for (const auto& r : rows) {
        if (!t.empty() && !(r.cells[0].value > t.back())) {
            number_table_error(path, r.line, r.cells[0].column,
                               "time '" + r.cells[0].text + "' s is not after the previous row's; times must increase");
        }
        t.push_back(r.cells[0].value), u.push_back(r.cells[1].value), i.push_back(r.cells[2].value);
    }
    return waveform_means(t, u, i);
}

}  // namespace heatbead
