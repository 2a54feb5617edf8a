#include "solver/physics/procedure.hpp"

#include "solver/physics/material.hpp"
#include "solver/core/text.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>

namespace heatbead {

EfficiencyDefault default_arc_efficiency(Process process) {
    switch (process) {
        case Process::saw: return {1.0, "EN 1011-1 thermal efficiency factor k for submerged arc"};
        case Process::smaw: return {0.8, "EN 1011-1 thermal efficiency factor k for manual metal arc"};
        case Process::fcaw: return {0.8, "EN 1011-1 thermal efficiency factor k for flux-cored wire"};
        case Process::gmaw: break;
    }
    return {0.8, "EN 1011-1 thermal efficiency factor k for MIG/MAG"};
}

EfficiencyDefault arc_efficiency_spread(Process process) {
    switch (process) {
        case Process::saw:
            return {0.15, "from memory: calorimetric measurements of submerged arc welding give about 0.85-0.99 "
                          "against the EN 1011-1 factor 1.0 (DuPont & Marder 1995, Weld. J. 74, 406s)"};
        case Process::smaw:
            return {0.10, "from memory: measured efficiencies of manual metal arc welding lie about 0.7-0.85"};
        case Process::fcaw:
            return {0.10, "from memory: as for MIG/MAG, measured about 0.7-0.9"};
        case Process::gmaw: break;
    }
    return {0.10, "from memory: calorimetric measurements of MIG/MAG welding give about 0.7-0.9 with transfer mode "
                  "and settings (DuPont & Marder 1995, Weld. J. 74, 406s: about 0.84)"};
}

double electrical_power(const ProcedureSpec& p) { return p.instantaneous_power.value_or(p.voltage * p.current); }

double arc_energy(const ProcedureSpec& p) { return electrical_power(p) / p.travel_speed; }

double net_power(const ProcedureSpec& p) { return p.net_power ? *p.net_power : p.arc_efficiency * electrical_power(p); }

double heat_input(const ProcedureSpec& p) { return net_power(p) / p.travel_speed; }

EfficiencyDefault default_deposition_efficiency(Process process, Transfer transfer) {
    switch (process) {
        case Process::saw: return {0.99, "submerged arc: almost no spatter under the flux (from memory)"};
        case Process::fcaw: return {0.85, "flux-cored wire: slag, spatter and fume (from memory)"};
        case Process::smaw: return {1.0, "manual metal arc: no wire feed"};
        case Process::gmaw: break;
    }
    switch (transfer) {
        case Transfer::short_circuit: return {0.93, "short-circuit transfer: spatter (from memory)"};
        case Transfer::globular: return {0.90, "globular transfer: spatter from large drops (from memory)"};
        case Transfer::spray: return {0.98, "spray transfer: little spatter (from memory)"};
        case Transfer::pulsed_spray: return {0.98, "pulsed spray transfer: little spatter (from memory)"};
        case Transfer::none: break;
    }
    return {0.93, "gas-metal-arc, transfer mode not given (from memory)"};
}

std::optional<Deposition> deposition(const ProcedureSpec& p) {
    if (!missing_wire_data(p).empty()) return std::nullopt;
    Deposition d;
    // Volume of wire fed per second over length welded per second.
    d.wire_area = std::numbers::pi * p.wire_diameter * p.wire_diameter / 4.0 * *p.wire_feed_speed / p.travel_speed;
    d.efficiency = p.deposition_efficiency;
    d.area = d.efficiency * d.wire_area;
    return d;
}

std::string missing_wire_data(const ProcedureSpec& p) {
    if (p.process == Process::smaw) return "manual metal arc has no wire feed";
    if (!p.wire_feed_speed && p.wire_diameter <= 0) return "needs procedure.wire_feed and procedure.wire_diameter";
    if (!p.wire_feed_speed) return "needs procedure.wire_feed";
    if (p.wire_diameter <= 0) return "needs procedure.wire_diameter";
    return "";
}

mesh::Fillet scaled_fillet(const mesh::Fillet& asked, double area) {
    const double k = std::sqrt(area / mesh::fillet_area(asked));
    return {asked.leg_flange * k, asked.leg_web * k, asked.face, asked.convexity * k};
}

std::string legs_text(const mesh::Fillet& f) {
    const std::string flange = format_text("%.1f", f.leg_flange * 1e3), web = format_text("%.1f", f.leg_web * 1e3);
    return flange == web ? flange + " mm" : flange + " x " + web + " mm";
}

TransferPreset transfer_preset(Process process, Transfer transfer) {
    switch (process) {
        case Process::saw: return {"submerged arc", 2300, 1.0, 0.35, "arc force of high current under flux"};
        case Process::smaw: return {"manual metal arc", 2200, 0.3, 0.30, "drops across a short arc"};
        case Process::fcaw: return {"flux-cored", 2300, 0.5, 0.35, "mostly large, partly axial drops"};
        case Process::gmaw: break;
    }
    switch (transfer) {
        case Transfer::short_circuit: return {"short-circuit", 1900, 0.0, 0.35, "metal handed over in short circuits"};
        case Transfer::globular: return {"globular", 2200, 0.5, 0.40, "large drops, irregular paths"};
        case Transfer::spray: return {"spray", 2500, 1.0, 0.45, "fine axial stream of free-flight droplets"};
        case Transfer::pulsed_spray: return {"pulsed spray", 2400, 1.0, 0.40, "one axial drop per pulse"};
        case Transfer::none: break;
    }
    return {"gas-metal-arc", 2200, 0.5, 0.40, "transfer mode not given"};
}

double droplet_heat_share(const WeldSetup& c) {
    const auto& p = c.procedure;
    const TransferPreset preset = transfer_preset(p.process, p.transfer);
    if (!p.wire_feed_speed || p.wire_diameter <= 0) return preset.typical_droplet_share;
    const Material steel = make_en1993_steel(c.base_melting);
    const double density = 7850;  // kg/m³, EN 1993-1-2
    const double per_kg = (steel.enthalpy(preset.droplet_temperature) - steel.enthalpy(c.ambient)) / density;
    const double mass_rate = density * std::numbers::pi * p.wire_diameter * p.wire_diameter / 4 * *p.wire_feed_speed;
    return std::clamp(mass_rate * per_kg / net_power(p), 0.0, 0.7);
}

SourceShape source_from_procedure(const WeldSetup& c) {
    // The depth axis points along the torch into the root; the origin is the root corner where
    // the arc is aimed (or the bead face, by choice). See the header for the rule.
    const auto& j = c.joint;
    const TransferPreset preset = transfer_preset(c.procedure.process, c.procedure.transfer);
    const double share = droplet_heat_share(c);
    const double chord = std::hypot(j.leg_flange, j.leg_web);
    const double a_arc = chord / 2.0, b_arc = j.leg_flange * j.leg_web / chord;
    const double a_drop = c.procedure.wire_diameter > 0 ? 2 * c.procedure.wire_diameter : a_arc / 2, b_drop = 2 * b_arc;
    const double f = preset.impact * share;
    SourceShape s;
    s.from_procedure = true;
    s.half_width = std::sqrt((1 - f) * a_arc * a_arc + f * a_drop * a_drop);
    s.depth = std::sqrt((1 - f) * b_arc * b_arc + f * b_drop * b_drop);
    s.front_length = s.half_width;
    s.rear_length = 2.0 * s.half_width;
    s.rule = format_text("rule of thumb from the bead and the transfer: the arc over the bead (a = face width/2, "
                         "b = design throat) and a droplet column carrying %.2f of the heat (impact %.1f x droplet "
                         "share %.2f), one ellipsoid of the same moments; c_f = a, c_r = 2a",
                         f, preset.impact, share) +
             " (" + std::string(preset.name) + ": " + std::string(preset.basis) + ")";
    return s;
}

double spray_transition_current(double wire_diameter) {
    // Diameter [mm] → transition current [A] for solid steel wire in argon-rich gas
    // (common practice, no source; from memory). Linear between points, proportional outside.
    static constexpr std::array<std::array<double, 2>, 5> table{{
        {0.8, 150}, {0.9, 165}, {1.0, 185}, {1.2, 220}, {1.6, 275}}};
    const double d = wire_diameter * 1e3;
    if (d <= table.front()[0]) return table.front()[1] * d / table.front()[0];
    if (d >= table.back()[0]) return table.back()[1] * d / table.back()[0];
    for (std::size_t i = 1; i < table.size(); ++i) {
        if (d <= table[i][0]) {
            const double t = (d - table[i - 1][0]) / (table[i][0] - table[i - 1][0]);
            return table[i - 1][1] + t * (table[i][1] - table[i - 1][1]);
        }
    }
    return table.back()[1];
}

std::string unusual_preheat_warning(double preheat) {
    if (preheat <= unusual_preheat) return "";
    return format_text("preheat %.0f degC is above %.0f degC: unusual; check the steel's tempering limits", preheat,
                       unusual_preheat);
}

std::vector<std::string> plausibility_warnings(const WeldSetup& c) {
    std::vector<std::string> w;
    const auto& p = c.procedure;
    const double q_kj_mm = heat_input(p) * 1e-6;
    if (q_kj_mm > 5.0) w.push_back(format_text("heat input %.2f kJ/mm is above 5 kJ/mm: unusual for a fillet pass", q_kj_mm));
    if (p.travel_speed < 1e-3) w.push_back(format_text("travel speed %.2f mm/s is below 1 mm/s: unusual", p.travel_speed * 1e3));
    if (auto hot = unusual_preheat_warning(c.preheat); !hot.empty()) w.push_back(std::move(hot));
    const bool spray_like = p.transfer == Transfer::spray || p.transfer == Transfer::globular;
    if (p.transfer == Transfer::spray && p.wire_diameter > 0) {
        const double transition = spray_transition_current(p.wire_diameter);
        if (p.current < transition) {
            w.push_back(format_text("spray transfer at %.0f A is below the usual transition current of about %.0f A "
                                    "for %.1f mm wire; expect globular transfer (common practice, no source)",
                                    p.current, transition, p.wire_diameter * 1e3));
        }
    }
    if ((p.transfer == Transfer::spray || p.transfer == Transfer::pulsed_spray) && p.gas &&
        p.gas->argon + p.gas->helium < 80.0) {
        w.push_back(format_text("spray transfer with %.0f %% CO2 + O2 in the gas: spray needs an argon-rich gas (about "
                                "80 %% argon or more); blends with much CO2 spray poorly (common practice, no source)",
                                p.gas->co2 + p.gas->oxygen));
    }
    if (spray_like && p.position != Position::flat && p.position != Position::horizontal) {
        w.push_back(std::string("spray and globular transfer work in the flat and horizontal positions only, not ") +
                    std::string(to_string(p.position)) + " (common practice, no source)");
    }
    if (p.transfer == Transfer::short_circuit &&
        std::max(c.joint.flange_thickness, c.joint.web_thickness) >= 10e-3) {
        w.push_back("short-circuit transfer on plate 10 mm or thicker risks incomplete fusion into the flange "
                    "(cold lap); confirm by a macro-etch (common practice, no source)");
    }
    return w;
}

std::string_view to_string(Process p) { return process_names[static_cast<std::size_t>(p)]; }
std::string_view to_string(Transfer t) {
    return t == Transfer::none ? "none" : transfer_names[static_cast<std::size_t>(t) - 1];
}
std::string_view to_string(Position p) { return position_names[static_cast<std::size_t>(p)]; }

}  // namespace heatbead
