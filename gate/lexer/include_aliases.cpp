// SPDX-License-Identifier: MIT
// Quoted includes that climb folders ("../x.h") get their headers under the path libclang builds.
#include "gate/lexer/include_aliases.hpp"

#include "gate/lexer/lexer.hpp"

#include <map>
#include <optional>
#include <set>

namespace tollgate::lexer {

namespace {

// Return the quoted include names of `content` that hold a ".." component.
std::set<std::string> climbing_includes(const std::string& content) {
    std::set<std::string> names;
    std::size_t at = 0;
    while ((at = content.find("include", at)) != std::string::npos) {
        // The directive's `#` must start the line (after blanks).
        std::size_t hash = at;
        while (hash > 0 && (content[hash - 1] == ' ' || content[hash - 1] == '\t')) {
            --hash;
        }
        const bool directive = hash > 0 && content[hash - 1] == '#';
        std::size_t line_start = directive ? hash - 1 : 0;
        while (directive && line_start > 0 &&
               (content[line_start - 1] == ' ' || content[line_start - 1] == '\t')) {
            --line_start;
        }
        at += 7;
        if (!directive || (line_start > 0 && content[line_start - 1] != '\n')) {
            continue;
        }
        std::size_t open = at;
        while (open < content.size() && (content[open] == ' ' || content[open] == '\t')) {
            ++open;
        }
        if (open >= content.size() || content[open] != '"') {
            continue;
        }
        const std::size_t close = content.find_first_of("\"\n", open + 1);
        if (close == std::string::npos || content[close] != '"') {
            continue;
        }
        const std::string name = content.substr(open + 1, close - open - 1);
        if (name == ".." || name.rfind("../", 0) == 0 || name.find("/../") != std::string::npos) {
            names.insert(name);
        }
    }
    return names;
}

// Return `folder` + "/" + `name` with "." and ".." resolved, or nothing when it climbs out.
std::optional<std::string> normalised(const std::string& folder, const std::string& name) {
    std::vector<std::string> parts;
    const std::string joined = folder.empty() ? name : folder + "/" + name;
    std::size_t start = 0;
    while (start <= joined.size()) {
        const std::size_t slash = joined.find('/', start);
        const std::string part =
            joined.substr(start, slash == std::string::npos ? std::string::npos : slash - start);
        if (part == "..") {
            if (parts.empty()) {
                return std::nullopt;
            }
            parts.pop_back();
        } else if (!part.empty() && part != ".") {
            parts.push_back(part);
        }
        if (slash == std::string::npos) {
            break;
        }
        start = slash + 1;
    }
    std::string path;
    for (const auto& part : parts) {
        path += (path.empty() ? "" : "/") + part;
    }
    return path;
}

std::string folder_of(const std::string& path) {
    const auto slash = path.rfind('/');
    return slash == std::string::npos ? std::string() : path.substr(0, slash);
}

} // namespace

std::vector<SourceFile> parent_include_aliases(const std::vector<SourceFile>& files,
                                               const std::vector<SourceFile>& headers,
                                               const std::vector<std::string>& include_dirs) {
    std::map<std::string, const SourceFile*> by_path;
    for (const SourceFile& header : headers) {
        by_path[header.path] = &header;
    }
    std::map<std::string, std::string> aliases; // alias -> the header's own path
    for (const SourceFile& file : files) {
        const std::set<std::string> names = climbing_includes(file.content);
        if (names.empty()) {
            continue;
        }
        std::vector<std::string> folders = {folder_of(file.path)};
        folders.insert(folders.end(), include_dirs.begin(), include_dirs.end());
        for (const std::string& name : names) {
            for (const std::string& folder : folders) {
                const auto target = normalised(folder, name);
                if (!target) {
                    continue;
                }
                const auto header = by_path.find(*target);
                const std::string alias = folder.empty() ? name : folder + "/" + name;
                if (header != by_path.end() && alias != *target &&
                    target->find_first_of("\"\\\n") == std::string::npos) {
                    aliases.emplace(alias, *target);
                }
            }
        }
    }
    // An alias includes the header by its own path, so that #pragma once and include guards
    // see one file however it was reached.
    std::vector<SourceFile> result;
    for (const auto& [alias, target] : aliases) {
        result.push_back({alias, "#include \"" + std::string(k_virtual_root) + target + "\"\n"});
    }
    return result;
}

} // namespace tollgate::lexer
