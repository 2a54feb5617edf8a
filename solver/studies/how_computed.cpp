#include "solver/studies/how_computed.hpp"

#include "solver/core/text.hpp"
#include "solver/studies/answer_bands.hpp"
#include "solver/weldability/haz_hardness.hpp"

namespace heatbead {

post::MethodFacts method_facts(const Case& c, std::optional<std::size_t> solid_cells) {
    post::MethodFacts f;
    const auto& g = c.grid;
    f.grid = format_text("finest %.2f mm near the bead (and %.1f mm beyond it), %.2f mm along the weld, growing at "
                         "most x%.2f to %.1f mm",
                         g.cross_section.finest * 1e3, g.refine_margin * 1e3, g.along_weld * 1e3, g.cross_section.growth,
                         g.cross_section.coarsest * 1e3);
    if (solid_cells) f.grid += format_text(" (%zu solid cells)", *solid_cells);
    f.integrator = c.solver.integrator;
    const auto& s = c.source;
    f.source_from_procedure = s.from_procedure;
    f.source = format_text("Goldak double ellipsoid, a %.2f, b %.2f, c_f %.2f, c_r %.2f mm, origin at the %s; ",
                           s.half_width * 1e3, s.depth * 1e3, s.front_length * 1e3, s.rear_length * 1e3,
                           s.origin_at_root ? "root" : "bead face") +
               s.rule;
    f.hardness = c.base.composition.has_value();
    f.hardness_model = format_text("the higher of Düren (1986, IIW Doc. IX-1437-86), bounded by the Maynier, Dollet & "
                                   "Bastien (1978) phase hardnesses, and Yurioka et al. (1987), from each probe's "
                                   "own cooling; coefficients from memory; scatter ±%.0f HV and ±%.0f HV (from memory)",
                                   duren_scatter, yurioka_scatter);
    f.hardness_brief = "the higher of Düren 1986 and Yurioka 1987 (coefficients from memory), limit " +
                       format_text("%.0f HV", c.preheat_search.hardness_limit);
    f.hardness_limit = format_text("%.0f HV: ", c.preheat_search.hardness_limit) + c.preheat_search.hardness_limit_source;
    f.bands = post::bands_words(band_facts(c));
    return f;
}

}  // namespace heatbead
