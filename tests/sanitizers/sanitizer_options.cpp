// SPDX-License-Identifier: MIT
// Default options of the sanitizer runtimes, compiled into the tollgate binary and the test
// binary of a TOLLGATE_SANITIZE=ON build, so that every run (CTest, tests/run_sanitized.sh, a
// test starting the binary, a developer by hand) stops at the first report and reads the
// suppression files beside this one. ASAN_OPTIONS, LSAN_OPTIONS and UBSAN_OPTIONS still override.

// The runtimes look these functions up by name: they keep their names and C linkage.
extern "C" {

const char* __asan_default_options();
const char* __lsan_default_options();
const char* __ubsan_default_options();

// Leaks are errors; use-after-return detection stays off (libclang's deep recursion on fake
// stacks costs more than it finds in our code). No alternate signal stack from ASan: LLVM gives
// a thread its own (malloc'd, 79,040 bytes) when it registers its signal handlers, which libclang
// does on its parse thread when it writes a precompiled preamble to a temporary file; at that
// thread's exit ASan then tried to unmap LLVM's stack and stopped the process ("unable to
// unmap"), in every parse that keeps its preamble (tests/gate/lexer/test_preamble_kept.cpp).
const char* __asan_default_options() {
    return "detect_leaks=1:strict_string_checks=1:detect_stack_use_after_return=0:"
           "use_sigaltstack=0";
}

const char* __lsan_default_options() {
    return "suppressions=" TOLLGATE_SANITIZER_DIR "/lsan.supp:print_suppressions=0";
}

const char* __ubsan_default_options() {
    return "halt_on_error=1:print_stacktrace=1:suppressions=" TOLLGATE_SANITIZER_DIR "/ubsan.supp";
}

} // extern "C"
