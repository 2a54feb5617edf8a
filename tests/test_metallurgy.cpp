// Transformation temperatures against values worked by hand from the published formulas.
#include "solver/weldability/metallurgy.hpp"

#include <catch2/catch.hpp>

using namespace heatbead;

TEST_CASE("Andrews (1965) Ac1 and Ac3", "[metallurgy]") {
    // By hand from Andrews, J. Iron Steel Inst. 203 (1965) 721, for C 0.18, Mn 1.4, Si 0.3:
    // Ac1 = 723 − 10.7·1.4 + 29.1·0.3 = 716.75 °C; Ac3 = 910 − 203·√0.18 + 44.7·0.3 = 837.28 °C.
    Composition c;
    c.C = 0.18, c.Mn = 1.4, c.Si = 0.3;
    CHECK(andrews_ac1(c) == Approx(716.75).margin(0.01));
    CHECK(andrews_ac3(c) == Approx(837.28).margin(0.01));
    // Every term, by hand: Ni 1, Cr 0.5, V 0.05, Mo 0.2 on top of the above:
    // Ac1 = 716.75 − 16.9 + 8.45 = 708.30; Ac3 = 837.28 − 15.2 + 5.2 + 6.3 = 833.58.
    c.Ni = 1, c.Cr = 0.5, c.V = 0.05, c.Mo = 0.2;
    CHECK(andrews_ac1(c) == Approx(708.30).margin(0.01));
    CHECK(andrews_ac3(c) == Approx(833.58).margin(0.01));
}
