// A sweep: a base case and axes of values for some of its keys, combined into points. Each point is
// the base case with one `--set key=value` per axis; its identity is a hash of the resolved case,
// so a re-run recognises points already done whatever their order.
//
// Sweep file (TOML; paths relative to it):
//   base = "demo_tee_15mm.toml"       the base case
//   combine = "grid"                  "grid" (every combination), "zip" (i-th values together) or
//                                     "sample" (Latin hypercube of `samples` points, `seed`)
//   samples = 20, seed = 1            for "sample"
//   outputs = "summary"               per point: "summary" (the summary and the cross-section lines,
//                                     a few kB) or "full" (the base case's output.files)
//   [set]                             overrides for every point, e.g. "grid.finest" = "1.5 mm"
//   [axes.NAME]                       one per axis, NAME a label of the user's:
//     key = "procedure.current"       the case key it varies
//     values = ["220 A", "260 A"]     a list (numbers or strings with units), or a range:
//     from = 220, to = 300, step = 20 (or count = 5; log = true for a geometric range with count),
//     unit = "A"                      the unit of a range's numbers (default: the key's own unit)
#pragma once

#include "solver/case/toml_reader.hpp"

#include <cstdint>
#include <string>
#include <vector>

namespace heatbead {

struct SweepAxis {
    std::string name, key;
    std::vector<std::string> values;  // TOML values for --set, e.g. "\"220 A\"" or "220"
};

struct SweepPoint {
    std::size_t index = 0;
    std::vector<std::string> values;  // one per axis, as in SweepAxis::values
};

struct SweepPlan {
    std::string file, text;       // the sweep file and its contents
    std::string base;             // the base case's path
    std::string combine = "grid";
    bool full_outputs = false;
    std::vector<Override> fixed;  // [set]
    std::vector<SweepAxis> axes;
    std::vector<SweepPoint> points;
};

// Reads and checks a sweep file: every axis key must be a key of the base case (checked by reading the
// base case with each axis's first value), no axis empty, zipped axes of one length, samples > 0.
// Throws CaseError with every problem (file:line, key, value, what is allowed); nothing is run.
SweepPlan read_sweep_plan(const std::string& path);

// The overrides of every point: bands off (a sweep maps the response over its axes, and the bands'
// extra runs would multiply its cost several times), then [set], which may turn them on again
// ("bands.enabled" = true).
std::vector<Override> base_overrides(const SweepPlan& plan);
// The overrides of one point: those of every point, then one per axis.
std::vector<Override> point_overrides(const SweepPlan& plan, const SweepPoint& point);

// 64-bit FNV-1a hash of a text, as 16 hex digits: the identity of a point's resolved case.
std::string text_hash(const std::string& text);

}  // namespace heatbead
