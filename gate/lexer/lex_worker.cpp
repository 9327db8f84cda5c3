// SPDX-License-Identifier: MIT
// The parser process's main loop: limits, confinement, then contexts and jobs over the socket.
#include "gate/lexer/lex_worker.hpp"

#include "gate/common/errors.hpp"
#include "gate/isolate/path_guard.hpp"
#include "gate/isolate/worker_process.hpp"
#include "gate/lexer/lex_messages.hpp"
#include "gate/lexer/lexer.hpp"

#include <cerrno>
#include <csignal>
#include <cstdio>
#include <cstring>
#include <malloc.h>
#include <map>
#include <memory>
#include <new>
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>
#include <string>
#include <sys/resource.h>
#include <unistd.h>

namespace tollgate::lexer {

namespace {

using isolate::k_exit_cannot_start;
using isolate::k_exit_out_of_memory;
using isolate::k_worker_socket_fd;

[[noreturn]] void out_of_memory() {
    _exit(k_exit_out_of_memory);
}

// libLLVM reports a failed malloc by aborting; errno still says why.
void on_abort(int) {
    if (errno == ENOMEM) {
        _exit(k_exit_out_of_memory);
    }
    std::signal(SIGABRT, SIG_DFL);
    std::raise(SIGABRT);
}

bool set_limit(int resource, rlim_t soft, rlim_t hard) {
    const rlimit limit{soft, hard};
    return ::setrlimit(resource, &limit) == 0;
}

// Allow `seconds` more of processor time from now; the kernel sends SIGXCPU past it.
void limit_processor_time(unsigned seconds) {
    rusage usage{};
    ::getrusage(RUSAGE_SELF, &usage);
    const rlim_t used = static_cast<rlim_t>(usage.ru_utime.tv_sec + usage.ru_stime.tv_sec + 1);
    rlimit current{};
    ::getrlimit(RLIMIT_CPU, &current);
    rlim_t soft = used + std::max(1u, seconds);
    if (current.rlim_max != RLIM_INFINITY && soft > current.rlim_max) {
        soft = current.rlim_max;
    }
    set_limit(RLIMIT_CPU, soft, current.rlim_max);
}

// The file access a context needs: system headers, plus its cache and trusted folders.
// The private folder the parent made for this process's preambles and shared precompiled
// headers (TMPDIR), or empty.
std::string g_preamble_dir; // NOLINT: set once at start

isolate::PathPolicy policy_for(const ParseContext& context) {
    isolate::PathPolicy policy;
    if (!g_preamble_dir.empty()) {
        // libclang writes each precompiled preamble to a temporary file and reads it back;
        // shared precompiled headers are kept there too.
        policy.write_roots.push_back(g_preamble_dir);
    }
    policy.read_roots = isolate::system_include_roots();
    policy.read_roots.insert(policy.read_roots.end(), context.trusted_dirs.begin(),
                             context.trusted_dirs.end());
    if (!context.cache_dir.empty()) {
        policy.write_roots.push_back(context.cache_dir);
    }
    return policy;
}

bool same_policy(const isolate::PathPolicy& a, const isolate::PathPolicy& b) {
    return a.read_roots == b.read_roots && a.write_roots == b.write_roots;
}

// Set limits and confinement; return false (with a line on stderr) when that fails.
bool set_up(std::uint64_t memory_mib) {
#if defined(__SANITIZE_ADDRESS__)
    // AddressSanitizer reserves terabytes of address space for its shadow memory at start, so an
    // address-space limit would fail every allocation after it: sanitized builds (tests/
    // run_sanitized.sh) parse without it; the regular build keeps and tests the limit.
    memory_mib = 0;
#endif
    if (memory_mib > 0) {
        rlim_t bytes = static_cast<rlim_t>(memory_mib) * 1024 * 1024;
        rlimit inherited{};
        ::getrlimit(RLIMIT_AS, &inherited);
        if (inherited.rlim_max != RLIM_INFINITY && inherited.rlim_max < bytes) {
            bytes = inherited.rlim_max; // a lower limit set around tollgate stays in force
        }
        if (!set_limit(RLIMIT_AS, bytes, bytes)) {
            std::fprintf(stderr, "tollgate parser: cannot limit the address space: %s\n",
                         std::strerror(errno));
            return false;
        }
    }
    set_limit(RLIMIT_CORE, 0, 0);
    // Descriptors the parent opened without close-on-exec (libgit2's, say) are not the parser's.
    if (::close_range(k_worker_socket_fd + 1, ~0U, 0) != 0) {
        for (int fd = k_worker_socket_fd + 1; fd < 4096; ++fd) {
            ::close(fd);
        }
    }
    std::set_new_handler(out_of_memory);
    std::signal(SIGABRT, on_abort);
    if (::chdir("/") != 0) {
        return false;
    }
    isolate::confine_paths({isolate::system_include_roots(), {}});
    if (!isolate::interposer_bound()) {
        std::fprintf(stderr, "tollgate parser: file access cannot be confined in this build (the "
                             "C library wrappers are not bound)\n");
        return false;
    }
    return true;
}

// The parser process's arguments, as lex_pool's launch_of writes them.
struct WorkerArguments {
    std::uint64_t memory_mib = 0;
    std::size_t preamble_units = 0;
    bool shared_headers = false;
    bool verbose = false;
};

WorkerArguments read_arguments(int argc, char** argv) {
    WorkerArguments read;
    for (int i = 2; i < argc; ++i) {
        const std::string arg = argv[i];
        if (arg == "--memory-mib" && i + 1 < argc) {
            read.memory_mib = std::strtoull(argv[++i], nullptr, 10);
        } else if (arg == "--preamble-units" && i + 1 < argc) {
            read.preamble_units = std::strtoull(argv[++i], nullptr, 10);
        } else {
            read.shared_headers = read.shared_headers || arg == "--shared-headers";
            read.verbose = read.verbose || arg == "--verbose";
        }
    }
    return read;
}

// Keep preambles and shared headers as `arguments` ask, in the private folder the parent gave.
void set_up_reuse(Lexer& lexer, const WorkerArguments& arguments) {
    lexer.keep_preambles(arguments.preamble_units);
    const char* folder = std::getenv("TMPDIR");
    if (folder == nullptr || (arguments.preamble_units == 0 && !arguments.shared_headers)) {
        return;
    }
    g_preamble_dir = folder;
    if (arguments.shared_headers) {
        lexer.share_headers(folder);
    }
}

} // namespace

int run_lex_worker(int argc, char** argv) {
    const WorkerArguments arguments = read_arguments(argc, argv);
    auto logger = spdlog::stderr_color_st("tollgate-parser");
    logger->set_pattern("tollgate parser: %l: %v");
    logger->set_level(arguments.verbose ? spdlog::level::debug : spdlog::level::off);
    spdlog::set_default_logger(logger);
    if (!set_up(arguments.memory_mib)) {
        return k_exit_cannot_start;
    }
    try {
        Lexer lexer;
        set_up_reuse(lexer, arguments);
        if (!isolate::write_frame(k_worker_socket_fd, encode_ready())) {
            return 0;
        }
        std::map<std::uint64_t, std::unique_ptr<ParseContext>> contexts;
        isolate::PathPolicy policy{isolate::system_include_roots(), {}};
        if (!g_preamble_dir.empty()) {
            policy.write_roots.push_back(g_preamble_dir);
            isolate::confine_paths(policy);
        }
        std::string bytes;
        while (isolate::read_frame(k_worker_socket_fd, bytes)) {
            WorkerRequest request = decode_request(bytes);
            if (request.kind == WorkerRequest::Kind::context) {
                for (const std::uint64_t id : request.drop) {
                    if (const auto found = contexts.find(id); found != contexts.end()) {
                        lexer.forget(*found->second);
                        contexts.erase(found);
                    }
                }
                contexts[request.id] = std::make_unique<ParseContext>(std::move(request.context));
                continue;
            }
            std::string reply;
            const auto found = contexts.find(request.id);
            if (found == contexts.end()) {
                reply = encode_failed("no context " + std::to_string(request.id));
            } else {
                const isolate::PathPolicy wanted = policy_for(*found->second);
                if (!same_policy(wanted, policy)) {
                    isolate::confine_paths(wanted);
                    policy = wanted;
                }
                limit_processor_time(request.cpu_seconds);
                try {
                    reply = encode_result(lexer.lex_functions(request.file, *found->second));
                } catch (const Failure& error) {
                    reply = encode_failed(error.what());
                }
            }
            if (!isolate::write_frame(k_worker_socket_fd, reply)) {
                break;
            }
            // A parse frees most of what it took; give it back between files, so that the
            // run's peak is what its parser processes hold at once, not the sum of each one's
            // largest file ever.
            ::malloc_trim(0);
        }
    } catch (const std::bad_alloc&) {
        out_of_memory();
    } catch (const std::exception& error) {
        spdlog::debug("{}", error.what());
        return k_exit_cannot_start;
    }
    return 0;
}

} // namespace tollgate::lexer
