// Every caution text of heatbead, in one place. Results that can hurt someone (preheat, fusion
// adequacy, hardness) are shown with one of these, which defer to the governing welding code,
// qualified procedures and licensed practice. The texts are kept word for word: change one only
// on purpose, never in passing.
#pragma once

namespace heatbead::post {

// What the commands print and write beside their results.
extern const char* const planning_caution;  // check and run: predictions are estimates for planning
extern const char* const preheat_caution;   // preheat: an advisory estimate, not a qualified preheat
extern const char* const compare_caution;   // compare: no procedure compared is shown to be qualified
extern const char* const fit_caution;       // fit: a fitted source holds for what it was fitted to
extern const char* const sweep_caution;     // sweep: each point is an estimate, trends are the point

// What a report page shows when its caller gives no caution, so that no page goes out without one.
extern const char* const run_page_caution;
extern const char* const preheat_page_caution;
extern const char* const compare_page_caution;
extern const char* const sweep_page_caution;

}  // namespace heatbead::post
