// Highest hardness of the coarse-grained HAZ from the cooling time t8/5 and the composition.
//
// Estimate: Düren (1986), IIW Doc. IX-1437-86 (coefficients from memory, check them against
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
// So the estimate is min(HV_M, max(HV_FP, HV_Düren)).
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

struct HardnessEstimate {
    double hv = 0;
    // Which bound applied: "" (none), "martensite" (capped) or "ferrite-pearlite" (floored).
    std::string bound;
};
// The bounded estimate above, from t8/5 [s] and the cooling rate at 700 °C [K/s].
HardnessEstimate haz_hardness(const Composition& c, double t8_5, double rate_700);

// The shortest t8/5 [s] that keeps the bounded estimate at or below `limit` [HV] when cooling
// from T0 (rates at 700 °C from thick_plate_rate_700). 0 when every t8/5 from 0.5 s on does;
// +∞ when none up to 1000 s does.
double critical_t8_5(const Composition& c, double limit, double T0);

// Warnings when the composition lies outside the range of structural C–Mn and low-alloy steels
// the hardness formulas were fitted to (our envelope, from memory: C 0.05–0.30, Si ≤ 0.8,
// Mn ≤ 2.0, Cr ≤ 1.5, Mo ≤ 1.0, Ni ≤ 2.5, Cu ≤ 0.7, V ≤ 0.2, Nb ≤ 0.1, B ≤ 0.005).
std::vector<std::string> hardness_validity(const Composition& c);

}  // namespace heatbead
