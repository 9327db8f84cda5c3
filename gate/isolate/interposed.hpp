// SPDX-License-Identifier: MIT
// The table interpose.cpp publishes, so the library can tell whether the wrappers are in place.
#pragma once

namespace tollgate::isolate {

// One C library function the interposer replaces.
struct InterposedFunction {
    const char* name; // the C name, e.g. "open"; null ends the table
    void* address;    // the wrapper's address
};

} // namespace tollgate::isolate

// Return the interposer's table, ended by a null name. Defined only in executables that link
// interpose.cpp; weak, so other programs (the unit tests) see a null function.
extern "C" const tollgate::isolate::InterposedFunction* tollgate_interposed_functions()
    __attribute__((weak));
