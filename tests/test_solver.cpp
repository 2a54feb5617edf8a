// The solver, one physical piece at a time, against analytic solutions (tests/analytic):
// boundary losses (erfc), latent heat (Neumann), a moving source (Rosenthal; the transient
// double-ellipsoid solution), convergence in space and time, and energy conservation.
#include "mesh/grading.hpp"
#include "mesh/grid.hpp"
#include "post/cross_section.hpp"
#include "solver/numerics/integrators.hpp"
#include "solver/numerics/simulation.hpp"
#include "solver/studies/run_setup.hpp"
#include "tests/analytic/conduction_1d.hpp"
#include "tests/analytic/moving_sources.hpp"
#include "tests/moving_source_block.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <omp.h>

using namespace heatbead;
using namespace heatbead::testing;

namespace {

std::vector<double> uniform(double lo, double hi, std::size_t n) {
    std::vector<double> f(n + 1);
    for (std::size_t i = 0; i <= n; ++i) f[i] = lo + (hi - lo) * static_cast<double>(i) / static_cast<double>(n);
    f.back() = hi;
    return f;
}

// Advances a field with the operator alone (no source) from T0 to t_end with steps ≤ dt_max.
struct Column {
    mesh::Grid grid;
    mesh::SolidCells cells;
    ConductionOperator op;
    std::vector<double> H, T;
    std::vector<std::uint8_t> active;
    Column(mesh::Grid g, const Material& m, SurfaceLosses losses, double T0)
        : grid(std::move(g)), cells(mesh::index_solid_cells(grid)), op(grid, cells, m, losses),
          H(cells.size(), m.enthalpy(T0)), T(cells.size(), T0), active(cells.size(), 1) {}
    void advance(Integrator& integ, double t_end, double dt_max) {
        for (double t = 0; t < t_end - 1e-12;) {
            op.prepare(T, active, {}, std::nan(""), 1);
            const double dt = std::min({dt_max, integ.max_step(op.stable_step()), t_end - t});
            integ.step(op, H, T, dt);
            t += dt;
        }
    }
};

// Semi-infinite solid heated through its surface z = 0 by a fluid at T∞ with coefficient h: the
// column's top face loses h(T − T∞), every other face is adiabatic.
struct ConvectiveProblem {
    double k = 30, rho = 7850, c = 600, h = 2e4, T0 = 20, T_inf = 1020, depth = 0.02, t_end = 4;
    analytic::Properties props() const { return {k, rho * c}; }
    SurfaceLosses losses() const {
        SurfaceLosses l{h, 0, T_inf, 0, {}};
        l.adiabatic.fill(true);
        l.adiabatic[5] = false;  // z+ is the heated surface
        return l;
    }
    mesh::Grid grid(std::size_t n) const { return block({0, 1e-3}, {0, 1e-3}, uniform(-depth, 0, n)); }
};

// Largest error against the analytic solution at cell centres within 4 mm of the surface.
double convective_error(const ConvectiveProblem& pb, std::size_t n, Integrator& integ, double dt_max) {
    const Material m = constant_material(pb.k, pb.rho, pb.c);
    Column col(pb.grid(n), m, pb.losses(), pb.T0);
    col.advance(integ, pb.t_end, dt_max);
    double worst = 0;
    for (std::size_t kk = 0; kk < col.grid.z.cells(); ++kk) {
        const double depth = -col.grid.z.centre(kk);
        if (depth > 4e-3) continue;
        const double exact = analytic::convective_surface_temperature(pb.props(), pb.T0, pb.h, pb.T_inf, depth, pb.t_end);
        worst = std::max(worst, std::abs(col.T[kk] - exact));
    }
    return worst;
}

}  // namespace

TEST_CASE("surface convection matches the erfc solution and converges at second order", "[solver]") {
    // Semi-infinite solid with a convective surface: Carslaw & Jaeger, Conduction of Heat in Solids,
    // 2nd ed. (1959) §2.7 (section from memory); any heat-transfer textbook has it under transient
    // conduction. tests/analytic/conduction_1d.
    ConvectiveProblem pb;
    ExplicitEuler euler(400);
    const double e1 = convective_error(pb, 50, euler, 1e9);   // 0.4 mm
    const double e2 = convective_error(pb, 100, euler, 1e9);  // 0.2 mm
    const double e3 = convective_error(pb, 200, euler, 1e9);  // 0.1 mm
    INFO("errors " << e1 << " " << e2 << " " << e3 << " K");
    CHECK(e2 < 0.01 * (pb.T_inf - pb.T0));  // within 1 % of the temperature span at 0.2 mm
    // Halving the spacing: order log2(e1/e2) ≥ 1.5 (cell-centred finite volumes are second order).
    CHECK(std::log2(e1 / e2) >= 1.5);
    CHECK(std::log2(e2 / e3) >= 1.5);
}

TEST_CASE("time integrators converge at their order", "[solver]") {
    // Same problem; reference = rkl2 with a tiny step. Forward Euler is first order, RKL2 second
    // order (Meyer, Balsara & Aslam, J. Comput. Phys. 257 (2014) 594, from memory).
    ConvectiveProblem pb;
    pb.t_end = 2;
    const std::size_t n = 100;
    const Material m = constant_material(pb.k, pb.rho, pb.c);
    const auto solve = [&](Integrator& integ, double dt) {
        Column col(pb.grid(n), m, pb.losses(), pb.T0);
        col.advance(integ, pb.t_end, dt);
        return col.T;
    };
    RungeKuttaLegendre2 rkl(n);
    const auto reference = solve(rkl, 1e-3);
    const auto error = [&](const std::vector<double>& T) {
        double worst = 0;
        for (std::size_t i = 0; i < T.size(); ++i) worst = std::max(worst, std::abs(T[i] - reference[i]));
        return worst;
    };
    const double r1 = error(solve(rkl, 0.2)), r2 = error(solve(rkl, 0.1)), r3 = error(solve(rkl, 0.05));
    INFO("rkl2 errors " << r1 << " " << r2 << " " << r3);
    CHECK(std::log2(r1 / r2) > 1.7);
    CHECK(std::log2(r2 / r3) > 1.7);
    // Forward Euler at a quarter and an eighth of its stable step.
    Column probe(pb.grid(n), m, pb.losses(), pb.T0);
    probe.op.prepare(probe.T, probe.active, {}, std::nan(""), 1);
    const double dt_e = probe.op.stable_step();
    ExplicitEuler euler(n);
    const double x1 = error(solve(euler, dt_e / 4)), x2 = error(solve(euler, dt_e / 8));
    INFO("explicit errors " << x1 << " " << x2);
    CHECK(std::log2(x1 / x2) > 0.8);
    CHECK(std::log2(x1 / x2) < 1.3);
}

TEST_CASE("melting front follows Neumann's solution", "[solver]") {
    // Two-phase Stefan problem, semi-infinite solid melted from a surface held above T_m
    // (Carslaw & Jaeger 1959 §11.2, from memory; tests/analytic NeumannMelting). The surface is held by a very
    // large convection coefficient; the latent heat is spread over a 10 K mushy range centred on
    // T_m. Front = depth where T crosses T_m, interpolated between cell centres.
    // Heat reaches about 4√(αt) ≈ 10 mm in the time simulated; the column is 20 mm deep.
    const double k = 30, rho = 7850, c = 650, L = 270e3, Tm = 1495, Ts = 2200, T0 = 20, t_end = 1.0;
    const Material m = constant_material(k, rho, c, {Tm - 5, Tm + 5, L, 1});
    const analytic::Properties p{k, rho * c};
    const analytic::NeumannMelting exact({p, p, rho * L, Tm, T0, Ts});
    SurfaceLosses losses{1e8, 0, Ts, 0, {}};
    losses.adiabatic.fill(true);
    losses.adiabatic[5] = false;
    // Fine cells (10 µm) over the melted depth, graded to 20 mm so the far face is never reached.
    const auto z = mesh::graded_faces(-20e-3, 0, -2.5e-3, 0, {10e-6, 0.5e-3, 1.1}, {});
    Column col(block({0, 1e-4}, {0, 1e-4}, z), m, losses, T0);
    RungeKuttaLegendre2 rkl(col.cells.size());
    col.advance(rkl, t_end, 2e-3);
    double front = 0;
    for (std::size_t kk = col.grid.z.cells() - 1; kk > 0; --kk) {
        const double a = col.T[kk], b = col.T[kk - 1];  // kk is nearer the surface
        if (a >= Tm && b < Tm) {
            const double za = -col.grid.z.centre(kk), zb = -col.grid.z.centre(kk - 1);
            front = za + (a - Tm) / (a - b) * (zb - za);
            break;
        }
    }
    INFO("front " << front * 1e3 << " mm, Neumann " << exact.front(t_end) * 1e3 << " mm");
    CHECK(front == Approx(exact.front(t_end)).epsilon(0.03));
}


TEST_CASE("a small moving source reproduces Rosenthal's thick-plate solution", "[solver][slow]") {
    // Rosenthal (1946), quasi-steady point source on a semi-infinite body, constant properties:
    // T − T0 = Q/(2πkR)·exp(−v(R + ξ)/(2α)). A 1 mm source; points at least 3 source widths
    // (6 mm) from it, compared while the arc is still on, 11 s (55 mm) after the start.
    MovingSourceRun run(1e-3, 1e-3, 1e-3, 1e-3, 0.5e-3);
    const Material m = constant_material(run.k, run.rho, run.c);
    const double t_check = 11.0;
    auto sim = run.simulation(m, "rkl2", 300, t_check + 0.5);
    const double x_arc = run.v * t_check;
    const std::vector<std::array<double, 3>> wanted{
        {x_arc - 12e-3, 4e-3, 0}, {x_arc - 8e-3, 6e-3, -2e-3}, {x_arc - 20e-3, 3e-3, -3e-3},
        {x_arc, 7e-3, 0},         {x_arc - 6e-3, 0, -6e-3},    {x_arc - 30e-3, 8e-3, -4e-3}};
    for (std::size_t i = 0; i < wanted.size(); ++i) {
        sim->add_probe("p" + std::to_string(i), run.centre_near(wanted[i][0], wanted[i][1], wanted[i][2]));
    }
    std::atomic<bool> stop{false};
    sim->run(stop);
    for (const auto& p : sim->probes()) {
        const double xi = p.position[0] - x_arc;
        const double exact = 20 + analytic::rosenthal_thick_plate(run.Q, run.v, run.props(), xi, p.position[1], p.position[2]);
        const double got = value_at(p, t_check);
        INFO(p.name << " xi " << xi * 1e3 << " mm: simulated " << got << ", Rosenthal " << exact);
        CHECK((got - 20) == Approx(exact - 20).epsilon(0.05));
    }
}

TEST_CASE("peaks and t8/5 match the transient double-ellipsoid solution", "[solver][slow]") {
    // Transient double-ellipsoid source in a semi-infinite body (time-integral form after Nguyen
    // et al. 1999, with the exact front/rear split; tests/analytic): peak temperature and t8/5 at
    // points outside the source, within 3 %.
    MovingSourceRun run(3e-3, 3e-3, 3e-3, 6e-3, 0.5e-3);
    const Material m = constant_material(run.k, run.rho, run.c);
    auto sim = run.simulation(m, "rkl2", 450, 40);
    const RecordedHistory recorded = record_history(*sim, 20);
    const std::vector<std::array<double, 3>> wanted{{30e-3, 5e-3, 0}, {30e-3, 4e-3, -3e-3}, {40e-3, 0, -5e-3},
                                                   {40e-3, 5e-3, -1e-3}};
    for (std::size_t i = 0; i < wanted.size(); ++i) {
        sim->add_probe("p" + std::to_string(i), run.centre_near(wanted[i][0], wanted[i][1], wanted[i][2]));
    }
    std::atomic<bool> stop{false};
    const RunResult result = sim->run(stop);
    INFO("steps " << result.steps << ", stages " << result.stages << ", cells " << sim->cells().size());
    for (const auto& p : sim->probes()) {
        const auto exact = analytic::peak_and_cooling(run.analytic_source(), run.props(), p.position[0], p.position[1],
                                                      p.position[2], 20, {0, 30, 600});
        const auto simulated = analytic::peak_and_cooling([&](double t) { return value_at(p, t); }, {0, 30, 3000});
        INFO(p.name << " at (" << p.position[0] * 1e3 << ", " << p.position[1] * 1e3 << ", " << p.position[2] * 1e3
                    << ") mm: peak " << simulated.T_peak << " vs " << exact.T_peak);
        REQUIRE(exact.T_peak > 850);
        CHECK((simulated.T_peak - 20) == Approx(exact.T_peak - 20).epsilon(0.03));
        REQUIRE(exact.t8_5());
        REQUIRE(simulated.t8_5());
        INFO("t8/5 " << *simulated.t8_5() << " vs " << *exact.t8_5());
        CHECK(*simulated.t8_5() == Approx(*exact.t8_5()).epsilon(0.03));
    }
    // The boundary of the zone that reached 1200 °C (standing in for the fusion line; the
    // properties are constant) on the cross-section at x = 35 mm: at every point of the simulated
    // isoline the analytic peak is 1200 °C, within 3 % of the rise.
    const double level = 1200;
    const std::size_t slice = static_cast<std::size_t>(
        std::upper_bound(run.grid.x.faces.begin(), run.grid.x.faces.end(), 35e-3) - run.grid.x.faces.begin() - 1);
    const auto lines = post::isolines(run.grid, sim->cells(), recorded.history->peak(), slice, level);
    REQUIRE_FALSE(lines.empty());
    std::size_t checked = 0;
    for (const auto& line : lines) {
        for (std::size_t n = 0; n < line.points.size(); n += 7) {
            const auto [y, z] = line.points[n];
            const auto exact = analytic::peak_and_cooling(run.analytic_source(), run.props(), run.grid.x.centre(slice), y, z,
                                                          20, {0, 20, 400});
            INFO("isoline point (" << y * 1e3 << ", " << z * 1e3 << ") mm: analytic peak " << exact.T_peak);
            CHECK((exact.T_peak - 20) == Approx(level - 20).epsilon(0.03));
            ++checked;
        }
    }
    CHECK(checked >= 5);
}

TEST_CASE("energy is conserved and results do not depend on the thread count", "[solver]") {
    // Conservation (a property of the finite-volume form): with adiabatic faces, the enthalpy
    // gained equals the arc energy. Threads: the same field for 1 and 2 threads (to round-off).
    MovingSourceRun run(3e-3, 3e-3, 3e-3, 6e-3, 1e-3);
    run.weld = 20e-3;
    const Material m = make_en1993_steel({});
    std::vector<std::vector<double>> peaks;
    for (int threads : {1, 2}) {
        omp_set_num_threads(threads);
        auto sim = run.simulation(m, "rkl2", 400, 60);
        const RecordedHistory recorded = record_history(*sim, 20);
        std::atomic<bool> stop{false};
        const RunResult r = sim->run(stop);
        INFO("balance " << r.energy.error());
        CHECK(std::abs(r.energy.error()) < 1e-6);
        CHECK(r.energy.deposited == Approx(r.energy.arc).epsilon(1e-9));
        peaks.push_back(recorded.history->peak());
    }
    omp_set_num_threads(omp_get_num_procs());
    double worst = 0;
    for (std::size_t c = 0; c < peaks[0].size(); ++c) worst = std::max(worst, std::abs(peaks[0][c] - peaks[1][c]));
    CHECK(worst < 1e-9);
}

TEST_CASE("cut weld cells do not shorten the stable step", "[solver]") {
    // The scale s_P of a cut cell's section conductances (solver/numerics/conduction.hpp) keeps, along
    // each axis, its Σ m·A/(Δ/2) over its metal volume at most that of a full cell of the same size, so
    // the forward-Euler limit min_P V_P ρc_min / ΣG (the integrators' stability bound) is no shorter than
    // with every weld cell full (hand derivation in THEORY.md, "Cut cells"). Legs from 6.00 to 6.50 mm
    // in 0.01 mm steps on a 0.5 mm grid give the face every position in the cells, tiny slivers and
    // corner triangles included.
    const Material steel = make_en1993_steel({});
    double smallest_fill = 1;
    for (int n = 0; n <= 50; ++n) {
        const mesh::JointGeometry joint{.flange_thickness = 10e-3,
                                        .flange_width = 60e-3,
                                        .web_thickness = 8e-3,
                                        .web_height = 30e-3,
                                        .weld_length = 4e-3,
                                        .leg_flange = 6e-3 + n * 1e-5,
                                        .leg_web = 5.5e-3 + n * 1e-5,
                                        .convexity = 0.4e-3,
                                        .face = mesh::FaceShape::convex};
        const mesh::GridSettings settings{{0.5e-3, 4e-3, 1.2}, 2e-3, 2e-3};
        const mesh::Grid cut = mesh::build_grid(joint, settings);
        mesh::Grid full = cut;
        for (mesh::BeadCell& c : full.bead) {
            smallest_fill = std::min(smallest_fill, c.fill.area);
            c.fill = mesh::CellFill{};
        }
        const auto stable_step = [&](const mesh::Grid& grid) {
            const mesh::SolidCells cells = mesh::index_solid_cells(grid);
            ConductionOperator op(grid, cells, steel, SurfaceLosses{});
            const std::vector<double> T(cells.size(), 1000.0);
            const std::vector<std::uint8_t> active(cells.size(), 1);
            op.prepare(T, active, {}, std::nan(""), 1);
            return op.stable_step();
        };
        INFO("legs " << joint.leg_flange * 1e3 << " x " << joint.leg_web * 1e3 << " mm");
        CHECK(stable_step(cut) >= stable_step(full) * (1 - 1e-12));
    }
    CHECK(smallest_fill < 1e-3);
}
