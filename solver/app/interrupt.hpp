// Ctrl-C and SIGTERM: one flag for the whole program, set by one handler. Commands install the
// handler first thing; runs poll the flag every step, stop, and write nothing.
#pragma once

#include <atomic>

namespace heatbead {

// Set by SIGINT or SIGTERM once catch_interrupts() has run.
std::atomic<bool>& interrupt_flag();

// Installs the handler for SIGINT and SIGTERM. With `restart_calls` false, a blocking system call
// (a wait for worker processes) returns at the signal instead of resuming, so the caller can pass
// the signal on at once.
void catch_interrupts(bool restart_calls = true);

}  // namespace heatbead
