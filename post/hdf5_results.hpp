// The results file of a run: grid, per-cell fields, probe histories, summary numbers, the resolved
// case and its warnings, in one HDF5 file. post/HDF5_LAYOUT.md describes the layout for readers.
#pragma once

#include <array>
#include <filesystem>
#include <span>
#include <string>
#include <vector>

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"

namespace heatbead::post {

// One value per solid cell, in the solid-cell order of mesh::SolidCells (index i·ns + s).
struct CellField {
    std::string name, unit, description;
    std::span<const double> values;
};

// Temperature history [degC] at a point [m], sampled at `time` [s].
struct ProbeSeries {
    std::string name;
    std::array<double, 3> position;
    std::vector<double> time, temperature;
};

struct Scalar {
    std::string name;
    double value;
    std::string unit;  // "1" for a dimensionless number
    std::string description;
};

// Everything a results file holds. The writer only reads it; grid, cells and the field values must
// stay alive during the call.
struct RunRecord {
    const mesh::Grid* grid = nullptr;
    const mesh::SolidCells* cells = nullptr;
    std::vector<CellField> fields;
    std::vector<ProbeSeries> probes;
    std::vector<Scalar> scalars;
    std::string resolved_case;  // TOML text of the case with every default filled in
    std::vector<std::string> warnings;
    std::string stop_reason, program_version;
};

// Writes `record` to `path` (layout in post/HDF5_LAYOUT.md), replacing any file there. The file is
// written beside the target as `path.partial.<pid>` and renamed into place when complete, so `path`
// is either the old file or the whole new one. Creates missing parent folders.
//
// Throws std::runtime_error naming the path, and leaves no temporary behind, when the record is
// inconsistent (no grid or cells, cells of another grid, a field with the wrong number of values, a
// probe with unequal time and temperature lengths, an empty unit, a name that is empty, contains '/'
// or is used twice in one group, or text containing a NUL byte) or when HDF5 or the file system fails.
void write_hdf5_results(const std::filesystem::path& path, const RunRecord& record);

// A table of results (a sweep's points), one row per point, column by column:
//   /table/<name>  numbers (unit and description attributes) or UTF-8 strings (unit "1");
//   /<document>    whole texts kept with the table (the sweep file, the base case).
// Written to a temporary name, synced and renamed, like write_hdf5_results.
struct NumberColumn {
    std::string name, unit, description;
    std::vector<double> values;
};
struct TextColumn {
    std::string name, description;
    std::vector<std::string> values;
};
struct TextDocument {
    std::string name, description, text;
};
struct TableRecord {
    std::vector<NumberColumn> numbers;
    std::vector<TextColumn> texts;
    std::vector<TextDocument> documents;
    std::string program_version;
};
// Throws std::runtime_error naming the file, also for columns of unequal length, repeated or empty
// names, or texts holding NUL characters.
void write_hdf5_table(const std::filesystem::path& path, const TableRecord& table);

}  // namespace heatbead::post
