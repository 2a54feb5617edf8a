// Numbers into text for the pages, tables and files of post/: its one formatting helper. (post/
// may not include solver/, so it cannot share solver/core/text.hpp.) Everything here is in the
// C locale: the program never sets another, and to_chars knows none.
#pragma once

#include <string>

namespace heatbead::post {

// printf-style formatting into a string of any length, e.g. format_text("_%06zu.vtu", 7) → "_000007.vtu".
// The compiler checks the arguments against the format.
std::string format_text(const char* format, ...) __attribute__((format(printf, 1, 2)));

// The shortest form with up to 6 significant digits, as a reader typed it ("250", "0.3", "1e+06").
std::string number_text(double value);

// The shortest text that reads back as the same double ("0.1", "12.000000000000002").
std::string exact_text(double value);

// Fixed-point text with `decimals` digits after the point (0 to 12); "n/a", "inf" or "-inf" for a
// value that is not finite, and "0.00", never "-0.00", for a value that rounds to zero.
std::string format_fixed(double value, int decimals);

}  // namespace heatbead::post
