// SPDX-License-Identifier: MIT
// What SIGINT, SIGTERM and SIGHUP do to a running command: remove the temporary files of
// outputs not yet in place (core/atomic_file.h) and end with 128 + the signal's number (130,
// 143, 129), leaving every old output as it was.
#pragma once

namespace sevenfold::cli {

// Installs the handlers; call once, first thing in main.
void InstallInterruptCleanup();

}  // namespace sevenfold::cli
