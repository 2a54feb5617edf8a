// The arc as a moving volumetric heat source: the torch's path along a fillet and the Goldak double
// ellipsoid (Goldak, Chakravarti & Bibby, Metall. Trans. B 15B (1984) 299–305) it carries, integrated
// over the solid cells of the grid and renormalised to the net arc power.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/joint.hpp"
#include "mesh/solid_cells.hpp"

#include <array>
#include <string>
#include <cstdint>
#include <span>
#include <vector>

namespace heatbead {

// Goldak double-ellipsoid dimensions (Goldak, Chakravarti & Bibby 1984), in metres.
struct SourceShape {
    bool from_procedure = true;
    bool origin_at_root = true;  // origin at the root corner (where the arc is aimed), else on the bead face
    double half_width = 0, depth = 0, front_length = 0, rear_length = 0;
    std::string rule;  // how the dimensions were chosen
};

using Vec3 = std::array<double, 3>;  // (x, y, z) in metres, or a direction

// Where the ellipsoid is and how it is turned. The arc strikes at `start` (x = 0) at `on_time` and moves
// along +x at `speed` until `off_time`, when it reaches the end of the weld. The local frame is fixed:
// `length` (ξ, the travel direction made orthogonal to the depth axis), `width` (η) and `depth` (ζ, along
// the torch into the root) are orthonormal and right-handed, length × width = depth.
struct TorchPath {
    Vec3 start;
    double speed;     // m/s
    double on_time;   // s
    double off_time;  // s
    Vec3 length, width, depth;

    bool arc_on(double t) const { return t >= on_time && t <= off_time; }
    // The origin at time t; before the strike and after the stop it rests at the path's ends.
    Vec3 origin(double t) const;
};

// The path of the bead on `side` (+1 or -1) of a tee joint, the arc burning over
// [start_time, start_time + L/speed]. In the cross-section the torch axis passes through the root corner
// (web_face(side), 0) at `work_angle` to the flange (45° is the bisector of the right angle between the
// plates); `travel_angle` turns it out of the section, positive = push, so that the depth axis is
//     ζ = (sin τ, -side·cos τ·cos θ, -cos τ·sin θ).
// With SourceOrigin::face the origin is where that axis meets the bead face (flat, convex or concave, as in
// mesh/joint.hpp); with SourceOrigin::root it is the root corner itself, where the arc is aimed. Either way,
// the origin's x = speed·(t - start_time): the arc, not the root aim point, runs from x = 0 to x = L.
// Because the face is the same in every section, the origin's (y, z) does not depend on the travel angle.
// Side -1 is the mirror image of side +1 in y about the web centre; its frame is kept right-handed, so its
// width axis is the mirrored one reversed (the density is even in η, so the source is the mirror image).
// Throws std::invalid_argument for an invalid joint, a side without a bead, a work angle outside
// (0, 90°), a travel angle outside (-90°, 90°) or a speed <= 0.
// Where the ellipsoid's origin sits on the torch axis: where the arc is aimed, the root corner,
// or where the axis meets the finished bead's face.
enum class SourceOrigin { root, face };
TorchPath torch_path(const mesh::JointGeometry& joint, int side, double work_angle, double travel_angle,
                     double speed, double start_time, SourceOrigin origin = SourceOrigin::face);

// Power put into one solid cell (index i·ns + s of mesh::SolidCells).
struct CellPower {
    std::uint32_t cell;
    double watts;
};

// Goldak's double ellipsoid moving along a TorchPath. In the local frame (ξ along travel, η width,
// ζ depth), with (f, c) = (f_f, c_f) for ξ >= 0 and (f_r, c_r) for ξ < 0,
//     q = 6√3·f·Q / (a·b·c·π^1.5) · exp(-3ξ²/c² - 3η²/a² - 3ζ²/b²),
//     f_f = 2c_f/(c_f + c_r), f_r = 2c_r/(c_f + c_r)   (f_f + f_r = 2, q continuous at ξ = 0).
// The constant makes q integrate to Q over the half-space ζ >= 0 only (2Q over all space); deposit()
// therefore never relies on it and renormalises over the metal the ellipsoid actually covers.
class DoubleEllipsoid {
public:
    // Throws std::invalid_argument unless all four dimensions and the net power are > 0.
    DoubleEllipsoid(const TorchPath& path, const SourceShape& shape, double net_power);

    // Raw density q at point p [W/m³]; zero while the arc is off.
    double density(const Vec3& p, double t) const;
    Vec3 origin(double t) const { return path_.origin(t); }
    const TorchPath& path() const { return path_; }
    double net_power() const { return power_; }

    // Fills `out` with the power of every active solid cell the source reaches at time t, scaled so that
    // the powers sum to the net power Q. Returns the raw integral of q over those cells before scaling
    // [W]: raw/(2Q) is the fraction of the ellipsoid inside (active) metal. With the origin on the bead
    // face the outer half (ζ < 0) lies mostly in air, so on a fillet raw is near Q, not 2Q. Returns 0 with
    // `out` empty when the arc is off or touches no active cell (the caller should warn in the latter case).
    //
    // Each cell's integral uses tensor Gauss–Legendre points, n = ceil(3h/s_min) per axis (h the cell
    // width, s_min the smallest semi-axis, n <= 8), so the sub-spacing is about s_min/3 or less. A cut
    // weld cell (mesh/bead_fill.hpp) takes its fill φ of its box's integral: the share of q that falls
    // in its metal, to first order in the cell size, and continuous as the bead's face moves. Only cells
    // overlapping the cut-off box (2 semi-axes in the local frame, where q has fallen to e^(-12) of its
    // peak) are visited. `active` has one flag per solid cell (nonzero = metal present); `out` is cleared
    // and refilled, keeping its capacity, so steady use does not allocate. Throws std::invalid_argument
    // when `active` does not match `cells`.
    double deposit(const mesh::Grid& grid, const mesh::SolidCells& cells, std::span<const std::uint8_t> active,
                   double t, std::vector<CellPower>& out) const;

private:
    double local_density(double xi, double eta, double zeta) const;

    TorchPath path_;
    double power_;
    double min_semi_axis_;
    std::array<double, 3> lo_, hi_;  // cut-off box in the local frame (ξ, η, ζ)
    double peak_front_, peak_rear_;  // 6√3·f·Q/(a·b·c·π^1.5) for each half
    double k_front_, k_rear_, k_width_, k_depth_;  // 3/c_f², 3/c_r², 3/a², 3/b²
};

}  // namespace heatbead
