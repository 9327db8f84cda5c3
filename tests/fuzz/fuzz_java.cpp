// SPDX-License-Identifier: MIT
// libFuzzer target for the Java front end: any bytes as a .java file, through tree-sitter and the
// lexical cross-check, and through the lexical path alone. Any input must measure without a crash
// and keep the promises checked in java_check.hpp.
#include "java_check.hpp"

#include <cstdio>
#include <cstdlib>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const std::string broken = tollgate::fuzz::check_java_input(data, size);
    if (!broken.empty()) {
        std::fprintf(stderr, "fuzz_java: %s\n", broken.c_str());
        std::abort();
    }
    return 0;
}
