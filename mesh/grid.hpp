// The tagged rectilinear grid of a tee joint: uniform along the weld, graded across it.
#pragma once

#include <cstddef>
#include <vector>

#include "mesh/bead_fill.hpp"
#include "mesh/grading.hpp"
#include "mesh/joint.hpp"

namespace heatbead::mesh {

// One axis of the grid, given by its cell faces (strictly increasing, at least two).
struct Axis {
    std::vector<double> faces;

    std::size_t cells() const;
    double centre(std::size_t i) const;  // (f_i + f_{i+1})/2
    double width(std::size_t i) const;   // f_{i+1} - f_i
    double min_width() const;
    double max_width() const;
    double max_ratio() const;  // largest ratio of neighbouring widths, >= 1 (1 for a single cell)
};

struct GridSettings {
    Spacing cross_section;  // graded y and z spacing
    double refine_margin;   // the fine zone reaches this far beyond the bead(s) in y and z
    double along_weld;      // uniform x spacing (rounded so that whole cells fill the weld length)
};

// An axis-aligned rectangle of the cross-section.
struct SectionBox {
    double y_lo, y_hi, z_lo, z_hi;
};

// Bounding box of the joint's cross-section: y in [-W/2, W/2], z in [-t_f, g + H].
SectionBox section_bounds(const JointGeometry& joint);

// Bounding box of the bead(s), spanning both beads on a two-sided joint, grown by `margin` and clipped to
// section_bounds. The validated face never passes its toes, so the legs bound it.
SectionBox refine_box(const JointGeometry& joint, double margin);

struct Grid {
    Axis x, y, z;
    // Tags of one cross-section, the same at every x; cell (j, k) is at index j + ny·k.
    std::vector<Tag> section_tags;
    // The weld cells with how much of each the bead fills (mesh/bead_fill.hpp), in increasing position.
    std::vector<BeadCell> bead;

    Tag tag(std::size_t j, std::size_t k) const;
    // The metal of cell (j, k): its bead fill for a weld cell, full for any other.
    const CellFill& fill(std::size_t j, std::size_t k) const;
    std::size_t cells() const;        // nx·ny·nz
    std::size_t solid_cells() const;  // flange, web or weld, over all x
    std::size_t weld_cells() const;   // over all x
};

// Cross-section cells build_grid accepts (about 1000 × 1000), to keep meshing and solving fast.
inline constexpr std::size_t max_section_cells = 1'000'000;

// y faces hit ±W/2 and both web faces; z faces hit -t_f, 0, g and g + H, so plate surfaces are cell faces.
// Cells are fine (cross_section.finest) in refine_box(joint, refine_margin) and graded outside it. A plate
// cell is tagged with its plate; every cell the bead fills by at least min_fill is weld, with its fill
// (bead_cells: the bead's face cuts through cells); the rest is void.
// Throws std::invalid_argument for an invalid joint or settings, or a cross-section above max_section_cells.
Grid build_grid(const JointGeometry& joint, const GridSettings& settings);

// The axes of build_grid without the tags: cheap even for grids too large to tag, so sizes can be
// checked before any large allocation.
Grid build_axes(const JointGeometry& joint, const GridSettings& settings);

}  // namespace heatbead::mesh
