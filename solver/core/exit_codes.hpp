// Exit codes of the heatbead program (documented in README).
#pragma once

namespace heatbead::exit_code {
inline constexpr int ok = 0;
inline constexpr int bad_input = 1;       // case file or options wrong; nothing computed or written
inline constexpr int run_failed = 2;      // a computation or a write failed
inline constexpr int outside_validity = 3;  // results written but outside their validity (e.g. energy balance)
}  // namespace heatbead::exit_code
