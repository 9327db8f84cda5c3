// SPDX-License-Identifier: MIT
// Touched-function selection and base/head pairing.
#include "gate/delta/compare.hpp"

#include "gate/delta/pairing.hpp"
#include "tollgate/core/counts.hpp"

#include <algorithm>
#include <map>

namespace tollgate::delta {

namespace {

std::string name_and_signature(const SideFunction& f) {
    return f.qualified_name() + "(" + f.signature() + ")";
}

bool covers(const SideFunction& f, const walker::LineSet* lines) {
    if (lines == nullptr) {
        return false;
    }
    for (unsigned line = f.start_line(); line <= f.end_line(); ++line) {
        if (!lines->contains(line)) {
            return false;
        }
    }
    return true;
}

std::vector<Candidate> candidates_of(const std::vector<SideFunction>& functions,
                                     const walker::LineSet* lines) {
    std::vector<Candidate> result;
    for (const auto& f : functions) {
        result.push_back({&f, is_touched(f, lines), covers(f, lines), false});
    }
    return result;
}

// Measure `f` (count its tokens now, or take the snapshot's measures).
FunctionSide side_of(const SideFunction& f, const core::MeasureSettings& settings) {
    FunctionSide side;
    side.path = f.path();
    side.start_line = f.start_line();
    side.end_line = f.end_line();
    side.lexical = f.mode() == lexer::ExtentMode::lexical;
    side.inactive = f.inactive();
    side.brace_extent = f.brace_extent();
    side.parser_stopped = f.mode() == lexer::ExtentMode::parser_stopped;
    side.token_hash = f.token_hash();
    side.measures = f.span ? core::compute_measures(core::count_tokens(f.span->tokens),
                                                    f.span->potential_operands, settings)
                           : f.stored->measures;
    return side;
}

void pair_sides(std::vector<Candidate*>& base, std::vector<Candidate*>& head,
                std::vector<std::pair<Candidate*, Candidate*>>& pairs) {
    pair_by(
        base, head, [](const SideFunction& f) { return f.usr(); }, pairs);
    pair_by(
        base, head, [](const SideFunction& f) { return f.fallback_key(); }, pairs);
    pair_by(base, head, name_and_signature, pairs);
    pair_by_name(base, head, pairs);
}

// Where a pair's two sides were found.
enum class PairPlace {
    same_file,   // paired within one file (a renamed file's sides are the same file)
    other_file,  // the function moved to another file
    other_scope, // its namespace or class was renamed
};

FunctionDelta make_delta(const Candidate* base, const Candidate* head, PairPlace place,
                         const core::MeasureSettings& settings) {
    FunctionDelta delta;
    const SideFunction& shown = head ? *head->span : *base->span;
    delta.name = shown.qualified_name();
    delta.signature = shown.signature();
    delta.identity = shown.usr().empty() ? shown.fallback_key() : shown.usr();
    if (base) {
        delta.base = side_of(*base->span, settings);
        if (head && base->span->qualified_name() != head->span->qualified_name()) {
            delta.base_name = base->span->qualified_name();
        }
        if (head && base->span->signature() != head->span->signature()) {
            delta.base_signature = base->span->signature();
        }
    }
    if (head) {
        delta.head = side_of(*head->span, settings);
    }
    if (!base) {
        delta.label = DeltaLabel::added;
    } else if (!head) {
        delta.label = DeltaLabel::removed;
    } else if (place == PairPlace::other_file ||
               (place == PairPlace::other_scope &&
                (base->span->path() != head->span->path() ||
                 base->span->qualified_name() != head->span->qualified_name())) ||
               (base->whole && head->whole &&
                base->span->start_line() != head->span->start_line())) {
        delta.label = DeltaLabel::moved;
    } else if (base->span->token_hash() == head->span->token_hash()) {
        delta.label = DeltaLabel::unchanged;
    } else {
        delta.label = DeltaLabel::changed;
    }
    return delta;
}

} // namespace

bool is_touched(const SideFunction& function, const walker::LineSet* lines) {
    return lines != nullptr && lines->meets(function.start_line(), function.end_line());
}

std::vector<SideFunction> side_functions(const lexer::FileFunctions* file) {
    std::vector<SideFunction> functions;
    if (file != nullptr) {
        for (const auto& span : file->functions) {
            functions.push_back({&span, nullptr});
        }
    }
    return functions;
}

std::vector<SideFunction> side_functions(const baseline::Snapshot& snapshot,
                                         const std::string& path) {
    std::vector<SideFunction> functions;
    // Snapshot functions are sorted by path: find the file's run.
    auto it = std::lower_bound(
        snapshot.functions.begin(), snapshot.functions.end(), path,
        [](const baseline::SnapshotFunction& f, const std::string& p) { return f.path < p; });
    for (; it != snapshot.functions.end() && it->path == path; ++it) {
        functions.push_back({nullptr, &*it});
    }
    return functions;
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
                result.push_back(make_delta(b, h, PairPlace::same_file, settings));
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
        base_left, head_left, [](const SideFunction& f) { return f.usr(); }, moves);
    pair_by(base_left, head_left, name_and_signature, moves);
    for (const auto& [b, h] : moves) {
        result.push_back(make_delta(
            b, h, b->span->path() != h->span->path() ? PairPlace::other_file : PairPlace::same_file,
            settings));
    }
    // Last: a namespace or class renamed around the function, in one file or across files.
    std::vector<std::pair<Candidate*, Candidate*>> renamed;
    pair_renamed_scopes(base_left, head_left, renamed);
    for (const auto& [b, h] : renamed) {
        result.push_back(make_delta(b, h, PairPlace::other_scope, settings));
    }
    for (auto* c : base_left) {
        if (!c->paired) {
            result.push_back(make_delta(c, nullptr, PairPlace::same_file, settings));
        }
    }
    for (auto* c : head_left) {
        if (!c->paired) {
            result.push_back(make_delta(nullptr, c, PairPlace::same_file, settings));
        }
    }
    sort_deltas(result);
    return result;
}

} // namespace tollgate::delta
