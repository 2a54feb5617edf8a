// Small text tables of numbers, as users write them for heatbead (property tables, recorded
// waveforms): one row per line; cells separated by commas (CSV, blanks around cells ignored) or
// else by runs of blanks; '#' starts a comment; a first content line without any number is a
// header; a UTF-8 byte-order mark is skipped. Every problem names file:line:column, the text found
// and what is allowed.
#pragma once

#include <cstddef>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

struct NumberTableError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

struct NumberCell {
    double value = 0;
    std::string text;
    std::size_t column = 0;  // 1-based
};

struct NumberRow {
    std::vector<NumberCell> cells;
    std::size_t line = 0;
};

// What a table holds: its name in messages ("property table"), the name of each column in
// messages ("conductivity") and the columns as a header would spell them ("temperature_degC, ...").
struct NumberTableLayout {
    std::string_view kind;
    std::span<const std::string_view> column_names;
    std::string_view header;
};

// The rows of `path`, each with one finite number per column, at least `min_rows` of them.
std::vector<NumberRow> read_number_table(const std::string& path, const NumberTableLayout& layout, std::size_t min_rows);

// Throws NumberTableError "path:line:column: what".
[[noreturn]] void number_table_error(const std::string& path, std::size_t line, std::size_t column,
                                     const std::string& what);

}  // namespace heatbead
