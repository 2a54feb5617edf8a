// How sure the headline answers are, as a page shows it (solver/studies/answer_bands.hpp makes the
// bands): each answer in a small figure of its own, the value of each run as a marker and its band
// as an error bar, with the runs (one run, the procedures compared, the preheats of a search) along
// the axis; then a table of what moved each answer, and the words on how the bands were made.
#pragma once

#include <string>
#include <vector>

namespace heatbead::post {

// One headline answer of one or more runs: value, low and high in `unit`, NaN where there is none.
struct BandedAnswer {
    std::string key, name, unit;    // key: for the figure's id ("penetration_flange")
    std::vector<std::string> runs;  // the names along the axis, one per value
    std::vector<double> value, low, high;
};

struct BandsView {
    std::vector<BandedAnswer> answers;  // none: the page has no "How sure" section
    // What moved each answer: the table's header and rows, as text with units.
    std::vector<std::string> columns;
    std::vector<std::vector<std::string>> rows;
    std::string note;  // what the bands mean here, in words, before the lead every section has (may be empty)
};

// The answer's figure (300 × 300 px, an SVG with id "figure-band-<key>-plot"). Throws
// std::invalid_argument when runs, value, low and high differ in size.
std::string band_svg(const BandedAnswer& answer);
// The page's "How sure" section: its heading, the note, one figure per answer and the table; empty
// when there are no answers.
std::string bands_section(const BandsView& bands);

}  // namespace heatbead::post
