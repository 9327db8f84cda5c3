// SPDX-License-Identifier: MIT
// The snapshot file's text: schema name, JSON dumping, the content digest, message helpers.
#include "gate/baseline/snapshot_text.hpp"

#include "gate/baseline/snapshot.hpp"
#include "gate/common/fnv_digest.hpp"
#include "gate/common/text_safety.hpp"

#include <cctype>
#include <cstdint>
#include <cstring>
#include <fmt/format.h>

namespace tollgate::baseline::snapshot_text {

std::string schema_text(int version) {
    return std::string(k_snapshot_schema_name) + "/" + std::to_string(version);
}

std::string dump(const Json& value, int indent) {
    return ::tollgate::text::dump_json(value, indent);
}

std::string content_digest(Json document) {
    document.erase("created");
    document.erase("content_digest");
    return fmt::format("{}{:016x}", k_digest_prefix, fnv_digest(dump(document, -1)));
}

std::string format_stroud(double stroud) {
    return fmt::format("{}", stroud);
}

std::string shell_word(const std::string& text) {
    return ::tollgate::text::shell_word(text);
}

std::string lowercase_error(int error) {
    std::string text = std::strerror(error);
    if (!text.empty()) {
        text[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(text[0])));
    }
    return text;
}

} // namespace tollgate::baseline::snapshot_text
