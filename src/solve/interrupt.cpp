// InterruptGuard: see interrupt.hpp for why this file holds the library's only file-scope
// mutable state (signal handlers take no user data).
#include "solve/interrupt.hpp"

#include <csignal>

#include "core/error.hpp"

namespace colchem {

namespace {

// The signal number received, 0 if none; -1 marks a programmatic request.
volatile std::sig_atomic_t g_interrupt_signal = 0;
// How many guards are alive (touched only outside handlers).
int g_guard_depth = 0;

struct sigaction g_previous_int;
struct sigaction g_previous_term;

extern "C" void colchem_on_signal(int sig) {
  if (g_interrupt_signal != 0) {
    // Second signal: restore the previous disposition and re-raise, so it takes effect.
    sigaction(SIGINT, &g_previous_int, nullptr);
    sigaction(SIGTERM, &g_previous_term, nullptr);
    std::raise(sig);
    return;
  }
  g_interrupt_signal = sig;
}

}  // namespace

InterruptGuard::InterruptGuard() {
  const bool outermost = g_guard_depth == 0;
  if (outermost) g_interrupt_signal = 0;
  struct sigaction sa {};
  sa.sa_handler = colchem_on_signal;
  sigemptyset(&sa.sa_mask);
  sa.sa_flags = 0;  // no SA_RESTART: a blocking read returns EINTR and the solver polls
  if (sigaction(SIGINT, &sa, outermost ? &g_previous_int : nullptr) != 0 ||
      sigaction(SIGTERM, &sa, outermost ? &g_previous_term : nullptr) != 0) {
    throw RunError(ExitCode::kInternal, "could not install the SIGINT/SIGTERM handlers");
  }
  ++g_guard_depth;
}

InterruptGuard::~InterruptGuard() {
  if (--g_guard_depth > 0) return;
  sigaction(SIGINT, &g_previous_int, nullptr);
  sigaction(SIGTERM, &g_previous_term, nullptr);
  g_interrupt_signal = 0;
}

bool InterruptGuard::requested() const { return g_interrupt_signal != 0; }

int InterruptGuard::signal_number() const {
  return g_interrupt_signal > 0 ? static_cast<int>(g_interrupt_signal) : 0;
}

void InterruptGuard::request() { g_interrupt_signal = -1; }

void InterruptGuard::clear() { g_interrupt_signal = 0; }

}  // namespace colchem
