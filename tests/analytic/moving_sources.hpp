// Analytic temperature fields of a welding heat source moving along the surface of a
// semi-infinite body with constant properties: outside references for the solver's tests.
//
// Geometry: the body is z ≤ 0, its surface z = 0 is adiabatic, the source runs along the line
// y = z = 0 in +x at speed v. Units SI; temperature rises ΔT in K.
//
// ── Rosenthal (1941, Weld. J. 20:220s; 1946, Trans. ASME 68:849), quasi-steady point source ──
//   ΔT = Q/(2πkR)·exp(−v(R + ξ)/(2α)),  ξ = x − vt,  R = √(ξ² + y² + z²).
//
// ── Transient Goldak double ellipsoid (time-integral form after Nguyen et al. 1999) ──────────
// Nguyen, Ohta, Matsuoka, Suzuki & Maeda, Weld. J. 78 (1999) 265s, for the time integral;
// Goldak, Chakravarti & Bibby, Metall. Trans. B 15B (1984) 299, for the power density, with
// ξ′ = x − x_c(t′) measured from the source centre x_c(t′) = x0 + v·t′:
//   q = 6√3·f·Q/(a·b·c·π^1.5)·exp(−3ξ′²/c² − 3y²/a² − 3z²/b²),
//   (f, c) = (f_f, c_f) for ξ′ ≥ 0 and (f_r, c_r) for ξ′ < 0, f_f = 2c_f/(c_f + c_r), f_r = 2c_r/(c_f + c_r).
// The adiabatic surface is replaced by the mirror image in z = 0, so the same expression over all
// z acts in an infinite body; the half below the surface carries Q.
//
// Derivation of the exact front/rear split. Heat released in an infinite body spreads with the
// kernel Π_i (4παs)^(−1/2)·exp(−u_i²/(4αs)) per coordinate, s = t − t′. Write A = 12αs. For one
// coordinate, a Gaussian exp(−3u′²/w²) (variance σ1² = w²/6) convolved with the 1-D kernel
// (variance σ2² = 2αs) gives a Gaussian of variance σ1² + σ2² = (w² + A)/6:
//   ∫ exp(−3u′²/w²)·(4παs)^(−1/2)·exp(−(u − u′)²/(4αs)) du′ = w·G(u, w),
//   G(u, w) = exp(−3u²/(w² + A))/√(w² + A).
// For a half-Gaussian the product of the two Gaussians is, completing the square in u′,
//   exp(−u²/(2(σ1² + σ2²)))·exp(−(u′ − μ)²/(2τ²)),  μ = u·σ1²/(σ1² + σ2²),  τ² = σ1²σ2²/(σ1² + σ2²),
// and ∫₀^∞ exp(−(u′ − μ)²/(2τ²)) du′ = τ√(2π)·½·[1 + erf(μ/(√2·τ))], so the half-line result is
// the full-line one times ½·[1 ± erf(η)] (+ for u′ ≥ 0, − for u′ < 0), with
//   η = μ/(√2·τ) = u·σ1/(√2·σ2·√(σ1² + σ2²)) = c·u·√(3/(A·(c² + A)))   (derived).
// Summing over releases t′ ∈ [0, t] with X = ξ + v·s (ξ = x − x0 − v·t), the rise is
//   ΔT = 3√3·Q/(ρc·π^1.5) · ∫ G(y,a)·G(z,b)·[f_f·G(X,c_f)·E_f + f_r·G(X,c_r)·E_r] ds,
//   E_f = 1 + erf(η_f) = erfc(−η_f),  E_r = 1 − erf(η_r) = erfc(η_r),  η = c·X·√(3/(A(c² + A))),
// the prefactor being 6√3/(abcπ^1.5)·(a·b·c)·½. The published form takes E_f = E_r = 1. With
// c_f = c_r = c (so f_f = f_r = 1) the two erf terms cancel and both forms give
// 2·G(X, c): the published form is exact there. For c_f ≠ c_r it is not: as s → 0 it tends to the
// mean of the front and rear Gaussians on both sides, whereas E_f → 2, E_r → 0 for X > 0 (and the
// reverse for X < 0) recover Goldak's source, which the tests check. Both forms hold the energy:
// over z ≤ 0, ∫G(y,a)dy = ∫G(X,w)dX = √(π/3), ∫G(z,b)dz = ½√(π/3), the erf terms are odd in X,
// so the integrand integrates to Q/(ρc) for every s and ∫ρc·ΔT dV = Q·t (derived).
// Arc on from t′ = 0 to t_off: s runs over [max(0, t − t_off), t].
#pragma once

#include "tests/analytic/conduction_1d.hpp"

#include <functional>
#include <limits>
#include <optional>

namespace heatbead::analytic {

// Rosenthal's thick-plate quasi-steady rise [K] at (ξ, y, z) behind/around a point source of net
// power Q [W] moving at v [m/s]. R > 0.
double rosenthal_thick_plate(double Q, double v, const Properties& p, double xi, double y, double z);

struct DoubleEllipsoid {
    double Q = 0;        // net power [W]
    double a = 0;        // half-width along y [m]
    double b = 0;        // depth along −z [m]
    double c_front = 0;  // front length along +x [m]
    double c_rear = 0;   // rear length along −x [m]
    double speed = 0;    // v along +x [m/s]
    double x_start = 0;  // centre at t = 0 [m]
    double t_off = std::numeric_limits<double>::infinity();  // arc switched off [s]
};

// How the front and rear halves are summed (see the header comment).
enum class FrontRearSplit { exact, published };

// How double_ellipsoid_rise evaluates. The time integral is taken on panels log-graded towards
// the moments where the integrand is sharp, then bisected adaptively. The integrand is positive,
// so the tolerance is relative to the result; each panel's error estimate is
// |Gauss–Legendre 10 − Gauss–Legendre 5|, an overestimate of the 10-point error, so the achieved
// accuracy is far better than the tolerance: against a tolerance of 1e-13 over 20 000 random
// sources, points and times the default was off by 1.5e-8 relative at worst (at a rise of 1e-194 K).
struct RiseOptions {
    double relative_tolerance = 1e-6;
    FrontRearSplit split = FrontRearSplit::exact;
};

// Temperature rise ΔT [K] at (x, y, z ≤ 0) and time t [s]; zero for t ≤ 0.
double double_ellipsoid_rise(const DoubleEllipsoid& source, const Properties& p, double x, double y,
                             double z, double t, const RiseOptions& options = {});

// Peak temperature and the t8/5 cooling time at one point.
struct PeakCooling {
    double t_peak = 0;            // [s]
    double T_peak = 0;            // [°C]
    std::optional<double> t800;   // first downward crossing of 800 °C after the peak [s]
    std::optional<double> t500;   // first downward crossing of 500 °C after t800 (or the peak) [s]
    std::optional<double> t8_5() const;  // t500 − t800 when both exist
};

struct TimeScan {
    double t_begin = 0;
    double t_end = 0;
    int samples = 400;  // uniform samples on [t_begin, t_end]; their spacing must resolve the peak
};

// Scans T(t) [°C] on the samples; the largest sample brackets the peak with its neighbours and a
// golden-section search refines it (a peak at t_end is followed forward with growing steps until
// T falls). Each crossing is bracketed by the first sample below the level after the previous
// event (again stepping past t_end with growing steps if need be) and found by bisection.
// Throws std::invalid_argument unless t_end > t_begin, and std::runtime_error if T has not fallen
// after 60 doubling steps.
PeakCooling peak_and_cooling(const std::function<double(double)>& temperature, const TimeScan& scan);

// The same for T = T0 + double_ellipsoid_rise(...) at (x, y, z).
PeakCooling peak_and_cooling(const DoubleEllipsoid& source, const Properties& p, double x, double y, double z,
                             double T0, const TimeScan& scan, const RiseOptions& options = {});

}  // namespace heatbead::analytic
