// Quantities a welding engineer derives from the procedure before any simulation: arc energy,
// heat input, deposition, the heat-source shape rule, and plausibility of the transfer mode.
#pragma once

#include "solver/case.hpp"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

struct EfficiencyDefault {
    double value;
    std::string_view source;
};
// Thermal efficiency factor k of the process (EN 1011-1:2009 Table 1, also ISO/TR 17671-1).
EfficiencyDefault default_arc_efficiency(Process process);

// Arc energy per unit length E = U·I / v [J/m] (EN 1011-1).
double arc_energy(const ProcedureSpec& p);
// Net power into the work: the given net power, else η·U·I [W].
double net_power(const ProcedureSpec& p);
// Heat input Q = η·U·I / v [J/m] (EN 1011-1; ISO/TR 17671-1), or net power / v when given.
double heat_input(const ProcedureSpec& p);

struct Deposition {
    double area = 0;        // m², deposited per unit length of one pass = (π d²/4)·WFS / v
    double equal_leg = 0;   // m, leg of the equal-leg fillet of the joint's face shape with that area
    double asked_area = 0;  // m², cross-section of one bead the case asks for
    double asked_leg = 0;   // m, equal leg with the asked area
    double difference = 0;  // (equal_leg − asked_leg) / asked_leg
};
// Needs wire feed speed and wire diameter; empty otherwise. All wire is taken as deposited
// (spatter and fume losses neglected).
std::optional<Deposition> deposition(const Case& c);

// Equal leg l of a fillet with area A and face convexity c (s = +1 convex, −1 concave, 0 flat):
// A = l²/2 + s·(2√2/3)·l·c  ⇒  l = −s·k + √(k² + 2A), k = (2√2/3)·c.
double equal_leg_for_area(double area, mesh::FaceShape face, double convexity);

// Goldak dimensions from the bead the procedure lays: a rule of thumb until calibrated.
SourceShape source_from_procedure(const mesh::JointGeometry& joint);

// Transition current from globular to spray transfer for solid steel wire in argon-rich gas,
// by wire diameter [m] → [A] (common practice, no source; values from memory).
double spray_transition_current(double wire_diameter);

// Warnings for unusual but possible procedures (each cites its basis).
std::vector<std::string> plausibility_warnings(const Case& c);

}  // namespace heatbead
