#include "solver/weldability/en1011_preheat.hpp"

#include "solver/core/text.hpp"
#include "solver/weldability/carbon_equivalent.hpp"

#include <cmath>

namespace heatbead {

namespace {

void check_range(std::vector<std::string>& out, const char* what, double value, double lo, double hi, const char* unit) {
    if (value >= lo && value <= hi) return;
    out.push_back(format_text("%s %.4g%s is outside the method's range %.4g to %.4g%s", what, value, unit, lo, hi, unit));
}

}  // namespace

StandardPreheat en1011_method_b(const StandardPreheatInput& in) {
    StandardPreheat r;
    r.cet = carbon_equivalent_cet(in.composition);
    r.formula = 697 * r.cet + 160 * std::tanh(in.thickness / 35) + 62 * std::pow(in.hydrogen, 0.35) +
                (53 * r.cet - 32) * in.heat_input - 328;
    check_range(r.outside_validity, "CET", r.cet, 0.20, 0.50, " %");
    check_range(r.outside_validity, "thickness", in.thickness, 10, 90, " mm");
    check_range(r.outside_validity, "diffusible hydrogen", in.hydrogen, 1, 20, " ml/100 g");
    check_range(r.outside_validity, "heat input", in.heat_input, 0.5, 4.0, " kJ/mm");
    static constexpr ElementRange composition[] = {{"C", 0.05, 0.32}, {"Si", 0, 0.8},   {"Mn", 0.5, 1.9},
                                                   {"Cr", 0, 1.5},    {"Cu", 0, 0.7},   {"Mo", 0, 0.75},
                                                   {"Nb", 0, 0.06},   {"Ni", 0, 2.5},   {"V", 0, 0.18},
                                                   {"B", 0, 0.005}};
    for (auto& m : outside_ranges(in.composition, composition, "outside the method's composition range")) {
        r.outside_validity.push_back(std::move(m));
    }
    return r;
}

}  // namespace heatbead
