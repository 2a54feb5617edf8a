// Quantities a welding engineer derives from the procedure before any simulation: arc energy,
// heat input, deposition, the heat-source shape rule, and plausibility of the transfer mode.
#pragma once

#include "mesh/joint.hpp"
#include "solver/physics/heat_source.hpp"
#include "solver/physics/material.hpp"
#include "solver/physics/procedure_spec.hpp"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

// What the procedure rules below read of a case: the joint, the procedure, the base metal's
// melting range and latent heat, and the temperatures [°C].
struct WeldSetup {
    mesh::JointGeometry joint;
    ProcedureSpec procedure;
    MaterialParameters base_melting;
    double ambient = 20, preheat = 20;
};

struct EfficiencyDefault {
    double value;
    std::string_view source;
};
// Thermal efficiency factor k of the process (EN 1011-1:2009 Table 1, also ISO/TR 17671-1).
EfficiencyDefault default_arc_efficiency(Process process);

// Electrical power of the arc: the instantaneous power of a waveform when the case gives one
// (ISO/TR 18491), else U·I [W].
double electrical_power(const ProcedureSpec& p);
// Arc energy per unit length E = U·I / v [J/m] (EN 1011-1), with U·I the electrical power above.
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
std::optional<Deposition> deposition(const WeldSetup& c);

// Equal leg l of a fillet with area A and face convexity c (s = +1 convex, −1 concave, 0 flat):
// A = l²/2 + s·(2√2/3)·l·c  ⇒  l = −s·k + √(k² + 2A), k = (2√2/3)·c.
double equal_leg_for_area(double area, mesh::FaceShape face, double convexity);

// How a process or transfer mode carries metal and heat into the root (rule of thumb, values
// from memory; the fit command calibrates what matters):
// - droplet_temperature: of the metal as it reaches the pool [°C];
// - impact: how much of the droplets' heat is driven deep along the arc axis (1: a fine axial
//   stream of free-flight droplets, spray or one drop per pulse; 0: metal handed over by short
//   circuits, no free flight; between: large irregular drops, or arc force under flux);
// - typical_droplet_share: the droplets' share of the net arc power, used when the case gives no
//   wire feed to compute it from.
struct TransferPreset {
    std::string_view name;
    double droplet_temperature;
    double impact;
    double typical_droplet_share;
    std::string_view basis;
};
TransferPreset transfer_preset(Process process, Transfer transfer);

// Share of the net arc power the filler droplets carry in: wire mass rate × rise of the steel's
// enthalpy (EN 1993-1-2 with the base metal's melting range and latent heat) from the ambient
// temperature (the wire is not preheated) to
// the droplet temperature, over the net power; capped at 0.7. The preset's typical share without
// wire data.
double droplet_heat_share(const WeldSetup& c);

// Goldak dimensions from the bead the procedure lays, a rule of thumb until calibrated. The heat
// comes in two parts, lumped into one ellipsoid with the same power-weighted second moments:
// - the arc's, over the bead: half-width a_arc = face width/2, depth b_arc = design throat;
// - the droplets' driven share f = impact × droplet share, in a narrow column down the torch axis:
//   half-width a_drop = 2 wire diameters (a_arc/2 without wire data), depth b_drop = 2 b_arc.
//   a = √((1 − f)·a_arc² + f·a_drop²),  b = √((1 − f)·b_arc² + f·b_drop²),  c_f = a,  c_r = 2a
//   (c_f, c_r: Goldak et al. 1984 first-guess proportions, from memory).
// A fine axial stream of superheated droplets concentrates the heat and digs the "finger" of spray
// transfer (Essers & Walter 1981, Weld. J. 60:37s, from memory), while short-circuit transfer lays
// its metal on the surface (f = 0: the arc's ellipsoid alone).
SourceShape source_from_procedure(const WeldSetup& c);

// Transition current from globular to spray transfer for solid steel wire in argon-rich gas,
// by wire diameter [m] → [A] (common practice, no source; values from memory).
double spray_transition_current(double wire_diameter);

// Warnings for unusual but possible procedures (each cites its basis).
std::vector<std::string> plausibility_warnings(const WeldSetup& c);

}  // namespace heatbead
