#include "solver/core/units.hpp"

#include <array>
#include <charconv>
#include <cmath>
#include <optional>
#include <numbers>
#include <span>
#include <system_error>

namespace heatbead::units {
namespace {

struct DimensionInfo {
    std::string_view name;      // human words
    std::string_view internal;  // internal unit
    std::string_view example;   // a quantity suggested in messages; it must parse
};

DimensionInfo info(Dimension dim) {
    // A switch, so that the compiler (-Wswitch) points here when a dimension is added.
    switch (dim) {
        case Dimension::length: return {"length", "m", "12 mm"};
        case Dimension::speed: return {"speed", "m/s", "7 mm/s"};
        case Dimension::temperature: return {"temperature", "degC", "150 degC"};
        case Dimension::time: return {"time", "s", "30 s"};
        case Dimension::current: return {"current", "A", "250 A"};
        case Dimension::voltage: return {"voltage", "V", "24 V"};
        case Dimension::power: return {"power", "W", "6 kW"};
        case Dimension::angle: return {"angle", "rad", "45 deg"};
        case Dimension::heat_transfer_coefficient: return {"heat transfer coefficient", "W/(m2 K)", "10 W/(m2 K)"};
        case Dimension::conductivity: return {"thermal conductivity", "W/(m K)", "45 W/(m K)"};
        case Dimension::memory: return {"memory", "byte", "8 GB"};
        case Dimension::energy_per_length: return {"energy per length", "J/m", "1.1 kJ/mm"};
        case Dimension::hydrogen: return {"diffusible hydrogen", "ml/100g", "5 ml/100g"};
        case Dimension::specific_energy: return {"energy per mass", "J/kg", "270 kJ/kg"};
        case Dimension::energy: return {"energy", "J", "85 kJ"};
        case Dimension::fraction: return {"fraction", "1", "80 %"};
    }
    throw std::invalid_argument("heatbead::units: invalid Dimension value");
}

// A unit, by its canonical spelling. A value v in this unit is, in the internal unit of its dimension,
//     internal = (v - zero) · num / den.
// Each definition is kept as an exact ratio (1 in = 254/10000 m) and applied as multiply-then-divide, so
// "1/2 in" gives the double nearest to 0.0127 m; multiplying by the rounded double 0.0254 would not
// guarantee that. `zero` is non-zero only for temperature scales whose zero is not at 0 degC.
struct Unit {
    std::string_view name;
    Dimension dim;
    double num = 1;
    double den = 1;
    double zero = 0;

    double to_internal(double value) const { return (value - zero) * num / den; }
    double from_internal(double internal) const { return internal * den / num + zero; }
};

// Canonical units in the order they are listed in messages. Every name is unique across dimensions.
std::span<const Unit> units() {
    using enum Dimension;
    static constexpr Unit table[] = {
        // 1 in = 25.4 mm exactly (international yard and pound, 1959); 1 ft = 12 in.
        {"mm", length, 1, 1000},
        {"cm", length, 1, 100},
        {"m", length},
        {"in", length, 254, 10'000},
        {"ft", length, 12 * 254, 10'000},
        // 1 min = 60 s, 1 h = 3600 s.
        {"mm/s", speed, 1, 1000},
        {"mm/min", speed, 1, 60 * 1000},
        {"cm/min", speed, 1, 60 * 100},
        {"m/s", speed},
        {"m/min", speed, 1, 60},
        {"m/h", speed, 1, 3600},
        {"in/s", speed, 254, 10'000},
        {"in/min", speed, 254, 60 * 10'000},
        {"ft/min", speed, 12 * 254, 60 * 10'000},
        // t/degC = (t/degF - 32) · 5/9 and t/degC = T/K - 273.15.
        {"degC", temperature},
        {"degF", temperature, 5, 9, 32},
        {"K", temperature, 1, 1, kelvin_at_0_degC},
        {"s", time},
        {"ms", time, 1, 1000},
        {"min", time, 60},
        {"h", time, 3600},
        {"A", current},
        {"kA", current, 1000},
        {"V", voltage},
        {"W", power},
        {"kW", power, 1000},
        // 1 deg = pi/180 rad.
        {"deg", angle, std::numbers::pi, 180},
        {"rad", angle},
        {"W/(m2 K)", heat_transfer_coefficient},
        {"W/(m K)", conductivity},
        // Decimal prefixes are powers of 1000, binary ones (Ki, Mi, Gi) powers of 1024.
        {"B", memory},
        {"kB", memory, 1e3},
        {"MB", memory, 1e6},
        {"GB", memory, 1e9},
        {"KiB", memory, 1024.0},
        {"MiB", memory, 1024.0 * 1024},
        {"GiB", memory, 1024.0 * 1024 * 1024},
        {"J/mm", energy_per_length, 1000},
        {"kJ/mm", energy_per_length, 1e6},
        {"J/m", energy_per_length},
        {"kJ/m", energy_per_length, 1000},
        {"J/in", energy_per_length, 10'000, 254},
        {"kJ/in", energy_per_length, 1000 * 10'000, 254},
        {"ml/100g", hydrogen},
        {"J/kg", specific_energy},
        {"kJ/kg", specific_energy, 1000},
        {"J", energy},
        {"kJ", energy, 1000},
        {"MJ", energy, 1e6},
        {"%", fraction, 1, 100},
    };
    return table;
}

// Other accepted spellings and the canonical name each stands for.
struct Alias {
    std::string_view spelling;
    std::string_view name;
};

constexpr Alias aliases[] = {
    {"inch", "in"},
    {"ipm", "in/min"},
    {"°C", "degC"},
    {"C", "degC"},
    {"°F", "degF"},
    {"F", "degF"},
    {"°", "deg"},
    {"W/(m^2 K)", "W/(m2 K)"},
    {"W/(m2·K)", "W/(m2 K)"},
    {"W/(m^2·K)", "W/(m2 K)"},
    {"W/m2K", "W/(m2 K)"},
    {"W/mK", "W/(m K)"},
    {"W/(m·K)", "W/(m K)"},
    {"mL/100g", "ml/100g"},
    {"ml/100 g", "ml/100g"},
    {"mL/100 g", "ml/100g"},
};

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

bool is_digit(char c) { return c >= '0' && c <= '9'; }

std::string_view trim(std::string_view s) {
    while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
    while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
    return s;
}

// `unit` trimmed, with every run of inner white space replaced by one space.
std::string normalise(std::string_view unit) {
    std::string out;
    for (const char c : trim(unit)) {
        if (!is_space(c)) {
            out += c;
        } else if (out.back() != ' ') {  // out is not empty: the unit is trimmed
            out += ' ';
        }
    }
    return out;
}

// The unit an accepted spelling stands for, whatever its dimension, or nullptr.
const Unit* find_any(std::string_view spelling) {
    std::string name = normalise(spelling);
    for (const Alias& a : aliases) {
        if (a.spelling == name) {
            name = a.name;
            break;
        }
    }
    for (const Unit& u : units()) {
        if (u.name == name) return &u;
    }
    return nullptr;
}

const Unit* find(std::string_view spelling, Dimension dim) {
    const Unit* u = find_any(spelling);
    return u != nullptr && u->dim == dim ? u : nullptr;
}

std::string units_list(Dimension dim) {
    std::string out;
    for (const Unit& u : units()) {
        if (u.dim != dim) continue;
        if (!out.empty()) out += ", ";
        out += u.name;
    }
    return out;
}

std::string quoted(std::string_view s) { return '"' + std::string(s) + '"'; }

// The advice ending every message about a malformed quantity.
std::string write_advice(Dimension dim) {
    return "write a number and a unit, e.g. " + quoted(info(dim).example) + " (units of " +
           std::string(info(dim).name) + ": " + units_list(dim) + ")";
}

// Why `spelling` is refused for `dim`, with the units that would be accepted.
std::string unknown_unit(std::string_view spelling, Dimension dim) {
    std::string why = quoted(spelling) + " is not a unit of " + std::string(info(dim).name);
    if (const Unit* other = find_any(spelling)) why += " but of " + std::string(info(other->dim).name);
    return why + "; use one of: " + units_list(dim);
}

// The message format of every UnitError about a quantity: "<text>": <reason>; <advice>.
[[noreturn]] void raise(std::string_view text, const std::string& reason_and_advice) {
    throw UnitError(quoted(text) + ": " + reason_and_advice);
}

// Shortest text that reads back as exactly `value` ("inf" and "nan" included), for messages.
std::string exact_text(double value) {
    std::array<char, 32> buf{};
    const auto end = std::to_chars(buf.data(), buf.data() + buf.size(), value).ptr;
    return std::string(buf.data(), end);
}

const Unit& require(std::string_view unit, Dimension dim) {
    const Unit* u = find(unit, dim);
    if (u == nullptr) throw UnitError(unknown_unit(unit, dim));
    return *u;
}

// to_internal, quoting shown() (called only on error) as the offending text.
template <class Shown>
double convert(double value, std::string_view unit, Dimension dim, Shown shown) {
    const Unit* u = find(unit, dim);
    if (u == nullptr) raise(shown(), unknown_unit(unit, dim));
    if (!std::isfinite(value)) raise(shown(), "not a finite number; " + write_advice(dim));
    const double internal = u->to_internal(value);
    if (!std::isfinite(internal)) {
        raise(shown(), "too large to hold in " + std::string(info(dim).internal) + "; " + write_advice(dim));
    }
    return internal;
}

// A number at the start of a trimmed quantity, with where it ends.
struct Number {
    double value;
    std::size_t end;
};

// The text being parsed and its dimension, for error messages.
struct Source {
    std::string_view text;
    Dimension dim;

    [[noreturn]] void fail(const std::string& reason) const {
        raise(text, reason + "; " + write_advice(dim));
    }
};

std::size_t digits_at(std::string_view s, std::size_t pos) {
    std::size_t n = 0;
    while (pos + n < s.size() && is_digit(s[pos + n])) ++n;
    return n;
}

// The decimal number starting at s[pos] ("12", "0.5", "1.2e3"; no sign), with where it ends.
Number decimal_at(std::string_view s, std::size_t pos, const Source& src) {
    double value = 0;
    const auto [end, ec] = std::from_chars(s.data() + pos, s.data() + s.size(), value);
    if (ec == std::errc::invalid_argument) src.fail("no number found");
    if (ec == std::errc::result_out_of_range) src.fail("number out of range");
    if (!std::isfinite(value)) src.fail("not a finite number");  // from_chars reads "inf" and "nan"
    return {value, static_cast<std::size_t>(end - s.data())};
}

// Where the numerator of a mixed number "w a/b" or "w-a/b" starts, given where w ends; npos if s has
// no such fraction there.
std::size_t mixed_numerator_at(std::string_view s, std::size_t whole_end) {
    std::size_t pos = whole_end;
    if (pos < s.size() && s[pos] == '-') {
        ++pos;
    } else {
        while (pos < s.size() && is_space(s[pos])) ++pos;
        if (pos == whole_end) return std::string_view::npos;
    }
    const std::size_t n = digits_at(s, pos);
    return n > 0 && pos + n < s.size() && s[pos + n] == '/' ? pos : std::string_view::npos;
}

// Reads the number at the start of s (trimmed): a signed decimal, or a signed fraction a/b, w a/b, w-a/b.
Number read_number(std::string_view s, const Source& src) {
    std::size_t start = 0;
    double sign = 1;
    if (!s.empty() && (s[0] == '+' || s[0] == '-')) {
        sign = s[0] == '-' ? -1 : 1;
        start = 1;
    }
    // from_chars takes a leading '-' itself; refuse it after our sign so "--5" is not a number.
    if (start < s.size() && (s[start] == '+' || s[start] == '-')) src.fail("no number found");

    const auto [first, first_end] = decimal_at(s, start, src);
    const std::string_view first_text = s.substr(start, first_end - start);

    // A fraction is either "a/b" (the first number is a) or "w a/b", "w-a/b" (the first number is w).
    double whole = 0;
    std::size_t numerator_at = std::string_view::npos;
    if (first_end < s.size() && s[first_end] == '/') {
        numerator_at = start;
    } else {
        numerator_at = mixed_numerator_at(s, first_end);
        whole = first;
    }
    if (numerator_at == std::string_view::npos) return {sign * first, first_end};

    if (digits_at(first_text, 0) != first_text.size()) {
        src.fail("a fraction takes whole numbers only, as in 1/2, 1 1/2 or 1-1/2");
    }
    const std::size_t slash = numerator_at + digits_at(s, numerator_at);
    const std::size_t denominator_digits = digits_at(s, slash + 1);
    if (denominator_digits == 0) src.fail("a fraction needs a whole-number denominator after '/'");
    const std::size_t end = slash + 1 + denominator_digits;
    // Bounded at `end`, so that from_chars cannot run on into "2.5" or "2e3" after the digits.
    const std::string_view fraction = s.substr(0, end);
    const double numerator = decimal_at(fraction, numerator_at, src).value;
    const double denominator = decimal_at(fraction, slash + 1, src).value;
    if (denominator == 0) src.fail("division by zero in " + quoted(s.substr(numerator_at, end - numerator_at)));
    return {sign * (whole + numerator / denominator), end};
}

}  // namespace

std::string_view dimension_name(Dimension dim) { return info(dim).name; }

std::string_view internal_unit(Dimension dim) { return info(dim).internal; }

std::vector<std::string> unit_names(Dimension dim) {
    std::vector<std::string> names;
    for (const Unit& u : units()) {
        if (u.dim == dim) names.emplace_back(u.name);
    }
    return names;
}

bool is_unit_of(std::string_view unit, Dimension dim) { return find(unit, dim) != nullptr; }

double to_internal(double value, std::string_view unit, Dimension dim) {
    return convert(value, unit, dim, [&] { return exact_text(value) + " " + std::string(trim(unit)); });
}

double from_internal(double internal, std::string_view unit, Dimension dim) {
    return require(unit, dim).from_internal(internal);
}

namespace {

// Diffusible-hydrogen designators of consumables, as the upper limit of their class in ml/100 g
// of deposited metal (from memory): H4, H8, H16 as in the AWS filler-metal specifications; H5,
// H10, H15 as in the EN ISO consumable standards; hydrogen scales B to E of EN 1011-2 (scale A,
// over 15, has no upper limit and is refused).
std::optional<double> hydrogen_designator(std::string_view s) {
    static constexpr std::pair<std::string_view, double> table[] = {
        {"H4", 4},         {"H5", 5},         {"H8", 8},         {"H10", 10},       {"H15", 15},
        {"H16", 16},       {"scale B", 15},   {"scale C", 10},   {"scale D", 5},    {"scale E", 3}};
    for (const auto& [name, value] : table) {
        if (s == name) return value;
    }
    if (s == "scale A") {
        throw UnitError("\"scale A\": hydrogen scale A (over 15 ml/100g) has no upper limit; give the measured "
                        "value, e.g. \"18 ml/100g\"");
    }
    return std::nullopt;
}

}  // namespace

double parse(std::string_view text, Dimension dim) {
    const Source src{text, dim};
    const std::string_view s = trim(text);
    if (dim == Dimension::hydrogen) {
        if (const auto designated = hydrogen_designator(s)) return *designated;
    }
    const Number number = read_number(s, src);
    const std::string_view unit = trim(s.substr(number.end));
    if (unit.empty()) src.fail("no unit");
    return convert(number.value, unit, dim, [&] { return std::string(text); });
}

std::string format(double internal, std::string_view unit, Dimension dim) {
    const Unit& u = require(unit, dim);
    double shown = u.from_internal(internal);
    if (!std::isfinite(shown)) {
        throw UnitError("cannot write " + exact_text(internal) + " " + std::string(info(dim).internal) + " in " +
                        quoted(u.name) + ": the result is not a finite number");
    }
    if (shown == 0) shown = 0;  // write -0 as "0"
    std::array<char, 32> buf{};
    const auto end = std::to_chars(buf.data(), buf.data() + buf.size(), shown, std::chars_format::general, 12).ptr;
    return std::string(buf.data(), end) + " " + normalise(unit);
}

}  // namespace heatbead::units
