#include "solver/app/progress.hpp"

#include "solver/core/text.hpp"

#include <algorithm>
#include <cmath>
#include <unistd.h>

namespace heatbead {

ProgressPrinter::ProgressPrinter(bool quiet, double expected_time)
    : quiet_(quiet),
      terminal_(::isatty(STDERR_FILENO) == 1),
      expected_(expected_time),
      start_(std::chrono::steady_clock::now()),
      last_(start_) {}

void ProgressPrinter::update(double t, double arc_x, double dt, double max_temperature) {
    if (quiet_) return;
    const auto now = std::chrono::steady_clock::now();
    // A terminal line is redrawn up to ten times a second; a log gets a line every five seconds.
    const double gap = std::chrono::duration<double>(now - last_).count();
    if (gap < (terminal_ ? 0.1 : 5.0)) return;
    last_ = now;
    const double wall = std::chrono::duration<double>(now - start_).count();
    const double eta = t > 0 ? std::max(0.0, wall * (expected_ / t - 1)) : 0.0;
    const std::string arc = std::isnan(arc_x) ? "arc off" : format_text("arc at %5.1f mm", arc_x * 1e3);
    std::fprintf(stderr, "%s  t %7.2f s  %s  step %.3g s  hottest %5.0f degC  elapsed %.0f s  eta ~%.0f s%s",
                 terminal_ ? "\r" : "", t, arc.c_str(), dt, max_temperature, wall, eta, terminal_ ? "   " : "\n");
    std::fflush(stderr);
}

void ProgressPrinter::finish() {
    if (!quiet_ && terminal_) std::fprintf(stderr, "\n");
}

}  // namespace heatbead
