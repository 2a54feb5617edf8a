#include "mesh/bead_fill.hpp"

#include <algorithm>
#include <cmath>

namespace heatbead::mesh {
namespace {

struct Point {
    double a, z;
};

// One bead in its own frame (bead_fill.hpp): the face as a polyline from the web toe (0, l_w) to the
// flange toe (l_f, 0), a never falling and z never rising along it.
class BeadOutline {
public:
    explicit BeadOutline(const JointGeometry& joint) : lf_(joint.leg_flange), lw_(joint.leg_web) {
        // P(u) = F + u·d + v·n, F = (l_f, 0), d = (−l_f, l_w), n = (l_w, l_f)/|d|, v = s·4c·u(1 − u),
        // from u = 1 (web toe) to u = 0 (flange toe), as mesh/joint.cpp describes the face.
        const double chord = std::hypot(lf_, lw_);
        const double bulge = face_sign(joint.face) * 4 * joint.convexity;
        const int n = bulge == 0 ? 1 : face_segments;
        for (int i = 0; i <= n; ++i) {
            const double u = 1.0 - static_cast<double>(i) / n;
            const double v = bulge * u * (1 - u);
            Point p{lf_ - u * lf_ + v * lw_ / chord, u * lw_ + v * lf_ / chord};
            if (i == 0) p = {0.0, lw_};
            if (i == n) p = {lf_, 0.0};
            // A valid face is monotone; this only absorbs rounding at the largest convexity.
            if (!points_.empty()) p = {std::max(p.a, points_.back().a), std::min(p.z, points_.back().z)};
            points_.push_back(p);
        }
    }

    double leg_flange() const { return lf_; }
    double leg_web() const { return lw_; }

    // Share of the face a = A, z in [z0, z1], that lies in the bead: [0, top(A)] within [z0, z1].
    double vertical_share(double a, double z0, double z1) const {
        if (a < 0 || a > lf_) return 0.0;
        return (std::clamp(top(a), z0, z1) - z0) / (z1 - z0);
    }

    // Share of the face z = Z, a in [a0, a1], that lies in the bead: [0, reach(Z)] within [a0, a1].
    double horizontal_share(double z, double a0, double a1) const {
        if (z < 0 || z > lw_) return 0.0;
        return std::max(0.0, std::min(reach(z), a1) - std::max(a0, 0.0)) / (a1 - a0);
    }

    // Area of the bead in the rectangle [a0, a1] × [z0, z1]: ∫ (clamp(top(a), z0, z1) − z0) da over
    // [a0, a1] ∩ [0, l_f], exact on each straight piece of the face.
    double area(double a0, double a1, double z0, double z1) const {
        double sum = 0;
        for (std::size_t i = 0; i + 1 < points_.size(); ++i) {
            const Point& p = points_[i];
            const Point& q = points_[i + 1];
            const double lo = std::max(a0, p.a), hi = std::min(a1, q.a);
            if (!(hi > lo)) continue;
            const auto at = [&](double a) { return p.z + (q.z - p.z) * (a - p.a) / (q.a - p.a); };
            sum += clamped_integral(lo, hi, at(lo), at(hi), z0, z1);
        }
        return sum;
    }

    // Length of the face inside the rectangle [a0, a1] × [z0, z1].
    double face_length(double a0, double a1, double z0, double z1) const {
        double sum = 0;
        for (std::size_t i = 0; i + 1 < points_.size(); ++i) sum += clipped_length(points_[i], points_[i + 1], a0, a1, z0, z1);
        return sum;
    }

private:
    // top(A) for 0 <= A <= l_f; on a vertical piece of the face, its upper end.
    double top(double a) const {
        for (std::size_t i = 0; i + 1 < points_.size(); ++i) {
            const Point& p = points_[i];
            const Point& q = points_[i + 1];
            if (a > q.a) continue;
            return q.a > p.a ? p.z + (q.z - p.z) * (a - p.a) / (q.a - p.a) : p.z;
        }
        return 0.0;
    }

    // The a where the face is at height Z, 0 <= Z <= l_w; on a level piece of the face, its far end.
    double reach(double z) const {
        for (std::size_t i = points_.size() - 1; i > 0; --i) {
            const Point& p = points_[i - 1];
            const Point& q = points_[i];
            if (z > p.z) continue;
            return p.z > q.z ? p.a + (q.a - p.a) * (p.z - z) / (p.z - q.z) : q.a;
        }
        return 0.0;
    }

    // ∫_lo^hi (clamp(t(a), z0, z1) − z0) da for t linear from t_lo to t_hi: split where t crosses z0 and
    // z1, so that the integrand is linear on each piece, and add the trapezoids.
    static double clamped_integral(double lo, double hi, double t_lo, double t_hi, double z0, double z1) {
        const auto crossing = [&](double level) {  // where t = level, or lo when it never is in between
            return (t_lo - level) * (t_hi - level) < 0 ? lo + (hi - lo) * (level - t_lo) / (t_hi - t_lo) : lo;
        };
        const double c0 = crossing(z0), c1 = crossing(z1);
        const std::array<double, 4> cuts{lo, std::min(c0, c1), std::max(c0, c1), hi};
        const auto g = [&](double a) {
            return std::clamp(t_lo + (t_hi - t_lo) * (a - lo) / (hi - lo), z0, z1) - z0;
        };
        double sum = 0;
        for (std::size_t i = 0; i + 1 < cuts.size(); ++i) sum += (g(cuts[i]) + g(cuts[i + 1])) / 2 * (cuts[i + 1] - cuts[i]);
        return sum;
    }

    // Length of the segment p–q inside the rectangle (Liang–Barsky clipping of p + t·(q − p), t in [0, 1]).
    static double clipped_length(Point p, Point q, double a0, double a1, double z0, double z1) {
        const double da = q.a - p.a, dz = q.z - p.z;
        double t0 = 0, t1 = 1;
        const auto clip = [&](double den, double num) {  // keeps t with den·t <= num
            if (den == 0) return num >= 0;
            const double t = num / den;
            if (den < 0) t0 = std::max(t0, t);
            else t1 = std::min(t1, t);
            return t0 < t1;
        };
        if (!(clip(-da, p.a - a0) && clip(da, a1 - p.a) && clip(-dz, p.z - z0) && clip(dz, z1 - p.z))) return 0.0;
        return (t1 - t0) * std::hypot(da, dz);
    }

    double lf_, lw_;
    std::vector<Point> points_;
};

}  // namespace

std::vector<BeadCell> bead_cells(const JointGeometry& joint, std::span<const double> y_faces,
                                 std::span<const double> z_faces) {
    const BeadOutline outline(joint);
    const double lf = outline.leg_flange(), lw = outline.leg_web();
    const std::size_t ny = y_faces.size() - 1, nz = z_faces.size() - 1;
    std::vector<BeadCell> cells;
    for (const int side : {1, -1}) {
        if (side == -1 && joint.sides != 2) continue;
        const double yw = joint.web_face(side);
        for (std::size_t k = 0; k < nz; ++k) {
            const double z0 = z_faces[k], z1 = z_faces[k + 1];
            if (z1 <= 0 || z0 >= lw) continue;
            for (std::size_t j = 0; j < ny; ++j) {
                // The cell in the bead's frame: a_near is its side toward the web, a_far away from it.
                const double a_near = side > 0 ? y_faces[j] - yw : yw - y_faces[j + 1];
                const double a_far = side > 0 ? y_faces[j + 1] - yw : yw - y_faces[j];
                if (a_far <= 0 || a_near >= lf) continue;
                CellFill fill;
                fill.area = outline.area(a_near, a_far, z0, z1) / ((a_far - a_near) * (z1 - z0));
                if (fill.area < min_fill) continue;
                const double near = outline.vertical_share(a_near, z0, z1);
                const double far = outline.vertical_share(a_far, z0, z1);
                fill.faces[minus_y] = side > 0 ? near : far;
                fill.faces[plus_y] = side > 0 ? far : near;
                fill.faces[minus_z] = outline.horizontal_share(z0, a_near, a_far);
                fill.faces[plus_z] = outline.horizontal_share(z1, a_near, a_far);
                fill.free_face = outline.face_length(a_near, a_far, z0, z1);
                cells.push_back({j + ny * k, fill});
            }
        }
    }
    std::sort(cells.begin(), cells.end(), [](const BeadCell& a, const BeadCell& b) { return a.position < b.position; });
    return cells;
}

}  // namespace heatbead::mesh
