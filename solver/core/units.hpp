// Quantities with units, as written in case files, and their conversion to the internal units.
#pragma once

#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead::units {

// What a quantity measures. Every value inside heatbead is held in the internal unit of its dimension:
//
//     length m, speed m/s, temperature degC, time s, current A, voltage V, power W, angle rad,
//     heat_transfer_coefficient W/(m2 K), conductivity W/(m K), memory byte,
//     energy_per_length J/m, hydrogen ml/100g (diffusible hydrogen per 100 g of weld metal),
//     specific_energy J/kg (latent heat), energy J (an arc-energy meter's reading),
//     fraction 1 (0..1, so 80 % is 0.8).
//
// These are SI units with one deliberate exception: temperatures are held in degrees Celsius, not
// kelvin, because the numbers people check (preheat, interpass, the 800 degC and 500 degC of t8/5) are
// quoted in degC, and a temperature difference is the same in both scales. Code whose physics needs
// absolute temperature, such as radiation q = eps·sigma·(T^4 - T_inf^4), converts with kelvin() below.
enum class Dimension {
    length,
    speed,
    temperature,
    time,
    current,
    voltage,
    power,
    angle,
    heat_transfer_coefficient,
    conductivity,
    memory,
    energy_per_length,
    hydrogen,
    specific_energy,
    energy,
    fraction
};

// Absolute temperature of a Celsius temperature: T/K = t/degC + 273.15 (definition of the Celsius scale).
inline constexpr double kelvin_at_0_degC = 273.15;
constexpr double kelvin(double celsius) { return celsius + kelvin_at_0_degC; }

// Thrown for anything that cannot be read or converted. The message is complete on its own (it quotes
// the offending text and lists the accepted units), because it is shown to users next to the case-file key.
struct UnitError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

// Human words for the dimension, e.g. "length", "heat transfer coefficient".
std::string_view dimension_name(Dimension dim);

// The unit values of this dimension are held in, e.g. "m", "degC", "byte", "1" (see Dimension).
std::string_view internal_unit(Dimension dim);

// The canonical spellings of the units of a dimension, in the order they are listed in messages,
// e.g. {"mm", "cm", "m", "in", "ft"}. A few other spellings are also accepted ("inch", "ipm", "°C", "C",
// "W/m2K", "mL/100g", ...); they are left out here to keep messages short.
std::vector<std::string> unit_names(Dimension dim);

// Whether `unit` (any accepted spelling) is a unit of `dim`. Spellings are case-sensitive; surrounding
// white space is ignored and runs of inner white space count as one space ("ml/100  g").
bool is_unit_of(std::string_view unit, Dimension dim);

// A value written in `unit`, in the internal unit of `dim`; for a case-file key given as a bare number in
// its default unit. Throws UnitError if `unit` is not a unit of `dim` or the value is not finite.
double to_internal(double value, std::string_view unit, Dimension dim);

// The inverse of to_internal: an internal value expressed in `unit`. Throws UnitError for a unit not of `dim`.
double from_internal(double internal, std::string_view unit, Dimension dim);

// Reads a quantity "number unit" and returns it in the internal unit of `dim`.
//
// The number is a decimal ("12", "-10", "0.5", "1.2e3") or, for inch sizes, a fraction of whole numbers:
// "a/b", "w a/b" or "w-a/b" ("1/2 in", "1 1/2 in", "1-1/2 in"), optionally signed. White space between
// number and unit is optional ("12mm"). Examples: "7 mm/s", "300 ipm", "9 m/min", "300 degF", "293 K",
// "45 deg", "8 GB", "1.1 kJ/mm", "5 ml/100g", "80 %".
// Diffusible hydrogen also takes a consumable's designator or hydrogen scale: "H4", "H5", "H8",
// "H10", "H15", "H16" (the upper limit of the class) or "scale B" … "scale E" (EN 1011-2).
//
// Throws UnitError when there is no number, no unit, a unit not of `dim`, a number that is not finite or out
// of range, or a fraction that is not of whole numbers or divides by zero. A bare number is an error here;
// callers convert bare numbers in their key's default unit with to_internal.
double parse(std::string_view text, Dimension dim);

// An internal value written in `unit` as text that parse() reads back, e.g. format(0.012, "mm", length)
// == "12 mm" and format(150, "degC", temperature) == "150 degC".
//
// The number is rounded to 12 significant digits, which removes the noise of unit conversion (12 mm, not
// 12.000000000000002 mm); a value with at most 12 significant digits in `unit` therefore round-trips
// exactly, any other to a relative 5e-12. Throws UnitError for a unit not of `dim` or a value that is not
// finite in `unit`.
std::string format(double internal, std::string_view unit, Dimension dim);

}  // namespace heatbead::units
