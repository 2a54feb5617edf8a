// Carbon equivalents: one number for how readily a steel's HAZ hardens, from its composition
// (mass per cent). Each formula with its published source.
#pragma once

#include "solver/weldability/composition.hpp"

#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

// IIW: CE = C + Mn/6 + (Cr + Mo + V)/5 + (Ni + Cu)/15
double carbon_equivalent_iiw(const Composition& c);
// Ito & Bessyo (1968): Pcm = C + Si/30 + (Mn + Cu + Cr)/20 + Ni/60 + Mo/15 + V/10 + 5B
double carbon_equivalent_pcm(const Composition& c);
// Yurioka (1983, Weld. J. 62:147s):
//   CEN = C + A(C)·[Si/24 + Mn/6 + Cu/15 + Ni/20 + (Cr + Mo + Nb + V)/5 + 5B],
//   A(C) = 0.75 + 0.25·tanh(20 (C − 0.12))   (coefficients from memory)
double carbon_equivalent_cen(const Composition& c);
// EN 1011-2:2001 Annex C.3: CET = C + (Mn + Mo)/10 + (Cr + Cu)/20 + Ni/40
double carbon_equivalent_cet(const Composition& c);

struct CarbonEquivalents {
    double iiw = 0, pcm = 0, cen = 0, cet = 0;
};
CarbonEquivalents carbon_equivalents(const Composition& c);

// The mass per cent of an element by its symbol ("C", "Mn", …); throws for an unknown symbol.
double element(const Composition& c, std::string_view symbol);

// An element's range in which a formula was fitted, mass per cent.
struct ElementRange {
    std::string_view symbol;
    double lo, hi;
};

// One message per element outside its range, e.g. "C 0.45 % is above 0.32 % (<what>)".
std::vector<std::string> outside_ranges(const Composition& c, std::span<const ElementRange> ranges,
                                        std::string_view what);

}  // namespace heatbead
