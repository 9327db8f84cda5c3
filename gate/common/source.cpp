// SPDX-License-Identifier: MIT
// C/C++ and Java file recognition by extension.
#include "gate/common/source.hpp"

#include "gate/common/byte_size.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <string_view>

namespace tollgate {

namespace {

constexpr std::array<std::string_view, 7> k_header_extensions = {".h",   ".hh",  ".hpp", ".hxx",
                                                                 ".inl", ".ipp", ".tpp"};
constexpr std::array<std::string_view, 5> k_source_extensions = {".c", ".cc", ".cpp", ".cxx",
                                                                 ".c++"};

} // namespace

std::string lower_extension(const std::string& path) {
    const auto slash = path.find_last_of('/');
    const auto dot = path.find_last_of('.');
    if (dot == std::string::npos || (slash != std::string::npos && dot < slash)) {
        return {};
    }
    std::string ext = path.substr(dot);
    std::transform(ext.begin(), ext.end(), ext.begin(),
                   [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    return ext;
}

bool is_header_path(const std::string& path) {
    const std::string ext = lower_extension(path);
    return std::find(k_header_extensions.begin(), k_header_extensions.end(), ext) !=
           k_header_extensions.end();
}

bool is_c_family_path(const std::string& path) {
    const std::string ext = lower_extension(path);
    return is_header_path(path) || std::find(k_source_extensions.begin(), k_source_extensions.end(),
                                             ext) != k_source_extensions.end();
}

std::string oversized_reason(std::uint64_t size, std::uint64_t max_bytes) {
    return "too large: " + format_byte_size(size) + ", over the " + format_byte_size(max_bytes) +
           " limit of --max-file-size";
}

bool is_java_path(const std::string& path) {
    return lower_extension(path) == ".java";
}

bool is_measured_path(const std::string& path) {
    return is_c_family_path(path) || is_java_path(path);
}

} // namespace tollgate
