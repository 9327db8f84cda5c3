// SPDX-License-Identifier: MIT
// The dispatch by extension: .java files go to the Java front end, the rest to the C/C++ one.
// The Java front end runs in this process: tree-sitter parses without recursion, each file is
// bounded in size and time, and a file it must not take is measured lexically instead.
#include "gate/java/java_jobs.hpp"

#include "gate/common/workers.hpp"
#include "gate/java/java_front_end.hpp"

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>

namespace tollgate::java {

bool has_java_jobs(const std::vector<lexer::LexJob>& jobs_list) {
    return std::any_of(jobs_list.begin(), jobs_list.end(), [](const lexer::LexJob& job) {
        return job.file != nullptr && is_java_path(job.file->path);
    });
}

std::vector<lexer::FileFunctions>
lex_mixed_jobs(const std::vector<lexer::LexJob>& jobs_list, unsigned jobs,
               const std::function<void(const lexer::FileFunctions&)>& on_done,
               CFamilyLexing c_family) {
    std::vector<lexer::FileFunctions> results(jobs_list.size());
    std::vector<std::size_t> java_index;
    std::vector<std::size_t> other_index;
    std::vector<lexer::LexJob> others;
    for (std::size_t i = 0; i < jobs_list.size(); ++i) {
        if (jobs_list[i].file != nullptr && is_java_path(jobs_list[i].file->path)) {
            java_index.push_back(i);
        } else {
            other_index.push_back(i);
            others.push_back(jobs_list[i]);
        }
    }
    std::mutex done_mutex;
    auto report = [&](const lexer::FileFunctions& done) {
        if (on_done) {
            std::lock_guard<std::mutex> lock(done_mutex);
            on_done(done);
        }
    };

    std::atomic<std::size_t> next{0};
    std::exception_ptr first_error;
    auto work = [&] {
        try {
            for (std::size_t k = next++; k < java_index.size(); k = next++) {
                const lexer::LexJob& job = jobs_list[java_index[k]];
                results[java_index[k]] = lex_java_file(*job.file, job.context->convention);
                report(results[java_index[k]]);
            }
        } catch (...) {
            std::lock_guard<std::mutex> lock(done_mutex);
            if (!first_error) {
                first_error = std::current_exception();
            }
            next = java_index.size();
        }
    };
    const unsigned threads =
        std::min<unsigned>(lexer::effective_jobs(jobs), static_cast<unsigned>(java_index.size()));
    run_workers(threads, work);
    if (first_error) {
        std::rethrow_exception(first_error);
    }

    if (!others.empty()) {
        std::vector<lexer::FileFunctions> lexed = c_family(others, jobs, report);
        for (std::size_t k = 0; k < lexed.size() && k < other_index.size(); ++k) {
            results[other_index[k]] = std::move(lexed[k]);
        }
    }
    return results;
}

} // namespace tollgate::java
