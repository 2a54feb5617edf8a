#include "mesh/grading.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <iterator>
#include <stdexcept>
#include <utility>

namespace heatbead::mesh {
namespace {

// Absorbs the rounding in I = ∫ ds/h so that, e.g., a 1 m range of 0.1 m cells gives 10 cells, not 11.
constexpr double cell_count_tolerance = 1e-9;
// Breakpoints closer than this fraction of the range are one breakpoint.
constexpr double breakpoint_merge_fraction = 1e-12;

// A stretch of the target size field on which h is linear: h(s) = h_start + slope·(s − start).
struct SizePiece {
    double start;
    double h_start;
    double slope;
    double phi_start;  // Φ(start), Φ(s) = ∫_lo^s ds/h
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

// The target size h(s) = min(h_min + ln(r)·dist(s, [fine_lo, fine_hi]), h_max) on [lo, hi], held as the
// linear pieces between its kinks so that Φ and its inverse are exact.
class SizeField {
public:
    SizeField(double lo, double hi, double fine_lo, double fine_hi, const Spacing& spacing)
        : fine_lo_(fine_lo), fine_hi_(fine_hi), spacing_(spacing), slope_(std::log(spacing.growth)) {
        std::vector<double> kinks{lo, hi, fine_lo, fine_hi};
        if (slope_ > 0.0) {
            // Distance from the fine interval at which h reaches h_max.
            const double reach = (spacing.coarsest - spacing.finest) / slope_;
            kinks.push_back(fine_lo - reach);
            kinks.push_back(fine_hi + reach);
        }
        std::erase_if(kinks, [&](double s) { return s < lo || s > hi; });
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
    }

    double phi(double s) const {
        const SizePiece& piece = piece_at(&SizePiece::start, s);
        return piece.phi_start + phi_within(piece, s - piece.start);
    }

    double position(double phi_value) const {
        const SizePiece& piece = piece_at(&SizePiece::phi_start, phi_value);
        return piece.start + delta_within(piece, phi_value - piece.phi_start);
    }

private:
    // The last piece whose `key` is <= value; the first piece for values before it.
    const SizePiece& piece_at(double SizePiece::*key, double value) const {
        const auto after = std::upper_bound(std::next(pieces_.begin()), pieces_.end(), value,
                                            [key](double v, const SizePiece& p) { return v < p.*key; });
        return *std::prev(after);
    }

    double target(double s) const {
        const double dist = std::max({fine_lo_ - s, s - fine_hi_, 0.0});
        return std::min(spacing_.finest + slope_ * dist, spacing_.coarsest);
    }

    double fine_lo_;
    double fine_hi_;
    Spacing spacing_;
    double slope_;  // ln r: see graded_faces in grading.hpp for why not r − 1
    std::vector<SizePiece> pieces_;
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

}  // namespace

std::vector<double> graded_faces(double lo, double hi, double fine_lo, double fine_hi, const Spacing& spacing,
                                 std::vector<double> must_hit) {
    check_arguments(lo, hi, fine_lo, fine_hi, spacing);
    const SizeField field(lo, hi, fine_lo, fine_hi, spacing);
    const std::vector<double> points = breakpoints(lo, hi, std::move(must_hit));

    std::vector<double> faces{lo};
    for (std::size_t b = 0; b + 1 < points.size(); ++b) {
        const double phi_p = field.phi(points[b]);
        const double span = field.phi(points[b + 1]) - phi_p;  // I = ∫_p^q ds/h
        const auto n = std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil(span - cell_count_tolerance)));
        for (std::size_t k = 1; k < n; ++k)
            faces.push_back(field.position(phi_p + span * static_cast<double>(k) / static_cast<double>(n)));
        faces.push_back(points[b + 1]);  // exact, not the rounded inverse
    }
    return faces;
}

}  // namespace heatbead::mesh
