// VTK output read back with VTK's own readers: the cells present and only those, values at known cells,
// shared points, the series index and the cross-section lines; failed writes leave nothing behind.
#include "post/vtk_output.hpp"

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"
#include "tests/temp_folder.hpp"

#include <catch2/catch.hpp>

#include <vtkCell.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkIdList.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkSmartPointer.h>
#include <vtkStringArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLPolyDataReader.h>
#include <vtkXMLUnstructuredGridReader.h>
#include <vtkXMLUtilities.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <limits>
#include <set>
#include <string>

using namespace heatbead;
using post::VtkField;

namespace {

constexpr double mm = 1e-3;

// A coarse tee joint: about a hundred cells per cross-section, five slices along the weld.
mesh::Grid small_tee() {
    const mesh::JointGeometry joint{.flange_thickness = 10 * mm,
                                    .flange_width = 60 * mm,
                                    .web_thickness = 8 * mm,
                                    .web_height = 30 * mm,
                                    .weld_length = 100 * mm,
                                    .leg_flange = 8 * mm,
                                    .leg_web = 6 * mm};
    const mesh::GridSettings settings{.cross_section = {.finest = 2 * mm, .coarsest = 8 * mm, .growth = 1.3},
                                      .refine_margin = 2 * mm,
                                      .along_weld = 20 * mm};
    return mesh::build_grid(joint, settings);
}

using CellKey = std::array<std::size_t, 3>;  // (i, j, k)

double known_value(const CellKey& c) { return 1000 + 100.0 * c[0] + c[1] + 0.001 * c[2]; }

std::size_t cell_containing(const mesh::Axis& axis, double centre) {
    return static_cast<std::size_t>(std::upper_bound(axis.faces.begin(), axis.faces.end(), centre) -
                                    axis.faces.begin() - 1);
}

// Cell (i, j, k) of each VTK cell, found from its centre.
std::vector<CellKey> grid_cells_of(vtkDataSet& data, const mesh::Grid& grid) {
    std::vector<CellKey> keys;
    for (vtkIdType c = 0; c < data.GetNumberOfCells(); ++c) {
        double b[6];
        data.GetCell(c)->GetBounds(b);
        keys.push_back({cell_containing(grid.x, (b[0] + b[1]) / 2), cell_containing(grid.y, (b[2] + b[3]) / 2),
                        cell_containing(grid.z, (b[4] + b[5]) / 2)});
    }
    return keys;
}

vtkSmartPointer<vtkUnstructuredGrid> read_vtu(const std::filesystem::path& path) {
    vtkNew<vtkXMLUnstructuredGridReader> reader;
    reader->SetFileName(path.c_str());
    reader->Update();
    REQUIRE(reader->GetErrorCode() == 0);
    return reader->GetOutput();
}

struct Sample {
    mesh::Grid grid = small_tee();
    mesh::SolidCells cells = mesh::index_solid_cells(grid);
    std::vector<double> temperature, peak;
    Sample() {
        for (std::size_t c = 0; c < cells.size(); ++c) {
            const std::size_t i = c / cells.ns, s = c % cells.ns;
            temperature.push_back(known_value({i, cells.j[s], cells.k[s]}));
            peak.push_back(c == 0 ? std::numeric_limits<double>::quiet_NaN() : -static_cast<double>(c));
        }
    }
    // Weld deposited in slices i < `deposited` only.
    std::vector<std::uint8_t> present(std::size_t deposited) const {
        std::vector<std::uint8_t> flags(cells.size());
        for (std::size_t c = 0; c < cells.size(); ++c)
            flags[c] = cells.tag[c % cells.ns] != mesh::Tag::weld || c / cells.ns < deposited;
        return flags;
    }
    std::vector<VtkField> fields() const { return {{"temperature", temperature}, {"peak", peak}}; }
};

std::size_t count_present(const std::vector<std::uint8_t>& present) {
    return static_cast<std::size_t>(std::count(present.begin(), present.end(), 1));
}

bool folder_empty_but(const std::filesystem::path& folder, const std::filesystem::path& kept) {
    for (const auto& entry : std::filesystem::recursive_directory_iterator(folder))
        if (entry.path() != kept) return false;
    return true;
}

}  // namespace

TEST_CASE("cells read back: present solid cells only, known values, shared points", "[vtk]") {
    testing::TempFolder tmp("vtk_cells");
    const Sample sample;
    const auto& grid = sample.grid;
    const auto& cells = sample.cells;
    REQUIRE(grid.x.cells() == 5);
    const auto present = sample.present(3);
    const auto path = tmp.path / "cells.vtu";
    post::write_vtk_cells(path, grid, cells, present, sample.fields());

    const auto data = read_vtu(path);
    REQUIRE(static_cast<std::size_t>(data->GetNumberOfCells()) == count_present(present));
    REQUIRE(count_present(present) < grid.solid_cells());  // some weld is left out
    vtkDataArray* temperature = data->GetCellData()->GetArray("temperature");
    vtkDataArray* peak = data->GetCellData()->GetArray("peak");
    vtkDataArray* material = data->GetCellData()->GetArray("material");
    REQUIRE(temperature != nullptr);
    REQUIRE(peak != nullptr);
    REQUIRE(material != nullptr);
    CHECK(material->GetDataType() == VTK_UNSIGNED_CHAR);

    const auto keys = grid_cells_of(*data, grid);
    std::set<CellKey> seen;
    std::set<std::array<double, 3>> corners;
    for (vtkIdType c = 0; c < data->GetNumberOfCells(); ++c) {
        const CellKey& key = keys[static_cast<std::size_t>(c)];
        INFO("cell " << key[0] << " " << key[1] << " " << key[2]);
        CHECK(seen.insert(key).second);
        const mesh::Tag tag = grid.tag(key[1], key[2]);
        REQUIRE(tag != mesh::Tag::empty);  // no void cell is written
        const std::size_t index = cells.index(key[0], cells.at(key[1], key[2], grid.y.cells()));
        CHECK(present[index] == 1);
        CHECK(temperature->GetTuple1(c) == known_value(key));
        if (index == 0)
            CHECK(std::isnan(peak->GetTuple1(c)));
        else
            CHECK(peak->GetTuple1(c) == -static_cast<double>(index));
        CHECK(material->GetTuple1(c) == static_cast<double>(tag));

        // Exactly the cell's faces, in VTK's hexahedron order: positive volume at corner 0.
        vtkCell* hex = data->GetCell(c);
        REQUIRE(hex->GetCellType() == VTK_HEXAHEDRON);
        double p[8][3];
        for (int n = 0; n < 8; ++n) {
            hex->GetPoints()->GetPoint(n, p[n]);
            corners.insert({p[n][0], p[n][1], p[n][2]});
        }
        CHECK(p[0][0] == grid.x.faces[key[0]]);
        CHECK(p[0][1] == grid.y.faces[key[1]]);
        CHECK(p[0][2] == grid.z.faces[key[2]]);
        CHECK(p[6][0] == grid.x.faces[key[0] + 1]);
        CHECK(p[6][1] == grid.y.faces[key[1] + 1]);
        CHECK(p[6][2] == grid.z.faces[key[2] + 1]);
        double e[3][3];
        for (int d = 0; d < 3; ++d) {
            e[0][d] = p[1][d] - p[0][d];
            e[1][d] = p[3][d] - p[0][d];
            e[2][d] = p[4][d] - p[0][d];
        }
        const double volume = e[2][0] * (e[0][1] * e[1][2] - e[0][2] * e[1][1]) +
                              e[2][1] * (e[0][2] * e[1][0] - e[0][0] * e[1][2]) +
                              e[2][2] * (e[0][0] * e[1][1] - e[0][1] * e[1][0]);
        CHECK(volume > 0);
    }
    // Every corner is one point: as many points as distinct corners.
    CHECK(static_cast<std::size_t>(data->GetNumberOfPoints()) == corners.size());

    // A weld cell of slice 4 (not deposited) is absent; the same cell of slice 0 is there.
    const auto weld = std::find(cells.tag.begin(), cells.tag.end(), mesh::Tag::weld);
    REQUIRE(weld != cells.tag.end());
    const auto s = static_cast<std::size_t>(weld - cells.tag.begin());
    CHECK(seen.count({0, cells.j[s], cells.k[s]}) == 1);
    CHECK(seen.count({4, cells.j[s], cells.k[s]}) == 0);
}

TEST_CASE("cells refuse inputs of the wrong size or with bad names", "[vtk]") {
    testing::TempFolder tmp("vtk_inputs");
    const Sample sample;
    const auto present = sample.present(5);
    const auto path = tmp.path / "bad.vtu";
    const std::vector<std::uint8_t> short_present(present.begin(), present.end() - 1);
    CHECK_THROWS_AS(post::write_vtk_cells(path, sample.grid, sample.cells, short_present, sample.fields()),
                    std::invalid_argument);
    const std::span<const double> short_values(sample.temperature.data(), sample.temperature.size() - 1);
    CHECK_THROWS_AS(post::write_vtk_cells(path, sample.grid, sample.cells, present, {{"t", short_values}}),
                    std::invalid_argument);
    CHECK_THROWS_AS(post::write_vtk_cells(path, sample.grid, sample.cells, present, {{"material", sample.peak}}),
                    std::invalid_argument);
    CHECK_THROWS_AS(post::write_vtk_cells(path, sample.grid, sample.cells, present,
                                          {{"t", sample.peak}, {"t", sample.temperature}}),
                    std::invalid_argument);
    CHECK(folder_empty_but(tmp.path, {}));
}

TEST_CASE("series index lists every snapshot with its time", "[vtk]") {
    testing::TempFolder tmp("vtk_series");
    const Sample sample;
    const std::array<double, 3> times{0.5, 1.25, 2.0 / 3.0 + 2};
    post::VtkSeries series(tmp.path / "run", "pass");
    for (std::size_t n = 0; n < times.size(); ++n)
        series.add(times[n], sample.grid, sample.cells, sample.present(n + 1), sample.fields());
    CHECK_THROWS_AS(series.add(times.back(), sample.grid, sample.cells, sample.present(5), sample.fields()),
                    std::invalid_argument);
    series.finish();
    REQUIRE(series.index_path() == tmp.path / "run" / "pass.pvd");

    // VTK 9.1 ships no collection reader, so the index is read with VTK's XML parser.
    vtkXMLDataElement* root = vtkXMLUtilities::ReadElementFromFile(series.index_path().c_str());
    REQUIRE(root != nullptr);
    CHECK(std::string(root->GetName()) == "VTKFile");
    CHECK(std::string(root->GetAttribute("type")) == "Collection");
    vtkXMLDataElement* collection = root->FindNestedElementWithName("Collection");
    REQUIRE(collection != nullptr);
    REQUIRE(collection->GetNumberOfNestedElements() == static_cast<int>(times.size()));
    for (std::size_t n = 0; n < times.size(); ++n) {
        vtkXMLDataElement* entry = collection->GetNestedElement(static_cast<int>(n));
        CHECK(std::string(entry->GetName()) == "DataSet");
        CHECK(std::stod(entry->GetAttribute("timestep")) == times[n]);
        const auto data = read_vtu(tmp.path / "run" / entry->GetAttribute("file"));
        CHECK(static_cast<std::size_t>(data->GetNumberOfCells()) == count_present(sample.present(n + 1)));
        vtkDataArray* time_value = data->GetFieldData()->GetArray("TimeValue");
        REQUIRE(time_value != nullptr);
        CHECK(time_value->GetTuple1(0) == times[n]);
    }
    root->Delete();
}

TEST_CASE("cross-section lines read back at the station with their kinds", "[vtk]") {
    testing::TempFolder tmp("vtk_lines");
    const double station = 0.05;
    const std::vector<post::VtkLine> lines{{"fusion", {{0.004, 0.0}, {0.006, 0.002}, {0.012, 0.0}}},
                                           {"ac1", {{0.003, -0.001}, {0.014, -0.001}}}};
    const auto path = tmp.path / "section.vtp";
    post::write_vtk_lines(path, station, lines);

    vtkNew<vtkXMLPolyDataReader> reader;
    reader->SetFileName(path.c_str());
    reader->Update();
    REQUIRE(reader->GetErrorCode() == 0);
    vtkPolyData* data = reader->GetOutput();
    REQUIRE(data->GetNumberOfLines() == 2);
    REQUIRE(data->GetNumberOfPoints() == 5);
    auto* kinds = vtkStringArray::SafeDownCast(data->GetCellData()->GetAbstractArray("kind"));
    REQUIRE(kinds != nullptr);
    vtkNew<vtkIdList> ids;
    for (vtkIdType line = 0; line < 2; ++line) {
        const auto& expected = lines[static_cast<std::size_t>(line)];
        CHECK(kinds->GetValue(line) == expected.kind);
        data->GetCellPoints(line, ids);
        REQUIRE(static_cast<std::size_t>(ids->GetNumberOfIds()) == expected.points.size());
        for (vtkIdType n = 0; n < ids->GetNumberOfIds(); ++n) {
            double p[3];
            data->GetPoint(ids->GetId(n), p);
            CHECK(p[0] == station);
            CHECK(p[1] == expected.points[static_cast<std::size_t>(n)][0]);
            CHECK(p[2] == expected.points[static_cast<std::size_t>(n)][1]);
        }
    }
    CHECK_THROWS_AS(post::write_vtk_lines(tmp.path / "bad.vtp", station, {{"ac3", {{0.0, 0.0}}}}),
                    std::invalid_argument);
}

TEST_CASE("a failed write throws naming the path and leaves nothing", "[vtk]") {
    testing::TempFolder tmp("vtk_fail");
    const auto blocker = tmp.path / "not_a_folder";
    std::ofstream(blocker) << "x";
    const Sample sample;
    const auto check_fails = [&](auto&& write) {
        try {
            write();
            FAIL("no exception");
        } catch (const std::runtime_error& e) {
            CHECK_THAT(e.what(), Catch::Contains(blocker.string()));
        }
        CHECK(folder_empty_but(tmp.path, blocker));
    };
    check_fails([&] {
        post::write_vtk_cells(blocker / "cells.vtu", sample.grid, sample.cells, sample.present(5), sample.fields());
    });
    check_fails([&] { post::write_vtk_lines(blocker / "section.vtp", 0.0, {{"fusion", {{0, 0}, {1, 1}}}}); });
    check_fails([&] {
        post::VtkSeries series(blocker / "run", "pass");
        series.add(0.0, sample.grid, sample.cells, sample.present(5), sample.fields());
    });
    check_fails([&] {
        post::VtkSeries series(blocker / "run", "pass");
        series.finish();
    });
}
