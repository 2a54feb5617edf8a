#include "post/cautions.hpp"

namespace heatbead::post {

const char* const planning_caution =
    "Predictions are estimates for planning. Fusion, soundness, hardness and preheat are proven by "
    "procedure qualification (macro-etch, hardness survey) under the governing welding code.";

const char* const preheat_caution =
    "Advisory estimate for planning, not a qualified preheat. The governing welding code, the qualified welding "
    "procedure and hardness testing decide the preheat; hydrogen control (dry low-hydrogen consumables, clean "
    "and dry joints, maintained interpass temperature, slow cooling where required) still applies.";

const char* const compare_caution =
    "Estimates for planning, not a qualified procedure. Which procedure fuses the root and both plates, and at "
    "what preheat, is proven by procedure qualification (macro-etch, hardness survey) under the governing welding "
    "code; the source shapes are rules of thumb until calibrated against a macro-section.";

const char* const fit_caution =
    "A fitted source reproduces the measurements it was fitted to; it is not a qualified procedure. Check it "
    "against a macro-section it was not fitted to before relying on its predictions.";

const char* const sweep_caution =
    "Each point is an estimate for planning; trends across a sweep are what it shows best. Fusion, hardness and "
    "preheat of a procedure are proven by its qualification under the governing welding code.";

const char* const run_page_caution =
    "Predictions are estimates for planning. Fusion and soundness are proven by procedure qualification "
    "(macro-etch, hardness survey) under the governing welding code.";

// A preheat set too low can let a weld crack, so the page never goes out without this.
const char* const preheat_page_caution =
    "The preheat and hardness shown are estimates for planning, not a procedure. The preheat to use is the one "
    "the governing welding code requires and a qualified welding procedure (with its hardness survey) proves; "
    "follow those and licensed engineering practice.";

// A comparison invites picking the "better" procedure: the page says that the pick still has to be
// qualified.
const char* const compare_page_caution =
    "The comparison is an estimate for planning: it shows how these procedures differ in this model, not "
    "that any of them is adequate. Fusion, hardness and preheat are proven by procedure qualification "
    "(macro-etch, hardness survey) under the governing welding code; follow it and licensed engineering practice.";

// A sweep invites picking the "best" point: the page says that the pick still has to be qualified.
const char* const sweep_page_caution =
    "The sweep shows how this model responds to the inputs varied; its values are estimates for planning, "
    "and no point of it is shown to be an adequate procedure. Fusion, hardness and preheat are proven by "
    "procedure qualification (macro-etch, hardness survey) under the governing welding code; follow it, "
    "qualified welding procedures and licensed engineering practice.";

}  // namespace heatbead::post
