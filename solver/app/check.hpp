// `heatbead check`: the derived quantities a welding engineer looks at before any run.
#pragma once

#include "solver/weldability/carbon_equivalent.hpp"
#include "solver/case/case.hpp"
#include "solver/weldability/en1011_preheat.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/numerics/run_estimate.hpp"
#include "solver/studies/bead_summary.hpp"
#include "solver/studies/run_setup.hpp"

#include <nlohmann/json.hpp>

#include <optional>
#include <string>

namespace heatbead {

struct CheckReport {
    const Case* c = nullptr;
    double arc_energy = 0;   // J/m
    double heat_input = 0;   // J/m
    double net_power = 0;    // W
    BeadReport bead;         // asked against laid, and the wire's deposit
    // Grid
    std::size_t nx = 0, ny = 0, nz = 0, cells = 0, solid_cells = 0, weld_cells = 0;
    double h_min = 0, h_max = 0, max_ratio = 0;
    double memory = 0;  // bytes
    RunEstimate estimate;
    StopPlan stop;  // where the run will stop and why (solver/studies/run_setup.hpp)
    // With a base-metal composition: its carbon equivalents; with the filler's hydrogen too, the
    // EN 1011-2 method B preheat (a quick look before `heatbead preheat`).
    std::optional<CarbonEquivalents> carbon_equivalents;
    std::optional<StandardPreheat> standard_preheat;
};

CheckReport make_check_report(const Case& c);
// One screen of text.
std::string to_text(const CheckReport& r);
// The same figures as JSON, each with its unit.
nlohmann::json to_json(const CheckReport& r);

}  // namespace heatbead
