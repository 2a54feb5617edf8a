// Case files: bad input is rejected with messages naming file, line, key, value and what is
// allowed; good input resolves to SI and round-trips through the resolved listing.
#include "solver/studies/run_setup.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>

using namespace heatbead;
namespace fs = std::filesystem;

namespace {

const fs::path source_dir{HEATBEAD_SOURCE_DIR};
const std::string minimal = (source_dir / "tests/cases/minimal.toml").string();

std::string header_value(const fs::path& file, const std::string& tag) {
    std::ifstream in(file);
    std::string line;
    const std::string prefix = "# " + tag + ": ";
    while (std::getline(in, line)) {
        if (line.rfind(prefix, 0) == 0) return line.substr(prefix.size());
    }
    FAIL("no '" << prefix << "' line in " << file);
    return {};
}

std::vector<Diagnostic> diagnostics_of(const std::string& path, const std::vector<Override>& overrides = {}) {
    try {
        load_case(path, overrides);
    } catch (const CaseError& e) {
        return e.diagnostics();
    }
    return {};
}

std::string all_text(const std::vector<Diagnostic>& ds) {
    std::string out;
    for (const auto& d : ds) out += d.text() + "\n";
    return out;
}

}  // namespace

TEST_CASE("every bad case file is rejected with a message naming key, value and what is allowed", "[case]") {
    std::vector<fs::path> files;
    for (const auto& entry : fs::directory_iterator(source_dir / "tests/bad_cases")) files.push_back(entry.path());
    std::sort(files.begin(), files.end());
    REQUIRE(files.size() >= 25);
    for (const auto& file : files) {
        const std::string key = header_value(file, "expect-key");
        const std::string text = header_value(file, "expect-text");
        const auto ds = diagnostics_of(file.string());
        INFO(file.filename().string() << " gave:\n" << all_text(ds));
        REQUIRE_FALSE(ds.empty());
        const auto match = std::find_if(ds.begin(), ds.end(), [&](const Diagnostic& d) {
            return d.key == key && d.message.find(text) != std::string::npos;
        });
        REQUIRE(match != ds.end());
        // Every message says which file it is about; a key present in the file gets its line.
        CHECK(match->origin.rfind(file.string(), 0) == 0);
        if (!match->value.empty()) CHECK(match->origin.find(':') != std::string::npos);
    }
}

TEST_CASE("messages carry the file and line of the offending key", "[case]") {
    const auto file = (source_dir / "tests/bad_cases/unit_kg_for_length.toml").string();
    const auto ds = diagnostics_of(file);
    REQUIRE(ds.size() == 1);
    // Line 5 of the file holds flange_thickness (3 comment lines, then [joint]).
    CHECK(ds[0].origin == file + ":5");
    CHECK(ds[0].value == "\"12 kg\"");
    CHECK_THAT(ds[0].text(), Catch::Contains("joint.flange_thickness = \"12 kg\"") &&
                                 Catch::Contains("mm, cm, m, in, ft"));
}

TEST_CASE("bad --set values are rejected and named as command-line options", "[case]") {
    SECTION("unknown key") {
        const auto ds = diagnostics_of(minimal, {parse_override("joint.lenght=100")});
        REQUIRE(ds.size() == 1);
        CHECK(ds[0].origin == "--set joint.lenght=100");
        CHECK_THAT(ds[0].message, Catch::Contains("did you mean \"length\""));
    }
    SECTION("value out of range") {
        const auto ds = diagnostics_of(minimal, {parse_override("procedure.voltage=-3")});
        REQUIRE(ds.size() == 1);
        CHECK(ds[0].origin == "--set procedure.voltage=-3");
        CHECK_THAT(ds[0].message, Catch::Contains("> 0 V"));
    }
    SECTION("wrong unit") {
        const auto ds = diagnostics_of(minimal, {parse_override("procedure.travel_speed=7 A")});
        REQUIRE(ds.size() == 1);
        CHECK_THAT(ds[0].message, Catch::Contains("not a unit of speed"));
    }
    SECTION("no equals sign") { CHECK_THROWS_AS(parse_override("joint.length"), CaseError); }
    SECTION("empty key path part") { CHECK_THROWS_AS(parse_override("joint..length=3"), CaseError); }
    SECTION("into a value") {
        CHECK_THROWS_AS(load_case(minimal, {parse_override("joint.length.x=3")}), CaseError);
    }
}

TEST_CASE("all problems are reported at once", "[case]") {
    const auto ds = diagnostics_of(minimal, {parse_override("procedure.voltage=-3"), parse_override("bead.leg_flange=0"),
                                             parse_override("grid.growth=2")});
    CHECK(ds.size() == 3);
}

TEST_CASE("a missing file is reported, not a crash", "[case]") {
    const auto ds = diagnostics_of((source_dir / "tests/cases/no_such_case.toml").string());
    REQUIRE(ds.size() == 1);
    CHECK_THAT(ds[0].message, Catch::Contains("cannot open"));
}

TEST_CASE("quantities with units resolve to SI", "[case]") {
    // 1 in = 25.4 mm exactly (NIST SP 811); °F → °C = (°F − 32)·5/9 (NIST SP 811).
    const auto c = load_case(minimal, {parse_override("joint.flange_thickness=1/2 in"),
                                       parse_override("procedure.travel_speed=16 in/min"),
                                       parse_override("procedure.wire_feed=300 ipm"),
                                       parse_override("temperatures.preheat=300 degF")})
                       .value;
    CHECK(c.joint.flange_thickness == Approx(0.0127).epsilon(1e-12));
    CHECK(c.procedure.travel_speed == Approx(16 * 0.0254 / 60).epsilon(1e-12));
    CHECK(*c.procedure.wire_feed_speed == Approx(0.127).epsilon(1e-12));
    CHECK(c.temperatures.preheat == Approx((300.0 - 32) * 5 / 9).epsilon(1e-12));
    // Bare numbers are in the documented default units: mm, A, V, mm/s, m/min.
    const auto d = load_case(minimal).value;
    CHECK(d.joint.web_height == Approx(0.080));
    CHECK(d.procedure.current == Approx(200));
    CHECK(d.procedure.travel_speed == Approx(0.005));
    CHECK(*d.procedure.wire_feed_speed == Approx(8.0 / 60));
}

TEST_CASE("defaults are filled in and the resolved case reads back to itself", "[case]") {
    const auto first = load_case(minimal);
    const Case& c = first.value;
    CHECK(c.joint.leg_web == c.joint.leg_flange);
    CHECK(c.temperatures.preheat == 20);
    CHECK(c.procedure.arc_efficiency == 0.8);  // EN 1011-1:2009 factor k for MIG/MAG
    CHECK(c.output.station == Approx(c.joint.weld_length / 2));
    CHECK_THAT(first.resolved_toml, Catch::Contains("leg_web = \"6 mm\"  # default"));

    const fs::path again = fs::temp_directory_path() / "heatbead_resolved_roundtrip.toml";
    std::ofstream(again) << first.resolved_toml;
    const auto second = load_case(again.string());
    fs::remove(again);
    const Case& r = second.value;
    CHECK(r.joint.flange_thickness == Approx(c.joint.flange_thickness).epsilon(1e-12));
    CHECK(r.procedure.travel_speed == Approx(c.procedure.travel_speed).epsilon(1e-12));
    CHECK(r.grid.along_weld == Approx(c.grid.along_weld).epsilon(1e-12));
    CHECK(r.memory_limit == Approx(c.memory_limit).epsilon(1e-9));
    CHECK(r.source.depth == Approx(c.source.depth).epsilon(1e-12));
    // The listing is a fixed point: resolving a resolved case changes nothing but the comments.
    const auto strip = [](std::string s) {
        std::string out, line;
        std::istringstream in(s);
        while (std::getline(in, line)) out += line.substr(0, line.find("  #")) + "\n";
        return out;
    };
    CHECK(strip(second.resolved_toml) == strip(first.resolved_toml));
}

TEST_CASE("the demo case is valid", "[case]") {
    const auto c = load_case((source_dir / "cases/demo_tee_15mm.toml").string()).value;
    CHECK(c.procedure.transfer == Transfer::spray);
    CHECK(c.base.composition.has_value());
    CHECK(c.filler.diffusible_hydrogen.value() == Approx(4));
    CHECK(c.output.probes.size() == 1);
}
