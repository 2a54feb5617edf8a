// Thermal material model in enthalpy form: H(T), its exact inverse T(H), k(T) and the liquid fraction.
//
// The solver advances the volumetric enthalpy H [J/m³] of every cell and needs T(H) and k(T) per cell per
// stage, so all properties are tabulated once on a uniform temperature grid and looked up in O(1).
#pragma once

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <functional>
#include <stdexcept>
#include <string>
#include <vector>

namespace heatbead {

// Thrown for a property table or material parameters that cannot be used. The message is complete on its
// own: it names the file, line and column (for tables), the offending value and what is allowed.
struct MaterialError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

struct MaterialParameters {
    double solidus = 1495, liquidus = 1540;   // °C, typical of a C–Mn steel (from memory)
    double latent_heat = 277e3;               // J/kg
    double liquid_conductivity_factor = 1.0;  // multiplies k above liquidus (stand-in for pool stirring),
                                              // ramped linearly over the mushy range
};

// A temperature-dependent property, θ in °C → value in SI units.
using PropertyFunction = std::function<double(double)>;

// Immutable after construction. Between table nodes H(T) and k(T) are linear; beyond the ends of the table
// H continues with the slope of the end segment and k keeps its end value.
class Material {
public:
    // Tabulates k(θ) and c(θ) on the temperature grid. `name` opens description(), e.g. "carbon steel,
    // EN 1993-1-2". Throws MaterialError for parameters outside what is allowed (see material.cpp).
    Material(std::string name, double density_kg_per_m3, const PropertyFunction& conductivity_of,
             const PropertyFunction& specific_heat_of, const MaterialParameters& parameters);

    // H(T) = ∫_{0 °C}^{T} ρ c(T') dT' + ρ L f_l(T) [J/m³], linear between table nodes.
    double enthalpy(double T) const {
        const Position p = locate(T);
        return enthalpy_[p.segment] + p.fraction * (enthalpy_[p.segment + 1] - enthalpy_[p.segment]);
    }

    // The exact inverse of enthalpy(): T such that enthalpy(T) == H, to rounding. O(1): the H-bin of H
    // gives a segment at or below H, then a walk of at most a node or two.
    // This runs for every cell in every stage, so the usual case is branch-free: bins are narrower
    // than any segment's rise, so at most one node lies between the bin's first segment and H.
    double temperature(double H) const {
        std::size_t i = bin_first_segment_[bin_of(H)];
        i += static_cast<std::size_t>(i + 2 < enthalpy_.size() && H >= enthalpy_[i + 1]);
        while (i + 2 < enthalpy_.size() && H >= enthalpy_[i + 1]) [[unlikely]] ++i;  // tables with capped bins
        return node_temperature(static_cast<double>(i) + (H - enthalpy_[i]) * inverse_rise_[i]);
    }

    // k(T) [W/(m K)], including the liquid conductivity factor; held constant beyond the table.
    double conductivity(double T) const {
        const Position p = locate(T);
        const double w = std::clamp(p.fraction, 0.0, 1.0);
        return conductivity_[p.segment] + w * (conductivity_[p.segment + 1] - conductivity_[p.segment]);
    }

    // f_l = (T − T_s)/(T_l − T_s), clamped to [0, 1].
    double liquid_fraction(double T) const {
        return std::clamp((T - parameters_.solidus) / (parameters_.liquidus - parameters_.solidus), 0.0, 1.0);
    }

    // dH/dT [J/(m³ K)] of the tabulated H: the slope of the segment holding T (of the upper one at a node),
    // ρ c averaged over the segment plus ρ L/(T_l − T_s) in the mushy range.
    double volumetric_heat_capacity(double T) const {
        const std::size_t i = locate(T).segment;
        return (enthalpy_[i + 1] - enthalpy_[i]) * inverse_step_;
    }

    double density() const { return density_; }

    // max over T of k/(dH/dT) [m²/s], for the explicit stable step. An explicit enthalpy update changes T
    // by ΔH/(dH/dT), so the latent heat (large dH/dT) only slows it down: the maximum of k/(dH/dT) itself
    // is the binding value, and the liquid conductivity factor raises it.
    double max_diffusivity() const { return max_diffusivity_; }
    // min over T of dH/dT [J/(m³ K)]: an explicit enthalpy step changes T by ΔH/(dH/dT), so the
    // smallest slope is the stiffest.
    double min_volumetric_heat_capacity() const { return min_heat_capacity_; }

    const MaterialParameters& parameters() const { return parameters_; }

    // One line for reports: name, density, solidus, liquidus, latent heat, liquid conductivity factor.
    std::string description() const;

private:
    // Segment `segment` joins nodes segment and segment + 1; `fraction` is in [0, 1) inside the table and
    // outside it beyond the end segments.
    struct Position {
        std::size_t segment;
        double fraction;
    };

    // Node i sits at T_i = T_s + (i − i_s) ΔT, so that the solidus is node i_s and the liquidus node i_s + n.
    Position locate(double T) const {
        const double s = (T - parameters_.solidus) * inverse_step_ + solidus_node_;
        double i = std::floor(s);
        if (!(i >= 0.0)) i = 0.0;  // also catches NaN, which then propagates through `fraction`
        i = std::min(i, last_segment_);
        return {static_cast<std::size_t>(i), s - i};
    }

    // The temperature at fractional node number s.
    double node_temperature(double s) const { return parameters_.solidus + (s - solidus_node_) * step_; }

    // Uniform bins of H over the table. Monotone in H, which is what makes bin_first_segment_ valid.
    std::size_t bin_of(double H) const {
        double b = std::floor((H - enthalpy_.front()) * inverse_bin_width_);
        if (!(b >= 0.0)) b = 0.0;
        return static_cast<std::size_t>(std::min(b, last_bin_));
    }

    void tabulate(const PropertyFunction& conductivity_of, const PropertyFunction& specific_heat_of);
    void index_enthalpy_bins();

    std::string name_;
    double density_;
    MaterialParameters parameters_;
    double step_ = 0, inverse_step_ = 0;  // ΔT [K] and 1/ΔT
    double solidus_node_ = 0;             // i_s, a whole number held as double
    double last_segment_ = 0;             // index of the last segment, as double
    std::vector<double> enthalpy_;        // H at the nodes [J/m³]
    std::vector<double> conductivity_;    // k at the nodes [W/(m K)], liquid factor included
    double inverse_bin_width_ = 0, last_bin_ = 0;
    std::vector<std::uint32_t> bin_first_segment_;  // per H-bin: the last segment starting in an earlier bin
    std::vector<double> inverse_rise_;              // per segment: 1 / (H_{i+1} − H_i)
    double max_diffusivity_ = 0;
    double min_heat_capacity_ = 0;
};

// Carbon steel after EN 1993-1-2 §3.4.1 (solver/physics/steel_en1993.hpp): k and c held constant outside the
// standard's 20–1200 °C, density 7850 kg/m³.
Material make_en1993_steel(const MaterialParameters& parameters);

}  // namespace heatbead
