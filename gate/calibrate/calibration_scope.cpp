// SPDX-License-Identifier: MIT
// Choosing the policy a calibration honours and leaving bundled folders out of it.
#include "gate/calibrate/calibration_scope.hpp"

#include "gate/policy/judge.hpp"

#include <algorithm>
#include <set>

namespace tollgate::calibrate {

std::string folder_glob(const std::string& folder) {
    std::string glob;
    for (const char c : folder) {
        if (c == '*' || c == '?' || c == '[') {
            glob += '[';
            glob += c;
            glob += ']';
        } else {
            glob += c;
        }
    }
    return glob + "/**";
}

CalibrationScope choose_scope(const walker::Repository& repository, const walker::History& history,
                              const std::string& draft_path, VendoredHandling handling) {
    CalibrationScope scope;
    scope.handling = handling;
    if (!draft_path.empty()) {
        scope.policy = policy::load_policy_file(draft_path);
        scope.origin = draft_path;
        scope.draft = true;
    } else if (!history.commits.empty()) {
        const auto& tip = history.commits.back().id;
        if (const auto file = repository.read_file(tip, policy::k_default_policy_path)) {
            scope.origin = std::string(policy::k_default_policy_path) + " at " + tip.short_hex();
            scope.policy = policy::load_policy(file->content, scope.origin);
        }
    }
    if (scope.origin.empty()) {
        scope.policy = policy::default_policy();
        scope.origin = "built-in default";
    }

    std::set<std::string> paths;
    if (!history.commits.empty()) {
        for (const auto& path : repository.list_file_paths(history.commits.back().id)) {
            paths.insert(path);
        }
        if (const auto& first = history.commits.front(); first.parent) {
            for (const auto& path : repository.list_file_paths(*first.parent)) {
                paths.insert(path);
            }
        }
    }
    scope.vendored = find_vendored(std::vector<std::string>(paths.begin(), paths.end()));
    exclude_vendored(scope);
    return scope;
}

void exclude_vendored(CalibrationScope& scope) {
    if (scope.handling == VendoredHandling::exclude) {
        auto& exclude = scope.policy.paths.exclude;
        for (const auto& folder : scope.vendored) {
            const std::string glob = folder_glob(folder.path);
            // A folder the policy already leaves out needs no second entry.
            if (policy::in_scope(scope.policy.paths, folder.path + "/x.c") &&
                std::find(exclude.begin(), exclude.end(), glob) == exclude.end()) {
                exclude.push_back(glob);
            }
        }
    }
}

bool keep_changed_file(const CalibrationScope& scope, const walker::ChangedFile& file) {
    bool any_in_scope = false;
    for (const auto* path : {&file.head_path, &file.base_path}) {
        if (path->empty()) {
            continue;
        }
        if (scope.handling == VendoredHandling::exclude && inside_any(scope.vendored, *path)) {
            continue;
        }
        any_in_scope = any_in_scope || policy::in_scope(scope.policy.paths, *path);
    }
    return any_in_scope;
}

void count_vendored(CalibrationScope& scope,
                    const std::vector<std::vector<std::string>>& dropped_per_commit) {
    for (auto& folder : scope.vendored) {
        folder.files = 0;
        folder.commits = 0;
        const std::vector<VendoredFolder> one = {folder};
        for (const auto& dropped : dropped_per_commit) {
            const auto inside = static_cast<std::size_t>(
                std::count_if(dropped.begin(), dropped.end(),
                              [&one](const std::string& path) { return inside_any(one, path); }));
            folder.files += inside;
            folder.commits += inside > 0 ? 1 : 0;
        }
    }
}

} // namespace tollgate::calibrate
