// Tests of mesh/: joint geometry, graded spacings and the tagged grid. Each check names its source:
// a hand computation or a textbook formula.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <functional>
#include <iterator>
#include <stdexcept>
#include <vector>

#include "mesh/bead_fill.hpp"
#include "mesh/grading.hpp"
#include "mesh/grid.hpp"
#include "mesh/joint.hpp"

using namespace heatbead::mesh;

namespace {

constexpr double mm = 1e-3;
constexpr double mm2 = mm * mm;
// Allowance for rounding in sums and ratios of doubles.
constexpr double rounding = 1e-9;

// Flange 100 × 10 mm, web 8 × 50 mm centred on the flange, 100 mm weld, 8 mm flange leg and 6 mm web leg.
JointGeometry sample_joint() {
    return {.flange_thickness = 10 * mm,
            .flange_width = 100 * mm,
            .web_thickness = 8 * mm,
            .web_height = 50 * mm,
            .weld_length = 100 * mm,
            .leg_flange = 8 * mm,
            .leg_web = 6 * mm};
}

JointGeometry with_face(JointGeometry joint, FaceShape face, double convexity) {
    joint.face = face;
    joint.convexity = convexity;
    return joint;
}

GridSettings settings_with_finest(double finest) {
    return {.cross_section = {.finest = finest, .coarsest = 4 * mm, .growth = 1.2},
            .refine_margin = 2 * mm,
            .along_weld = 5 * mm};
}

double cell_area(const Grid& grid, std::size_t j, std::size_t k) { return grid.y.width(j) * grid.z.width(k); }

// Cross-section area of the cells carrying `tag` and passing `where(y, z)` at their centre.
template <typename Where>
double tagged_area(const Grid& grid, Tag tag, Where where) {
    double area = 0.0;
    for (std::size_t k = 0; k < grid.z.cells(); ++k)
        for (std::size_t j = 0; j < grid.y.cells(); ++j)
            if (grid.tag(j, k) == tag && where(grid.y.centre(j), grid.z.centre(k))) area += cell_area(grid, j, k);
    return area;
}

double tagged_area(const Grid& grid, Tag tag) {
    return tagged_area(grid, tag, [](double, double) { return true; });
}

// Metal of the weld cells passing `where(y, z)` at their centre: Σ φ·Δy·Δz (mesh/bead_fill.hpp).
template <typename Where>
double bead_metal(const Grid& grid, Where where) {
    double area = 0.0;
    for (const BeadCell& c : grid.bead) {
        const std::size_t j = c.position % grid.y.cells(), k = c.position / grid.y.cells();
        if (where(grid.y.centre(j), grid.z.centre(k))) area += c.fill.area * cell_area(grid, j, k);
    }
    return area;
}

double bead_metal(const Grid& grid) {
    return bead_metal(grid, [](double, double) { return true; });
}

// The area the bead's polyline face encloses (mesh/bead_fill.hpp). Hand computation (Archimedes'
// quadrature of the parabola, by pieces): over a parameter step 1/N the parabola v = 4c·u(1 − u) lies
// (2/3)·c/N³ beyond its chord in (u, v), whose area element is |d|; N such pieces miss (2/3)·|d|·c/N².
// The polyline keeps the convex bead inside the parabola and the concave one outside it.
double polyline_fillet_area(const JointGeometry& joint) {
    const double chord = std::hypot(joint.leg_flange, joint.leg_web);
    const double missed = 2.0 / 3.0 * chord * joint.convexity / (face_segments * face_segments);
    return fillet_area(joint.leg_flange, joint.leg_web, joint.face, joint.convexity) - face_sign(joint.face) * missed;
}

bool contains(const std::vector<double>& faces, double value) {
    return std::find(faces.begin(), faces.end(), value) != faces.end();
}

struct GradingCase {
    double lo, hi, fine_lo, fine_hi;
    Spacing spacing;
    std::vector<double> must_hit;
};

}  // namespace

// ---------------------------------------------------------------------------------------------- joint

TEST_CASE("fillet_area matches hand values for flat, convex and concave faces", "[mesh]") {
    // Hand computation: triangle l_f·l_w/2 plus or minus a parabolic segment (2/3)·chord·height.
    CHECK(fillet_area(8 * mm, 8 * mm, FaceShape::flat, 0.0) == Approx(32 * mm2));
    // Chord sqrt(8² + 8²) = 11.3137 mm: 32 + (2/3)·11.3137·1 = 39.5425 mm².
    CHECK(fillet_area(8 * mm, 8 * mm, FaceShape::convex, 1 * mm) == Approx(39.5425 * mm2).epsilon(1e-5));
    // Chord sqrt(8² + 6²) = 10 mm: 24 - (2/3)·10·0.5 = 20.6667 mm².
    CHECK(fillet_area(8 * mm, 6 * mm, FaceShape::concave, 0.5 * mm) == Approx(20.66667 * mm2).epsilon(1e-6));
    // A flat face ignores the convexity value.
    CHECK(fillet_area(8 * mm, 6 * mm, FaceShape::flat, 1 * mm) == Approx(24 * mm2));
}

TEST_CASE("max_convexity keeps the face between the toes", "[mesh]") {
    // Hand computation of c_max = |d|·min(l_f/l_w, l_w/l_f)/4: 8 × 8 mm gives 11.3137/4 = 2.8284 mm,
    // 8 × 6 mm gives 10·0.75/4 = 1.875 mm.
    CHECK(max_convexity(8 * mm, 8 * mm) == Approx(2.828427 * mm).epsilon(1e-6));
    CHECK(max_convexity(8 * mm, 6 * mm) == Approx(1.875 * mm));
    CHECK(max_convexity(6 * mm, 8 * mm) == Approx(1.875 * mm));
}

TEST_CASE("inside_bead follows the chord and the parabolic face", "[mesh]") {
    JointGeometry joint = sample_joint();
    joint.leg_web = 8 * mm;
    // Hand computation: web face y_w = 4 mm, chord from (12, 0) to (4, 8) mm, midpoint (8, 4) mm, outward
    // normal (1, 1)/sqrt(2). Points 0.5 mm outside and inside the chord's midpoint along that normal:
    const double step = 0.5 * mm / std::sqrt(2.0);
    const double out_y = 8 * mm + step, out_z = 4 * mm + step;
    const double in_y = 8 * mm - step, in_z = 4 * mm - step;

    const JointGeometry flat = joint;
    const JointGeometry convex = with_face(joint, FaceShape::convex, 1 * mm);
    const JointGeometry concave = with_face(joint, FaceShape::concave, 1 * mm);
    CHECK_FALSE(inside_bead(flat, out_y, out_z));
    CHECK(inside_bead(convex, out_y, out_z));  // face bulges 1 mm > 0.5 mm out at the midpoint
    CHECK_FALSE(inside_bead(concave, out_y, out_z));
    CHECK(inside_bead(flat, in_y, in_z));
    CHECK(inside_bead(convex, in_y, in_z));
    CHECK_FALSE(inside_bead(concave, in_y, in_z));  // face sags 1 mm > 0.5 mm in at the midpoint

    // Hand computation: the convex face passes exactly c = 1 mm out of the chord's midpoint.
    const double normal = 1 * mm / std::sqrt(2.0);
    CHECK(inside_bead(convex, 8 * mm + 0.99 * normal, 4 * mm + 0.99 * normal));
    CHECK_FALSE(inside_bead(convex, 8 * mm + 1.01 * normal, 4 * mm + 1.01 * normal));

    // Hand computation for the flat face a/l_f + z/l_w <= 1 with a = y - y_w: near the toes and the root.
    CHECK(inside_bead(flat, (4 + 7.9) * mm, 0.05 * mm));   // 7.9/8 + 0.05/8 = 0.994
    CHECK_FALSE(inside_bead(flat, (4 + 7.9) * mm, 0.2 * mm));  // 7.9/8 + 0.2/8 = 1.0125
    CHECK(inside_bead(flat, 4.1 * mm, 7.8 * mm));          // 0.1/8 + 7.8/8 = 0.9875
    CHECK(inside_bead(flat, 4.1 * mm, 0.1 * mm));
    // Below the flange top, inside the web, or on the side without a bead: not bead.
    CHECK_FALSE(inside_bead(flat, 6 * mm, -0.1 * mm));
    CHECK_FALSE(inside_bead(flat, 3.9 * mm, 1 * mm));
    CHECK_FALSE(inside_bead(flat, -6 * mm, 1 * mm));
}

TEST_CASE("material_at tells flange, web, weld and void apart", "[mesh]") {
    const JointGeometry joint = sample_joint();
    // Hand computation from the sample joint's dimensions (web faces at y = ±4 mm, flange top z = 0).
    CHECK(material_at(joint, 40 * mm, -5 * mm) == Tag::flange);
    CHECK(material_at(joint, 0, 30 * mm) == Tag::web);
    CHECK(material_at(joint, 6 * mm, 1 * mm) == Tag::weld);
    CHECK(material_at(joint, 30 * mm, 1 * mm) == Tag::empty);   // above the flange, beyond the bead
    CHECK(material_at(joint, -6 * mm, 1 * mm) == Tag::empty);   // one-sided: nothing on side -1
    CHECK(material_at(joint, 0, 51 * mm) == Tag::empty);        // above the web
    CHECK(material_at(joint, 60 * mm, -5 * mm) == Tag::empty);  // beyond the flange edge
}

TEST_CASE("validate rejects inconsistent joints", "[mesh]") {
    const JointGeometry good = sample_joint();
    CHECK_NOTHROW(validate(good));

    JointGeometry joint = with_face(good, FaceShape::convex, 1.9 * mm);  // hand computation: c_max = 1.875 mm
    CHECK_THROWS_AS(validate(joint), std::invalid_argument);
    joint = with_face(good, FaceShape::concave, 1.8 * mm);
    CHECK_NOTHROW(validate(joint));

    joint = good;
    joint.web_offset = 40 * mm;  // bead reaches 40 + 4 + 8 = 52 mm > W/2 = 50 mm
    CHECK_THROWS_AS(validate(joint), std::invalid_argument);
    joint = good;
    joint.root_gap = 6 * mm;  // web leg 6 mm does not reach past the gap
    CHECK_THROWS_AS(validate(joint), std::invalid_argument);
    joint = good;
    joint.sides = 3;
    CHECK_THROWS_AS(validate(joint), std::invalid_argument);
    joint = good;
    joint.flange_thickness = 0;
    CHECK_THROWS_AS(validate(joint), std::invalid_argument);
    CHECK_THROWS_AS(good.web_face(0), std::invalid_argument);
}

// -------------------------------------------------------------------------------------------- grading

TEST_CASE("graded_faces: exact ends and breakpoints, monotone, bounded sizes and ratios", "[mesh]") {
    const GradingCase grading_case = GENERATE(
        // Fine zone across a web-like pair of breakpoints in the middle of a wide range.
        GradingCase{-50 * mm, 50 * mm, -6 * mm, 16 * mm, {0.1 * mm, 4 * mm, 1.2}, {-4 * mm, 4 * mm}},
        // Fine zone at one end, breakpoints inside and beyond it.
        GradingCase{0, 60 * mm, 0, 10 * mm, {0.1 * mm, 5 * mm, 1.1}, {10 * mm, 20 * mm}},
        // A single fine point, no breakpoints.
        GradingCase{0, 1, 0.5, 0.5, {0.01, 0.1, 1.15}, {}},
        // Breakpoints closer together than a cell, and one on an end.
        GradingCase{0, 1, 0.2, 0.3, {0.01, 0.1, 1.2}, {0.25, 0.2501, 0.7, 1.0}},
        // Fine interval outside the range: grading starts part way up.
        GradingCase{0, 1, -0.2, -0.1, {0.01, 0.2, 1.2}, {0.5}});
    const Spacing& spacing = grading_case.spacing;
    const std::vector<double> faces = graded_faces(grading_case.lo, grading_case.hi, grading_case.fine_lo,
                                                   grading_case.fine_hi, spacing, grading_case.must_hit);
    // The definition of the grid the function promises.
    CHECK(faces.front() == grading_case.lo);
    CHECK(faces.back() == grading_case.hi);
    CHECK(std::adjacent_find(faces.begin(), faces.end(), std::greater_equal<>()) == faces.end());
    for (const double p : grading_case.must_hit) CHECK(contains(faces, p));

    const Axis axis{faces};
    CHECK(axis.max_width() <= spacing.coarsest * (1 + rounding));
    // Across breakpoints too, not only between them.
    CHECK(axis.max_ratio() <= spacing.growth * (1 + rounding));
    for (std::size_t i = 0; i < axis.cells(); ++i)
        if (faces[i] >= grading_case.fine_lo && faces[i + 1] <= grading_case.fine_hi)
            CHECK(axis.width(i) <= spacing.finest * (1 + rounding));
}

TEST_CASE("graded grids keep every neighbour ratio within the growth asked, across plate faces too", "[mesh]") {
    // The definition of grid.growth (cases/README.md: the largest ratio between neighbouring cells),
    // checked on whole axes of tee joints, plate faces included: a 20 mm flange with a 15 mm web and
    // 8 mm legs (at 1 mm finest its flange cells once met the web face at a ratio of 1.219 for a
    // growth of 1.15), the sample joint, and both with a root gap that is no multiple of the finest
    // size, one and two sides.
    JointGeometry thick{.flange_thickness = 20 * mm,
                        .flange_width = 200 * mm,
                        .web_thickness = 15 * mm,
                        .web_height = 100 * mm,
                        .weld_length = 150 * mm,
                        .leg_flange = 8 * mm,
                        .leg_web = 8 * mm};
    JointGeometry gapped = sample_joint();
    gapped.root_gap = 0.3 * mm;
    JointGeometry two_sided = thick;
    two_sided.sides = 2;
    two_sided.root_gap = 1.3 * mm;
    for (const JointGeometry& joint : {thick, sample_joint(), gapped, two_sided}) {
        for (const double growth : {1.1, 1.15, 1.2}) {
            for (const double finest : {0.3 * mm, 0.5 * mm, 0.7 * mm, 1.0 * mm, 1.5 * mm, 2.5 * mm}) {
                const GridSettings settings{.cross_section = {.finest = finest, .coarsest = 8 * mm, .growth = growth},
                                            .refine_margin = 3 * mm,
                                            .along_weld = 2 * finest};
                const Grid grid = build_axes(joint, settings);
                INFO("flange " << joint.flange_thickness / mm << " mm, gap " << joint.root_gap / mm << " mm, sides "
                               << joint.sides << ", growth " << growth << ", finest " << finest / mm << " mm");
                CHECK(grid.y.max_ratio() <= growth * (1 + rounding));
                CHECK(grid.z.max_ratio() <= growth * (1 + rounding));
                CHECK(grid.y.max_width() <= settings.cross_section.coarsest * (1 + rounding));
                CHECK(grid.z.max_width() <= settings.cross_section.coarsest * (1 + rounding));
            }
        }
    }
}

TEST_CASE("graded_faces is uniform when finest equals coarsest", "[mesh]") {
    // Hand computation: 10 mm in 1 mm cells, breakpoints on whole millimetres.
    const std::vector<double> faces = graded_faces(0, 10 * mm, 2 * mm, 3 * mm, {1 * mm, 1 * mm, 1.2}, {4 * mm});
    REQUIRE(faces.size() == 11);
    for (std::size_t i = 0; i < faces.size(); ++i) CHECK(faces[i] == Approx(static_cast<double>(i) * mm));

    // Growth 1 keeps the finest size everywhere, whatever the coarsest.
    const std::vector<double> no_growth = graded_faces(0, 1, 0, 0, {0.1, 0.5, 1.0}, {});
    CHECK(no_growth.size() == 11);
    CHECK(Axis{no_growth}.max_ratio() == Approx(1.0));
}

TEST_CASE("graded_faces cell count follows the integral of 1/h", "[mesh]") {
    // Hand computation for h(s) = min(h0 + ln(r)·s, h1) on [0, 1] with h0 = 1 mm, h1 = 50 mm, r = 1.2:
    // h reaches h1 at D = (h1 - h0)/ln r = 0.26875 m; ∫ ds/h = ln(h1/h0)/ln r + (1 - D)/h1 = 21.457 + 14.625
    // = 36.08, so 37 cells.
    const double h0 = 1e-3, h1 = 0.05, r = 1.2;
    const double reach = (h1 - h0) / std::log(r);
    const double integral = std::log(h1 / h0) / std::log(r) + (1 - reach) / h1;
    REQUIRE(integral == Approx(36.08).epsilon(1e-3));
    const Axis axis{graded_faces(0, 1, 0, 0, {h0, h1, r}, {})};
    CHECK(axis.cells() == 37);
    // Every cell spans Δ = I/n of its local size: the first is h0·(r^Δ - 1)/ln r, the last h1·Δ.
    const double delta = integral / 37;
    CHECK(axis.width(0) == Approx(h0 * (std::pow(r, delta) - 1) / std::log(r)).epsilon(1e-9));
    CHECK(axis.width(axis.cells() - 1) == Approx(h1 * delta).epsilon(1e-9));
    // Neighbours in the growing part differ by exactly r^Δ (<= r).
    CHECK(axis.width(1) / axis.width(0) == Approx(std::pow(r, delta)).epsilon(1e-9));
}

TEST_CASE("graded_faces rejects bad arguments", "[mesh]") {
    const Spacing spacing{0.01, 0.1, 1.2};
    CHECK_THROWS_AS(graded_faces(1, 0, 0, 0, spacing, {}), std::invalid_argument);
    CHECK_THROWS_AS(graded_faces(0, 1, 0.6, 0.5, spacing, {}), std::invalid_argument);
    CHECK_THROWS_AS(graded_faces(0, 1, 0, 0, {0, 0.1, 1.2}, {}), std::invalid_argument);
    CHECK_THROWS_AS(graded_faces(0, 1, 0, 0, {0.1, 0.01, 1.2}, {}), std::invalid_argument);
    CHECK_THROWS_AS(graded_faces(0, 1, 0, 0, {0.01, 0.1, 0.9}, {}), std::invalid_argument);
    CHECK_THROWS_AS(graded_faces(0, 1, 0, 0, spacing, {1.5}), std::invalid_argument);
}

// ----------------------------------------------------------------------------------------------- grid

TEST_CASE("refine_box and section_bounds from the joint dimensions", "[mesh]") {
    JointGeometry joint = sample_joint();
    // Hand computation: bead y in [4, 12] mm, z in [0, 6] mm, grown by 2 mm.
    SectionBox box = refine_box(joint, 2 * mm);
    CHECK(box.y_lo == Approx(2 * mm));
    CHECK(box.y_hi == Approx(14 * mm));
    CHECK(box.z_lo == Approx(-2 * mm));
    CHECK(box.z_hi == Approx(8 * mm));
    joint.sides = 2;
    box = refine_box(joint, 2 * mm);
    CHECK(box.y_lo == Approx(-14 * mm));
    CHECK(box.y_hi == Approx(14 * mm));
    // A huge margin is clipped to the body, y in [-50, 50] mm, z in [-10, 50] mm.
    box = refine_box(joint, 1.0);
    const SectionBox body = section_bounds(joint);
    CHECK(box.y_lo == body.y_lo);
    CHECK(box.y_hi == body.y_hi);
    CHECK(box.z_lo == body.z_lo);
    CHECK(box.z_hi == body.z_hi);
    CHECK(body.y_lo == Approx(-50 * mm));
    CHECK(body.z_lo == Approx(-10 * mm));
    CHECK(body.z_hi == Approx(50 * mm));
}

TEST_CASE("build_grid: plates land on cell faces, so their tagged areas are exact", "[mesh]") {
    const JointGeometry joint = sample_joint();
    const Grid grid = build_grid(joint, settings_with_finest(0.25 * mm));
    // Hand computation: flange 10 × 100 mm = 1000 mm², web 8 × 50 mm = 400 mm².
    CHECK(tagged_area(grid, Tag::flange) == Approx(1000 * mm2).epsilon(1e-12));
    CHECK(tagged_area(grid, Tag::web) == Approx(400 * mm2).epsilon(1e-12));
    for (const double face : {-4 * mm, 4 * mm}) CHECK(contains(grid.y.faces, face));
    CHECK(contains(grid.z.faces, 0.0));
    CHECK(grid.y.faces.front() == -50 * mm);
    CHECK(grid.z.faces.back() == 50 * mm);
    // Fine spacing inside the refine box, coarse far from it.
    CHECK(grid.y.min_width() <= 0.25 * mm * (1 + rounding));
    CHECK(grid.y.max_width() > 2 * mm);
}

TEST_CASE("build_grid: uniform along the weld and consistent cell counts", "[mesh]") {
    const JointGeometry joint = sample_joint();
    GridSettings settings = settings_with_finest(0.5 * mm);
    settings.along_weld = 3 * mm;
    const Grid grid = build_grid(joint, settings);
    // Hand computation: 100 mm / 3 mm = 33.3, so 34 cells of 100/34 mm.
    REQUIRE(grid.x.cells() == 34);
    CHECK(grid.x.min_width() == Approx(100.0 / 34 * mm));
    CHECK(grid.x.max_width() == Approx(100.0 / 34 * mm));
    CHECK(grid.x.faces.back() == 100 * mm);

    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();
    REQUIRE(grid.section_tags.size() == ny * nz);
    CHECK(grid.cells() == 34 * ny * nz);
    const auto count = [&](Tag t) {
        return static_cast<std::size_t>(std::count(grid.section_tags.begin(), grid.section_tags.end(), t));
    };
    CHECK(grid.weld_cells() == 34 * count(Tag::weld));
    CHECK(grid.solid_cells() == 34 * (count(Tag::flange) + count(Tag::web) + count(Tag::weld)));
    CHECK(grid.weld_cells() > 0);
}

TEST_CASE("build_grid: the weld cells hold exactly the bead's area", "[mesh]") {
    const JointGeometry joint = GENERATE(with_face(sample_joint(), FaceShape::flat, 0),
                                         with_face(sample_joint(), FaceShape::convex, 1 * mm),
                                         with_face(sample_joint(), FaceShape::concave, 1 * mm));
    // Hand computation: the bead's face cuts cells, and each cut cell holds the share of the bead inside
    // it, so the sum is the bead's area on any grid: fillet_area for a flat face, and the polyline's area
    // (polyline_fillet_area, within 1e-4 of it here) for a curved one. A staircase of whole cells sampled
    // at their centres errs by about half the cells the face passes through.
    for (const double finest : {0.37 * mm, 0.2 * mm, 0.1 * mm}) {
        INFO("finest " << finest / mm << " mm");
        const Grid grid = build_grid(joint, settings_with_finest(finest));
        // Cells the face only grazes (filled below min_fill = 1e-6) are left void: 4e-9 mm² at 0.1 mm.
        CHECK(bead_metal(grid) == Approx(polyline_fillet_area(joint)).epsilon(1e-9));
        CHECK(polyline_fillet_area(joint) ==
              Approx(fillet_area(joint.leg_flange, joint.leg_web, joint.face, joint.convexity)).epsilon(1e-4));
        for (const BeadCell& c : grid.bead) {
            REQUIRE(grid.section_tags[c.position] == Tag::weld);
            REQUIRE(c.fill.area >= min_fill);
            REQUIRE(c.fill.area <= 1 + rounding);
        }
        CHECK(static_cast<std::size_t>(std::count(grid.section_tags.begin(), grid.section_tags.end(), Tag::weld)) ==
              grid.bead.size());
    }
}

TEST_CASE("build_grid: the weld cells touch the plates over the legs and show the bead's face", "[mesh]") {
    JointGeometry joint = GENERATE(with_face(sample_joint(), FaceShape::flat, 0),
                                   with_face(sample_joint(), FaceShape::convex, 1 * mm));
    joint.root_gap = 0.5 * mm;
    const Grid grid = build_grid(joint, settings_with_finest(0.37 * mm));
    const std::size_t ny = grid.y.cells();
    const double web_face = joint.web_face(1);
    double on_flange = 0, on_web = 0, face_length = 0;
    for (const BeadCell& c : grid.bead) {
        const std::size_t j = c.position % ny, k = c.position / ny;
        if (grid.z.faces[k] == 0.0) on_flange += c.fill.faces[minus_z] * grid.y.width(j);
        if (grid.y.faces[j] == web_face) on_web += c.fill.faces[minus_y] * grid.z.width(k);
        face_length += c.fill.free_face;
        // A face between two weld cells is the same face seen from both (the same share of it).
        if (j + 1 < ny && grid.tag(j + 1, k) == Tag::weld)
            CHECK(c.fill.faces[plus_y] == Approx(grid.fill(j + 1, k).faces[minus_y]).margin(rounding));
        if (grid.tag(j, k + 1) == Tag::weld)
            CHECK(c.fill.faces[plus_z] == Approx(grid.fill(j, k + 1).faces[minus_z]).margin(rounding));
    }
    // Hand computation: the bead lies on the flange from the root to its toe (l_f = 8 mm) and against the
    // web side from the flange up to its toe (l_w = 6 mm, the root gap's 0.5 mm included).
    CHECK(on_flange == Approx(8 * mm).epsilon(1e-12));
    CHECK(on_web == Approx(6 * mm).epsilon(1e-12));
    // The free face is the chord |d| = 10 mm for a flat face; for the convex one the parabola's length,
    // ∫ |P'(u)| du with P' = d + 4c(1 − 2u)·n, by the midpoint rule on 10⁵ steps (the polyline lies
    // within 1e-4 of it).
    double arc = 0;
    const double chord = std::hypot(joint.leg_flange, joint.leg_web), bulge = 4 * joint.convexity;
    for (int n = 0; n < 100000; ++n) arc += std::hypot(chord, bulge * (1 - 2 * (n + 0.5) / 100000)) / 100000;
    CHECK(face_length == Approx(joint.face == FaceShape::flat ? 10 * mm : arc).epsilon(1e-4));
}

TEST_CASE("bead_cells: the fill moves continuously with the legs", "[mesh]") {
    // Hand computation: growing both legs of a flat fillet by δ moves each toe by δ, so each point of the
    // face (a convex combination of the toes) moves by at most δ. The metal a cell gains is the band
    // between the two faces inside it, at most δ wide and no longer than the cell's diagonal, so no
    // share changes by more than δ·(Δy + Δz)/(Δy·Δz) <= 2δ/h_min; the total grows by
    // (l_f + δ)(l_w + δ)/2 − l_f·l_w/2.
    const JointGeometry before = sample_joint();
    JointGeometry after = before;
    const double delta = 1e-3 * mm;
    after.leg_flange += delta, after.leg_web += delta;
    const Grid grid = build_grid(before, settings_with_finest(0.37 * mm));
    const std::vector<BeadCell> grown = bead_cells(after, grid.y.faces, grid.z.faces);
    const auto metal = [&](const std::vector<BeadCell>& cells) {
        double area = 0;
        for (const BeadCell& c : cells)
            area += c.fill.area * cell_area(grid, c.position % grid.y.cells(), c.position / grid.y.cells());
        return area;
    };
    const auto share = [](const std::vector<BeadCell>& cells, std::size_t position) {
        const auto it = std::find_if(cells.begin(), cells.end(), [&](const BeadCell& c) { return c.position == position; });
        return it == cells.end() ? 0.0 : it->fill.area;
    };
    const double h = std::min(grid.y.min_width(), grid.z.min_width());
    double largest = 0;
    for (std::size_t position = 0; position < grid.section_tags.size(); ++position)
        largest = std::max(largest, std::abs(share(grown, position) - share(grid.bead, position)));
    CHECK(largest > 0);
    CHECK(largest <= 2 * delta / h);
    CHECK(metal(grown) - metal(grid.bead) == Approx((8 * mm + delta) * (6 * mm + delta) / 2 - 24 * mm2).epsilon(1e-6));
}

TEST_CASE("build_grid: a root gap leaves a void slot under the web", "[mesh]") {
    JointGeometry joint = sample_joint();
    joint.root_gap = 1 * mm;
    const Grid grid = build_grid(joint, settings_with_finest(0.1 * mm));
    CHECK(contains(grid.z.faces, 1 * mm));
    const auto under_web = [](double y, double z) { return std::abs(y) < 4 * mm && z > 0 && z < 1 * mm; };
    // Hand computation: the slot is t_w × g = 8 × 1 mm = 8 mm², all of it void; the web keeps its 400 mm²
    // and now ends at z = g + H = 51 mm.
    CHECK(tagged_area(grid, Tag::empty, under_web) == Approx(8 * mm2).epsilon(1e-12));
    CHECK(tagged_area(grid, Tag::web) == Approx(400 * mm2).epsilon(1e-12));
    CHECK(grid.z.faces.back() == Approx(51 * mm));
    // The bead still fills the corner beside the slot, from the flange top up.
    CHECK(material_at(joint, 4.05 * mm, 0.5 * mm) == Tag::weld);
    CHECK(material_at(joint, 3.95 * mm, 0.5 * mm) == Tag::empty);
}

TEST_CASE("build_grid: two sides give two beads mirrored about the web centre", "[mesh]") {
    JointGeometry joint = with_face(sample_joint(), FaceShape::convex, 1 * mm);
    joint.sides = 2;
    joint.web_offset = 3 * mm;
    // Hand computation: mirroring y -> 2·y0 - y maps the joint onto itself where the flange is wide enough
    // on both sides (|y - y0| < W/2 - y0 = 47 mm).
    for (double dy = -46 * mm; dy <= 46 * mm; dy += 0.37 * mm)
        for (double z = -9 * mm; z <= 49 * mm; z += 0.41 * mm)
            REQUIRE(material_at(joint, 3 * mm + dy, z) == material_at(joint, 3 * mm - dy, z));

    const Grid grid = build_grid(joint, settings_with_finest(0.1 * mm));
    const double each = fillet_area(joint.leg_flange, joint.leg_web, joint.face, joint.convexity);
    const auto right = [](double y, double) { return y > 3 * mm; };
    const auto left = [](double y, double) { return y < 3 * mm; };
    // Each side holds one bead's area (its polyline's, within 1e-4 of it).
    CHECK(bead_metal(grid, right) == Approx(polyline_fillet_area(joint)).epsilon(1e-10));
    CHECK(bead_metal(grid, left) == Approx(polyline_fillet_area(joint)).epsilon(1e-10));
    CHECK(polyline_fillet_area(joint) == Approx(each).epsilon(1e-4));
}

TEST_CASE("build_grid: a web offset shifts the web and the bead", "[mesh]") {
    const JointGeometry centred = sample_joint();
    JointGeometry shifted = centred;
    shifted.web_offset = 5 * mm;
    // Hand computation: every point of the centred joint's bead and web moves 5 mm in y.
    for (double y = -20 * mm; y <= 20 * mm; y += 0.29 * mm)
        for (double z = 0; z <= 12 * mm; z += 0.31 * mm)
            REQUIRE(material_at(shifted, y + 5 * mm, z) == material_at(centred, y, z));

    const Grid grid = build_grid(shifted, settings_with_finest(0.1 * mm));
    CHECK(contains(grid.y.faces, 1 * mm));
    CHECK(contains(grid.y.faces, 9 * mm));
    CHECK(tagged_area(grid, Tag::web) == Approx(400 * mm2).epsilon(1e-12));
    // The bead lies in y in [9, 17] mm: every weld cell overlaps that span.
    for (const BeadCell& c : grid.bead) {
        const std::size_t j = c.position % grid.y.cells();
        CHECK(grid.y.faces[j + 1] > 9 * mm);
        CHECK(grid.y.faces[j] < 17 * mm);
    }
    CHECK(bead_metal(grid) == Approx(24 * mm2).epsilon(1e-10));
}

TEST_CASE("build_grid refuses cross-sections that are too fine", "[mesh]") {
    CHECK_THROWS_AS(build_grid(sample_joint(), settings_with_finest(0.002 * mm)), std::invalid_argument);
    GridSettings settings = settings_with_finest(0.1 * mm);
    settings.along_weld = 0;
    CHECK_THROWS_AS(build_grid(sample_joint(), settings), std::invalid_argument);
}
