// Storage index of the solid cells of a grid: the solver keeps its fields only for these, as flat
// arrays (structure of arrays), so void cells cost no memory and no bandwidth.
//
// The joint's cross-section is the same at every x, so the solid cells are indexed slice by slice:
// cell (i, s) has index i·ns + s, where s runs over the solid cells of one cross-section in (k, j)
// order. Neighbours along x are ±ns away; neighbours in the section come from a small table.
#pragma once

#include "mesh/grid.hpp"

#include <array>
#include <cstdint>
#include <limits>
#include <vector>

namespace heatbead::mesh {

// Loops over fewer cells than this run on one thread: below it, starting threads costs more
// than the work (measured: a 200-cell column ran 18x slower on 2 threads than on 1).
inline constexpr std::size_t parallel_min_cells = 1 << 14;

inline constexpr std::uint32_t no_neighbour = std::numeric_limits<std::uint32_t>::max();

struct SolidCells {
    std::size_t nx = 0, ns = 0;
    std::vector<std::uint32_t> j, k;  // section position of each s
    std::vector<Tag> tag;             // material of each s
    // Solid neighbour of s on each side (SectionSide order), or no_neighbour (a free surface).
    std::vector<std::array<std::uint32_t, 4>> neighbour;
    // The metal of each s (mesh/bead_fill.hpp; plate cells are full): the share φ of its cross-section,
    // the share of each face (SectionSide order) and the length of the bead's free face inside it.
    std::vector<double> fill;
    std::vector<std::array<double, 4>> face_fill;
    std::vector<double> free_face;
    // True where the face on that side is a web–flange contact (the web edge resting on the
    // flange): heat crosses it through a contact conductance until the metal there fuses.
    std::vector<std::array<bool, 4>> contact;
    // Section position (j + ny·k) → s, or no_neighbour for a void position.
    std::vector<std::uint32_t> section_index;

    std::size_t size() const { return nx * ns; }
    std::size_t index(std::size_t i, std::size_t s) const { return i * ns + s; }
    std::uint32_t at(std::size_t jj, std::size_t kk, std::size_t ny) const { return section_index[jj + ny * kk]; }
};

SolidCells index_solid_cells(const Grid& grid);

}  // namespace heatbead::mesh
