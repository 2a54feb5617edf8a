#include "mesh/solid_cells.hpp"

#include <stdexcept>

namespace heatbead::mesh {

namespace {
bool is_contact(Tag a, Tag b) {
    return (a == Tag::web && b == Tag::flange) || (a == Tag::flange && b == Tag::web);
}
}  // namespace

SolidCells index_solid_cells(const Grid& grid) {
    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();
    SolidCells cells;
    cells.nx = grid.x.cells();
    auto& section_index = cells.section_index;
    section_index.assign(ny * nz, no_neighbour);
    for (std::size_t kk = 0; kk < nz; ++kk) {
        for (std::size_t jj = 0; jj < ny; ++jj) {
            const Tag t = grid.tag(jj, kk);
            if (t == Tag::empty) continue;
            section_index[jj + ny * kk] = static_cast<std::uint32_t>(cells.j.size());
            cells.j.push_back(static_cast<std::uint32_t>(jj));
            cells.k.push_back(static_cast<std::uint32_t>(kk));
            cells.tag.push_back(t);
            const CellFill& metal = grid.fill(jj, kk);
            cells.fill.push_back(metal.area);
            cells.face_fill.push_back(metal.faces);
            cells.free_face.push_back(metal.free_face);
        }
    }
    cells.ns = cells.j.size();
    if (static_cast<double>(cells.nx) * static_cast<double>(cells.ns) >= static_cast<double>(no_neighbour)) {
        throw std::invalid_argument("index_solid_cells: more solid cells than 32-bit indices address");
    }
    cells.neighbour.resize(cells.ns);
    cells.contact.resize(cells.ns);
    for (std::size_t s = 0; s < cells.ns; ++s) {
        const std::size_t jj = cells.j[s], kk = cells.k[s];
        const std::array<bool, 4> exists{jj > 0, jj + 1 < ny, kk > 0, kk + 1 < nz};
        const std::array<std::size_t, 4> at{jj - 1 + ny * kk, jj + 1 + ny * kk, jj + ny * (kk - 1), jj + ny * (kk + 1)};
        for (int side = 0; side < 4; ++side) {
            const std::uint32_t other = exists[side] ? section_index[at[side]] : no_neighbour;
            cells.neighbour[s][side] = other;
            cells.contact[s][side] = other != no_neighbour && is_contact(cells.tag[s], cells.tag[other]);
        }
    }
    return cells;
}

}  // namespace heatbead::mesh
