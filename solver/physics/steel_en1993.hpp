// Thermal properties of carbon steel after EN 1993-1-2:2005 §3.4.1 (θ in °C).
#pragma once

namespace heatbead::en1993 {

inline constexpr double density = 7850.0;  // kg/m³, EN 1993-1-2 §3.2.2

// λ(θ) [W/(m K)] = 54 − 3.33·10⁻²·θ for 20 ≤ θ < 800 °C; 27.3 from 800 to 1200 °C (§3.4.1.3).
// Held constant outside 20–1200 °C (the standard stops there; our documented extension).
double conductivity(double theta);

// c(θ) [J/(kg K)] (§3.4.1.2), piecewise:
//   425 + 7.73·10⁻¹θ − 1.69·10⁻³θ² + 2.22·10⁻⁶θ³   20 ≤ θ < 600
//   666 + 13002 / (738 − θ)                       600 ≤ θ < 735
//   545 + 17820 / (θ − 731)                       735 ≤ θ ≤ 900
//   650                                            900 < θ ≤ 1200
// The peak near 735 °C stands for the latent heat of the ferrite–austenite change.
double specific_heat(double theta);

}  // namespace heatbead::en1993
