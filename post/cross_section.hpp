// A cross-section of the weld measured the way a welder reads an etched macro, from the per-cell peak
// temperature: the fusion zone is where the peak reached the solidus, the HAZ reaches out to the Ac1 line.
//
// The field is known at cell centres. Between the centres of solid cells it is read by bilinear
// interpolation, so lines and crossings are found to a fraction of a cell. Where a lattice square has a
// void corner (at free surfaces and at the root gap) the solid corners alone are interpolated, their
// bilinear weights renormalised: along a free surface the value is then linear between the centres of
// the surface cells (constant over the outer half cell).
//
// Frame of one side (see mesh/joint.hpp): the root corner is (y_w, 0) with y_w = web_face(side); "out" is
// the direction side·(+y) away from the web, "into the web" is −side·y, "into the flange" is −z.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"

#include <array>
#include <cstddef>
#include <span>
#include <vector>

namespace heatbead::post {

struct Polyline {
    std::vector<std::array<double, 2>> points;  // (y, z) in m; closed loops repeat the first point at the end
};

// Isolines `field == level` of one slice (x index `slice`) of a per-cell field (one value per solid cell,
// index cells.index(i, s)). Marching squares on the lattice of cell centres, using only squares whose four
// corners are solid cells; a crossing on a lattice edge is linear between its two centres, and a saddle
// square is resolved by the mean of its corners. Segments sharing an edge crossing are chained into
// polylines: open ones end where the lattice ends (near a free surface), closed ones repeat their start.
// Throws std::invalid_argument if the field size is not cells.size() or the slice is out of range.
std::vector<Polyline> isolines(const mesh::Grid& grid, const mesh::SolidCells& cells, std::span<const double> field,
                               std::size_t slice, double level);

struct SectionLevels {
    double solidus, ac1, ac3;  // °C
};

// What is measured (all lengths in m, areas in m²):
//
// Fusion zone: the solid cells of the slice whose peak reached the solidus, connected through cell faces
// to a fused bead cell of this side. On a two-sided joint each side keeps to its half of the section
// (y beyond the web centre y0 on that side), so each side's figures stop at the web's centre plane.
//
// penetration_flange: how deep the fusion zone goes below the flange's top face (z = 0), measured straight
//   down (normal to the flange). Each column of cells is followed down from its lowest fusion-zone cell to
//   where the peak falls through the solidus (linear between centres, or the cell face at a void); the
//   deepest column counts, so the deepest point is found within O(h²/r) for a boundary of radius r.
//   At most t_f (burn-through). Negative: the fusion line stays that far above the flange top.
// penetration_web: the same beyond the web face y_w, into the web (normal to the web), along the rows of
//   web cells (centres above the web edge z = g; a zone widest right at the web edge is read at the
//   lowest row, half a cell up). Negative: the fusion line stays that far out in the bead;
//   0 when no fusion-zone cell lies in a web row at all (the zone stays below the web edge).
// fused_leg_flange / fused_leg_web: from the root corner along the flange top (z = 0, outward) and along
//   the web face (y = y_w, upward), the distance to the far end of the first fused stretch met — the
//   fused leg of the macro, which runs past the bead's toe when the plate melted beyond it. A point of
//   the surface is fused where the plate's own cells read at or above the solidus there, or where it lies
//   under the bead's true outline (mesh::inside_bead) and the bead's cells do: so a fused bead's leg is
//   its true leg, not its staircase of cells. 0 if no point of that surface fused. (With a root gap the
//   web line starts up the bead's side of the gap slot.)
// design_throat: root corner to the face, perpendicular to the chord between the toes, l_f·l_w/|d|
//   (|d| = chord length); a convex face's reinforcement does not count, a concave face's dip does
//   (common practice, no source).
// actual_throat: along the joint bisector through the root corner (45° between the plates), from the
//   deepest point of the fusion zone on it to the bead face: design-style throat plus the penetration
//   beyond the root along the bisector. If the root did not fuse, from the first fused point on the
//   bisector to the face (smaller than the geometric root-to-face distance); 0 if nothing on it fused.
// fused_area: area of the fusion zone within the joint's true outline (mesh::material_at);
//   deposited_area: its part in the bead, i.e. the weld metal that fused; melted_base_area: its part in
//   the flange and web; dilution = melted base / fused. A full fused cell whose eight neighbours are
//   fused counts whole; every other solid cell next to the zone counts its metal (the whole cell for a
//   plate cell, its fill φ for a weld cell the bead's face cuts: mesh/bead_fill.hpp) times the share of
//   its 8×8 sample points in that metal whose interpolated peak is at or above the solidus. Bead points
//   are read from the bead's own cells (the bead is weld metal right up to the plate), plate points from
//   all cells around them. A fully fused bead's deposited area is thus its own area.
// root_fused: the fusion zone holds both the point root_margin below the root corner (y_w, −m), into the
//   flange, and the point root_margin inside the web face on the web edge (y_w − side·m, g), into the web.
// lack_of_fusion_flange / _web: the penetration into that plate is ≤ 0.
// haz_width_flange / _web: at the column (row) of the deepest penetration, from the fusion line on to
//   where the peak falls through Ac1, along the same line (normal to the plate).
// fusion_line, ac1_line, ac3_line: isolines of the peak at solidus, Ac1 and Ac3 over the whole slice
//   (both beads on a two-sided joint).
// flange_mid, flange_toe, web_mid, web_toe: lines normal to a plate from its surface under the bead —
//   straight down from the flange top at l_f/2 and at l_f from the root, straight into the web from its
//   face at the middle of the web leg above the root gap, g + (l_w − g)/2, and at l_w — and where the
//   fusion line crosses each: fused when the interpolated peak at the surface point reached the solidus
//   (there the bead's and the plate's cells are read together, as the finite volumes see their common
//   face), then the depth to where it falls through it. They are the same lines on every grid, so what
//   is measured on them converges as the grid is refined; the station's probes lie on them.
//
// With no fused bead cell at the slice (the weld has not reached it) the fusion zone is empty: lengths
// and areas are 0 and both lack-of-fusion flags are set.
struct NormalLine {
    std::array<double, 2> surface{};  // (y, z) of the surface point, m
    std::array<double, 2> inward{};   // unit direction into the plate
    bool fused = false;               // the peak at the surface point reached the solidus
    double fusion_depth = 0;          // m from the surface along the line to the fusion line; 0 when not fused
};

struct CrossSection {
    double station = 0;
    std::size_t slice = 0;
    int side = 1;
    double penetration_flange = 0, penetration_web = 0;
    double fused_leg_flange = 0, fused_leg_web = 0;
    double design_throat = 0, actual_throat = 0;
    double fused_area = 0, deposited_area = 0, melted_base_area = 0, dilution = 0;
    bool root_fused = false;
    bool lack_of_fusion_flange = false, lack_of_fusion_web = false;
    double haz_width_flange = 0, haz_width_web = 0;
    std::vector<Polyline> fusion_line, ac1_line, ac3_line;
    NormalLine flange_mid, flange_toe, web_mid, web_toe;
};

// The cross-section at the slice containing x = station (a station on a face between slices belongs to
// the slice after it; x = L to the last one). `peak` holds one peak temperature per solid cell (°C).
// Throws std::invalid_argument for an invalid joint, a side other than ±1 (or −1 on a one-sided joint),
// a station outside [0, L], levels not ordered Ac1 ≤ Ac3 ≤ solidus, root_margin < 0 or a wrong field size.
CrossSection measure_cross_section(const mesh::JointGeometry& joint, const mesh::Grid& grid,
                                   const mesh::SolidCells& cells, std::span<const double> peak, double station,
                                   int side, const SectionLevels& levels, double root_margin = 0.3e-3);

// The same at stations x = 0, spacing, 2·spacing, ... up to L, to see start and stop effects.
// Throws std::invalid_argument for spacing <= 0 and as measure_cross_section.
std::vector<CrossSection> along_weld(const mesh::JointGeometry& joint, const mesh::Grid& grid,
                                     const mesh::SolidCells& cells, std::span<const double> peak, double spacing,
                                     int side, const SectionLevels& levels);

}  // namespace heatbead::post
