// The analytic reference solutions in tests/analytic against published formulas (Rosenthal 1941
// and 1946, Nguyen et al. 1999, Goldak et al. 1984, Carslaw & Jaeger 1959), values worked by hand
// from them, and the equations they must satisfy. Each check names its source; "derived" marks a
// value worked out from the cited formulas.
#include "tests/analytic/conduction_1d.hpp"
#include "tests/analytic/moving_sources.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <functional>
#include <limits>
#include <numbers>
#include <stdexcept>
#include <tuple>
#include <utility>

using namespace heatbead::analytic;

namespace {
constexpr double pi = std::numbers::pi;
const Properties steel{30.0, 5e6};  // k = 30 W/(m K), ρc = 0.005 J/(mm³ K): round steel-like values

// A double ellipsoid much smaller than the distances at which it is compared with a point source.
DoubleEllipsoid tiny(double Q, double v, double size) { return {Q, size, size, size, size, v, 0.0}; }

// Goldak, Chakravarti & Bibby (1984): q = 6√3·f·Q/(a·b·c·π^1.5)·exp(−3ξ²/c² − 3y²/a² − 3z²/b²).
double goldak_density(const DoubleEllipsoid& s, double xi, double y, double z) {
    const double c = xi >= 0 ? s.c_front : s.c_rear;
    const double f = 2.0 * c / (s.c_front + s.c_rear);
    return 6.0 * std::sqrt(3.0) * f * s.Q / (s.a * s.b * c * std::pow(pi, 1.5)) *
           std::exp(-3.0 * xi * xi / (c * c) - 3.0 * y * y / (s.a * s.a) - 3.0 * z * z / (s.b * s.b));
}

// Residual of the heat equation ∂T/∂t − α·∂²T/∂x² by central differences, in units of the
// temperature scale per unit time (so a correct solution gives ~1e-6 from truncation).
template <class F>
double heat_equation_residual(const F& T, double alpha, double x, double t, double dx, double scale) {
    const double dt = 1e-4 * t;
    const double T_t = (T(x, t + dt) - T(x, t - dt)) / (2.0 * dt);
    const double T_xx = (T(x + dx, t) - 2.0 * T(x, t) + T(x - dx, t)) / (dx * dx);
    return (T_t - alpha * T_xx) * t / scale;
}

// One-sided second-order derivative ∂T/∂x at x from the side given by the sign of dx.
template <class F>
double one_sided_slope(const F& T, double x, double dx) {
    return (-3.0 * T(x) + 4.0 * T(x + dx) - T(x + 2.0 * dx)) / (2.0 * dx);
}
}  // namespace

TEST_CASE("a fast source reaches Rosenthal's fast-source peak", "[analytic]") {
    // Derived from Rosenthal's point source (Weld. J. 20 (1941) 220s) in the fast-source limit:
    // Tp − T0 = 2(q/v)/(π e ρc r²). By hand with q/v = 1000 J/mm, ρc = 0.005 J/(mm³ K), T0 = 20 °C:
    // 20 + 2000/(π·e·0.005·r²) gives r = 10 mm → 488.4 °C, r = 8 mm → 751.9 °C.
    // The limit needs v·r/(2α) ≫ 1: at v = 0.1 m/s, α = 6e-6 m²/s it is 67–83. The point sits at
    // 45° between the surface and the depth direction: the limit is axisymmetric in the half-space.
    const double q_per_v = 1e6, v = 0.1;
    const DoubleEllipsoid source = tiny(q_per_v * v, v, 5e-4);
    const auto [r, expected] = GENERATE(std::pair{10e-3, 488.4}, std::pair{8e-3, 751.9});
    const double x = 0.05;  // 50 mm after the start: heat flow along x no longer sees the start
    CHECK(20.0 + 2.0 * q_per_v / (pi * std::numbers::e * steel.rho_c * r * r) == Approx(expected).epsilon(1e-4));
    const double t_pass = x / v, t_diffuse = r * r / (4.0 * steel.alpha());  // fast-limit peak time
    const PeakCooling pc = peak_and_cooling(source, steel, x, r / std::sqrt(2.0), -r / std::sqrt(2.0), 20.0,
                                            {0.0, t_pass + 5.0 * t_diffuse, 200});
    CHECK(pc.T_peak == Approx(expected).epsilon(0.01));
    CHECK(pc.t_peak == Approx(t_pass + t_diffuse).epsilon(0.05));
}

TEST_CASE("a tiny double ellipsoid reproduces Rosenthal's thick-plate field", "[analytic]") {
    // Rosenthal, Weld. J. 20 (1941) 220s: ΔT = Q/(2πkR)·exp(−v(R + ξ)/(2α)). After 40 s of travel the
    // memory of the start has decayed as exp(−v²s/(4α)) ≈ e^−42 (derived). A source of size d
    // smears the point-source field over a variance ~d²/6, an effect of order (d·v/(2α))² ≈ 2e-3 for
    // d = 0.1 mm (derived); it vanishes as d², which the last check shows.
    const double Q = 2000.0, v = 5e-3, t = 40.0;
    const auto rise = [&](double size, double xi, double y, double z) {
        return double_ellipsoid_rise(tiny(Q, v, size), steel, v * t + xi, y, z, t);
    };
    const auto [xi, y, z] = GENERATE(std::tuple{-10e-3, 5e-3, -3e-3}, std::tuple{5e-3, 3e-3, -2e-3},
                                     std::tuple{-30e-3, 2e-3, -1e-3}, std::tuple{0.0, 0.0, -8e-3},
                                     std::tuple{-5e-3, 0.0, 0.0}, std::tuple{0.0, 12e-3, 0.0});
    CAPTURE(xi, y, z);
    const double rosenthal = rosenthal_thick_plate(Q, v, steel, xi, y, z);
    CHECK(rise(1e-4, xi, y, z) == Approx(rosenthal).epsilon(5e-3));
    const double ratio = (rise(2e-4, xi, y, z) - rosenthal) / (rise(1e-4, xi, y, z) - rosenthal);
    CHECK(ratio == Approx(4.0).epsilon(0.05));
}

TEST_CASE("Rosenthal's thick-plate t8/5 and cooling rate on the weld axis", "[analytic]") {
    // On the axis behind the source R = −ξ, so Rosenthal gives ΔT = (q/v)/(2πk·τ), τ = time since
    // the source passed (derived). Hence t8/5 = (q/v)/(2πk)·[1/(500 − T0) − 1/(800 − T0)] and the
    // cooling rate 2πk(T − T0)²/(q/v) (Rosenthal's thick-plate cooling law, from memory, consistent
    // with the formula). By hand: k = 30 W/(m K), q/v = 1000 J/mm → 2π·30·520²/10⁶ = 51.0 °C/s at
    // 540 °C.
    const double q_per_v = 1e6, v = 5e-3, T0 = 20.0, x = 0.15;
    const DoubleEllipsoid source = tiny(q_per_v * v, v, 5e-4);
    const PeakCooling pc = peak_and_cooling(source, steel, x, 0.0, 0.0, T0, {0.0, 60.0, 240});
    const double t85 = q_per_v / (2.0 * pi * steel.k) * (1.0 / (500.0 - T0) - 1.0 / (800.0 - T0));
    REQUIRE(pc.t8_5().has_value());
    CHECK(*pc.t8_5() == Approx(t85).epsilon(5e-3));
    CHECK(*pc.t800 - x / v == Approx(q_per_v / (2.0 * pi * steel.k * (800.0 - T0))).epsilon(5e-3));

    const double t540 = x / v + q_per_v / (2.0 * pi * steel.k * (540.0 - T0));
    const auto T = [&](double t) { return T0 + double_ellipsoid_rise(source, steel, x, 0.0, 0.0, t); };
    CHECK(T(t540) == Approx(540.0).epsilon(5e-3));
    const double rate = (T(t540 - 1e-3) - T(t540 + 1e-3)) / 2e-3;
    CHECK(rate == Approx(51.0).epsilon(5e-3));
    CHECK(2.0 * pi * steel.k * 520.0 * 520.0 / q_per_v == Approx(51.0).epsilon(1e-3));
}

TEST_CASE("the exact front/rear split matches the published form and Goldak's source", "[analytic]") {
    // The published form of Nguyen et al., Weld. J. 78 (1999) 265s, with E_f = E_r = 1 must equal
    // the exact split when c_f = c_r (derived in moving_sources.hpp: the erf terms cancel).
    const DoubleEllipsoid symmetric{2000.0, 5e-3, 4e-3, 6e-3, 6e-3, 5e-3, 0.0};
    const RiseOptions published{1e-6, FrontRearSplit::published};
    const auto [x, y, z, t] = GENERATE(std::tuple{0.0, 0.0, 0.0, 0.3}, std::tuple{-4e-3, 3e-3, -2e-3, 2.0},
                                       std::tuple{25e-3, 6e-3, -5e-3, 4.0}, std::tuple{5e-3, 1e-3, -1e-3, 0.5});
    CAPTURE(x, y, z, t);
    CHECK(double_ellipsoid_rise(symmetric, steel, x, y, z, t) ==
          Approx(double_ellipsoid_rise(symmetric, steel, x, y, z, t, published)).epsilon(1e-9));
}

TEST_CASE("at the first instant the exact split releases Goldak's power density", "[analytic]") {
    // Over a short time δt the rise is ΔT ≈ q·δt/ρc with q Goldak's density at the mean source
    // position (Goldak, Chakravarti & Bibby, Metall. Trans. B 15B (1984) 299). By hand: Q = 2000 W,
    // a = 5, b = 4, c_f = 4, c_r = 10 mm → q_max = 6√3·f_f·Q/(a·b·c_f·π^1.5) = 2.666·10¹⁰ W/m³
    // with f_f = 8/14. Diffusion over δt = 1e-4 s (αδt ≈ 6e-10 m² against c² ≥ 1.6e-5 m²) and
    // travel v·δt change this by ~1e-4 (derived).
    const DoubleEllipsoid goldak{2000.0, 5e-3, 4e-3, 4e-3, 10e-3, 5e-3, 0.0};
    const double dt = 1e-4, centre = goldak.speed * dt / 2.0;
    CHECK(goldak_density(goldak, 0, 0, 0) == Approx(2.666e10).epsilon(1e-3));
    const auto [xi, y, z] = GENERATE(std::tuple{0.0, 0.0, 0.0}, std::tuple{3e-3, 2e-3, -1e-3},
                                     std::tuple{-6e-3, 2e-3, -1e-3}, std::tuple{-12e-3, 0.0, -3e-3});
    CAPTURE(xi, y, z);
    const double rate = steel.rho_c * double_ellipsoid_rise(goldak, steel, centre + xi, y, z, dt) / dt;
    CHECK(rate == Approx(goldak_density(goldak, xi, y, z)).epsilon(2e-3));
    if (xi < 0) {
        // The published form blends front and rear there, the reason for the exact split.
        const double blended = steel.rho_c / dt *
                               double_ellipsoid_rise(goldak, steel, centre + xi, y, z, dt,
                                                     {1e-6, FrontRearSplit::published});
        CHECK(std::abs(blended / rate - 1.0) > 0.1);
    }
}

TEST_CASE("the double-ellipsoid field holds the energy released", "[analytic]") {
    // ∫ρc·ΔT dV over z ≤ 0 = Q·(time the arc was on) (derived in moving_sources.hpp from Goldak's
    // source, which integrates to Q over the half-space). The field is smooth and decays like a
    // Gaussian, so the trapezoid rule on a coarse grid is accurate: the error of a Gaussian of
    // width σ on spacing h is ~exp(−2π²σ²/h²) ≈ 1e-4 here (derived). Symmetric in y, so y ≥ 0.
    const DoubleEllipsoid source{2000.0, 4e-3, 4e-3, 4e-3, 8e-3, 5e-3, 0.0,
                                 GENERATE(std::numeric_limits<double>::infinity(), 0.3)};
    const double t = 0.5, h = 2e-3, reach = 22e-3;
    const double arc_time = std::min(t, source.t_off);
    double energy = 0;
    for (double x = -reach; x <= source.speed * t + reach; x += h) {
        for (int j = 0; j * h <= reach; ++j) {
            for (int k = 0; k * h <= reach; ++k) {
                // Trapezoid weights: the planes y = 0 and z = 0 are edges, and y counts twice.
                const double w = (j == 0 ? 1.0 : 2.0) * (k == 0 ? 0.5 : 1.0);
                energy += w * double_ellipsoid_rise(source, steel, x, j * h, -k * h, t);
            }
        }
    }
    energy *= steel.rho_c * h * h * h;
    CAPTURE(source.t_off);
    CHECK(energy == Approx(source.Q * arc_time).epsilon(0.01));
}

TEST_CASE("the time quadrature meets its accuracy", "[analytic]") {
    // Not an outside check: the default tolerance against a much tighter one, for points outside
    // and inside the source, while the arc is on and after it is off (the 1e-4 requirement).
    DoubleEllipsoid source{3000.0, 3e-3, 3e-3, 3e-3, 9e-3, 6e-3, 0.0, 10.0};
    const auto [x, y, z, t] = GENERATE(std::tuple{0.03, 0.0, 0.0, 5.0}, std::tuple{0.03, 0.0, -1e-3, 5.001},
                                       std::tuple{0.02, 8e-3, -2e-3, 5.0}, std::tuple{0.07, 0.0, -5e-3, 10.5},
                                       std::tuple{-0.02, 1e-2, 0.0, 3.0}, std::tuple{0.059, 0.0, 0.0, 10.0});
    CAPTURE(x, y, z, t);
    const double rise = double_ellipsoid_rise(source, steel, x, y, z, t);
    CHECK(rise == Approx(double_ellipsoid_rise(source, steel, x, y, z, t, {1e-12})).epsilon(1e-6));
}

TEST_CASE("peak_and_cooling follows a peak beyond the scan and finds both crossings", "[analytic]") {
    // T(t) = 20 + 1000·(t/τ)·exp(1 − t/τ) peaks at t = τ with 1020 °C (derived: dT/dt = 0 at t = τ).
    // The scan stops at τ/2, so the peak and the crossings lie beyond it.
    const double tau = 3.0;
    const auto T = [&](double t) { return 20.0 + 1000.0 * (t / tau) * std::exp(1.0 - t / tau); };
    const PeakCooling pc = peak_and_cooling(T, {0.0, tau / 2.0, 20});
    CHECK(pc.t_peak == Approx(tau).epsilon(1e-6));
    CHECK(pc.T_peak == Approx(1020.0).epsilon(1e-12));
    REQUIRE(pc.t800.has_value());
    REQUIRE(pc.t500.has_value());
    CHECK(T(*pc.t800) == Approx(800.0).epsilon(1e-8));
    CHECK(T(*pc.t500) == Approx(500.0).epsilon(1e-8));
    CHECK(*pc.t800 > tau);
    CHECK(*pc.t8_5() == Approx(*pc.t500 - *pc.t800));
    // A peak below 800 °C has no t8/5.
    const PeakCooling low = peak_and_cooling([](double t) { return 20.0 + 700.0 * t * std::exp(1.0 - t); },
                                             {0.0, 10.0, 100});
    CHECK_FALSE(low.t800.has_value());
    CHECK(low.t500.has_value());
    CHECK_FALSE(low.t8_5().has_value());
}

TEST_CASE("erfcx matches exp(u²)·erfc(u) in extended precision", "[analytic]") {
    // Definition of erfcx, evaluated with long double where exp(u²) and erfc(u) stay in range.
    for (double u : {-3.0, -0.5, 0.0, 0.7, 3.9, 4.0, 4.1, 7.0, 20.0, 60.0, 100.0}) {
        CAPTURE(u);
        const long double ul = u;
        const double reference = static_cast<double>(std::exp(ul * ul) * std::erfc(ul));
        CHECK(erfcx(u) == Approx(reference).epsilon(1e-13));
    }
    // erfcx(u) → 1/(u√π): the leading term of erfc's asymptotic series (Abramowitz & Stegun 7.1.23,
    // from memory).
    CHECK(erfcx(1e8) * 1e8 * std::sqrt(pi) == Approx(1.0).epsilon(1e-14));
}

TEST_CASE("the erfc solutions satisfy the heat equation and their boundary conditions", "[analytic]") {
    // Carslaw & Jaeger (1959) ch. 2 solutions; their defining equations are checked by finite
    // differences: ∂T/∂t = α∂²T/∂x², the surface condition, and T → T0 far away and early.
    const double T0 = 20.0, Ts = 1000.0, q0 = 2e6, h = 800.0, T_inf = 1000.0;
    const double t = 2.0, L = std::sqrt(steel.alpha() * t), dx = 1e-3 * L;
    using Field = std::function<double(double, double)>;
    const Field fixed = [&](double x, double tt) { return fixed_surface_temperature(steel, T0, Ts, x, tt); };
    const Field flux = [&](double x, double tt) { return constant_flux_temperature(steel, T0, q0, x, tt); };
    const Field conv = [&](double x, double tt) { return convective_surface_temperature(steel, T0, h, T_inf, x, tt); };
    const double flux_scale = q0 * L / steel.k;
    for (double x : {0.3 * L, L, 3.0 * L}) {
        CAPTURE(x);
        CHECK(std::abs(heat_equation_residual(fixed, steel.alpha(), x, t, dx, Ts - T0)) < 1e-5);
        CHECK(std::abs(heat_equation_residual(flux, steel.alpha(), x, t, dx, flux_scale)) < 1e-5);
        CHECK(std::abs(heat_equation_residual(conv, steel.alpha(), x, t, dx, T_inf - T0)) < 1e-5);
    }
    // Surface: T = Ts; −k∂T/∂x = q0; −k∂T/∂x = h(T∞ − T).
    CHECK(fixed(0.0, t) == Approx(Ts).epsilon(1e-15));
    const auto at_t = [&](const auto& T) { return [&](double x) { return T(x, t); }; };
    CHECK(-steel.k * one_sided_slope(at_t(flux), 0.0, dx) == Approx(q0).epsilon(1e-5));
    CHECK(-steel.k * one_sided_slope(at_t(conv), 0.0, dx) == Approx(h * (T_inf - conv(0.0, t))).epsilon(1e-5));
    // Far away and at early times the body is still at T0.
    for (const Field& T : {fixed, flux, conv}) {
        CHECK(T(20.0 * L, t) == Approx(T0).epsilon(1e-12));
        CHECK(T(L, 1e-4 * t) == Approx(T0).epsilon(1e-12));
    }
}

TEST_CASE("the convective solution has the right limits without overflow", "[analytic]") {
    // h → ∞ gives the fixed-surface solution with Ts = T∞, the difference at the surface being
    // (T∞ − T0)·erfcx(β√(αt)) ≈ (T∞ − T0)/(√π·β√(αt)) (derived from the formula). Written as
    // exp(βx + β²αt)·erfc(…) the exponent here is ~7e6: it would overflow.
    const double T0 = 20.0, T_inf = 1000.0, t = 1000.0, h = 1e6;
    const double root = std::sqrt(steel.alpha() * t), beta_root = h / steel.k * root;
    for (double x : {0.0, 0.5 * root, 2.0 * root}) {
        CAPTURE(x);
        const double T = convective_surface_temperature(steel, T0, h, T_inf, x, t);
        REQUIRE(std::isfinite(T));
        CHECK(T == Approx(fixed_surface_temperature(steel, T0, T_inf, x, t)).epsilon(2.0 / beta_root));
    }
    CHECK(T_inf - convective_surface_temperature(steel, T0, h, T_inf, 0.0, t) ==
          Approx((T_inf - T0) / (std::sqrt(pi) * beta_root)).epsilon(1e-6));
    // h → 0: no heat enters.
    CHECK(convective_surface_temperature(steel, T0, 1e-9, T_inf, 0.0, t) == Approx(T0).epsilon(1e-9));
}

TEST_CASE("Neumann's melting solution satisfies the Stefan problem", "[analytic]") {
    // Neumann's solution (Carslaw & Jaeger 1959 §11.2, from memory). Steel-like values: T_m = 1495 °C
    // and L = 277 kJ/kg (typical of a C–Mn steel, from memory), ρ = 7850 kg/m³ (EN 1993-1-2 §3.2.2);
    // the phases differ on purpose.
    MeltingProblem problem;
    problem.liquid = {35.0, 6.0e6};
    problem.solid = {28.0, 5.2e6};
    problem.latent_heat = 7850.0 * 277e3;
    problem.melting_point = 1495.0;
    problem.initial = 20.0;
    problem.surface = 1800.0;
    const NeumannMelting melt(problem);
    const double t = 3.0, s = melt.front(t), dx = 1e-3 * s;
    REQUIRE(s > 0);
    const auto T = [&](double x, double tt) { return melt.temperature(x, tt); };
    const auto T_now = [&](double x) { return melt.temperature(x, t); };
    // Continuity at the front: T = T_m from both sides.
    CHECK(T_now(s * (1 - 1e-12)) == Approx(problem.melting_point).epsilon(1e-9));
    CHECK(T_now(s * (1 + 1e-12)) == Approx(problem.melting_point).epsilon(1e-9));
    // Stefan condition ρL·ds/dt = −k_l·∂T/∂x|₋ + k_s·∂T/∂x|₊.
    const double ds_dt = (melt.front(t * (1 + 1e-6)) - melt.front(t * (1 - 1e-6))) / (2e-6 * t);
    const double from_liquid = -problem.liquid.k * one_sided_slope(T_now, s, -dx);
    const double into_solid = -problem.solid.k * one_sided_slope(T_now, s, dx);
    CHECK(problem.latent_heat * ds_dt == Approx(from_liquid - into_solid).epsilon(1e-5));
    // Heat equation in each phase, surface held at T_s, far solid untouched.
    const double range = problem.surface - problem.initial;
    CHECK(std::abs(heat_equation_residual(T, problem.liquid.alpha(), 0.5 * s, t, dx, range)) < 1e-5);
    CHECK(std::abs(heat_equation_residual(T, problem.solid.alpha(), 2.0 * s, t, dx, range)) < 1e-5);
    CHECK(T_now(0.0) == Approx(problem.surface).epsilon(1e-15));
    CHECK(T_now(50.0 * s) == Approx(problem.initial).epsilon(1e-12));
}

TEST_CASE("Neumann's λ has the known one-phase values", "[analytic]") {
    // One phase (T_init = T_m): exp(λ²)·erf(λ)·λ = Ste/√π. Small Ste: λ ≈ √(Ste/2)·(1 − Ste/6)
    // (derived in conduction_1d.hpp; the leading term is the quasi-steady limit). Ste = 1:
    // λ = 0.6201, the root of λ·exp(λ²)·erf(λ) = 1/√π, the transcendental equation of Neumann's
    // problem (Carslaw & Jaeger, Conduction of Heat in Solids, 2nd ed. 1959, §11.2, section from
    // memory), solved here by bisection (0.62006); it agrees with the one-phase tables (from memory).
    const auto melting = [](double ste, double initial) {
        MeltingProblem p;
        p.liquid = {30.0, 5e6};
        p.solid = {30.0, 5e6};
        p.melting_point = 1500.0;
        p.initial = initial;
        p.surface = 1600.0;
        p.latent_heat = p.liquid.rho_c * (p.surface - p.melting_point) / ste;
        return p;
    };
    const double ste = 0.01;
    const NeumannMelting small(melting(ste, 1500.0));
    CHECK(small.stefan_number() == Approx(ste).epsilon(1e-12));
    CHECK(small.lambda() == Approx(std::sqrt(ste / 2.0)).epsilon(ste));
    CHECK(small.lambda() == Approx(std::sqrt(ste / 2.0) * (1.0 - ste / 6.0)).epsilon(1e-4));
    const double one_phase = NeumannMelting(melting(1.0, 1500.0)).lambda();
    CHECK(one_phase == Approx(0.6201).margin(1e-4));
    // A subcooled solid (T_init < T_m) draws heat from the front, so the front moves slower.
    CHECK(NeumannMelting(melting(1.0, 20.0)).lambda() < one_phase);
    CHECK_THROWS_AS(NeumannMelting(melting(1.0, 1600.0)), std::invalid_argument);
}
