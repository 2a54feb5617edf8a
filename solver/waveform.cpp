#include "solver/waveform.hpp"

#include "solver/number_table.hpp"

#include <stdexcept>
#include <string_view>
#include <vector>

namespace heatbead {

WaveformMeans waveform_means(std::span<const double> time, std::span<const double> voltage,
                             std::span<const double> current) {
    if (time.size() < 2 || voltage.size() != time.size() || current.size() != time.size())
        throw std::invalid_argument("a waveform needs at least 2 samples of time, voltage and current alike");
    WaveformMeans m;
    double energy = 0, volt_seconds = 0, amp_seconds = 0;
    for (std::size_t n = 0; n + 1 < time.size(); ++n) {
        const double dt = time[n + 1] - time[n];
        if (!(dt > 0)) throw std::invalid_argument("waveform times must increase strictly");
        energy += voltage[n] * current[n] * dt;
        volt_seconds += voltage[n] * dt;
        amp_seconds += current[n] * dt;
    }
    m.duration = time.back() - time.front();
    m.power = energy / m.duration;
    m.voltage = volt_seconds / m.duration;
    m.current = amp_seconds / m.duration;
    m.samples = time.size();
    return m;
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
