#include "tests/analytic/conduction_1d.hpp"

#include <cmath>
#include <numbers>
#include <stdexcept>

namespace heatbead::analytic {

double erfcx(double u) {
    if (u < 0) return 2.0 * std::exp(u * u) - erfcx(-u);
    // Below 4 the direct product is accurate (erfc(4) ≈ 1.5e-8 is far from underflow).
    if (u < 4.0) return std::exp(u * u) * std::erfc(u);
    // Continued fraction evaluated from the tail: f ← u + (n/2)/f for n = N … 1. Its convergents
    // close in quickly for u ≥ 4; 60 levels leave the error below double rounding there.
    double f = u;
    for (int n = 60; n >= 1; --n) f = u + 0.5 * n / f;
    return std::numbers::inv_sqrtpi / f;
}

double fixed_surface_temperature(const Properties& p, double T0, double Ts, double x, double t) {
    // T = Ts + (T0 − Ts)·erf(x/(2√(αt)))
    return Ts + (T0 - Ts) * std::erf(x / (2.0 * std::sqrt(p.alpha() * t)));
}

double constant_flux_temperature(const Properties& p, double T0, double q0, double x, double t) {
    // T − T0 = (2q0/k)·√(αt/π)·exp(−x²/(4αt)) − (q0·x/k)·erfc(x/(2√(αt)))
    const double at = p.alpha() * t;
    return T0 + 2.0 * q0 / p.k * std::sqrt(at / std::numbers::pi) * std::exp(-x * x / (4.0 * at)) -
           q0 * x / p.k * std::erfc(x / (2.0 * std::sqrt(at)));
}

double convective_surface_temperature(const Properties& p, double T0, double h, double T_inf, double x,
                                      double t) {
    // T − T0 = (T∞ − T0)·[erfc(η) − exp(−η²)·erfcx(η + β√(αt))], the overflow-free form of
    // erfc(η) − exp(βx + β²αt)·erfc(η + β√(αt)) (see the header).
    const double root = std::sqrt(p.alpha() * t);
    const double eta = x / (2.0 * root);
    const double beta = h / p.k;
    return T0 + (T_inf - T0) * (std::erfc(eta) - std::exp(-eta * eta) * erfcx(eta + beta * root));
}

NeumannMelting::NeumannMelting(const MeltingProblem& problem) : p_(problem) {
    const bool positive = p_.liquid.k > 0 && p_.liquid.rho_c > 0 && p_.solid.k > 0 && p_.solid.rho_c > 0 &&
                          p_.latent_heat > 0;
    if (!positive || !(p_.initial <= p_.melting_point) || !(p_.melting_point < p_.surface)) {
        throw std::invalid_argument("Neumann melting needs positive properties and T_init <= T_m < T_s");
    }
    const double nu = std::sqrt(p_.liquid.alpha() / p_.solid.alpha());
    const double ste = stefan_number();
    const double K = p_.solid.k * nu / p_.liquid.k * (p_.melting_point - p_.initial) /
                     (p_.surface - p_.melting_point);
    // F(λ) = exp(−λ²)/erf(λ) − K/erfcx(νλ) − √π·λ/Ste falls strictly from +∞ to −∞.
    const auto F = [&](double lam) {
        return std::exp(-lam * lam) / std::erf(lam) - K / erfcx(nu * lam) - std::sqrt(std::numbers::pi) * lam / ste;
    };
    double lo = 0.5, hi = 1.0;
    while (F(hi) > 0) hi *= 2.0;
    while (F(lo) < 0) lo *= 0.5;
    // Bisection until the bracket stops shrinking in double precision.
    for (;;) {
        const double mid = 0.5 * (lo + hi);
        if (mid <= lo || mid >= hi) break;
        (F(mid) > 0 ? lo : hi) = mid;
    }
    lambda_ = 0.5 * (lo + hi);
}

double NeumannMelting::stefan_number() const {
    return p_.liquid.rho_c * (p_.surface - p_.melting_point) / p_.latent_heat;
}

double NeumannMelting::front(double t) const { return 2.0 * lambda_ * std::sqrt(p_.liquid.alpha() * t); }

double NeumannMelting::temperature(double x, double t) const {
    if (x <= front(t)) {
        // T = T_s − (T_s − T_m)·erf(x/(2√(α_l t)))/erf(λ)
        const double u = x / (2.0 * std::sqrt(p_.liquid.alpha() * t));
        return p_.surface - (p_.surface - p_.melting_point) * std::erf(u) / std::erf(lambda_);
    }
    // T = T_init + (T_m − T_init)·erfc(u)/erfc(w), u = x/(2√(α_s t)) ≥ w = νλ. The ratio is taken as
    // exp(w² − u²)·erfcx(u)/erfcx(w) so that it stays accurate where both erfc underflow.
    const double u = x / (2.0 * std::sqrt(p_.solid.alpha() * t));
    const double w = std::sqrt(p_.liquid.alpha() / p_.solid.alpha()) * lambda_;
    return p_.initial + (p_.melting_point - p_.initial) * std::exp((w - u) * (w + u)) * erfcx(u) / erfcx(w);
}

}  // namespace heatbead::analytic
