#include "solver/physics/waveform.hpp"

#include <stdexcept>
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

}  // namespace heatbead
