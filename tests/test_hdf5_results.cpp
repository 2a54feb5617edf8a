// Tests of post/hdf5_results: what the writer puts in the file is read back through the HDF5
// library's own C API (and listed by h5dump when it is installed), never through our writer's code.
#include "tests/temp_folder.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <array>
#include <cstdint>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <regex>
#include <set>
#include <sstream>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>
#include <unistd.h>

#include <hdf5.h>

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"
#include "post/hdf5_results.hpp"

using namespace heatbead;
namespace fs = std::filesystem;

namespace {

constexpr double mm = 1e-3;

// Flange 100 × 10 mm, web 8 × 50 mm, 8 × 6 mm bead; coarse cells in the cross-section (20 × 15)
// keep the grid small, so writing and reading it back takes milliseconds.
mesh::Grid small_tee(double weld_length = 60 * mm, double along_weld = 20 * mm) {
    const mesh::JointGeometry joint{.flange_thickness = 10 * mm,
                                    .flange_width = 100 * mm,
                                    .web_thickness = 8 * mm,
                                    .web_height = 50 * mm,
                                    .weld_length = weld_length,
                                    .leg_flange = 8 * mm,
                                    .leg_web = 6 * mm};
    const mesh::GridSettings settings{.cross_section = {.finest = 2 * mm, .coarsest = 10 * mm, .growth = 1.5},
                                      .refine_margin = 2 * mm,
                                      .along_weld = along_weld};
    return mesh::build_grid(joint, settings);
}

// A value that differs in every cell, computed from the cell's position alone, so a value landing in
// the wrong cell of the file is caught.
double marker(std::size_t i, std::size_t j, std::size_t k) {
    return 1000.0 + 100.0 * static_cast<double>(i) + static_cast<double>(j) + 1e-3 * static_cast<double>(k);
}

// A temporary folder that can list what is in it.
struct Scratch : heatbead::testing::TempFolder {
    explicit Scratch(const std::string& tag) : TempFolder("hdf5_" + tag), dir(path) {}
    const fs::path& dir;

    std::set<std::string> entries() const {
        std::set<std::string> names;
        for (const auto& entry : fs::directory_iterator(dir)) names.insert(entry.path().filename().string());
        return names;
    }
};

// An opened HDF5 object of the reading side, closed when it goes out of scope.
struct Opened {
    hid_t id;
    herr_t (*close)(hid_t);
    Opened(hid_t opened, herr_t (*closer)(hid_t)) : id(opened), close(closer) { REQUIRE(id >= 0); }
    ~Opened() { close(id); }
    Opened(const Opened&) = delete;
    Opened& operator=(const Opened&) = delete;
};

Opened open_file(const fs::path& path) {
    return {H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT), H5Fclose};
}

std::vector<hsize_t> dims_of(hid_t dataset) {
    const Opened space(H5Dget_space(dataset), H5Sclose);
    std::vector<hsize_t> dims(static_cast<std::size_t>(H5Sget_simple_extent_ndims(space.id)));
    H5Sget_simple_extent_dims(space.id, dims.data(), nullptr);
    return dims;
}

// All values of a float64 dataset, and its shape.
std::vector<double> read_doubles(hid_t file, const std::string& name, std::vector<hsize_t>& dims) {
    const Opened dataset(H5Dopen2(file, name.c_str(), H5P_DEFAULT), H5Dclose);
    dims = dims_of(dataset.id);
    std::size_t n = 1;
    for (hsize_t d : dims) n *= d;
    std::vector<double> values(n);
    if (n > 0) REQUIRE(H5Dread(dataset.id, H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()) >= 0);
    return values;
}

std::vector<double> read_doubles(hid_t file, const std::string& name) {
    std::vector<hsize_t> dims;
    return read_doubles(file, name, dims);
}

// A variable-length string stored in the file, read as the library hands it out.
std::string take_string(char* text) {
    REQUIRE(text != nullptr);
    std::string copy(text);
    H5free_memory(text);
    return copy;
}

// The memory type for reading variable-length UTF-8 strings; the caller owns it.
hid_t new_string_type() {
    const hid_t type = H5Tcopy(H5T_C_S1);
    H5Tset_size(type, H5T_VARIABLE);
    H5Tset_cset(type, H5T_CSET_UTF8);
    return type;
}

std::string text_attribute(hid_t object, const std::string& where, const char* name) {
    const Opened attribute(H5Aopen_by_name(object, where.c_str(), name, H5P_DEFAULT, H5P_DEFAULT), H5Aclose);
    const Opened type(new_string_type(), H5Tclose);
    char* text = nullptr;
    REQUIRE(H5Aread(attribute.id, type.id, &text) >= 0);
    return take_string(text);
}

std::vector<std::string> read_texts(hid_t file, const char* name) {
    const Opened dataset(H5Dopen2(file, name, H5P_DEFAULT), H5Dclose);
    const Opened type(new_string_type(), H5Tclose);
    const Opened space(H5Dget_space(dataset.id), H5Sclose);
    const hssize_t n = H5Sget_simple_extent_npoints(space.id);
    std::vector<char*> raw(static_cast<std::size_t>(n), nullptr);
    if (n > 0) REQUIRE(H5Dread(dataset.id, type.id, H5S_ALL, H5S_ALL, H5P_DEFAULT, raw.data()) >= 0);
    std::vector<std::string> texts(raw.begin(), raw.end());
    if (n > 0) H5Dvlen_reclaim(type.id, space.id, H5P_DEFAULT, raw.data());
    return texts;
}

// Every dataset in the file, by path, found by walking the file with the library.
std::set<std::string> dataset_paths(hid_t file) {
    std::set<std::string> paths;
    const auto visit = [](hid_t, const char* name, const H5O_info_t* info, void* out) -> herr_t {
        if (info->type == H5O_TYPE_DATASET) static_cast<std::set<std::string>*>(out)->insert(name);
        return 0;
    };
    REQUIRE(H5Ovisit(file, H5_INDEX_NAME, H5_ITER_NATIVE, visit, &paths) >= 0);
    return paths;
}

std::string read_whole(const fs::path& path) {
    std::ifstream in(path, std::ios::binary);
    return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

// The record of a short run on the small tee: a marker field, an all-NaN field (a level never reached),
// two probes, two summary values, a case text with non-ASCII characters and quotes, and two warnings.
struct SampleRun {
    mesh::Grid grid;
    mesh::SolidCells cells = mesh::index_solid_cells(grid);
    std::vector<double> peak, never;
    post::RunRecord record;

    explicit SampleRun(mesh::Grid g = small_tee()) : grid(std::move(g)), peak(cells.size()), never(cells.size(), std::nan("")) {
        for (std::size_t i = 0; i < cells.nx; ++i)
            for (std::size_t s = 0; s < cells.ns; ++s) peak[cells.index(i, s)] = marker(i, cells.j[s], cells.k[s]);
        record.grid = &grid;
        record.cells = &cells;
        record.fields = {{"peak_temperature", "degC", "highest temperature the cell reached", peak},
                         {"last_below_1400", "s", "last time the cell cooled through 1400 degC (NaN: never)", never}};
        record.probes = {{"root", {0.030, 0.004, 0.0}, {0.0, 0.5, 1.0}, {20.0, 850.5, 400.25}},
                         {"user_1", {0.010, 0.020, -0.005}, {0.0}, {20.0}}};
        record.scalars = {{"heat_input", 864000.0, "J/m", "net arc power / travel speed"},
                          {"energy_balance_error", 0.004, "1", "(arc - stored - lost) / arc"}};
        record.resolved_case = "[joint]\nflange_thickness = \"10 mm\"  # résumé: 10 mm\n\n[thermal]\n"
                               "ambient = \"20 degC\"\nnote = 'single \\ and \"double\" quotes, °C'\n";
        record.warnings = {"preheat above 300 degC", "heat input high for a 6 mm leg"};
        record.stop_reason = "all cells below 300 degC";
        record.program_version = "0.1.0-test";
    }
};

// The marker field read back: each solid cell's value at its (i, j, k), NaN in every void cell.
void check_marker_field(hid_t file, const mesh::Grid& grid) {
    const std::size_t nx = grid.x.cells(), ny = grid.y.cells(), nz = grid.z.cells();
    std::vector<hsize_t> dims;
    const std::vector<double> peak = read_doubles(file, "fields/peak_temperature", dims);
    REQUIRE(dims == std::vector<hsize_t>{nz, ny, nx});
    std::size_t wrong_void = 0, wrong_solid = 0, solid = 0;
    for (std::size_t k = 0; k < nz; ++k)
        for (std::size_t j = 0; j < ny; ++j)
            for (std::size_t i = 0; i < nx; ++i) {
                const double v = peak[(k * ny + j) * nx + i];  // C order, field[k, j, i]
                if (grid.tag(j, k) == mesh::Tag::empty) {
                    wrong_void += !std::isnan(v);
                } else {
                    ++solid;
                    wrong_solid += v != marker(i, j, k);
                }
            }
    CHECK(wrong_void == 0);
    CHECK(wrong_solid == 0);
    CHECK(solid == grid.solid_cells());
    CHECK(solid < grid.cells());  // the tee has void cells, so the NaN check bites
}

}  // namespace

TEST_CASE("the results file reads back through the HDF5 library", "[hdf5]") {
    const SampleRun run;
    const Scratch scratch("layout");
    const fs::path path = scratch.dir / "run.h5";
    post::write_hdf5_results(path, run.record);

    // Only the finished file is left: the temporary was renamed, not copied.
    CHECK(scratch.entries() == std::set<std::string>{"run.h5"});

    const Opened file = open_file(path);
    const mesh::Grid& grid = run.grid;
    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();

    SECTION("exactly the documented datasets, each with a unit and a description") {
        const std::set<std::string> expected{
            "grid/x_faces", "grid/y_faces", "grid/z_faces", "grid/tags", "fields/peak_temperature",
            "fields/last_below_1400", "probes/root/time", "probes/root/temperature", "probes/user_1/time",
            "probes/user_1/temperature", "summary/heat_input", "summary/energy_balance_error", "case", "warnings"};
        const std::set<std::string> found = dataset_paths(file.id);
        CHECK(found == expected);
        for (const std::string& name : found) {
            INFO(name);
            CHECK_FALSE(text_attribute(file.id, name, "unit").empty());
            CHECK_FALSE(text_attribute(file.id, name, "description").empty());
        }
        CHECK(text_attribute(file.id, "fields/peak_temperature", "unit") == "degC");
        CHECK(text_attribute(file.id, "fields/last_below_1400", "unit") == "s");
        CHECK(text_attribute(file.id, "grid/x_faces", "unit") == "m");
        CHECK(text_attribute(file.id, "probes/root/temperature", "unit") == "degC");
        CHECK(text_attribute(file.id, "summary/heat_input", "unit") == "J/m");
        CHECK(text_attribute(file.id, "summary/energy_balance_error", "unit") == "1");
    }

    SECTION("grid faces and cross-section tags") {
        CHECK(read_doubles(file.id, "grid/x_faces") == grid.x.faces);
        CHECK(read_doubles(file.id, "grid/y_faces") == grid.y.faces);
        CHECK(read_doubles(file.id, "grid/z_faces") == grid.z.faces);

        const Opened tags(H5Dopen2(file.id, "grid/tags", H5P_DEFAULT), H5Dclose);
        REQUIRE(dims_of(tags.id) == std::vector<hsize_t>{nz, ny});
        std::vector<std::uint8_t> values(ny * nz);
        REQUIRE(H5Dread(tags.id, H5T_NATIVE_UINT8, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()) >= 0);
        std::size_t mismatches = 0;
        for (std::size_t k = 0; k < nz; ++k)
            for (std::size_t j = 0; j < ny; ++j)
                mismatches += values[k * ny + j] != static_cast<std::uint8_t>(grid.tag(j, k));
        CHECK(mismatches == 0);
        CHECK(text_attribute(file.id, "grid/tags", "meaning") == "0 = void (air), 1 = flange, 2 = web, 3 = weld metal");
    }

    SECTION("fields: solid values at their (i, j, k), NaN in void cells, compressed in chunks") {
        check_marker_field(file.id, grid);
        CHECK(text_attribute(file.id, "fields/peak_temperature", "fill") == "NaN for void cells");

        const std::vector<double> never = read_doubles(file.id, "fields/last_below_1400");
        CHECK(std::all_of(never.begin(), never.end(), [](double v) { return std::isnan(v); }));

        const Opened dataset(H5Dopen2(file.id, "fields/last_below_1400", H5P_DEFAULT), H5Dclose);
        const Opened creation(H5Dget_create_plist(dataset.id), H5Pclose);
        CHECK(H5Pget_layout(creation.id) == H5D_CHUNKED);
        unsigned flags = 0, level = 0;
        std::size_t n_values = 1;
        CHECK(H5Pget_filter_by_id2(creation.id, H5Z_FILTER_DEFLATE, &flags, &n_values, &level, 0, nullptr, nullptr) >= 0);
        CHECK(level == 4);
        // An all-NaN field shrinks to a small fraction of its raw size.
        CHECK(H5Dget_storage_size(dataset.id) * 20 < grid.cells() * sizeof(double));
    }

    SECTION("probes") {
        for (const post::ProbeSeries& probe : run.record.probes) {
            INFO(probe.name);
            const std::string group = "probes/" + probe.name;
            CHECK(read_doubles(file.id, group + "/time") == probe.time);
            CHECK(read_doubles(file.id, group + "/temperature") == probe.temperature);
            const Opened attribute(H5Aopen_by_name(file.id, group.c_str(), "position", H5P_DEFAULT, H5P_DEFAULT),
                                   H5Aclose);
            std::array<double, 3> position{};
            REQUIRE(H5Aread(attribute.id, H5T_NATIVE_DOUBLE, position.data()) >= 0);
            CHECK(position == probe.position);
        }
    }

    SECTION("summary values") {
        std::vector<hsize_t> dims;
        CHECK(read_doubles(file.id, "summary/heat_input", dims) == std::vector<double>{864000.0});
        CHECK(dims.empty());  // a scalar dataspace
        CHECK(read_doubles(file.id, "summary/energy_balance_error") == std::vector<double>{0.004});
    }

    SECTION("case text, warnings and the run's attributes") {
        CHECK(read_texts(file.id, "case") == std::vector<std::string>{run.record.resolved_case});
        CHECK(read_texts(file.id, "warnings") == run.record.warnings);
        CHECK(text_attribute(file.id, ".", "program") == "heatbead");
        CHECK(text_attribute(file.id, ".", "version") == "0.1.0-test");
        CHECK(text_attribute(file.id, ".", "stop_reason") == "all cells below 300 degC");
        const std::string created = text_attribute(file.id, ".", "created");
        CHECK(std::regex_match(created, std::regex(R"(\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ)")));
    }

    SECTION("h5dump lists the file") {
        if (std::system("command -v h5dump > /dev/null 2>&1") != 0) {
            WARN("h5dump not installed (Debian package hdf5-tools): listing not checked");
            return;
        }
        const fs::path listing = scratch.dir / "listing.txt";
        const std::string command = "h5dump -H '" + path.string() + "' > '" + listing.string() + "' 2>&1";
        REQUIRE(std::system(command.c_str()) == 0);
        const std::string text = read_whole(listing);
        CHECK(text.find("DATASET \"peak_temperature\"") != std::string::npos);
        CHECK(text.find("GROUP \"probes\"") != std::string::npos);
    }
}

TEST_CASE("fields larger than one chunk are written stack by stack", "[hdf5]") {
    // 20 × 15 cells per section; 1 MiB chunks hold 131072 values. Along x: 1000 cells give stacks of 6 of
    // the 15 layers (the last stack short); 7000 cells give layers too large for one chunk, halved along x.
    const double along_weld = GENERATE(0.5 * mm, 0.1 * mm);
    const double weld_length = along_weld == 0.5 * mm ? 500 * mm : 700 * mm;
    const SampleRun run(small_tee(weld_length, along_weld));
    const Scratch scratch("chunks");
    const fs::path path = scratch.dir / "run.h5";
    post::write_hdf5_results(path, run.record);
    const Opened file = open_file(path);
    check_marker_field(file.id, run.grid);
}

TEST_CASE("an existing results file is replaced whole", "[hdf5]") {
    SampleRun run;
    const Scratch scratch("replace");
    const fs::path path = scratch.dir / "run.h5";
    post::write_hdf5_results(path, run.record);
    run.record.program_version = "0.2.0-test";
    run.record.warnings.clear();
    post::write_hdf5_results(path, run.record);

    CHECK(scratch.entries() == std::set<std::string>{"run.h5"});
    const Opened file = open_file(path);
    CHECK(text_attribute(file.id, ".", "version") == "0.2.0-test");
    CHECK(read_texts(file.id, "warnings").empty());
}

TEST_CASE("a failed write throws, names the path and leaves nothing", "[hdf5]") {
    SampleRun run;
    const Scratch scratch("fail");
    const auto throws_naming = [](const fs::path& path, const post::RunRecord& record) {
        try {
            post::write_hdf5_results(path, record);
        } catch (const std::runtime_error& e) {
            INFO(e.what());
            CHECK(std::string(e.what()).find(path.string()) != std::string::npos);
            return true;
        }
        return false;
    };

    SECTION("parent folder is a regular file") {
        // Not a permission test: the suite may run as root, which may write anywhere.
        std::ofstream(scratch.dir / "blocker") << "x";
        CHECK(throws_naming(scratch.dir / "blocker" / "run.h5", run.record));
        CHECK(scratch.entries() == std::set<std::string>{"blocker"});
    }
    SECTION("target is a folder, so the final rename fails after the file was written") {
        fs::create_directory(scratch.dir / "taken");
        CHECK(throws_naming(scratch.dir / "taken", run.record));
        CHECK(scratch.entries() == std::set<std::string>{"taken"});
        CHECK(fs::is_empty(scratch.dir / "taken"));
    }
    SECTION("inconsistent records are refused before anything is created") {
        const fs::path path = scratch.dir / "sub" / "run.h5";
        post::RunRecord bad = run.record;
        SECTION("field of the wrong length") { bad.fields[0].values = bad.fields[0].values.first(3); }
        SECTION("field name used twice") { bad.fields[1].name = bad.fields[0].name; }
        SECTION("name with a slash") { bad.probes[0].name = "a/b"; }
        SECTION("probe with more times than temperatures") { bad.probes[0].time.push_back(2.0); }
        SECTION("summary value without a unit") { bad.scalars[0].unit.clear(); }
        SECTION("no grid") { bad.grid = nullptr; }
        CHECK(throws_naming(path, bad));
        CHECK(scratch.entries().empty());
    }
}
