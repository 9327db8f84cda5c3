// SPDX-License-Identifier: MIT
// libFuzzer target for the lexical path: the definition scanner and the token classifier without
// a syntax tree (what measures a file the parser could not), fed a token stream decoded from the
// input. Any stream must scan and classify without a crash and keep the promises checked in
// lexical_stream.hpp.
#include "lexical_stream.hpp"

#include <cstdio>
#include <cstdlib>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    const tollgate::fuzz::Stream stream = tollgate::fuzz::decode_stream(data, size);
    const std::string broken = tollgate::fuzz::check_lexical_path(stream);
    if (!broken.empty()) {
        std::fprintf(stderr, "fuzz_lexical: %s\n", broken.c_str());
        std::abort();
    }
    return 0;
}
