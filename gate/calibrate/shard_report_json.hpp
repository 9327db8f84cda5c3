// SPDX-License-Identifier: MIT
// A lossless JSON form of a change report, for the partial results of a sharded replay.
#pragma once

#include "gate/delta/function_delta.hpp"

#include <nlohmann/json.hpp>

namespace tollgate::calibrate {

// Return `report` as JSON that change_report_from_json reads back equal: every field, every text
// kept losslessly with text::store_bytes, every number exactly (doubles as the shortest text
// that reads back the same). Never throws.
nlohmann::json change_report_to_json(const delta::ChangeReport& report);

// Return the report that change_report_to_json wrote as `stored`. Throws std::exception (a
// nlohmann error or std::runtime_error) for a missing or mistyped field or damaged text.
delta::ChangeReport change_report_from_json(const nlohmann::json& stored);

} // namespace tollgate::calibrate
