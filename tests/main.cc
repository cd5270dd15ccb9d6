// SPDX-License-Identifier: MIT
// The one Catch2 main shared by every module's test binary.
#define CATCH_CONFIG_MAIN
#include <catch2/catch.hpp>
