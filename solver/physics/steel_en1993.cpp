#include "solver/physics/steel_en1993.hpp"

#include <algorithm>

namespace heatbead::en1993 {

double conductivity(double theta) {
    const double t = std::clamp(theta, 20.0, 1200.0);
    return t < 800.0 ? 54.0 - 3.33e-2 * t : 27.3;
}

double specific_heat(double theta) {
    const double t = std::clamp(theta, 20.0, 1200.0);
    if (t < 600.0) return 425.0 + 7.73e-1 * t - 1.69e-3 * t * t + 2.22e-6 * t * t * t;
    if (t < 735.0) return 666.0 + 13002.0 / (738.0 - t);
    if (t <= 900.0) return 545.0 + 17820.0 / (t - 731.0);
    return 650.0;
}

}  // namespace heatbead::en1993
