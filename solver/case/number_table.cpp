#include "solver/case/number_table.hpp"

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstring>
#include <fstream>

namespace heatbead {

namespace {

struct Cell {
    std::string_view text;
    std::size_t column;  // 1-based
};

bool is_blank(char ch) { return ch == ' ' || ch == '\t' || ch == '\r' || ch == '\v' || ch == '\f'; }

// The cell text between begin and end of `line`, without surrounding blanks.
Cell trimmed_cell(std::string_view line, std::size_t begin, std::size_t end) {
    while (begin < end && is_blank(line[begin])) ++begin;
    while (end > begin && is_blank(line[end - 1])) --end;
    return {line.substr(begin, end - begin), begin + 1};
}

// Cells separated by commas if the line has any (CSV; blanks around cells ignored), else by runs of blanks.
std::vector<Cell> split_cells(std::string_view line) {
    std::vector<Cell> cells;
    if (line.find(',') != std::string_view::npos) {
        std::size_t begin = 0;
        for (std::size_t comma; (comma = line.find(',', begin)) != std::string_view::npos; begin = comma + 1)
            cells.push_back(trimmed_cell(line, begin, comma));
        cells.push_back(trimmed_cell(line, begin, line.size()));
        return cells;
    }
    for (std::size_t pos = 0; pos < line.size();) {
        if (is_blank(line[pos])) {
            ++pos;
            continue;
        }
        const std::size_t begin = pos;
        while (pos < line.size() && !is_blank(line[pos])) ++pos;
        cells.push_back({line.substr(begin, pos - begin), begin + 1});
    }
    return cells;
}

// A decimal number filling the whole text ("20", "-5", "+1.5e3"); from_chars also reads "nan" and "inf".
bool parse_double(std::string_view text, double& value) {
    if (text.size() > 1 && text.front() == '+' && text[1] != '-') text.remove_prefix(1);
    const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
    return ec == std::errc() && end == text.data() + text.size() && !text.empty();
}

// A header is a first content line in which no cell is a number, so a typo in a first data row ("2O, 45,
// 440") is reported rather than skipped.
bool is_header(const std::vector<Cell>& cells) {
    double ignored;
    return std::none_of(cells.begin(), cells.end(), [&](const Cell& c) { return parse_double(c.text, ignored); });
}

}  // namespace

void number_table_error(const std::string& path, std::size_t line, std::size_t column, const std::string& what) {
    throw NumberTableError(path + ":" + std::to_string(line) + ":" + std::to_string(column) + ": " + what);
}

std::vector<NumberRow> read_number_table(const std::string& path, const NumberTableLayout& layout, std::size_t min_rows) {
    std::ifstream in(path);
    const std::string kind(layout.kind), header(layout.header);
    const std::size_t columns = layout.column_names.size();
    if (!in) throw NumberTableError(path + ": cannot open the " + kind + ": " + std::strerror(errno));
    std::vector<NumberRow> rows;
    bool header_allowed = true;
    std::string text;
    std::size_t line = 0;
    while (std::getline(in, text)) {
        ++line;
        std::string_view view = text;
        if (line == 1 && view.starts_with("\xEF\xBB\xBF")) view.remove_prefix(3);  // UTF-8 byte-order mark
        view = view.substr(0, view.find('#'));
        const std::vector<Cell> cells = split_cells(view);
        if (cells.empty()) continue;  // blank or comment-only line
        if (header_allowed && is_header(cells)) {
            header_allowed = false;
            continue;
        }
        header_allowed = false;
        if (cells.size() != columns)
            number_table_error(path, line, cells.size() > columns ? cells[columns].column : 1,
                               "the row '" + std::string(view.substr(cells.front().column - 1)) + "' has " +
                                   std::to_string(cells.size()) + " cells; expected " + std::to_string(columns) +
                                   ": " + header);
        NumberRow row{{}, line};
        for (std::size_t i = 0; i < columns; ++i) {
            const Cell& cell = cells[i];
            const std::string where = std::string(layout.column_names[i]) + " ";
            const std::string shown = "'" + std::string(cell.text) + "'";
            if (cell.text.empty())
                number_table_error(path, line, cell.column,
                                   where + "cell is empty; expected a decimal number such as 20, 45.5 or 6.1e2");
            double value;
            if (!parse_double(cell.text, value))
                number_table_error(path, line, cell.column,
                                   where + shown + " is not a number; expected a decimal number such as 20, 45.5 or 6.1e2");
            if (!std::isfinite(value))
                number_table_error(path, line, cell.column,
                                   where + shown + " is not a finite number; NaN and infinity are not allowed");
            row.cells.push_back({value, std::string(cell.text), cell.column});
        }
        rows.push_back(std::move(row));
    }
    if (in.bad()) throw NumberTableError(path + ": cannot read the " + kind + ": " + std::strerror(errno));
    if (rows.size() < min_rows)
        number_table_error(path, rows.empty() ? std::max<std::size_t>(line, 1) : rows.front().line, 1,
                           "the " + kind + (rows.empty() ? " has no data row" : rows.size() == 1 ? " has only this one data row"
                                                                                               : " has too few data rows") +
                               "; at least " + std::to_string(min_rows) + " rows of " + header + " are needed");
    return rows;
}

}  // namespace heatbead
