#include "solver/studies/least_squares.hpp"

#include <algorithm>
#include <stdexcept>

namespace heatbead {

namespace {

double sum_of_squares(const std::vector<double>& r) {
    double s = 0;
    for (double v : r) s += v * v;
    return s;
}

}  // namespace

LeastSquaresFit levenberg_marquardt(const ResidualBatch& residuals, std::vector<double> theta,
                                    const std::vector<double>& low, const std::vector<double>& high, int iterations,
                                    double step, const std::function<void(int, double)>& on_step) {
    const std::size_t n = theta.size();
    if (low.size() != n || high.size() != n) throw std::invalid_argument("levenberg_marquardt: bounds do not match the unknowns");
    const auto clamp = [&](std::vector<double> t) {
        for (std::size_t j = 0; j < n; ++j) t[j] = std::clamp(t[j], low[j], high[j]);
        return t;
    };
    theta = clamp(theta);
    LeastSquaresFit out;
    std::vector<double> r = residuals({theta}).at(0);
    out.start_misfit = sum_of_squares(r);
    double misfit = out.start_misfit, lambda = 1e-2;
    const std::size_t rows = r.size();
    Eigen::MatrixXd J(rows, n);
    const auto jacobian = [&] {
        std::vector<std::vector<double>> shifted;
        for (std::size_t j = 0; j < n; ++j) {
            auto t = theta;
            t[j] += theta[j] + step > high[j] ? -step : step;  // step back from the upper bound
            shifted.push_back(t);
        }
        const auto rs = residuals(shifted);
        for (std::size_t j = 0; j < n; ++j) {
            const double h = shifted[j][j] - theta[j];
            for (std::size_t i = 0; i < rows; ++i) J(Eigen::Index(i), Eigen::Index(j)) = (rs[j][i] - r[i]) / h;
        }
    };
    for (out.iterations = 0; out.iterations < iterations;) {
        jacobian();
        const Eigen::VectorXd rv = Eigen::Map<const Eigen::VectorXd>(r.data(), Eigen::Index(rows));
        const Eigen::MatrixXd A = J.transpose() * J;
        const Eigen::VectorXd g = J.transpose() * rv;
        bool accepted = false;
        double gain = 0;
        for (int attempt = 0; attempt < 6 && !accepted; ++attempt) {
            Eigen::MatrixXd damped = A;
            for (Eigen::Index j = 0; j < Eigen::Index(n); ++j) damped(j, j) += lambda * std::max(A(j, j), 1e-12);
            const Eigen::VectorXd delta = -damped.ldlt().solve(g);
            std::vector<double> trial(n);
            for (std::size_t j = 0; j < n; ++j) trial[j] = theta[j] + delta(Eigen::Index(j));
            trial = clamp(trial);
            std::vector<double> tr = residuals({trial}).at(0);
            const double m = sum_of_squares(tr);
            if (m < misfit) {
                gain = (misfit - m) / std::max(misfit, 1e-300);
                theta = trial, r = std::move(tr), misfit = m, lambda = std::max(lambda / 3, 1e-6), accepted = true;
            } else {
                lambda *= 4;
            }
        }
        if (!accepted) break;  // no step improves the misfit: a minimum within the bounds
        ++out.iterations;
        if (on_step) on_step(out.iterations, misfit);
        if (gain < 1e-3) break;  // converged: no real gain left
    }
    jacobian();  // at the solution, for the caller's intervals and identifiability
    out.theta = theta, out.residuals = r, out.misfit = misfit, out.jacobian = J;
    return out;
}

}  // namespace heatbead
