// SPDX-License-Identifier: MIT
// FileFunctions as a JSON value: the form the lexed-file cache keeps on disk. Every text is kept
// losslessly with text::store_bytes, so source text that is not UTF-8 survives JSON.
#pragma once

#include "gate/lexer/function_span.hpp"

#include <nlohmann/json.hpp>
#include <string>

namespace tollgate::lexer {

// Return the bytes text::store_bytes kept in the JSON string `stored`. Throws
// std::runtime_error when it is damaged (nlohmann's type error when it is not a string).
std::string stored_text(const nlohmann::json& stored);

// Return `functions` as a JSON value (every field, tokens as compact arrays).
nlohmann::json file_functions_to_json(const FileFunctions& functions);

// Return the FileFunctions `value` holds. Throws std::exception (nlohmann's or
// std::runtime_error) when a field is missing, of the wrong type or out of range.
FileFunctions file_functions_from_json(const nlohmann::json& value);

} // namespace tollgate::lexer
