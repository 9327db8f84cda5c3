// SPDX-License-Identifier: MIT
// Benchmark floor: parse each given file with bare libclang, naive settings (full parse, no
// precompiled header, one thread), and print the wall time. Not a test; run by the bench scripts.
#include <chrono>
#include <clang-c/Index.h>
#include <cstdio>
#include <string>
#include <vector>

int main(int argc, char** argv) {
    if (argc < 2) {
        std::fprintf(stderr, "usage: naive_parse [-I DIR]... FILE...\n");
        return 2;
    }
    std::vector<std::string> flags = {"-x", "c++", "-std=c++17"};
    std::vector<const char*> files;
    for (int i = 1; i < argc; ++i) {
        const std::string arg = argv[i];
        if (arg == "-I" && i + 1 < argc) {
            flags.push_back("-I" + std::string(argv[++i]));
        } else {
            files.push_back(argv[i]);
        }
    }
    std::vector<const char*> args;
    for (const auto& f : flags) {
        args.push_back(f.c_str());
    }
    const auto start = std::chrono::steady_clock::now();
    CXIndex index = clang_createIndex(0, 0);
    unsigned parsed = 0;
    for (const char* file : files) {
        CXTranslationUnit unit = nullptr;
        if (clang_parseTranslationUnit2(index, file, args.data(), static_cast<int>(args.size()),
                                        nullptr, 0, CXTranslationUnit_None,
                                        &unit) == CXError_Success) {
            ++parsed;
            clang_disposeTranslationUnit(unit);
        }
    }
    clang_disposeIndex(index);
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    std::printf("%u %.3f\n", parsed, seconds);
    return parsed == files.size() ? 0 : 1;
}
