// Numbers into text for messages, screens and tables: the one formatting helper of the solver.
#pragma once

#include <cstdio>
#include <string>

namespace heatbead {

// printf-style formatting into a string of any length, e.g. format_text("%.1f mm", 7.94) → "7.9 mm".
template <class... Args>
std::string format_text(const char* format, Args... args) {
    const int n = std::snprintf(nullptr, 0, format, args...);
    if (n <= 0) return {};
    std::string s(static_cast<std::size_t>(n), '\0');
    std::snprintf(s.data(), s.size() + 1, format, args...);
    return s;
}

// The shortest form with up to 6 significant digits and no trailing zeros ("1495", "0.5", "1e-06").
inline std::string number_text(double x) { return format_text("%g", x); }

}  // namespace heatbead
