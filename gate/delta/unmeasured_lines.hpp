// SPDX-License-Identifier: MIT
// The safety net: changed lines of a C/C++ file that no measured function holds.
#pragma once

#include "gate/delta/compare.hpp"
#include "gate/delta/function_delta.hpp"

#include <string>
#include <vector>

namespace tollgate::delta {

// Return, for each line of `content` (index = 1-based line number, index 0 unused), whether it
// holds code: anything but whitespace, `//` and `/* */` comments. Strings, character literals
// and raw strings are read as C++ reads them, so a comment marker inside one is code; a
// preprocessor directive is code. An empty text has no lines.
std::vector<bool> code_lines(const std::string& content);

// Return the changed code lines of `file` outside every function of the same side: the deleted
// lines of `base_content` outside every base function and the added lines of `head_content`
// outside every head function (a null content is a missing side). `path` names the file.
UnmeasuredLines unmeasured_lines(const std::string& path, const FileSides& file,
                                 const std::string* base_content, const std::string* head_content);

} // namespace tollgate::delta
