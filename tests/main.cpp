// SPDX-License-Identifier: MIT
// Catch2's main for the whole test suite.
#define CATCH_CONFIG_MAIN
#include <catch2/catch.hpp>
