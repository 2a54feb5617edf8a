#include "solver/app/interrupt.hpp"

#include <csignal>

namespace heatbead {

std::atomic<bool>& interrupt_flag() {
    static std::atomic<bool> flag{false};
    return flag;
}

namespace {
extern "C" void on_interrupt(int) { interrupt_flag().store(true); }
}  // namespace

void catch_interrupts(bool restart_calls) {
    struct sigaction action {};
    action.sa_handler = on_interrupt;
    action.sa_flags = restart_calls ? SA_RESTART : 0;
    sigemptyset(&action.sa_mask);
    sigaction(SIGINT, &action, nullptr);
    sigaction(SIGTERM, &action, nullptr);
}

}  // namespace heatbead
