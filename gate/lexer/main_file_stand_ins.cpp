// SPDX-License-Identifier: MIT
// Stand-ins on disk for in-memory main files (see main_file_stand_ins.hpp).
#include "gate/lexer/main_file_stand_ins.hpp"

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <spdlog/spdlog.h>
#include <system_error>
#include <vector>

namespace tollgate::lexer {

namespace {

// Paths that go into the overlay document verbatim: printable ASCII without the characters
// that JSON (and so clang's YAML reader) would need escaped. Anything else is a path a change
// chose; it is parsed without reuse rather than escaped into a file another parser reads.
bool plain_path(const std::string& path) {
    return !path.empty() && std::all_of(path.begin(), path.end(), [](unsigned char c) {
        return c >= 0x20 && c < 0x7f && c != '"' && c != '\\';
    });
}

bool write_file(const std::string& path, const std::string& content) {
    std::ofstream out(path, std::ios::binary | std::ios::trunc);
    out << content;
    out.close();
    return static_cast<bool>(out);
}

} // namespace

bool chooses_toolchain(const std::vector<std::string>& flags) {
    return std::any_of(flags.begin(), flags.end(), [](const std::string& flag) {
        for (const char* prefix : {"--gcc-toolchain", "--sysroot", "-isysroot", "-target",
                                   "--target", "-B", "-nostdinc", "-stdlib", "--gcc-install-dir"}) {
            if (flag.rfind(prefix, 0) == 0) {
                return true;
            }
        }
        return false;
    });
}

MainFileStandIns::~MainFileStandIns() {
    if (!m_folder.empty()) {
        std::error_code ignored;
        std::filesystem::remove_all(m_folder, ignored);
    }
}

std::optional<std::string> MainFileStandIns::overlay_for(const std::string& main_path) {
    if (m_failed || !plain_path(main_path)) {
        return std::nullopt;
    }
    if (const auto found = m_overlays.find(main_path); found != m_overlays.end()) {
        return found->second;
    }
    if (m_folder.empty()) {
        std::error_code error;
        std::string pattern =
            (std::filesystem::temp_directory_path(error) / "tollgate-main-XXXXXX").string();
        std::vector<char> name(pattern.begin(), pattern.end());
        name.push_back('\0');
        if (!std::filesystem::is_directory("/usr/lib/gcc", error)) {
            spdlog::debug("GCC is not installed under /usr: parsing without preamble reuse");
            m_failed = true;
            return std::nullopt;
        }
        if (error || ::mkdtemp(name.data()) == nullptr || !plain_path(name.data()) ||
            !write_file(std::string(name.data()) + "/empty", "")) {
            spdlog::debug("no folder for main-file stand-ins: parsing without preamble reuse");
            m_failed = true;
            return std::nullopt;
        }
        m_folder = name.data();
    }
    const std::string overlay = m_folder + "/overlay-" + std::to_string(m_overlays.size());
    // "use-external-names": false keeps the main path as the file's name in every location.
    const std::string document =
        "{\"version\": 0, \"use-external-names\": false, \"roots\": [{\"type\": \"file\", "
        "\"name\": \"" +
        main_path + "\", \"external-contents\": \"" + m_folder + "/empty\"}]}\n";
    if (!write_file(overlay, document)) {
        spdlog::debug("cannot write \"{}\": parsing without preamble reuse", overlay);
        return std::nullopt;
    }
    m_overlays.emplace(main_path, overlay);
    return overlay;
}

} // namespace tollgate::lexer
