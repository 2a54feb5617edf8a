// Quantity parsing and unit conversion, checked against the definitions of the units.
//
// Sources, as cited beside each check (all recalled from memory, not looked up):
//  - inch and foot: 1 in = 25.4 mm exactly and 1 ft = 12 in, from the international yard and pound
//    agreement of 1959, as listed in NIST SP 811 (Guide for the Use of the SI), appendix B;
//  - Fahrenheit: t/degC = (t/degF - 32)/1.8, NIST SP 811;
//  - Celsius: t/degC = T/K - 273.15, the definition of the Celsius temperature in the SI Brochure (BIPM);
//  - minute, hour, degree of angle: 1 min = 60 s, 1 h = 3600 s, 1 deg = (pi/180) rad, non-SI units
//    accepted for use with the SI, SI Brochure;
//  - SI prefixes k = 1e3, M = 1e6, G = 1e9 (SI Brochure) and binary prefixes Ki = 2^10, Mi = 2^20,
//    Gi = 2^30 (IEC 80000-13);
//  - percent: 1 % = 0.01, NIST SP 811.
#include "solver/core/units.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <numbers>
#include <string>
#include <vector>

using Catch::Matchers::Contains;
using heatbead::units::Dimension;
using heatbead::units::format;
using heatbead::units::parse;
using heatbead::units::UnitError;

namespace {

// Relative tolerance for results that involve a few roundings of double arithmetic.
constexpr double tight = 1e-13;

Approx near(double expected) { return Approx(expected).epsilon(tight).margin(0); }

// The message of the UnitError that call() throws; fails the test if it throws nothing.
template <class Call>
std::string error_of(Call call) {
    try {
        call();
    } catch (const UnitError& e) {
        return e.what();
    }
    FAIL("no UnitError was thrown");
    return {};
}

std::string parse_error(std::string_view text, Dimension dim) {
    INFO("parse(\"" << std::string(text) << "\")");
    return error_of([&] { parse(text, dim); });
}

const std::vector<Dimension> all_dimensions = {
    Dimension::length,       Dimension::speed,  Dimension::temperature,       Dimension::time,
    Dimension::current,      Dimension::voltage, Dimension::power,            Dimension::angle,
    Dimension::heat_transfer_coefficient,        Dimension::conductivity,     Dimension::memory,
    Dimension::energy_per_length,                Dimension::hydrogen,         Dimension::specific_energy,
    Dimension::energy,                           Dimension::fraction,
};

}  // namespace

TEST_CASE("lengths in metric units and inches", "[units]") {
    using enum Dimension;
    CHECK(parse("12 mm", length) == near(0.012));
    CHECK(parse("12mm", length) == near(0.012));
    CHECK(parse("  12 \t mm ", length) == near(0.012));
    CHECK(parse("2.5 cm", length) == near(0.025));
    CHECK(parse("1.5 m", length) == near(1.5));
    // 1 in = 25.4 mm exactly, 1 ft = 12 in (1959 agreement; NIST SP 811).
    CHECK(parse("0.5 in", length) == near(0.0127));
    CHECK(parse("1 inch", length) == near(0.0254));
    CHECK(parse("2 ft", length) == near(0.6096));
}

TEST_CASE("fractional inches", "[units]") {
    using enum Dimension;
    // 1 in = 25.4 mm exactly (1959 agreement; NIST SP 811).
    CHECK(parse("1/2 in", length) == near(0.0127));
    CHECK(parse("3/8 in", length) == near(0.009525));
    CHECK(parse("1 1/2 in", length) == near(0.0381));
    CHECK(parse("1-1/2 in", length) == near(0.0381));
    CHECK(parse("1 1/2in", length) == near(0.0381));
    CHECK(parse("-1/2 in", length) == near(-0.0127));
    CHECK(parse("-1 1/2 in", length) == near(-0.0381));
}

TEST_CASE("travel speeds", "[units]") {
    using enum Dimension;
    CHECK(parse("7 mm/s", speed) == near(0.007));
    // 1 in = 25.4 mm (1959 agreement; NIST SP 811), 1 min = 60 s (SI Brochure):
    // 16 in/min = 16 · 25.4 mm / 60 s = 6.77333... mm/s.
    CHECK(parse("16 in/min", speed) == near(16 * 25.4e-3 / 60));
    CHECK(parse("16 in/min", speed) == Approx(6.7733e-3).epsilon(1e-5));
    // ipm is the trade abbreviation of inches per minute (common practice, no source): 300 ipm = 127 mm/s.
    CHECK(parse("300 ipm", speed) == near(0.127));
    // 9 m/min = 9 m / 60 s = 0.15 m/s (SI Brochure, minute).
    CHECK(parse("9 m/min", speed) == near(0.15));
    CHECK(parse("600 mm/min", speed) == near(0.01));
    CHECK(parse("60 cm/min", speed) == near(0.01));
    CHECK(parse("36 m/h", speed) == near(0.01));
    CHECK(parse("1 in/s", speed) == near(0.0254));
    CHECK(parse("10 ft/min", speed) == near(10 * 0.3048 / 60));
}

TEST_CASE("temperatures are held in degrees Celsius", "[units]") {
    using enum Dimension;
    CHECK(parse("150 degC", temperature) == near(150));
    CHECK(parse("-10 degC", temperature) == near(-10));
    CHECK(parse("20 °C", temperature) == near(20));
    CHECK(parse("20 C", temperature) == near(20));
    // t/degC = (t/degF - 32)/1.8 (NIST SP 811): 300 degF = 148.888... degC, 32 degF = 0 degC.
    CHECK(parse("300 degF", temperature) == near((300 - 32) / 1.8));
    CHECK(parse("300 degF", temperature) == Approx(148.8888888889).epsilon(1e-12));
    CHECK(parse("32 °F", temperature) == near(0).margin(1e-12));
    CHECK(parse("-40 F", temperature) == near(-40));
    // t/degC = T/K - 273.15 (SI Brochure).
    CHECK(parse("293 K", temperature) == near(19.85));
    CHECK(parse("273.15 K", temperature) == Approx(0).margin(1e-12));
    CHECK(heatbead::units::kelvin(20) == near(293.15));
}

TEST_CASE("welding electrical quantities, time, angle, memory, heat input, hydrogen, fractions", "[units]") {
    using enum Dimension;
    CHECK(parse("250 A", current) == near(250));
    CHECK(parse("1.2 kA", current) == near(1200));
    CHECK(parse("24 V", voltage) == near(24));
    CHECK(parse("1.2e3 W", power) == near(1200));
    CHECK(parse("6 kW", power) == near(6000));
    // 1 min = 60 s, 1 h = 3600 s (SI Brochure).
    CHECK(parse("30 s", time) == near(30));
    CHECK(parse("250 ms", time) == near(0.25));
    CHECK(parse("2 min", time) == near(120));
    CHECK(parse("1.5 h", time) == near(5400));
    // 1 deg = pi/180 rad (SI Brochure).
    CHECK(parse("45 deg", angle) == near(std::numbers::pi / 4));
    CHECK(parse("90°", angle) == near(std::numbers::pi / 2));
    CHECK(parse("0.5 rad", angle) == near(0.5));
    // SI prefixes (SI Brochure) and binary prefixes (IEC 80000-13).
    CHECK(parse("8 GB", memory) == near(8e9));
    CHECK(parse("512 MB", memory) == near(512e6));
    CHECK(parse("4 kB", memory) == near(4000));
    CHECK(parse("100 B", memory) == near(100));
    CHECK(parse("8 GiB", memory) == near(8.0 * 1024 * 1024 * 1024));
    CHECK(parse("3 MiB", memory) == near(3.0 * 1024 * 1024));
    CHECK(parse("2 KiB", memory) == near(2048));
    // 1 kJ/mm = 1000 J / 0.001 m = 1e6 J/m; 1 in = 0.0254 m (1959 agreement; NIST SP 811).
    CHECK(parse("1.1 kJ/mm", energy_per_length) == near(1.1e6));
    CHECK(parse("800 J/mm", energy_per_length) == near(8e5));
    CHECK(parse("1.5 kJ/m", energy_per_length) == near(1500));
    CHECK(parse("2 J/m", energy_per_length) == near(2));
    CHECK(parse("25.4 kJ/in", energy_per_length) == near(1e6));
    CHECK(parse("254 J/in", energy_per_length) == near(1e4));
    // Diffusible hydrogen is quoted in ml per 100 g of weld metal (common practice, no source).
    CHECK(parse("5 ml/100g", hydrogen) == near(5));
    CHECK(parse("5 mL/100g", hydrogen) == near(5));
    CHECK(parse("5 ml/100 g", hydrogen) == near(5));
    // Designators read as the upper limit of their class (from memory): AWS H8, EN ISO H5, and
    // EN 1011-2 hydrogen scale D (3 to 5 ml/100 g); scale A has no upper limit and is refused.
    CHECK(parse("H8", hydrogen) == near(8));
    CHECK(parse(" H5 ", hydrogen) == near(5));
    CHECK(parse("scale D", hydrogen) == near(5));
    CHECK_THROWS_WITH(parse("scale A", hydrogen), Catch::Contains("no upper limit"));
    CHECK_THROWS(parse("H7", hydrogen));
    CHECK_THROWS(parse("H5", length));
    // Latent heat per mass: 1 kJ/kg = 1000 J/kg (SI prefix).
    CHECK(parse("277 kJ/kg", specific_energy) == near(277e3));
    // An arc-energy meter's reading: 1 kJ = 1000 J, 1 MJ = 10^6 J (SI prefixes).
    CHECK(parse("85 kJ", energy) == near(85e3));
    CHECK(parse("0.085 MJ", energy) == near(85e3));
    // 1 % = 0.01 (NIST SP 811).
    CHECK(parse("80 %", fraction) == near(0.8));
    CHECK(parse("80%", fraction) == near(0.8));
    // The film coefficient and the conductivity are already in their internal units.
    CHECK(parse("10 W/(m2 K)", heat_transfer_coefficient) == near(10));
    CHECK(parse("10 W/m2K", heat_transfer_coefficient) == near(10));
    CHECK(parse("10 W/(m^2 K)", heat_transfer_coefficient) == near(10));
    CHECK(parse("10 W/(m2·K)", heat_transfer_coefficient) == near(10));
    CHECK(parse("45 W/(m K)", conductivity) == near(45));
    CHECK(parse("45 W/mK", conductivity) == near(45));
}

TEST_CASE("bare numbers are converted with a default unit", "[units]") {
    using enum Dimension;
    using heatbead::units::from_internal;
    using heatbead::units::to_internal;
    // 1 in = 25.4 mm (1959 agreement; NIST SP 811); t/degC = (t/degF - 32)/1.8 (NIST SP 811).
    CHECK(to_internal(12, "mm", length) == near(0.012));
    CHECK(to_internal(212, "degF", temperature) == near(100));
    CHECK(from_internal(0.0254, "in", length) == near(1));
    CHECK(from_internal(100, "degF", temperature) == near(212));
    CHECK(from_internal(0, "K", temperature) == near(273.15));
    CHECK(from_internal(0.127, "ipm", speed) == near(300));
    CHECK_THROWS_AS(to_internal(12, "kg", length), UnitError);
    CHECK_THROWS_AS(from_internal(12, "kg", length), UnitError);
    CHECK_THAT(error_of([] { to_internal(std::numeric_limits<double>::infinity(), "degC", temperature); }),
               Contains("\"inf degC\": not a finite number") && Contains("degC, degF, K"));
}

TEST_CASE("format writes text that parse reads back", "[units]") {
    using enum Dimension;
    CHECK(format(0.012, "mm", length) == "12 mm");
    CHECK(format(150, "degC", temperature) == "150 degC");
    CHECK(format(-10, "degC", temperature) == "-10 degC");
    CHECK(format((300 - 32) / 1.8, "degF", temperature) == "300 degF");
    CHECK(format(19.85, "K", temperature) == "293 K");
    CHECK(format(0.127, "ipm", speed) == "300 ipm");
    CHECK(format(0.15, "m/min", speed) == "9 m/min");
    CHECK(format(1.1e6, "kJ/mm", energy_per_length) == "1.1 kJ/mm");
    CHECK(format(0.8, "%", fraction) == "80 %");
    CHECK(format(-0.0, "mm", length) == "0 mm");
    CHECK(format(1e15, "B", memory) == "1e+15 B");

    struct Case {
        double internal;
        std::string_view unit;
        Dimension dim;
    };
    const Case cases[] = {
        {0.012, "mm", length},
        {0.009525, "in", length},
        {1.0 / 3.0, "m", length},
        {2.5e-7, "mm", length},
        {6.7733e-3, "in/min", speed},
        {-17.5, "degF", temperature},
        {1200.25, "K", temperature},
        {std::numbers::pi / 7, "deg", angle},
        {8.0 * 1024 * 1024 * 1024, "GiB", memory},
        {1e15, "B", memory},
        {123456.789, "J/in", energy_per_length},
        {0.125, "%", fraction},
        {10.5, "W/(m2 K)", heat_transfer_coefficient},
    };
    for (const Case& c : cases) {
        const std::string text = format(c.internal, c.unit, c.dim);
        INFO(text);
        // 12 significant digits: back to within a relative 5e-12.
        CHECK(parse(text, c.dim) == Approx(c.internal).epsilon(5e-12).margin(0));
    }
}

TEST_CASE("unit names and dimensions", "[units]") {
    using enum Dimension;
    using heatbead::units::dimension_name;
    using heatbead::units::internal_unit;
    using heatbead::units::is_unit_of;
    using heatbead::units::unit_names;
    CHECK(dimension_name(length) == "length");
    CHECK(dimension_name(heat_transfer_coefficient) == "heat transfer coefficient");
    CHECK(internal_unit(temperature) == "degC");
    CHECK(internal_unit(memory) == "byte");
    CHECK(unit_names(length) == std::vector<std::string>{"mm", "cm", "m", "in", "ft"});
    CHECK(unit_names(temperature) == std::vector<std::string>{"degC", "degF", "K"});
    CHECK(is_unit_of("ipm", speed));
    CHECK(is_unit_of("ml/100  g", hydrogen));
    CHECK_FALSE(is_unit_of("mm", speed));
    CHECK_FALSE(is_unit_of("MM", length));
    // Every canonical unit of every dimension is accepted by parse and converts 1 to a finite value.
    for (const Dimension dim : all_dimensions) {
        CHECK_FALSE(dimension_name(dim).empty());
        CHECK_FALSE(internal_unit(dim).empty());
        CHECK_FALSE(unit_names(dim).empty());
        for (const std::string& unit : unit_names(dim)) {
            INFO(unit);
            CHECK(is_unit_of(unit, dim));
            CHECK(std::isfinite(parse("1 " + unit, dim)));
        }
    }
}

// The messages follow the project's rule for errors: self-contained, quoting the text, listing units.
TEST_CASE("errors quote the text and list the accepted units", "[units]") {
    using enum Dimension;
    const auto length_units = Contains("mm, cm, m, in, ft");

    CHECK(parse_error("12 kg", length) ==
          "\"12 kg\": \"kg\" is not a unit of length; use one of: mm, cm, m, in, ft");
    CHECK_THAT(parse_error("12 mm/s", length), Contains("\"12 mm/s\"") && Contains("of speed") && length_units);
    CHECK_THAT(parse_error("12 mm extra", length), Contains("\"mm extra\"") && length_units);
    CHECK_THAT(parse_error("12 MM", length), Contains("\"MM\"") && length_units);
    CHECK_THAT(parse_error("twelve mm", length),
               Contains("\"twelve mm\": no number found; write a number and a unit, e.g. \"12 mm\"") &&
                   length_units);
    CHECK_THAT(parse_error("12", length), Contains("\"12\": no unit") && Contains("\"12 mm\"") && length_units);
    CHECK_THAT(parse_error("", length), Contains("\"\": no number found") && length_units);
    CHECK_THAT(parse_error("mm", length), Contains("\"mm\": no number found") && length_units);
    CHECK_THAT(parse_error("--5 mm", length), Contains("\"--5 mm\": no number found") && length_units);
    CHECK_THAT(parse_error("inf mm", length), Contains("\"inf mm\": not a finite number") && length_units);
    CHECK_THAT(parse_error("nan mm", length), Contains("\"nan mm\": not a finite number") && length_units);
    CHECK_THAT(parse_error("-inf degC", temperature),
               Contains("\"-inf degC\": not a finite number") && Contains("degC, degF, K"));
    CHECK_THAT(parse_error("1e999 mm", length), Contains("\"1e999 mm\": number out of range") && length_units);
    CHECK_THAT(parse_error("1e308 GiB", memory), Contains("\"1e308 GiB\": too large") && Contains("KiB, MiB"));
    CHECK_THAT(parse_error("1/0 in", length), Contains("\"1/0 in\": division by zero") && length_units);
    CHECK_THAT(parse_error("1 1/0 in", length), Contains("\"1 1/0 in\": division by zero") && length_units);
    CHECK_THAT(parse_error("1.5/2 in", length), Contains("\"1.5/2 in\": a fraction takes whole numbers") &&
                                                    length_units);
    CHECK_THAT(parse_error("0.5 1/2 in", length), Contains("whole numbers") && length_units);
    CHECK_THAT(parse_error("1/ in", length), Contains("\"1/ in\": a fraction needs") && length_units);
    CHECK_THAT(parse_error("80 kg", fraction), Contains("\"80 kg\"") && Contains("use one of: %"));
    CHECK_THAT(error_of([] { format(1, "kg", length); }), Contains("\"kg\" is not a unit of length") && length_units);
}
