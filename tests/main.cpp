// Catch2 v2 entry point for the single test executable.
#define CATCH_CONFIG_MAIN
#include <catch2/catch.hpp>
