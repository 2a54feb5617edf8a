// Carbon equivalents, HAZ hardness and the EN 1011-2 preheat formula against values worked by
// hand from the published formulas; each check names its formula's source and shows the working.
#include "solver/weldability/carbon_equivalent.hpp"
#include "solver/weldability/en1011_preheat.hpp"
#include "solver/weldability/haz_hardness.hpp"

#include <catch2/catch.hpp>

#include <cmath>

using namespace heatbead;

namespace {
// A structural C–Mn composition invented for the hand checks, every element non-zero.
Composition check_composition() {
    Composition c;
    c.C = 0.18, c.Si = 0.30, c.Mn = 1.40, c.Cr = 0.10, c.Mo = 0.05, c.V = 0.02, c.Ni = 0.10, c.Cu = 0.15, c.Nb = 0.02;
    c.B = 0.0005;
    return c;
}
Composition plain_cmn() {
    Composition c;
    c.C = 0.18, c.Si = 0.30, c.Mn = 1.40;
    return c;
}
}  // namespace

TEST_CASE("Carbon equivalents against hand-worked values", "[weldability]") {
    // Hand-worked from the published formulas: IIW CE = C + Mn/6 + (Cr + Mo + V)/5 + (Ni + Cu)/15
    // = 0.464; Ito & Bessyo (1968) Pcm = C + Si/30 + (Mn + Cu + Cr)/20 + Ni/60 + Mo/15 + V/10 + 5B
    // = 0.282; Yurioka et al., Weld. J. 62 (1983) 147s, CEN with A(C) = 0.75 + 0.25·tanh(20·0.06)
    // = 0.9584 → 0.469 (coefficients from memory); EN 1011-2:2001 Annex C.3 CET = 0.340.
    const auto ce = carbon_equivalents(check_composition());
    CHECK(ce.iiw == Approx(0.464).margin(5e-4));
    CHECK(ce.pcm == Approx(0.282).margin(5e-4));
    CHECK(ce.cen == Approx(0.469).margin(5e-4));
    CHECK(ce.cet == Approx(0.340).margin(5e-4));
    // By hand from Yurioka's CEN for pure carbon 0.12 %: A(C) = 0.75, so CEN = 0.12 exactly.
    Composition carbon_only;
    carbon_only.C = 0.12;
    CHECK(carbon_equivalent_cen(carbon_only) == Approx(0.12));
}

TEST_CASE("EN 1011-2 method B preheat against a hand-worked value", "[weldability]") {
    // Hand-worked from EN 1011-2:2001 Annex C.3, method B, with CET 0.34, d = 30 mm, HD = 5,
    // Q = 1.2 kJ/mm: 697·0.34 + 160·tanh(30/35) + 62·5^0.35 + (53·0.34 − 32)·1.2 − 328
    // = 236.98 + 111.17 + 108.90 − 16.78 − 328 = 112.27 °C; inside every validity range.
    const auto r = en1011_method_b({check_composition(), 30, 5, 1.2});
    CHECK(r.cet == Approx(0.34).margin(1e-9));
    CHECK(r.formula == Approx(112.3).margin(0.05));
    CHECK(r.outside_validity.empty());
    // By hand, each term moves the way the standard's figures show: thicker plate and more
    // hydrogen need more preheat, a higher heat input less (53·0.34 − 32 < 0).
    CHECK(en1011_method_b({check_composition(), 60, 5, 1.2}).formula > r.formula);
    CHECK(en1011_method_b({check_composition(), 30, 10, 1.2}).formula > r.formula);
    CHECK(en1011_method_b({check_composition(), 30, 5, 2.0}).formula < r.formula);
}

TEST_CASE("EN 1011-2 method B warns outside its validity instead of extrapolating silently", "[weldability]") {
    // EN 1011-2:2001 Annex C.3 validity: CET 0.20–0.50, d 10–90 mm, HD 1–20, Q 0.5–4.0 kJ/mm, and
    // C 0.05–0.32 (the composition range from memory).
    Composition high_carbon = check_composition();
    high_carbon.C = 0.45;  // by hand: CET 0.45 + 0.145 + 0.0125 + 0.0025 = 0.61, C above 0.32
    const auto r = en1011_method_b({high_carbon, 100, 30, 5});
    REQUIRE(r.outside_validity.size() == 5);  // CET, thickness, hydrogen, heat input, carbon
    CHECK(r.outside_validity[0].find("CET 0.61") != std::string::npos);
    CHECK(r.outside_validity[1].find("thickness 100 mm") != std::string::npos);
    CHECK(r.outside_validity[4].find("C 0.45 % is above 0.32 %") != std::string::npos);
}

TEST_CASE("Maynier et al. (1978) phase hardness", "[weldability]") {
    // Hand-worked from Maynier, Dollet & Bastien (1978) for C 0.18 / Si 0.30 / Mn 1.40 (others 0),
    // Vr = 1e5 °C/h, log Vr = 5: HV_M = 127 + 170.82 + 8.1 + 15.4 + 105 = 426.3,
    // HV_B = −323 + 33.3 + 99 + 214.2 + 5·(89 + 9.54 − 16.5 − 30.8) = 279.7,
    // HV_FP = 42 + 40.14 + 15.9 + 42 + 5·(10 − 5.7) = 161.5.
    const auto h = maynier_phase_hardness(plain_cmn(), 1e5 / 3600);
    CHECK(h.martensite == Approx(426.3).margin(0.05));
    CHECK(h.bainite == Approx(279.7).margin(0.05));
    CHECK(h.ferrite_pearlite == Approx(161.5).margin(0.05));
    // Derived from Rosenthal's thick-plate cooling law (see haz_hardness.hpp):
    // V700 = 300·680²/(10·480·780) = 37.05 °C/s for t8/5 = 10 s from 20 °C.
    CHECK(thick_plate_rate_700(10, 20) == Approx(37.05).margin(0.005));
}

TEST_CASE("HAZ hardness from Düren's formula, bounded by Maynier's phases", "[weldability]") {
    // Values computed by hand from Düren (1986), IIW Doc. IX-1437-86, as quoted in haz_hardness.hpp
    // (coefficients from memory; no published worked example at hand):
    // C 0.18, Si 0.30, Mn 1.40 gives CE_B = 0.18 + 0.3/11 + 1.4/8 = 0.382273;
    // t8/5 = 10 s: 2019·(0.18·0.5 + 0.3·0.202273) + 66·0.2 = 317.43 HV;
    // t8/5 = 30 s: log = 1.47712, 2019·(0.18·0.26144 + 0.060682) + 66·(−0.18170) = 205.54 HV.
    const Composition c = plain_cmn();
    CHECK(duren_ceb(c) == Approx(0.382273).margin(1e-6));
    CHECK(duren_hardness(c, 10) == Approx(317.43).margin(0.01));
    CHECK(duren_hardness(c, 30) == Approx(205.54).margin(0.01));
    // Between Maynier's bounds at t8/5 = 10 s (by hand: HV_FP 162.1 < 317.4 < HV_M 428.9 at
    // 37.05 K/s).
    const auto mid = haz_hardness(c, 10, thick_plate_rate_700(10, 20));
    CHECK(mid.hv == Approx(317.43).margin(0.01));
    CHECK(mid.bound.empty());
    // Very fast cooling: Düren's straight line in log t8/5 passes the all-martensite hardness,
    // which caps it (by hand, t8/5 = 1 s: Düren 2019·(0.18 + 0.060682) + 66 = 551.9; Maynier's
    // HV_M at 370.5 K/s = 321.32 + 21·log10(1.334e6) = 449.95).
    const auto fast = haz_hardness(c, 1, thick_plate_rate_700(1, 20));
    CHECK(fast.bound == "martensite");
    CHECK(fast.hv == Approx(449.95).margin(0.01));
}

TEST_CASE("Critical t8/5 for a hardness limit", "[weldability]") {
    const Composition c = plain_cmn();
    // Düren (1986) is linear in log t8/5; solved by hand for 350 HV (inside Maynier's bounds):
    // log t = (2019·(0.18 + 0.060682) + 66 − 350) / (2019·0.09 + 52.8) = 201.937 / 234.51 = 0.86110,
    // t = 7.262 s.
    const double t350 = critical_t8_5(c, 350, 20);
    CHECK(t350 == Approx(7.262).epsilon(1e-3));
    CHECK(haz_hardness(c, t350, thick_plate_rate_700(t350, 20)).hv == Approx(350).margin(0.05));
    // A lower limit (sour service, 250 HV in the weld zone by ISO 15156-2, clause not checked)
    // needs slower cooling.
    CHECK(critical_t8_5(c, 250, 20) > t350);
    // A limit above the all-martensite hardness is met at any cooling time; one below the
    // ferrite-pearlite floor never is (by hand from Maynier et al. over the searched t8/5 of
    // 0.5–1000 s: HV_M ≤ 456 at 0.5 s, HV_FP ≥ 153 at 1000 s).
    CHECK(critical_t8_5(c, 600, 20) == 0);
    CHECK(std::isinf(critical_t8_5(c, 100, 20)));
}

TEST_CASE("Hardness formulas warn outside the steels they were fitted to", "[weldability]") {
    // Our envelope of haz_hardness.hpp (from memory): C 0.05–0.30, Ni ≤ 2.5, among others.
    CHECK(hardness_validity(check_composition()).empty());
    Composition odd = check_composition();
    odd.C = 0.6, odd.Ni = 5;
    const auto w = hardness_validity(odd);
    REQUIRE(w.size() == 2);
    CHECK(w[0].find("C 0.6 % is above 0.3 %") != std::string::npos);
    CHECK(w[1].find("Ni 5 %") != std::string::npos);
}
