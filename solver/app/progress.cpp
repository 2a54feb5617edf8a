#include "solver/app/progress.hpp"

#include "solver/core/text.hpp"

#include <algorithm>
#include <cmath>
#include <unistd.h>

namespace heatbead {

ProgressPrinter::ProgressPrinter(bool quiet, const ProgressPlan& plan)
    : quiet_(quiet),
      terminal_(::isatty(STDERR_FILENO) == 1),
      plan_(plan),
      start_(std::chrono::steady_clock::now()),
      last_(start_) {}

// While the joint cools, its hottest cell follows the thick-plate line-source law
// T − T0 = (q/v)/(2πk·τ) (Rosenthal 1946), τ the time since the arc left it, so it reaches the
// stop temperature at τ_stop = τ·(T − T0)/(T_stop − T0). Before that, the run estimate.
double ProgressPrinter::expected_end(double t, double max_temperature) const {
    const double rise = plan_.stop_temperature - plan_.base_temperature;
    if (!arc_off_ || t <= *arc_off_ || rise <= 0 || max_temperature <= plan_.stop_temperature) {
        return std::max(plan_.expected_time, t);
    }
    const double tau = t - *arc_off_;
    return std::min(plan_.time_limit, *arc_off_ + tau * (max_temperature - plan_.base_temperature) / rise);
}

void ProgressPrinter::update(double t, double arc_x, double dt, double max_temperature) {
    if (std::isnan(arc_x)) {
        if (!arc_off_) arc_off_ = t - dt;
    } else {
        arc_off_.reset();
    }
    if (quiet_) return;
    const auto now = std::chrono::steady_clock::now();
    // A terminal line is redrawn up to ten times a second; a log gets a line every five seconds.
    const double gap = std::chrono::duration<double>(now - last_).count();
    if (gap < (terminal_ ? 0.1 : 5.0)) return;
    // Time left at the pace of the last interval: cooling steps cover far more simulated time per
    // second of work than the steps under the arc.
    const double pace = t > last_t_ ? gap / (t - last_t_) : 0.0;
    last_ = now, last_t_ = t;
    const double wall = std::chrono::duration<double>(now - start_).count();
    const double eta = std::max(0.0, (expected_end(t, max_temperature) - t) * pace);
    const std::string arc = std::isnan(arc_x) ? "arc off" : format_text("arc at %5.1f mm", arc_x * 1e3);
    std::fprintf(stderr, "%s  t %7.2f s  %s  step %.3g s  hottest %5.0f degC  elapsed %.0f s  eta ~%.0f s%s",
                 terminal_ ? "\r" : "", t, arc.c_str(), dt, max_temperature, wall, eta, terminal_ ? "   " : "\n");
    std::fflush(stderr);
}

void ProgressPrinter::finish() {
    if (!quiet_ && terminal_) std::fprintf(stderr, "\n");
}

}  // namespace heatbead
