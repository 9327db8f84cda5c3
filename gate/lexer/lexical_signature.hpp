// SPDX-License-Identifier: MIT
// What the lexical scan reads from a definition's header: its written name, parameter types and
// whether it has a result.
#pragma once

#include "gate/lexer/source_token.hpp"

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace tollgate::lexer {

// The parameters of one parameter list.
struct Parameters {
    std::string signature;   // types as written, names and default values left out
    std::uint64_t count = 0; // how many
};

// Describe the parameter list opened at `open`: types without names or default values; "()"
// and "(void)" have none.
Parameters describe_parameters(const std::vector<SourceToken>& tokens, std::size_t open);

// Return the written name of the function named at `name` whose parameter list opens at `open`,
// from the start of its qualification (no further back than `statement_start`): "Box::put",
// "operator+", "~Box", "Box::operator int".
std::string written_name(const std::vector<SourceToken>& tokens, std::size_t name, std::size_t open,
                         std::size_t statement_start);

// Return true when the declaration from `first` (name at `name`, body at `body_open`, written
// name `written`, in the class `class_name` or at namespace scope when empty) declares a result
// other than void: not a constructor, destructor or `void` function.
bool has_result(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t name,
                std::size_t body_open, const std::string& written, const std::string& class_name);

} // namespace tollgate::lexer
