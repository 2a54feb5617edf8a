#include "tests/analytic/moving_sources.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <stdexcept>
#include <vector>

namespace heatbead::analytic {

double rosenthal_thick_plate(double Q, double v, const Properties& p, double xi, double y, double z) {
    // ΔT = Q/(2πkR)·exp(−v(R + ξ)/(2α))
    const double R = std::sqrt(xi * xi + y * y + z * z);
    return Q / (2.0 * std::numbers::pi * p.k * R) * std::exp(-v * (R + xi) / (2.0 * p.alpha()));
}

namespace {

// Gauss–Legendre nodes and weights on [−1, 1]: Newton's method on P_n, whose roots lie close to
// cos(π(i + 3/4)/(n + 1/2)); P_n and P_n′ from the three-term recurrence
// j·P_j = (2j − 1)·z·P_{j−1} − (j − 1)·P_{j−2}, P_n′ = n·(z·P_n − P_{n−1})/(z² − 1), w = 2/((1 − z²)·P_n′²).
struct GaussRule {
    std::vector<double> node, weight;
};

GaussRule gauss_legendre(int n) {
    GaussRule rule;
    for (int i = 0; i < n; ++i) {
        double z = std::cos(std::numbers::pi * (i + 0.75) / (n + 0.5));
        double derivative = 0;
        for (int iteration = 0; iteration < 100; ++iteration) {
            double p1 = 1.0, p2 = 0.0;
            for (int j = 1; j <= n; ++j) {
                const double p3 = p2;
                p2 = p1;
                p1 = ((2.0 * j - 1.0) * z * p2 - (j - 1.0) * p3) / j;
            }
            derivative = n * (z * p1 - p2) / (z * z - 1.0);
            const double step = p1 / derivative;
            z -= step;
            if (std::abs(step) < 1e-16) break;
        }
        rule.node.push_back(z);
        rule.weight.push_back(2.0 / ((1.0 - z * z) * derivative * derivative));
    }
    return rule;
}

struct Panel {
    double lo, hi, value, error;
};

template <class F>
double gauss(const GaussRule& rule, const F& f, double lo, double hi) {
    const double mid = 0.5 * (lo + hi), half = 0.5 * (hi - lo);
    double sum = 0;
    for (std::size_t i = 0; i < rule.node.size(); ++i) sum += rule.weight[i] * f(mid + half * rule.node[i]);
    return sum * half;
}

template <class F>
Panel make_panel(const F& f, double lo, double hi) {
    static const GaussRule fine = gauss_legendre(10), coarse = gauss_legendre(5);
    const double value = gauss(fine, f, lo, hi);
    return {lo, hi, value, std::abs(value - gauss(coarse, f, lo, hi))};
}

// Globally adaptive quadrature of a positive integrand: start from the panels between the sorted
// breaks and bisect the panel with the largest error estimate until the summed estimate is below
// tol·|sum| (or a panel budget runs out, far beyond what the tests need).
template <class F>
double integrate(const F& f, const std::vector<double>& breaks, double tol) {
    const auto by_error = [](const Panel& l, const Panel& r) { return l.error < r.error; };
    std::vector<Panel> heap;
    double value = 0, error = 0;
    for (std::size_t i = 0; i + 1 < breaks.size(); ++i) {
        heap.push_back(make_panel(f, breaks[i], breaks[i + 1]));
        value += heap.back().value;
        error += heap.back().error;
    }
    std::make_heap(heap.begin(), heap.end(), by_error);
    constexpr std::size_t budget = 20000;
    while (error > tol * std::abs(value) && heap.size() < budget) {
        std::pop_heap(heap.begin(), heap.end(), by_error);
        const Panel worst = heap.back();
        heap.pop_back();
        const double mid = 0.5 * (worst.lo + worst.hi);
        for (const Panel& half : {make_panel(f, worst.lo, mid), make_panel(f, mid, worst.hi)}) {
            heap.push_back(half);
            std::push_heap(heap.begin(), heap.end(), by_error);
            value += half.value;
            error += half.error;
        }
        value -= worst.value;
        error -= worst.error;
    }
    value = 0;
    for (const Panel& p : heap) value += p.value;
    return value;
}

// Breaks from `feature` towards `end`, log-spaced in the distance to the feature (three per
// decade) down to `floor`, below which the integrand no longer changes.
void add_graded(std::vector<double>& breaks, double feature, double end, double floor) {
    const double span = end - feature;
    for (double d = std::abs(span); d > floor; d /= std::cbrt(10.0)) {
        breaks.push_back(feature + std::copysign(d, span));
    }
    breaks.push_back(feature);
}

}  // namespace

double double_ellipsoid_rise(const DoubleEllipsoid& src, const Properties& p, double x, double y, double z,
                             double t, const RiseOptions& options) {
    const double s_lo = std::max(0.0, t - src.t_off);  // releases t′ ∈ [0, t_off] ⇔ s ∈ [t − t_off, t]
    if (!(t > s_lo)) return 0.0;
    const double alpha = p.alpha();
    const double v = src.speed;
    const double xi = x - src.x_start - v * t;
    const double cf2 = src.c_front * src.c_front, cr2 = src.c_rear * src.c_rear;
    const double ff = 2.0 * src.c_front / (src.c_front + src.c_rear), fr = 2.0 - ff;
    const bool exact = options.split == FrontRearSplit::exact;

    // Integrand of ΔT = 3√3·Q/(ρc·π^1.5)·∫ G(y,a)·G(z,b)·[f_f·G(X,c_f)·E_f + f_r·G(X,c_r)·E_r] ds, A = 12αs,
    // X = ξ + v·s, G(u,w) = exp(−3u²/(w² + A))/√(w² + A), E_f = erfc(−η_f), E_r = erfc(η_r),
    // η = c·X·√(3/(A(c² + A))); the published form has E_f = E_r = 1.
    const auto integrand = [&](double s) {
        const double A = 12.0 * alpha * s;
        const double X = xi + v * s;
        const double wy = src.a * src.a + A, wz = src.b * src.b + A, wf = cf2 + A, wr = cr2 + A;
        const double yz = -3.0 * (y * y / wy + z * z / wz);
        double front = ff * std::exp(yz - 3.0 * X * X / wf) / std::sqrt(wf);
        double rear = fr * std::exp(yz - 3.0 * X * X / wr) / std::sqrt(wr);
        if (exact) {
            front *= std::erfc(-src.c_front * X * std::sqrt(3.0 / (A * wf)));
            rear *= std::erfc(src.c_rear * X * std::sqrt(3.0 / (A * wr)));
        }
        return (front + rear) / std::sqrt(wy * wz);
    };

    // Where the integrand changes fastest: at s = s_lo (the latest release, sharp when the point
    // is near the source) and at s* = −ξ/v, when the centre passed over the point's x. It varies
    // on scales no shorter than d²/(12α) (a kernel width grows by d² when 12αs does) and d/v (the
    // centre crossing a length d), so grading stops at a hundredth of these.
    const double d = std::min({src.a, src.b, src.c_front, src.c_rear});
    const double floor = 0.01 * (v > 0 ? std::min(d * d / (12.0 * alpha), d / v) : d * d / (12.0 * alpha));
    std::vector<double> breaks{t};
    const double s_pass = v > 0 ? -xi / v : -1.0;
    if (s_pass > s_lo && s_pass < t) {
        const double mid = 0.5 * (s_lo + s_pass);
        add_graded(breaks, s_lo, mid, floor);
        add_graded(breaks, s_pass, mid, floor);
        add_graded(breaks, s_pass, t, floor);
    } else {
        add_graded(breaks, s_lo, t, floor);
    }
    std::sort(breaks.begin(), breaks.end());
    breaks.erase(std::unique(breaks.begin(), breaks.end()), breaks.end());

    const double scale = 3.0 * std::sqrt(3.0) * src.Q / (p.rho_c * std::pow(std::numbers::pi, 1.5));
    return scale * integrate(integrand, breaks, options.relative_tolerance);
}

std::optional<double> PeakCooling::t8_5() const {
    if (t800 && t500) return *t500 - *t800;
    return std::nullopt;
}

namespace {

constexpr int max_growing_steps = 60;

// First t after `from` (where T ≥ level) with T(t) < level: bracket on the samples, or step past
// the last sample with doubling steps, then bisect.
double downward_crossing(const std::function<double(double)>& T, const std::vector<double>& ts,
                         const std::vector<double>& Ts, double from, double level, double resolution) {
    double lo = from, hi = from;
    bool bracketed = false;
    for (std::size_t j = 0; j < ts.size() && !bracketed; ++j) {
        if (ts[j] <= from) continue;
        if (Ts[j] < level) {
            hi = ts[j];
            bracketed = true;
        } else {
            lo = ts[j];
        }
    }
    double step = ts[1] - ts[0];
    for (int k = 0; !bracketed && k < max_growing_steps; ++k, step *= 2.0) {
        if (T(lo + step) < level) {
            hi = lo + step;
            bracketed = true;
        } else {
            lo += step;
        }
    }
    if (!bracketed) throw std::runtime_error("peak_and_cooling: temperature never falls below the level");
    while (hi - lo > resolution) {
        const double mid = 0.5 * (lo + hi);
        (T(mid) < level ? hi : lo) = mid;
    }
    return 0.5 * (lo + hi);
}

}  // namespace

PeakCooling peak_and_cooling(const std::function<double(double)>& T, const TimeScan& scan) {
    if (!(scan.t_end > scan.t_begin)) throw std::invalid_argument("peak_and_cooling: t_end must exceed t_begin");
    const int n = std::max(scan.samples, 2);
    const double h = (scan.t_end - scan.t_begin) / n;
    const double resolution = 1e-10 * (scan.t_end - scan.t_begin);
    std::vector<double> ts, Ts;
    for (int i = 0; i <= n; ++i) {
        ts.push_back(scan.t_begin + i * h);
        Ts.push_back(T(ts.back()));
    }
    const auto top = static_cast<std::size_t>(std::max_element(Ts.begin(), Ts.end()) - Ts.begin());
    double lo = ts[top == 0 ? 0 : top - 1];
    double hi = top == ts.size() - 1 ? ts[top] : ts[top + 1];
    if (top == ts.size() - 1) {
        // Still rising at the end of the scan: follow with doubling steps until T falls.
        double current = ts[top], T_current = Ts[top], step = h;
        bool fell = false;
        for (int k = 0; !fell && k < max_growing_steps; ++k, step *= 2.0) {
            const double T_next = T(current + step);
            fell = T_next < T_current;
            hi = current + step;
            if (!fell) {
                lo = current;
                current = hi;
                T_current = T_next;
            }
        }
        if (!fell) throw std::runtime_error("peak_and_cooling: temperature never falls after the scan");
    }
    // Golden-section search for the maximum on [lo, hi].
    const double g = (std::sqrt(5.0) - 1.0) / 2.0;
    double t1 = hi - g * (hi - lo), t2 = lo + g * (hi - lo);
    double T1 = T(t1), T2 = T(t2);
    while (hi - lo > resolution) {
        if (T1 < T2) {
            lo = t1;
            t1 = t2;
            T1 = T2;
            t2 = lo + g * (hi - lo);
            T2 = T(t2);
        } else {
            hi = t2;
            t2 = t1;
            T2 = T1;
            t1 = hi - g * (hi - lo);
            T1 = T(t1);
        }
    }
    PeakCooling result;
    result.t_peak = 0.5 * (lo + hi);
    result.T_peak = T(result.t_peak);
    // t8/5 levels (EN 1011-2 Annex D definition of the cooling time).
    constexpr double upper = 800.0, lower = 500.0;
    double after = result.t_peak;
    if (result.T_peak > upper) {
        result.t800 = downward_crossing(T, ts, Ts, after, upper, resolution);
        after = *result.t800;
    }
    if (result.T_peak > lower) result.t500 = downward_crossing(T, ts, Ts, after, lower, resolution);
    return result;
}

PeakCooling peak_and_cooling(const DoubleEllipsoid& source, const Properties& p, double x, double y, double z,
                             double T0, const TimeScan& scan, const RiseOptions& options) {
    return peak_and_cooling(
        [&](double t) { return T0 + double_ellipsoid_rise(source, p, x, y, z, t, options); }, scan);
}

}  // namespace heatbead::analytic
