// The published standard method for preheat against hydrogen cracking that heatbead's own answer
// is shown beside: EN 1011-2:2001 Annex C.3, method B (based on CET).
//
//   Tp = 697·CET + 160·tanh(d/35) + 62·HD^0.35 + (53·CET − 32)·Q − 328        [°C]
//
// CET carbon equivalent (mass %), d plate thickness [mm], HD diffusible hydrogen [ml/100 g],
// Q heat input [kJ/mm]. The constant −328 is the sum of the standard's four constant terms.
// Validity (the standard's, ranges of the composition from memory): CET 0.20–0.50, d 10–90 mm,
// HD 1–20 ml/100 g, Q 0.5–4.0 kJ/mm, yield strength up to 1000 MPa, and C 0.05–0.32, Si ≤ 0.8,
// Mn 0.5–1.9, Cr ≤ 1.5, Cu ≤ 0.7, Mo ≤ 0.75, Nb ≤ 0.06, Ni ≤ 2.5, V ≤ 0.18, B ≤ 0.005.
#pragma once

#include "solver/weldability/composition.hpp"

#include <string>
#include <vector>

namespace heatbead {

struct StandardPreheatInput {
    Composition composition;
    double thickness = 0;   // mm
    double hydrogen = 0;    // ml/100 g deposited metal
    double heat_input = 0;  // kJ/mm
};

struct StandardPreheat {
    double cet = 0;
    double formula = 0;  // °C as the formula gives it (may be below room temperature)
    // Each input outside the formula's validity, in words; empty when all are inside.
    std::vector<std::string> outside_validity;
};

StandardPreheat en1011_method_b(const StandardPreheatInput& in);

}  // namespace heatbead
