// SPDX-License-Identifier: MIT
// A rename similarity metric for libgit2 that follows git's own estimate, so renames match git's.
#include "gate/walker/rename_similarity.hpp"

#include "gate/common/disk_file.hpp"

#include <algorithm>
#include <fstream>
#include <functional>
#include <new>
#include <sstream>
#include <string>
#include <unordered_map>

namespace tollgate::walker {

namespace {

// The chunk counts of one file: chunk hash -> bytes in chunks with that hash, and the size.
struct ChunkSignature {
    std::unordered_map<std::size_t, std::size_t> bytes_by_chunk;
    std::size_t size = 0; // the file's size in bytes, CRs included (git compares blob sizes)
};

// libgit2's default metric scores short, partly shared files much higher than git does (a file
// sharing 6 of 15 lines scored as a rename at 50%), so the change set would disagree with the git
// diff users see. This follows git's estimate instead (diffcore-delta.c, from memory).
ChunkSignature sign(std::string_view text) {
    ChunkSignature signature;
    signature.size = text.size();
    std::string chunk;
    const auto flush = [&]() {
        if (!chunk.empty()) {
            signature.bytes_by_chunk[std::hash<std::string>{}(chunk)] += chunk.size();
            chunk.clear();
        }
    };
    for (std::size_t i = 0; i < text.size(); ++i) {
        const char c = text[i];
        if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n') {
            continue;
        }
        chunk += c;
        if (c == '\n' || chunk.size() >= 64) {
            flush();
        }
    }
    flush();
    return signature;
}

unsigned score(const ChunkSignature& base, const ChunkSignature& head, unsigned threshold) {
    const std::size_t larger = std::max(base.size, head.size);
    const std::size_t smaller = std::min(base.size, head.size);
    if (larger == 0 || larger * (100 - std::min(threshold, 100U)) < (larger - smaller) * 100) {
        return 0;
    }
    std::size_t copied = 0;
    for (const auto& item : base.bytes_by_chunk) {
        const auto found = head.bytes_by_chunk.find(item.first);
        if (found != head.bytes_by_chunk.end()) {
            copied += std::min(item.second, found->second);
        }
    }
    return static_cast<unsigned>(copied * 100 / larger);
}

int sign_file(void** out, const git_diff_file*, const char* fullpath, void*) {
    try {
        // A working-tree file: read only when it is a regular file (never a FIFO or symlink).
        const DiskFile file = read_regular_file(fullpath);
        if (file.entry != DiskEntry::regular) {
            *out = nullptr;
            return 0; // unreadable: no signature, so no rename
        }
        *out = new ChunkSignature(sign(file.content));
        return 0;
    } catch (...) {
        return -1;
    }
}

int sign_buffer(void** out, const git_diff_file*, const char* buffer, std::size_t length, void*) {
    try {
        *out = new ChunkSignature(sign(std::string_view(buffer, length)));
        return 0;
    } catch (...) {
        return -1;
    }
}

void free_signature(void* signature, void*) {
    delete static_cast<ChunkSignature*>(signature);
}

int compare(int* result, void* base, void* head, void* payload) {
    if (base == nullptr || head == nullptr) {
        *result = 0;
        return 0;
    }
    const unsigned threshold = *static_cast<const unsigned*>(payload);
    *result = static_cast<int>(score(*static_cast<const ChunkSignature*>(base),
                                     *static_cast<const ChunkSignature*>(head), threshold));
    return 0;
}

} // namespace

unsigned estimate_similarity(std::string_view base, std::string_view head, unsigned threshold) {
    return score(sign(base), sign(head), threshold);
}

git_diff_similarity_metric make_similarity_metric(const unsigned* threshold) {
    git_diff_similarity_metric metric{};
    metric.file_signature = sign_file;
    metric.buffer_signature = sign_buffer;
    metric.free_signature = free_signature;
    metric.similarity = compare;
    metric.payload = const_cast<unsigned*>(threshold);
    return metric;
}

} // namespace tollgate::walker
