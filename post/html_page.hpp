// The parts every HTML page of heatbead shares (the run report, the preheat report): one style, one
// skeleton (head, header, caution, warnings), the tables and the figure wrapper. Pages built from
// them look alike, are self-contained (inline CSS, nothing fetched) and escape every text here.
#pragma once

#include "post/how_computed.hpp"

#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace heatbead::post {

struct PageHead {
    std::string_view title, case_file, created;
    std::string_view caution;                // shown in a box before anything else on the page
    std::span<const std::pair<std::string, std::string>> how_computed;  // the block under the caution
    std::span<const std::string> warnings;   // none: no warnings section
    std::string_view extra_style = {};       // CSS for the page's own classes, after the shared style
};

// From the doctype to the warnings: the head with title and style, the header with the title and
// the line naming the case file and the time, the caution box, the block saying how the page's
// results were computed (post/how_computed.hpp; method_not_recorded when there are no rows) and the
// warnings list.
std::string page_start(const PageHead& head);
// Closes what page_start opened.
std::string page_end();

// A table of name–value rows under a heading ("None recorded." when there are none).
std::string table(const std::string& heading, const std::vector<std::pair<std::string, std::string>>& rows);

struct TableRow {
    std::vector<std::string> cells;
    std::string css_class;  // empty: the row carries no class
};
// A table with a header row of column names, under a heading ("None recorded." when there are no rows).
std::string column_table(const std::string& heading, const std::vector<std::string>& columns,
                         const std::vector<TableRow>& rows);

// An SVG (already built and escaped by SvgPlot) with its caption, as a figure findable by `id`.
std::string figure(const std::string& id, const std::string& svg, const std::string& caption);

}  // namespace heatbead::post
