// Transformation temperatures of the base metal from its composition.
#pragma once

#include "solver/weldability/composition.hpp"

namespace heatbead {

// Andrews (1965), J. Iron Steel Inst. 203:721, mass per cent (As and W taken as 0):
//   Ac1 = 723 − 10.7 Mn − 16.9 Ni + 29.1 Si + 16.9 Cr                [°C]
//   Ac3 = 910 − 203 √C − 15.2 Ni + 44.7 Si + 104 V + 31.5 Mo         [°C]
// They bound the HAZ: above Ac1 the steel starts to turn to austenite, above Ac3 it has fully.
double andrews_ac1(const Composition& c);
double andrews_ac3(const Composition& c);

}  // namespace heatbead
