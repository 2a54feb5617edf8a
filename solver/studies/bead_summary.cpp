#include "solver/studies/bead_summary.hpp"

#include "solver/core/text.hpp"

#include <cctype>
#include <cmath>
#include <tuple>

namespace heatbead {

namespace {

// "a" or "an" before a size read aloud: "an 8.3 mm", "an 11 mm", "an 18 mm".
std::string a_or_an(const std::string& size) {
    const bool eleven_or_eighteen = size.size() >= 2 && size[0] == '1' && (size[1] == '1' || size[1] == '8') &&
                                    (size.size() == 2 || !std::isdigit(static_cast<unsigned char>(size[2])));
    return size.starts_with('8') || eleven_or_eighteen ? "an " + size : "a " + size;
}

// The warning of the report, once its figures are known.
std::string size_warning(const Case& c, const BeadReport& b) {
    if (!b.deposit || !(std::abs(b.size_ratio - 1) > size_limit)) return "";
    const mesh::Fillet wire = scaled_fillet(b.asked, b.deposit->area);
    const std::string areas = format_text("%.1f mm2 deposited, %.1f mm2 asked", b.deposit->area * 1e6, b.asked_area * 1e6);
    if (c.bead.from_wire) {
        return "the wire lays " + a_or_an(legs_text(wire)) + " fillet; " + legs_text(b.asked) + " was asked: " +
               (b.size_ratio < 1 ? "undersized" : "oversized") + " (" + areas + ")";
    }
    return "the wire deposits " + a_or_an(legs_text(wire)) + " fillet, but the " + legs_text(b.asked) +
           " asked is laid as asked (" + areas + "): check the wire feed, the travel speed and the legs";
}

}  // namespace

BeadReport bead_report(const Case& c) {
    BeadReport b;
    b.asked = c.bead.asked;
    b.laid = mesh::fillet_of(c.joint);
    b.asked_area = mesh::fillet_area(b.asked), b.laid_area = mesh::fillet_area(b.laid);
    b.asked_throat = mesh::design_throat(b.asked), b.laid_throat = mesh::design_throat(b.laid);
    b.deposit = deposition(c.procedure);
    b.no_deposit = missing_wire_data(c.procedure);
    b.basis = c.bead.basis;
    if (b.deposit) b.size_ratio = std::sqrt(b.deposit->area / b.asked_area);
    b.warning = size_warning(c, b);
    return b;
}

void add_bead_items(post::Summary& s, const BeadReport& b) {
    const auto num = [&](const char* group, const char* key, const char* label, double value, const char* unit,
                         int decimals) { s.add({group, key, label, value, unit, decimals, ""}); };
    for (const auto& [group, prefix, f, area, throat] :
         {std::tuple{"Bead asked", "bead_asked", b.asked, b.asked_area, b.asked_throat},
          std::tuple{"Bead laid", "bead_laid", b.laid, b.laid_area, b.laid_throat}}) {
        const std::string p = prefix;
        num(group, (p + "_leg_flange").c_str(), "legs flange", f.leg_flange * 1e3, "mm", 1);
        num(group, (p + "_leg_web").c_str(), "web", f.leg_web * 1e3, "mm", 1);
        num(group, (p + "_throat").c_str(), "throat", throat * 1e3, "mm", 2);
        num(group, (p + "_area").c_str(), "area", area * 1e6, "mm2", 1);
    }
    // Without wire data the basis says why no deposit is shown: the item is not an output the run lacks.
    if (b.deposit) num("Bead laid", "wire_deposit", "wire deposits", b.deposit->area * 1e6, "mm2", 1);
    s.add({"Bead laid", "bead_laid_basis", "basis", std::nullopt, "", 0, b.basis});
    if (!b.warning.empty()) s.add_note("Bead laid", b.warning);
}

}  // namespace heatbead
