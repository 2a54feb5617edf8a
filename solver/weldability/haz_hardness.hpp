// Highest hardness of the coarse-grained HAZ from the cooling time t8/5 and the composition, by
// two independent published formulas; the higher of the two is the one judged against a limit.
//
// 1. Düren (1986), IIW Doc. IX-1437-86 (coefficients from memory, check them against
// the paper before relying on them):
//   HV = 2019·[C·(1 − 0.5·log t8/5) + 0.3·(CE_B − C)] + 66·(1 − 0.8·log t8/5),   t8/5 in s,
//   CE_B = C + Si/11 + Mn/8 + Cu/9 + Cr/5 + Ni/17 + Mo/6 + V/3.
// Bounds: a mixed microstructure's hardness lies between those of all-ferrite-pearlite and
// all-martensite cooled at the same rate (the rule of mixtures HV = Σ fᵢ·HVᵢ), with the phase
// hardnesses of Maynier, Dollet & Bastien (1978) at the cooling rate Vr at 700 °C in °C/h:
//   HV_M  = 127 + 949C + 27Si + 11Mn + 8Ni + 16Cr + 21·log Vr
//   HV_B  = −323 + 185C + 330Si + 153Mn + 65Ni + 144Cr + 191Mo
//           + (89 + 53C − 55Si − 22Mn − 10Ni − 20Cr − 33Mo)·log Vr
//   HV_FP = 42 + 223C + 53Si + 30Mn + 12.6Ni + 7Cr + 19Mo + (10 − 19Si + 4Ni + 8Cr + 130V)·log Vr
// So Düren's estimate is min(HV_M, max(HV_FP, HV_Düren)).
//
// 2. Yurioka, Okumura, Kasuya & Cotton (1987), "Prediction of HAZ hardness of transformable
// steels", Metal Construction 19 (1987) 217R–223R (reference and coefficients from memory):
//   HV = 442C + 99CE_II + 206 + (402C − 90CE_II + 80)·arctan(X)
//   X  = (log t8/5 − 2.30CE_I − 1.35CE_III + 0.882) / (1.15CE_I − 0.673CE_III − 0.601)
//   CE_I   = C + Si/24 + Mn/6 + Cu/15 + Ni/12 + Cr(1 − 0.16√Cr)/8 + Mo/4 + ΔH
//   CE_II  = C + Si/24 + Mn/5 + Cu/10 + Ni/18 + Cr/5 + Mo/2.5 + V/5 + Nb/3
//   CE_III = C + Mn/3.6 + Cu/20 + Ni/9 + Cr/5 + Mo/4
// It is the paper's HV = (H_M + H_B)/2 + (H_M − H_B)/2.2·arctan(X) with the martensite and
// bainite hardnesses made linear, H_M ≈ 884C + 294 and H_B ≈ 118 + 198CE_II (442 = 884/2,
// 402 ≈ 884/2.2, 90 = 198/2.2, 80 = 176/2.2: derived here), and X = +2 at the time for all
// martensite, −2 at the time for all bainite. The denominator is negative for structural steels,
// so X falls, and the hardness with it, as t8/5 grows. ΔH, the boron term, depends on the steel's
// free nitrogen, which a case does not give: it is left out (0), and hardness_validity warns
// when the steel holds boron, for then this estimate may read low.
// The estimate is not bounded: the arctan itself runs between (H_M + H_B)/2 ∓ π/2·(H_M − H_B)/2.2.
#pragma once

#include "solver/weldability/composition.hpp"

#include <string>
#include <vector>

namespace heatbead {

// CE_B of Düren's formula.
double duren_ceb(const Composition& c);
// Düren's formula alone (no bounds), t8/5 in s.
double duren_hardness(const Composition& c, double t8_5);

struct PhaseHardness {
    double martensite = 0, bainite = 0, ferrite_pearlite = 0;  // HV
};
// Maynier et al. (1978) phase hardnesses at a cooling rate at 700 °C given in K/s.
PhaseHardness maynier_phase_hardness(const Composition& c, double rate_700);

// Cooling rate at 700 °C of thick-plate (3-D) cooling with the given t8/5 from the initial
// temperature T0 [°C]: with T − T0 ∝ 1/t, dT/dt = −(T − T0)²/(q/2πk v) and
// t8/5 = (q/2πk v)·(1/(500 − T0) − 1/(800 − T0)), so
//   V700 = 300·(700 − T0)² / [t8/5·(500 − T0)·(800 − T0)]   [K/s]
double thick_plate_rate_700(double t8_5, double T0);

struct YuriokaEquivalents {
    double ce_i = 0, ce_ii = 0, ce_iii = 0;
};
YuriokaEquivalents yurioka_equivalents(const Composition& c);
// Yurioka et al.'s formula, t8/5 in s.
double yurioka_hardness(const Composition& c, double t8_5);

// The scatter of each formula against measured HAZ hardness, one standard deviation [HV] (from
// memory, not checked against the papers): what a warning of disagreement is measured against.
inline constexpr double duren_scatter = 30;
inline constexpr double yurioka_scatter = 25;
// The two are independent fits, so their difference scatters by the root of the sum of squares.
double hardness_models_scatter();

struct HardnessEstimate {
    double hv = 0;       // the higher of the two below: the one judged against a limit
    double duren = 0;    // Düren's, bounded by Maynier's phases
    double yurioka = 0;  // Yurioka's
    // Which bound Düren's took: "" (none), "martensite" (capped) or "ferrite-pearlite" (floored).
    std::string bound;
    const char* governing = "";  // "Düren" or "Yurioka", whichever is higher
};
// Both estimates, from t8/5 [s] and the cooling rate at 700 °C [K/s].
HardnessEstimate haz_hardness(const Composition& c, double t8_5, double rate_700);

// "" when Düren's and Yurioka's estimates [HV] agree within hardness_models_scatter(); else the
// warning in words.
std::string hardness_disagreement(double duren, double yurioka);

// The shortest t8/5 [s] that keeps the higher estimate at or below `limit` [HV] when cooling
// from T0 (rates at 700 °C from thick_plate_rate_700). 0 when every t8/5 from 0.5 s on does;
// +∞ when none up to 1000 s does.
double critical_t8_5(const Composition& c, double limit, double T0);

// Warnings when the composition lies outside the range of structural C–Mn and low-alloy steels
// the hardness formulas were fitted to (our envelope, from memory: C 0.05–0.30, Si ≤ 0.8,
// Mn ≤ 2.0, Cr ≤ 1.5, Mo ≤ 1.0, Ni ≤ 2.5, Cu ≤ 0.7, V ≤ 0.2, Nb ≤ 0.1, B ≤ 0.005), and when
// boron is present (above 1 ppm, from memory the level below which Yurioka's ΔH is 0) while
// Yurioka's boron term is left out.
std::vector<std::string> hardness_validity(const Composition& c);

}  // namespace heatbead
