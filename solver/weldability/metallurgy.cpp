#include "solver/weldability/metallurgy.hpp"

#include <cmath>

namespace heatbead {

double andrews_ac1(const Composition& c) { return 723 - 10.7 * c.Mn - 16.9 * c.Ni + 29.1 * c.Si + 16.9 * c.Cr; }

double andrews_ac3(const Composition& c) {
    return 910 - 203 * std::sqrt(c.C) - 15.2 * c.Ni + 44.7 * c.Si + 104 * c.V + 31.5 * c.Mo;
}

}  // namespace heatbead
