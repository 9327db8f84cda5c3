// SPDX-License-Identifier: MIT
// A small work queue over files: each worker thread owns one Lexer (one CXIndex).
#include "gate/lexer/lex_files.hpp"

#include "gate/common/workers.hpp"
#include "gate/java/java_jobs.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>

namespace tollgate::lexer {

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
    std::vector<FileFunctions> results(files.size());
    const unsigned threads =
        std::min<unsigned>(effective_jobs(jobs), static_cast<unsigned>(files.size()));
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

} // namespace tollgate::lexer
