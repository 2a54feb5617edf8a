// Results as VTK XML files, for viewing in any VTK-based tool: the solid cells as hexahedra (.vtu), a
// time series of them with an index, and the lines of one cross-section as polylines (.vtp).
//
// Every file is written atomically (complete or absent): VTK's writer renders it into memory, then
// write_file_atomically stores it. Failures throw std::runtime_error naming the file.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"

#include <array>
#include <cstdint>
#include <filesystem>
#include <span>
#include <string>
#include <vector>

namespace heatbead::post {

// A cell field: one value per solid cell, in storage order (i·ns + s). NaN is written as NaN.
struct VtkField {
    std::string name;
    std::span<const double> values;
};

// Writes the solid cells as an unstructured grid of hexahedra (XML .vtu, appended raw binary, zlib):
// void cells are never written, and cells whose `present` flag (one per solid cell) is 0, such as weld
// not yet deposited, are left out. Neighbouring cells share their points. Cell data: one Float64 array
// per field and a UInt8 "material" array (1 flange, 2 web, 3 weld).
// Throws std::invalid_argument when `present` or a field has the wrong size, when `cells` does not
// belong to `grid`, or when a field name is empty, repeated or "material".
void write_vtk_cells(const std::filesystem::path& path, const mesh::Grid& grid, const mesh::SolidCells& cells,
                     std::span<const std::uint8_t> present, const std::vector<VtkField>& fields);

// A time series of snapshots in `folder`: each add() writes `stem_NNNNNN.vtu` (as write_vtk_cells, plus a
// "TimeValue" field-data array that VTK's XML readers report as the time step); finish() writes the
// index `stem.pvd` listing (time, file) with file names relative to the folder. finish() may be called
// again after further add()s; it rewrites the index with every snapshot so far.
class VtkSeries {
public:
    VtkSeries(std::filesystem::path folder, std::string stem);

    // Throws std::invalid_argument for a time that is not finite or not later than the previous one.
    void add(double time, const mesh::Grid& grid, const mesh::SolidCells& cells,
             std::span<const std::uint8_t> present, const std::vector<VtkField>& fields);
    void finish();

    std::filesystem::path index_path() const;

private:
    struct Snapshot {
        double time;
        std::string file;  // relative to the folder
    };
    std::filesystem::path folder_;
    std::string stem_;
    std::vector<Snapshot> snapshots_;
};

// A line of a cross-section, given by its points (y, z), with the kind of line it is ("fusion", "ac1").
struct VtkLine {
    std::string kind;
    std::vector<std::array<double, 2>> points;
};

// Writes the lines as polylines of vtkPolyData at x = station (XML .vtp, appended raw binary, zlib),
// with a cell-data string array "kind". Throws std::invalid_argument for a non-finite station or point,
// an empty kind or a line of fewer than two points.
void write_vtk_lines(const std::filesystem::path& path, double station, const std::vector<VtkLine>& lines);

}  // namespace heatbead::post
