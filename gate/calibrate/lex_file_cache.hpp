// SPDX-License-Identifier: MIT
// A lexed-file cache kept on disk, one file per entry, shared by calibrate's worker threads.
#pragma once

#include "gate/lexer/lex_cache.hpp"

#include <atomic>
#include <condition_variable>
#include <cstdint>
#include <map>
#include <mutex>
#include <set>
#include <string>
#include <thread>
#include <vector>

namespace tollgate::calibrate {

// Return the 128-bit FNV-1a digest of `bytes` as 32 lowercase hex digits (offset basis
// 0x6c62272e07bb014262b821756295c58d, prime 2^88 + 0x13b). Never fails.
std::string content_key(const std::string& bytes);

// Return the key under which the lexed form of `file` is kept: a digest of the cache format
// version, the convention fingerprint, the file's path and content, its flags, the include folders
// and every header of `context` the file can reach through #include lines (found lexically and
// over-approximated: a name matches every header whose path ends with it; an include the scan
// cannot follow, such as `#include MACRO` or a forced `-include`, makes every header count).
std::string lex_cache_key(const SourceFile& file, const lexer::ParseContext& context);

// How the cache was used in one run.
struct CacheCounts {
    std::uint64_t visits = 0;         // lookups (one per file side measured)
    std::uint64_t hits = 0;           // lookups answered from disk
    std::uint64_t parses = 0;         // lookups that had to parse (misses)
    std::uint64_t damaged = 0;        // entries found unreadable, ignored and rewritten
    std::uint64_t write_failures = 0; // entries that could not be written
    std::uint64_t distinct_blobs = 0; // distinct file contents visited

    bool operator==(const CacheCounts& other) const {
        return visits == other.visits && hits == other.hits && parses == other.parses &&
               damaged == other.damaged && write_failures == other.write_failures &&
               distinct_blobs == other.distinct_blobs;
    }
};

// The default bound on a cache folder's size: 512 MiB holds about 15,000 entries of 34 KB, the
// mean measured on Tollgate's own history (see DEVELOPERS.md), over a thousand commits.
inline constexpr std::uint64_t k_default_cache_bytes = std::uint64_t{512} << 20;

// The default bound on an entry's age since it was last used: 30 days, so a history replayed
// monthly keeps its cache.
inline constexpr unsigned k_default_cache_days = 30;

// How far evict() trims a cache folder.
struct CacheLimits {
    std::uint64_t max_bytes = k_default_cache_bytes; // total size of the entries; 0: no bound
    unsigned max_age_days = k_default_cache_days;    // days since an entry was last used; 0: no
                                                     // bound
};

// What evict() did.
struct Eviction {
    std::uint64_t removed_entries = 0; // entries removed, for age or for size
    std::uint64_t kept_entries = 0;    // entries left
    std::uint64_t kept_bytes = 0;      // their total size
};

// A LexCache in a folder: each entry is `DIR/xx/<key>.json` (format "tollgate.lexcache/3", every
// text kept losslessly with text::store_bytes, so a file of any bytes reads back the same),
// written to a temporary file and renamed into place, so a killed run leaves whole entries or
// none, and processes may share the folder: entries appear by rename and vanish by unlink, so a
// reader sees a whole entry or none, and a removed entry is only parsed again. Entries that do not
// parse or whose recorded key differs are ignored and rewritten. A hit stamps the entry's
// modification time, which evict() reads as its last use.
// Thread-safe, and each key is parsed at most once per instance: the first lookup of a key
// claims it (even while it reads the disk); a later lookup of a claimed key answers pending
// instead of parsing it again, and await hands it the holder's result (kept in memory only until
// every waiter has it).
class LexFileCache : public lexer::LexCache {
public:
    // Use folder `dir` (created when missing). Throws Failure `cannot create cache folder "DIR":
    // REASON` when it cannot be created.
    explicit LexFileCache(std::string dir);

    // Use no folder: every lookup is a counted miss and nothing is kept (calibrate's fallback
    // when its folder cannot be created).
    LexFileCache() = default;

    // Remove entries unused for longer than `limits.max_age_days`, then the least recently used
    // until the rest fit in `limits.max_bytes`, and temporary files older than an hour (a writer
    // renames its own within milliseconds). Safe while other processes use the folder. Never
    // throws: what cannot be removed is left. Does nothing without a folder.
    Eviction evict(const CacheLimits& limits);

    // Return the entry of `file` under `context`'s key, or nothing when there is none or it is
    // damaged (counted, and rewritten by the next store).
    std::optional<lexer::FileFunctions> find(const SourceFile& file,
                                             const lexer::ParseContext& context) override;
    // Write `functions` under the key of `file` and `context`, atomically; a failed write is
    // counted, not thrown.
    void store(const SourceFile& file, const lexer::ParseContext& context,
               const lexer::FileFunctions& functions) override;
    // Release the key of `file` and `context` without writing an entry.
    void abandon(const SourceFile& file, const lexer::ParseContext& context) override;
    // Return the entry, or claim the key, or say another thread holds it (never waits).
    lexer::Lookup lookup(const SourceFile& file, const lexer::ParseContext& context) override;
    // Wait for a key another thread holds: its result, or the claim when it gave up.
    lexer::Lookup await(const SourceFile& file, const lexer::ParseContext& context) override;
    // Hand `functions` to the waiters of the key and release it without writing an entry.
    void share(const SourceFile& file, const lexer::ParseContext& context,
               const lexer::FileFunctions& functions) override;

    // Return the counts so far.
    CacheCounts counts() const;
    // Return the content keys (content_key) of the distinct file contents visited so far, sorted.
    std::vector<std::string> blob_keys() const;
    // Return the folder.
    const std::string& dir() const { return m_dir; }

private:
    std::string entry_path(const std::string& key) const;
    std::optional<lexer::FileFunctions> read_entry(const std::string& key, bool& damaged) const;
    // Release `key`, handing `functions` (when not null) to its waiters; then wake them.
    void release(const std::string& key, const lexer::FileFunctions* functions);

    std::string m_dir;
    mutable std::mutex m_mutex;
    std::condition_variable m_stored;                      // signalled after each store
    std::map<std::string, std::thread::id> m_in_flight;    // keys claimed (read or parsed), by whom
    std::map<std::string, std::size_t> m_waiting;          // keys awaited, by how many threads
    std::map<std::string, lexer::FileFunctions> m_handoff; // results for those waiters
    CacheCounts m_counts;
    std::set<std::string> m_blobs;
    std::uint64_t m_writes = 0;      // entries written this run
    std::uint64_t m_pause_after = 0; // test hook: stop after this many writes (0: never)
};

} // namespace tollgate::calibrate
