#include "mesh/grading.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <iterator>
#include <limits>
#include <stdexcept>
#include <utility>

namespace heatbead::mesh {
namespace {

// Absorbs the rounding in I = ∫ ds/h so that, e.g., a 1 m range of 0.1 m cells gives 10 cells, not 11.
constexpr double cell_count_tolerance = 1e-9;
// Breakpoints closer than this fraction of the range are one breakpoint.
constexpr double breakpoint_merge_fraction = 1e-12;
// Allowance for rounding when a neighbour ratio is compared with the growth asked.
constexpr double ratio_tolerance = 1e-9;
// Rounds of narrowing at breakpoints; two or three suffice on joints, the cap guards odd inputs.
constexpr int max_narrowing_rounds = 50;

constexpr double none = std::numeric_limits<double>::infinity();

// A stretch of the target size field on which h is linear: h(s) = h_start + slope·(s − start).
struct SizePiece {
    double start;
    double h_start;
    double slope;
    double phi_start;  // Φ(start), Φ(s) = ∫_start of the field^s ds/h
};

// ∫_0^δ ds / (h0 + m·s) = ln(1 + m·δ/h0)/m, or δ/h0 when m = 0.
double phi_within(const SizePiece& piece, double delta) {
    if (piece.slope == 0.0) return delta / piece.h_start;
    return std::log1p(piece.slope * delta / piece.h_start) / piece.slope;
}

// Inverse of phi_within: δ = h0·(e^(m·φ) − 1)/m, or φ·h0 when m = 0.
double delta_within(const SizePiece& piece, double phi) {
    if (piece.slope == 0.0) return phi * piece.h_start;
    return piece.h_start * std::expm1(piece.slope * phi) / piece.slope;
}

// h0 + m·dist(s, [a, b]): the target size around a stretch held at h0.
struct Cone {
    double a, b, h0;
};

// A straight line h = intercept + slope·s.
struct Line {
    double intercept, slope;
};

// The target size on [lo, hi], h(s) = min(h_max, min over cones of h0 + m·dist(s, [a, b])), held as the
// linear pieces between its kinks so that Φ and its inverse are exact. Each cone is the largest of
// three lines (falling, flat, rising), so between consecutive crossings of all the lines the field is
// one line: those crossings, with lo and hi, are the kinks.
class SizeField {
public:
    SizeField(double lo, double hi, std::vector<Cone> cones, double h_max, double m)
        : cones_(std::move(cones)), h_max_(h_max), m_(m) {
        std::vector<Line> lines{{h_max, 0.0}};
        for (const Cone& c : cones_) {
            lines.push_back({c.h0 + m * c.a, -m});
            lines.push_back({c.h0, 0.0});
            lines.push_back({c.h0 - m * c.b, m});
        }
        std::vector<double> kinks{lo, hi};
        for (std::size_t i = 0; i < lines.size(); ++i)
            for (std::size_t j = i + 1; j < lines.size(); ++j)
                if (lines[i].slope != lines[j].slope)
                    kinks.push_back((lines[j].intercept - lines[i].intercept) / (lines[i].slope - lines[j].slope));
        std::erase_if(kinks, [&](double s) { return !(s >= lo && s <= hi); });
        std::sort(kinks.begin(), kinks.end());
        kinks.erase(std::unique(kinks.begin(), kinks.end()), kinks.end());

        double phi_so_far = 0.0;
        for (std::size_t i = 0; i + 1 < kinks.size(); ++i) {
            const double a = kinks[i];
            const double b = kinks[i + 1];
            const SizePiece piece{a, target(a), (target(b) - target(a)) / (b - a), phi_so_far};
            phi_so_far += phi_within(piece, b - a);
            pieces_.push_back(piece);
        }
        span_ = phi_so_far;
    }

    // I = ∫_lo^hi ds/h.
    double span() const { return span_; }

    double position(double phi_value) const {
        const auto after = std::upper_bound(std::next(pieces_.begin()), pieces_.end(), phi_value,
                                            [](double v, const SizePiece& p) { return v < p.phi_start; });
        const SizePiece& piece = *std::prev(after);
        return piece.start + delta_within(piece, phi_value - piece.phi_start);
    }

private:
    double target(double s) const {
        double h = h_max_;
        for (const Cone& c : cones_) h = std::min(h, c.h0 + m_ * std::max({c.a - s, s - c.b, 0.0}));
        return h;
    }

    std::vector<Cone> cones_;
    double h_max_;
    double m_;  // ln r: see graded_faces in grading.hpp for why not r − 1
    std::vector<SizePiece> pieces_;
    double span_ = 0.0;
};

void check_arguments(double lo, double hi, double fine_lo, double fine_hi, const Spacing& spacing) {
    if (!(lo < hi)) throw std::invalid_argument("graded_faces: need lo < hi");
    if (!(fine_lo <= fine_hi)) throw std::invalid_argument("graded_faces: need fine_lo <= fine_hi");
    if (!(spacing.finest > 0.0)) throw std::invalid_argument("graded_faces: finest spacing must be > 0");
    if (!(spacing.coarsest >= spacing.finest))
        throw std::invalid_argument("graded_faces: coarsest spacing must be >= finest");
    if (!(spacing.growth >= 1.0) || !std::isfinite(spacing.growth))
        throw std::invalid_argument("graded_faces: growth ratio must be >= 1");
}

// lo, the breakpoints strictly inside (lo, hi) with near-duplicates merged, and hi.
std::vector<double> breakpoints(double lo, double hi, std::vector<double> must_hit) {
    const double merge = breakpoint_merge_fraction * (hi - lo);
    std::sort(must_hit.begin(), must_hit.end());
    std::vector<double> points{lo};
    for (const double p : must_hit) {
        if (!(p >= lo - merge && p <= hi + merge))
            throw std::invalid_argument("graded_faces: breakpoint outside [lo, hi]");
        if (p > points.back() + merge && p < hi - merge) points.push_back(p);
    }
    points.push_back(hi);
    return points;
}

// Faces of one interval [p, q] between breakpoints: n = max(1, ceil(I)) cells, the faces where
// ∫_p^s ds/h = k·I/n, the ends exact.
std::vector<double> interval_faces(double p, double q, const SizeField& field) {
    const double span = field.span();
    const auto n = std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil(span - cell_count_tolerance)));
    std::vector<double> faces{p};
    for (std::size_t k = 1; k < n; ++k)
        faces.push_back(field.position(span * static_cast<double>(k) / static_cast<double>(n)));
    faces.push_back(q);
    return faces;
}

}  // namespace

std::vector<double> graded_faces(double lo, double hi, double fine_lo, double fine_hi, const Spacing& spacing,
                                 std::vector<double> must_hit) {
    check_arguments(lo, hi, fine_lo, fine_hi, spacing);
    const std::vector<double> points = breakpoints(lo, hi, std::move(must_hit));
    const std::size_t intervals = points.size() - 1;
    const double m = std::log(spacing.growth);

    // The size each interval's field is narrowed to at its low and high end (none at first).
    std::vector<double> low_end(intervals, none), high_end(intervals, none);
    std::vector<std::vector<double>> pieces(intervals);
    for (int round = 0;; ++round) {
        for (std::size_t b = 0; b < intervals; ++b) {
            std::vector<Cone> cones{{fine_lo, fine_hi, spacing.finest}};
            if (low_end[b] < none) cones.push_back({points[b], points[b], low_end[b]});
            if (high_end[b] < none) cones.push_back({points[b + 1], points[b + 1], high_end[b]});
            pieces[b] = interval_faces(points[b], points[b + 1],
                                       SizeField(points[b], points[b + 1], std::move(cones), spacing.coarsest, m));
        }
        // Where the cells either side of a breakpoint differ by more than r, the larger side's field is
        // narrowed to the smaller cell at that end, so it grows from it again by at most r per cell.
        bool narrowed = false;
        for (std::size_t b = 1; b < intervals; ++b) {
            const auto& before = pieces[b - 1];
            const double left = before[before.size() - 1] - before[before.size() - 2];
            const double right = pieces[b][1] - pieces[b][0];
            if (right > spacing.growth * left * (1 + ratio_tolerance) && left < low_end[b]) {
                low_end[b] = left;
                narrowed = true;
            }
            if (left > spacing.growth * right * (1 + ratio_tolerance) && right < high_end[b - 1]) {
                high_end[b - 1] = right;
                narrowed = true;
            }
        }
        if (!narrowed || m == 0.0 || round == max_narrowing_rounds) break;
    }

    std::vector<double> faces{lo};
    for (const auto& piece : pieces) faces.insert(faces.end(), std::next(piece.begin()), piece.end());
    return faces;
}

}  // namespace heatbead::mesh
