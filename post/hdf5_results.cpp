#include "post/hdf5_results.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <ctime>
#include <fcntl.h>
#include <limits>
#include <optional>
#include <set>
#include <stdexcept>
#include <string_view>
#include <unistd.h>
#include <utility>

#include <hdf5.h>

namespace heatbead::post {
namespace {

// Bumped whenever a reader would have to change; readers can check it before trusting the layout.
constexpr int layout_version = 1;

// Unit of datasets that hold no physical quantity (tag codes, text).
constexpr const char* no_unit = "none";

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// Largest chunk of a 3-D field, in values: 2^17 doubles = 1 MiB, the size of HDF5's default chunk
// cache, so a reader going through a field chunk by chunk never decompresses a chunk twice.
constexpr hsize_t chunk_values = hsize_t{1} << 17;

// Deflate level 4: most of the gain of level 9 on NaN-padded and smooth fields, at a fraction of the time.
constexpr unsigned deflate_level = 4;

// The innermost (most specific) entry of HDF5's error stack, e.g. "unable to open file ... Permission
// denied", which says more than the name of the call that failed. Clears the stack.
herr_t keep_innermost(unsigned n, const H5E_error2_t* error, void* out) {
    if (n == 0 && error->desc) *static_cast<std::string*>(out) = error->desc;
    return 0;
}

std::string hdf5_detail() {
    std::string text;
    H5Ewalk2(H5E_DEFAULT, H5E_WALK_UPWARD, keep_innermost, &text);
    H5Eclear2(H5E_DEFAULT);
    return text.empty() ? std::string() : " (" + text + ")";
}

[[noreturn]] void fail(const std::string& what) { throw std::runtime_error(what + hdf5_detail()); }

void check(herr_t status, const std::string& what) {
    if (status < 0) fail(what);
}

// HDF5 prints its error stack to stderr by default; we report errors through exceptions instead, so the
// printing is switched off while writing and the caller's setting restored afterwards.
class QuietErrors {
public:
    QuietErrors() {
        H5Eget_auto2(H5E_DEFAULT, &handler_, &data_);
        H5Eset_auto2(H5E_DEFAULT, nullptr, nullptr);
    }
    ~QuietErrors() { H5Eset_auto2(H5E_DEFAULT, handler_, data_); }
    QuietErrors(const QuietErrors&) = delete;
    QuietErrors& operator=(const QuietErrors&) = delete;

private:
    H5E_auto2_t handler_ = nullptr;
    void* data_ = nullptr;
};

// Owner of one HDF5 identifier, closed with the function of its kind (H5Fclose, H5Dclose, ...).
class Handle {
public:
    using Closer = herr_t (*)(hid_t);
    Handle(hid_t id, Closer closer, const std::string& what) : id_(id), closer_(closer) {
        if (id_ < 0) fail(what);
    }
    ~Handle() {
        if (id_ >= 0) closer_(id_);
    }
    Handle(Handle&& other) noexcept : id_(std::exchange(other.id_, H5I_INVALID_HID)), closer_(other.closer_) {}
    Handle(const Handle&) = delete;
    Handle& operator=(const Handle&) = delete;
    Handle& operator=(Handle&&) = delete;

    hid_t get() const { return id_; }
    // Closes now and reports failure: for a file, data still buffered is written at this point.
    void close(const std::string& what) {
        const herr_t status = closer_(id_);
        id_ = H5I_INVALID_HID;
        check(status, what);
    }

private:
    hid_t id_;
    Closer closer_;
};

Handle utf8_string_type() {
    Handle type(H5Tcopy(H5T_C_S1), H5Tclose, "copy string type");
    check(H5Tset_size(type.get(), H5T_VARIABLE), "set string size");
    check(H5Tset_cset(type.get(), H5T_CSET_UTF8), "set string character set");
    return type;
}

Handle scalar_space() { return Handle(H5Screate(H5S_SCALAR), H5Sclose, "create scalar dataspace"); }

Handle simple_space(std::span<const hsize_t> dims) {
    return Handle(H5Screate_simple(static_cast<int>(dims.size()), dims.data(), nullptr), H5Sclose,
                  "create dataspace");
}

void set_text_attribute(hid_t object, const char* name, const std::string& value) {
    const Handle type = utf8_string_type();
    const Handle space = scalar_space();
    const Handle attribute(H5Acreate2(object, name, type.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT), H5Aclose,
                           std::string("create attribute ") + name);
    const char* text = value.c_str();
    check(H5Awrite(attribute.get(), type.get(), &text), std::string("write attribute ") + name);
}

void set_number_attribute(hid_t object, const char* name, hid_t type, const void* values, hsize_t count) {
    const Handle space = count == 1 ? scalar_space() : simple_space(std::span(&count, 1));
    const Handle attribute(H5Acreate2(object, name, type, space.get(), H5P_DEFAULT, H5P_DEFAULT), H5Aclose,
                           std::string("create attribute ") + name);
    check(H5Awrite(attribute.get(), type, values), std::string("write attribute ") + name);
}

void describe(hid_t dataset, const std::string& unit, const std::string& description) {
    set_text_attribute(dataset, "unit", unit);
    set_text_attribute(dataset, "description", description);
}

Handle create_group(hid_t parent, const std::string& name) {
    return Handle(H5Gcreate2(parent, name.c_str(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT), H5Gclose,
                  "create group " + name);
}

Handle create_dataset(hid_t parent, const std::string& name, hid_t type, hid_t space, hid_t creation = H5P_DEFAULT) {
    return Handle(H5Dcreate2(parent, name.c_str(), type, space, H5P_DEFAULT, creation, H5P_DEFAULT), H5Dclose,
                  "create dataset " + name);
}

// A dataset of `dims` values written in one call (an empty one is created but not written).
void write_array(hid_t parent, const std::string& name, hid_t type, std::span<const hsize_t> dims, const void* values,
                 const std::string& unit, const std::string& description) {
    const Handle space = simple_space(dims);
    const Handle dataset = create_dataset(parent, name, type, space.get());
    if (H5Sget_simple_extent_npoints(space.get()) > 0)
        check(H5Dwrite(dataset.get(), type, H5S_ALL, H5S_ALL, H5P_DEFAULT, values), "write dataset " + name);
    describe(dataset.get(), unit, description);
}

void write_doubles(hid_t parent, const std::string& name, std::span<const double> values, const std::string& unit,
                   const std::string& description) {
    const hsize_t n = values.size();
    write_array(parent, name, H5T_NATIVE_DOUBLE, std::span(&n, 1), values.data(), unit, description);
}

void write_grid(hid_t file, const mesh::Grid& grid) {
    const Handle group = create_group(file, "grid");
    const auto faces = [&](const char* name, const mesh::Axis& axis, const char* index, const char* along) {
        write_doubles(group.get(), name, axis.faces, "m",
                      std::string("cell faces along ") + along + ", strictly increasing: cell " + index +
                          " spans faces[" + index + "] to faces[" + index + " + 1]");
    };
    faces("x_faces", grid.x, "i", "x (along the weld)");
    faces("y_faces", grid.y, "j", "y (across the flange)");
    faces("z_faces", grid.z, "k", "z (up the web)");

    static_assert(static_cast<int>(mesh::Tag::empty) == 0 && static_cast<int>(mesh::Tag::flange) == 1 &&
                      static_cast<int>(mesh::Tag::web) == 2 && static_cast<int>(mesh::Tag::weld) == 3,
                  "the tag meanings written below follow mesh::Tag");
    // section_tags is already in (k, j) order, index j + ny·k, which is C order for dims (nz, ny).
    std::vector<std::uint8_t> tags(grid.section_tags.size());
    std::transform(grid.section_tags.begin(), grid.section_tags.end(), tags.begin(),
                   [](mesh::Tag t) { return static_cast<std::uint8_t>(t); });
    const std::array<hsize_t, 2> dims{grid.z.cells(), grid.y.cells()};
    const Handle space = simple_space(dims);
    const Handle dataset = create_dataset(group.get(), "tags", H5T_NATIVE_UINT8, space.get());
    check(H5Dwrite(dataset.get(), H5T_NATIVE_UINT8, H5S_ALL, H5S_ALL, H5P_DEFAULT, tags.data()), "write dataset tags");
    describe(dataset.get(), no_unit,
             "material of each cross-section cell (the same at every x), tags[k, j] for cell column (j, k)");
    set_text_attribute(dataset.get(), "meaning", "0 = void (air), 1 = flange, 2 = web, 3 = weld metal");
    set_text_attribute(dataset.get(), "axes", "(z, y): tags[k, j]");
}

// Chunk shape of a (nz, ny, nx) field: whole (y, x) layers stacked up to chunk_values when a layer fits,
// else a layer halved along its longer side until it does.
std::array<hsize_t, 3> chunk_shape(hsize_t nz, hsize_t ny, hsize_t nx) {
    hsize_t cy = ny, cx = nx;
    while (cy * cx > chunk_values) {
        hsize_t& longer = cx >= cy ? cx : cy;
        longer = (longer + 1) / 2;
    }
    const hsize_t cz = std::clamp<hsize_t>(chunk_values / (cy * cx), 1, nz);
    return {cz, cy, cx};
}

// The creation properties of every field: chunked, byte-shuffled and deflated (shuffling groups the
// bytes of equal exponents, which deflate then packs far better than raw doubles), NaN where unwritten.
Handle field_creation(const std::array<hsize_t, 3>& chunk) {
    if (H5Zfilter_avail(H5Z_FILTER_DEFLATE) <= 0) fail("this HDF5 library has no deflate (gzip) filter");
    Handle creation(H5Pcreate(H5P_DATASET_CREATE), H5Pclose, "create dataset properties");
    check(H5Pset_chunk(creation.get(), 3, chunk.data()), "set chunk shape");
    check(H5Pset_shuffle(creation.get()), "set shuffle filter");
    check(H5Pset_deflate(creation.get(), deflate_level), "set deflate filter");
    check(H5Pset_fill_value(creation.get(), H5T_NATIVE_DOUBLE, &nan), "set fill value");
    return creation;
}

// Scatters the solid-cell values onto the full grid, NaN in void cells, writing one stack of chunk layers
// at a time: every chunk is written whole and once, and the buffer stays near one layer of the grid.
void write_field(hid_t parent, const CellField& field, const mesh::Grid& grid, const mesh::SolidCells& cells) {
    const hsize_t nx = grid.x.cells(), ny = grid.y.cells(), nz = grid.z.cells();
    const std::array<hsize_t, 3> dims{nz, ny, nx};
    const std::array<hsize_t, 3> chunk = chunk_shape(nz, ny, nx);
    const Handle creation = field_creation(chunk);
    const Handle file_space = simple_space(dims);
    const Handle dataset = create_dataset(parent, field.name, H5T_NATIVE_DOUBLE, file_space.get(), creation.get());

    std::vector<double> layers(chunk[0] * ny * nx);
    for (hsize_t k0 = 0; k0 < nz; k0 += chunk[0]) {
        const hsize_t count = std::min(chunk[0], nz - k0);
        std::fill(layers.begin(), layers.end(), nan);
        for (hsize_t kk = k0; kk < k0 + count; ++kk) {
            for (hsize_t jj = 0; jj < ny; ++jj) {
                const std::uint32_t s = cells.at(jj, kk, ny);
                if (s == mesh::no_neighbour) continue;
                double* row = layers.data() + ((kk - k0) * ny + jj) * nx;
                for (hsize_t i = 0; i < nx; ++i) row[i] = field.values[cells.index(i, s)];
            }
        }
        const std::array<hsize_t, 3> start{k0, 0, 0}, block{count, ny, nx};
        check(H5Sselect_hyperslab(file_space.get(), H5S_SELECT_SET, start.data(), nullptr, block.data(), nullptr),
              "select layers of " + field.name);
        const Handle memory_space = simple_space(block);
        check(H5Dwrite(dataset.get(), H5T_NATIVE_DOUBLE, memory_space.get(), file_space.get(), H5P_DEFAULT,
                       layers.data()),
              "write dataset " + field.name);
    }
    describe(dataset.get(), field.unit, field.description);
    set_text_attribute(dataset.get(), "fill", "NaN for void cells");
    set_text_attribute(dataset.get(), "axes", "(z, y, x): value[k, j, i] for cell (i, j, k)");
}

void write_probe(hid_t parent, const ProbeSeries& probe) {
    const Handle group = create_group(parent, probe.name);
    write_doubles(group.get(), "time", probe.time, "s", "time of each sample");
    write_doubles(group.get(), "temperature", probe.temperature, "degC",
                  "temperature of the cell holding the probe at each sample time");
    set_number_attribute(group.get(), "position", H5T_NATIVE_DOUBLE, probe.position.data(), probe.position.size());
    set_text_attribute(group.get(), "position_unit", "m");
}

void write_scalar(hid_t parent, const Scalar& scalar) {
    const Handle space = scalar_space();
    const Handle dataset = create_dataset(parent, scalar.name, H5T_NATIVE_DOUBLE, space.get());
    check(H5Dwrite(dataset.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, &scalar.value),
          "write dataset " + scalar.name);
    describe(dataset.get(), scalar.unit, scalar.description);
}

void write_texts(hid_t file, const RunRecord& record) {
    const Handle type = utf8_string_type();
    {
        const Handle space = scalar_space();
        const Handle dataset = create_dataset(file, "case", type.get(), space.get());
        const char* text = record.resolved_case.c_str();
        check(H5Dwrite(dataset.get(), type.get(), H5S_ALL, H5S_ALL, H5P_DEFAULT, &text), "write dataset case");
        describe(dataset.get(), no_unit, "the case as run, in TOML, with every default filled in");
    }
    std::vector<const char*> warnings(record.warnings.size());
    std::transform(record.warnings.begin(), record.warnings.end(), warnings.begin(),
                   [](const std::string& w) { return w.c_str(); });
    const hsize_t n = warnings.size();
    write_array(file, "warnings", type.get(), std::span(&n, 1), warnings.data(), no_unit,
                "warnings raised while reading the case and running it, one per entry");
}

std::string utc_now() {
    const std::time_t now = std::time(nullptr);
    std::tm utc{};
    gmtime_r(&now, &utc);
    char text[32];
    std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &utc);
    return text;
}

// A new file whose root says which program and version wrote it, and when.
Handle create_file(const std::string& name, const std::string& program_version) {
    const Handle access(H5Pcreate(H5P_FILE_ACCESS), H5Pclose, "create file access properties");
    // Closing the file fails if an object in it is still open, instead of leaving the file open unseen.
    check(H5Pset_fclose_degree(access.get(), H5F_CLOSE_SEMI), "set file close degree");
    Handle file(H5Fcreate(name.c_str(), H5F_ACC_TRUNC, H5P_DEFAULT, access.get()), H5Fclose, "create file");
    set_text_attribute(file.get(), "program", "heatbead");
    set_text_attribute(file.get(), "version", program_version);
    set_text_attribute(file.get(), "created", utc_now());
    return file;
}

void write_file(const std::string& name, const RunRecord& record) {
    Handle file = create_file(name, record.program_version);
    {
        const hid_t root = file.get();
        set_text_attribute(root, "stop_reason", record.stop_reason);
        set_number_attribute(root, "layout_version", H5T_NATIVE_INT, &layout_version, 1);

        write_grid(root, *record.grid);
        const Handle fields = create_group(root, "fields");
        for (const CellField& field : record.fields) write_field(fields.get(), field, *record.grid, *record.cells);
        const Handle probes = create_group(root, "probes");
        for (const ProbeSeries& probe : record.probes) write_probe(probes.get(), probe);
        const Handle summary = create_group(root, "summary");
        for (const Scalar& scalar : record.scalars) write_scalar(summary.get(), scalar);
        write_texts(root, record);
    }
    file.close("close file");
}

// HDF5 leaves the data in the kernel's cache; syncing before the rename keeps a crash from leaving a
// complete-looking name on an empty or truncated file.
void sync_file(const std::string& name) {
    const int fd = ::open(name.c_str(), O_RDONLY);
    const bool synced = fd >= 0 && ::fsync(fd) == 0;
    const int error = errno;
    if (fd >= 0) ::close(fd);
    if (!synced) throw std::runtime_error(std::string("sync: ") + std::strerror(error));
}

void check_text(std::string_view text, const std::string& what) {
    // HDF5 strings end at the first NUL, so the rest would be lost without notice.
    if (text.find('\0') != std::string_view::npos) throw std::runtime_error(what + " contains a NUL byte");
}

// Checks a link name and that it is the first of its name in its group.
void check_name(const std::string& name, const char* group, std::set<std::string>& seen) {
    const std::string what = std::string(group) + " name '" + name + "'";
    if (name.empty() || name == "." || name.find('/') != std::string::npos)
        throw std::runtime_error(what + " is not usable in HDF5 (empty, '.' or containing '/')");
    check_text(name, what);
    if (!seen.insert(name).second) throw std::runtime_error(what + " is used twice");
}

void check_described(const std::string& unit, const std::string& description, const std::string& what) {
    if (unit.empty()) throw std::runtime_error(what + " has no unit (use \"1\" for a dimensionless number)");
    check_text(unit, what + " unit");
    check_text(description, what + " description");
}

void check_record(const RunRecord& record) {
    if (!record.grid || !record.cells) throw std::runtime_error("the record has no grid or no solid cells");
    const mesh::Grid& grid = *record.grid;
    const mesh::SolidCells& cells = *record.cells;
    const std::size_t section = grid.y.cells() * grid.z.cells();
    bool same_grid = cells.nx == grid.x.cells() && grid.section_tags.size() == section &&
                     cells.section_index.size() == section;
    for (std::size_t p = 0; same_grid && p < section; ++p)
        same_grid = (grid.section_tags[p] == mesh::Tag::empty) == (cells.section_index[p] == mesh::no_neighbour);
    if (!same_grid) throw std::runtime_error("the solid cells do not belong to the grid");

    std::set<std::string> field_names, probe_names, scalar_names;
    for (const CellField& field : record.fields) {
        check_name(field.name, "field", field_names);
        check_described(field.unit, field.description, "field " + field.name);
        if (field.values.size() != cells.size())
            throw std::runtime_error("field " + field.name + " has " + std::to_string(field.values.size()) +
                                     " values for " + std::to_string(cells.size()) + " solid cells");
    }
    for (const ProbeSeries& probe : record.probes) {
        check_name(probe.name, "probe", probe_names);
        if (probe.time.size() != probe.temperature.size())
            throw std::runtime_error("probe " + probe.name + " has " + std::to_string(probe.time.size()) +
                                     " times and " + std::to_string(probe.temperature.size()) + " temperatures");
    }
    for (const Scalar& scalar : record.scalars) {
        check_name(scalar.name, "summary", scalar_names);
        check_described(scalar.unit, scalar.description, "summary value " + scalar.name);
    }
    check_text(record.resolved_case, "the resolved case");
    for (const std::string& warning : record.warnings) check_text(warning, "a warning");
    check_text(record.stop_reason, "the stop reason");
    check_text(record.program_version, "the program version");
}

void write_text_dataset(hid_t parent, const std::string& name, const std::string& text, const std::string& description) {
    const Handle type = utf8_string_type();
    const Handle space = scalar_space();
    const Handle dataset = create_dataset(parent, name, type.get(), space.get());
    const char* data = text.c_str();
    check(H5Dwrite(dataset.get(), type.get(), H5S_ALL, H5S_ALL, H5P_DEFAULT, &data), "write dataset " + name);
    describe(dataset.get(), no_unit, description);
}

void write_table_file(const std::string& name, const TableRecord& table) {
    Handle file = create_file(name, table.program_version);
    {
        const hid_t root = file.get();
        const Handle group = create_group(root, "table");
        for (const auto& c : table.numbers) write_doubles(group.get(), c.name, c.values, c.unit, c.description);
        const Handle type = utf8_string_type();
        for (const auto& c : table.texts) {
            std::vector<const char*> values(c.values.size());
            std::transform(c.values.begin(), c.values.end(), values.begin(), [](const std::string& v) { return v.c_str(); });
            const hsize_t n = values.size();
            write_array(group.get(), c.name, type.get(), std::span(&n, 1), values.data(), no_unit, c.description);
        }
        for (const auto& d : table.documents) write_text_dataset(root, d.name, d.text, d.description);
    }
    file.close("close file");
}

void check_table(const TableRecord& table) {
    std::set<std::string> seen;
    std::optional<std::size_t> rows;
    const auto check_rows = [&](std::size_t n, const std::string& name) {
        if (rows && *rows != n)
            throw std::runtime_error("table column " + name + " has " + std::to_string(n) + " rows, others " +
                                        std::to_string(*rows));
        rows = n;
    };
    for (const auto& c : table.numbers) {
        check_name(c.name, "table", seen);
        check_rows(c.values.size(), c.name);
    }
    for (const auto& c : table.texts) {
        check_name(c.name, "table", seen);
        check_rows(c.values.size(), c.name);
        for (const auto& v : c.values) check_text(v, "table column " + c.name);
    }
    std::set<std::string> documents;
    for (const auto& d : table.documents) {
        check_name(d.name, "/", documents);
        check_text(d.text, d.name);
    }
}

// Checks the record before anything is created, then temporary name, sync, rename: the file is
// complete or absent.
template <class Record, class Check, class Writer>
void write_atomically(const std::filesystem::path& path, const Record& record, Check check_first, Writer writer) {
    // The process id keeps two runs writing into one folder from sharing a temporary name.
    const std::string temporary = path.string() + ".partial." + std::to_string(::getpid());
    const QuietErrors quiet;
    try {
        check_first(record);
        if (path.has_parent_path()) std::filesystem::create_directories(path.parent_path());
        writer(temporary, record);
        sync_file(temporary);
        if (std::rename(temporary.c_str(), path.c_str()) != 0)
            throw std::runtime_error(std::string("rename: ") + std::strerror(errno));
    } catch (const std::exception& e) {
        std::remove(temporary.c_str());
        throw std::runtime_error("cannot write " + path.string() + ": " + e.what());
    }
}

}  // namespace

void write_hdf5_table(const std::filesystem::path& path, const TableRecord& table) {
    write_atomically(path, table, check_table, write_table_file);
}

void write_hdf5_results(const std::filesystem::path& path, const RunRecord& record) {
    write_atomically(path, record, check_record, write_file);
}

}  // namespace heatbead::post
