// Cooling figures of a thermal cycle, against the thick-plate cooling law of Rosenthal, Trans. ASME
// 68 (1946) 849 (the law from memory; it follows from his point source on the weld axis): behind a
// fast line of heat, T − T0 = (q/v) / (2πk·t), which gives
//   t8/5 = (q/v)/(2πk) · [1/(500 − T0) − 1/(800 − T0)],   cooling rate at T: 2πk (T − T0)² / (q/v).
#include "post/section_history.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>

using namespace heatbead::post;

TEST_CASE("cycle figures match the thick-plate cooling law", "[cycles]") {
    const double q_per_v = 1000e3, k = 30, T0 = 20;  // 1000 J/mm, W/(m K), °C
    const double a = q_per_v / (2 * std::numbers::pi * k);
    std::vector<double> t, T;
    // Heats linearly to 1400 °C by t = 1 s, then cools by the law (shifted to join at 1400 °C).
    const double t_join = a / (1400 - T0);
    for (double s = 0; s <= 1; s += 0.01) t.push_back(s), T.push_back(T0 + s * (1400 - T0));
    for (double s = 1.0005; s < 400; s *= 1.0005) t.push_back(s), T.push_back(T0 + a / (s - 1 + t_join));
    const CycleFigures f = cycle_figures(t, T, 720);
    CHECK(f.peak == Approx(1400).epsilon(1e-3));
    // Hand computation: a = 5305.2 K·s; t8/5 = a (1/480 − 1/780) = 4.251 s.
    CHECK(f.t8_5 == Approx(a * (1.0 / 480 - 1.0 / 780)).epsilon(1e-4));
    CHECK(f.t8_3 == Approx(a * (1.0 / 280 - 1.0 / 780)).epsilon(1e-4));
    // By hand from the law: 2π·30·520²/10⁶ = 51.0 °C/s at 540 °C for k = 30 W/(m K), q/v = 1000 J/mm.
    CHECK(f.rate_540 == Approx(2 * std::numbers::pi * k * 520 * 520 / q_per_v).epsilon(1e-3));
    CHECK(f.rate_540 == Approx(51.0).epsilon(2e-3));
    // The same law at 700 °C: 2πk (700 − T0)² / (q/v).
    CHECK(f.rate_700 == Approx(2 * std::numbers::pi * k * 680 * 680 / q_per_v).epsilon(1e-3));
    // Above Ac1 = 720 °C: from 700/1380 s into the heating ramp until the law brings it back.
    const double up = (720 - T0) / (1400 - T0), down = 1 + a / (720 - T0) - t_join;
    CHECK(f.time_above_ac1 == Approx(down - up).epsilon(1e-3));
    CHECK(f.time_to_100 == Approx(1 + a / 80 - t_join - 1).epsilon(1e-3));
}

TEST_CASE("a cycle that never reaches 800 degC has no t8/5", "[cycles]") {
    const std::vector<double> t{0, 1, 2, 3}, T{20, 600, 400, 200};
    const CycleFigures f = cycle_figures(t, T, 720);
    CHECK(std::isnan(f.t8_5));
    CHECK(f.time_above_ac1 == 0);
    CHECK(f.rate_540 == Approx(200));  // by hand: 600 → 400 °C over the second that passes 540 °C
}
