// SPDX-License-Identifier: MIT
// Names a reviewer can read: functions made by a macro invocation followed by a body (test
// macros), and operator names as written.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <clang-c/Index.h>
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace tollgate::lexer {

// Return tokens `begin`..`end` (exclusive) as they are usually written: a space only between two
// words (names, keywords, literals) and after a comma, e.g. "operator const char*",
// "TEST(EmitterTest, MultiDocs)", "std::vector<int>".
std::string join_written(const std::vector<SourceToken>& tokens, std::size_t begin,
                         std::size_t end);

// Return the name of a function made by a macro invocation followed by a body, as written:
// when the tokens from `first` are a name, a balanced `( ... )` and then `{`, return e.g.
// "TEST(EmitterTest, MultiDocs)" or "TEST_CASE(\"parses\", \"[yaml]\")"; otherwise nothing.
std::optional<std::string> macro_invocation_name(const std::vector<SourceToken>& tokens,
                                                 std::size_t first);

// Return true when `spelling` reads as a macro name by the common convention (common practice,
// no source): upper-case letters, digits and underscores, with at least two letters.
bool is_macro_style_name(const std::string& spelling);

// The name a reviewer reads for a function libclang reported.
struct ReadableName {
    std::string name;        // qualified name as the reports show it
    bool macro_made = false; // named by the macro invocation that made it (no parameters)
};

// Return the name a reviewer reads for the function libclang reports as `cursor`, whose
// qualified name is `qualified` and whose tokens run from `first` to `last` with its name at
// `name` (static_cast<std::size_t>(-1) when the name is not spelled in the file): a conversion
// operator as written ("Box::operator T*", not "operator type-parameter-0-0 *"); a function made
// by a macro invocation followed by a body by the invocation, after its enclosing namespaces
// ("TEST(EmitterTest, MultiDocs)", not "EmitterTest_MultiDocs_Test::TestBody"), when its name
// token is missing or spelled otherwise than the function, or when the declaration starts with
// a macro-style name (an unknown test macro the parser took for a function); any other function
// by `qualified`.
ReadableName readable_name(CXCursor cursor, const std::string& qualified,
                           const std::vector<SourceToken>& tokens, std::size_t first,
                           std::size_t last, std::size_t name);

} // namespace tollgate::lexer
