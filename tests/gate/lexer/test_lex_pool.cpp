// SPDX-License-Identifier: MIT
// lex_jobs through parser processes: the same results as parsing in this process, files that
// stop the parser measured lexically, the pool going on after a crash, and includes confined.
#include "gate/lexer/isolation.hpp"
#include "gate/lexer/lex_files.hpp"
#include "lexer_test_support.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <chrono>
#include <csignal>
#include <filesystem>
#include <fstream>
#include <thread>
#include <unistd.h>

using namespace tollgate;

namespace {

// Set the pool's limits for one test and put the previous ones back afterwards.
class IsolationScope {
public:
    explicit IsolationScope(unsigned cpu_seconds, std::uint64_t memory_mib = 4096)
        : m_saved(lexer::current_isolation()) {
        lexer::IsolationSettings settings = m_saved;
        settings.cpu_seconds = cpu_seconds;
        settings.memory_mib = memory_mib;
        lexer::set_isolation(settings);
    }
    ~IsolationScope() { lexer::set_isolation(m_saved); }
    IsolationScope(const IsolationScope&) = delete;
    IsolationScope& operator=(const IsolationScope&) = delete;

private:
    lexer::IsolationSettings m_saved;
};

std::vector<SourceFile> fixture_files() {
    const std::string folder = std::string(TOLLGATE_FIXTURES_DIR) + "/lexer/";
    std::vector<SourceFile> files;
    for (const std::string name : {"crc16.c", "ring_buffer.hpp", "ring_buffer_stats.cpp",
                                   "unit_converter.cpp", "low_pass_filter.cpp"}) {
        files.push_back({name, test::read_text(folder + name)});
    }
    return files;
}

// 20,000 nested template arguments: libclang exhausts its stack on them.
SourceFile deep_nesting(const std::string& path) {
    std::string text = "int deep() { return ";
    for (int i = 0; i < 20000; ++i) {
        text += "A<";
    }
    text += "int";
    for (int i = 0; i < 20000; ++i) {
        text += ">";
    }
    return {path, text + "::v; }\n"};
}

// An object-like macro that doubles 40 times: 2^40 tokens to expand.
SourceFile macro_bomb(const std::string& path) {
    std::string text = "#define A0 x\n";
    for (int i = 1; i < 40; ++i) {
        text += "#define A" + std::to_string(i) + " A" + std::to_string(i - 1) + " A" +
                std::to_string(i - 1) + "\n";
    }
    return {path, text + "int bomb() { int x = 0; return A39; }\n"};
}

std::vector<std::string> all_text(const lexer::FileFunctions& file) {
    std::vector<std::string> text;
    for (const auto& w : file.warnings) {
        text.push_back(w.message);
    }
    for (const auto& f : file.functions) {
        text.push_back(f.qualified_name);
        for (const auto& t : f.tokens) {
            text.push_back(t.spelling);
        }
    }
    return text;
}

// Return the process ids of this process's parser processes.
std::vector<pid_t> parser_processes() {
    std::vector<pid_t> found;
    for (const auto& entry : std::filesystem::directory_iterator("/proc")) {
        const std::string name = entry.path().filename().string();
        if (name.find_first_not_of("0123456789") != std::string::npos) {
            continue;
        }
        std::ifstream stat(entry.path() / "stat");
        std::string pid, command, state;
        long parent = 0;
        stat >> pid >> command >> state >> parent;
        const std::string cmdline = test::read_text((entry.path() / "cmdline").string());
        if (parent == ::getpid() && state != "Z" &&
            cmdline.find("__lex-worker") != std::string::npos) {
            found.push_back(static_cast<pid_t>(std::stol(pid)));
        }
    }
    return found;
}

// Kill `pid` and wait until it is dead (a zombie waiting for its parent to reap it).
void kill_and_wait(pid_t pid) {
    ::kill(pid, SIGKILL);
    for (int i = 0; i < 500; ++i) {
        std::ifstream stat("/proc/" + std::to_string(pid) + "/stat");
        std::string id, command, state;
        stat >> id >> command >> state;
        if (!stat || state == "Z") {
            return;
        }
        std::this_thread::sleep_for(std::chrono::milliseconds(10));
    }
}

bool mentions(const lexer::FileFunctions& file, const std::string& word) {
    for (const auto& text : all_text(file)) {
        if (text.find(word) != std::string::npos) {
            return true;
        }
    }
    return false;
}

} // namespace

TEST_CASE("lex_jobs in parser processes", "[lexer]") {
    const auto files = fixture_files();
    const auto context = lexer::make_parse_context(files);

    SECTION("gives what the in-process lexer gives, for 1 and 2 processes") {
        std::vector<lexer::FileFunctions> in_process;
        lexer::Lexer lexer;
        for (const auto& file : files) {
            in_process.push_back(lexer.lex_functions(file, context));
        }
        const auto one = lexer::lex_files(files, context, 1);
        const auto two = lexer::lex_files(files, context, 2);
        REQUIRE(one.size() == files.size());
        for (std::size_t i = 0; i < files.size(); ++i) {
            INFO(files[i].path);
            CHECK(one[i].functions == in_process[i].functions);
            CHECK(one[i].parser_stop == lexer::ParserStop::none);
            CHECK(two[i].functions == one[i].functions);
            CHECK(two[i].warnings.size() == one[i].warnings.size());
        }
    }
    SECTION("a file that crashes the parser is measured lexically and later files are parsed") {
        const std::vector<SourceFile> change = {files[2], deep_nesting("deep.cpp"), files[3],
                                                files[4]};
        const auto lexed = lexer::lex_files(change, context, 1);
        REQUIRE(lexed.size() == 4);
        CHECK(lexed[1].parser_stop == lexer::ParserStop::crashed);
        REQUIRE(lexed[1].functions.size() == 1);
        CHECK(lexed[1].functions[0].qualified_name == "deep");
        CHECK(lexed[1].functions[0].mode == lexer::ExtentMode::parser_stopped);
        REQUIRE_FALSE(lexed[1].warnings.empty());
        CHECK(lexed[1].warnings[0].message ==
              "the parser stopped on this file (crashed): measured lexically");
        for (std::size_t i : {std::size_t{0}, std::size_t{2}, std::size_t{3}}) {
            INFO(change[i].path);
            CHECK(lexed[i].parser_stop == lexer::ParserStop::none);
            REQUIRE_FALSE(lexed[i].functions.empty());
            CHECK(lexed[i].functions[0].mode == lexer::ExtentMode::syntax_tree);
        }
    }
    SECTION("a parser process killed between files is replaced and the next file is parsed") {
        std::size_t done = 0;
        std::size_t killed = 0;
        const auto lexed = lexer::lex_files(files, context, 1, [&](const lexer::FileFunctions&) {
            if (++done == 2) {
                for (const pid_t pid : parser_processes()) {
                    kill_and_wait(pid);
                    ++killed;
                }
            }
        });
        CHECK(killed >= 1); // the one at work, and any the pool kept from earlier calls
        for (std::size_t i = 0; i < files.size(); ++i) {
            INFO(files[i].path);
            CHECK(lexed[i].parser_stop == lexer::ParserStop::none);
        }
        CHECK_FALSE(parser_processes().empty());
    }
    SECTION("a file that runs past the processor-time limit is measured lexically") {
        const IsolationScope limits(1);
        const auto lexed = lexer::lex_files({macro_bomb("bomb.cpp"), files[3]}, context, 1);
        CHECK(lexed[0].parser_stop == lexer::ParserStop::timed_out);
        REQUIRE(lexed[0].functions.size() == 1);
        CHECK(lexed[0].functions[0].mode == lexer::ExtentMode::parser_stopped);
        CHECK(lexed[0].warnings[0].message.find("took longer than") != std::string::npos);
        CHECK(lexed[1].parser_stop == lexer::ParserStop::none);
    }
#if !defined(__SANITIZE_ADDRESS__) // sanitized parser processes have no address-space limit
    SECTION("a file that runs out of address space is measured lexically") {
        const IsolationScope limits(60, 600);
        const auto lexed = lexer::lex_files({macro_bomb("bomb.cpp"), files[3]}, context, 1);
        CHECK(lexed[0].parser_stop == lexer::ParserStop::out_of_memory);
        CHECK(lexed[0].warnings[0].message ==
              "the parser stopped on this file (ran out of memory): measured lexically");
        CHECK(lexed[1].parser_stop == lexer::ParserStop::none);
    }
#endif
}

TEST_CASE("lex_jobs confines includes", "[lexer]") {
    test::TempDir outside;
    // A host file with a secret in it: read, it would define a macro the file tests, and its
    // broken line would give parse errors about it.
    outside.write("secret.h", "#define SECRET_READ 1\nint SECRETTOKEN_1 = 1; SECRETTOKEN_2 here\n");
    const std::string secret = outside.path() + "/secret.h";
    std::string dots;
    for (int i = 0; i < 12; ++i) {
        dots += "../";
    }
    const SourceFile file{"src/a.cpp", "#include \"" + secret + "\"\n#include \"" + dots +
                                           secret.substr(1) + "\"\n#define WHERE \"" + secret +
                                           "\"\n#include WHERE\n#ifdef SECRET_READ\n"
                                           "int leaked(int a) { return a; }\n#else\n"
                                           "int confined(int a) { return a; }\n#endif\n"};
    const auto context = lexer::make_parse_context({file});

    SECTION("the input would be read by an unconfined parser") {
        // The in-process lexer opens the host file; this is what the parser processes prevent.
        // Both branches are measured; the one the preprocessor skipped is marked inactive.
        lexer::Lexer lexer;
        const auto lexed = lexer.lex_functions(file, context);
        REQUIRE(lexed.functions.size() == 2);
        CHECK(lexed.functions[0].qualified_name == "leaked");
        CHECK_FALSE(lexed.functions[0].inactive);
        CHECK(lexed.functions[1].inactive);
    }
    SECTION("no byte of a host file reaches the result, and each include is named") {
        const auto lexed = lexer::lex_files({file}, context, 1);
        CHECK_FALSE(mentions(lexed[0], "SECRETTOKEN"));
        REQUIRE(lexed[0].functions.size() == 2);
        CHECK(lexed[0].functions[0].qualified_name == "leaked");
        CHECK(lexed[0].functions[0].inactive);
        CHECK(lexed[0].functions[1].qualified_name == "confined");
        CHECK_FALSE(lexed[0].functions[1].inactive);
        CHECK(lexed[0].functions[1].mode == lexer::ExtentMode::syntax_tree);
        const std::string expected_end =
            "\" not found (only the revision's files, the system include folders and those of a "
            "compile database given with --compile-commands are read)";
        CHECK(lexed[0].warnings.size() == 3);
        for (const auto& w : lexed[0].warnings) {
            CHECK(w.message.rfind("include \"", 0) == 0);
            CHECK(w.message.find(expected_end) != std::string::npos);
        }
    }
    SECTION("devices and FIFOs are never opened") {
        test::TempDir fifo_dir;
        REQUIRE(test::run_command("mkfifo pipe.h", fifo_dir.path()).exit_code == 0);
        const SourceFile devices{"src/b.cpp", "#include \"/dev/zero\"\n#include \"/dev/stdin\"\n"
                                              "#include \"" +
                                                  fifo_dir.path() +
                                                  "/pipe.h\"\nint g() { return 1; }\n"};
        const auto lexed = lexer::lex_files({devices}, lexer::make_parse_context({devices}), 1);
        CHECK(lexed[0].parser_stop == lexer::ParserStop::none);
        CHECK(lexed[0].warnings.size() == 3);
        REQUIRE(lexed[0].functions.size() == 1);
    }
}
