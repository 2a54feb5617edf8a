#include "post/cross_section.hpp"

#include "mesh/interpolation.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <iterator>
#include <limits>
#include <optional>
#include <stdexcept>
#include <string>
#include <unordered_map>

namespace heatbead::post {
namespace {

using Point = std::array<double, 2>;
constexpr std::uint32_t none = mesh::no_neighbour;

void require(bool ok, const std::string& what) {
    if (!ok) throw std::invalid_argument("cross section: " + what);
}

void check_field(const mesh::SolidCells& cells, std::span<const double> field) {
    require(field.size() == cells.size(), "field has " + std::to_string(field.size()) + " values for " +
                                              std::to_string(cells.size()) + " solid cells");
}

std::vector<double> centres(const mesh::Axis& axis) {
    std::vector<double> c(axis.cells());
    for (std::size_t i = 0; i < c.size(); ++i) c[i] = axis.centre(i);
    return c;
}

// One slice of a per-cell field, readable at cell centres and, interpolated, anywhere in the section.
class SliceField {
public:
    SliceField(const mesh::Grid& grid, const mesh::SolidCells& cells, std::span<const double> field,
               std::size_t slice)
        : grid_(grid), cells_(cells), field_(field), slice_(slice), yc_(centres(grid.y)), zc_(centres(grid.z)) {
        check_field(cells, field);
        require(slice < cells.nx, "slice " + std::to_string(slice) + " out of range");
    }

    std::size_t ny() const { return yc_.size(); }
    std::size_t nz() const { return zc_.size(); }
    const std::vector<double>& yc() const { return yc_; }
    const std::vector<double>& zc() const { return zc_; }
    const mesh::Grid& grid() const { return grid_; }
    const mesh::SolidCells& cells() const { return cells_; }

    std::uint32_t at(std::size_t j, std::size_t k) const { return cells_.at(j, k, ny()); }
    double value(std::uint32_t s) const { return field_[cells_.index(slice_, s)]; }

    // Bilinear between the four surrounding centres, over the solid ones only with their weights
    // renormalised (mesh/interpolation.hpp: beside a void the value is linear along the solid edge,
    // constant by a lone solid corner); nothing if no corner is solid.
    std::optional<double> sample(double y, double z) const {
        return read(y, z, [](const mesh::Corner&) { return true; });
    }
    // The same over the cells of one material only: a surface between two metals read from one side.
    std::optional<double> sample_in(double y, double z, mesh::Tag tag) const {
        return read(y, z, [&](const mesh::Corner& c) { return cells_.tag[c.s] == tag; });
    }

    // The solid cell holding (y, z) (a point on a face belongs to the cell above it), if any.
    std::uint32_t cell_holding(double y, double z) const {
        const auto& yf = grid_.y.faces;
        const auto& zf = grid_.z.faces;
        const auto j = std::upper_bound(yf.begin(), yf.end(), y) - yf.begin();
        const auto k = std::upper_bound(zf.begin(), zf.end(), z) - zf.begin();
        if (j == 0 || k == 0 || j == std::ssize(yf) || k == std::ssize(zf)) return none;
        return at(static_cast<std::size_t>(j - 1), static_cast<std::size_t>(k - 1));
    }

private:
    template <typename Usable>
    std::optional<double> read(double y, double z, Usable usable) const {
        return mesh::interpolate(mesh::section_corners(grid_, cells_, y, z), usable,
                                 [&](const mesh::Corner& c) { return value(c.s); });
    }

    const mesh::Grid& grid_;
    const mesh::SolidCells& cells_;
    std::span<const double> field_;
    std::size_t slice_;
    std::vector<double> yc_, zc_;
};

std::size_t slice_at(const mesh::Axis& x, double station) {
    require(station >= x.faces.front() && station <= x.faces.back(), "station outside the weld");
    const auto after = static_cast<std::size_t>(std::upper_bound(x.faces.begin(), x.faces.end(), station) -
                                                x.faces.begin());
    return std::min(after, x.cells()) - 1;
}

// ---- isolines -------------------------------------------------------------------------------------------

struct Segment {
    std::array<std::size_t, 2> edge;
};

// Lattice edges: from node (j, k) to (j+1, k) is 2·(j + ny·k), from (j, k) to (j, k+1) is 2·(j + ny·k) + 1.
std::size_t horizontal_edge(std::size_t j, std::size_t k, std::size_t ny) { return 2 * (j + ny * k); }
std::size_t vertical_edge(std::size_t j, std::size_t k, std::size_t ny) { return 2 * (j + ny * k) + 1; }

std::vector<Polyline> chain(const std::vector<Segment>& segments, const std::unordered_map<std::size_t, Point>& at) {
    std::unordered_map<std::size_t, std::vector<std::size_t>> touching;
    for (std::size_t n = 0; n < segments.size(); ++n)
        for (std::size_t e : segments[n].edge) touching[e].push_back(n);
    std::vector<bool> used(segments.size(), false);
    auto trace = [&](std::size_t first, std::size_t start_edge) {
        Polyline line;
        line.points.push_back(at.at(start_edge));
        std::size_t n = first, edge = start_edge;
        while (true) {
            used[n] = true;
            edge = segments[n].edge[0] == edge ? segments[n].edge[1] : segments[n].edge[0];
            line.points.push_back(at.at(edge));
            const auto& next = touching.at(edge);
            const auto it = std::find_if(next.begin(), next.end(), [&](std::size_t m) { return !used[m]; });
            if (it == next.end()) return line;
            n = *it;
        }
    };
    std::vector<Polyline> lines;
    // Open lines first, from an end (an edge crossing only one segment touches), then the closed loops.
    for (std::size_t n = 0; n < segments.size(); ++n) {
        if (used[n]) continue;
        for (std::size_t e : segments[n].edge) {
            if (touching.at(e).size() == 1) {
                lines.push_back(trace(n, e));
                break;
            }
        }
    }
    for (std::size_t n = 0; n < segments.size(); ++n)
        if (!used[n]) lines.push_back(trace(n, segments[n].edge[0]));
    return lines;
}

std::vector<Polyline> slice_isolines(const SliceField& f, double level) {
    const std::size_t ny = f.ny(), nz = f.nz();
    std::vector<Segment> segments;
    std::unordered_map<std::size_t, Point> crossing;
    for (std::size_t k = 0; k + 1 < nz; ++k) {
        for (std::size_t j = 0; j + 1 < ny; ++j) {
            // Corners counter-clockwise from (j, k); edge c runs from corner c to corner c+1.
            const std::array<std::size_t, 4> cj{j, j + 1, j + 1, j}, ck{k, k, k + 1, k + 1};
            std::array<double, 4> v{};
            bool all_solid = true;
            for (int c = 0; c < 4; ++c) {
                const std::uint32_t s = f.at(cj[c], ck[c]);
                all_solid = all_solid && s != none;
                if (s != none) v[c] = f.value(s);
            }
            if (!all_solid) continue;
            std::array<bool, 4> in{};
            for (int c = 0; c < 4; ++c) in[c] = v[c] >= level;
            const std::array<std::size_t, 4> edge{horizontal_edge(j, k, ny), vertical_edge(j + 1, k, ny),
                                                  horizontal_edge(j, k + 1, ny), vertical_edge(j, k, ny)};
            std::vector<std::size_t> cut;
            for (int c = 0; c < 4; ++c) {
                const int d = (c + 1) % 4;
                if (in[c] == in[d]) continue;
                cut.push_back(edge[c]);
                const double t = (level - v[c]) / (v[d] - v[c]);
                crossing.emplace(edge[c], Point{f.yc()[cj[c]] + t * (f.yc()[cj[d]] - f.yc()[cj[c]]),
                                                f.zc()[ck[c]] + t * (f.zc()[ck[d]] - f.zc()[ck[c]])});
            }
            if (cut.size() == 2) {
                segments.push_back({{cut[0], cut[1]}});
            } else if (cut.size() == 4) {
                // Saddle: the corners on the other side than the square's mean are cut off, each by a
                // segment between its two edges (edges c−1 and c meet at corner c).
                const bool centre_in = (v[0] + v[1] + v[2] + v[3]) / 4 >= level;
                for (int c = 0; c < 4; ++c)
                    if (in[c] != centre_in) segments.push_back({{edge[(c + 3) % 4], edge[c]}});
            }
        }
    }
    return chain(segments, crossing);
}

// ---- the fusion zone ------------------------------------------------------------------------------------

struct Frame {
    int side;
    double yw;       // web face y_w
    bool halved;     // two-sided joint: keep to this side of the web centre
    double y0;       // web centre
    bool in_half(double y) const { return !halved || side * (y - y0) > 0 || (y == y0 && side == 1); }
};

// Solid cells of the slice fused and connected through faces to a fused bead cell of this side.
std::vector<bool> fusion_zone(const SliceField& f, const Frame& frame, double solidus) {
    const mesh::SolidCells& cells = f.cells();
    std::vector<bool> zone(cells.ns, false);
    std::vector<std::uint32_t> todo;
    auto admit = [&](std::uint32_t s) {
        if (s == none || zone[s] || f.value(s) < solidus || !frame.in_half(f.yc()[cells.j[s]])) return;
        zone[s] = true;
        todo.push_back(s);
    };
    for (std::uint32_t s = 0; s < cells.ns; ++s)
        if (cells.tag[s] == mesh::Tag::weld) admit(s);
    while (!todo.empty()) {
        const std::uint32_t s = todo.back();
        todo.pop_back();
        for (std::uint32_t n : cells.neighbour[s]) admit(n);
    }
    return zone;
}

// Along a line of cells (a column or a row) from cell index i, whose value is >= level, step by dir while
// the next cell is solid, on this side and >= level; returns the coordinate where the field falls through
// `level`: linear between the last two centres, or the shared face when the next cell is void or on the
// other side. `cell_of(i)` gives the solid index of position i on the line or none.
template <typename CellOf>
double walk_line(const SliceField& f, const mesh::Axis& axis, CellOf cell_of, std::size_t i, int dir, double level,
                 const Frame& frame, bool along_y) {
    const std::size_t n = axis.cells();
    while (true) {
        const bool has_next = dir > 0 ? i + 1 < n : i > 0;
        const double face = dir > 0 ? axis.faces[i + 1] : axis.faces[i];
        if (!has_next) return face;
        const std::size_t next = dir > 0 ? i + 1 : i - 1;
        const std::uint32_t s = cell_of(next);
        if (s == none || (along_y && !frame.in_half(axis.centre(next)))) return face;
        const double here = f.value(cell_of(i)), there = f.value(s);
        if (there < level) {
            const double t = (here - level) / (here - there);
            return axis.centre(i) + t * (axis.centre(next) - axis.centre(i));
        }
        i = next;
    }
}

// Where a plate is reached deepest: the line index, its start cell on the line, the depth.
struct Deepest {
    std::size_t line = 0, start = 0;
    double depth = -std::numeric_limits<double>::infinity();
};

Deepest flange_penetration(const SliceField& f, const std::vector<bool>& zone, const Frame& frame, double solidus) {
    Deepest best;
    for (std::size_t j = 0; j < f.ny(); ++j) {
        std::size_t k = 0;
        while (k < f.nz() && !(f.at(j, k) != none && zone[f.at(j, k)])) ++k;
        if (k == f.nz()) continue;
        const auto column = [&](std::size_t kk) { return f.at(j, kk); };
        const double depth = -walk_line(f, f.grid().z, column, k, -1, solidus, frame, false);
        if (depth > best.depth) best = {j, k, depth};
    }
    return best;
}

Deepest web_penetration(const SliceField& f, const std::vector<bool>& zone, const Frame& frame,
                        const mesh::JointGeometry& joint, double solidus) {
    Deepest best;
    for (std::size_t k = 0; k < f.nz(); ++k) {
        const double z = f.zc()[k];
        if (z <= joint.root_gap || z >= joint.root_gap + joint.web_height) continue;
        std::optional<std::size_t> furthest;  // the zone cell of the row furthest into the web
        for (std::size_t j = 0; j < f.ny(); ++j) {
            const std::uint32_t s = f.at(j, k);
            if (s == none || !zone[s]) continue;
            if (!furthest || frame.side * (f.yc()[j] - f.yc()[*furthest]) < 0) furthest = j;
        }
        if (!furthest) continue;
        const auto row = [&](std::size_t jj) { return f.at(jj, k); };
        const double y = walk_line(f, f.grid().y, row, *furthest, -frame.side, solidus, frame, true);
        const double depth = frame.side * (frame.yw - y);
        if (depth > best.depth) best = {k, *furthest, depth};
    }
    return best;
}

// The first stretch of a straight line, from `origin` along the unit `dir` for up to `length`, where
// `fused(y, z)` holds; distances from origin.
struct Stretch {
    double begin, end;
};

template <typename Fused>
std::optional<Stretch> first_stretch(const SliceField& f, Point origin, Point dir, double length, Fused fused) {
    auto inside = [&](double s) { return fused(origin[0] + s * dir[0], origin[1] + s * dir[1]); };
    // Refine the change of `inside` between a and b (inside(a) != inside(b)) by bisection.
    auto edge = [&](double a, double b) {
        const bool at_a = inside(a);
        for (int n = 0; n < 40; ++n) {
            const double m = (a + b) / 2;
            (inside(m) == at_a ? a : b) = m;
        }
        return (a + b) / 2;
    };
    const double step = std::min(f.grid().y.min_width(), f.grid().z.min_width()) / 4;
    std::optional<double> begin;
    double previous = 0;
    for (double s = 0;; s = std::min(s + step, length)) {
        const bool in = inside(s);
        if (in && !begin) begin = s == 0 ? 0.0 : edge(previous, s);
        if (!in && begin) return Stretch{*begin, edge(previous, s)};
        if (s >= length) return begin ? std::optional<Stretch>{{*begin, length}} : std::nullopt;
        previous = s;
    }
}

// Metal of the section (mesh::material_at) whose interpolated peak reached `level`.
auto reached(const SliceField& f, const mesh::JointGeometry& joint, double level) {
    return [&f, &joint, level](double y, double z) {
        if (mesh::material_at(joint, y, z) == mesh::Tag::empty) return false;
        const std::optional<double> v = f.sample(y, z);
        return v && *v >= level;
    };
}

// A point of a plate's surface is fused where the plate itself melted there (read from the plate's own
// cells) or where the bead metal lying on it did (read from the bead's cells, within the bead's true
// outline, mesh::inside_bead): either way fused metal meets the plate there. Reading each side from its
// own cells keeps the hot bead from counting as melted plate, and the staircase of bead cells from
// cutting the leg short by half a cell.
auto fused_surface(const SliceField& f, const mesh::JointGeometry& joint, mesh::Tag plate, double level) {
    return [&f, &joint, plate, level](double y, double z) {
        const auto at = [&](mesh::Tag tag) {
            const std::optional<double> v = f.sample_in(y, z, tag);
            return v && *v >= level;
        };
        return (mesh::material_at(joint, y, z) == plate && at(plate)) ||
               (mesh::inside_bead(joint, y, z) && at(mesh::Tag::weld));
    };
}

// The line from `surface` along `inward` into a plate, up to `length`: fused when the peak there reached
// the solidus, then the distance to where it falls through it.
NormalLine normal_line(const SliceField& f, const mesh::JointGeometry& joint, Point surface, Point inward,
                       double length, double solidus) {
    NormalLine line;
    line.surface = surface, line.inward = inward;
    const auto stretch = first_stretch(f, surface, inward, length, reached(f, joint, solidus));
    line.fused = stretch && stretch->begin == 0;
    line.fusion_depth = line.fused ? stretch->end : 0.0;
    return line;
}

// Distance from the root corner along the bisector (direction (side, 1)/√2) to the bead face. The bead is
// star-shaped from its root corner, so the inside of the bead on this ray is one interval from 0.
double face_along_bisector(const mesh::JointGeometry& joint, const Frame& frame) {
    const double r = 1 / std::sqrt(2.0);
    double in = 0, out = joint.leg_flange + joint.leg_web;
    for (int n = 0; n < 60; ++n) {
        const double m = (in + out) / 2;
        (mesh::inside_bead(joint, frame.yw + frame.side * r * m, r * m) ? in : out) = m;
    }
    return (in + out) / 2;
}

struct Areas {
    double deposited = 0, melted_base = 0;
};

// Area of the zone above the solidus: full zone cells whose eight neighbours are in the zone count whole;
// every other solid cell next to the zone (fused or not) counts the fused share of its metal. A cell holds
// one metal: a plate's, over the whole cell, or the bead's, over its fill φ (mesh/bead_fill.hpp: the
// bead's face cuts cells, and the weld cells hold all of the bead). The fused share is that of its 8×8
// sample points in that metal (the bead's by its true outline, mesh::inside_bead) whose interpolated
// peak reached the solidus; a weld cell so thin that no sample lands in the bead is fused or not as its
// own peak says. Points of the bead are read from the bead's own cells where any is near (the molten bead
// is weld metal up to the plate, which the plate's cooler cells must not pull below the solidus); points
// of the plates from all cells around them, as the finite volumes see the bead–plate face. So the
// deposited area of a fully fused bead is the bead's own area, not that of its cells' boxes.
Areas fused_areas(const SliceField& f, const mesh::JointGeometry& joint, const std::vector<bool>& zone,
                  const Frame& frame, double solidus) {
    constexpr int samples = 8;
    const mesh::SolidCells& cells = f.cells();
    const mesh::Grid& grid = f.grid();
    const auto ny = static_cast<std::ptrdiff_t>(f.ny()), nz = static_cast<std::ptrdiff_t>(f.nz());
    const auto in_zone = [&](std::ptrdiff_t j, std::ptrdiff_t k) {
        if (j < 0 || k < 0 || j >= ny || k >= nz) return false;
        const std::uint32_t s = f.at(static_cast<std::size_t>(j), static_cast<std::size_t>(k));
        return s != none && zone[s];
    };
    std::vector<bool> seen(f.ny() * f.nz(), false);
    Areas areas;
    auto add = [&](std::size_t j, std::size_t k) {
        if (seen[j + f.ny() * k]) return;
        seen[j + f.ny() * k] = true;
        const std::uint32_t s = f.at(j, k);
        // Fused cells outside the zone belong to the other side or to a separate spot: not this bead's.
        if (s != none && !zone[s] && f.value(s) >= solidus) return;
        const double cell = grid.y.width(j) * grid.z.width(k);
        // A cut weld cell is only partly metal (mesh/bead_fill.hpp): it is sampled, never counted whole.
        bool interior = s != none && zone[s] && cells.fill[s] == 1;
        for (int dk = -1; dk <= 1 && interior; ++dk)
            for (int dj = -1; dj <= 1 && interior; ++dj)
                interior = in_zone(static_cast<std::ptrdiff_t>(j) + dj, static_cast<std::ptrdiff_t>(k) + dk);
        if (interior) {
            (cells.tag[s] == mesh::Tag::weld ? areas.deposited : areas.melted_base) += cell;
            return;
        }
        if (s == none) return;  // void: no metal (the bead's is all in weld cells)
        const bool bead = cells.tag[s] == mesh::Tag::weld;
        int in_metal = 0, fused = 0;
        for (int a = 0; a < samples; ++a)
            for (int b = 0; b < samples; ++b) {
                const double y = grid.y.faces[j] + (a + 0.5) / samples * grid.y.width(j);
                const double z = grid.z.faces[k] + (b + 0.5) / samples * grid.z.width(k);
                if (!frame.in_half(y) || (bead && !mesh::inside_bead(joint, y, z))) continue;
                ++in_metal;
                std::optional<double> v = bead ? f.sample_in(y, z, mesh::Tag::weld) : std::nullopt;
                if (!v) v = f.sample(y, z);
                if (v && *v >= solidus) ++fused;
            }
        if (bead) {
            const double share = in_metal > 0 ? static_cast<double>(fused) / in_metal : f.value(s) >= solidus;
            areas.deposited += cells.fill[s] * cell * share;
        } else {
            areas.melted_base += cell * fused / (samples * samples);
        }
    };
    for (std::uint32_t s = 0; s < cells.ns; ++s) {
        if (!zone[s]) continue;
        for (int dk = -1; dk <= 1; ++dk)
            for (int dj = -1; dj <= 1; ++dj) {
                const auto jj = static_cast<std::ptrdiff_t>(cells.j[s]) + dj;
                const auto kk = static_cast<std::ptrdiff_t>(cells.k[s]) + dk;
                if (jj < 0 || kk < 0 || jj >= ny || kk >= nz) continue;
                add(static_cast<std::size_t>(jj), static_cast<std::size_t>(kk));
            }
    }
    return areas;
}

}  // namespace

std::vector<Polyline> isolines(const mesh::Grid& grid, const mesh::SolidCells& cells, std::span<const double> field,
                               std::size_t slice, double level) {
    return slice_isolines(SliceField(grid, cells, field, slice), level);
}

CrossSection measure_cross_section(const mesh::JointGeometry& joint, const mesh::Grid& grid,
                                   const mesh::SolidCells& cells, std::span<const double> peak, double station,
                                   int side, const SectionLevels& levels, double root_margin) {
    mesh::validate(joint);
    require(side == 1 || (side == -1 && joint.sides == 2), "side must be +1, or -1 on a two-sided joint");
    require(levels.ac1 <= levels.ac3 && levels.ac3 <= levels.solidus, "levels must be Ac1 <= Ac3 <= solidus");
    require(root_margin >= 0, "root margin must be >= 0");

    CrossSection cs;
    cs.station = station;
    cs.side = side;
    cs.slice = slice_at(grid.x, station);
    const SliceField f(grid, cells, peak, cs.slice);
    const Frame frame{side, joint.web_face(side), joint.sides == 2, joint.web_offset};

    cs.fusion_line = slice_isolines(f, levels.solidus);
    cs.ac1_line = slice_isolines(f, levels.ac1);
    cs.ac3_line = slice_isolines(f, levels.ac3);
    cs.design_throat = mesh::design_throat(mesh::fillet_of(joint));
    // The probe lines: under the flange leg's middle and its toe, straight down; across the web at the
    // middle of the web leg (above the root gap) and at its toe, straight in.
    const double into_web = joint.sides == 2 ? joint.web_thickness / 2 : joint.web_thickness;
    const double web_middle = joint.root_gap + (joint.leg_web - joint.root_gap) / 2;
    const auto flange_line = [&](double a) {
        return normal_line(f, joint, {frame.yw + side * a, 0.0}, {0.0, -1.0}, joint.flange_thickness, levels.solidus);
    };
    const auto web_line = [&](double z) {
        return normal_line(f, joint, {frame.yw, z}, {-double(side), 0.0}, into_web, levels.solidus);
    };
    cs.flange_mid = flange_line(joint.leg_flange / 2), cs.flange_toe = flange_line(joint.leg_flange);
    cs.web_mid = web_line(web_middle), cs.web_toe = web_line(joint.leg_web);

    const std::vector<bool> zone = fusion_zone(f, frame, levels.solidus);
    if (std::find(zone.begin(), zone.end(), true) == zone.end()) {
        cs.lack_of_fusion_flange = cs.lack_of_fusion_web = true;
        return cs;
    }

    const Deepest flange = flange_penetration(f, zone, frame, levels.solidus);
    cs.penetration_flange = flange.depth;
    const auto column = [&](std::size_t kk) { return f.at(flange.line, kk); };
    cs.haz_width_flange =
        -walk_line(f, grid.z, column, flange.start, -1, levels.ac1, frame, false) - flange.depth;

    const Deepest web = web_penetration(f, zone, frame, joint, levels.solidus);
    if (web.depth > -std::numeric_limits<double>::infinity()) {
        cs.penetration_web = web.depth;
        const auto row = [&](std::size_t jj) { return f.at(jj, web.line); };
        const double y = walk_line(f, grid.y, row, web.start, -side, levels.ac1, frame, true);
        cs.haz_width_web = side * (frame.yw - y) - web.depth;
    }  // else no zone cell in any web row (the zone stays below the web edge): 0, lack of fusion
    cs.lack_of_fusion_flange = cs.penetration_flange <= 0;
    cs.lack_of_fusion_web = cs.penetration_web <= 0;

    const Point root{frame.yw, 0.0};
    // A leg is where the fused metal meets the plate surface, as a gauge reads it: along the surface
    // from the root corner, fused where the plate melted or the bead on it did (fused_surface).
    const auto reach = [&](Point direction, double length, mesh::Tag plate) {
        const auto stretch = first_stretch(f, root, direction, length, fused_surface(f, joint, plate, levels.solidus));
        return stretch ? stretch->end : 0.0;
    };
    const double flange_room = joint.flange_width / 2 - side * frame.yw, web_room = joint.root_gap + joint.web_height;
    cs.fused_leg_flange = reach({double(side), 0.0}, flange_room, mesh::Tag::flange);
    cs.fused_leg_web = reach({0.0, 1.0}, web_room, mesh::Tag::web);

    // Bisector: back from the root into the plates (under the web edge, into the flange) for the
    // penetration beyond the root; if the root did not fuse, forward to the first fused point instead.
    const double r = 1 / std::sqrt(2.0);
    const double to_face = face_along_bisector(joint, frame);
    const auto back = first_stretch(f, root, {-side * r, -r}, std::sqrt(2.0) * joint.flange_thickness,
                                    reached(f, joint, levels.solidus));
    if (back && back->begin == 0) {
        cs.actual_throat = to_face + back->end;
    } else {
        const auto forward = first_stretch(f, root, {side * r, r}, to_face, reached(f, joint, levels.solidus));
        cs.actual_throat = forward ? to_face - forward->begin : 0.0;
    }

    const Areas areas = fused_areas(f, joint, zone, frame, levels.solidus);
    cs.deposited_area = areas.deposited;
    cs.melted_base_area = areas.melted_base;
    cs.fused_area = areas.deposited + areas.melted_base;
    cs.dilution = cs.fused_area > 0 ? cs.melted_base_area / cs.fused_area : 0.0;

    auto fused_at = [&](double y, double z) {
        const std::uint32_t s = f.cell_holding(y, z);
        const std::optional<double> v = f.sample(y, z);
        return s != none && zone[s] && v && *v >= levels.solidus;
    };
    cs.root_fused = fused_at(frame.yw, -root_margin) && fused_at(frame.yw - side * root_margin, joint.root_gap);
    return cs;
}

std::vector<CrossSection> along_weld(const mesh::JointGeometry& joint, const mesh::Grid& grid,
                                     const mesh::SolidCells& cells, std::span<const double> peak, double spacing,
                                     int side, const SectionLevels& levels) {
    require(spacing > 0, "spacing along the weld must be > 0");
    const double length = grid.x.faces.back();
    std::vector<CrossSection> sections;
    // Counting stations avoids accumulating rounding in x; the last one may land on L itself.
    const auto count = static_cast<std::size_t>(std::floor(length / spacing * (1 + 1e-12))) + 1;
    for (std::size_t n = 0; n < count; ++n)
        sections.push_back(measure_cross_section(joint, grid, cells, peak,
                                                 std::min(static_cast<double>(n) * spacing, length), side, levels));
    return sections;
}

}  // namespace heatbead::post
