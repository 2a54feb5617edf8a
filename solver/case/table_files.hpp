// Files of numbers a case points at, read into physics objects: a property table into a Material,
// a recorded waveform into its means (solver/case/number_table.hpp reads the rows).
#pragma once

#include "solver/physics/material.hpp"
#include "solver/physics/waveform.hpp"

#include <string>

namespace heatbead {

// Reads a table of columns "temperature_degC, conductivity_W_per_mK, specific_heat_J_per_kgK", separated by
// commas or white space; '#' starts a comment; a first line without any number is a header. Between rows k
// and c are interpolated linearly, beyond the first and last rows held constant. Throws MaterialError
// (file:line:column, value, what is allowed) for: a file that cannot be read, fewer than 2 rows, a row
// without exactly 3 cells, an empty or non-numeric cell, NaN or infinity, a temperature at or below
// −273.15 °C or not above the previous row's, a non-positive k or c; and for a non-positive density.
Material read_property_table(const std::string& path, double density, const MaterialParameters& parameters);

// From a file of rows "time_s, voltage_V, current_A" (solver/case/number_table.hpp); throws
// NumberTableError naming file:line:column for any bad row, too few rows or times not increasing.
WaveformMeans read_waveform(const std::string& path);

}  // namespace heatbead
