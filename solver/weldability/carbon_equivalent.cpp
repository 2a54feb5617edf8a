#include "solver/weldability/carbon_equivalent.hpp"

#include "solver/core/text.hpp"

#include <cmath>
#include <stdexcept>

namespace heatbead {

double carbon_equivalent_iiw(const Composition& c) {
    return c.C + c.Mn / 6 + (c.Cr + c.Mo + c.V) / 5 + (c.Ni + c.Cu) / 15;
}

double carbon_equivalent_pcm(const Composition& c) {
    return c.C + c.Si / 30 + (c.Mn + c.Cu + c.Cr) / 20 + c.Ni / 60 + c.Mo / 15 + c.V / 10 + 5 * c.B;
}

double carbon_equivalent_cen(const Composition& c) {
    const double a = 0.75 + 0.25 * std::tanh(20 * (c.C - 0.12));
    return c.C + a * (c.Si / 24 + c.Mn / 6 + c.Cu / 15 + c.Ni / 20 + (c.Cr + c.Mo + c.Nb + c.V) / 5 + 5 * c.B);
}

double carbon_equivalent_cet(const Composition& c) { return c.C + (c.Mn + c.Mo) / 10 + (c.Cr + c.Cu) / 20 + c.Ni / 40; }

CarbonEquivalents carbon_equivalents(const Composition& c) {
    return {carbon_equivalent_iiw(c), carbon_equivalent_pcm(c), carbon_equivalent_cen(c), carbon_equivalent_cet(c)};
}

double element(const Composition& c, std::string_view symbol) {
    const std::pair<std::string_view, double> table[] = {{"C", c.C},   {"Mn", c.Mn}, {"Si", c.Si}, {"Cr", c.Cr},
                                                         {"Mo", c.Mo}, {"V", c.V},   {"Ni", c.Ni}, {"Cu", c.Cu},
                                                         {"Nb", c.Nb}, {"B", c.B}};
    for (const auto& [name, value] : table) {
        if (name == symbol) return value;
    }
    throw std::invalid_argument("unknown element symbol " + std::string(symbol));
}

std::vector<std::string> outside_ranges(const Composition& c, std::span<const ElementRange> ranges,
                                        std::string_view what) {
    std::vector<std::string> out;
    for (const auto& r : ranges) {
        const double v = element(c, r.symbol);
        if (v >= r.lo && v <= r.hi) continue;
        out.push_back(format_text("%s %.4g %% is %s %.4g %%", std::string(r.symbol).c_str(), v, v < r.lo ? "below" : "above",
                                  v < r.lo ? r.lo : r.hi) +
                      " (" + std::string(what) + ")");
    }
    return out;
}

}  // namespace heatbead
