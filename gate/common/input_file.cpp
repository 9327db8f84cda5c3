// SPDX-License-Identifier: MIT
// Reading a file the user named, with a precise error.
#include "gate/common/input_file.hpp"

#include "gate/common/errors.hpp"

#include <cctype>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace tollgate {

std::string read_named_file(const std::string& what, const std::string& path,
                            const std::string& remedy) {
    const std::string subject = "cannot read " + what + " \"" + path + "\": ";
    const std::string tail = remedy.empty() ? std::string() : " (" + remedy + ")";
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec)) {
        throw UsageError(subject + "it is a folder" + tail);
    }
    errno = 0;
    std::ifstream in(path, std::ios::binary);
    std::ostringstream buffer;
    if (in) {
        buffer << in.rdbuf();
    }
    if (!in || in.bad()) {
        std::string reason = errno != 0 ? std::strerror(errno) : "it cannot be opened";
        reason[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(reason[0])));
        throw UsageError(subject + reason + tail);
    }
    return buffer.str();
}

} // namespace tollgate
