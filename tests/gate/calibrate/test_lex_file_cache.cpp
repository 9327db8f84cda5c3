// SPDX-License-Identifier: MIT
// The lexed-file cache's keys: content digest against the FNV definition, and which headers count;
// entries kept and found, and eviction by age and size.
#include "gate/calibrate/lex_file_cache.hpp"
#include "support/temp_repo.hpp"

#include <atomic>
#include <catch2/catch.hpp>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <thread>
#include <vector>

using tollgate::SourceFile;
using tollgate::calibrate::content_key;
using tollgate::calibrate::lex_cache_key;
using tollgate::calibrate::LexFileCache;

namespace {

tollgate::lexer::ParseContext context_with(std::vector<SourceFile> headers) {
    tollgate::lexer::ParseContext context;
    context.headers = std::move(headers);
    context.include_dirs = {""};
    return context;
}

} // namespace

TEST_CASE("content_key", "[calibrate]") {
    SECTION("it is 128-bit FNV-1a of the bytes followed by one 0xff separator") {
        // Reference: the FNV-1a definition (Fowler, Noll, Vo; IETF draft-eastlake-fnv, section
        // 2: offset basis and prime for 128 bits), computed independently with Python integers.
        const auto py = tollgate::test::run_command(
            "python3 -c \"h = 0x6c62272e07bb014262b821756295c58d\n"
            "for b in b'tollgate' + bytes([255]):\n"
            "    h = ((h ^ b) * 0x0000000001000000000000000000013B) % (1 << 128)\n"
            "print('%032x' % h)\"",
            ".");
        REQUIRE(py.exit_code == 0);
        CHECK(content_key("tollgate") + "\n" == py.out);
    }
    SECTION("different bytes give different keys") {
        CHECK(content_key("int f();") != content_key("int g();"));
        CHECK(content_key("").size() == 32);
    }
}

TEST_CASE("lex_cache_key", "[calibrate]") {
    const SourceFile file{"src/a.cpp", "#include \"a.hpp\"\nint f() { return 1; }\n"};
    const SourceFile a_hpp{"src/a.hpp", "#include \"b.hpp\"\nint f();\n"};
    const SourceFile b_hpp{"include/b.hpp", "int b();\n"};
    const SourceFile other{"src/other.hpp", "int other();\n"};
    const auto key = lex_cache_key(file, context_with({b_hpp, a_hpp, other}));

    SECTION("a header the file does not reach does not change the key") {
        const SourceFile other_edited{"src/other.hpp", "int other(int);\n"};
        CHECK(lex_cache_key(file, context_with({b_hpp, a_hpp, other_edited})) == key);
        CHECK(lex_cache_key(file, context_with({b_hpp, a_hpp})) == key);
    }
    SECTION("a header reached directly or through another header changes it") {
        const SourceFile a_edited{"src/a.hpp", "#include \"b.hpp\"\nint f(int = 0);\n"};
        const SourceFile b_edited{"include/b.hpp", "int b(int);\n"};
        CHECK(lex_cache_key(file, context_with({b_hpp, a_edited, other})) != key);
        CHECK(lex_cache_key(file, context_with({b_edited, a_hpp, other})) != key);
    }
    SECTION("the path, the content and the convention are part of it") {
        CHECK(lex_cache_key({"src/b.cpp", file.content}, context_with({b_hpp, a_hpp, other})) !=
              key);
        CHECK(lex_cache_key({file.path, file.content + "\n"},
                            context_with({b_hpp, a_hpp, other})) != key);
        auto context = context_with({b_hpp, a_hpp, other});
        context.convention.body_only = true;
        CHECK(lex_cache_key(file, context) != key);
    }
    SECTION("an include the scan cannot follow makes every header count") {
        const SourceFile computed{"src/c.cpp", "#include HEADER\nint c() { return 2; }\n"};
        const auto computed_key = lex_cache_key(computed, context_with({b_hpp, a_hpp, other}));
        const SourceFile other_edited{"src/other.hpp", "int other(int);\n"};
        CHECK(lex_cache_key(computed, context_with({b_hpp, a_hpp, other_edited})) != computed_key);
    }
}

TEST_CASE("LexFileCache", "[calibrate]") {
    tollgate::test::TempDir dir;
    LexFileCache cache(dir.path() + "/cache");
    const SourceFile file{"src/a.c", "int f(int x) { return x + 1; }\n"};
    const auto context = context_with({});
    tollgate::lexer::FileFunctions lexed;
    lexed.path = file.path;
    tollgate::lexer::FunctionSpan span;
    span.qualified_name = "f";
    span.fallback_key = "f(int)#0";
    span.path = file.path;
    span.start_line = 1;
    span.end_line = 1;
    span.tokens.push_back({"int", "int", tollgate::core::Role::operator_token, "",
                           tollgate::core::Basis::spelling, 1});
    span.tokens.push_back(
        {"x", "x", tollgate::core::Role::operand_token, "", tollgate::core::Basis::syntax_tree, 1});
    span.token_hash = "abc";
    lexed.functions.push_back(span);
    lexed.warnings.push_back({file.path, 1, "a warning"});

    SECTION("a stored entry comes back equal, from another instance too") {
        CHECK_FALSE(cache.find(file, context));
        cache.store(file, context, lexed);
        LexFileCache again(dir.path() + "/cache");
        const auto found = again.find(file, context);
        REQUIRE(found);
        CHECK(found->functions == lexed.functions);
        CHECK(found->warnings.size() == 1);
        CHECK(found->warnings[0].message == "a warning");
        CHECK(again.counts().hits == 1);
        CHECK(cache.counts().parses == 1);
    }
}

namespace {

// A lexed file of one function whose tokens make an entry of roughly `tokens` * 40 bytes.
tollgate::lexer::FileFunctions lexed_file(const std::string& path, std::size_t tokens) {
    tollgate::lexer::FileFunctions lexed;
    lexed.path = path;
    tollgate::lexer::FunctionSpan span;
    span.qualified_name = "f";
    span.fallback_key = "f()#0";
    span.path = path;
    span.start_line = 1;
    span.end_line = 1;
    for (std::size_t i = 0; i < tokens; ++i) {
        span.tokens.push_back({"x", "x", tollgate::core::Role::operand_token, "",
                               tollgate::core::Basis::syntax_tree, 1});
    }
    lexed.functions.push_back(span);
    return lexed;
}

// Every entry file (DIR/xx/KEY.json) of the cache at `dir`, and their total size.
std::vector<std::filesystem::path> entries_of(const std::string& dir, std::uint64_t* bytes) {
    std::vector<std::filesystem::path> entries;
    *bytes = 0;
    for (const auto& item : std::filesystem::recursive_directory_iterator(dir)) {
        if (item.is_regular_file() && item.path().extension() == ".json") {
            entries.push_back(item.path());
            *bytes += item.file_size();
        }
    }
    return entries;
}

// Set the last use of the entry of `file` to `days` days ago.
void age_entry(const std::string& dir, const SourceFile& file,
               const tollgate::lexer::ParseContext& context, int days) {
    const std::string key = lex_cache_key(file, context);
    const auto path = std::filesystem::path(dir) / key.substr(0, 2) / (key.substr(2) + ".json");
    REQUIRE(std::filesystem::exists(path));
    std::filesystem::last_write_time(path, std::filesystem::file_time_type::clock::now() -
                                               std::chrono::hours(24) * days);
}

} // namespace

TEST_CASE("LexFileCache::evict", "[calibrate]") {
    tollgate::test::TempDir dir;
    const std::string folder = dir.path() + "/cache";
    LexFileCache cache(folder);
    const auto context = context_with({});
    std::vector<SourceFile> files;
    for (int i = 0; i < 6; ++i) {
        files.push_back({"src/f" + std::to_string(i) + ".c", "int f" + std::to_string(i) + ";\n"});
        cache.store(files.back(), context, lexed_file(files.back().path, 50));
    }
    // Last uses: f0 40 days ago, f1 31, f2 20, f3 10, f4 2, f5 now.
    const int ages[] = {40, 31, 20, 10, 2};
    for (int i = 0; i < 5; ++i) {
        age_entry(folder, files[static_cast<std::size_t>(i)], context, ages[i]);
    }
    std::uint64_t total = 0;
    REQUIRE(entries_of(folder, &total).size() == 6);

    SECTION("entries unused for longer than the age go, the rest stay and are found") {
        const auto evicted = cache.evict({0, 30});
        CHECK(evicted.removed_entries == 2);
        CHECK(evicted.kept_entries == 4);
        LexFileCache again(folder);
        CHECK_FALSE(again.find(files[0], context));
        CHECK_FALSE(again.find(files[1], context));
        for (std::size_t i = 2; i < 6; ++i) {
            CHECK(again.find(files[i], context));
        }
    }
    SECTION("over the size, the least recently used go until the rest fit") {
        const std::uint64_t one = total / 6;
        const auto evicted = cache.evict({one * 2 + one / 2, 0});
        CHECK(evicted.removed_entries == 4);
        CHECK(evicted.kept_entries == 2);
        std::uint64_t kept = 0;
        CHECK(entries_of(folder, &kept).size() == 2);
        CHECK(kept == evicted.kept_bytes);
        CHECK(kept <= one * 2 + one / 2);
        LexFileCache again(folder);
        CHECK(again.find(files[4], context));
        CHECK(again.find(files[5], context));
    }
    SECTION("a hit counts as a use") {
        LexFileCache reader(folder);
        REQUIRE(reader.find(files[0], context)); // f0 was the oldest; now the newest
        const auto evicted = cache.evict({0, 30});
        CHECK(evicted.removed_entries == 1);
        CHECK(LexFileCache(folder).find(files[0], context));
        CHECK_FALSE(LexFileCache(folder).find(files[1], context));
    }
    SECTION("no limits remove nothing; a folder of other files is left alone") {
        std::ofstream(folder + "/notes.txt") << "mine\n";
        std::filesystem::create_directories(folder + "/zz-not-ours");
        std::ofstream(folder + "/zz-not-ours/x.json") << "{}";
        const auto evicted = cache.evict({0, 0});
        CHECK(evicted.removed_entries == 0);
        CHECK(evicted.kept_entries == 6);
        const auto tiny = cache.evict({1, 1});
        CHECK(tiny.kept_entries == 0);
        CHECK(std::filesystem::exists(folder + "/notes.txt"));
        CHECK(std::filesystem::exists(folder + "/zz-not-ours/x.json"));
    }
    SECTION("stale temporary files go, fresh ones (a writer at work) stay") {
        const std::string stale = folder + "/tmp.999999.0.part";
        const std::string fresh = folder + "/tmp.999999.1.part";
        std::ofstream(stale) << "half";
        std::ofstream(fresh) << "half";
        std::filesystem::last_write_time(stale, std::filesystem::file_time_type::clock::now() -
                                                    std::chrono::hours(2));
        cache.evict({0, 0});
        CHECK_FALSE(std::filesystem::exists(stale));
        CHECK(std::filesystem::exists(fresh));
    }
    SECTION("evicting while other threads store and find leaves whole entries only") {
        std::atomic<bool> stop{false};
        std::vector<std::thread> workers;
        for (int t = 0; t < 3; ++t) {
            workers.emplace_back([&, t] {
                LexFileCache own(folder);
                for (int n = 0; !stop.load(); ++n) {
                    const SourceFile file{"w" + std::to_string(t) + "/" + std::to_string(n % 20) +
                                              ".c",
                                          "int g" + std::to_string(n % 20) + ";\n"};
                    if (!own.find(file, context)) {
                        own.store(file, context, lexed_file(file.path, 30));
                    }
                }
            });
        }
        for (int round = 0; round < 50; ++round) {
            cache.evict({total / 3, 30});
        }
        stop.store(true);
        for (auto& worker : workers) {
            worker.join();
        }
        // Every entry left parses as a whole entry: none is damaged.
        LexFileCache reader(folder);
        std::uint64_t bytes = 0;
        std::size_t found = 0;
        for (int t = 0; t < 3; ++t) {
            for (int n = 0; n < 20; ++n) {
                const SourceFile file{"w" + std::to_string(t) + "/" + std::to_string(n) + ".c",
                                      "int g" + std::to_string(n) + ";\n"};
                found += reader.find(file, context) ? 1 : 0;
            }
        }
        CHECK(reader.counts().damaged == 0);
        CHECK(found == reader.counts().hits);
        CHECK(entries_of(folder, &bytes).size() >= found);
    }
}

TEST_CASE("LexFileCache without a folder", "[calibrate]") {
    LexFileCache cache;
    const SourceFile file{"a.c", "int a;\n"};
    const auto context = context_with({});
    cache.store(file, context, lexed_file(file.path, 3));
    CHECK_FALSE(cache.find(file, context));
    CHECK_FALSE(cache.find(file, context));
    CHECK(cache.counts().visits == 2);
    CHECK(cache.counts().parses == 2);
    CHECK(cache.counts().hits == 0);
    CHECK(cache.counts().distinct_blobs == 1);
    CHECK(cache.evict({1, 1}).removed_entries == 0);
}

TEST_CASE("LexFileCache keeps text that is not UTF-8 byte for byte", "[calibrate]") {
    tollgate::test::TempDir dir;
    LexFileCache cache(dir.path() + "/cache");
    const auto context = context_with({});
    // A Latin-1 file whose string literals differ only in a Latin-1 byte: replacing either
    // with U+FFFD would merge two distinct operands and change n2.
    const SourceFile latin1{"src/caf\xE9.c", "char* s() { return \"\xE9\" \"\xE8\"; }\n"};
    tollgate::lexer::FileFunctions bytes;
    bytes.path = latin1.path;
    tollgate::lexer::FunctionSpan span;
    span.path = latin1.path;
    span.usr = "c:caf\xE9.c@F@s";
    span.qualified_name = "s\x1b[2J";
    span.fallback_key = "s\x1b[2J()#0";
    span.start_line = 1;
    span.end_line = 1;
    span.token_hash = "abc";
    span.tokens = {
        {"\"\xE9\"", "\"\xE9\"", tollgate::core::Role::operand_token, "",
         tollgate::core::Basis::spelling, 1},
        {"\"\xE8\"", "\"\xE8\"", tollgate::core::Role::operand_token, "",
         tollgate::core::Basis::spelling, 1},
        {"%d", "%d", tollgate::core::Role::operand_token, "", tollgate::core::Basis::spelling, 1}};
    bytes.functions.push_back(span);
    bytes.warnings = {{latin1.path, 1, "caf\xE9 \xFF"}};
    // Before: nlohmann's dump threw type_error 316 in store() and ended the run.
    REQUIRE_NOTHROW(cache.store(latin1, context, bytes));
    CHECK(cache.counts().write_failures == 0);
    LexFileCache again(dir.path() + "/cache");
    const auto found = again.find(latin1, context);
    REQUIRE(found);
    CHECK(found->path == latin1.path);
    CHECK(found->functions == bytes.functions);
    REQUIRE(found->warnings.size() == 1);
    CHECK(found->warnings[0].path == latin1.path);
    CHECK(found->warnings[0].message == "caf\xE9 \xFF");
    CHECK(again.counts().damaged == 0);
}
