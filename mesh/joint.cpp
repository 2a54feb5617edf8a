#include "mesh/joint.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

namespace heatbead::mesh {

double face_sign(FaceShape face) {
    switch (face) {
        case FaceShape::convex: return 1.0;
        case FaceShape::concave: return -1.0;
        case FaceShape::flat: break;
    }
    return 0.0;
}

namespace {

bool within(double v, double lo, double hi) { return v >= lo && v <= hi; }

void require(bool ok, const std::string& what) {
    if (!ok) throw std::invalid_argument("joint geometry: " + what);
}

// One bead in its own frame: a = distance out from the web face, z = height above the flange top.
// From the flange toe F = (l_f, 0) the chord runs along d = (-l_f, l_w) to the web toe, with unit outward
// normal n = (l_w, l_f)/|d|. A point P = F + u·d + v·n lies in the bead when it is in the quadrant a, z >= 0,
// within the chord's span 0 <= u <= 1 and under the face, v <= s·4c·u(1 - u). The triangle between the
// legs lies within that span because its angles at both toes are acute.
bool inside_own_bead(const JointGeometry& joint, double a, double z) {
    if (a < 0.0 || z < 0.0) return false;
    const double lf = joint.leg_flange;
    const double lw = joint.leg_web;
    const double chord = std::hypot(lf, lw);
    const double from_toe = a - lf;
    const double u = (-lf * from_toe + lw * z) / (chord * chord);
    if (u < 0.0 || u > 1.0) return false;
    const double v = (lw * from_toe + lf * z) / chord;
    return v <= face_sign(joint.face) * 4.0 * joint.convexity * u * (1.0 - u);
}

}  // namespace

double JointGeometry::web_face(int side) const {
    if (side != 1 && side != -1) throw std::invalid_argument("web_face: side must be +1 or -1");
    return web_offset + side * web_thickness / 2.0;
}

double max_convexity(double leg_flange, double leg_web) {
    const double chord = std::hypot(leg_flange, leg_web);
    return chord * std::min(leg_flange / leg_web, leg_web / leg_flange) / 4.0;
}

void validate(const JointGeometry& joint) {
    require(joint.flange_thickness > 0.0, "flange thickness must be > 0");
    require(joint.flange_width > 0.0, "flange width must be > 0");
    require(joint.web_thickness > 0.0, "web thickness must be > 0");
    require(joint.web_height > 0.0, "web height must be > 0");
    require(joint.weld_length > 0.0, "weld length must be > 0");
    require(joint.root_gap >= 0.0, "root gap must be >= 0");
    require(joint.leg_flange > 0.0, "flange leg must be > 0");
    require(joint.leg_web > joint.root_gap, "web leg must be larger than the root gap to reach the web");
    require(joint.leg_web <= joint.root_gap + joint.web_height, "web leg runs past the top of the web");
    require(joint.sides == 1 || joint.sides == 2, "sides must be 1 or 2");
    require(joint.convexity >= 0.0, "convexity must be >= 0 (choose convex or concave with the face shape)");
    require(joint.face == FaceShape::flat || joint.convexity <= max_convexity(joint.leg_flange, joint.leg_web),
            "convexity too large: the face would turn back over a toe or dip below a plate");

    const double half_width = joint.flange_width / 2.0;
    const double reach_plus = joint.web_face(1) + joint.leg_flange;
    const double reach_minus = joint.web_face(-1) - (joint.sides == 2 ? joint.leg_flange : 0.0);
    require(reach_plus <= half_width && reach_minus >= -half_width, "web or bead runs off the flange");
}

double fillet_area(double leg_flange, double leg_web, FaceShape face, double convexity) {
    const double triangle = leg_flange * leg_web / 2.0;
    const double segment = 2.0 / 3.0 * std::hypot(leg_flange, leg_web) * convexity;
    return triangle + face_sign(face) * segment;
}

Fillet fillet_of(const JointGeometry& joint) {
    return {joint.leg_flange, joint.leg_web, joint.face, joint.convexity};
}

JointGeometry with_fillet(JointGeometry joint, const Fillet& fillet) {
    joint.leg_flange = fillet.leg_flange, joint.leg_web = fillet.leg_web;
    joint.face = fillet.face, joint.convexity = fillet.convexity;
    return joint;
}

double fillet_area(const Fillet& f) { return fillet_area(f.leg_flange, f.leg_web, f.face, f.convexity); }

double design_throat(const Fillet& f) {
    const double lf = f.leg_flange, lw = f.leg_web, chord = std::hypot(lf, lw);
    const double u = lf * lf / (chord * chord);
    const double dip = f.face == FaceShape::concave ? 4 * f.convexity * u * (1 - u) : 0.0;
    return lf * lw / chord - dip;
}

bool inside_bead(const JointGeometry& joint, double y, double z) {
    if (inside_own_bead(joint, y - joint.web_face(1), z)) return true;
    return joint.sides == 2 && inside_own_bead(joint, joint.web_face(-1) - y, z);
}

Tag material_at(const JointGeometry& joint, double y, double z) {
    const double half_width = joint.flange_width / 2.0;
    if (within(y, -half_width, half_width) && within(z, -joint.flange_thickness, 0.0)) return Tag::flange;
    const double web_bottom = joint.root_gap;
    if (within(y, joint.web_face(-1), joint.web_face(1)) && within(z, web_bottom, web_bottom + joint.web_height))
        return Tag::web;
    if (inside_bead(joint, y, z)) return Tag::weld;
    return Tag::empty;
}

}  // namespace heatbead::mesh
