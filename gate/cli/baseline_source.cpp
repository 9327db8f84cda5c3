// SPDX-License-Identifier: MIT
// The baseline snapshot a check trusts: the pipeline's --baseline file or the base commit's blob.
#include "gate/cli/baseline_source.hpp"

#include "gate/baseline/snapshot_text.hpp"
#include "gate/common/errors.hpp"
#include "gate/java/java_front_end.hpp"

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

namespace tollgate {

namespace {

namespace fs = std::filesystem;

// Return `configured` as a path in a git tree ("a/b.json"), or throw UsageError when it leaves
// the repository or names its root.
std::string tree_path(const std::string& configured) {
    const std::string remedy = "(give a path relative to the repository root, such as \"" +
                               std::string(baseline::k_default_snapshot_path) +
                               "\", or name a snapshot elsewhere with --baseline)";
    if (!configured.empty() && configured.front() == '/') {
        throw UsageError("baseline.path \"" + configured +
                         "\" is an absolute path; it is read from the base commit " + remedy);
    }
    std::string result;
    std::istringstream parts(configured);
    for (std::string part; std::getline(parts, part, '/');) {
        if (part.empty() || part == ".") {
            continue;
        }
        if (part == "..") {
            throw UsageError("baseline.path \"" + configured +
                             "\" leaves the repository by \"..\" " + remedy);
        }
        result += (result.empty() ? "" : "/") + part;
    }
    if (result.empty()) {
        throw UsageError("baseline.path \"" + configured + "\" names no file " + remedy);
    }
    return result;
}

std::string read_bytes(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    return text.str();
}

// Return the repository-relative path of `given` when it is a file of the working tree that the
// head commit added or changed (the change wrote it, e.g. where a pipeline restores its cache
// but found none): its bytes are the head's blob there and not the base's.
std::optional<std::string> written_by_change(const std::string& given,
                                             const walker::Repository& repository,
                                             const walker::ResolvedRange& range) {
    if (repository.is_bare() || range.head_source != walker::HeadSource::commit) {
        return std::nullopt;
    }
    std::error_code ec;
    const fs::path root = fs::weakly_canonical(fs::absolute(repository.workdir()), ec);
    const fs::path file = fs::weakly_canonical(fs::absolute(given), ec);
    const fs::path relative = file.lexically_relative(root);
    if (ec || relative.empty() || *relative.begin() == "..") {
        return std::nullopt;
    }
    const auto head = repository.read_file(range.head, relative.generic_string());
    if (!head || head->content != read_bytes(file.string())) {
        return std::nullopt;
    }
    const auto base = repository.read_file(range.base, relative.generic_string());
    if (base && base->content == head->content) {
        return std::nullopt;
    }
    return relative.generic_string();
}

// Index the snapshot's measures by the identity the report uses (USR, else the fallback key);
// identities recorded twice (macro-made functions) are left out rather than guessed.
std::map<std::string, core::Measures> baseline_by_identity(const baseline::Snapshot& snapshot) {
    std::map<std::string, core::Measures> by_identity;
    std::set<std::string> repeated;
    for (const auto& f : snapshot.functions) {
        const std::string& identity = f.usr.empty() ? f.fallback_key : f.usr;
        if (!by_identity.emplace(identity, f.measures).second) {
            repeated.insert(identity);
        }
    }
    for (const auto& identity : repeated) {
        by_identity.erase(identity);
    }
    return by_identity;
}

// A snapshot counted under another convention or Stroud number is stale, not wrong: a tool
// upgrade must not stop every pipeline. It is not used (the base is parsed, nothing is
// tolerated) and the warning says how to rebuild it.
void drop_if_stale(TrustedBaseline& trusted, const baseline::SnapshotExpectations& expectations,
                   const std::string& rebuild_path) {
    const baseline::Snapshot& snapshot = *trusted.snapshot;
    std::string why;
    if (expectations.convention && snapshot.convention != *expectations.convention) {
        why = "it was measured under convention \"" + snapshot.convention +
              "\", this run counts \"" + *expectations.convention + "\"";
    } else if (expectations.stroud && snapshot.stroud != *expectations.stroud) {
        why = "it was measured with Stroud number " +
              baseline::snapshot_text::format_stroud(snapshot.stroud) + ", this run uses " +
              baseline::snapshot_text::format_stroud(*expectations.stroud);
    }
    if (why.empty()) {
        return;
    }
    trusted.warning = "the baseline snapshot " + trusted.label + " is not used: " + why +
                      "; the base was parsed (rebuild it: tollgate snapshot --rev " +
                      snapshot.commit.substr(0, 7) + " --out " + rebuild_path + ")";
    trusted.notes.push_back(trusted.warning);
    trusted.snapshot.reset();
}

} // namespace

TrustedBaseline load_trusted_baseline(const std::string& given, const policy::Policy& judging,
                                      const walker::Repository& repository,
                                      const walker::ResolvedRange& range,
                                      const baseline::SnapshotExpectations& expectations) {
    TrustedBaseline trusted;
    if (!given.empty()) {
        trusted.label = given;
        trusted.rebuild_path = given;
        if (const auto own = written_by_change(given, repository, range)) {
            trusted.notes.push_back(
                "the baseline snapshot " + given + " is not used: it is the file " + *own +
                " as the head commit " + range.head.short_hex() +
                " adds or changes it, and a change cannot bring its own baseline (the base was "
                "parsed)");
            return trusted;
        }
        trusted.snapshot = baseline::load_snapshot(given);
        drop_if_stale(trusted, expectations, trusted.rebuild_path);
        return trusted;
    }
    if (judging.baseline.path.empty()) {
        return trusted;
    }
    const std::string path = tree_path(judging.baseline.path);
    trusted.label = path + " at base " + range.base.short_hex();
    trusted.rebuild_path = path;
    const auto file = repository.read_file(range.base, path);
    if (!file) {
        trusted.notes.push_back("no baseline snapshot at " + path + " in the base commit " +
                                range.base.short_hex() +
                                " (a pipeline passes the default branch's with --baseline)");
        return trusted;
    }
    try {
        trusted.snapshot = baseline::parse_snapshot(file->content, path);
    } catch (const UsageError& e) {
        throw UsageError("the base commit " + range.base.short_hex() + "'s " + e.what());
    }
    drop_if_stale(trusted, expectations, path);
    return trusted;
}

SnapshotUse decide_snapshot_use(const TrustedBaseline& trusted, const walker::ResolvedRange& range,
                                const delta::SnapshotCheck& check) {
    SnapshotUse use;
    use.notes = trusted.notes;
    use.warning = trusted.warning;
    if (!trusted.snapshot) {
        return use;
    }
    const baseline::Snapshot& snapshot = *trusted.snapshot;
    if (snapshot.commit != range.base.hex) {
        use.tolerates = true;
        use.notes.push_back("the baseline snapshot " + trusted.label + " is of commit " +
                            snapshot.commit.substr(0, 7) + ", not the base " +
                            range.base.short_hex() + ": the base was parsed");
        return use;
    }
    if (check.disagreements.empty()) {
        use.tolerates = true;
        use.notes.push_back("the baseline snapshot " + trusted.label + " is of the base " +
                            range.base.short_hex() +
                            " and agrees with the parsed base on every touched function (" +
                            std::to_string(check.functions) + " compared)");
        return use;
    }
    use.warning = "the baseline snapshot " + trusted.label + " disagrees with the parsed base " +
                  range.base.short_hex() + " on " + std::to_string(check.disagreements.size()) +
                  " of " + std::to_string(check.functions) +
                  " touched functions and is not used, neither for the base nor for "
                  "tolerating existing findings: " +
                  check.first_disagreement() + " (rebuild it: tollgate snapshot --rev " +
                  range.base.short_hex() + " --out " + trusted.rebuild_path + ")";
    use.notes.push_back(use.warning);
    return use;
}

CheckBaseline::CheckBaseline(const std::string& given, const policy::Policy& judging,
                             const walker::Repository& repository,
                             const walker::ResolvedRange& range,
                             delta::MeasureChangeSettings& settings) {
    baseline::SnapshotExpectations expectations;
    expectations.convention = java::build_fingerprint(settings.convention);
    expectations.stroud = settings.measures.stroud;
    m_trusted = load_trusted_baseline(given, judging, repository, range, expectations);
    if (m_trusted.snapshot) {
        settings.base_snapshot = &*m_trusted.snapshot;
        settings.snapshot_check = &m_check;
    }
}

void CheckBaseline::apply(const walker::ResolvedRange& range, delta::ChangeReport& report,
                          policy::JudgeOptions& options) {
    const SnapshotUse use = decide_snapshot_use(m_trusted, range, m_check);
    report.notes.insert(report.notes.end(), use.notes.begin(), use.notes.end());
    if (!use.warning.empty()) {
        std::fprintf(stderr, "tollgate: warning: %s\n", use.warning.c_str());
    }
    if (!use.tolerates) {
        return;
    }
    m_recorded = baseline_by_identity(*m_trusted.snapshot);
    options.baseline_lookup = [this](const std::string& identity) -> std::optional<core::Measures> {
        const auto it = m_recorded.find(identity);
        return it == m_recorded.end() ? std::nullopt : std::optional(it->second);
    };
}

} // namespace tollgate
