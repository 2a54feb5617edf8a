// The command line: verbs, options, and the one place that turns errors into messages and exit codes.
#pragma once

namespace heatbead {
int run_command_line(int argc, char** argv);
}
