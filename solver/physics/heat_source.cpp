#include "solver/physics/heat_source.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <stdexcept>
#include <string>

namespace heatbead {
namespace {

constexpr std::size_t max_points = 8;     // Gauss–Legendre points per axis and cell, at most
// q/q_peak = e^(-3·2²) ≈ 6e-6 at the box edge; the power beyond is about 1e-5 of the total
// (a 3-D Gaussian with variance c²/6 per axis), and renormalisation puts it back.
constexpr double cutoff_semi_axes = 2.0;

void require(bool ok, const std::string& what) {
    if (!ok) throw std::invalid_argument(what);
}

double dot(const Vec3& a, const Vec3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

Vec3 cross(const Vec3& a, const Vec3& b) {
    return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

// --- Torch geometry -------------------------------------------------------------------------------------

// The root of q2·u² + q1·u + q0 in [0, 1] when q0 < 0 < q2 + q1 + q0 (so exactly one lies there), from
// the cancellation-free pair q = -(q1 + sgn(q1)·√(q1² - 4·q2·q0))/2, u = q0/q and u = q/q2. A flat face
// (q2 = 0) has the single root q0/q = -q0/q1.
double root_in_unit_interval(double q2, double q1, double q0) {
    const double q = -0.5 * (q1 + std::copysign(std::sqrt(q1 * q1 - 4.0 * q2 * q0), q1));
    const double u = q0 / q;
    return u >= 0.0 && u <= 1.0 ? u : q / q2;
}

struct BeadPoint {
    double a;  // out from the web face
    double z;  // up from the flange top
};

// Where the ray from the root corner at angle θ to the flange, e = (cos θ, sin θ), meets the bead face
// P(u) = F + u·d + s·4c·u(1-u)·n (mesh/joint.hpp: F = (l_f, 0), d = (-l_f, l_w), n = (l_w, l_f)/|d|).
// P(u) lies on the ray when e × P(u) = 0, a quadratic in u:
//     -k·u² + (e×d + k)·u + e×F = 0,  k = s·4c·(e×n),  e×w = e_a·w_z - e_z·w_a.
// At u = 0 it is -l_f·sin θ < 0 and at u = 1 it is l_w·cos θ > 0, so for 0 < θ < 90° one root is a point of
// the face between the toes.
BeadPoint face_on_ray(const mesh::JointGeometry& joint, double work_angle) {
    const double lf = joint.leg_flange, lw = joint.leg_web;
    const double chord = std::hypot(lf, lw);
    const double ea = std::cos(work_angle), ez = std::sin(work_angle);
    const double bulge = mesh::face_sign(joint.face) * 4.0 * joint.convexity;  // s·4c
    const double k = bulge * (ea * lf - ez * lw) / chord;
    const double u = root_in_unit_interval(-k, ea * lw + ez * lf + k, -ez * lf);
    const double v = bulge * u * (1.0 - u);
    return {lf - u * lf + v * lw / chord, u * lw + v * lf / chord};
}

// --- Quadrature -----------------------------------------------------------------------------------------

struct GaussRule {
    std::array<double, max_points> node{}, weight{};  // on [-1, 1]
};

// n-point Gauss–Legendre rule: nodes are the roots of P_n, found by Newton's method from
// x ≈ cos(π(i + 3/4)/(n + 1/2)), with P_n from (m + 1)P_{m+1} = (2m + 1)x·P_m - m·P_{m-1},
// P_n' = n(x·P_n - P_{n-1})/(x² - 1), and weights w = 2/((1 - x²)·P_n'²).
GaussRule legendre_rule(std::size_t n_points) {
    const double n = static_cast<double>(n_points);
    GaussRule rule;
    for (std::size_t i = 0; i < n_points; ++i) {
        double x = std::cos(std::numbers::pi * (static_cast<double>(i) + 0.75) / (n + 0.5));
        double slope = 1.0;
        for (int iteration = 0; iteration < 50; ++iteration) {
            double previous = 1.0, value = x;  // P_0, P_1
            for (double m = 1.0; m < n; m += 1.0) {
                const double next = ((2.0 * m + 1.0) * x * value - m * previous) / (m + 1.0);
                previous = value;
                value = next;
            }
            slope = n * (x * value - previous) / (x * x - 1.0);
            const double step = value / slope;
            x -= step;
            if (std::abs(step) < 1e-15) break;
        }
        rule.node[i] = x;
        rule.weight[i] = 2.0 / ((1.0 - x * x) * slope * slope);
    }
    return rule;
}

// The rules for 1 … max_points points, built once (thread-safe static initialisation).
const GaussRule& gauss_rule(std::size_t n) {
    static const std::array<GaussRule, max_points> rules = [] {
        std::array<GaussRule, max_points> all;
        for (std::size_t n_points = 1; n_points <= max_points; ++n_points) all[n_points - 1] = legendre_rule(n_points);
        return all;
    }();
    return rules[n - 1];
}

// The sample points of one cell along one global axis g, as their shares of the local coordinates
// (ξ, η, ζ) = Σ_g r_g·(length_g, width_g, depth_g), r = p - origin, and their weights w·h/2.
struct AxisSamples {
    std::size_t n;
    std::array<double, max_points> xi, eta, zeta, weight;
};

AxisSamples sample_axis(const mesh::Axis& axis, std::size_t cell, std::size_t g, double origin,
                        const TorchPath& path, double min_semi_axis) {
    const double h = axis.width(cell);
    const double centre = axis.centre(cell);
    AxisSamples s;
    const double wanted = std::ceil(3.0 * h / min_semi_axis);  // sub-spacing h/n <= s_min/3
    s.n = static_cast<std::size_t>(std::clamp(wanted, 1.0, static_cast<double>(max_points)));
    const GaussRule& rule = gauss_rule(s.n);
    for (std::size_t p = 0; p < s.n; ++p) {
        const double r = centre + 0.5 * h * rule.node[p] - origin;
        s.xi[p] = path.length[g] * r;
        s.eta[p] = path.width[g] * r;
        s.zeta[p] = path.depth[g] * r;
        s.weight[p] = 0.5 * h * rule.weight[p];
    }
    return s;
}

// --- Cell ranges ----------------------------------------------------------------------------------------

struct CellRange {
    std::size_t first, end;  // cells [first, end)
};

// Cells of `axis` overlapping [lo, hi]: those with f_{i+1} > lo and f_i < hi, by binary search on the faces.
CellRange overlapping(const mesh::Axis& axis, double lo, double hi) {
    const auto& f = axis.faces;
    const auto above_lo = std::upper_bound(f.begin(), f.end(), lo);
    const std::size_t first = above_lo == f.begin() ? 0 : static_cast<std::size_t>(above_lo - f.begin()) - 1;
    const std::size_t end = std::min(static_cast<std::size_t>(std::lower_bound(f.begin(), f.end(), hi) - f.begin()),
                                     axis.cells());
    return {first, std::max(first, end)};
}

}  // namespace

Vec3 TorchPath::origin(double t) const {
    const double travelled = speed * std::clamp(t - on_time, 0.0, off_time - on_time);
    return {start[0] + travelled, start[1], start[2]};
}

TorchPath torch_path(const mesh::JointGeometry& joint, int side, double work_angle, double travel_angle,
                     double speed, double start_time, SourceOrigin origin) {
    mesh::validate(joint);
    require(side == 1 || (side == -1 && joint.sides == 2), "torch path: no bead on side " + std::to_string(side));
    require(work_angle > 0.0 && work_angle < std::numbers::pi / 2.0, "torch path: work angle must be in (0, 90) deg");
    require(std::abs(travel_angle) < std::numbers::pi / 2.0, "torch path: travel angle must be in (-90, 90) deg");
    require(speed > 0.0, "torch path: travel speed must be > 0");

    const BeadPoint on_face = face_on_ray(joint, work_angle);
    const double cos_travel = std::cos(travel_angle);
    TorchPath path;
    path.start = origin == SourceOrigin::face ? Vec3{0.0, joint.web_face(side) + side * on_face.a, on_face.z}
                                              : Vec3{0.0, joint.web_face(side), 0.0};
    path.speed = speed;
    path.on_time = start_time;
    path.off_time = start_time + joint.weld_length / speed;
    path.depth = {std::sin(travel_angle), -side * cos_travel * std::cos(work_angle),
                  -cos_travel * std::sin(work_angle)};
    // Travel x̂ made orthogonal to ζ: x̂ - (x̂·ζ)ζ, of length √(1 - ζ_x²) = cos τ.
    const double along = path.depth[0];
    path.length = {(1.0 - along * along) / cos_travel, -along * path.depth[1] / cos_travel,
                   -along * path.depth[2] / cos_travel};
    path.width = cross(path.depth, path.length);  // right-handed: length × width = depth
    return path;
}

DoubleEllipsoid::DoubleEllipsoid(const TorchPath& path, const SourceShape& shape, double net_power)
    : path_(path), power_(net_power) {
    const double a = shape.half_width, b = shape.depth, cf = shape.front_length, cr = shape.rear_length;
    require(a > 0.0 && b > 0.0 && cf > 0.0 && cr > 0.0, "heat source: all ellipsoid dimensions must be > 0");
    require(net_power > 0.0, "heat source: net power must be > 0");
    min_semi_axis_ = std::min({a, b, cf, cr});
    lo_ = {-cutoff_semi_axes * cr, -cutoff_semi_axes * a, -cutoff_semi_axes * b};
    hi_ = {cutoff_semi_axes * cf, cutoff_semi_axes * a, cutoff_semi_axes * b};
    // 6√3·f·Q/(a·b·c·π^1.5) with f_f = 2c_f/(c_f + c_r) makes f/c, and so q at ξ = 0, the same on both sides.
    const double scale = 6.0 * std::numbers::sqrt3 * net_power / (a * b * std::pow(std::numbers::pi, 1.5));
    const double f_front = 2.0 * cf / (cf + cr), f_rear = 2.0 * cr / (cf + cr);
    peak_front_ = scale * f_front / cf;
    peak_rear_ = scale * f_rear / cr;
    k_front_ = 3.0 / (cf * cf);
    k_rear_ = 3.0 / (cr * cr);
    k_width_ = 3.0 / (a * a);
    k_depth_ = 3.0 / (b * b);
}

double DoubleEllipsoid::local_density(double xi, double eta, double zeta) const {
    const bool front = xi >= 0.0;
    const double k_length = front ? k_front_ : k_rear_;
    return (front ? peak_front_ : peak_rear_) *
           std::exp(-(k_length * xi * xi + k_width_ * eta * eta + k_depth_ * zeta * zeta));
}

double DoubleEllipsoid::density(const Vec3& p, double t) const {
    if (!path_.arc_on(t)) return 0.0;
    const Vec3 o = path_.origin(t);
    const Vec3 r{p[0] - o[0], p[1] - o[1], p[2] - o[2]};
    return local_density(dot(r, path_.length), dot(r, path_.width), dot(r, path_.depth));
}

double DoubleEllipsoid::deposit(const mesh::Grid& grid, const mesh::SolidCells& cells,
                                std::span<const std::uint8_t> active, double t, std::vector<CellPower>& out) const {
    require(active.size() == cells.size(), "heat source: one active flag per solid cell expected");
    out.clear();
    if (!path_.arc_on(t)) return 0.0;

    // Axis-aligned hull of the local cut-off box: along global axis g it spans
    // o_g + Σ_e min(e_g·lo_e, e_g·hi_e) … o_g + Σ_e max(e_g·lo_e, e_g·hi_e) over the frame axes e.
    const Vec3 o = path_.origin(t);
    const std::array<const Vec3*, 3> frame{&path_.length, &path_.width, &path_.depth};
    std::array<CellRange, 3> range;
    const std::array<const mesh::Axis*, 3> axes{&grid.x, &grid.y, &grid.z};
    for (std::size_t g = 0; g < 3; ++g) {
        double lo = o[g], hi = o[g];
        for (std::size_t e = 0; e < 3; ++e) {
            const double reach_lo = (*frame[e])[g] * lo_[e], reach_hi = (*frame[e])[g] * hi_[e];
            lo += std::min(reach_lo, reach_hi);
            hi += std::max(reach_lo, reach_hi);
        }
        range[g] = overlapping(*axes[g], lo, hi);
    }

    // ∫_cell q dV ≈ Σ_ijk w_i·w_j·w_k·q(ξ_i + ξ_j + ξ_k, η_i + η_j + η_k, ζ_i + ζ_j + ζ_k).
    const auto cell_integral = [this](const AxisSamples& xs, const AxisSamples& ys, const AxisSamples& zs) {
        double sum = 0.0;
        for (std::size_t kk = 0; kk < zs.n; ++kk) {
            for (std::size_t jj = 0; jj < ys.n; ++jj) {
                const double xi = ys.xi[jj] + zs.xi[kk], eta = ys.eta[jj] + zs.eta[kk];
                const double zeta = ys.zeta[jj] + zs.zeta[kk], w = ys.weight[jj] * zs.weight[kk];
                for (std::size_t ii = 0; ii < xs.n; ++ii)
                    sum += w * xs.weight[ii] * local_density(xi + xs.xi[ii], eta + xs.eta[ii], zeta + xs.zeta[ii]);
            }
        }
        return sum;
    };

    const std::size_t ny = grid.y.cells();
    double raw = 0.0;
    for (std::size_t k = range[2].first; k < range[2].end; ++k) {
        const AxisSamples zs = sample_axis(grid.z, k, 2, o[2], path_, min_semi_axis_);
        for (std::size_t j = range[1].first; j < range[1].end; ++j) {
            const std::uint32_t s = cells.at(j, k, ny);
            if (s == mesh::no_neighbour) continue;  // void
            const AxisSamples ys = sample_axis(grid.y, j, 1, o[1], path_, min_semi_axis_);
            for (std::size_t i = range[0].first; i < range[0].end; ++i) {
                const std::size_t cell = cells.index(i, s);
                if (active[cell] == 0) continue;
                // A cut weld cell takes the share φ of the box's integral that its metal fills.
                const double watts =
                    cells.fill[s] * cell_integral(sample_axis(grid.x, i, 0, o[0], path_, min_semi_axis_), ys, zs);
                if (watts <= 0.0) continue;  // underflow far out in the tail
                out.push_back({static_cast<std::uint32_t>(cell), watts});
                raw += watts;
            }
        }
    }
    if (out.empty()) return 0.0;

    // Renormalise: P_cell ← P_cell·Q/Σ P, so no power is lost where the ellipsoid leaves the metal.
    const double scale = power_ / raw;
    for (CellPower& c : out) c.watts *= scale;
    return raw;
}

}  // namespace heatbead
