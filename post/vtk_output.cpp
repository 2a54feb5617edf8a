#include "post/vtk_output.hpp"

#include "post/atomic_file.hpp"
#include "post/text.hpp"

#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkFieldData.h>
#include <vtkIdTypeArray.h>
#include <vtkIndent.h>
#include <vtkNew.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkStringArray.h>
#include <vtkUnsignedCharArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLPolyDataWriter.h>
#include <vtkXMLUnstructuredGridWriter.h>
#include <vtkXMLUtilities.h>

#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>
#include <stdexcept>
#include <utility>

namespace heatbead::post {

namespace {

// The material array stores the tag values as they are; these are the codes the header promises.
static_assert(static_cast<int>(mesh::Tag::flange) == 1 && static_cast<int>(mesh::Tag::web) == 2 &&
              static_cast<int>(mesh::Tag::weld) == 3);

// VTK writes into memory and write_file_atomically stores the bytes, so one routine owns the
// temporary-then-rename logic for every output of the program. Appended raw binary skips base64, which
// would make the file a third larger; 64-bit headers keep blocks of large grids addressable.
void store(vtkXMLWriter& writer, vtkDataObject* data, const std::filesystem::path& path) {
    writer.SetInputData(data);
    writer.WriteToOutputStringOn();
    writer.SetDataModeToAppended();
    writer.EncodeAppendedDataOff();
    writer.SetCompressorTypeToZLib();
    writer.SetHeaderTypeToUInt64();
    if (writer.Write() == 0) throw std::runtime_error("cannot write " + path.string() + ": the VTK writer failed");
    write_file_atomically(path, writer.GetOutputString());
}

void check_inputs(const mesh::Grid& grid, const mesh::SolidCells& cells, std::span<const std::uint8_t> present,
                  const std::vector<VtkField>& fields) {
    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();
    if (cells.nx != grid.x.cells() || cells.section_index.size() != ny * nz || cells.j.size() != cells.ns ||
        cells.k.size() != cells.ns || cells.tag.size() != cells.ns)
        throw std::invalid_argument("VTK output: the solid cells do not belong to the grid");
    if (present.size() != cells.size())
        throw std::invalid_argument("VTK output: " + std::to_string(present.size()) + " presence flags for " +
                                    std::to_string(cells.size()) + " solid cells");
    std::set<std::string> names{"material"};
    for (const auto& field : fields) {
        if (field.name.empty()) throw std::invalid_argument("VTK output: a field has no name");
        if (!names.insert(field.name).second)
            throw std::invalid_argument("VTK output: field name \"" + field.name + "\" is reserved or repeated");
        if (field.values.size() != cells.size())
            throw std::invalid_argument("VTK output: field \"" + field.name + "\" has " +
                                        std::to_string(field.values.size()) + " values for " +
                                        std::to_string(cells.size()) + " solid cells");
    }
}

// Assigns point ids plane by plane: the cells of slice i only touch the node planes i and i+1, so two
// tables of section nodes suffice, where one table over all nodes of the grid could need gigabytes.
class PointTable {
public:
    PointTable(const mesh::Grid& grid, vtkPoints& points)
        : grid_(grid), points_(points), stride_(grid.y.cells() + 1),
          lower_((grid.y.cells() + 1) * (grid.z.cells() + 1), unassigned),
          upper_(lower_.size(), unassigned) {}

    // Moves on to slice i (called with i = 0, 1, ... in order).
    void start_slice(std::size_t i) {
        if (i > 0) {
            std::swap(lower_, upper_);
            std::fill(upper_.begin(), upper_.end(), unassigned);
        }
        slice_ = i;
    }

    // Point id of node (slice + di, jj, kk), di in {0, 1}.
    vtkIdType id(std::size_t di, std::size_t jj, std::size_t kk) {
        vtkIdType& slot = (di == 0 ? lower_ : upper_)[jj + stride_ * kk];
        if (slot == unassigned)
            slot = points_.InsertNextPoint(grid_.x.faces[slice_ + di], grid_.y.faces[jj], grid_.z.faces[kk]);
        return slot;
    }

private:
    static constexpr vtkIdType unassigned = -1;
    const mesh::Grid& grid_;
    vtkPoints& points_;
    std::size_t stride_;
    std::vector<vtkIdType> lower_, upper_;
    std::size_t slice_ = 0;
};

vtkNew<vtkUnstructuredGrid> hexahedra(const mesh::Grid& grid, const mesh::SolidCells& cells,
                                      std::span<const std::uint8_t> present, const std::vector<VtkField>& fields) {
    check_inputs(grid, cells, present, fields);
    std::vector<std::size_t> written;  // storage index of each VTK cell
    for (std::size_t c = 0; c < cells.size(); ++c)
        if (present[c] != 0) written.push_back(c);

    vtkNew<vtkPoints> points;
    // Faces are exact doubles; single precision would move them by up to ~10 nm on a 0.1 m part.
    points->SetDataTypeToDouble();
    vtkNew<vtkIdTypeArray> connectivity;
    connectivity->SetNumberOfValues(static_cast<vtkIdType>(8 * written.size()));
    vtkNew<vtkUnsignedCharArray> material;
    material->SetName("material");
    material->SetNumberOfValues(static_cast<vtkIdType>(written.size()));

    PointTable table(grid, *points);
    vtkIdType cell = 0;
    std::size_t slice = 0;
    table.start_slice(0);
    for (const std::size_t c : written) {
        while (slice < c / cells.ns) table.start_slice(++slice);
        const std::size_t s = c % cells.ns, jj = cells.j[s], kk = cells.k[s];
        // VTK_HEXAHEDRON order: the face at x_i as (j,k) (j+1,k) (j+1,k+1) (j,k+1), whose right-hand
        // normal y × z = +x points to the face at x_{i+1}, which follows in the same order.
        const vtkIdType corners[8] = {table.id(0, jj, kk),     table.id(0, jj + 1, kk),
                                      table.id(0, jj + 1, kk + 1), table.id(0, jj, kk + 1),
                                      table.id(1, jj, kk),     table.id(1, jj + 1, kk),
                                      table.id(1, jj + 1, kk + 1), table.id(1, jj, kk + 1)};
        for (int n = 0; n < 8; ++n) connectivity->SetValue(8 * cell + n, corners[n]);
        material->SetValue(cell, static_cast<unsigned char>(cells.tag[s]));
        ++cell;
    }

    vtkNew<vtkCellArray> hexes;
    hexes->SetData(8, connectivity);
    vtkNew<vtkUnstructuredGrid> mesh_out;
    mesh_out->SetPoints(points);
    mesh_out->SetCells(VTK_HEXAHEDRON, hexes);
    mesh_out->GetCellData()->AddArray(material);
    for (const auto& field : fields) {
        vtkNew<vtkDoubleArray> array;
        array->SetName(field.name.c_str());
        array->SetNumberOfValues(static_cast<vtkIdType>(written.size()));
        for (std::size_t n = 0; n < written.size(); ++n)
            array->SetValue(static_cast<vtkIdType>(n), field.values[written[n]]);
        mesh_out->GetCellData()->AddArray(array);
    }
    return mesh_out;
}

}  // namespace

void write_vtk_cells(const std::filesystem::path& path, const mesh::Grid& grid, const mesh::SolidCells& cells,
                     std::span<const std::uint8_t> present, const std::vector<VtkField>& fields) {
    auto data = hexahedra(grid, cells, present, fields);
    vtkNew<vtkXMLUnstructuredGridWriter> writer;
    store(*writer, data, path);
}

VtkSeries::VtkSeries(std::filesystem::path folder, std::string stem)
    : folder_(std::move(folder)), stem_(std::move(stem)) {
    if (stem_.empty()) throw std::invalid_argument("VTK series: empty file stem");
}

std::filesystem::path VtkSeries::index_path() const { return folder_ / (stem_ + ".pvd"); }

void VtkSeries::add(double time, const mesh::Grid& grid, const mesh::SolidCells& cells,
                    std::span<const std::uint8_t> present, const std::vector<VtkField>& fields) {
    if (!std::isfinite(time) || (!snapshots_.empty() && time <= snapshots_.back().time))
        throw std::invalid_argument("VTK series: time " + exact_text(time) + " is not finite or not after " +
                                    (snapshots_.empty() ? "nothing" : exact_text(snapshots_.back().time)));
    const std::string file = stem_ + format_text("_%06zu.vtu", snapshots_.size());

    auto data = hexahedra(grid, cells, present, fields);
    // "TimeValue" is the field-data name VTK's XML readers take as the time of a dataset, so a snapshot
    // opened on its own still knows its time.
    vtkNew<vtkDoubleArray> time_value;
    time_value->SetName("TimeValue");
    time_value->InsertNextValue(time);
    data->GetFieldData()->AddArray(time_value);
    vtkNew<vtkXMLUnstructuredGridWriter> writer;
    store(*writer, data, folder_ / file);
    snapshots_.push_back({time, file});
}

void VtkSeries::finish() {
    // VTK 9.1 has no writer (and no reader) for a collection index, so this is the one hand-made file:
    // the minimal VTKFile "Collection" layout, one DataSet element per snapshot. It is still built as
    // VTK XML elements and rendered by vtkXMLUtilities, which escapes the attribute text.
    vtkNew<vtkXMLDataElement> root;
    root->SetName("VTKFile");
    root->SetAttribute("type", "Collection");
    root->SetAttribute("version", "0.1");
    vtkNew<vtkXMLDataElement> collection;
    collection->SetName("Collection");
    for (const auto& snapshot : snapshots_) {
        vtkNew<vtkXMLDataElement> entry;
        entry->SetName("DataSet");
        // The shortest text that reads back as the same double, so index times match the snapshots exactly.
        entry->SetAttribute("timestep", exact_text(snapshot.time).c_str());
        entry->SetAttribute("file", snapshot.file.c_str());
        collection->AddNestedElement(entry);
    }
    root->AddNestedElement(collection);
    std::ostringstream text;
    text << "<?xml version=\"1.0\"?>\n";
    vtkIndent indent;
    vtkXMLUtilities::FlattenElement(root, text, &indent);
    write_file_atomically(index_path(), text.str());
}

void write_vtk_lines(const std::filesystem::path& path, double station, const std::vector<VtkLine>& lines) {
    if (!std::isfinite(station)) throw std::invalid_argument("VTK lines: station is not finite");
    vtkNew<vtkPoints> points;
    points->SetDataTypeToDouble();
    vtkNew<vtkIdTypeArray> offsets, connectivity;
    offsets->InsertNextValue(0);
    vtkNew<vtkStringArray> kinds;
    kinds->SetName("kind");
    for (const auto& line : lines) {
        if (line.kind.empty()) throw std::invalid_argument("VTK lines: a line has no kind");
        if (line.points.size() < 2)
            throw std::invalid_argument("VTK lines: line \"" + line.kind + "\" has fewer than two points");
        for (const auto& [y, z] : line.points) {
            if (!std::isfinite(y) || !std::isfinite(z))
                throw std::invalid_argument("VTK lines: line \"" + line.kind + "\" has a non-finite point");
            connectivity->InsertNextValue(points->InsertNextPoint(station, y, z));
        }
        offsets->InsertNextValue(connectivity->GetNumberOfValues());
        kinds->InsertNextValue(line.kind);
    }
    vtkNew<vtkCellArray> polylines;
    polylines->SetData(offsets, connectivity);
    vtkNew<vtkPolyData> data;
    data->SetPoints(points);
    data->SetLines(polylines);
    data->GetCellData()->AddArray(kinds);
    vtkNew<vtkXMLPolyDataWriter> writer;
    store(*writer, data, path);
}

}  // namespace heatbead::post
