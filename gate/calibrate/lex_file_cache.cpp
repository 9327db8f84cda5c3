// SPDX-License-Identifier: MIT
// The on-disk lexed-file cache: keys from content and reachable headers, JSON entries, atomic
// writes.
#include "gate/calibrate/lex_file_cache.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/text_safety.hpp"
#include "gate/java/java_front_end.hpp"
#include "gate/lexer/file_functions_json.hpp"

#include <algorithm>
#include <cctype>
#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <map>
#include <nlohmann/json.hpp>
#include <sstream>
#include <thread>
#include <unistd.h>
#include <vector>

namespace tollgate::calibrate {

namespace {

namespace fs = std::filesystem;
using nlohmann::json;

// Version 3: the entry's lexed file is lexer::file_functions_to_json, every text kept losslessly
// with text::store_bytes (source text need not be UTF-8, JSON strings must be), with each
// function's inactive and brace_extent marks.
constexpr const char* k_format = "tollgate.lexcache/3";

// Numbers temporary files; one counter for the process, so that two caches on one folder in one
// process never write the same temporary file.
std::atomic<std::uint64_t> g_temp_serial{0};

__extension__ typedef unsigned __int128 Hash128;

// 128-bit FNV-1a, fed in pieces.
class Fnv128 {
public:
    void feed(const std::string& bytes) {
        for (unsigned char c : bytes) {
            m_state ^= c;
            m_state *= k_prime;
        }
        // A separator so that ("ab","c") and ("a","bc") differ.
        m_state ^= 0xffu;
        m_state *= k_prime;
    }
    std::string hex() const {
        static const char* digits = "0123456789abcdef";
        std::string out(32, '0');
        Hash128 value = m_state;
        for (int i = 31; i >= 0; --i) {
            out[static_cast<std::size_t>(i)] = digits[static_cast<unsigned>(value & 0xfu)];
            value >>= 4;
        }
        return out;
    }

private:
    static constexpr Hash128 k_prime = (static_cast<Hash128>(1) << 88) + 0x13b;
    Hash128 m_state = (static_cast<Hash128>(0x6c62272e07bb0142ULL) << 64) | 0x62b821756295c58dULL;
};

// The names of a file's #include lines; `followable` turns false for an include the scan cannot
// follow (a macro, or a name with "..": then only its last component is kept).
struct IncludeScan {
    std::vector<std::string> names;
    bool followable = true;
};

IncludeScan scan_includes(const std::string& text) {
    IncludeScan scan;
    std::size_t pos = 0;
    while (pos < text.size()) {
        std::size_t end = text.find('\n', pos);
        if (end == std::string::npos) {
            end = text.size();
        }
        std::size_t i = pos;
        auto skip_blank = [&] {
            while (i < end && (text[i] == ' ' || text[i] == '\t')) {
                ++i;
            }
        };
        skip_blank();
        if (i < end && text[i] == '#') {
            ++i;
            skip_blank();
            const bool include = text.compare(i, 7, "include") == 0;
            const bool import = text.compare(i, 6, "import") == 0;
            if (include || import) {
                i += include ? 7 : 6;
                if (text.compare(i, 5, "_next") == 0) {
                    i += 5;
                }
                skip_blank();
                if (i < end && (text[i] == '"' || text[i] == '<')) {
                    const char close = text[i] == '"' ? '"' : '>';
                    const std::size_t stop = text.find(close, i + 1);
                    if (stop != std::string::npos && stop < end) {
                        std::string name = text.substr(i + 1, stop - i - 1);
                        const auto dots = name.rfind("..");
                        if (dots != std::string::npos) {
                            const auto slash = name.find('/', dots);
                            name =
                                slash == std::string::npos ? std::string() : name.substr(slash + 1);
                        }
                        while (name.rfind("./", 0) == 0) {
                            name = name.substr(2);
                        }
                        if (!name.empty()) {
                            scan.names.push_back(name);
                        } else {
                            scan.followable = false;
                        }
                    }
                } else {
                    scan.followable = false; // #include MACRO
                }
            }
        }
        pos = end + 1;
    }
    return scan;
}

bool path_ends_with(const std::string& path, const std::string& name) {
    if (path == name) {
        return true;
    }
    return path.size() > name.size() &&
           path.compare(path.size() - name.size(), name.size(), name) == 0 &&
           path[path.size() - name.size() - 1] == '/';
}

std::string basename_of(const std::string& path) {
    const auto slash = path.rfind('/');
    return slash == std::string::npos ? path : path.substr(slash + 1);
}

} // namespace

std::string content_key(const std::string& bytes) {
    Fnv128 hash;
    hash.feed(bytes);
    return hash.hex();
}

std::string lex_cache_key(const SourceFile& file, const lexer::ParseContext& context) {
    Fnv128 hash;
    hash.feed(k_format);
    hash.feed(core::fingerprint(context.convention));
    if (is_java_path(file.path)) {
        hash.feed(java::java_status()); // the Java convention and grammar versions
    }
    hash.feed(file.path);
    hash.feed(file.content);
    hash.feed(context.force_language ? std::to_string(static_cast<int>(*context.force_language))
                                     : std::string("by-extension"));
    for (const auto& dir : context.include_dirs) {
        hash.feed("I" + dir);
    }
    bool everything = false;
    const auto flags = context.file_flags.find(file.path);
    if (flags != context.file_flags.end()) {
        for (const auto& flag : flags->second) {
            hash.feed("F" + flag);
            everything = everything || flag.rfind("-include", 0) == 0;
        }
    }

    // Headers by basename, then a breadth-first closure over #include names.
    std::multimap<std::string, std::size_t> by_basename;
    for (std::size_t i = 0; i < context.headers.size(); ++i) {
        by_basename.emplace(basename_of(context.headers[i].path), i);
    }
    std::vector<bool> reached(context.headers.size(), false);
    std::vector<const std::string*> pending = {&file.content};
    while (!pending.empty() && !everything) {
        const IncludeScan scan = scan_includes(*pending.back());
        pending.pop_back();
        everything = !scan.followable;
        for (const auto& name : scan.names) {
            const auto range = by_basename.equal_range(basename_of(name));
            for (auto it = range.first; it != range.second; ++it) {
                if (!reached[it->second] &&
                    path_ends_with(context.headers[it->second].path, name)) {
                    reached[it->second] = true;
                    pending.push_back(&context.headers[it->second].content);
                }
            }
        }
    }
    // Headers are kept sorted by path in the context, so the order is stable.
    for (std::size_t i = 0; i < context.headers.size(); ++i) {
        if (everything || reached[i]) {
            hash.feed("H" + context.headers[i].path);
            hash.feed(context.headers[i].content);
        }
    }
    return hash.hex();
}

LexFileCache::LexFileCache(std::string dir) : m_dir(std::move(dir)) {
    std::error_code error;
    fs::create_directories(m_dir, error);
    if (error) {
        std::string reason = error.message();
        if (!reason.empty()) {
            reason[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(reason[0])));
        }
        throw Failure("cannot create cache folder \"" + m_dir + "\": " + reason);
    }
    if (const char* pause = std::getenv("TOLLGATE_TEST_PAUSE_AFTER_CACHE_WRITES")) {
        m_pause_after = std::strtoull(pause, nullptr, 10);
    }
}

std::string LexFileCache::entry_path(const std::string& key) const {
    return (fs::path(m_dir) / key.substr(0, 2) / (key.substr(2) + ".json")).string();
}

std::optional<lexer::FileFunctions> LexFileCache::read_entry(const std::string& key,
                                                             bool& damaged) const {
    damaged = false;
    const std::string path = entry_path(key);
    std::ifstream in(path, std::ios::binary);
    if (!in) {
        return std::nullopt;
    }
    try {
        const json entry = json::parse(in);
        if (entry.at("format").get<std::string>() != k_format ||
            entry.at("key").get<std::string>() != key) {
            throw std::runtime_error("key mismatch");
        }
        lexer::FileFunctions functions = lexer::file_functions_from_json(entry.at("lexed"));
        // The modification time records the last use, for evict(); failing to stamp it is
        // harmless.
        std::error_code stamp_error;
        fs::last_write_time(path, fs::file_time_type::clock::now(), stamp_error);
        return functions;
    } catch (const std::exception&) {
        damaged = true;
        return std::nullopt;
    }
}

lexer::Lookup LexFileCache::lookup(const SourceFile& file, const lexer::ParseContext& context) {
    const std::string blob = content_key(file.content);
    lexer::Lookup result;
    if (m_dir.empty()) {
        // No folder: nothing is claimed or kept, every lookup is a counted miss.
        std::lock_guard<std::mutex> lock(m_mutex);
        ++m_counts.visits;
        ++m_counts.parses;
        if (m_blobs.insert(blob).second) {
            ++m_counts.distinct_blobs;
        }
        result.state = lexer::LookupState::claimed;
        return result;
    }
    const std::string key = lex_cache_key(file, context);
    {
        std::lock_guard<std::mutex> lock(m_mutex);
        ++m_counts.visits;
        if (m_blobs.insert(blob).second) {
            ++m_counts.distinct_blobs;
        }
        if (m_in_flight.count(key) != 0) {
            ++m_waiting[key];
            result.state = lexer::LookupState::pending;
            return result;
        }
        // Claimed before the disk is read, so that no other thread parses it meanwhile.
        m_in_flight.emplace(key, std::this_thread::get_id());
    }
    bool damaged = false;
    result.functions = read_entry(key, damaged);
    if (result.functions) {
        {
            std::lock_guard<std::mutex> lock(m_mutex);
            ++m_counts.hits;
        }
        release(key, &*result.functions);
        result.state = lexer::LookupState::found;
        return result;
    }
    std::lock_guard<std::mutex> lock(m_mutex);
    if (damaged) {
        ++m_counts.damaged;
    }
    ++m_counts.parses;
    result.state = lexer::LookupState::claimed;
    return result;
}

lexer::Lookup LexFileCache::await(const SourceFile& file, const lexer::ParseContext& context) {
    const std::string key = lex_cache_key(file, context);
    lexer::Lookup result;
    std::unique_lock<std::mutex> lock(m_mutex);
    // A safety valve, not a path taken: holders always release (see lex_with_cache).
    m_stored.wait_for(lock, std::chrono::minutes(10),
                      [&] { return m_handoff.count(key) != 0 || m_in_flight.count(key) == 0; });
    const auto handed = m_handoff.find(key);
    auto waiting = m_waiting.find(key);
    const bool last = waiting == m_waiting.end() || --waiting->second == 0;
    if (last && waiting != m_waiting.end()) {
        m_waiting.erase(waiting);
    }
    if (handed != m_handoff.end()) {
        result.functions = last ? std::move(handed->second) : handed->second;
        if (last) {
            m_handoff.erase(handed);
        }
        ++m_counts.hits;
        result.state = lexer::LookupState::found;
        return result;
    }
    // The holder gave up (a failure or a timed-out parse it did not share): this caller parses.
    m_in_flight[key] = std::this_thread::get_id();
    ++m_counts.parses;
    result.state = lexer::LookupState::claimed;
    return result;
}

std::optional<lexer::FileFunctions> LexFileCache::find(const SourceFile& file,
                                                       const lexer::ParseContext& context) {
    lexer::Lookup result = lookup(file, context);
    if (result.state == lexer::LookupState::pending) {
        result = await(file, context);
    }
    return std::move(result.functions);
}

void LexFileCache::release(const std::string& key, const lexer::FileFunctions* functions) {
    {
        std::lock_guard<std::mutex> lock(m_mutex);
        m_in_flight.erase(key);
        const auto waiting = m_waiting.find(key);
        if (functions != nullptr && waiting != m_waiting.end() && waiting->second > 0) {
            m_handoff[key] = *functions;
        }
    }
    m_stored.notify_all();
}

void LexFileCache::store(const SourceFile& file, const lexer::ParseContext& context,
                         const lexer::FileFunctions& functions) {
    if (m_dir.empty()) {
        return;
    }
    const std::string key = lex_cache_key(file, context);
    const fs::path final_path = entry_path(key);
    const json entry = {
        {"format", k_format}, {"key", key}, {"lexed", lexer::file_functions_to_json(functions)}};
    const std::string serialised = text::dump_json(entry, -1);
    const fs::path temp_path = fs::path(m_dir) / ("tmp." + std::to_string(::getpid()) + "." +
                                                  std::to_string(g_temp_serial++) + ".part");
    std::error_code error;
    fs::create_directories(final_path.parent_path(), error);
    bool written = false;
    if (!error) {
        std::ofstream out(temp_path, std::ios::binary | std::ios::trunc);
        out << serialised;
        out.close();
        written = static_cast<bool>(out);
        if (written) {
            fs::rename(temp_path, final_path, error);
            written = !error;
        }
        if (!written) {
            fs::remove(temp_path, error);
        }
    }
    std::uint64_t writes = 0;
    {
        std::lock_guard<std::mutex> lock(m_mutex);
        if (!written) {
            ++m_counts.write_failures;
        } else {
            ++m_writes;
        }
        writes = m_writes;
    }
    release(key, &functions); // waiters get it from memory, written or not
    if (written && m_pause_after != 0 && writes >= m_pause_after) {
        // Test hook: leave a half-written temporary file behind, then wait to be killed.
        std::ofstream half(fs::path(m_dir) / "tmp.paused.part", std::ios::binary);
        half << serialised.substr(0, serialised.size() / 2);
        half.close();
        std::cerr << "tollgate: test hook: paused after " << writes << " cache writes" << std::endl;
        for (;;) {
            std::this_thread::sleep_for(std::chrono::seconds(1));
        }
    }
}

Eviction LexFileCache::evict(const CacheLimits& limits) {
    Eviction result;
    if (m_dir.empty()) {
        return result;
    }
    struct Entry {
        fs::path path;
        std::uint64_t bytes = 0;
        fs::file_time_type used;
    };
    const auto now = fs::file_time_type::clock::now();
    std::vector<Entry> entries;
    std::error_code error;
    for (fs::directory_iterator top(m_dir, error), end; !error && top != end;
         top.increment(error)) {
        const std::string name = top->path().filename().string();
        std::error_code entry_error;
        const bool temporary = name.rfind("tmp.", 0) == 0 && name.size() > 9 &&
                               name.compare(name.size() - 5, 5, ".part") == 0;
        if (temporary) {
            const auto written = top->last_write_time(entry_error);
            if (!entry_error && now - written > std::chrono::hours(1)) {
                fs::remove(top->path(), entry_error);
            }
            continue;
        }
        // Only the two-hex-digit fan-out folders hold entries; anything else is not ours.
        if (name.size() != 2 || !std::isxdigit(static_cast<unsigned char>(name[0])) ||
            !std::isxdigit(static_cast<unsigned char>(name[1])) ||
            !top->is_directory(entry_error)) {
            continue;
        }
        for (fs::directory_iterator it(top->path(), entry_error); !entry_error && it != end;
             it.increment(entry_error)) {
            std::error_code stat_error;
            if (it->path().extension() != ".json" || !it->is_regular_file(stat_error)) {
                continue;
            }
            Entry entry{it->path(), it->file_size(stat_error), it->last_write_time(stat_error)};
            if (!stat_error) {
                entries.push_back(std::move(entry));
            }
        }
    }
    // Oldest use first: entries past the age go, then the least recently used until the rest fit.
    std::sort(entries.begin(), entries.end(),
              [](const Entry& a, const Entry& b) { return a.used < b.used; });
    std::uint64_t total = 0;
    for (const auto& entry : entries) {
        total += entry.bytes;
    }
    const auto max_age = std::chrono::hours(24) * limits.max_age_days;
    for (const auto& entry : entries) {
        const bool too_old = limits.max_age_days != 0 && now - entry.used > max_age;
        const bool too_big = limits.max_bytes != 0 && total > limits.max_bytes;
        if (too_old || too_big) {
            // Gone either way when no error: removed here, or by another process just before.
            std::error_code remove_error;
            fs::remove(entry.path, remove_error);
            if (!remove_error) {
                ++result.removed_entries;
                total -= entry.bytes;
                continue;
            }
        }
        ++result.kept_entries;
    }
    result.kept_bytes = total;
    return result;
}

void LexFileCache::abandon(const SourceFile& file, const lexer::ParseContext& context) {
    release(lex_cache_key(file, context), nullptr);
}

void LexFileCache::share(const SourceFile& file, const lexer::ParseContext& context,
                         const lexer::FileFunctions& functions) {
    release(lex_cache_key(file, context), &functions);
}

CacheCounts LexFileCache::counts() const {
    std::lock_guard<std::mutex> lock(m_mutex);
    return m_counts;
}

std::vector<std::string> LexFileCache::blob_keys() const {
    std::lock_guard<std::mutex> lock(m_mutex);
    return {m_blobs.begin(), m_blobs.end()};
}

} // namespace tollgate::calibrate
