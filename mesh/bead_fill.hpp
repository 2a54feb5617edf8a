// How much of each cross-section cell the fillet bead fills: the cut cells of the bead.
//
// The bead's face cuts through the cells of the rectilinear grid. A cell the bead overlaps is weld metal
// over the share φ of its cross-section that lies in the bead, and each of its four faces bounds metal
// over the share of the face that lies in the bead. The solver scales the cell's heat capacity and birth
// enthalpy by φ and each face's conductance by its share (a cut-cell finite-volume method,
// solver/numerics/THEORY.md), so the weld metal's mass, its contact with the plates and its free face
// change continuously with the legs, not by whole cells.
//
// In its own frame (a = distance out from the web face, z = height above the flange top) a bead is
//     {(a, z): 0 <= a <= l_f, 0 <= z <= top(a)},
// where top falls from l_w at the web face to 0 at the flange toe. Every valid face does (mesh/joint.hpp,
// validate: it neither turns back over a toe nor dips below a plate), so each line a = const and z = const
// meets the bead in one interval from the plate. top is the face as a polyline: exact for a flat face; a
// convex or concave face F + u·d + s·4c·u(1 − u)·n is taken at face_segments + 1 even steps of u, which
// lies within c/face_segments² of the parabola. On it the area, the face shares and the length of the free
// face are exact.
#pragma once

#include "mesh/joint.hpp"

#include <array>
#include <cstddef>
#include <span>
#include <vector>

namespace heatbead::mesh {

// Segments of the polyline that stands for a convex or concave face (see above).
inline constexpr int face_segments = 64;

// Cells the bead fills by less than this share of their cross-section are left void: they hold
// almost no metal (a face grazing a cell corner), and dropping them loses at most this share of one
// cell along the bead's face.
inline constexpr double min_fill = 1e-6;

// Directions of a cell's neighbours in the cross-section.
enum SectionSide : int { minus_y = 0, plus_y = 1, minus_z = 2, plus_z = 3 };

// The metal of one cross-section cell. A plate cell is full (the defaults).
struct CellFill {
    double area = 1;                          // φ: share of the cell's cross-section that is metal
    std::array<double, 4> faces{1, 1, 1, 1};  // share of each face that bounds this metal (SectionSide order)
    double free_face = 0;                     // m: length of the bead's own face inside the cell
};

// A cell the bead overlaps: its section position j + ny·k and its fill.
struct BeadCell {
    std::size_t position;
    CellFill fill;
};

// Every cell of the cross-section grid with faces `y_faces` × `z_faces` (increasing) that a bead of the
// joint fills by at least min_fill, with its fill, in increasing position. Assumes a valid joint whose
// plate surfaces (flange top, web faces) are grid faces, as build_grid lays them.
std::vector<BeadCell> bead_cells(const JointGeometry& joint, std::span<const double> y_faces,
                                 std::span<const double> z_faces);

}  // namespace heatbead::mesh
