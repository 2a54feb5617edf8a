// Tests of solver/heat_source: the torch path on a tee joint and the Goldak double ellipsoid. Each check
// names its source: the published formula (Goldak, Chakravarti & Bibby, Metall. Trans. B 15B (1984)
// 299), its analytic integrals, or hand geometry.
#include <catch2/catch.hpp>

#include <cmath>
#include <cstdint>
#include <numbers>
#include <stdexcept>
#include <vector>

#include "mesh/grading.hpp"
#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"
#include "solver/physics/heat_source.hpp"

using namespace heatbead;

namespace {

constexpr double mm = 1e-3;
constexpr double deg = std::numbers::pi / 180.0;
// Allowance for rounding in geometry computed in doubles (lengths of about 1e-2 m).
constexpr double rounding = 1e-12;

// A source for hand checks of Goldak, Chakravarti & Bibby (1984): Q = 2000 W, a = 5, b = 4,
// c_f = 4, c_r = 10 mm.
constexpr double power = 2000.0;
SourceShape check_shape() {
    SourceShape s;
    s.half_width = 5 * mm;
    s.depth = 4 * mm;
    s.front_length = 4 * mm;
    s.rear_length = 10 * mm;
    return s;
}
// By hand from Goldak et al. (1984): f_f = 2c_f/(c_f + c_r) = 8/14, f_r = 2 − f_f = 20/14.
constexpr double f_front = 0.5714, f_rear = 1.4286;

// Flange 60 × 10 mm, web 8 × 30 mm, 40 mm weld, equal 6 mm legs.
mesh::JointGeometry sample_joint() {
    return {.flange_thickness = 10 * mm,
            .flange_width = 60 * mm,
            .web_thickness = 8 * mm,
            .web_height = 30 * mm,
            .weld_length = 40 * mm,
            .leg_flange = 6 * mm,
            .leg_web = 6 * mm};
}

mesh::GridSettings sample_settings() {
    return {.cross_section = {.finest = 1 * mm, .coarsest = 4 * mm, .growth = 1.2},
            .refine_margin = 2 * mm,
            .along_weld = 1 * mm};
}

// A torch path with a hand-made frame, at rest at `at` from t = 0 to t = 1 s.
TorchPath still_path(Vec3 at, Vec3 length, Vec3 width, Vec3 depth) {
    return {.start = at, .speed = 0.0, .on_time = 0.0, .off_time = 1.0, .length = length, .width = width,
            .depth = depth};
}

// A solid block [lo, hi] of uniform cells of about size h, all flange.
mesh::Grid block(Vec3 lo, Vec3 hi, double h) {
    const mesh::Spacing uniform{h, h, 1.0};
    mesh::Grid grid;
    grid.x.faces = mesh::graded_faces(lo[0], hi[0], lo[0], hi[0], uniform, {});
    grid.y.faces = mesh::graded_faces(lo[1], hi[1], lo[1], hi[1], uniform, {});
    grid.z.faces = mesh::graded_faces(lo[2], hi[2], lo[2], hi[2], uniform, {});
    grid.section_tags.assign(grid.y.cells() * grid.z.cells(), mesh::Tag::flange);
    return grid;
}

std::vector<std::uint8_t> all_active(const mesh::SolidCells& cells) {
    return std::vector<std::uint8_t>(cells.size(), 1);
}

double total(const std::vector<CellPower>& out) {
    double sum = 0.0;
    for (const CellPower& c : out) sum += c.watts;
    return sum;
}

// Raw integral of the source over every cell of `grid` at t = 0.
double raw_integral(const DoubleEllipsoid& source, const mesh::Grid& grid) {
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const std::vector<std::uint8_t> active = all_active(cells);
    std::vector<CellPower> out;
    return source.deposit(grid, cells, active, 0.0, out);
}

Vec3 add(const Vec3& p, double s, const Vec3& d) { return {p[0] + s * d[0], p[1] + s * d[1], p[2] + s * d[2]}; }
double dot(const Vec3& a, const Vec3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

// A tilted frame (work angle 40°, push 15°) for the block tests: any orientation integrates alike.
TorchPath tilted_path_at(Vec3 at) {
    TorchPath path = torch_path(sample_joint(), 1, 40 * deg, 15 * deg, 5 * mm, 0.0);
    path.start = at;
    return path;
}

}  // namespace

TEST_CASE("peak density and decay along the semi-axes follow Goldak's formula", "[source]") {
    const Vec3 o{0.0, 0.0, 0.0};
    const DoubleEllipsoid source(still_path(o, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}), check_shape(), power);
    // By hand from Goldak, Chakravarti & Bibby (1984), the front-quadrant density at its centre:
    // q_max = 6√3·f_f·Q/(a·b·c_f·π^1.5) = 10.392·0.5714·2000/(80e-9 m³·5.5683) = 2.666e10 W/m³.
    CHECK(source.density(o, 0.5) == Approx(2.666e10).epsilon(2e-4));
    // Continuity at ξ = 0 (f_f/c_f = f_r/c_r, Goldak 1984): the same peak from both sides.
    CHECK(source.density({-1e-12, 0, 0}, 0.5) == Approx(source.density({1e-12, 0, 0}, 0.5)).epsilon(1e-9));
    // One semi-axis out along each axis the exponent is -3 (the formula).
    const double peak = source.density(o, 0.5);
    const double e3 = std::exp(-3.0);
    CHECK(source.density({4 * mm, 0, 0}, 0.5) == Approx(peak * e3).epsilon(1e-12));
    CHECK(source.density({-10 * mm, 0, 0}, 0.5) == Approx(peak * e3).epsilon(1e-12));
    CHECK(source.density({0, 5 * mm, 0}, 0.5) == Approx(peak * e3).epsilon(1e-12));
    CHECK(source.density({0, 0, -4 * mm}, 0.5) == Approx(peak * e3).epsilon(1e-12));
}

TEST_CASE("the arc is off before its start and after its end", "[source]") {
    const mesh::JointGeometry joint = sample_joint();
    const TorchPath path = torch_path(joint, 1, 45 * deg, 0.0, 5 * mm, 2.0);
    // Hand computation: the arc burns for L/v = 40 mm / 5 mm/s = 8 s from t = 2 s.
    CHECK(path.off_time == Approx(10.0));
    // Origin moves with the travel speed: x = v·(t − t_on).
    CHECK(path.origin(6.0)[0] == Approx(20 * mm));
    const DoubleEllipsoid source(path, check_shape(), power);
    const mesh::Grid grid = mesh::build_grid(joint, sample_settings());
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const std::vector<std::uint8_t> active = all_active(cells);
    std::vector<CellPower> out{{0, 1.0}};
    for (double t : {1.9, 10.1}) {
        CHECK(source.density(source.origin(t), t) == 0.0);
        CHECK(source.deposit(grid, cells, active, t, out) == 0.0);
        CHECK(out.empty());
    }
}

TEST_CASE("the raw integral over all space is twice the net power", "[source]") {
    // Derived from Goldak 1984: the density is normalised to Q over the half-space ζ >= 0, and it is
    // even in ζ, so it integrates to 2Q over all space, whatever the frame's orientation.
    const DoubleEllipsoid source(tilted_path_at({0.3 * mm, 0.7 * mm, -0.2 * mm}), check_shape(), power);
    const Vec3 lo{-30 * mm, -30 * mm, -30 * mm}, hi{30 * mm, 30 * mm, 30 * mm};
    // Coarse: spacing = the smallest semi-axis (4 mm).
    CHECK(raw_integral(source, block(lo, hi, 4 * mm)) == Approx(2 * power).epsilon(0.01));
    // Fine: 1 mm.
    CHECK(raw_integral(source, block(lo, hi, 1 * mm)) == Approx(2 * power).epsilon(0.001));
}

TEST_CASE("over a half-space the raw integral is the net power, split f_f/2 : f_r/2", "[source]") {
    // Ellipsoid centred on the top face z = 0 of a block, depth axis down, ξ = 0 on an x face.
    const DoubleEllipsoid source(still_path({0, 0, 0}, {1, 0, 0}, {0, -1, 0}, {0, 0, -1}), check_shape(), power);
    const mesh::Grid grid = block({-32 * mm, -16 * mm, -12 * mm}, {16 * mm, 16 * mm, 0.0}, 4 * mm);
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const std::vector<std::uint8_t> active = all_active(cells);
    std::vector<CellPower> out;
    // Goldak 1984 normalisation: ∫_{ζ>=0} q dV = Q.
    CHECK(source.deposit(grid, cells, active, 0.0, out) == Approx(power).epsilon(0.01));
    double front = 0.0;
    for (const CellPower& c : out)
        if (grid.x.centre(c.cell / cells.ns) > 0.0) front += c.watts;
    // Derived from Goldak et al. (1984): the front half carries f_f·Q/2 of the half-space's Q, the
    // rear f_r·Q/2.
    CHECK(front / power == Approx(f_front / 2).epsilon(0.01));
    CHECK((power - front) / power == Approx(f_rear / 2).epsilon(0.01));
}

TEST_CASE("renormalised cell powers sum to the net power on a tee joint", "[source]") {
    const mesh::JointGeometry joint = sample_joint();
    const mesh::Grid grid = mesh::build_grid(joint, sample_settings());
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const std::vector<std::uint8_t> active = all_active(cells);
    const DoubleEllipsoid source(torch_path(joint, 1, 45 * deg, 0.0, 5 * mm, 0.0), check_shape(), power);
    std::vector<CellPower> out;
    // At the plate start x = 0, mid-weld and the plate end x = L: the ellipsoid straddles the root corner,
    // the bead face, the plate surfaces near the toes, and the plate ends.
    const double start = source.deposit(grid, cells, active, 0.0, out);
    CHECK(total(out) == Approx(power).epsilon(1e-12));
    const double middle = source.deposit(grid, cells, active, 4.0, out);
    CHECK(total(out) == Approx(power).epsilon(1e-12));
    std::size_t outside = 0;
    for (const CellPower& c : out) outside += c.cell < cells.size() ? 0 : 1;
    CHECK(outside == 0);
    const double end = source.deposit(grid, cells, active, 8.0, out);
    CHECK(total(out) == Approx(power).epsilon(1e-12));
    // The outer half (ζ < 0) lies mostly in air above the bead face: the raw integral stays below 2Q.
    CHECK(middle > 0.0);
    CHECK(middle < 2 * power);
    // Derived: with no travel angle ξ = x − x_arc, so the section integral factors out and a plate end
    // cuts off the rear (at x = 0) or the front (at x = L): c_f/(c_f + c_r) and c_r/(c_f + c_r) remain.
    CHECK(start / middle == Approx(f_front / 2).epsilon(0.01));
    CHECK(end / middle == Approx(f_rear / 2).epsilon(0.01));
}

TEST_CASE("inactive cells get no power and the rest still carry the net power", "[source]") {
    const mesh::JointGeometry joint = sample_joint();
    const mesh::Grid grid = mesh::build_grid(joint, sample_settings());
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    std::vector<std::uint8_t> active = all_active(cells);
    const DoubleEllipsoid source(torch_path(joint, 1, 45 * deg, 0.0, 5 * mm, 0.0), check_shape(), power);
    const double t = 4.0;
    std::vector<CellPower> out;
    const double all_metal = source.deposit(grid, cells, active, t, out);
    // Weld metal ahead of the arc is not there yet.
    for (std::size_t i = 0; i < cells.nx; ++i)
        for (std::size_t s = 0; s < cells.ns; ++s)
            if (cells.tag[s] == mesh::Tag::weld && grid.x.centre(i) > source.origin(t)[0])
                active[cells.index(i, s)] = 0;
    const double partial = source.deposit(grid, cells, active, t, out);
    CHECK(partial < all_metal);
    CHECK(total(out) == Approx(power).epsilon(1e-12));
    std::size_t powered_inactive = 0;
    for (const CellPower& c : out) powered_inactive += active[c.cell] == 0 ? 1 : 0;
    CHECK(powered_inactive == 0);
}

TEST_CASE("the origin is where the torch axis meets the bead face", "[source]") {
    using mesh::FaceShape;
    mesh::JointGeometry joint = sample_joint();
    joint.leg_flange = 8 * mm;
    const double lf = joint.leg_flange, lw = joint.leg_web, chord = std::hypot(lf, lw);
    const double y_w = joint.web_face(1);
    for (FaceShape face : {FaceShape::flat, FaceShape::convex, FaceShape::concave}) {
        joint.face = face;
        joint.convexity = face == FaceShape::flat ? 0.0 : 0.6 * mesh::max_convexity(lf, lw);
        const double s = face == FaceShape::convex ? 1.0 : face == FaceShape::concave ? -1.0 : 0.0;
        for (double work : {30 * deg, 45 * deg, 60 * deg}) {
            const TorchPath path = torch_path(joint, 1, work, 0.0, 5 * mm, 0.0);
            const double a = path.start[1] - y_w, z = path.start[2];
            // Hand geometry: the origin lies on the work-angle ray from the root corner (y_w, 0).
            CHECK(std::atan2(z, a) == Approx(work).epsilon(1e-12));
            // On the face of mesh/joint.hpp: P = F + u·d + v·n with v = s·4c·u(1 − u), 0 <= u <= 1.
            const double u = (-lf * (a - lf) + lw * z) / (chord * chord);
            const double v = (lw * (a - lf) + lf * z) / chord;
            CHECK(u > 0.0);
            CHECK(u < 1.0);
            CHECK(v == Approx(s * 4 * joint.convexity * u * (1 - u)).margin(rounding));
            // Consistent with the mesh's bead: 1 µm toward the root is weld metal, 1 µm out is not.
            const double step = 1e-6;
            CHECK(mesh::inside_bead(joint, path.start[1] - step * std::cos(work), z - step * std::sin(work)));
            CHECK_FALSE(mesh::inside_bead(joint, path.start[1] + step * std::cos(work), z + step * std::sin(work)));
            // Hand geometry, flat face: the ray r(cos θ, sin θ) meets the chord a/l_f + z/l_w = 1 at
            // r = 1/(cos θ/l_f + sin θ/l_w).
            if (face == FaceShape::flat)
                CHECK(std::hypot(a, z) == Approx(1.0 / (std::cos(work) / lf + std::sin(work) / lw)).epsilon(1e-12));
        }
    }
}

TEST_CASE("equal legs at 45 degrees: the origin sits on the bisector at l/sqrt2 (+/- convexity)", "[source]") {
    using mesh::FaceShape;
    mesh::JointGeometry joint = sample_joint();
    const double l = joint.leg_flange, c = 1 * mm;
    // Hand geometry: the bisector meets the chord at its midpoint (l/2, l/2), at l/√2 from the root, where
    // the parabolic offset 4c·u(1 − u) is largest (c) and points along the bisector.
    const std::vector<std::pair<FaceShape, double>> faces{
        {FaceShape::flat, l / std::sqrt(2.0)}, {FaceShape::convex, l / std::sqrt(2.0) + c},
        {FaceShape::concave, l / std::sqrt(2.0) - c}};
    for (const auto& [face, distance] : faces) {
        joint.face = face;
        joint.convexity = face == FaceShape::flat ? 0.0 : c;
        const TorchPath path = torch_path(joint, 1, 45 * deg, 0.0, 5 * mm, 0.0);
        CHECK(path.start[1] - joint.web_face(1) == Approx(distance / std::sqrt(2.0)).epsilon(1e-12));
        CHECK(path.start[2] == Approx(distance / std::sqrt(2.0)).epsilon(1e-12));
    }
}

TEST_CASE("the travel angle tilts the depth axis out of the cross-section", "[source]") {
    const mesh::JointGeometry joint = sample_joint();
    const double work = 40 * deg;
    const TorchPath level = torch_path(joint, 1, work, 0.0, 5 * mm, 0.0);
    for (double travel : {15 * deg, -10 * deg}) {
        const TorchPath path = torch_path(joint, 1, work, travel, 5 * mm, 0.0);
        const Vec3& d = path.depth;
        // Hand geometry: the angle between the depth axis and the section plane x = const is τ, leaning
        // forward (+x) for push, backward for drag; its section projection keeps the work angle.
        CHECK(std::asin(d[0]) == Approx(travel).epsilon(1e-12));
        CHECK(std::atan2(-d[2], -d[1]) == Approx(work).epsilon(1e-12));
        // Orthonormal, right-handed frame; the length axis is the travel direction made orthogonal to ζ.
        CHECK(dot(d, d) == Approx(1.0).epsilon(rounding));
        CHECK(dot(path.length, path.length) == Approx(1.0).epsilon(rounding));
        CHECK(dot(path.width, path.width) == Approx(1.0).epsilon(rounding));
        CHECK(dot(path.length, d) == Approx(0.0).margin(rounding));
        CHECK(dot(path.width, d) == Approx(0.0).margin(rounding));
        CHECK(dot(path.width, path.length) == Approx(0.0).margin(rounding));
        const Vec3 l_cross_w{path.length[1] * path.width[2] - path.length[2] * path.width[1],
                             path.length[2] * path.width[0] - path.length[0] * path.width[2],
                             path.length[0] * path.width[1] - path.length[1] * path.width[0]};
        CHECK(dot(l_cross_w, d) == Approx(1.0).epsilon(rounding));
        CHECK(path.length[0] == Approx(std::cos(travel)).epsilon(1e-12));
        // The face is the same in every section: the origin's (y, z) does not move.
        CHECK(path.start[1] == Approx(level.start[1]).epsilon(1e-12));
        CHECK(path.start[2] == Approx(level.start[2]).epsilon(1e-12));
        // The density follows the tilted frame: one front length along the length axis gives e^-3.
        const DoubleEllipsoid source(path, check_shape(), power);
        const double peak = source.density(path.start, 0.0);
        CHECK(source.density(add(path.start, 4 * mm, path.length), 0.0) == Approx(peak * std::exp(-3.0)).epsilon(1e-9));
        CHECK(source.density(add(path.start, -4 * mm, path.depth), 0.0) == Approx(peak * std::exp(-3.0)).epsilon(1e-9));
    }
}

TEST_CASE("side -1 is the mirror image of side +1 about the web centre", "[source]") {
    mesh::JointGeometry joint = sample_joint();
    joint.sides = 2;
    joint.web_offset = 3 * mm;
    joint.flange_width = 80 * mm;
    const TorchPath plus = torch_path(joint, 1, 35 * deg, 12 * deg, 5 * mm, 0.0);
    const TorchPath minus = torch_path(joint, -1, 35 * deg, 12 * deg, 5 * mm, 0.0);
    // Hand geometry: y → 2·y0 − y for points, d_y → −d_y for directions.
    const double y0 = joint.web_offset;
    CHECK(minus.start[1] == Approx(2 * y0 - plus.start[1]).epsilon(1e-12));
    CHECK(minus.start[2] == Approx(plus.start[2]).epsilon(1e-12));
    CHECK(minus.depth[0] == Approx(plus.depth[0]).epsilon(1e-12));
    CHECK(minus.depth[1] == Approx(-plus.depth[1]).epsilon(1e-12));
    CHECK(minus.depth[2] == Approx(plus.depth[2]).epsilon(1e-12));
    const DoubleEllipsoid source_plus(plus, check_shape(), power), source_minus(minus, check_shape(), power);
    const std::vector<Vec3> offsets{{1 * mm, 2 * mm, -1 * mm}, {-3 * mm, -1 * mm, 2 * mm}, {0, 3 * mm, 1 * mm}};
    for (const Vec3& offset : offsets) {
        const Vec3 p = add(plus.start, 1.0, offset);
        const Vec3 mirrored{p[0], 2 * y0 - p[1], p[2]};
        CHECK(source_minus.density(mirrored, 1.0) == Approx(source_plus.density(p, 1.0)).epsilon(1e-12));
    }
    // On the joint's grid side -1 carries the net power too, centred on its own side of the web.
    const mesh::Grid grid = mesh::build_grid(joint, sample_settings());
    const mesh::SolidCells cells = mesh::index_solid_cells(grid);
    const std::vector<std::uint8_t> active = all_active(cells);
    std::vector<CellPower> out;
    source_minus.deposit(grid, cells, active, 2.0, out);
    CHECK(total(out) == Approx(power).epsilon(1e-12));
    double moment = 0.0;
    for (const CellPower& c : out) moment += c.watts * grid.y.centre(cells.j[c.cell % cells.ns]);
    CHECK(moment / power < y0);
}

TEST_CASE("invalid torch paths and sources are rejected", "[source]") {
    const mesh::JointGeometry joint = sample_joint();
    CHECK_THROWS_AS(torch_path(joint, -1, 45 * deg, 0.0, 5 * mm, 0.0), std::invalid_argument);  // one-sided
    CHECK_THROWS_AS(torch_path(joint, 1, 0.0, 0.0, 5 * mm, 0.0), std::invalid_argument);
    CHECK_THROWS_AS(torch_path(joint, 1, 90 * deg, 0.0, 5 * mm, 0.0), std::invalid_argument);
    CHECK_THROWS_AS(torch_path(joint, 1, 45 * deg, 90 * deg, 5 * mm, 0.0), std::invalid_argument);
    CHECK_THROWS_AS(torch_path(joint, 1, 45 * deg, 0.0, 0.0, 0.0), std::invalid_argument);
    const TorchPath path = torch_path(joint, 1, 45 * deg, 0.0, 5 * mm, 0.0);
    SourceShape flat = check_shape();
    flat.depth = 0.0;
    CHECK_THROWS_AS(DoubleEllipsoid(path, flat, power), std::invalid_argument);
    CHECK_THROWS_AS(DoubleEllipsoid(path, check_shape(), 0.0), std::invalid_argument);
}

TEST_CASE("the origin can sit at the root corner, where the arc is aimed", "[source]") {
    // Hand geometry: the root corner of side +1 is (web face, 0); the depth axis is unchanged.
    const auto joint = sample_joint();
    const TorchPath face = torch_path(joint, 1, std::numbers::pi / 4, 0, 5e-3, 0);
    const TorchPath root = torch_path(joint, 1, std::numbers::pi / 4, 0, 5e-3, 0, SourceOrigin::root);
    CHECK(root.start[1] == Approx(joint.web_face(1)));
    CHECK(root.start[2] == Approx(0).margin(1e-15));
    for (int i = 0; i < 3; ++i) CHECK(root.depth[i] == Approx(face.depth[i]));
}
