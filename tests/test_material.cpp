// The enthalpy-form material model, checked against EN 1993-1-2 and against hand computations.
//
// Sources, as cited beside each check:
//  - EN 1993-1-2:2005 §3.4.1 (carbon steel): λ = 54 − 3.33·10⁻²θ (20–800 °C), 27.3 W/(m K) (800–1200 °C);
//    c = 425 + 0.773θ − 1.69·10⁻³θ² + 2.22·10⁻⁶θ³ (20–600 °C), 666 + 13002/(738 − θ) (600–735 °C),
//    545 + 17820/(θ − 731) (735–900 °C), 650 J/(kg K) (900–1200 °C); ρ = 7850 kg/m³ (§3.2.2)
//    (formulas confirmed, sub-clause numbers from memory);
//  - solidus 1495 °C, liquidus 1540 °C, latent heat 277 kJ/kg: typical values for a C–Mn steel
//    (from memory);
//  - "hand computation": integrals of those formulas and other arithmetic done by hand (written out beside
//    each check), with the project's documented extension: k and c held constant outside 20–1200 °C;
//  - absolute zero −273.15 °C: definition of the Celsius scale, SI Brochure (from memory).
#include "solver/case/table_files.hpp"
#include "solver/physics/material.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <string>
#include <vector>

using Catch::Matchers::Contains;
using heatbead::make_en1993_steel;
using heatbead::Material;
using heatbead::MaterialError;
using heatbead::MaterialParameters;
using heatbead::read_property_table;

namespace {

constexpr double rho = 7850.0;             // EN 1993-1-2 §3.2.2
constexpr double c_20 = 439.80176;         // hand computation: 425 + 0.773·20 − 1.69e-3·400 + 2.22e-6·8000
constexpr double k_20 = 53.334;            // hand computation: 54 − 3.33e-2·20
constexpr double c_above_900 = 650.0;      // EN 1993-1-2 §3.4.1.2, held constant above 1200 °C
constexpr double k_above_800 = 27.3;       // EN 1993-1-2 §3.4.1.3, held constant above 1200 °C

Approx relative(double expected, double eps) { return Approx(expected).epsilon(eps).margin(0); }

// A file in the temporary directory that is removed again when the test ends.
class TempFile {
public:
    TempFile(const std::string& name, const std::string& contents)
        : path_((std::filesystem::temp_directory_path() / ("heatbead_test_material_" + name)).string()) {
        std::ofstream(path_) << contents;
    }
    ~TempFile() { std::filesystem::remove(path_); }
    TempFile(const TempFile&) = delete;
    TempFile& operator=(const TempFile&) = delete;
    const std::string& path() const { return path_; }

private:
    std::string path_;
};

// The message of the MaterialError that call() throws; fails the test if it throws nothing.
template <class Call>
std::string error_of(Call call) {
    try {
        call();
    } catch (const MaterialError& e) {
        return e.what();
    }
    FAIL("no MaterialError was thrown");
    return {};
}

// The error for a table with these contents, which must name the file and `where` (":line:column:").
void check_bad_table(const std::string& name, const std::string& contents, const std::string& where,
                     const std::string& value) {
    const TempFile file(name, contents);
    INFO("table " << name << ":\n" << contents);
    const std::string message = error_of([&] { read_property_table(file.path(), 7800, {}); });
    CHECK_THAT(message, Contains(file.path() + where));
    CHECK_THAT(message, Contains(value));
}

// Off-grid mushy range, so that ΔT = 42.5/43 K is not a whole number of kelvin.
MaterialParameters odd_parameters() { return {1470.3, 1512.8, 250e3, 2.5}; }

}  // namespace

TEST_CASE("EN 1993-1-2 conductivity through the Material", "[material]") {
    const Material steel = make_en1993_steel({});
    CHECK(steel.density() == rho);
    CHECK(steel.conductivity(400) == relative(40.68, 1e-12));  // EN 1993-1-2 §3.4.1.3: 54 − 3.33e-2·400
    CHECK(steel.conductivity(20) == relative(k_20, 1e-12));    // EN 1993-1-2 §3.4.1.3
    CHECK(steel.conductivity(1000) == relative(k_above_800, 1e-12));
    // Extension (documented): held at the 20 °C and 1200 °C values.
    CHECK(steel.conductivity(-50) == relative(k_20, 1e-12));
    CHECK(steel.conductivity(1300) == relative(k_above_800, 1e-12));
    CHECK(steel.conductivity(5000) == relative(k_above_800, 1e-12));
}

TEST_CASE("EN 1993-1-2 enthalpy differences match hand integration of c", "[material]") {
    const Material steel = make_en1993_steel({});
    // Hand computation from EN 1993-1-2 §3.4.1.2: ∫_20^600 (425 + 0.773θ − 1.69e-3θ² + 2.22e-6θ³) dθ
    //   = [425θ + 0.3865θ² − 5.6333e-4θ³ + 5.55e-7θ⁴]_20^600 = 335737.818 J/kg.
    // The enthalpy table is required to within 0.1 %; the trapezoidal rule on 1/16 K sub-steps is
    // far inside that.
    CHECK(steel.enthalpy(600) - steel.enthalpy(20) == relative(rho * 335737.818, 1e-6));
    // Hand computation across the 735 °C peak: ∫_600^735 (666 + 13002/(738 − θ)) dθ = 666·135 + 13002 ln(138/3)
    //   = 139689.995; ∫_735^900 (545 + 17820/(θ − 731)) dθ = 545·165 + 17820 ln(169/4) = 156636.030 J/kg.
    CHECK(steel.enthalpy(900) - steel.enthalpy(600) == relative(rho * (139689.995 + 156636.030), 1e-5));
}

TEST_CASE("enthalpy is zero at 0 degC and extends with constant c below 20 degC", "[material]") {
    const Material steel = make_en1993_steel({});
    CHECK(std::abs(steel.enthalpy(0)) < 1e-6);
    // Hand computation: c held at c(20) below 20 °C, so H(T) = ρ c(20) T there, also below the table's −100 °C.
    for (double T : {10.0, -40.0, -100.0, -150.0, -270.0}) {
        INFO("T = " << T);
        CHECK(steel.enthalpy(T) == relative(rho * c_20 * T, 1e-12));
        CHECK(steel.volumetric_heat_capacity(T) == relative(rho * c_20, 1e-12));
    }
    // Hand computation: c held at 650 above 1200 °C, also beyond the table's 3000 °C.
    CHECK(steel.enthalpy(3500) - steel.enthalpy(2000) == relative(rho * c_above_900 * 1500, 1e-12));
}

TEST_CASE("the mushy range adds exactly rho L", "[material]") {
    SECTION("default parameters, 1495-1540 degC, L = 277 kJ/kg") {
        const Material steel = make_en1993_steel({});
        // Hand computation: H(T_l) − H(T_s) − ρ·650·(1540 − 1495) = ρ L.
        const double latent = steel.enthalpy(1540) - steel.enthalpy(1495) - rho * c_above_900 * 45;
        CHECK(latent == relative(rho * 277e3, 1e-12));
        // Hand computation: dH/dT in the mushy range = ρ (c + L/(T_l − T_s)) = 7850 (650 + 277000/45).
        CHECK(steel.volumetric_heat_capacity(1510) == relative(rho * (650 + 277e3 / 45), 1e-12));
        CHECK(steel.volumetric_heat_capacity(1600) == relative(rho * c_above_900, 1e-12));
    }
    SECTION("a mushy range that is not a whole number of kelvin") {
        const MaterialParameters p = odd_parameters();
        const Material steel = make_en1993_steel(p);
        // Hand computation: T_l − T_s = 1512.8 − 1470.3 = 42.5 K.
        const double latent = steel.enthalpy(p.liquidus) - steel.enthalpy(p.solidus) - rho * c_above_900 * 42.5;
        CHECK(latent == relative(rho * p.latent_heat, 1e-11));
    }
}

TEST_CASE("liquid fraction is linear between solidus and liquidus", "[material]") {
    const Material steel = make_en1993_steel({});
    // Hand computation: f_l = (T − 1495)/45, clamped to [0, 1].
    CHECK(steel.liquid_fraction(1400) == 0.0);
    CHECK(steel.liquid_fraction(1495) == 0.0);
    CHECK(steel.liquid_fraction(1517.5) == relative(0.5, 1e-14));
    CHECK(steel.liquid_fraction(1540) == 1.0);
    CHECK(steel.liquid_fraction(2000) == 1.0);
}

TEST_CASE("enthalpy is strictly increasing and temperature() is its exact inverse", "[material]") {
    for (const MaterialParameters& p : {MaterialParameters{}, odd_parameters()}) {
        const Material steel = make_en1993_steel(p);
        INFO(steel.description());
        double previous = -std::numeric_limits<double>::infinity();
        double worst = 0;
        // Across the whole table (−100..3000 °C) and beyond both ends, off the nodes and on them.
        for (double T = -300.0; T <= 3300.0; T += 0.37) {
            const double H = steel.enthalpy(T);
            REQUIRE(H > previous);
            previous = H;
            worst = std::max(worst, std::abs(steel.temperature(H) - T));
        }
        for (double T : {p.solidus, p.liquidus, 735.0, 20.0, 0.0, -100.0, 3000.0}) {
            worst = std::max(worst, std::abs(steel.temperature(steel.enthalpy(T)) - T));
        }
        CHECK(worst < 1e-9);
    }
}

TEST_CASE("the liquid conductivity factor multiplies k above liquidus, ramped over the mushy range", "[material]") {
    MaterialParameters p;
    p.liquid_conductivity_factor = 3;
    const Material stirred = make_en1993_steel(p);
    const Material plain = make_en1993_steel({});
    // Hand computation: k = 27.3 (1 + (3 − 1) f_l).
    CHECK(stirred.conductivity(1400) == relative(k_above_800, 1e-12));
    CHECK(stirred.conductivity(1495) == relative(k_above_800, 1e-12));
    CHECK(stirred.conductivity(1517.5) == relative(2 * k_above_800, 1e-12));
    CHECK(stirred.conductivity(1540) == relative(3 * k_above_800, 1e-12));
    CHECK(stirred.conductivity(2500) == relative(3 * k_above_800, 1e-12));
    // The factor touches k only, not the stored heat.
    for (double T : {500.0, 1517.5, 2000.0}) CHECK(stirred.enthalpy(T) == plain.enthalpy(T));
}

TEST_CASE("max_diffusivity is the largest k/(dH/dT)", "[material]") {
    // Hand computation: without the factor, k/(ρc) is largest at and below 20 °C:
    //   53.334 / (7850 · 439.80176) = 1.54482e-5 m²/s.
    CHECK(make_en1993_steel({}).max_diffusivity() == relative(k_20 / (rho * c_20), 1e-12));
    // Hand computation: with factor 3 the liquid wins: 3 · 27.3 / (7850 · 650) = 1.60510e-5 m²/s.
    MaterialParameters p;
    p.liquid_conductivity_factor = 3;
    CHECK(make_en1993_steel(p).max_diffusivity() == relative(3 * k_above_800 / (rho * c_above_900), 1e-12));
}

TEST_CASE("bad material parameters are refused with the value and what is allowed", "[material]") {
    const auto message = [](MaterialParameters p) { return error_of([&] { make_en1993_steel(p); }); };
    MaterialParameters p;
    p.liquidus = 1495;
    CHECK_THAT(message(p), Contains("liquidus 1495 degC") && Contains("at least 1 K above solidus 1495 degC"));
    p = {};
    p.latent_heat = -1;
    CHECK_THAT(message(p), Contains("latent heat -1 J/kg") && Contains(">= 0"));
    p = {};
    p.liquid_conductivity_factor = 0.5;
    CHECK_THAT(message(p), Contains("liquid conductivity factor 0.5") && Contains(">= 1"));
    p = {};
    p.solidus = std::numeric_limits<double>::quiet_NaN();
    CHECK_THAT(message(p), Contains("solidus nan degC"));
    p = {};
    p.liquidus = 3200;
    CHECK_THAT(message(p), Contains("liquidus 3200 degC") && Contains("below 3000 degC"));
}

TEST_CASE("description names the material and its melting parameters", "[material]") {
    CHECK(make_en1993_steel({}).description() ==
          "carbon steel, EN 1993-1-2 (k, c held constant outside 20-1200 degC); density 7850 kg/m3; "
          "solidus 1495 degC, liquidus 1540 degC, latent heat 277 kJ/kg; liquid conductivity x1");
}

TEST_CASE("a property table with constant properties reproduces them", "[material]") {
    const TempFile csv("constant.csv",
                       "# constant properties, for the test\n"
                       "temperature_degC, conductivity_W_per_mK, specific_heat_J_per_kgK\n"
                       "\n"
                       "20, 30, 500   # room temperature\n"
                       "1500,30,500\r\n");
    const Material m = read_property_table(csv.path(), 8000, {});
    for (double T : {-200.0, 20.0, 333.3, 1200.0, 2999.0, 4000.0}) {
        INFO("T = " << T);
        CHECK(m.conductivity(T) == 30.0);
        // Hand computation: H = ρ c T below the solidus, 8000 · 500 = 4e6 J/(m³ K).
        if (T < 1495) {
            CHECK(m.enthalpy(T) == relative(4e6 * T, 1e-12));
            CHECK(m.volumetric_heat_capacity(T) == relative(4e6, 1e-9));
        }
    }
    // Hand computation: k/(ρc) = 30 / 4e6 = 7.5e-6 m²/s.
    CHECK(m.max_diffusivity() == relative(7.5e-6, 1e-9));
    CHECK_THAT(m.description(), Contains(csv.path()) && Contains("2 rows"));
}

TEST_CASE("a whitespace property table is interpolated linearly between rows", "[material]") {
    const TempFile table("linear.txt",
                         "0\t10   400\n"
                         "  1000 20 6.0e2\n");
    const Material m = read_property_table(table.path(), 8000, {});
    // Hand computation: k(500) = 10 + 10 · 500/1000 = 15; ∫_0^1000 (400 + 0.2 T) dT = 400000 + 100000 J/kg.
    CHECK(m.conductivity(500) == relative(15, 1e-12));
    CHECK(m.enthalpy(1000) - m.enthalpy(0) == relative(8000 * 5e5, 1e-12));
}

TEST_CASE("bad property tables name the file, line and value", "[material]") {
    const std::string header = "temperature_degC, conductivity_W_per_mK, specific_heat_J_per_kgK\n";
    check_bad_table("one_row.csv", header + "20, 45, 440\n", ":2:", "only this one data row");
    check_bad_table("no_rows.csv", "# nothing\n" + header, ":2:", "no data row");
    check_bad_table("equal_T.csv", "20, 45, 440\n20, 44, 450\n", ":2:1:", "'20' degC is not above 20 degC");
    check_bad_table("falling_T.csv", "20 45 440\n600 40 700\n500 41 690\n", ":3:1:", "'500' degC is not above 600");
    check_bad_table("zero_k.csv", header + "20, 0, 440\n600, 40, 700\n", ":2:5:", "conductivity '0'");
    check_bad_table("negative_k.csv", "20, 45, 440\n600, -40, 700\n", ":2:6:", "conductivity '-40'");
    check_bad_table("zero_c.csv", "20, 45, 440\n600, 40, 0\n", ":2:10:", "specific heat '0'");
    check_bad_table("text_cell.csv", "20, 45, 440\n600, forty, 700\n", ":2:6:", "'forty' is not a number");
    check_bad_table("typo_first_row.csv", "2O, 45, 440\n600, 40, 700\n", ":1:1:", "'2O' is not a number");
    check_bad_table("nan.csv", "20, 45, 440\n600, nan, 700\n", ":2:6:", "'nan' is not a finite number");
    check_bad_table("inf.csv", "20 45 440\n600 40 inf\n", ":2:8:", "'inf' is not a finite number");
    check_bad_table("empty_cell.csv", "20, 45, 440\n600,, 700\n", ":2:5:", "cell is empty");
    check_bad_table("two_cells.csv", "20, 45, 440\n600, 40\n", ":2:1:", "'600, 40' has 2 cells");
    check_bad_table("four_cells.csv", "20 45 440 7850\n600 40 700\n", ":1:11:", "'20 45 440 7850' has 4 cells");
    // SI Brochure (from memory): absolute zero is −273.15 °C.
    check_bad_table("below_zero_K.csv", "-300, 45, 440\n600, 40, 700\n", ":1:1:", "'-300' degC");
}

TEST_CASE("a missing table file or a bad density is reported with the path", "[material]") {
    const std::string missing =
        (std::filesystem::temp_directory_path() / "heatbead_test_material_does_not_exist.csv").string();
    CHECK_THAT(error_of([&] { read_property_table(missing, 7800, {}); }),
               Contains(missing) && Contains("cannot open"));
    const TempFile csv("density.csv", "20, 45, 440\n600, 40, 700\n");
    CHECK_THAT(error_of([&] { read_property_table(csv.path(), -5, {}); }),
               Contains(csv.path()) && Contains("density -5 kg/m3"));
}
