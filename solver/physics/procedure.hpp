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
// How far a process's real arc efficiency may lie from that factor, ± on the efficiency: the spread
// the answer bands give it when the case does not (bands.arc_efficiency_spread), with its source.
EfficiencyDefault arc_efficiency_spread(Process process);

// Electrical power of the arc: the instantaneous power of a waveform when the case gives one
// (ISO/TR 18491), else U·I [W].
double electrical_power(const ProcedureSpec& p);
// Arc energy per unit length E = U·I / v [J/m] (EN 1011-1), with U·I the electrical power above.
double arc_energy(const ProcedureSpec& p);
// Net power into the work: the given net power, else η·U·I [W].
double net_power(const ProcedureSpec& p);
// Heat input Q = η·U·I / v [J/m] (EN 1011-1; ISO/TR 17671-1), or net power / v when given.
double heat_input(const ProcedureSpec& p);

// Share of the wire fed that ends up in the bead, the rest lost as spatter, fume and (flux-cored)
// slag, by process and transfer mode (from memory). Manual metal arc has no wire feed: its value
// is never used.
EfficiencyDefault default_deposition_efficiency(Process process, Transfer transfer);

struct Deposition {
    double wire_area = 0;   // m², wire fed per unit length of one pass: (π d²/4)·WFS / v
    double efficiency = 1;  // deposition efficiency, η_d
    double area = 0;        // m², deposited per unit length of one pass: η_d·(π d²/4)·WFS / v
};
// Mass conservation over one pass: A = η_d·WFS·(π d²/4) / v. Each side of a two-sided joint is
// its own pass, so one pass's wire fills one bead. Empty without wire feed speed and diameter.
std::optional<Deposition> deposition(const ProcedureSpec& p);
// The keys the deposition lacks ("procedure.wire_feed", "... and procedure.wire_diameter"), or
// why the process has none; empty when it can be computed.
std::string missing_wire_data(const ProcedureSpec& p);

// The fillet of cross-section `area` with the asked fillet's leg ratio and face: its legs and
// convexity times √(area / A_asked). Exact, for A = l_f·l_w/2 + s·(2/3)·√(l_f² + l_w²)·c is
// homogeneous of degree 2 in (l_f, l_w, c).
mesh::Fillet scaled_fillet(const mesh::Fillet& asked, double area);
// A fillet's legs as a welder names them: "7.5 mm" when equal, else "7.5 x 5.6 mm" (flange x web).
std::string legs_text(const mesh::Fillet& fillet);

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
// Above this preheat [°C] a preheat is unusual (common practice, no source): check and the preheat
// search warn of it in the same words (empty below it).
inline constexpr double unusual_preheat = 300;
std::string unusual_preheat_warning(double preheat);

}  // namespace heatbead
