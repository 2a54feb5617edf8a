#include "post/html_page.hpp"

#include "post/svg_plot.hpp"

namespace heatbead::post {

namespace {

// The pages' whole shared style: readable on screen and in print, figures scaling down on narrow screens.
constexpr const char* style = R"(
body{font-family:sans-serif;color:#222;margin:1.5em auto;max-width:1360px;padding:0 1em;line-height:1.4}
h1{font-size:1.5em;margin:0 0 .2em}h2{font-size:1.15em;margin:1em 0 .4em}
.meta{color:#555;margin:0 0 1em}
.caution{border:2px solid #a15c00;background:#fff4e0;padding:.7em 1em;margin:1em 0;border-radius:4px}
.how-computed{border-left:4px solid #7a7a7a;background:#f4f4f4;padding:.3em 1em .5em;margin:1em 0;font-size:.92em}
.how-computed h2{margin-top:.3em}.how-computed th{white-space:nowrap;vertical-align:top}
.warnings{border-left:4px solid #b8322a;background:#fcecea;padding:.4em 1em;margin:1em 0}
.warnings h2{margin-top:.3em}
.tables{display:flex;flex-wrap:wrap;gap:2em}
table{border-collapse:collapse}th,td{border-bottom:1px solid #ddd;padding:.25em .8em;text-align:left;vertical-align:top}
th{font-weight:normal;color:#444}td{font-variant-numeric:tabular-nums}
thead th{font-weight:bold;color:#222;border-bottom:2px solid #888}
.figures{display:flex;flex-wrap:wrap;gap:1.5em;margin-top:1.5em}
figure{margin:0;flex:0 1 660px}figure svg{max-width:100%;height:auto;display:block}
figcaption{font-size:.9em;color:#444;margin-top:.3em}
.bands figure{flex-basis:auto}.bands figcaption{width:0;min-width:100%}
)";

// Both kinds of table open the same way and say so when there is nothing to show.
std::string table_section(const std::string& heading, bool empty) {
    std::string s = "<section class=\"table\"><h2>" + escape_html(heading) + "</h2>";
    return s + (empty ? "<p>None recorded.</p></section>" : "<table>");
}

}  // namespace

std::string page_start(const PageHead& head) {
    std::string page = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>" +
                       escape_html(head.title) + "</title>\n<style>" + style + std::string(head.extra_style) +
                       "</style>\n</head>\n<body>\n";
    page += "<header><h1>" + escape_html(head.title) + "</h1><p class=\"meta\">Case file: " + escape_html(head.case_file) +
            " &#183; created " + escape_html(head.created) + "</p></header>\n";
    page += "<div class=\"caution\" role=\"note\"><strong>Caution:</strong> " + escape_html(head.caution) + "</div>\n";
    const std::string heading = "How this was computed";
    page += "<div class=\"how-computed\">" +
            (head.how_computed.empty()
                 ? "<section class=\"table\"><h2>" + heading + "</h2><p>" + escape_html(method_not_recorded) + "</p></section>"
                 : table(heading, {head.how_computed.begin(), head.how_computed.end()})) +
            "</div>\n";
    if (!head.warnings.empty()) {
        page += "<section class=\"warnings\"><h2>Warnings</h2><ul>";
        for (const auto& w : head.warnings) page += "<li>" + escape_html(w) + "</li>";
        page += "</ul></section>\n";
    }
    return page;
}

std::string page_end() { return "</body>\n</html>\n"; }

std::string table(const std::string& heading, const std::vector<std::pair<std::string, std::string>>& rows) {
    std::string s = table_section(heading, rows.empty());
    if (rows.empty()) return s;
    s += "<tbody>";
    for (const auto& [name, value] : rows)
        s += "<tr><th scope=\"row\">" + escape_html(name) + "</th><td>" + escape_html(value) + "</td></tr>";
    return s + "</tbody></table></section>";
}

std::string column_table(const std::string& heading, const std::vector<std::string>& columns,
                         const std::vector<TableRow>& rows) {
    std::string s = table_section(heading, rows.empty());
    if (rows.empty()) return s;
    s += "<thead><tr>";
    for (const auto& c : columns) s += "<th scope=\"col\">" + escape_html(c) + "</th>";
    s += "</tr></thead><tbody>";
    for (const auto& row : rows) {
        s += row.css_class.empty() ? "<tr>" : "<tr class=\"" + escape_html(row.css_class) + "\">";
        for (const auto& cell : row.cells) s += "<td>" + escape_html(cell) + "</td>";
        s += "</tr>";
    }
    return s + "</tbody></table></section>";
}

std::string figure(const std::string& id, const std::string& svg, const std::string& caption) {
    return "<figure id=\"" + escape_html(id) + "\">" + svg + "<figcaption>" + escape_html(caption) +
           "</figcaption></figure>";
}

}  // namespace heatbead::post
