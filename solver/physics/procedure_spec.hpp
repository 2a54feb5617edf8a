// What a welding procedure is, as the case gives it: process, transfer mode, electrical settings,
// travel, wire, torch angles and gas. Units are internal (SI; angles in radians).
#pragma once

#include <array>
#include <optional>
#include <string>
#include <string_view>

namespace heatbead {

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
    double deposition_efficiency = 1;          // share of the wire fed that stays in the bead
    std::string deposition_efficiency_source;  // where the value comes from
    double work_angle = 0;     // rad, between torch axis and flange, in the cross-section
    double travel_angle = 0;   // rad, positive = push (torch leans toward travel), negative = drag
    std::optional<GasMix> gas;
    Position position = Position::horizontal;
    double arc_efficiency = 0;         // net / electrical power
    std::string arc_efficiency_source; // where the value comes from
    std::optional<double> net_power;   // W, when given instead of efficiency x U x I
    // Waveform-controlled welding: the instantaneous power (ISO/TR 18491; solver/physics/waveform.hpp)
    // that replaces U x I in arc energy and heat input, and where it came from.
    std::optional<double> instantaneous_power;  // W
    std::string power_basis = "mean voltage x mean current";
    std::optional<double> interpass_wait;  // s between the passes of a two-sided joint
};

// The names the case file uses for each choice, in enum order (Transfer::none has none).
inline constexpr std::array<std::string_view, 4> process_names{"gmaw", "fcaw", "smaw", "saw"};
inline constexpr std::array<std::string_view, 4> transfer_names{"short_circuit", "globular", "spray", "pulsed_spray"};
inline constexpr std::array<std::string_view, 5> position_names{"flat", "horizontal", "vertical_up", "vertical_down",
                                                                "overhead"};
std::string_view to_string(Process);
std::string_view to_string(Transfer);
std::string_view to_string(Position);

}  // namespace heatbead
