#include "solver/weldability/haz_hardness.hpp"

#include "solver/weldability/carbon_equivalent.hpp"
#include "solver/core/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace heatbead {

namespace {
// Boron below which Yurioka's ΔH is 0: 1 ppm (from memory).
constexpr double boron_free = 0.0001;
}  // namespace

double duren_ceb(const Composition& c) {
    return c.C + c.Si / 11 + c.Mn / 8 + c.Cu / 9 + c.Cr / 5 + c.Ni / 17 + c.Mo / 6 + c.V / 3;
}

double duren_hardness(const Composition& c, double t8_5) {
    const double lt = std::log10(t8_5);
    return 2019 * (c.C * (1 - 0.5 * lt) + 0.3 * (duren_ceb(c) - c.C)) + 66 * (1 - 0.8 * lt);
}

PhaseHardness maynier_phase_hardness(const Composition& c, double rate_700) {
    const double lv = std::log10(rate_700 * 3600);  // Maynier's rates are in °C/h
    PhaseHardness h;
    h.martensite = 127 + 949 * c.C + 27 * c.Si + 11 * c.Mn + 8 * c.Ni + 16 * c.Cr + 21 * lv;
    h.bainite = -323 + 185 * c.C + 330 * c.Si + 153 * c.Mn + 65 * c.Ni + 144 * c.Cr + 191 * c.Mo +
                (89 + 53 * c.C - 55 * c.Si - 22 * c.Mn - 10 * c.Ni - 20 * c.Cr - 33 * c.Mo) * lv;
    h.ferrite_pearlite = 42 + 223 * c.C + 53 * c.Si + 30 * c.Mn + 12.6 * c.Ni + 7 * c.Cr + 19 * c.Mo +
                         (10 - 19 * c.Si + 4 * c.Ni + 8 * c.Cr + 130 * c.V) * lv;
    return h;
}

double thick_plate_rate_700(double t8_5, double T0) {
    return 300 * (700 - T0) * (700 - T0) / (t8_5 * (500 - T0) * (800 - T0));
}

YuriokaEquivalents yurioka_equivalents(const Composition& c) {
    YuriokaEquivalents e;
    // ΔH (boron) left out: it needs the free nitrogen (see the header).
    e.ce_i = c.C + c.Si / 24 + c.Mn / 6 + c.Cu / 15 + c.Ni / 12 + c.Cr * (1 - 0.16 * std::sqrt(c.Cr)) / 8 + c.Mo / 4;
    e.ce_ii = c.C + c.Si / 24 + c.Mn / 5 + c.Cu / 10 + c.Ni / 18 + c.Cr / 5 + c.Mo / 2.5 + c.V / 5 + c.Nb / 3;
    e.ce_iii = c.C + c.Mn / 3.6 + c.Cu / 20 + c.Ni / 9 + c.Cr / 5 + c.Mo / 4;
    return e;
}

double yurioka_hardness(const Composition& c, double t8_5) {
    const YuriokaEquivalents e = yurioka_equivalents(c);
    const double x = (std::log10(t8_5) - 2.30 * e.ce_i - 1.35 * e.ce_iii + 0.882) / (1.15 * e.ce_i - 0.673 * e.ce_iii - 0.601);
    return 442 * c.C + 99 * e.ce_ii + 206 + (402 * c.C - 90 * e.ce_ii + 80) * std::atan(x);
}

double hardness_models_scatter() { return std::hypot(duren_scatter, yurioka_scatter); }

HardnessEstimate haz_hardness(const Composition& c, double t8_5, double rate_700) {
    HardnessEstimate h;
    const PhaseHardness phase = maynier_phase_hardness(c, rate_700);
    h.duren = duren_hardness(c, t8_5);
    if (h.duren > phase.martensite) h.duren = phase.martensite, h.bound = "martensite";
    if (h.duren < phase.ferrite_pearlite) h.duren = phase.ferrite_pearlite, h.bound = "ferrite-pearlite";
    h.yurioka = yurioka_hardness(c, t8_5);
    h.hv = std::max(h.duren, h.yurioka);
    h.governing = h.yurioka > h.duren ? "Yurioka" : "Düren";
    return h;
}

std::string hardness_disagreement(double duren, double yurioka) {
    const double gap = std::abs(duren - yurioka);
    if (gap <= hardness_models_scatter()) return "";
    return format_text("the two hardness formulas disagree by %.0f HV (Düren %.0f HV, Yurioka %.0f HV), more than "
                       "their combined scatter of %.0f HV: the higher is used; a hardness survey of a test weld "
                       "settles it",
                       gap, duren, yurioka, hardness_models_scatter());
}

double critical_t8_5(const Composition& c, double limit, double T0) {
    const auto hv = [&](double t) { return haz_hardness(c, t, thick_plate_rate_700(t, T0)).hv; };
    double lo = 0.5, hi = 1000;
    if (hv(lo) <= limit) return 0;
    if (hv(hi) > limit) return std::numeric_limits<double>::infinity();
    // The estimate falls as t8/5 grows (Düren's and HV_M's terms always do, HV_FP's unless Si is
    // high and V low, Yurioka's while its denominator is negative); bisect on log t8/5 to 0.01 %.
    while (hi / lo > 1.0001) {
        const double mid = std::sqrt(lo * hi);
        (hv(mid) > limit ? lo : hi) = mid;
    }
    return hi;
}

std::vector<std::string> hardness_validity(const Composition& c) {
    static constexpr ElementRange envelope[] = {{"C", 0.05, 0.30}, {"Si", 0, 0.8},  {"Mn", 0, 2.0},  {"Cr", 0, 1.5},
                                                {"Mo", 0, 1.0},    {"Ni", 0, 2.5},  {"Cu", 0, 0.7},  {"V", 0, 0.2},
                                                {"Nb", 0, 0.1},    {"B", 0, 0.005}};
    auto w = outside_ranges(c, envelope, "outside the structural steels the hardness formulas were fitted to");
    if (c.B > boron_free) {
        w.push_back(format_text("B %.4f %%: Yurioka's boron term is left out (it needs the steel's free nitrogen), so "
                                "his estimate may read low",
                                c.B));
    }
    return w;
}

}  // namespace heatbead
