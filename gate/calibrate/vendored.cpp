// SPDX-License-Identifier: MIT
// Vendored-folder detection: licence and build files below holding folders, test-framework names.
#include "gate/calibrate/vendored.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <map>
#include <string_view>

namespace tollgate::calibrate {

namespace {

std::string lower(std::string_view text) {
    std::string out(text);
    for (auto& c : out) {
        c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    }
    return out;
}

// Folders a project keeps other people's code in (common practice, no source).
constexpr std::array<std::string_view, 15> k_holding_folders = {
    "tests",    "test",    "third_party", "third-party", "thirdparty",
    "3rdparty", "vendor",  "vendored",    "extern",      "external",
    "deps",     "contrib", "ext",         "externals",   "dependencies"};

// Folder names under which commonly bundled C/C++ unit-test frameworks ship their sources
// (common practice, no source).
constexpr std::array<std::string_view, 11> k_test_framework_folders = {
    "googletest", "googlemock", "gtest",  "gmock",    "catch",  "catch2",
    "doctest",    "unity",      "cmocka", "cpputest", "cxxtest"};

bool is_licence_file(std::string_view name) {
    const std::string stem = lower(name.substr(0, name.find('.')));
    return stem == "license" || stem == "licence" || stem == "copying" || stem == "license-mit" ||
           stem == "license_1_0";
}

bool is_build_file(std::string_view name) {
    const std::string n = lower(name);
    static constexpr std::array<std::string_view, 12> k_names = {
        "cmakelists.txt", "makefile", "makefile.am", "makefile.in", "meson.build",  "configure",
        "configure.ac",   "build",    "build.bazel", "sconstruct",  "premake5.lua", "build.gn"};
    return std::find(k_names.begin(), k_names.end(), n) != k_names.end() ||
           (n.size() > 4 && n.compare(n.size() - 4, 4, ".pro") == 0);
}

template <std::size_t N>
bool named_one_of(std::string_view name, const std::array<std::string_view, N>& names) {
    const std::string n = lower(name);
    return std::find(names.begin(), names.end(), n) != names.end();
}

// What the file names of one folder say.
struct FolderFacts {
    bool licence = false;
    bool build = false;
};

std::string_view last_component(std::string_view folder) {
    const auto slash = folder.rfind('/');
    return slash == std::string_view::npos ? folder : folder.substr(slash + 1);
}

bool below_holding_folder(std::string_view folder) {
    std::size_t start = 0;
    // Every component except the folder's own name.
    for (std::size_t slash = folder.find('/'); slash != std::string_view::npos;
         slash = folder.find('/', start)) {
        if (named_one_of(folder.substr(start, slash - start), k_holding_folders)) {
            return true;
        }
        start = slash + 1;
    }
    return false;
}

} // namespace

std::vector<VendoredFolder> find_vendored(const std::vector<std::string>& paths) {
    std::map<std::string, FolderFacts> folders; // sorted, so parents come before children
    for (const auto& path : paths) {
        const auto slash = path.rfind('/');
        if (slash == std::string::npos) {
            continue; // a file of the root: the root is never vendored
        }
        const std::string folder = path.substr(0, slash);
        const std::string_view name = std::string_view(path).substr(slash + 1);
        auto& facts = folders[folder];
        facts.licence = facts.licence || is_licence_file(name);
        facts.build = facts.build || is_build_file(name);
    }
    std::vector<VendoredFolder> found;
    for (const auto& [folder, facts] : folders) {
        if (inside_any(found, folder)) {
            continue; // inside a folder already taken
        }
        const bool top_level = folder.find('/') == std::string::npos;
        if (facts.licence && facts.build && below_holding_folder(folder)) {
            found.push_back({folder, VendoredSign::licensed_bundle, 0, 0});
        } else if ((facts.licence || facts.build) && !top_level &&
                   named_one_of(last_component(folder), k_test_framework_folders)) {
            found.push_back({folder, VendoredSign::test_framework, 0, 0});
        }
    }
    return found;
}

bool inside_any(const std::vector<VendoredFolder>& folders, const std::string& path) {
    return std::any_of(folders.begin(), folders.end(), [&path](const VendoredFolder& f) {
        return path.size() > f.path.size() && path.compare(0, f.path.size(), f.path) == 0 &&
               path[f.path.size()] == '/';
    });
}

const char* vendored_sign_text(VendoredSign sign) {
    switch (sign) {
    case VendoredSign::licensed_bundle:
        return "own licence and build files below a holding folder";
    case VendoredSign::test_framework:
        return "named like a bundled unit-test framework";
    }
    return "";
}

} // namespace tollgate::calibrate
