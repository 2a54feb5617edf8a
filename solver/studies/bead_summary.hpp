// The bead asked for against the bead laid, built once for every command that shows it: `check`
// (text and JSON), the run summary (screen, JSON, CSV, report) and `compare`.
#pragma once

#include "post/summary.hpp"
#include "solver/case/case.hpp"

#include <limits>
#include <optional>
#include <string>

namespace heatbead {

struct BeadReport {
    mesh::Fillet asked, laid;
    double asked_area = 0, laid_area = 0;      // m², one bead
    double asked_throat = 0, laid_throat = 0;  // m, design throats
    std::optional<Deposition> deposit;         // the wire's, per pass
    std::string no_deposit;                    // why there is none (the keys it needs)
    std::string basis;                         // why the bead laid is the one it is
    // The legs of the wire's fillet (the asked shape filled with the wire's deposit) over the asked
    // legs, √(A_wire / A_asked); NaN without wire data.
    double size_ratio = std::numeric_limits<double>::quiet_NaN();
    // Beyond ±10 % (size_limit), in words: "the wire lays a 7.5 mm fillet; 9.5 mm was asked:
    // undersized (27.8 mm2 deposited, 45.4 mm2 asked)", or, for a bead laid as asked, that the wire
    // does not deposit it. Empty otherwise.
    std::string warning;
};

// How far the wire's legs may differ from the asked ones before the reports warn (common
// practice, no source: a fillet gauge reads to about a millimetre on a 10 mm leg).
inline constexpr double size_limit = 0.10;

BeadReport bead_report(const Case& c);

// The report's figures as summary items in the groups "Bead asked" and "Bead laid", its warning as a
// note of the latter.
void add_bead_items(post::Summary& s, const BeadReport& b);

}  // namespace heatbead
