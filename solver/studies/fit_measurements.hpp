// What was measured on a test weld, to calibrate the heat source against (`heatbead fit`):
// macro-section dimensions, each with its standard uncertainty, and thermocouple traces.
//
// Measurement file (TOML; paths relative to it):
//   [section]            any of: penetration_flange, penetration_web, fused_leg_flange,
//                        fused_leg_web, haz_width_flange, haz_width_web (lengths, default mm), and
//                        fused_area_mm2 (a plain number, mm²)
//   [uncertainty]        the same keys: one standard uncertainty each (defaults 0.2 mm, 2 mm²)
//   [thermocouple]       optional: x, y, z (where it sat, default mm), trace (a file of rows
//                        time_s, temperature_degC), uncertainty (default 15 K)
//   [boundary]           optional: points (a file of rows y_mm, z_mm: the fusion boundary digitised
//                        from a macro photo, in the cross-section frame), uncertainty (default 0.2 mm)
//   [fit]                unknowns = a list from arc_efficiency, half_width, depth, front_length,
//                        rear_length (default ["arc_efficiency", "depth", "half_width"]);
//                        iterations (default 12)
#pragma once

#include "solver/case/case.hpp"

#include <array>
#include <string>
#include <vector>

namespace heatbead {

struct SectionMeasurement {
    std::string key;     // as in the run summary: "penetration_flange", "fused_area", ...
    double value = 0;    // m, or m² for the area
    double uncertainty = 0;
};

struct ThermocoupleTrace {
    std::array<double, 3> position{};  // m
    std::vector<double> time, temperature;  // s, °C
    double uncertainty = 15;  // K
};

struct Measurements {
    std::string file;
    std::vector<SectionMeasurement> section;
    std::vector<ThermocoupleTrace> thermocouples;
    std::vector<std::array<double, 2>> boundary;  // (y, z) in m
    double boundary_uncertainty = 0.2e-3;         // m
    std::vector<std::string> unknowns;
    int iterations = 12;
};

// Reads and checks a measurement file against the case it calibrates (a thermocouple must sit in
// the plates or the bead). Throws CaseError with every problem (file:line, key, value, allowed).
Measurements read_measurements(const std::string& path, const Case& c);

}  // namespace heatbead
