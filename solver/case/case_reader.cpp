// The case-file schema: which keys exist, their units, defaults and allowed values.
// cases/README.md documents the same keys for users; keep the two in step.
#include "solver/case/case_reader.hpp"

#include "solver/case/number_table.hpp"
#include "solver/case/table_files.hpp"
#include "solver/core/text.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/physics/waveform.hpp"

#include <array>
#include <cmath>
#include <filesystem>
#include <stdexcept>
#include <unistd.h>

namespace heatbead {

using units::Dimension;

namespace {

constexpr double mm = 1e-3;

// Names of the enum values, in enum order; the case-file words and the printed words are the same.
constexpr std::array<std::string_view, 3> face_names{"flat", "convex", "concave"};
constexpr std::array<std::string_view, 2> source_shapes{"from_procedure", "given"};
constexpr std::array<std::string_view, 5> output_files{"hdf5", "vtk", "summary", "report", "contours"};

template <class Enum, std::size_t N>
Enum enum_of(const std::array<std::string_view, N>& names, const std::string& word, std::size_t offset = 0) {
    for (std::size_t i = 0; i < N; ++i) {
        if (names[i] == word) return static_cast<Enum>(i + offset);
    }
    return static_cast<Enum>(offset);
}

std::string mm_text(double metres) {
    return format_text("%.4g mm", metres / mm);
}

void read_joint(Case& c, CaseDocument& doc) {
    auto s = doc.section("joint", true);
    auto& j = c.joint;
    const auto len = [&](std::string_view key, std::optional<double> fallback, Bounds b = Bounds::positive()) {
        return s.quantity(key, Dimension::length, "mm", fallback, b);
    };
    j.flange_thickness = len("flange_thickness", std::nullopt);
    j.flange_width = len("flange_width", std::nullopt);
    j.web_thickness = len("web_thickness", std::nullopt);
    j.web_height = len("web_height", std::nullopt);
    j.web_offset = len("web_offset", 0.0, {});
    j.weld_length = len("length", std::nullopt);
    j.root_gap = len("root_gap", 0.0, Bounds::closed(0, 5 * mm));
    j.sides = static_cast<int>(s.integer("sides", 1, 2, 1));
    if (std::abs(j.web_offset) + j.web_thickness / 2 > j.flange_width / 2) {
        s.error("web_offset", "the web (" + mm_text(j.web_thickness) + " thick, offset " + mm_text(j.web_offset) +
                                  ") does not stand on the " + mm_text(j.flange_width) + " flange");
    }
}

// Where a fillet does not fit on the joint's plates: the [bead] key at fault and what is wrong.
struct Misfit {
    std::string_view key;
    std::string message;
};

std::vector<Misfit> misfits(const mesh::JointGeometry& j, const mesh::Fillet& f) {
    std::vector<Misfit> out;
    // Legs must fit on the plates they sit on: the flange leg between the web face and the
    // flange edge, the web leg within the web height.
    for (int side = 1; side <= j.sides; ++side) {
        const double room = j.flange_width / 2 - (side == 1 ? j.web_offset : -j.web_offset) - j.web_thickness / 2;
        if (f.leg_flange > room) {
            out.push_back({"leg_flange", "the leg runs off the flange: only " + mm_text(room) +
                                             " of flange beside the web face on side " + std::to_string(side)});
        }
    }
    if (f.leg_web <= j.root_gap) {
        out.push_back({"leg_web", "must be longer than the root gap " + mm_text(j.root_gap) + " to reach the web"});
    }
    if (f.leg_web > j.web_height) out.push_back({"leg_web", "larger than the web height " + mm_text(j.web_height)});
    return out;
}

void read_bead(Case& c, CaseDocument& doc) {
    auto s = doc.section("bead", true);
    auto& j = c.joint;
    j.leg_flange = s.quantity("leg_flange", Dimension::length, "mm", std::nullopt, Bounds::positive());
    j.leg_web = s.quantity("leg_web", Dimension::length, "mm", j.leg_flange, Bounds::positive());
    j.face = enum_of<mesh::FaceShape>(face_names, s.choice("face", face_names, "flat"));
    j.convexity = s.quantity("convexity", Dimension::length, "mm", 0.0, Bounds::non_negative());
    c.bead.laying = enum_of<BeadLaying>(bead_laying_names, s.choice("laid", bead_laying_names, "from_wire"));
    // The joint holds the asked bead until the bead laid is known (lay_bead).
    c.bead.asked = mesh::fillet_of(j);
    for (const auto& m : misfits(j, c.bead.asked)) s.error(m.key, m.message);
    if (j.face == mesh::FaceShape::flat && j.convexity > 0) {
        s.error("convexity", "a flat face has no convexity; set face = \"convex\" or \"concave\", or convexity = 0");
    } else if (j.face != mesh::FaceShape::flat && !(j.convexity > 0)) {
        s.error("convexity", "a " + std::string(face_names[static_cast<int>(j.face)]) +
                                 " face needs convexity > 0 mm (largest offset of the face from the toe-to-toe line)");
    } else if (j.convexity > mesh::max_convexity(j.leg_flange, j.leg_web)) {
        // Beyond this the face would roll back over a toe (convex) or dip below a plate (concave).
        s.error("convexity", "must be at most " + mm_text(mesh::max_convexity(j.leg_flange, j.leg_web)) +
                                 " for these legs, or the face would run past a toe or below a plate");
    }
}

std::optional<Composition> read_composition(Section& parent) {
    auto s = parent.subsection("composition", false);
    if (!s.present()) return std::nullopt;
    Composition comp;
    // Mass per cent, plain numbers.
    const auto pct = [&](std::string_view key) { return s.number(key, 0.0, Bounds::closed(0, 100)); };
    // Carbon sets hardenability above all else: it must be given; an element left out is 0 %.
    comp.C = s.number("C", std::nullopt, Bounds::closed(0, 100));
    comp.Mn = pct("Mn"), comp.Si = pct("Si"), comp.Cr = pct("Cr"), comp.Mo = pct("Mo");
    comp.V = pct("V"), comp.Ni = pct("Ni"), comp.Cu = pct("Cu"), comp.Nb = pct("Nb"), comp.B = pct("B");
    const double sum = comp.C + comp.Mn + comp.Si + comp.Cr + comp.Mo + comp.V + comp.Ni + comp.Cu + comp.Nb + comp.B;
    if (sum > 100) s.error("C", "the alloying elements add up to more than 100 % by mass");
    return comp;
}

constexpr std::string_view builtin_steel = "carbon_steel_en1993";

// Thermal model of the base metal: the built-in steel or a table file, melting range and latent heat.
void read_thermal_properties(Section& s, MaterialSpec& m, const std::string& case_path) {
    m.properties = s.text("properties", builtin_steel);
    if (m.properties != builtin_steel) {
        m.properties_file = path_beside(m.properties, case_path);
        if (!std::filesystem::is_regular_file(m.properties_file)) {
            s.error("properties", "neither \"" + std::string(builtin_steel) + "\" nor a readable property table file (" +
                                      m.properties_file + ")");
        }
        m.density = s.number("density", std::nullopt, Bounds{0, 30000, true, false});
    } else {
        m.density = s.number("density", 7850.0, Bounds::closed(7850, 7850));
    }
    m.solidus = s.quantity("solidus", Dimension::temperature, "degC", 1495.0, Bounds::closed(500, 3000));
    m.liquidus = s.quantity("liquidus", Dimension::temperature, "degC", m.solidus + 45, Bounds::closed(500, 3000));
    if (m.liquidus <= m.solidus) s.error("liquidus", "must be above the solidus");
    m.latent_heat = s.quantity("latent_heat", Dimension::specific_energy, "kJ/kg", 277e3, Bounds::closed(0, 2e6));
    m.liquid_conductivity_factor = s.number("liquid_conductivity_factor", 1.0, Bounds::closed(1, 10));
}

// What kind of steel the base metal is: it sets the highest preheat the search may try.
void read_steel_type(Section& s, MaterialSpec& m) {
    m.steel_type = enum_of<SteelType>(steel_type_names, s.choice("steel_type", steel_type_names, "c_mn"));
    m.tempering_temperature = s.optional_quantity("tempering_temperature", Dimension::temperature, "degC",
                                                  Bounds::closed(300, 750));
    if (m.steel_type == SteelType::quenched_tempered && !m.tempering_temperature) {
        s.error("steel_type", "\"quenched_tempered\" needs base_metal.tempering_temperature: the temperature the "
                              "plate was tempered at (its certificate gives it), which preheat must not pass");
    } else if (m.steel_type != SteelType::quenched_tempered && m.tempering_temperature) {
        s.error("tempering_temperature", "only for steel_type = \"quenched_tempered\"");
    }
}

MaterialSpec read_material(CaseDocument& doc, std::string_view section, bool filler) {
    auto s = doc.section(section, false);
    MaterialSpec m;
    m.grade = s.text("grade", "unspecified");
    if (!filler) {
        read_thermal_properties(s, m, doc.path());
        read_steel_type(s, m);
    }
    m.composition = read_composition(s);
    if (filler) {
        m.diffusible_hydrogen =
            s.optional_quantity("diffusible_hydrogen", Dimension::hydrogen, "ml/100g", Bounds{0, 100, true, false});
    }
    return m;
}

// [procedure.waveform]: the instantaneous power of waveform-controlled welding, one way of three:
// recorded samples, a meter's energy over a weld length, or the meter's mean power.
void read_waveform_power(Section& procedure, ProcedureSpec& p, const std::string& case_path) {
    auto w = procedure.subsection("waveform", false);
    if (!w.present()) return;
    const std::string samples = w.text("samples", "");
    const auto energy = w.optional_quantity("energy", Dimension::energy, "kJ", Bounds::positive());
    const auto length = w.optional_quantity("weld_length", Dimension::length, "mm", Bounds::positive());
    const auto power = w.optional_quantity("power", Dimension::power, "W", Bounds::positive());
    const int ways = int(!samples.empty()) + int(energy.has_value()) + int(power.has_value());
    if (ways != 1) {
        w.error(samples.empty() ? (energy ? "energy" : "power") : "samples",
                "give exactly one of: samples (a file of time_s, voltage_V, current_A), energy with weld_length "
                "(a meter's reading), or power (the meter's instantaneous power)");
        return;
    }
    if (energy.has_value() != length.has_value()) {
        w.error(energy ? "energy" : "weld_length", "energy and weld_length go together: the energy a meter read over "
                                                   "that length of weld");
        return;
    }
    if (power) {
        p.instantaneous_power = *power;
        p.power_basis = "instantaneous power given (ISO/TR 18491)";
    } else if (energy) {
        // E/L is the arc energy per length; the power follows at the travel speed: P = (E/L)·v.
        p.instantaneous_power = *energy / *length * p.travel_speed;
        p.power_basis = format_text("instantaneous energy %.4g kJ over %.4g mm (ISO/TR 18491)", *energy / 1e3,
                                    *length * 1e3);
    } else {
        const std::string path = path_beside(samples, case_path);
        try {
            const WaveformMeans m = read_waveform(path);
            p.instantaneous_power = m.power;
            p.power_basis = format_text("instantaneous power of %zu samples over %.4g ms (ISO/TR 18491)", m.samples,
                                        m.duration * 1e3);
            if (std::abs(m.current - p.current) > 0.05 * p.current || std::abs(m.voltage - p.voltage) > 0.05 * p.voltage) {
                procedure.error("current", format_text("the waveform's means (%.0f A, %.1f V) differ by more than 5 %% "
                                                       "from procedure.current and procedure.voltage; give the "
                                                       "waveform's means there",
                                                       m.current, m.voltage));
            }
        } catch (const NumberTableError& e) {
            w.error("samples", e.what());
        }
    }
}

// The share of the wire that stays in the bead: given, or the process and transfer mode's default.
void read_deposition_efficiency(Section& s, ProcedureSpec& p) {
    constexpr std::string_view key = "deposition_efficiency";
    const Bounds share{0, 1, true, false};
    if (p.process == Process::smaw) {
        if (s.has(key)) {
            s.number(key, std::nullopt, share);
            s.error(key, "manual metal arc has no wire feed; remove the key");
        }
        return;
    }
    const auto fallback = default_deposition_efficiency(p.process, p.transfer);
    p.deposition_efficiency = s.number(key, s.has(key) ? std::nullopt : std::optional(fallback.value), share);
    p.deposition_efficiency_source = s.has(key) ? "given in the case" : std::string(fallback.source);
}

void read_procedure(Case& c, CaseDocument& doc) {
    auto s = doc.section("procedure", true);
    auto& p = c.procedure;
    p.process = enum_of<Process>(process_names, s.choice("process", process_names, std::nullopt));
    if (p.process == Process::gmaw) {
        p.transfer = enum_of<Transfer>(transfer_names, s.choice("transfer", transfer_names, std::nullopt), 1);
    } else if (s.has("transfer")) {
        s.choice("transfer", transfer_names, std::nullopt);
        s.error("transfer", "a transfer mode applies to gas-metal-arc welding (process = \"gmaw\") only");
    }
    p.current = s.quantity("current", Dimension::current, "A", std::nullopt, Bounds{0, 2000, true, false});
    p.voltage = s.quantity("voltage", Dimension::voltage, "V", std::nullopt, Bounds{0, 80, true, false});
    p.travel_speed = s.quantity("travel_speed", Dimension::speed, "mm/s", std::nullopt, Bounds{0, 0.2, true, false});
    p.wire_feed_speed = s.optional_quantity("wire_feed", Dimension::speed, "m/min", Bounds{0, 1, true, false});
    const bool wire_process = p.process != Process::smaw;
    if (p.wire_feed_speed && !wire_process) {
        s.error("wire_feed", "manual metal arc has no wire feed; remove the key");
    }
    if (p.wire_feed_speed || s.has("wire_diameter")) {
        p.wire_diameter = s.quantity("wire_diameter", Dimension::length, "mm", std::nullopt,
                                     Bounds{0, 8 * mm, true, false});
    } else {
        s.optional_quantity("wire_diameter", Dimension::length, "mm");
    }
    p.work_angle = s.quantity("work_angle", Dimension::angle, "deg", 45 * std::numbers::pi / 180,
                              Bounds{0, std::numbers::pi / 2, true, true});
    p.travel_angle = s.quantity("travel_angle", Dimension::angle, "deg", 0.0,
                                Bounds::closed(-std::numbers::pi / 4, std::numbers::pi / 4));
    p.position = enum_of<Position>(position_names, s.choice("position", position_names, "horizontal"));

    if (auto g = s.subsection("shielding_gas", false); g.present()) {
        if (!wire_process || p.process == Process::saw) {
            g.error("argon", "shielding gas applies to gas-shielded processes (gmaw, fcaw) only");
        }
        GasMix gas;
        const auto pct = [&](std::string_view key) { return g.number(key, 0.0, Bounds::closed(0, 100)); };
        gas.argon = pct("argon"), gas.co2 = pct("co2"), gas.oxygen = pct("oxygen"), gas.helium = pct("helium");
        const double sum = gas.argon + gas.co2 + gas.oxygen + gas.helium;
        if (std::abs(sum - 100) > 0.5) {
            g.error("argon", format_text("the gas components add up to %.1f %%; they must add up to 100 %%", sum));
        }
        p.gas = gas;
    }

    const auto fallback = default_arc_efficiency(p.process);
    if (s.has("arc_efficiency")) {
        p.arc_efficiency = s.number("arc_efficiency", std::nullopt, Bounds{0, 1, true, false});
        p.arc_efficiency_source = "given in the case";
    } else {
        p.arc_efficiency = s.number("arc_efficiency", fallback.value, {});
        p.arc_efficiency_source = std::string(fallback.source);
    }
    p.net_power = s.optional_quantity("net_power", Dimension::power, "W", Bounds::positive());
    if (p.net_power) {
        p.arc_efficiency_source = std::string("derived from the given net power (net power / electrical power)") +
                                  (s.has("arc_efficiency") ? "; the arc_efficiency given is not used" : "");
    }
    read_deposition_efficiency(s, p);
    p.interpass_wait = s.optional_quantity("interpass_wait", Dimension::time, "s", Bounds::non_negative());
    if (p.interpass_wait && c.joint.sides == 1) {
        s.error("interpass_wait", "applies to a second pass; this joint has sides = 1");
    }
    read_waveform_power(s, p, doc.path());
    if (p.net_power && *p.net_power > electrical_power(p)) {
        s.error("net_power", "exceeds the electrical power (" + p.power_basis + ") of " +
                                 std::to_string(electrical_power(p)) + " W");
    }
}

constexpr std::array<std::string_view, 2> source_origins{"root", "face"};

void read_source(Case& c, CaseDocument& doc) {
    auto s = doc.section("source", false);
    const bool given = s.choice("shape", source_shapes, "from_procedure") == "given";
    const bool at_root = s.choice("origin", source_origins, "root") == "root";
    constexpr std::array<std::string_view, 4> keys{"half_width", "depth", "front_length", "rear_length"};
    if (!given) {
        // Dimensions follow once the whole case is read and sound (read_case): the rule needs the
        // procedure, the base metal and the ambient temperature.
        c.source.from_procedure = true;
        c.source.origin_at_root = at_root;
        for (auto k : keys) {
            if (s.has(k)) s.error(k, "explicit dimensions need shape = \"given\"");
            s.optional_quantity(k, Dimension::length, "mm");
        }
        return;
    }
    const Bounds b{0, 50 * mm, true, false};
    c.source.from_procedure = false;
    c.source.origin_at_root = at_root;
    c.source.half_width = s.quantity("half_width", Dimension::length, "mm", std::nullopt, b);
    c.source.depth = s.quantity("depth", Dimension::length, "mm", std::nullopt, b);
    c.source.front_length = s.quantity("front_length", Dimension::length, "mm", std::nullopt, b);
    c.source.rear_length = s.quantity("rear_length", Dimension::length, "mm", std::nullopt, b);
    c.source.rule = "given in the case";
}

void read_temperatures(Case& c, CaseDocument& doc) {
    auto s = doc.section("temperatures", false);
    auto& t = c.temperatures;
    const Bounds plausible = Bounds{-50, 1000, false, true};
    t.ambient = s.quantity("ambient", Dimension::temperature, "degC", 20.0, Bounds::closed(-50, 60));
    t.preheat = s.quantity("preheat", Dimension::temperature, "degC", t.ambient, plausible);
    t.interpass = s.quantity("interpass", Dimension::temperature, "degC", t.preheat, plausible);
    if (t.interpass < t.preheat) doc.warn("interpass temperature is below the preheat temperature");
    // Without a fixed wait the second pass starts when the joint has cooled to the interpass
    // temperature, which it never does if that is not above the surroundings.
    if (c.joint.sides == 2 && !c.procedure.interpass_wait && !(t.interpass > t.ambient + 1)) {
        s.error("interpass", "the second pass starts when the hottest cell has cooled to the interpass temperature, "
                             "which must then be above ambient (" + std::to_string(static_cast<int>(t.ambient)) +
                                 " degC); raise it or set procedure.interpass_wait");
    }
}

void read_surface(Case& c, CaseDocument& doc) {
    auto s = doc.section("surface", false);
    const Bounds h = Bounds::closed(0, 1e4);
    c.surface.convection = s.quantity("convection", Dimension::heat_transfer_coefficient, "W/(m2 K)", 10.0, h);
    c.surface.emissivity = s.number("emissivity", 0.8, Bounds::closed(0, 1));
    c.surface.contact_conductance =
        s.quantity("contact_conductance", Dimension::heat_transfer_coefficient, "W/(m2 K)", 1000.0,
                   Bounds::closed(0, 1e8));
}

void read_grid(Case& c, CaseDocument& doc) {
    auto s = doc.section("grid", false);
    auto& g = c.grid;
    const Bounds spacing = Bounds::closed(0.01 * mm, 50 * mm);
    auto& h = g.cross_section;
    h.finest = s.quantity("finest", Dimension::length, "mm", 0.5 * mm, spacing);
    h.coarsest = s.quantity("coarsest", Dimension::length, "mm", std::max(8 * mm, h.finest), spacing);
    h.growth = s.number("growth", 1.15, Bounds::closed(1.0, 1.2));
    g.refine_margin = s.quantity("refine_margin", Dimension::length, "mm", 3 * mm, Bounds::non_negative());
    // Isotherms around a moving arc stretch along the weld, so the along-weld spacing can be
    // coarser: on the reference case, 2x the finest spacing changed t8/5 by 0.5 % and flange
    // penetration by 0.03 mm against 1x (README, Performance).
    g.along_weld = s.quantity("along_weld", Dimension::length, "mm", 2 * h.finest, spacing);
    c.memory_limit = s.quantity("memory_limit", Dimension::memory, "MB", default_memory_limit(), Bounds::positive());
    if (h.coarsest < h.finest) s.error("coarsest", "must be at least the finest spacing " + mm_text(h.finest));
}

void read_solver(Case& c, CaseDocument& doc, const SolverFacts& facts) {
    auto s = doc.section("solver", false);
    c.solver.integrator = s.choice("integrator", facts.integrators, "rkl2");
    c.solver.max_temperature_change = s.number("max_temperature_change", 500.0, Bounds::closed(1, 2000));
    c.solver.travel_per_step = s.number("travel_per_step", 0.25, Bounds::closed(0.01, 1));
    c.solver.time_limit = s.quantity("time_limit", Dimension::time, "s", 600.0, Bounds{0, 1e6, true, false});
    // "auto" (or no key): the run stops once the answers it must give are known (stop_plan). A
    // temperature given is kept: t8/5 needs every point to cool through 500 degC, so it lies
    // between that and ambient.
    constexpr std::array<std::string_view, 1> automatic{"auto"};
    if (!s.has("stop_temperature") || s.holds_word("stop_temperature")) {
        s.choice("stop_temperature", automatic, "auto");
    } else {
        c.solver.stop_temperature = s.quantity("stop_temperature", Dimension::temperature, "degC", std::nullopt,
                                               Bounds{c.temperatures.ambient, 500, true, false});
    }
    c.solver.weld_metal = enum_of<WeldMetalModel>(weld_metal_names, s.choice("weld_metal", weld_metal_names, "at_liquidus"));
}

void read_output(Case& c, CaseDocument& doc) {
    auto s = doc.section("output", false);
    auto& o = c.output;
    const auto& j = c.joint;
    o.files = s.choice_list("files", output_files, {"hdf5", "summary"});
    o.station = s.quantity("station", Dimension::length, "mm", j.weld_length / 2, Bounds{0, j.weld_length, true, true});
    o.probes = s.points("probes", Dimension::length, "mm");
    o.snapshot_interval = s.quantity("snapshot_interval", Dimension::time, "s", 1.0, Bounds::positive());
}

void read_preheat_search(Case& c, CaseDocument& doc) {
    auto s = doc.section("preheat_search", false);
    auto& p = c.preheat_search;
    // By default the limit follows the filler's hydrogen (solver/weldability/preheat_limits.hpp);
    // sour service and other codes set their own (ISO 15156-2: 250 HV in the weld zone).
    const HardnessLimit by_hydrogen = hardness_limit_for(c.filler.diffusible_hydrogen);
    const bool limit_given = s.has("hardness_limit");
    p.hardness_limit = s.number("hardness_limit", by_hydrogen.hv, Bounds::closed(150, 600));
    p.hardness_limit_source = limit_given ? "set in the case (preheat_search.hardness_limit)" : by_hydrogen.source;
    p.min_t8_5 = s.optional_quantity("min_t8_5", Dimension::time, "s", Bounds{0, 1000, true, false});
    p.min_time_to_100 = s.optional_quantity("min_time_to_100", Dimension::time, "s", Bounds{0, 1e5, true, false});
    p.lowest = s.quantity("lowest", Dimension::temperature, "degC", c.temperatures.ambient,
                          Bounds::closed(c.temperatures.ambient, highest_judged_preheat));
    // By default the search may go up to the highest preheat the steel tolerates (a
    // quenched-and-tempered steel without its tempering temperature is an error above).
    const bool tempering_known = c.base.steel_type == SteelType::c_mn || c.base.tempering_temperature;
    const PreheatCeiling ceiling =
        tempering_known ? preheat_ceiling(c.base.steel_type, c.base.tempering_temperature) : PreheatCeiling{};
    p.highest_given = s.has("highest");
    p.highest = s.quantity("highest", Dimension::temperature, "degC", ceiling.temperature,
                           Bounds::closed(c.temperatures.ambient, highest_judged_preheat));
    p.highest_reason = p.highest_given ? "the preheat_search.highest you set" : ceiling.reason;
    if (p.highest_given && std::isfinite(p.highest) && p.highest > ceiling.temperature) {
        doc.warn(format_text("preheat_search.highest %.0f degC is above the %.0f degC this steel tolerates (",
                             p.highest, ceiling.temperature) + ceiling.reason + ")");
    }
    p.resolution = s.number("resolution", 5.0, Bounds::closed(1, 50));
    if (std::isfinite(p.lowest) && std::isfinite(p.highest) && p.highest <= p.lowest) {
        s.error("highest", "must be above lowest (" + std::to_string(static_cast<int>(p.lowest)) + " degC)");
    }
}

// Spreads of the bands ([bands]): by default the process's for the arc efficiency, and for the
// source's dimensions ±20 % from the procedure's rule of thumb or ±10 % when the case gives them,
// taken to come from a calibration (heatbead fit writes them) or a measured macro-section.
void read_bands(Case& c, CaseDocument& doc) {
    auto s = doc.section("bands", false);
    auto& b = c.bands;
    b.enabled = s.flag("enabled", true);
    const auto fallback = arc_efficiency_spread(c.procedure.process);
    b.arc_efficiency_spread = s.number("arc_efficiency_spread", fallback.value, Bounds::closed(0, 0.5));
    b.arc_efficiency_spread_source = s.has("arc_efficiency_spread") ? "given in the case" : std::string(fallback.source);
    const bool given = !c.source.from_procedure;
    b.source_spread = s.number("source_spread", given ? 0.1 : 0.2, Bounds::closed(0, 0.5));
    b.source_spread_source = s.has("source_spread") ? "given in the case"
                             : given ? "the dimensions given, taken as calibrated (heatbead fit or a macro-section)"
                                     : "the procedure's rule of thumb, not calibrated";
}

// The bead laid (bead.laid): the asked fillet scaled to the wire's deposit, or the asked one. Needs
// a sound case so far.
void lay_bead(Case& c, CaseDocument& doc) {
    auto& b = c.bead;
    const auto d = deposition(c.procedure);
    b.from_wire = b.laying == BeadLaying::from_wire && d;
    if (b.laying == BeadLaying::as_asked) {
        b.basis = "as asked (bead.laid = \"as_asked\")";
    } else if (!d) {
        b.basis = "as asked, for the wire's deposit is not known: " + missing_wire_data(c.procedure);
    } else {
        b.basis = format_text("from the wire: wire feed x wire section x deposition efficiency %.2f / travel speed",
                              d->efficiency);
    }
    if (!b.from_wire) return;
    const mesh::Fillet laid = scaled_fillet(b.asked, d->area);
    for (const auto& m : misfits(c.joint, laid)) {
        doc.error("procedure.wire_feed",
                  format_text("the wire deposits %.1f mm2, a fillet of %s in the asked shape, which does not fit (%s leg: ",
                              d->area * 1e6, legs_text(laid).c_str(), m.key == "leg_flange" ? "flange" : "web") +
                      m.message + "); lower the wire feed or raise the travel speed, or set bead.laid = \"as_asked\"");
    }
    c.joint = mesh::with_fillet(c.joint, laid);
}

// User probes must lie in metal: in the plates or in the bead laid.
void check_probes(const Case& c, CaseDocument& doc) {
    const auto& j = c.joint;
    for (std::size_t i = 0; i < c.output.probes.size(); ++i) {
        const auto& [x, y, z] = c.output.probes[i];
        if (x < 0 || x > j.weld_length || mesh::material_at(j, y, z) == mesh::Tag::empty) {
            doc.error("output.probes", "point " + std::to_string(i + 1) + " (" + mm_text(x) + ", " + mm_text(y) + ", " +
                                           mm_text(z) + ") is not inside the plates or the bead" +
                                           (c.bead.from_wire ? " laid" : ""));
        }
    }
}

// Rejects grids that would not fit the memory limit, before any large allocation.
void check_grid_size(Case& c, CaseDocument& doc, const SolverFacts& facts) {
    mesh::Grid axes;
    try {
        axes = mesh::build_axes(c.joint, c.grid);
    } catch (const std::invalid_argument& e) {
        doc.error("joint", std::string("the joint cannot be meshed: ") + e.what());
        return;
    }
    const std::size_t section = axes.y.cells() * axes.z.cells();
    if (section > mesh::max_section_cells) {
        doc.error("grid.finest", "the cross-section would have " + std::to_string(axes.y.cells()) + " x " +
                                     std::to_string(axes.z.cells()) + " cells, above the " +
                                     std::to_string(mesh::max_section_cells) +
                                     " this tool meshes; use a coarser finest spacing or a smaller refine_margin");
        return;
    }
    const double cells = double(axes.x.cells()) * double(section);
    // Counting solid cells needs the tags; only worth it when the all-cells bound is too big.
    const double upper = cells * facts.bytes_per_solid_cell;
    const double needed = upper > c.memory_limit ? facts.run_memory(mesh::build_grid(c.joint, c.grid)) : upper;
    if (needed > c.memory_limit) {
        doc.error("grid.finest",
                  format_text("the grid needs about %.4g MB (%.3g cells), above the memory limit of %.4g MB; use a "
                              "coarser finest/along_weld spacing, a smaller refine_margin, or raise memory_limit",
                              needed / 1e6, cells, c.memory_limit / 1e6));
    }
}

}  // namespace

double default_memory_limit() {
    // Half the physical memory: leaves room for the system and a second run.
    const double pages = static_cast<double>(sysconf(_SC_PHYS_PAGES));
    const double page = static_cast<double>(sysconf(_SC_PAGE_SIZE));
    return pages > 0 && page > 0 ? 0.5 * pages * page : 4e9;
}

LoadedCase read_case(const std::string& path, const std::vector<Override>& overrides, const SolverFacts& facts) {
    CaseDocument doc(path, overrides);
    LoadedCase out;
    Case& c = out.value;
    c.file = path;
    read_joint(c, doc);
    read_bead(c, doc);
    c.base = read_material(doc, "base_metal", false);
    c.filler = read_material(doc, "filler", true);
    read_procedure(c, doc);
    read_source(c, doc);
    read_temperatures(c, doc);
    read_surface(c, doc);
    read_grid(c, doc);
    read_solver(c, doc, facts);
    read_output(c, doc);
    read_preheat_search(c, doc);
    read_bands(c, doc);
    doc.finish();  // throws on any problem so far: the checks below need a sound case
    lay_bead(c, doc);
    check_probes(c, doc);
    doc.finish();  // the source rule and the grid need the bead laid
    if (c.source.from_procedure) {
        const bool at_root = c.source.origin_at_root;
        c.source = source_from_procedure(weld_setup(c));
        c.source.origin_at_root = at_root;
    }
    check_grid_size(c, doc, facts);
    doc.finish();
    c.warnings = doc.warnings();
    for (auto& w : plausibility_warnings(weld_setup(c))) c.warnings.push_back(std::move(w));
    out.resolved_toml = doc.resolved_toml();
    return out;
}

}  // namespace heatbead
