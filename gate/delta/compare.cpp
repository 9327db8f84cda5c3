// SPDX-License-Identifier: MIT
// Touched-function selection and base/head pairing.
#include "gate/delta/compare.hpp"

#include "tollgate/core/counts.hpp"

#include <map>

namespace tollgate::delta {

namespace {

using lexer::FunctionSpan;

// A candidate function of one side, with where it came from.
struct Candidate {
    const FunctionSpan* span = nullptr; // the lexed function
    bool touched = false;               // its extent meets a changed line of its side
    bool whole = false;                 // every line of its extent changed (moved candidates)
    bool paired = false;                // already paired
};

std::string name_and_signature(const FunctionSpan& span) {
    return span.qualified_name + "(" + span.signature + ")";
}

bool covers(const FunctionSpan& span, const walker::LineSet* lines) {
    if (lines == nullptr) {
        return false;
    }
    for (unsigned line = span.start_line; line <= span.end_line; ++line) {
        if (!lines->contains(line)) {
            return false;
        }
    }
    return true;
}

std::vector<Candidate> candidates_of(const lexer::FileFunctions* file,
                                     const walker::LineSet* lines) {
    std::vector<Candidate> result;
    if (file == nullptr) {
        return result;
    }
    for (const auto& span : file->functions) {
        result.push_back({&span, is_touched(span, lines), covers(span, lines), false});
    }
    return result;
}

FunctionSide side_of(const FunctionSpan& span, const core::MeasureSettings& settings) {
    FunctionSide side;
    side.path = span.path;
    side.start_line = span.start_line;
    side.end_line = span.end_line;
    side.lexical = span.mode == lexer::ExtentMode::lexical;
    side.token_hash = span.token_hash;
    side.measures =
        core::compute_measures(core::count_tokens(span.tokens), span.potential_operands, settings);
    return side;
}

// Pair unpaired candidates of `base` and `head` whose `key` is equal and unique on each side.
template <typename KeyFn>
void pair_by(std::vector<Candidate*>& base, std::vector<Candidate*>& head, KeyFn key,
             std::vector<std::pair<Candidate*, Candidate*>>& pairs) {
    std::map<std::string, std::vector<Candidate*>> base_by_key, head_by_key;
    for (auto* c : base) {
        if (!c->paired && !key(*c->span).empty()) {
            base_by_key[key(*c->span)].push_back(c);
        }
    }
    for (auto* c : head) {
        if (!c->paired && !key(*c->span).empty()) {
            head_by_key[key(*c->span)].push_back(c);
        }
    }
    for (auto& [k, base_list] : base_by_key) {
        auto it = head_by_key.find(k);
        if (it == head_by_key.end() || base_list.size() != 1 || it->second.size() != 1) {
            continue;
        }
        base_list.front()->paired = true;
        it->second.front()->paired = true;
        pairs.emplace_back(base_list.front(), it->second.front());
    }
}

void pair_sides(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                std::vector<std::pair<Candidate*, Candidate*>>& pairs) {
    pair_by(
        base, head, [](const FunctionSpan& s) { return s.usr; }, pairs);
    pair_by(
        base, head, [](const FunctionSpan& s) { return s.fallback_key; }, pairs);
    pair_by(base, head, name_and_signature, pairs);
}

FunctionDelta make_delta(const Candidate* base, const Candidate* head, bool other_file,
                         const core::MeasureSettings& settings) {
    FunctionDelta delta;
    const FunctionSpan& shown = head ? *head->span : *base->span;
    delta.name = shown.qualified_name;
    delta.signature = shown.signature;
    delta.identity = shown.usr.empty() ? shown.fallback_key : shown.usr;
    if (base) {
        delta.base = side_of(*base->span, settings);
    }
    if (head) {
        delta.head = side_of(*head->span, settings);
    }
    if (!base) {
        delta.label = DeltaLabel::added;
    } else if (!head) {
        delta.label = DeltaLabel::removed;
    } else if (other_file ||
               (base->whole && head->whole && base->span->start_line != head->span->start_line)) {
        delta.label = DeltaLabel::moved;
    } else if (base->span->token_hash == head->span->token_hash) {
        delta.label = DeltaLabel::unchanged;
    } else {
        delta.label = DeltaLabel::changed;
    }
    return delta;
}

} // namespace

bool is_touched(const FunctionSpan& span, const walker::LineSet* lines) {
    return lines != nullptr && lines->meets(span.start_line, span.end_line);
}

std::vector<FunctionDelta> compare_functions(const std::vector<FileSides>& files,
                                             const core::MeasureSettings& settings) {
    std::vector<std::vector<Candidate>> base_candidates, head_candidates;
    base_candidates.reserve(files.size());
    head_candidates.reserve(files.size());
    for (const auto& file : files) {
        base_candidates.push_back(candidates_of(file.base, file.base_lines));
        head_candidates.push_back(candidates_of(file.head, file.head_lines));
    }

    std::vector<FunctionDelta> result;
    // Within each file (a renamed file's sides are the same file).
    for (std::size_t i = 0; i < files.size(); ++i) {
        std::vector<Candidate*> base, head;
        for (auto& c : base_candidates[i]) {
            base.push_back(&c);
        }
        for (auto& c : head_candidates[i]) {
            head.push_back(&c);
        }
        std::vector<std::pair<Candidate*, Candidate*>> pairs;
        pair_sides(base, head, pairs);
        for (const auto& [b, h] : pairs) {
            if (b->touched || h->touched) {
                result.push_back(make_delta(b, h, false, settings));
            }
        }
    }

    // Across files: what is left touched on one side only may have moved to another file.
    std::vector<Candidate*> base_left, head_left;
    for (auto& list : base_candidates) {
        for (auto& c : list) {
            if (!c.paired && c.touched) {
                base_left.push_back(&c);
            }
        }
    }
    for (auto& list : head_candidates) {
        for (auto& c : list) {
            if (!c.paired && c.touched) {
                head_left.push_back(&c);
            }
        }
    }
    std::vector<std::pair<Candidate*, Candidate*>> moves;
    pair_by(
        base_left, head_left, [](const FunctionSpan& s) { return s.usr; }, moves);
    pair_by(base_left, head_left, name_and_signature, moves);
    for (const auto& [b, h] : moves) {
        result.push_back(make_delta(b, h, b->span->path != h->span->path, settings));
    }
    for (auto* c : base_left) {
        if (!c->paired) {
            result.push_back(make_delta(c, nullptr, false, settings));
        }
    }
    for (auto* c : head_left) {
        if (!c->paired) {
            result.push_back(make_delta(nullptr, c, false, settings));
        }
    }
    sort_deltas(result);
    return result;
}

} // namespace tollgate::delta
