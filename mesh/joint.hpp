// Geometry of a fillet-welded tee joint: flange, web and one or two fillet beads. All lengths in metres.
//
// Axes: x along the weld, x in [0, L], plates as long as the weld; y across the flange; z up the web.
// Cross-section, side +1 bead shown (y to the right, z up; * marks the bead face):
//
//                 |      |                 web: y in [y0 - t_w/2, y0 + t_w/2], z in [g, g + H]
//                 |      * web toe (y_w, l_w)
//                 |      |  *
//                 +------+    *            the face runs toe to toe: flat, convex or concave
//                   void   bead *          root gap: void slot of height g under the web edge
//     -------------------+--------*------  flange top, z = 0
//                   root corner  flange toe (y_w + l_f, 0)
//                     (y_w, 0)
//     -----------------------------------  z = -t_f; flange: y in [-W/2, W/2]
//
// The bead of side +1 sits in the corner at the web face y_w = y0 + t_w/2 and grows toward +y; the bead of
// side -1 (two-sided joints) is its mirror at y_w = y0 - t_w/2 and grows toward -y. Legs are measured from
// the root corner (y_w, 0). The bead fills y beyond the web face, z >= 0, up to its face; the slot under
// the web edge (the root gap) is void.
#pragma once

#include <cstdint>

namespace heatbead::mesh {

enum class FaceShape { flat, convex, concave };

struct JointGeometry {
    double flange_thickness;  // t_f
    double flange_width;      // W, flange centred on y = 0
    double web_thickness;     // t_w
    double web_height;        // H, from the web edge up
    double web_offset = 0;    // y0, web centre
    double weld_length;       // L
    double root_gap = 0;      // g, between the flange top and the web edge
    double leg_flange;        // l_f, root corner to flange toe
    double leg_web;           // l_w, root corner to web toe (so l_w > g)
    double convexity = 0;     // c >= 0, largest offset of the face from the chord; ignored for a flat face
    FaceShape face = FaceShape::flat;
    int sides = 1;            // 1: bead on side +1 only; 2: beads on both sides of the web

    // y of the web face on `side` (+1 or -1): y0 ± t_w/2.
    double web_face(int side) const;
};

// s in A = l_f·l_w/2 + s·(2/3)·|d|·c: the face bulges outward (+1), inward (-1) or not at all (0).
double face_sign(FaceShape face);

// Largest convexity c for which the face neither turns back over a toe (convex) nor dips below a plate
// (concave). The face F + u·d + 4c·u(1-u)·n (chord d, unit normal n) has tangents at the toes that reach
// the plate surfaces when 4c·l_f/|d| = l_w or 4c·l_w/|d| = l_f, so c_max = |d|·min(l_f/l_w, l_w/l_f)/4
// with |d| = sqrt(l_f² + l_w²).
double max_convexity(double leg_flange, double leg_web);

// Throws std::invalid_argument naming the first inconsistency: a non-positive size, a bead that runs off
// the flange or past the top of the web, a web leg that does not bridge the root gap, a convexity above
// max_convexity, or sides other than 1 or 2.
void validate(const JointGeometry& joint);

// Cross-section area of one bead, A = l_f·l_w/2 + s·(2/3)·sqrt(l_f² + l_w²)·c with s = +1 convex,
// -1 concave, 0 flat: the triangle between the legs plus or minus a parabolic segment (2/3 chord × height).
double fillet_area(double leg_flange, double leg_web, FaceShape face, double convexity);

// One bead's cross-section on its own: its legs from the root corner, face shape and convexity (as in
// JointGeometry). A case keeps the fillet it asks for apart from the one it lays.
struct Fillet {
    double leg_flange = 0, leg_web = 0;
    FaceShape face = FaceShape::flat;
    double convexity = 0;
};
Fillet fillet_of(const JointGeometry& joint);
// The joint with `fillet` as its bead (on every side).
JointGeometry with_fillet(JointGeometry joint, const Fillet& fillet);
// fillet_area of the fillet's legs, face and convexity.
double fillet_area(const Fillet& fillet);
// Root corner to the face, perpendicular to the chord between the toes: l_f·l_w/|d|, less the dip of a
// concave face where that perpendicular meets the chord (at u = l_f²/|d|², 4c·u(1−u) inside it).
double design_throat(const Fillet& fillet);

// True where (y, z) lies in a bead of either side. Assumes a valid joint.
bool inside_bead(const JointGeometry& joint, double y, double z);

enum class Tag : std::uint8_t { empty, flange, web, weld };  // empty = void (air)

// Material at a cross-section point; points on a flange or web surface count as plate.
Tag material_at(const JointGeometry& joint, double y, double z);

}  // namespace heatbead::mesh
