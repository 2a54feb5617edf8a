#include "mesh/grid.hpp"

#include <algorithm>
#include <stdexcept>
#include <string>

namespace heatbead::mesh {
namespace {

std::size_t count_tag_cells(const std::vector<Tag>& tags, bool (*wanted)(Tag)) {
    return static_cast<std::size_t>(std::count_if(tags.begin(), tags.end(), wanted));
}

std::vector<double> widths(const Axis& axis) {
    std::vector<double> w(axis.cells());
    for (std::size_t i = 0; i < w.size(); ++i) w[i] = axis.width(i);
    return w;
}

bool is_solid(Tag t) { return t != Tag::empty; }
bool is_weld(Tag t) { return t == Tag::weld; }

}  // namespace

std::size_t Axis::cells() const { return faces.size() - 1; }

double Axis::centre(std::size_t i) const { return (faces[i] + faces[i + 1]) / 2.0; }

double Axis::width(std::size_t i) const { return faces[i + 1] - faces[i]; }

double Axis::min_width() const {
    const std::vector<double> w = widths(*this);
    return *std::min_element(w.begin(), w.end());
}

double Axis::max_width() const {
    const std::vector<double> w = widths(*this);
    return *std::max_element(w.begin(), w.end());
}

double Axis::max_ratio() const {
    double ratio = 1.0;
    for (std::size_t i = 1; i < cells(); ++i) {
        const double r = width(i) / width(i - 1);
        ratio = std::max({ratio, r, 1.0 / r});
    }
    return ratio;
}

SectionBox section_bounds(const JointGeometry& joint) {
    const double half_width = joint.flange_width / 2.0;
    return {-half_width, half_width, -joint.flange_thickness, joint.root_gap + joint.web_height};
}

SectionBox refine_box(const JointGeometry& joint, double margin) {
    const SectionBox body = section_bounds(joint);
    const double bead_y_hi = joint.web_face(1) + joint.leg_flange;
    const double bead_y_lo = joint.sides == 2 ? joint.web_face(-1) - joint.leg_flange : joint.web_face(1);
    return {std::max(body.y_lo, bead_y_lo - margin), std::min(body.y_hi, bead_y_hi + margin),
            std::max(body.z_lo, -margin), std::min(body.z_hi, joint.leg_web + margin)};
}

Tag Grid::tag(std::size_t j, std::size_t k) const { return section_tags[j + y.cells() * k]; }

const CellFill& Grid::fill(std::size_t j, std::size_t k) const {
    static const CellFill full;
    const std::size_t position = j + y.cells() * k;
    const auto it = std::lower_bound(bead.begin(), bead.end(), position,
                                     [](const BeadCell& c, std::size_t p) { return c.position < p; });
    return it != bead.end() && it->position == position ? it->fill : full;
}

std::size_t Grid::cells() const { return x.cells() * y.cells() * z.cells(); }

std::size_t Grid::solid_cells() const { return x.cells() * count_tag_cells(section_tags, is_solid); }

std::size_t Grid::weld_cells() const { return x.cells() * count_tag_cells(section_tags, is_weld); }

Grid build_axes(const JointGeometry& joint, const GridSettings& settings) {
    validate(joint);
    if (!(settings.refine_margin >= 0.0)) throw std::invalid_argument("build_grid: refine margin must be >= 0");
    if (!(settings.along_weld > 0.0)) throw std::invalid_argument("build_grid: spacing along the weld must be > 0");

    const SectionBox body = section_bounds(joint);
    const SectionBox fine = refine_box(joint, settings.refine_margin);
    Grid grid;
    // Uniform along x: a graded axis whose finest and coarsest sizes coincide.
    const Spacing along{settings.along_weld, settings.along_weld, 1.0};
    grid.x.faces = graded_faces(0.0, joint.weld_length, 0.0, joint.weld_length, along, {});
    grid.y.faces = graded_faces(body.y_lo, body.y_hi, fine.y_lo, fine.y_hi, settings.cross_section,
                                {joint.web_face(-1), joint.web_face(1)});
    // graded_faces merges the breakpoints 0 and g when there is no root gap.
    grid.z.faces = graded_faces(body.z_lo, body.z_hi, fine.z_lo, fine.z_hi, settings.cross_section,
                                {0.0, joint.root_gap});
    return grid;
}

Grid build_grid(const JointGeometry& joint, const GridSettings& settings) {
    Grid grid = build_axes(joint, settings);
    const std::size_t ny = grid.y.cells();
    const std::size_t nz = grid.z.cells();
    if (ny * nz > max_section_cells)
        throw std::invalid_argument("build_grid: cross-section spacing too fine (" + std::to_string(ny) + " x " +
                                    std::to_string(nz) + " cells)");

    grid.bead = bead_cells(joint, grid.y.faces, grid.z.faces);
    grid.section_tags.reserve(ny * nz);
    for (std::size_t k = 0; k < nz; ++k) {
        for (std::size_t j = 0; j < ny; ++j) {
            const Tag at_centre = material_at(joint, grid.y.centre(j), grid.z.centre(k));
            grid.section_tags.push_back(at_centre == Tag::weld ? Tag::empty : at_centre);
        }
    }
    for (const BeadCell& c : grid.bead) grid.section_tags[c.position] = Tag::weld;
    return grid;
}

}  // namespace heatbead::mesh
