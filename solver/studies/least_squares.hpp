// Weighted least squares by Levenberg–Marquardt (Levenberg 1944, Marquardt 1963): minimise Σ rᵢ(θ)²
// over θ within bounds, with forward-difference Jacobians. Every set of θ the method needs at once
// (the n shifted points of a Jacobian) is handed to the residual function as one batch, so a caller
// can evaluate them in parallel. Used by the heat-source fit (solver/studies/source_fit.hpp), and on its
// own by the tests against analytic solutions.
#pragma once

#include <Eigen/Dense>

#include <functional>
#include <vector>

namespace heatbead {

// Residuals at each θ of the batch, in the same order.
using ResidualBatch = std::function<std::vector<std::vector<double>>(const std::vector<std::vector<double>>& thetas)>;

struct LeastSquaresFit {
    std::vector<double> theta;      // the solution
    std::vector<double> residuals;  // at the solution
    double start_misfit = 0, misfit = 0;
    Eigen::MatrixXd jacobian;       // ∂r/∂θ at the solution
    int iterations = 0;
};

// From `theta` (clamped to [low, high]), at most `iterations` accepted steps; stops when a step gains
// less than 0.1 % of the misfit or none improves it. `step` is the forward-difference step in θ.
// `on_step` hears each accepted step's number and misfit.
LeastSquaresFit levenberg_marquardt(const ResidualBatch& residuals, std::vector<double> theta,
                                    const std::vector<double>& low, const std::vector<double>& high, int iterations,
                                    double step = 0.05, const std::function<void(int, double)>& on_step = {});

}  // namespace heatbead
