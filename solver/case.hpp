// A validated case: everything one run needs, every default filled in.
// Units are internal: SI (m, s, W, A, V, rad, J/m, W/(m2 K)), except temperatures in degrees
// Celsius (converted to kelvin only where physics needs it, e.g. radiation) and composition in
// mass per cent. The case-file keys behind each field are listed in cases/README.md.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace heatbead {

// Chemical composition in mass per cent.
struct Composition {
    double C = 0, Mn = 0, Si = 0, Cr = 0, Mo = 0, V = 0, Ni = 0, Cu = 0, Nb = 0, B = 0;
};

struct MaterialSpec {
    std::string grade;                       // free text, for reports only
    std::string properties;                  // "carbon_steel_en1993", or a property table file
    std::string properties_file;             // the table's path (relative to the case resolved), if any
    double density = 7850;                   // kg/m³ (tables only; EN 1993-1-2 for the built-in)
    double solidus = 1495, liquidus = 1540;  // °C
    double latent_heat = 277e3;              // J/kg
    double liquid_conductivity_factor = 1;   // k multiplier above liquidus (stand-in for pool stirring)
    std::optional<Composition> composition;  // needed by metallurgy outputs only
    std::optional<double> diffusible_hydrogen;  // ml/100 g deposited metal (filler only)
};

enum class Process { gmaw, fcaw, smaw, saw };
enum class Transfer { none, short_circuit, globular, spray, pulsed_spray };
enum class Position { flat, horizontal, vertical_up, vertical_down, overhead };

// Shielding gas by volume per cent; empty when the case does not say.
struct GasMix {
    double argon = 0, co2 = 0, oxygen = 0, helium = 0;
};

struct ProcedureSpec {
    Process process = Process::gmaw;
    Transfer transfer = Transfer::none;
    double current = 0;        // A
    double voltage = 0;        // V
    double travel_speed = 0;   // m/s
    std::optional<double> wire_feed_speed;  // m/s
    double wire_diameter = 0;  // m (0: not given)
    double work_angle = 0;     // rad, between torch axis and flange, in the cross-section
    double travel_angle = 0;   // rad, positive = push (torch leans toward travel), negative = drag
    std::optional<GasMix> gas;
    Position position = Position::horizontal;
    double arc_efficiency = 0;         // net / electrical power
    std::string arc_efficiency_source; // where the value comes from
    std::optional<double> net_power;   // W, when given instead of efficiency x U x I
    // Waveform-controlled welding: the instantaneous power (ISO/TR 18491; solver/waveform.hpp)
    // that replaces U x I in arc energy and heat input, and where it came from.
    std::optional<double> instantaneous_power;  // W
    std::string power_basis = "mean voltage x mean current";
    std::optional<double> interpass_wait;  // s between the passes of a two-sided joint
};

// Goldak double-ellipsoid dimensions (Goldak, Chakravarti & Bibby 1984), in metres.
struct SourceShape {
    bool from_procedure = true;
    bool origin_at_root = true;  // origin at the root corner (where the arc is aimed), else on the bead face
    double half_width = 0, depth = 0, front_length = 0, rear_length = 0;
    std::string rule;  // how the dimensions were chosen
};

struct TemperatureSpec {
    double preheat = 20, interpass = 20, ambient = 20;  // degC
};

struct SurfaceSpec {
    double convection = 10;            // W/(m2 K)
    double emissivity = 0.8;           // -
    double contact_conductance = 1000; // W/(m2 K), web edge on flange outside the weld
};

struct SolverSpec {
    std::string integrator = "rkl2";
    double max_temperature_change = 500;  // K per step (twice this rejects the step)
    double travel_per_step = 0.25;        // arc travel per step / smallest source semi-axis
    double time_limit = 600;       // s
    double stop_temperature = 300; // degC
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
    double hardness_limit = 350;            // HV
    std::optional<double> min_t8_5;         // s
    std::optional<double> min_time_to_100;  // s
    double lowest = 20, highest = 250;      // degC
    double resolution = 5;                  // K
};

struct Case {
    std::string file;  // path the case was read from
    mesh::JointGeometry joint;
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
    std::vector<std::string> warnings;  // unusual but possible values, found while reading
};

std::string_view to_string(Process);
std::string_view to_string(Transfer);
std::string_view to_string(Position);

}  // namespace heatbead
