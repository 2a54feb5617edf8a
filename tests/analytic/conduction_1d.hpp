// Closed-form 1-D conduction solutions for a semi-infinite solid x ≥ 0 with constant properties,
// used as outside references for the solver's conduction, surface-loss and melting treatment.
// They live in tests/ so that the solver never depends on them.
//
// Sources: Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed. (1959), chapter 2 for the
// erf/erfc solutions and §11.2 for Neumann's two-phase solution; Özişik, Heat Conduction
// (2nd ed. 1993), chapter on phase change. Section numbers are from memory.
//
// Units: SI (m, s, W, J); temperatures in °C (only differences enter).
#pragma once

namespace heatbead::analytic {

// Constant conduction properties: k [W/(m K)], ρc [J/(m³ K)], α = k/(ρc) [m²/s].
struct Properties {
    double k = 0;
    double rho_c = 0;
    double alpha() const { return k / rho_c; }
};

// Scaled complementary error function erfcx(u) = exp(u²)·erfc(u), finite for large u where
// exp(u²) overflows and erfc(u) underflows. For u ≥ 4 it uses Laplace's continued fraction
// (Abramowitz & Stegun 7.1.14, from memory):
//   √π·erfcx(u) = 1/(u + (1/2)/(u + 1/(u + (3/2)/(u + 2/(u + …))))).
// For u < 0, erfc(u) = 2 − erfc(−u) gives erfcx(u) = 2·exp(u²) − erfcx(−u) (overflows below about −26).
double erfcx(double u);

// (a) Surface suddenly held at Ts from t = 0, body initially at T0 (Carslaw & Jaeger ch. 2):
//   T = Ts + (T0 − Ts)·erf(x / (2√(αt))).                                        t > 0, x ≥ 0
double fixed_surface_temperature(const Properties& p, double T0, double Ts, double x, double t);

// (b) Constant flux q0 [W/m²] into the body through x = 0 (Carslaw & Jaeger ch. 2):
//   T − T0 = (2q0/k)·√(αt/π)·exp(−x²/(4αt)) − (q0·x/k)·erfc(x/(2√(αt))).          t > 0, x ≥ 0
double constant_flux_temperature(const Properties& p, double T0, double q0, double x, double t);

// (c) Convection to a fluid at T∞ with film coefficient h, −k·∂T/∂x = h·(T∞ − T) at x = 0
// (Carslaw & Jaeger ch. 2), with η = x/(2√(αt)) and β = h/k:
//   T − T0 = (T∞ − T0)·[erfc(η) − exp(βx + β²αt)·erfc(η + β√(αt))].
// The second term overflows as written for large βx or β²αt. With w = η + β√(αt) one has
// w² = η² + βx + β²αt, so exp(βx + β²αt)·erfc(w) = exp(−η²)·erfcx(w), which is what is evaluated.
double convective_surface_temperature(const Properties& p, double T0, double h, double T_inf, double x,
                                      double t);

// Melting of a semi-infinite solid x ≥ 0, initially at T_init ≤ T_m, by a surface held at
// T_s > T_m from t = 0 (Neumann's solution; Carslaw & Jaeger §11.2, Özişik, from memory).
struct MeltingProblem {
    Properties liquid;        // 0 ≤ x < s(t)
    Properties solid;         // x > s(t)
    double latent_heat = 0;   // ρL, latent heat per unit volume [J/m³]
    double melting_point = 0; // T_m
    double initial = 0;       // T_init ≤ T_m
    double surface = 0;       // T_s > T_m
};

// The similarity solution. With s(t) = 2λ√(α_l t), ν = √(α_l/α_s):
//   liquid  T = T_s − (T_s − T_m)·erf(x/(2√(α_l t))) / erf(λ)
//   solid   T = T_init + (T_m − T_init)·erfc(x/(2√(α_s t))) / erfc(νλ)
// Both satisfy the heat equation in their phase and equal T_m at x = s. The Stefan condition
// ρL·ds/dt = −k_l·∂T_l/∂x + k_s·∂T_s/∂x at x = s then gives the equation for λ (derived):
//   exp(−λ²)/erf(λ) − K/erfcx(νλ) = √π·λ / Ste,
//   Ste = ρc_l·(T_s − T_m)/ρL,   K = (k_s·ν/k_l)·(T_m − T_init)/(T_s − T_m),
// where exp(−ν²λ²)/erfc(νλ) is written 1/erfcx(νλ) to stay finite. The left side falls from +∞
// (λ → 0) and the right side rises from 0, so the root is unique; it is found by bisection.
// For T_init = T_m and small Ste, exp(−λ²)/erf(λ) ≈ (√π/(2λ))·(1 − 2λ²/3) gives
// λ ≈ √(Ste/2)·(1 − Ste/6) (derived).
class NeumannMelting {
public:
    // Throws std::invalid_argument unless T_init ≤ T_m < T_s and all properties are positive.
    explicit NeumannMelting(const MeltingProblem& problem);

    double lambda() const { return lambda_; }
    double stefan_number() const;            // Ste = ρc_l·(T_s − T_m)/ρL
    double front(double t) const;            // s(t) = 2λ√(α_l t) [m]
    double temperature(double x, double t) const;  // t > 0, x ≥ 0

private:
    MeltingProblem p_;
    double lambda_ = 0;
};

}  // namespace heatbead::analytic
