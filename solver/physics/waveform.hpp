// Heat input of waveform-controlled welding (pulsed and other controlled transfer), where the mean
// voltage times the mean current misstates the power: ISO/TR 18491 and ASME Section IX QW-409.1
// use the instantaneous energy or power instead. For samples (t_n, u_n, i_n), n = 0 … N−1, each
// sample holding until the next (the left rectangle rule of a sampling meter):
//   instantaneous energy E = Σ_{n<N−1} u_n·i_n·(t_{n+1} − t_n),   instantaneous power P = E / (t_{N−1} − t_0),
// and the means ū, ī by the same rule. Heat input is then k·P/v (or k·E/L from a meter's energy E
// over a weld length L), with the process's thermal efficiency k as for U·I.
#pragma once

#include <cstddef>
#include <span>
#include <string>

namespace heatbead {

struct WaveformMeans {
    double power = 0;    // W, instantaneous power
    double voltage = 0;  // V, mean
    double current = 0;  // A, mean
    double duration = 0; // s
    std::size_t samples = 0;
};

// From samples; throws std::invalid_argument for fewer than 2 samples, unequal lengths or times not
// strictly increasing.
WaveformMeans waveform_means(std::span<const double> time, std::span<const double> voltage,
                             std::span<const double> current);


}  // namespace heatbead
