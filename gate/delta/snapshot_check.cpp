// SPDX-License-Identifier: MIT
// The spot-check of a base snapshot: its touched functions against the parsed base's.
#include "gate/delta/snapshot_check.hpp"

#include <fmt/format.h>
#include <map>

namespace tollgate::delta {

namespace {

// The head side is the same in both lists, so it names a delta; a removed function has only
// its base side, named by its path and identity.
std::string key_of(const FunctionDelta& f) {
    if (f.head) {
        return fmt::format("head\n{}\n{}\n{}({})", f.head->path, f.head->start_line, f.name,
                           f.signature);
    }
    return fmt::format("base\n{}\n{}", f.base ? f.base->path : std::string(), f.identity);
}

std::string location_of(const FunctionDelta& f) {
    const FunctionSide& side = f.shown_side();
    return fmt::format("{}:{}: {}({})", side.path, side.start_line, f.name, f.signature);
}

bool same_base(const FunctionDelta& a, const FunctionDelta& b) {
    if (a.label != b.label || a.base.has_value() != b.base.has_value()) {
        return false;
    }
    if (!a.base) {
        return true;
    }
    const core::Measures& x = a.base->measures;
    const core::Measures& y = b.base->measures;
    return x.n1 == y.n1 && x.n2 == y.n2 && x.N1 == y.N1 && x.N2 == y.N2 &&
           x.potential_operands == y.potential_operands && a.base->token_hash == b.base->token_hash;
}

std::string describe(const FunctionDelta* f) {
    if (f == nullptr) {
        return "no such touched function";
    }
    if (!f->base) {
        return std::string(label_name(f->label)) + ", no base side";
    }
    const core::Measures& m = f->base->measures;
    return fmt::format("{}, n1 {} n2 {} N1 {} N2 {} n2* {} (effort {:.0f}), token hash {}",
                       label_name(f->label), m.n1, m.n2, m.N1, m.N2, m.potential_operands, m.effort,
                       f->base->token_hash.substr(0, 12));
}

} // namespace

std::string SnapshotCheck::first_disagreement() const {
    if (disagreements.empty()) {
        return std::string();
    }
    const SnapshotDisagreement& d = disagreements.front();
    return d.location + ": the snapshot has " + d.recorded + "; the base parses to " + d.parsed;
}

SnapshotCheck check_base_snapshot(const std::vector<FunctionDelta>& parsed,
                                  const std::vector<FunctionDelta>& recorded) {
    SnapshotCheck check;
    check.compared = true;
    // Both sides by key, in the parsed report's order first, then what only the snapshot has.
    std::map<std::string, std::pair<const FunctionDelta*, const FunctionDelta*>> by_key;
    std::vector<std::string> order;
    for (const auto& f : parsed) {
        const std::string key = key_of(f);
        if (by_key.emplace(key, std::make_pair(&f, nullptr)).second) {
            order.push_back(key);
        }
    }
    for (const auto& f : recorded) {
        const std::string key = key_of(f);
        auto [it, inserted] = by_key.emplace(key, std::make_pair(nullptr, &f));
        if (inserted) {
            order.push_back(key);
        } else {
            it->second.second = &f;
        }
    }
    for (const auto& key : order) {
        const auto [from_parse, from_snapshot] = by_key[key];
        ++check.functions;
        if (from_parse != nullptr && from_snapshot != nullptr &&
            same_base(*from_parse, *from_snapshot)) {
            continue;
        }
        const FunctionDelta& shown = from_parse != nullptr ? *from_parse : *from_snapshot;
        check.disagreements.push_back(
            {location_of(shown), describe(from_snapshot), describe(from_parse)});
    }
    return check;
}

} // namespace tollgate::delta
