// SPDX-License-Identifier: MIT
#include "cli/interrupt.h"

#include <signal.h>
#include <unistd.h>

#include "core/atomic_file.h"

namespace sevenfold::cli {
namespace {

// Only async-signal-safe calls: unlink (inside RemovePendingTemporaries) and _exit.
extern "C" void OnTerminationSignal(int signal_number) {
  RemovePendingTemporaries();
  _exit(128 + signal_number);
}

}  // namespace

void InstallInterruptCleanup() {
  struct sigaction action {};
  action.sa_handler = OnTerminationSignal;
  sigemptyset(&action.sa_mask);
  // While one handler runs, the others wait: the cleanup happens once.
  sigaddset(&action.sa_mask, SIGINT);
  sigaddset(&action.sa_mask, SIGTERM);
  sigaddset(&action.sa_mask, SIGHUP);
  for (const int signal_number : {SIGINT, SIGTERM, SIGHUP}) {
    struct sigaction previous {};
    sigaction(signal_number, nullptr, &previous);
    // A signal ignored by whoever started us (nohup, a background job) stays ignored.
    if (previous.sa_handler == SIG_IGN) continue;
    sigaction(signal_number, &action, nullptr);
  }
}

}  // namespace sevenfold::cli
