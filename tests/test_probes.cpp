// How probes read a field between cell centres (mesh/interpolation.hpp), on fields known in closed
// form set on a tee grid. Source of every check: linear interpolation along each axis reproduces a
// field linear in each coordinate exactly (exact, a property of the rule), so trilinear reading of
// T = a + b·x + c·y + d·z gives T itself to round-off wherever all eight surrounding cells are solid.
// Beside a free surface the rule the header states (renormalised over the solid cells) is worked out
// by hand beside each check. No solver run.
#include "mesh/grid.hpp"
#include "mesh/interpolation.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"
#include "post/section_history.hpp"

#include <catch2/catch.hpp>

#include <array>
#include <cmath>
#include <vector>

using namespace heatbead;

namespace {

constexpr double mm = 1e-3;

// A small tee, invented for the test: 10 mm flange 40 mm wide, 8 mm web 20 mm high, 6.1 mm legs, on a
// graded grid (0.5 mm fine cells growing to 2 mm) with 1 mm slices along a 6 mm weld.
struct Tee {
    mesh::JointGeometry joint{.flange_thickness = 10 * mm,
                              .flange_width = 40 * mm,
                              .web_thickness = 8 * mm,
                              .web_height = 20 * mm,
                              .weld_length = 6 * mm,
                              .leg_flange = 6.1 * mm,
                              .leg_web = 6.1 * mm};
    mesh::Grid grid = mesh::build_grid(
        joint, {.cross_section = {.finest = 0.5 * mm, .coarsest = 2 * mm, .growth = 1.2}, .refine_margin = 3 * mm,
                .along_weld = 1 * mm});
    mesh::SolidCells cells = mesh::index_solid_cells(grid);
};

// The linear field, °C with x, y, z in m.
double linear(double x, double y, double z) { return 300 + 2e4 * x - 3e4 * y + 5e4 * z; }

// The linear field at every solid cell centre.
std::vector<double> linear_field(const Tee& t) {
    std::vector<double> T(t.cells.size());
    for (std::size_t i = 0; i < t.cells.nx; ++i)
        for (std::size_t s = 0; s < t.cells.ns; ++s)
            T[t.cells.index(i, s)] =
                linear(t.grid.x.centre(i), t.grid.y.centre(t.cells.j[s]), t.grid.z.centre(t.cells.k[s]));
    return T;
}

double read(const Tee& t, const std::vector<double>& T, const std::array<double, 3>& p) {
    const auto corners = mesh::grid_corners(t.grid, t.cells, p);
    const auto value = mesh::interpolate(corners, [](const mesh::Corner&) { return true; },
                                         [&](const mesh::Corner& c) { return T[t.cells.index(c.i, c.s)]; });
    REQUIRE(value);
    return *value;
}

}  // namespace

TEST_CASE("a probe reads a linear field to round-off wherever its eight cells are solid", "[probes]") {
    const Tee t;
    const std::vector<double> T = linear_field(t);
    // Points off every cell centre, in the flange under the bead, in the web, across the graded cells
    // and between slices.
    const std::vector<std::array<double, 3>> points{{2.3 * mm, 6.7 * mm, -1.37 * mm},  {3.9 * mm, 9.1 * mm, -4.2 * mm},
                                                    {1.2 * mm, -12.6 * mm, -7.7 * mm}, {4.4 * mm, 1.1 * mm, 5.3 * mm},
                                                    {2.5 * mm, -2.9 * mm, 14.9 * mm},  {3.0 * mm, 0.3 * mm, -0.2 * mm}};
    for (const auto& p : points) {
        const auto corners = mesh::grid_corners(t.grid, t.cells, p);
        double weights = 0;
        for (const auto& c : corners) {
            REQUIRE(c.s != mesh::no_neighbour);
            weights += c.weight;
        }
        CHECK(weights == Approx(1).epsilon(1e-14));
        INFO("at (" << p[0] / mm << ", " << p[1] / mm << ", " << p[2] / mm << ") mm");
        CHECK(read(t, T, p) == Approx(linear(p[0], p[1], p[2])).epsilon(1e-13));
    }
}

TEST_CASE("beside a free surface a probe reads the surface cells: linear along them, constant across", "[probes]") {
    const Tee t;
    const std::vector<double> T = linear_field(t);
    // Below the flange's lowest centres (the outer half cell at z = −t_f) there is no centre beyond: the
    // value is that of the point moved onto the lowest centre line, by hand T(x, y, z_c).
    const double z_bottom = t.grid.z.centre(0);
    const std::array<double, 3> low{2.3 * mm, 6.7 * mm, -t.joint.flange_thickness + 0.1 * mm};
    REQUIRE(low[2] < z_bottom);
    CHECK(read(t, T, low) == Approx(linear(low[0], low[1], z_bottom)).epsilon(1e-13));
    // In the web just inside its face y_w = 4 mm, above the bead: the cells beyond the face are air, so
    // the value is the web's outer column's, by hand T(x, y_c, z) with y_c that column's centre.
    const double yw = t.joint.web_face(1);
    const std::array<double, 3> by_face{3.3 * mm, yw - 0.1 * mm, 9.3 * mm};
    const mesh::Bracket by = mesh::bracket(t.grid.y, by_face[1]);
    REQUIRE(t.grid.y.centre(by.hi) > yw);  // the centre beyond is in the air
    CHECK(read(t, T, by_face) == Approx(linear(by_face[0], t.grid.y.centre(by.lo), by_face[2])).epsilon(1e-13));
}

TEST_CASE("the station's cycles read the slice between centres and skip weld metal not yet laid", "[probes]") {
    const Tee t;
    const std::vector<double> T = linear_field(t);
    const std::size_t slice = 3;
    post::SectionHistory station(t.cells, slice, 20);
    station.record(1.0, T);
    // A point in the flange, off the centres: bilinear in (y, z) on the slice reproduces the field at the
    // slice's x (exact, as above).
    const double x = t.grid.x.centre(slice), y = 6.7 * mm, z = -1.37 * mm;
    const std::vector<double> cycle = station.cycle_at(t.grid, y, z);
    REQUIRE(cycle.size() == 2);
    CHECK(cycle[0] == 20);
    CHECK(cycle[1] == Approx(linear(x, y, z)).epsilon(1e-6));  // values are kept as float
    // Just above the flange top under the bead, the upper corners are weld cells. Before they are laid
    // the flange cells alone are read (by hand: constant upward from their centre line, T(x, y, z_c));
    // once laid, all four (the linear field again).
    const double z_above = 0.1 * mm;
    const mesh::Bracket bz = mesh::bracket(t.grid.z, z_above);
    const std::uint32_t weld = t.cells.at(mesh::bracket(t.grid.y, y).lo, bz.hi, t.grid.y.cells());
    REQUIRE(t.cells.tag[weld] == mesh::Tag::weld);
    CHECK(station.cycle_at(t.grid, y, z_above)[1] == Approx(linear(x, y, t.grid.z.centre(bz.lo))).epsilon(1e-6));
    for (std::uint32_t s = 0; s < t.cells.ns; ++s)
        if (t.cells.tag[s] == mesh::Tag::weld) station.appear(t.cells.index(slice, s), 1.5);
    station.record(2.0, T);
    const std::vector<double> later = station.cycle_at(t.grid, y, z_above);
    CHECK(later[1] == Approx(linear(x, y, t.grid.z.centre(bz.lo))).epsilon(1e-6));  // before they were laid
    CHECK(later[2] == Approx(linear(x, y, z_above)).epsilon(1e-6));
    // A point in the air has no cycle.
    CHECK(station.cycle_at(t.grid, 15 * mm, 15 * mm).empty());
}
