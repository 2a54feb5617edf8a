// Tests of post/cross_section: macro measurements of synthetic peak-temperature fields whose fusion and
// Ac1 boundaries are circles of known radius, so every figure has a hand-computed value from plane
// geometry (circle, circular segment, chord distance). No solver run.
#include <catch2/catch.hpp>

#include <cmath>
#include <functional>
#include <numbers>
#include <stdexcept>
#include <vector>

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"
#include "post/cross_section.hpp"

using namespace heatbead;
using post::CrossSection;

namespace {

constexpr double mm = 1e-3;
constexpr double pi = std::numbers::pi;

// Solidus and Ac1/Ac3 of a plain carbon steel (common practice, no source).
const post::SectionLevels levels{.solidus = 1500, .ac1 = 725, .ac3 = 900};
constexpr double ambient = 20;
constexpr double spread = 4 * mm;  // R of the Gaussian field

// Flange 40 × 10 mm, web 8 × 20 mm centred (web faces y = ±4 mm), 6 mm weld, 6.1 mm legs, flat face.
// Legs that are not a whole number of cells keep the chord off the cell centres, so the tagged staircase
// bead has the area of the true one to well under 1 % (a chord through centres adds half a cell per step).
constexpr double leg = 6.1 * mm;
mesh::JointGeometry tee(int sides = 1) {
    return {.flange_thickness = 10 * mm,
            .flange_width = 40 * mm,
            .web_thickness = 8 * mm,
            .web_height = 20 * mm,
            .weld_length = 6 * mm,
            .leg_flange = leg,
            .leg_web = leg,
            .sides = sides};
}

struct Setup {
    mesh::JointGeometry joint;
    mesh::Grid grid;
    mesh::SolidCells cells;
};

// Fine cells of size h over the bead and 8 mm around it (so all circles below lie in the fine zone),
// three slices of 2 mm along the weld.
Setup setup(double h, mesh::JointGeometry joint = tee()) {
    const mesh::GridSettings settings{
        .cross_section = {.finest = h, .coarsest = 2 * mm, .growth = 1.2}, .refine_margin = 8 * mm, .along_weld = 2 * mm};
    mesh::Grid grid = mesh::build_grid(joint, settings);
    mesh::SolidCells cells = mesh::index_solid_cells(grid);
    return {joint, std::move(grid), std::move(cells)};
}

// T = T0 + A·exp(−r²/R²) about (yc, zc), with A chosen so that T = solidus at r = r_s.
struct Gaussian {
    double yc, zc, r_s;
    double operator()(double y, double z) const {
        const double r2 = (y - yc) * (y - yc) + (z - zc) * (z - zc);
        return ambient + (levels.solidus - ambient) * std::exp((r_s * r_s - r2) / (spread * spread));
    }
};

// Radius where that field falls to `level`: r² = r_s² + R²·ln((T_s − T0)/(level − T0)).
double radius_at(double r_s, double level) {
    return std::sqrt(r_s * r_s + spread * spread * std::log((levels.solidus - ambient) / (level - ambient)));
}

// One peak value per solid cell; field(i, y, z) may differ from slice to slice.
std::vector<double> peak_field(const Setup& s, const std::function<double(std::size_t, double, double)>& field) {
    std::vector<double> peak(s.cells.size());
    for (std::size_t i = 0; i < s.cells.nx; ++i)
        for (std::size_t c = 0; c < s.cells.ns; ++c)
            peak[s.cells.index(i, c)] = field(i, s.grid.y.centre(s.cells.j[c]), s.grid.z.centre(s.cells.k[c]));
    return peak;
}

std::vector<double> peak_field(const Setup& s, const Gaussian& g) {
    return peak_field(s, [&](std::size_t, double y, double z) { return g(y, z); });
}

CrossSection measure(const Setup& s, const std::vector<double>& peak, int side = 1) {
    return post::measure_cross_section(s.joint, s.grid, s.cells, peak, 3 * mm, side, levels);
}

// Distance from the root corner to the chord of equal legs l: l·l/(sqrt(2)·l) = l/sqrt(2).
const double throat = leg / std::sqrt(2.0);

// Area enclosed by a closed polyline (shoelace formula).
double enclosed_area(const post::Polyline& line) {
    double twice = 0;
    for (std::size_t n = 0; n + 1 < line.points.size(); ++n)
        twice += line.points[n][0] * line.points[n + 1][1] - line.points[n + 1][0] * line.points[n][1];
    return std::abs(twice) / 2;
}

}  // namespace

TEST_CASE("a circle at the root inside the bead: penetrations, legs, throats, areas, HAZ", "[section]") {
    const double h = 0.2 * mm, r_s = 3 * mm;
    const Setup s = setup(h);
    const double yw = s.joint.web_face(1);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{yw, 0, r_s}));

    CHECK(cs.slice == 1);  // x = 3 mm lies in the second 2 mm slice
    // The fusion boundary is the circle r = r_s about the root corner: it reaches r_s straight down into
    // the flange, r_s across into the web, and meets both plate surfaces r_s from the root.
    CHECK(cs.penetration_flange == Approx(r_s).margin(0.05 * h));
    CHECK(cs.penetration_web == Approx(r_s).margin(0.05 * h));
    CHECK(cs.fused_leg_flange == Approx(r_s).margin(0.05 * h));
    CHECK(cs.fused_leg_web == Approx(r_s).margin(0.05 * h));
    CHECK_FALSE(cs.lack_of_fusion_flange);
    CHECK_FALSE(cs.lack_of_fusion_web);
    CHECK(cs.root_fused);
    // Flat face: root to chord l_f·l_w/sqrt(l_f² + l_w²); along the bisector the circle adds r_s behind the root.
    CHECK(cs.design_throat == Approx(throat).epsilon(1e-12));
    CHECK(cs.actual_throat == Approx(throat + r_s).margin(0.05 * h));
    // r_s < throat: the whole disc lies in metal (no root gap), a quarter of it in the bead.
    CHECK(cs.fused_area == Approx(pi * r_s * r_s).epsilon(0.005));
    CHECK(cs.deposited_area == Approx(pi * r_s * r_s / 4).epsilon(0.01));
    CHECK(cs.melted_base_area == Approx(0.75 * pi * r_s * r_s).epsilon(0.005));
    CHECK(cs.dilution == Approx(0.75).margin(0.005));
    // The Ac1 line is the circle of radius_at(r_s, Ac1).
    const double haz = radius_at(r_s, levels.ac1) - r_s;
    CHECK(cs.haz_width_flange == Approx(haz).margin(0.05 * h));
    CHECK(cs.haz_width_web == Approx(haz).margin(0.05 * h));
}

TEST_CASE("isolines of a radial field lie on their circles and close around them", "[section]") {
    // r_s = 1.5 mm puts the Ac1 circle at 3.76 mm, clear of the bead face (throat 4.31 mm) by over two
    // cells, so every lattice square along the three circles is solid.
    const double h = 0.2 * mm, r_s = 1.5 * mm;
    const Setup s = setup(h);
    const double yw = s.joint.web_face(1);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{yw, 0, r_s}));
    REQUIRE(radius_at(r_s, levels.ac1) < throat - 2 * h);
    const struct {
        const std::vector<post::Polyline>& lines;
        double radius;
    } cases[] = {{cs.fusion_line, r_s},
                 {cs.ac3_line, radius_at(r_s, levels.ac3)},
                 {cs.ac1_line, radius_at(r_s, levels.ac1)}};
    for (const auto& c : cases) {
        REQUIRE(c.lines.size() == 1);
        const post::Polyline& line = c.lines.front();
        // The circle lies in metal all round (r < throat, r < t_w, r < t_f): one closed loop.
        CHECK(line.points.front() == line.points.back());
        for (const auto& p : line.points) CHECK(std::hypot(p[0] - yw, p[1]) == Approx(c.radius).margin(0.02 * h));
        // The polygon's vertices lie on the lattice edges about a cell apart, slightly inside the circle
        // (linear reading of a field curving down): it encloses a little less than pi·r².
        CHECK(enclosed_area(line) == Approx(pi * c.radius * c.radius).epsilon(0.01));
        CHECK(enclosed_area(line) < pi * c.radius * c.radius);
    }
}

TEST_CASE("a fusion zone beyond the bead face: circular segment cut off by the chord", "[section]") {
    const double h = 0.2 * mm, r_s = 5 * mm;
    const Setup s = setup(h);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{s.joint.web_face(1), 0, r_s}));
    // throat < r_s < legs: the disc loses the segment beyond the chord, at distance d = throat from the
    // centre: r²·acos(d/r) − d·sqrt(r² − d²) (the chord's cut lies between the toes: sqrt(r² − d²) < throat).
    const double d = throat;
    const double segment = r_s * r_s * std::acos(d / r_s) - d * std::sqrt(r_s * r_s - d * d);
    const double deposited = pi * r_s * r_s / 4 - segment, base = 0.75 * pi * r_s * r_s;
    CHECK(cs.deposited_area == Approx(deposited).epsilon(0.01));
    CHECK(cs.melted_base_area == Approx(base).epsilon(0.005));
    CHECK(cs.dilution == Approx(base / (base + deposited)).margin(0.005));
    CHECK(cs.fused_leg_flange == Approx(r_s).margin(0.05 * h));
    CHECK(cs.fused_leg_web == Approx(r_s).margin(0.05 * h));
}

TEST_CASE("plate melted past the toes: the fused legs run beyond the bead legs", "[section]") {
    const double h = 0.2 * mm, r_s = 7 * mm;  // legs 6.1 mm < r_s < t_w = 8 mm < t_f = 10 mm
    const Setup s = setup(h);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{s.joint.web_face(1), 0, r_s}));
    CHECK(cs.fused_leg_flange == Approx(r_s).margin(0.05 * h));
    CHECK(cs.fused_leg_web == Approx(r_s).margin(0.05 * h));
    CHECK(cs.penetration_flange == Approx(r_s).margin(0.05 * h));
    CHECK(cs.penetration_web == Approx(r_s).margin(0.05 * h));
    // The whole bead (farthest point: a toe, 6.1 mm < r_s) and a half disc of flange plus a quarter disc
    // of web. The whole bead fused, so the deposited area is the bead's own, the triangle l²/2 (plane
    // geometry), measured on its true outline: not its staircase of cells, which is l²/2 only to first
    // order in h (tested in test_mesh; here 1.7 % small as the fine cells do not end on the legs).
    const double bead = leg * leg / 2, base = 0.75 * pi * r_s * r_s;
    CHECK(cs.deposited_area == Approx(bead).epsilon(0.002));
    CHECK(cs.melted_base_area == Approx(base).epsilon(0.005));
    CHECK(cs.dilution == Approx(base / (base + bead)).margin(0.005));
}

TEST_CASE("root fusion needs the zone to reach root_margin into both plates", "[section]") {
    const Setup s = setup(0.2 * mm);
    const double yw = s.joint.web_face(1);
    // Points 0.3 mm below and 0.3 mm inside the web face: fused for r_s = 0.5 mm, not for r_s = 0.2 mm.
    CHECK_FALSE(measure(s, peak_field(s, Gaussian{yw, 0, 0.2 * mm})).root_fused);
    CHECK(measure(s, peak_field(s, Gaussian{yw, 0, 0.5 * mm})).root_fused);
}

TEST_CASE("a fusion zone clear of both plates: negative penetration, lack of fusion", "[section]") {
    const double h = 0.2 * mm, r_s = 1 * mm;
    const Setup s = setup(h);
    // Centre 2 mm out and 2 mm up from the root: the circle stays 1 mm clear of each plate and of the face
    // (distance of the centre from the chord a + z = 6.1 mm is 2.1/sqrt(2) = 1.48 mm > r_s).
    const CrossSection cs = measure(s, peak_field(s, Gaussian{s.joint.web_face(1) + 2 * mm, 2 * mm, r_s}));
    CHECK(cs.penetration_flange == Approx(-1 * mm).margin(0.05 * h));
    CHECK(cs.penetration_web == Approx(-1 * mm).margin(0.05 * h));
    CHECK(cs.lack_of_fusion_flange);
    CHECK(cs.lack_of_fusion_web);
    CHECK_FALSE(cs.root_fused);
    CHECK(cs.fused_leg_flange == 0);
    CHECK(cs.fused_leg_web == 0);
    // On the bisector the circle starts 2·sqrt(2) − 1 mm from the root; the face is throat away.
    CHECK(cs.actual_throat == Approx(throat - (2 * std::sqrt(2.0) - 1) * mm).margin(0.05 * h));
    // A boundary only five cells in radius: the bilinear reading of the curved field falls inside it by
    // O(h²), about 1 % of the area here (at r_s = 3 mm the same reading is within 0.5 %, case above).
    CHECK(cs.fused_area == Approx(pi * r_s * r_s).epsilon(0.02));
    CHECK(cs.melted_base_area == 0);
    CHECK(cs.dilution == 0);
}

TEST_CASE("a field centred deeper in the flange penetrates the flange more than the web", "[section]") {
    const double h = 0.2 * mm, r_s = 3 * mm;
    const Setup s = setup(h);
    const double yw = s.joint.web_face(1);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{yw + 0.5 * mm, -1 * mm, r_s}));
    // Flange: 1 mm (centre depth) + r_s. Web: the circle is widest inside the web at its edge z = 0,
    // sqrt(r_s² − 1²) − 0.5 mm; the lowest row of web centres (z = h/2) sees it within slope·h/2 ≈ 0.018 mm.
    CHECK(cs.penetration_flange == Approx(4 * mm).margin(0.05 * h));
    CHECK(cs.penetration_web == Approx(std::sqrt(8.0) * mm - 0.5 * mm).margin(0.25 * h));
    CHECK(cs.penetration_flange > cs.penetration_web);
}

TEST_CASE("the measured penetration converges as the cells shrink", "[section]") {
    const double r_s = 2.5 * mm;
    double previous = 1;
    for (double h : {0.4 * mm, 0.2 * mm, 0.1 * mm}) {
        const Setup s = setup(h);
        // Off the lattice: centre between columns and between rows.
        const Gaussian g{s.joint.web_face(1) + 0.37 * mm, -0.61 * mm, r_s};
        const CrossSection cs = measure(s, peak_field(s, g));
        const double error = std::abs(cs.penetration_flange - (0.61 * mm + r_s));
        CHECK(error < 0.05 * h);
        CHECK(error < previous);
        previous = error;
    }
}

TEST_CASE("along the weld: one section per station, start effect visible", "[section]") {
    const Setup s = setup(0.2 * mm);
    const double yw = s.joint.web_face(1);
    // Slices 0, 1, 2 (x in [0,2], [2,4], [4,6] mm) fuse to r_s = 2, 2.5, 3 mm.
    const auto radius = [](std::size_t i) { return (2 + 0.5 * static_cast<double>(i)) * mm; };
    const std::vector<double> peak =
        peak_field(s, [&](std::size_t i, double y, double z) { return Gaussian{yw, 0, radius(i)}(y, z); });
    const auto sections = post::along_weld(s.joint, s.grid, s.cells, peak, 2 * mm, 1, levels);
    // Stations 0, 2, 4, 6 mm: a station on a face belongs to the slice after it, L to the last slice.
    REQUIRE(sections.size() == 4);
    const std::size_t expected_slice[] = {0, 1, 2, 2};
    for (std::size_t n = 0; n < 4; ++n) {
        CHECK(sections[n].station == Approx(2.0 * mm * static_cast<double>(n)));
        CHECK(sections[n].slice == expected_slice[n]);
        CHECK(sections[n].penetration_flange == Approx(radius(expected_slice[n])).margin(0.01 * mm));
    }
    CHECK_THROWS_AS(post::along_weld(s.joint, s.grid, s.cells, peak, 0, 1, levels), std::invalid_argument);
}

TEST_CASE("two-sided joint: each side is measured on its half, mirrored", "[section]") {
    const double h = 0.2 * mm;
    const Setup s = setup(h, tee(2));
    const double plus = s.joint.web_face(1), minus = s.joint.web_face(-1);
    for (double r_s : {3 * mm, 5 * mm}) {
        const Gaussian a{plus, 0, r_s}, b{minus, 0, r_s};
        const std::vector<double> peak =
            peak_field(s, [&](std::size_t, double y, double z) { return std::max(a(y, z), b(y, z)); });
        const CrossSection right = measure(s, peak, 1), left = measure(s, peak, -1);
        CHECK(left.penetration_flange == Approx(right.penetration_flange).margin(1e-9));
        CHECK(left.penetration_web == Approx(right.penetration_web).margin(1e-9));
        CHECK(left.fused_area == Approx(right.fused_area).epsilon(1e-6));
        CHECK(left.actual_throat == Approx(right.actual_throat).margin(1e-9));
        // 3 mm: the zones stay apart (2 mm of unfused web between them). 5 mm: they meet inside the 8 mm
        // web and each side's zone stops at the web's centre plane, t_w/2 in.
        const double web = r_s < 4 * mm ? r_s : 4 * mm;
        CHECK(right.penetration_web == Approx(web).margin(0.05 * h));
    }
}

TEST_CASE("concave face: the design throat loses the face's dip", "[section]") {
    mesh::JointGeometry joint = tee();
    joint.face = mesh::FaceShape::concave;
    joint.convexity = 0.5 * mm;
    const double h = 0.2 * mm, r_s = 2 * mm;
    const Setup s = setup(h, joint);
    const CrossSection cs = measure(s, peak_field(s, Gaussian{joint.web_face(1), 0, r_s}));
    // Equal legs: the perpendicular from the root meets the chord at its middle, where the parabolic face
    // lies c = 4c·(1/2)(1/2) inside it; the bisector is that perpendicular.
    CHECK(cs.design_throat == Approx(throat - 0.5 * mm).epsilon(1e-9));
    CHECK(cs.actual_throat == Approx(throat - 0.5 * mm + r_s).margin(0.05 * h));
}

TEST_CASE("cross-section input checks", "[section]") {
    const Setup s = setup(0.4 * mm);
    const std::vector<double> peak = peak_field(s, Gaussian{s.joint.web_face(1), 0, 2 * mm});
    using post::measure_cross_section;
    CHECK_THROWS_AS(measure_cross_section(s.joint, s.grid, s.cells, peak, 3 * mm, -1, levels), std::invalid_argument);
    CHECK_THROWS_AS(measure_cross_section(s.joint, s.grid, s.cells, peak, 7 * mm, 1, levels), std::invalid_argument);
    const std::vector<double> short_field(peak.begin(), peak.end() - 1);
    CHECK_THROWS_AS(measure_cross_section(s.joint, s.grid, s.cells, short_field, 3 * mm, 1, levels),
                    std::invalid_argument);
    CHECK_THROWS_AS(post::isolines(s.grid, s.cells, peak, 3, levels.solidus), std::invalid_argument);
    // Nothing fused: empty zone, lack of fusion on both plates.
    const std::vector<double> cold(peak.size(), ambient);
    const CrossSection cs = measure_cross_section(s.joint, s.grid, s.cells, cold, 3 * mm, 1, levels);
    CHECK(cs.fused_area == 0);
    CHECK(cs.lack_of_fusion_flange);
    CHECK(cs.lack_of_fusion_web);
    CHECK(cs.fusion_line.empty());
}

TEST_CASE("a bead that melted without melting the plates shows its own legs", "[section]") {
    // Only the weld metal is above the solidus: a gauge reads the bead's legs (hand geometry: the
    // meshed bead reaches the toe to within a cell), and there is no penetration into either plate.
    const double h = 0.2 * mm;
    const Setup s = setup(h);
    std::vector<double> peak(s.cells.size(), ambient);
    for (std::size_t i = 0; i < s.cells.nx; ++i) {
        for (std::size_t c = 0; c < s.cells.ns; ++c) {
            if (s.cells.tag[c] == mesh::Tag::weld) peak[s.cells.index(i, c)] = levels.solidus + 100;
        }
    }
    const auto cs = post::measure_cross_section(s.joint, s.grid, s.cells, peak, 3 * mm, 1, levels);
    CHECK(cs.fused_leg_flange == Approx(leg).margin(h));
    CHECK(cs.fused_leg_web == Approx(leg).margin(h));
    CHECK(cs.lack_of_fusion_flange);
    CHECK(cs.lack_of_fusion_web);
    CHECK_FALSE(cs.root_fused);
}
