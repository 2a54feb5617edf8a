#include "solver/physics/material.hpp"

#include "solver/core/text.hpp"
#include "solver/physics/steel_en1993.hpp"

#include <limits>
#include <sstream>
#include <string_view>
#include <utility>

namespace heatbead {

namespace {

// The table spans at least −100 °C to 3000 °C: below any preheat or cooling bath, above boiling steel.
// Beyond it H continues linearly and k stays constant, so a run that leaves the span still conserves energy.
constexpr double table_low = -100.0, table_high = 3000.0;
constexpr double largest_step = 1.0;  // K; ΔT = (T_l − T_s)/n with the smallest n that keeps ΔT ≤ 1 K

// Composite trapezoidal rule per table segment: sub-steps of ΔT/16 cut the rule's error near the cusp of
// the EN 1993-1-2 c(θ) at 735 °C by 16² against a single trapezoid.
constexpr int substeps = 16;

// H-bins per segment at most; bounds the bin index for tables with a tiny c somewhere.
constexpr std::size_t bins_per_segment_cap = 8;

[[noreturn]] void fail_parameter(const std::string& what) { throw MaterialError("material parameters: " + what); }

void check_parameters(double density, const MaterialParameters& p) {
    if (!(std::isfinite(density) && density > 0))
        fail_parameter("density " + number_text(density) + " kg/m3 is not allowed; it must be a positive number");
    if (!(std::isfinite(p.solidus) && p.solidus > table_low))
        fail_parameter("solidus " + number_text(p.solidus) + " degC is not allowed; it must be above " +
                       number_text(table_low) + " degC");
    if (!(std::isfinite(p.liquidus) && p.liquidus < table_high))
        fail_parameter("liquidus " + number_text(p.liquidus) + " degC is not allowed; it must be below " +
                       number_text(table_high) + " degC");
    if (!(p.liquidus - p.solidus >= largest_step))
        fail_parameter("liquidus " + number_text(p.liquidus) + " degC must be at least " + number_text(largest_step) +
                       " K above solidus " + number_text(p.solidus) +
                       " degC; the latent heat is spread linearly over the mushy range");
    if (!(std::isfinite(p.latent_heat) && p.latent_heat >= 0))
        fail_parameter("latent heat " + number_text(p.latent_heat) +
                       " J/kg is not allowed; it must be a finite number >= 0");
    if (!(std::isfinite(p.liquid_conductivity_factor) && p.liquid_conductivity_factor >= 1))
        fail_parameter("liquid conductivity factor " + number_text(p.liquid_conductivity_factor) +
                       " is not allowed; it must be a finite number >= 1 (1 leaves k unchanged)");
}

// A property function's value at a table node, checked: user code may hand us anything.
double positive_property(const PropertyFunction& f, double T, const char* what, const char* unit) {
    const double v = f(T);
    if (!(std::isfinite(v) && v > 0))
        throw MaterialError(std::string(what) + " at " + number_text(T) + " degC is " + number_text(v) + " " + unit +
                            "; it must be a positive finite number");
    return v;
}

// ∫_a^b c dT by the composite trapezoidal rule, given c(a) and c(b).
double integrate_specific_heat(const PropertyFunction& c, double a, double b, double ca, double cb) {
    const double h = (b - a) / substeps;
    double sum = 0.5 * (ca + cb);
    for (int j = 1; j < substeps; ++j) sum += c(a + j * h);
    return sum * h;
}

}  // namespace

Material::Material(std::string name, double density_kg_per_m3, const PropertyFunction& conductivity_of,
                   const PropertyFunction& specific_heat_of, const MaterialParameters& parameters)
    : name_(std::move(name)), density_(density_kg_per_m3), parameters_(parameters) {
    check_parameters(density_, parameters_);
    tabulate(conductivity_of, specific_heat_of);
    index_enthalpy_bins();
}

// Node i at T_i = T_s + (i − i_s) ΔT with ΔT = (T_l − T_s)/n, so T_s and T_l are nodes and the latent part
// ρ L f_l(T), linear between them, is represented exactly by the piecewise-linear H:
//     H_0 = 0,  H_{i+1} = H_i + ρ ∫_{T_i}^{T_{i+1}} c dT + ρ L (f_{i+1} − f_i),   f_i = clamp((i − i_s)/n, 0, 1)
// then shifted so that H(0 °C) = 0.
void Material::tabulate(const PropertyFunction& conductivity_of, const PropertyFunction& specific_heat_of) {
    const MaterialParameters& p = parameters_;
    const double mushy_segments = std::ceil((p.liquidus - p.solidus) / largest_step);
    step_ = (p.liquidus - p.solidus) / mushy_segments;
    inverse_step_ = 1.0 / step_;
    solidus_node_ = std::ceil((p.solidus - table_low) * inverse_step_);
    const double nodes = solidus_node_ + std::ceil((table_high - p.solidus) * inverse_step_) + 1;
    last_segment_ = nodes - 2;

    enthalpy_.resize(static_cast<std::size_t>(nodes));
    conductivity_.resize(enthalpy_.size());
    double previous_T = 0, previous_c = 0, previous_latent = 0;
    for (std::size_t i = 0; i < enthalpy_.size(); ++i) {
        const double T = node_temperature(static_cast<double>(i));
        const double f = std::clamp((static_cast<double>(i) - solidus_node_) / mushy_segments, 0.0, 1.0);
        const double c = positive_property(specific_heat_of, T, "specific heat", "J/(kg K)");
        const double latent = density_ * p.latent_heat * f;
        enthalpy_[i] = i == 0 ? 0.0
                              : enthalpy_[i - 1] +
                                    density_ * integrate_specific_heat(specific_heat_of, previous_T, T, previous_c, c) +
                                    (latent - previous_latent);
        // k ramps from k to factor·k over the mushy range: k_i = k(T_i) (1 + (factor − 1) f_i).
        conductivity_[i] = positive_property(conductivity_of, T, "conductivity", "W/(m K)") *
                           (1.0 + (p.liquid_conductivity_factor - 1.0) * f);
        previous_T = T;
        previous_c = c;
        previous_latent = latent;
    }
    const double at_zero = enthalpy(0.0);
    for (double& h : enthalpy_) h -= at_zero;

    // On a segment k is linear and dH/dT constant, so k/(dH/dT) peaks at an end node. A c(T) that is not
    // positive between nodes would make H non-monotone and T(H) meaningless.
    for (std::size_t i = 0; i + 1 < enthalpy_.size(); ++i) {
        const double slope = (enthalpy_[i + 1] - enthalpy_[i]) * inverse_step_;
        if (!(std::isfinite(slope) && slope > 0))
            throw MaterialError("enthalpy does not increase between " + number_text(node_temperature(static_cast<double>(i))) +
                                " and " + number_text(node_temperature(static_cast<double>(i + 1))) +
                                " degC; the specific heat must be positive there");
        max_diffusivity_ = std::max(max_diffusivity_, std::max(conductivity_[i], conductivity_[i + 1]) / slope);
    }
}

// Bins of width about the smallest segment rise in H, so a bin holds at most a node or two. For bin b the
// start is the last segment whose lower node lies in an earlier bin: bin_of is monotone in H, so every H in
// bin b lies at or above that node (bin 0 starts at segment 0, below which H is extrapolated).
void Material::index_enthalpy_bins() {
    double smallest_rise = std::numeric_limits<double>::infinity();
    for (std::size_t i = 0; i + 1 < enthalpy_.size(); ++i)
        smallest_rise = std::min(smallest_rise, enthalpy_[i + 1] - enthalpy_[i]);
    min_heat_capacity_ = smallest_rise * inverse_step_;
    const double range = enthalpy_.back() - enthalpy_.front();
    const std::size_t segments = enthalpy_.size() - 1;
    const auto bins = static_cast<std::size_t>(
        std::clamp(std::ceil(range / smallest_rise), 1.0, static_cast<double>(bins_per_segment_cap * segments)));
    inverse_bin_width_ = static_cast<double>(bins) / range;
    last_bin_ = static_cast<double>(bins - 1);

    inverse_rise_.resize(segments);
    for (std::size_t k = 0; k < segments; ++k) inverse_rise_[k] = 1.0 / (enthalpy_[k + 1] - enthalpy_[k]);
    bin_first_segment_.resize(bins);
    std::size_t i = 0;
    for (std::size_t b = 0; b < bins; ++b) {
        while (i + 1 < segments && bin_of(enthalpy_[i + 1]) < b) ++i;
        bin_first_segment_[b] = static_cast<std::uint32_t>(i);
    }
}

std::string Material::description() const {
    const MaterialParameters& p = parameters_;
    return name_ + "; density " + number_text(density_) + " kg/m3; solidus " + number_text(p.solidus) + " degC, liquidus " +
           number_text(p.liquidus) + " degC, latent heat " + number_text(p.latent_heat / 1e3) +
           " kJ/kg; liquid conductivity x" + number_text(p.liquid_conductivity_factor);
}

Material make_en1993_steel(const MaterialParameters& parameters) {
    return Material("carbon steel, EN 1993-1-2 (k, c held constant outside 20-1200 degC)", en1993::density,
                    en1993::conductivity, en1993::specific_heat, parameters);
}

// ---- Property table reader ----

}  // namespace heatbead
