// SPDX-License-Identifier: MIT
// The snapshot file's text, shared by its reader and its writer: schema name, JSON dumping, the
// content digest and message helpers. Internal to gate/baseline.
#pragma once

#include "gate/baseline/snapshot.hpp"
#include "gate/lexer/function_span.hpp"

#include <nlohmann/json.hpp>
#include <string>
#include <utility>

namespace tollgate::baseline::snapshot_text {

using Json = nlohmann::ordered_json;

// The prefix of the "content_digest" value.
inline constexpr const char* k_digest_prefix = "fnv1a64:";

// Return the "schema" value of schema version `version`, e.g. "tollgate.snapshot/1".
std::string schema_text(int version);

// Serialize `value` as written to disk (`indent` -1 is compact); invalid UTF-8 in source text
// becomes U+FFFD so dumping never throws and a re-read dumps to the same bytes (the exact bytes
// are kept under a function's "exact" key).
std::string dump(const Json& value, int indent);

// The text keys of a function whose exact bytes are kept under "exact" when they are not valid
// UTF-8 (JSON strings cannot hold them), with the field each one fills.
inline constexpr std::pair<const char*, std::string SnapshotFunction::*> k_text_keys[] = {
    {"file", &SnapshotFunction::path},
    {"usr", &SnapshotFunction::usr},
    {"fallback_key", &SnapshotFunction::fallback_key},
    {"function", &SnapshotFunction::qualified_name},
    {"signature", &SnapshotFunction::signature},
};

// Return the digest of `document` without its "created" and "content_digest" keys, as dumped
// compactly: equal content gives an equal digest. Anyone can recompute it: it shows damage and
// careless edits, not forgery.
std::string content_digest(Json document);

// Return the Stroud number as written in messages ("18", "17.5").
std::string format_stroud(double stroud);

// Quote `text` for a shell command shown in a message, only when it needs it.
std::string shell_word(const std::string& text);

// Return the text of errno value `error`, starting lowercase.
std::string lowercase_error(int error);

} // namespace tollgate::baseline::snapshot_text
