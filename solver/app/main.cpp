// heatbead: heat flow of one arc-welding pass on a fillet-welded tee joint.
// Usage examples (also CTest smoke tests):
//   heatbead check cases/demo_tee_12mm.toml
//   heatbead check cases/demo_tee_12mm.toml --format json --set procedure.current=280
#include "solver/app/cli.hpp"

int main(int argc, char** argv) { return heatbead::run_command_line(argc, argv); }
