// SPDX-License-Identifier: MIT
// Shared headers: which leading #include lines of a file may be precompiled ahead of it.
#include "gate/lexer/shared_headers.hpp"

#include "gate/common/fnv_digest.hpp"

#include <algorithm>
#include <cctype>
#include <map>
#include <set>
#include <string_view>

namespace tollgate::lexer {

namespace {

// One line of a file, the text between two newlines (a trailing carriage return dropped).
std::vector<std::string_view> lines_of(std::string_view text) {
    std::vector<std::string_view> lines;
    std::size_t start = 0;
    while (start <= text.size()) {
        std::size_t end = text.find('\n', start);
        if (end == std::string_view::npos) {
            end = text.size();
        }
        std::string_view line = text.substr(start, end - start);
        if (!line.empty() && line.back() == '\r') {
            line.remove_suffix(1);
        }
        lines.push_back(line);
        start = end + 1;
    }
    return lines;
}

std::string_view trim(std::string_view text) {
    while (!text.empty() && (text.front() == ' ' || text.front() == '\t')) {
        text.remove_prefix(1);
    }
    while (!text.empty() && (text.back() == ' ' || text.back() == '\t')) {
        text.remove_suffix(1);
    }
    return text;
}

// A preprocessor directive: its name and the rest of the line. Not a directive: empty name.
struct Directive {
    std::string_view name;
    std::string_view rest;
};

Directive directive_of(std::string_view line) {
    line = trim(line);
    if (line.empty() || line.front() != '#') {
        return {};
    }
    line = trim(line.substr(1));
    std::size_t end = 0;
    while (end < line.size() &&
           (std::isalnum(static_cast<unsigned char>(line[end])) != 0 || line[end] == '_')) {
        ++end;
    }
    return {line.substr(0, end), trim(line.substr(end))};
}

// The header an #include names, with its delimiter ('"' or '<'); nothing for any other form
// (a macro, a line continuation, trailing text other than a // comment).
struct Included {
    std::string name;
    char delimiter = 0;
};

std::optional<Included> included_of(std::string_view rest) {
    if (rest.empty() || (rest.front() != '"' && rest.front() != '<')) {
        return std::nullopt;
    }
    const char close = rest.front() == '"' ? '"' : '>';
    const std::size_t end = rest.find(close, 1);
    if (end == std::string_view::npos || end == 1) {
        return std::nullopt;
    }
    const std::string_view after = trim(rest.substr(end + 1));
    if (!after.empty() && after.rfind("//", 0) != 0) {
        return std::nullopt;
    }
    return Included{std::string(rest.substr(1, end - 1)), rest.front()};
}

std::string_view base_name(std::string_view path) {
    const std::size_t slash = path.rfind('/');
    return slash == std::string_view::npos ? path : path.substr(slash + 1);
}

std::string_view stem(std::string_view path) {
    const std::string_view base = base_name(path);
    return base.substr(0, base.rfind('.'));
}

// The headers of `headers` an include of `name` may mean: those whose path is `name` or ends in
// "/name"; a name that climbs ("..") matches every header of the same base name.
std::vector<const SourceFile*> matches(const std::string& name,
                                       const std::vector<SourceFile>& headers) {
    std::vector<const SourceFile*> found;
    const bool climbs = name.find("..") != std::string::npos;
    for (const SourceFile& header : headers) {
        const std::string_view path = header.path;
        const bool hit = climbs ? base_name(path) == base_name(name)
                                : path == name || (path.size() > name.size() &&
                                                   path.compare(path.size() - name.size(),
                                                                name.size(), name) == 0 &&
                                                   path[path.size() - name.size() - 1] == '/');
        if (hit) {
            found.push_back(&header);
        }
    }
    return found;
}

// The directive lines of `text` outside block comments, in order.
std::vector<Directive> directives_of(std::string_view text) {
    std::vector<Directive> found;
    bool in_comment = false;
    for (const std::string_view line : lines_of(text)) {
        std::string_view rest = line;
        if (in_comment) {
            const std::size_t end = rest.find("*/");
            if (end == std::string_view::npos) {
                continue;
            }
            rest = rest.substr(end + 2);
            in_comment = false;
        }
        const Directive directive = directive_of(rest);
        if (!directive.name.empty()) {
            found.push_back(directive);
        }
        const std::size_t open = rest.rfind("/*");
        if (open != std::string_view::npos && rest.find("*/", open) == std::string_view::npos) {
            in_comment = true;
        }
    }
    return found;
}

// The macro of the include guard `directives` open with (#ifndef X / #define X, or
// #if !defined(X) / #define X), or empty.
std::string_view guard_macro(const std::vector<Directive>& directives) {
    if (directives.size() < 2 || directives[1].name != "define") {
        return {};
    }
    std::string_view guarded = directives[0].rest;
    if (directives[0].name == "if" && guarded.rfind("!defined", 0) == 0) {
        guarded = trim(guarded.substr(8));
        if (guarded.size() >= 2 && guarded.front() == '(' && guarded.back() == ')') {
            guarded = trim(guarded.substr(1, guarded.size() - 2));
        }
    } else if (directives[0].name != "ifndef") {
        return {};
    }
    const std::string_view defined = directives[1].rest.substr(0, directives[1].rest.find(' '));
    return guarded == defined ? guarded : std::string_view();
}

// True when `text` has `#pragma once` or opens with an include guard.
bool has_guard(std::string_view text) {
    const std::vector<Directive> directives = directives_of(text);
    for (const Directive& directive : directives) {
        if (directive.name == "pragma" && directive.rest == "once") {
            return true;
        }
    }
    return !guard_macro(directives).empty();
}

// True when `text` defines a macro besides its include guard.
bool defines_macros(std::string_view text) {
    const std::vector<Directive> directives = directives_of(text);
    const auto defines = std::count_if(directives.begin(), directives.end(),
                                       [](const Directive& d) { return d.name == "define"; });
    return defines > (guard_macro(directives).empty() ? 0 : 1);
}

// The leading run of #include lines of a file: as written, and what each names.
struct Leading {
    std::vector<std::string> lines;
    std::vector<Included> names;
};

Leading leading_includes(std::string_view content) {
    Leading found;
    bool in_comment = false;
    for (const std::string_view line : lines_of(content)) {
        std::string_view rest = trim(line);
        if (in_comment) {
            const std::size_t end = rest.find("*/");
            if (end == std::string_view::npos) {
                continue;
            }
            rest = trim(rest.substr(end + 2));
            in_comment = false;
        }
        if (rest.rfind("/*", 0) == 0) {
            const std::size_t end = rest.find("*/", 2);
            if (end == std::string_view::npos) {
                in_comment = true;
                continue;
            }
            rest = trim(rest.substr(end + 2));
        }
        if (rest.empty() || rest.rfind("//", 0) == 0) {
            continue;
        }
        if (rest.back() == '\\' ||
            rest.find_first_of(std::string_view("\r\f\v\0", 4)) != std::string_view::npos) {
            break; // a continued line, or a character a compiler may take as a line end: doubt
        }
        const Directive directive = directive_of(rest);
        if (directive.name == "pragma" && directive.rest == "once") {
            continue;
        }
        const auto included =
            directive.name == "include" ? included_of(directive.rest) : std::nullopt;
        if (!included) {
            break;
        }
        found.lines.emplace_back(rest);
        found.names.push_back(*included);
    }
    return found;
}

// Leave out the file's own header (first, quoted, named like `path`) when moving it after the
// others can change nothing; false when it cannot be left out safely.
bool drop_own_header(Leading& leading, const std::string& path,
                     const std::vector<SourceFile>& headers) {
    const Included& first = leading.names.front();
    if (first.delimiter != '"' || stem(first.name) != stem(path)) {
        return true;
    }
    const std::vector<const SourceFile*> own = matches(first.name, headers);
    if (own.empty()) {
        return false;
    }
    for (const SourceFile* header : own) {
        if (defines_macros(header->content)) {
            return false;
        }
    }
    leading.lines.erase(leading.lines.begin());
    leading.names.erase(leading.names.begin());
    return true;
}

// True when every header of `headers` that `names` may mean has an include guard.
bool all_guarded(const std::vector<Included>& names, const std::vector<SourceFile>& headers) {
    for (const Included& name : names) {
        for (const SourceFile* header : matches(name.name, headers)) {
            if (!has_guard(header->content)) {
                return false;
            }
        }
    }
    return true;
}

// The headers of `headers` a chain of #include lines may reach from `names`; all of them when
// one of those includes names a macro.
std::set<const SourceFile*> reachable(const std::vector<Included>& names,
                                      const std::vector<SourceFile>& headers) {
    std::set<const SourceFile*> reached;
    std::vector<std::string> pending;
    for (const Included& name : names) {
        pending.push_back(name.name);
    }
    std::set<std::string> asked;
    while (!pending.empty()) {
        const std::string name = pending.back();
        pending.pop_back();
        if (!asked.insert(name).second) {
            continue;
        }
        for (const SourceFile* header : matches(name, headers)) {
            if (!reached.insert(header).second) {
                continue;
            }
            for (const Directive& directive : directives_of(header->content)) {
                if (directive.name != "include" && directive.name != "include_next" &&
                    directive.name != "import") {
                    continue;
                }
                const auto included = included_of(directive.rest);
                if (!included) { // an #include of a macro: it may mean any header
                    for (const SourceFile& any : headers) {
                        reached.insert(&any);
                    }
                    return reached;
                }
                pending.push_back(included->name);
            }
        }
    }
    return reached;
}

} // namespace

std::optional<SharedIncludes> shared_includes(const SourceFile& file,
                                              const std::vector<SourceFile>& headers) {
    Leading leading = leading_includes(file.content);
    if (leading.names.empty() || !drop_own_header(leading, file.path, headers) ||
        leading.names.empty() || !all_guarded(leading.names, headers)) {
        return std::nullopt;
    }
    const std::set<const SourceFile*> reached = reachable(leading.names, headers);
    FnvDigest digest;
    for (const std::string& line : leading.lines) {
        digest.add_field(line);
    }
    std::map<std::string_view, const SourceFile*> ordered; // by path, whatever the scan order
    for (const SourceFile* header : reached) {
        ordered.emplace(header->path, header);
    }
    for (const auto& [path, header] : ordered) {
        digest.add_field(path).add_field(header->content);
    }
    SharedIncludes shared;
    shared.lines = std::move(leading.lines);
    shared.digest = digest.value();
    return shared;
}

} // namespace tollgate::lexer
