// A validated case: everything one run needs, every default filled in.
// Units are internal: SI (m, s, W, A, V, rad, J/m, W/(m2 K)), except temperatures in degrees
// Celsius (converted to kelvin only where physics needs it, e.g. radiation) and composition in
// mass per cent. The case-file keys behind each field are listed in cases/README.md.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "solver/physics/heat_source.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/weldability/composition.hpp"
#include "solver/weldability/preheat_limits.hpp"

#include <array>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

struct MaterialSpec {
    std::string grade;                       // free text, for reports only
    std::string properties;                  // "carbon_steel_en1993", or a property table file
    std::string properties_file;             // the table's path (relative to the case resolved), if any
    double density = 7850;                   // kg/m³ (tables only; EN 1993-1-2 for the built-in)
    double solidus = 1495, liquidus = 1540;  // °C
    double latent_heat = 277e3;              // J/kg
    double liquid_conductivity_factor = 1;   // k multiplier above liquidus (stand-in for pool stirring)
    std::optional<Composition> composition;  // needed by metallurgy outputs only
    SteelType steel_type = SteelType::c_mn;     // base only: sets the highest preheat searched
    std::optional<double> tempering_temperature;  // °C, base only, quenched-and-tempered steel
    std::optional<double> diffusible_hydrogen;  // ml/100 g deposited metal (filler only)
};

struct TemperatureSpec {
    double preheat = 20, interpass = 20, ambient = 20;  // degC
};

struct SurfaceSpec {
    double convection = 10;            // W/(m2 K)
    double emissivity = 0.8;           // -
    double contact_conductance = 1000; // W/(m2 K), web edge on flange outside the weld
};

// How the weld metal enters a run: born at the liquidus (the droplets' superheat stays in the
// source, whose transfer-mode rule carries the droplets' heat in its column), born at the transfer
// mode's droplet temperature, or present from the start at the preheat with the whole net power
// in the source (the classical model). solver/numerics/THEORY.md compares them.
enum class WeldMetalModel { as_droplets, at_liquidus, present_from_start };
inline constexpr std::array<std::string_view, 3> weld_metal_names{"as_droplets", "at_liquidus", "present_from_start"};

struct SolverSpec {
    std::string integrator = "rkl2";
    double max_temperature_change = 500;  // K per step (twice this rejects the step)
    double travel_per_step = 0.25;        // arc travel per step / smallest source semi-axis
    double time_limit = 600;       // s
    // degC, given by the user; empty ("auto"): the stop follows the answers the run must give
    // (solver/studies/run_setup.hpp, stop_plan).
    std::optional<double> stop_temperature;
    WeldMetalModel weld_metal = WeldMetalModel::at_liquidus;
};

struct OutputSpec {
    std::vector<std::string> files;
    double station = 0;                          // m along the weld
    std::vector<std::array<double, 3>> probes;   // user points (x, y, z) in m
    double snapshot_interval = 1;                // s
};

// What `heatbead preheat` searches for: the lowest preheat, in steps of `resolution`, between
// `lowest` and `highest` at which every hardened HAZ probe stays at or below the hardness limit
// and, where given, cools from 800 to 500 °C no faster than `min_t8_5` and stays above 100 °C for
// at least `min_time_to_100` (time for hydrogen to diffuse out).
struct PreheatSearchSpec {
    double hardness_limit = 350;            // HV: the case's, or by the filler's hydrogen
    std::string hardness_limit_source;      // where it comes from, in words
    std::optional<double> min_t8_5;         // s
    std::optional<double> min_time_to_100;  // s
    double lowest = 20;                     // degC
    double highest = 400;                   // degC: the case's, or the steel's ceiling
    bool highest_given = false;             // set in the case (then the search keeps to it)
    std::string highest_reason;             // why the search stops at `highest`, in words
    double resolution = 5;                  // K
};

// How sure each headline answer is (solver/studies/answer_bands.hpp): whether the extra runs of
// the band are made, and the spreads of the inputs a user rarely knows well ([bands]).
struct BandSpec {
    bool enabled = true;
    double arc_efficiency_spread = 0.1;   // ± on the arc efficiency (net / electrical power)
    std::string arc_efficiency_spread_source;
    double source_spread = 0.2;           // ± share of each Goldak dimension
    std::string source_spread_source;
};

// Which bead a run lays: the one the wire deposits (mass conservation, keeping the asked legs'
// ratio and face), or the asked one exactly, for a bead that was measured.
enum class BeadLaying { from_wire, as_asked };
inline constexpr std::array<std::string_view, 2> bead_laying_names{"from_wire", "as_asked"};

// The bead a case asks for ([bead]): the procedure's target, kept apart from the bead laid.
struct BeadSpec {
    mesh::Fillet asked;
    BeadLaying laying = BeadLaying::from_wire;  // as chosen (bead.laid)
    bool from_wire = false;  // the wire's bead was laid: chosen, and the wire feed and diameter known
    std::string basis;       // in words, why the bead laid is the one it is
};

struct Case {
    std::string file;  // path the case was read from
    // The plates and the bead laid: what the grid, the source rule and the analysis use.
    mesh::JointGeometry joint;
    BeadSpec bead;
    mesh::GridSettings grid;
    double memory_limit = 0;  // bytes
    MaterialSpec base, filler;
    ProcedureSpec procedure;
    SourceShape source;
    TemperatureSpec temperatures;
    SurfaceSpec surface;
    SolverSpec solver;
    OutputSpec output;
    PreheatSearchSpec preheat_search;
    BandSpec bands;
    std::vector<std::string> warnings;  // unusual but possible values, found while reading
};

// What the procedure rules (solver/physics/procedure.hpp) read of a case.
inline WeldSetup weld_setup(const Case& c) {
    return {c.joint, c.procedure, {c.base.solidus, c.base.liquidus, c.base.latent_heat, 1.0},
            c.temperatures.ambient, c.temperatures.preheat};
}

}  // namespace heatbead
