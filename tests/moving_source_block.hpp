// A block of solid cells standing in for a semi-infinite body, and a moving double-ellipsoid source
// on its surface: the setting of the analytic solutions in tests/analytic (constant properties,
// adiabatic faces). Shared by the solver's and the fit's tests against those solutions.
#pragma once

#include "mesh/grading.hpp"
#include "mesh/grid.hpp"
#include "solver/physics/material.hpp"
#include "solver/numerics/simulation.hpp"
#include "tests/analytic/moving_sources.hpp"

#include <array>
#include <cmath>
#include <memory>
#include <string>
#include <vector>

namespace heatbead::testing {

// A rectangular block of solid cells (tagged flange) on the given faces.
inline mesh::Grid block(std::vector<double> xf, std::vector<double> yf, std::vector<double> zf) {
    mesh::Grid g;
    g.x.faces = std::move(xf), g.y.faces = std::move(yf), g.z.faces = std::move(zf);
    g.section_tags.assign(g.y.cells() * g.z.cells(), mesh::Tag::flange);
    return g;
}

// Constant properties, no phase change within reach (melting range far above any temperature).
inline Material constant_material(double k, double rho, double c, MaterialParameters p = {2800, 2900, 0, 1}) {
    return Material("constant properties", rho, [k](double) { return k; }, [c](double) { return c; }, p);
}

inline SurfaceLosses adiabatic_everywhere() {
    SurfaceLosses l{0, 0, 20, 0, {}};
    l.adiabatic.fill(true);
    return l;
}

// A moving double-ellipsoid source on the surface of a block that stands in for a semi-infinite
// body (adiabatic everywhere, as the analytic solutions assume).
struct MovingSourceRun {
    double k = 30, rho = 7850, c = 640, Q = 3000, v = 5e-3, weld = 60e-3;
    SourceShape shape;
    mesh::Grid grid;
    MovingSourceRun(double a, double b, double cf, double cr, double h) {
        shape.half_width = a, shape.depth = b, shape.front_length = cf, shape.rear_length = cr;
        const mesh::Spacing sp{h, 6e-3, 1.15};
        // Heat spreads about 4√(αt) ≈ 30 mm in the time simulated: the faces at 40 mm are far.
        grid = block(mesh::graded_faces(-10e-3, 70e-3, 0, 60e-3, {h, h, 1}, {}),
                     mesh::graded_faces(-40e-3, 40e-3, -10e-3, 10e-3, sp, {}),
                     mesh::graded_faces(-40e-3, 0, -8e-3, 0, sp, {}));
    }
    analytic::Properties props() const { return {k, rho * c}; }
    analytic::DoubleEllipsoid analytic_source() const {
        return {Q, shape.half_width, shape.depth, shape.front_length, shape.rear_length, v, 0, weld / v};
    }
    Pass pass() const {
        Pass p;
        const double speed = v, length = weld;
        // Origin on the surface z = 0 moving along +x; depth axis −z; length × width = depth.
        p.path = [speed, length](double start) {
            return TorchPath{{0, 0, 0}, speed, start, start + length / speed, {1, 0, 0}, {0, -1, 0}, {0, 0, -1}};
        };
        p.shape = shape;
        p.net_power = Q;
        return p;
    }
    std::unique_ptr<Simulation> simulation(const Material& m, std::string integrator, double stop,
                                           double time_limit) const {
        RunSettings s;
        s.initial_temperature = 20;
        s.stop.temperature = stop;
        s.time_limit = time_limit;
        s.integrator = std::move(integrator);
        return std::make_unique<Simulation>(grid, m, adiabatic_everywhere(), std::vector<Pass>{pass()}, s);
    }
    // A probe at the cell centre nearest to (x, y, z).
    std::array<double, 3> centre_near(double x, double y, double z) const {
        const auto nearest = [](const mesh::Axis& a, double wanted) {
            std::size_t best = 0;
            for (std::size_t i = 0; i < a.cells(); ++i) {
                if (std::abs(a.centre(i) - wanted) < std::abs(a.centre(best) - wanted)) best = i;
            }
            return a.centre(best);
        };
        return {nearest(grid.x, x), nearest(grid.y, y), nearest(grid.z, z)};
    }
};

inline double value_at(const Probe& p, double t) {
    for (std::size_t i = 1; i < p.time.size(); ++i) {
        if (p.time[i] >= t) {
            const double w = (t - p.time[i - 1]) / (p.time[i] - p.time[i - 1]);
            return p.temperature[i - 1] + w * (p.temperature[i] - p.temperature[i - 1]);
        }
    }
    return p.temperature.back();
}

}  // namespace heatbead::testing
