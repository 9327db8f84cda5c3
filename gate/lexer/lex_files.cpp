// SPDX-License-Identifier: MIT
// Lex many files: in parser processes (the default), or on threads of this process that each own
// one Lexer (one CXIndex) when isolation is switched off.
#include "gate/lexer/lex_files.hpp"

#include "gate/common/workers.hpp"
#include "gate/java/java_jobs.hpp"
#include "gate/lexer/isolation.hpp"
#include "gate/lexer/lex_pool.hpp"

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <exception>
#include <mutex>
#include <spdlog/spdlog.h>
#include <thread>

namespace tollgate::lexer {

namespace {

struct SharedSettings {
    std::mutex mutex;
    IsolationSettings settings;
};

SharedSettings& shared_settings() {
    static SharedSettings shared;
    return shared;
}

// The unsafe path: libclang in this process, no limits, no confinement.
std::vector<FileFunctions>
lex_in_process(const std::vector<LexJob>& files, unsigned threads,
               const std::function<void(const FileFunctions&)>& on_done) {
    std::vector<FileFunctions> results(files.size());
    std::atomic<std::size_t> next{0};
    std::mutex done_mutex;
    std::exception_ptr first_error;

    auto work = [&] {
        try {
            Lexer lexer;
            for (std::size_t i = next++; i < files.size(); i = next++) {
                results[i] = lexer.lex_functions(*files[i].file, *files[i].context);
                if (on_done) {
                    std::lock_guard<std::mutex> lock(done_mutex);
                    on_done(results[i]);
                }
            }
        } catch (...) {
            std::lock_guard<std::mutex> lock(done_mutex);
            if (!first_error) {
                first_error = std::current_exception();
            }
            next = files.size(); // stop the other workers early
        }
    };

    run_workers(threads, work);
    if (first_error) {
        std::rethrow_exception(first_error);
    }
    return results;
}

} // namespace

void set_isolation(const IsolationSettings& settings) {
    SharedSettings& shared = shared_settings();
    std::lock_guard<std::mutex> lock(shared.mutex);
    shared.settings = settings;
}

IsolationSettings current_isolation() {
    IsolationSettings settings;
    {
        SharedSettings& shared = shared_settings();
        std::lock_guard<std::mutex> lock(shared.mutex);
        settings = shared.settings;
    }
    if (const char* unsafe = std::getenv("TOLLGATE_UNSAFE_PARSE_IN_PROCESS");
        unsafe != nullptr && std::string(unsafe) == "1") {
        settings.in_process = true;
    }
    return settings;
}

unsigned effective_jobs(unsigned jobs) {
    if (jobs == 0) {
        jobs = std::thread::hardware_concurrency();
    }
    return std::max(1u, jobs);
}

std::vector<FileFunctions> lex_files(const std::vector<SourceFile>& files,
                                     const ParseContext& context, unsigned jobs,
                                     const std::function<void(const FileFunctions&)>& on_done) {
    std::vector<LexJob> list;
    list.reserve(files.size());
    for (const auto& file : files) {
        list.push_back({&file, &context});
    }
    return lex_jobs(list, jobs, on_done);
}

std::vector<FileFunctions> lex_jobs(const std::vector<LexJob>& files, unsigned jobs,
                                    const std::function<void(const FileFunctions&)>& on_done) {
    if (java::has_java_jobs(files)) { // the Java front end takes .java files (gate/java)
        return java::lex_mixed_jobs(files, jobs, on_done, &lex_jobs);
    }
    const unsigned threads =
        std::min<unsigned>(effective_jobs(jobs), static_cast<unsigned>(files.size()));
    IsolationSettings settings = current_isolation();
    settings.show_worker_errors = settings.show_worker_errors ||
                                  spdlog::default_logger_raw()->should_log(spdlog::level::debug);
    if (settings.in_process) {
        return lex_in_process(files, threads, on_done);
    }
    return lex_in_workers(files, threads, settings, on_done);
}

} // namespace tollgate::lexer
