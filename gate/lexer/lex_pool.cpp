// SPDX-License-Identifier: MIT
// The pool of parser processes: start, feed contexts and jobs, enforce the wall-clock limit,
// read the end of a dead worker, fall back to the lexical scanner, replace the worker.
#include "gate/lexer/lex_pool.hpp"

#include "gate/common/errors.hpp"
#include "gate/common/workers.hpp"
#include "gate/isolate/worker_process.hpp"
#include "gate/lexer/lex_messages.hpp"
#include "gate/lexer/lex_worker.hpp"
#include "gate/lexer/lexical_fallback.hpp"

#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <cstdlib>
#include <deque>
#include <exception>
#include <filesystem>
#include <map>
#include <memory>
#include <mutex>
#include <spdlog/spdlog.h>

namespace tollgate::lexer {

namespace {

using isolate::WorkerEnd;
using isolate::WorkerProcess;

// Contexts a worker keeps at once (base and head of a change, with room to spare).
constexpr std::size_t k_contexts_per_worker = 4;

// How long a new worker may take to report that it is ready.
constexpr auto k_start_timeout = std::chrono::seconds(60);

// One parser process and the contexts it holds.
struct Worker {
    std::unique_ptr<WorkerProcess> process; // null until started, and after it died
    std::deque<std::uint64_t> contexts;     // ids it holds, oldest first
    std::string launch_key;                 // the settings it was started with
    std::deque<std::string> recent;         // paths it parsed last, newest first (it may hold
                                            // their translation units for reuse)
};

// Return how many of `paths` `worker` parsed recently.
std::size_t affinity(const Worker& worker, const std::vector<std::string>& paths) {
    std::size_t count = 0;
    for (const std::string& path : paths) {
        count +=
            static_cast<std::size_t>(std::count(worker.recent.begin(), worker.recent.end(), path));
    }
    return count;
}

// Workers between calls: kept so a later call (calibrate lexes per commit) starts none.
class Pool {
public:
    // Take an idle worker started with `launch_key`, preferring the one that parsed most of
    // `paths` lately (the same path goes to the same worker, which may reuse its preamble).
    std::unique_ptr<Worker> take(const std::string& launch_key,
                                 const std::vector<std::string>& paths) {
        std::lock_guard<std::mutex> lock(m_mutex);
        std::size_t best = m_idle.size();
        std::size_t best_count = 0;
        for (std::size_t i = 0; i < m_idle.size(); ++i) {
            const std::size_t count =
                m_idle[i]->launch_key == launch_key ? affinity(*m_idle[i], paths) : 0;
            if (count > best_count) {
                best = i;
                best_count = count;
            }
        }
        if (best < m_idle.size()) {
            std::unique_ptr<Worker> worker = std::move(m_idle[best]);
            m_idle.erase(m_idle.begin() + static_cast<std::ptrdiff_t>(best));
            return worker;
        }
        while (!m_idle.empty()) {
            std::unique_ptr<Worker> worker = std::move(m_idle.back());
            m_idle.pop_back();
            if (worker->launch_key == launch_key) {
                return worker;
            }
        }
        auto worker = std::make_unique<Worker>();
        worker->launch_key = launch_key;
        return worker;
    }

    void give(std::unique_ptr<Worker> worker) {
        std::lock_guard<std::mutex> lock(m_mutex);
        m_idle.push_back(std::move(worker));
    }

    // Return the home (0 .. homes-1) of `path` among the processes started with `launch_key`:
    // fixed on first sight, the home with the fewest paths then (ties: the lowest), so that each
    // path's preamble lives in one process only.
    std::size_t home_of(const std::string& launch_key, const std::string& path, unsigned homes) {
        std::lock_guard<std::mutex> lock(m_mutex);
        Homes& set = homes_of(launch_key, homes);
        const auto found = set.home_of.find(path);
        if (found != set.home_of.end()) {
            return found->second;
        }
        const auto fewest = std::min_element(set.paths.begin(), set.paths.end());
        const auto home = static_cast<std::size_t>(fewest - set.paths.begin());
        ++*fewest;
        set.home_of.emplace(path, home);
        return home;
    }

    // Take the worker of `home`, waiting while another call has it.
    std::unique_ptr<Worker> take_home(const std::string& launch_key, std::size_t home) {
        std::unique_lock<std::mutex> lock(m_mutex);
        Homes& set = m_homes.at(launch_key);
        m_home_free.wait(lock, [&] { return set.workers[home] != nullptr; });
        return std::move(set.workers[home]);
    }

    void give_home(const std::string& launch_key, std::size_t home,
                   std::unique_ptr<Worker> worker) {
        {
            std::lock_guard<std::mutex> lock(m_mutex);
            m_homes.at(launch_key).workers[home] = std::move(worker);
        }
        m_home_free.notify_all();
    }

private:
    struct Homes {
        std::vector<std::unique_ptr<Worker>> workers; // null while a call has it
        std::vector<std::size_t> paths;               // paths at home in each
        std::map<std::string, std::size_t> home_of;
    };

    Homes& homes_of(const std::string& launch_key, unsigned homes) {
        Homes& set = m_homes[launch_key];
        while (set.workers.size() < homes) {
            set.workers.push_back(std::make_unique<Worker>());
            set.workers.back()->launch_key = launch_key;
            set.paths.push_back(0);
        }
        return set;
    }

    std::mutex m_mutex;
    std::vector<std::unique_ptr<Worker>> m_idle;
    std::map<std::string, Homes> m_homes; // by launch key
    std::condition_variable m_home_free;
};

// Gives a home's worker back however the job ends.
class HomeLoan {
public:
    HomeLoan(Pool& pool, const std::string& launch_key, std::size_t home)
        : m_pool(pool), m_launch_key(launch_key), m_home(home),
          m_worker(pool.take_home(launch_key, home)) {}
    ~HomeLoan() { m_pool.give_home(m_launch_key, m_home, std::move(m_worker)); }
    HomeLoan(const HomeLoan&) = delete;
    HomeLoan& operator=(const HomeLoan&) = delete;

    Worker& worker() { return *m_worker; }

private:
    Pool& m_pool;
    const std::string& m_launch_key;
    std::size_t m_home;
    std::unique_ptr<Worker> m_worker;
};

Pool& pool() {
    static Pool instance;
    return instance;
}

std::atomic<std::uint64_t> g_next_context_id{1};

// One context of a call, encoded once for every worker that needs it.
struct SharedContext {
    std::uint64_t id = 0;
    const ParseContext* context = nullptr;
    std::once_flag encoded_once;
    std::string encoded;

    const std::string& message(const std::vector<std::uint64_t>& drop) {
        std::call_once(encoded_once, [this] {
            if (!context->cache_dir.empty()) {
                // The parser may write only inside the cache folder, not make it.
                std::error_code ignored;
                std::filesystem::create_directories(context->cache_dir, ignored);
            }
            encoded = encode_context(id, {}, *context);
        });
        if (drop.empty()) {
            return encoded;
        }
        thread_local std::string with_drop;
        with_drop = encode_context(id, drop, *context);
        return with_drop;
    }
};

isolate::WorkerLaunch launch_of(const IsolationSettings& settings) {
    isolate::WorkerLaunch launch;
    launch.program = settings.worker_program.empty() ? "/proc/self/exe" : settings.worker_program;
    launch.arguments = {k_worker_command, "--memory-mib", std::to_string(settings.memory_mib),
                        "--preamble-units", std::to_string(settings.preamble_units)};
    if (settings.shared_headers) {
        launch.arguments.push_back("--shared-headers");
    }
    if (settings.show_worker_errors) {
        launch.arguments.push_back("--verbose");
    }
    // A clean environment: no include paths from variables, crashes end the process.
    launch.environment = {"LIBCLANG_DISABLE_CRASH_RECOVERY=1"};
    if (settings.preamble_units > 0 || settings.shared_headers) {
        // libclang keeps each precompiled preamble in a temporary file, and shared headers are
        // precompiled: give the parser a private folder (0700, made once per run, shared by the
        // run's parser processes) where it may write them, and nothing else.
        // Removed with whatever is left in it when the program ends.
        struct PrivateFolder {
            std::string path;
            PrivateFolder() {
                std::string pattern =
                    (std::filesystem::temp_directory_path() / "tollgate-preambles-XXXXXX").string();
                if (::mkdtemp(pattern.data()) != nullptr) {
                    path = pattern;
                }
            }
            ~PrivateFolder() {
                std::error_code ignored;
                if (!path.empty()) {
                    std::filesystem::remove_all(path, ignored);
                }
            }
        };
        static const PrivateFolder made;
        const std::string& folder = made.path;
        if (!folder.empty()) {
            launch.environment.push_back("TMPDIR=" + folder);
        }
    }
    launch.show_errors = settings.show_worker_errors;
    return launch;
}

std::string launch_key_of(const IsolationSettings& settings) {
    return settings.worker_program + '\x1f' + std::to_string(settings.memory_mib) + '\x1f' +
           (settings.show_worker_errors ? "v" : "q") + '\x1f' +
           std::to_string(settings.preamble_units) + (settings.shared_headers ? "s" : "");
}

// Start `worker`'s process and wait for it to be ready. Throws Failure when it cannot start.
void start(Worker& worker, const IsolationSettings& settings) {
    worker.contexts.clear();
    worker.process = std::make_unique<WorkerProcess>(launch_of(settings));
    std::string reply;
    const auto received =
        worker.process->receive(reply, std::chrono::steady_clock::now() + k_start_timeout);
    if (received == WorkerProcess::Received::message) {
        try {
            if (decode_reply(reply).kind == WorkerReply::Kind::ready) {
                return;
            }
        } catch (const std::exception&) {
        }
    }
    const isolate::WorkerExit end =
        worker.process->stop(received == WorkerProcess::Received::timed_out);
    worker.process.reset();
    if (end.end == WorkerEnd::out_of_memory) {
        throw Failure("the parser process ran out of memory while starting (raise "
                      "--parse-memory, now " +
                      std::to_string(settings.memory_mib) + " MiB)");
    }
    if (end.end == WorkerEnd::exited && end.code == isolate::k_exit_cannot_start) {
        throw Failure("the parser process could not set up its limits or confine its file "
                      "access (run with --verbose to see why)");
    }
    throw Failure("the parser process ended before it was ready (" +
                  std::string(end.end == WorkerEnd::exited ? "exit status " : "signal ") +
                  std::to_string(end.code) + ")");
}

unsigned wall_seconds(const IsolationSettings& settings) {
    return 2 * std::max(1u, settings.cpu_seconds);
}

// The reason a dead or stopped worker gives for its job.
FileFunctions fall_back(const LexJob& job, ParserStop stop, unsigned seconds) {
    const std::string warning = "the parser stopped on this file (" +
                                parser_stop_text(stop, seconds) + "): measured lexically";
    spdlog::debug("{}: {}", job.file->path, warning);
    return lex_lexically(*job.file, *job.context, stop, warning);
}

// Send `job` (and its context when `worker` does not hold it) before `deadline`; false when the
// worker is gone.
bool send_job(Worker& worker, const LexJob& job, SharedContext& context,
              const IsolationSettings& settings, isolate::Deadline deadline) {
    if (std::find(worker.contexts.begin(), worker.contexts.end(), context.id) ==
        worker.contexts.end()) {
        std::vector<std::uint64_t> drop;
        while (worker.contexts.size() >= k_contexts_per_worker) {
            drop.push_back(worker.contexts.front());
            worker.contexts.pop_front();
        }
        if (!worker.process->send(context.message(drop), deadline)) {
            return false;
        }
        worker.contexts.push_back(context.id);
    }
    return worker.process->send(encode_job(context.id, *job.file, settings.cpu_seconds), deadline);
}

// Lex `job` in `worker` (starting it when needed); never throws for the file's content.
FileFunctions lex_one(Worker& worker, const LexJob& job, SharedContext& context,
                      const IsolationSettings& settings) {
    if (!worker.process) {
        start(worker, settings);
    }
    const auto deadline =
        std::chrono::steady_clock::now() + std::chrono::seconds(wall_seconds(settings));
    bool sent = send_job(worker, job, context, settings, deadline);
    if (!sent && std::chrono::steady_clock::now() < deadline) {
        // The worker was gone before it had the job (it died idle): start another, once.
        worker.process->stop(false);
        start(worker, settings);
        sent = send_job(worker, job, context, settings, deadline);
    }
    std::string reply;
    const auto received =
        sent ? worker.process->receive(reply, deadline) : WorkerProcess::Received::ended;
    if (received == WorkerProcess::Received::message) {
        try {
            WorkerReply decoded = decode_reply(reply);
            if (decoded.kind == WorkerReply::Kind::result) {
                decoded.functions.path = job.file->path;
                if (settings.preamble_units > 0) {
                    worker.recent.push_front(job.file->path);
                    if (worker.recent.size() > settings.preamble_units) {
                        worker.recent.pop_back();
                    }
                }
                return std::move(decoded.functions);
            }
            if (decoded.kind == WorkerReply::Kind::failed) {
                spdlog::debug("{}", decoded.message);
                return fall_back(job, ParserStop::failed, 0);
            }
        } catch (const std::exception& error) {
            spdlog::debug("parser process sent a malformed reply: {}", error.what());
        }
    }
    const bool for_time = received == WorkerProcess::Received::timed_out;
    const isolate::WorkerExit end =
        worker.process->stop(for_time || received == WorkerProcess::Received::message);
    worker.process.reset();
    worker.contexts.clear();
    worker.recent.clear();
    switch (end.end) {
    case WorkerEnd::out_of_memory:
        return fall_back(job, ParserStop::out_of_memory, 0);
    case WorkerEnd::cpu_limit:
        return fall_back(job, ParserStop::timed_out, settings.cpu_seconds);
    case WorkerEnd::killed_for_time:
        if (for_time) {
            return fall_back(job, ParserStop::timed_out, wall_seconds(settings));
        }
        break;
    case WorkerEnd::exited:
    case WorkerEnd::crashed:
        break;
    }
    return fall_back(job, ParserStop::crashed, 0);
}

// Lex `job` in `held`, the calling thread's worker, or when null in the home process of the
// job's path (waiting while another call has it).
FileFunctions lex_job(Worker* held, const LexJob& job, SharedContext& context,
                      const IsolationSettings& settings, const std::string& launch_key) {
    if (held != nullptr) {
        return lex_one(*held, job, context, settings);
    }
    HomeLoan loan(pool(), launch_key,
                  pool().home_of(launch_key, job.file->path, settings.preamble_homes));
    return lex_one(loan.worker(), job, context, settings);
}

} // namespace

std::vector<FileFunctions>
lex_in_workers(const std::vector<LexJob>& jobs, unsigned threads, const IsolationSettings& settings,
               const std::function<void(const FileFunctions&)>& on_done) {
    std::vector<FileFunctions> results(jobs.size());
    if (jobs.empty()) {
        return results;
    }
    std::map<const ParseContext*, std::unique_ptr<SharedContext>> contexts;
    for (const LexJob& job : jobs) {
        auto& shared = contexts[job.context];
        if (!shared) {
            shared = std::make_unique<SharedContext>();
            shared->id = g_next_context_id++;
            shared->context = job.context;
        }
    }
    const std::string launch_key = launch_key_of(settings);
    std::vector<std::string> paths;
    if (settings.preamble_units > 0) {
        for (const LexJob& job : jobs) {
            paths.push_back(job.file->path);
        }
    }
    std::atomic<std::size_t> next{0};
    std::mutex done_mutex;
    std::exception_ptr first_error;
    const bool by_home = settings.preamble_units > 0 && settings.preamble_homes > 0;
    auto work = [&] {
        // A thread keeps one worker for the whole call, or with homes borrows each job's home.
        std::unique_ptr<Worker> held = by_home ? nullptr : pool().take(launch_key, paths);
        try {
            for (std::size_t i = next++; i < jobs.size(); i = next++) {
                results[i] = lex_job(held.get(), jobs[i], *contexts.at(jobs[i].context), settings,
                                     launch_key);
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
            next = jobs.size(); // stop the other threads early
        }
        if (held) {
            pool().give(std::move(held));
        }
    };
    run_workers(std::min<unsigned>(std::max(1u, threads), static_cast<unsigned>(jobs.size())),
                work);
    if (first_error) {
        std::rethrow_exception(first_error);
    }
    return results;
}

} // namespace tollgate::lexer
