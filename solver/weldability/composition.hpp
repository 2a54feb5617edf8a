// The chemical composition of a steel, in mass per cent: what every weldability formula reads.
#pragma once

namespace heatbead {

struct Composition {
    double C = 0, Mn = 0, Si = 0, Cr = 0, Mo = 0, V = 0, Ni = 0, Cu = 0, Nb = 0, B = 0;
};

}  // namespace heatbead
