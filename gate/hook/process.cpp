// SPDX-License-Identifier: MIT
// Child processes with fork and exec, stdout captured through a pipe.
#include "gate/hook/process.hpp"

#include "gate/common/errors.hpp"

#include <cerrno>
#include <cstring>
#include <fcntl.h>
#include <filesystem>
#include <sys/wait.h>
#include <unistd.h>

namespace tollgate::hook {

namespace {

std::string system_error_text() {
    return std::strerror(errno);
}

// Own a file descriptor; close it once.
class FileDescriptor {
public:
    explicit FileDescriptor(int fd = -1) : m_fd(fd) {}
    ~FileDescriptor() { reset(); }
    FileDescriptor(const FileDescriptor&) = delete;
    FileDescriptor& operator=(const FileDescriptor&) = delete;
    int get() const { return m_fd; }
    void reset() {
        if (m_fd >= 0) {
            ::close(m_fd);
        }
        m_fd = -1;
    }

private:
    int m_fd;
};

// In the forked child: wire standard input to /dev/null and standard output as `output` says,
// then exec `args`; exit 127 when exec fails. Only async-signal-safe calls here.
[[noreturn]] void exec_child(std::vector<char*>& args, Output output, const int (&pipe_fds)[2]) {
    const int null_fd = ::open("/dev/null", O_RDONLY);
    if (null_fd >= 0) {
        ::dup2(null_fd, STDIN_FILENO);
    }
    if (output == Output::capture) {
        const int null_out = ::open("/dev/null", O_WRONLY);
        if (null_out >= 0) {
            ::dup2(null_out, STDERR_FILENO);
        }
        ::dup2(pipe_fds[1], STDOUT_FILENO);
        ::close(pipe_fds[0]);
        ::close(pipe_fds[1]);
    } else if (output == Output::to_stderr) {
        ::dup2(STDERR_FILENO, STDOUT_FILENO);
    }
    ::execvp(args[0], args.data());
    _exit(127);
}

// Return everything readable from `fd` until end of file.
std::string read_all(int fd) {
    std::string text;
    char buffer[4096];
    for (;;) {
        const ssize_t got = ::read(fd, buffer, sizeof buffer);
        if (got > 0) {
            text.append(buffer, static_cast<std::size_t>(got));
        } else if (got == 0 || errno != EINTR) {
            return text;
        }
    }
}

// Wait for `pid` and return its exit code (128 + signal number when a signal ended it).
int wait_for(pid_t pid, const std::string& name) {
    int status = 0;
    while (::waitpid(pid, &status, 0) < 0) {
        if (errno != EINTR) {
            throw Failure("cannot wait for \"" + name + "\": " + system_error_text());
        }
    }
    if (WIFSIGNALED(status)) {
        return 128 + WTERMSIG(status);
    }
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

} // namespace

ProcessResult run_process(const std::vector<std::string>& argv, Output output) {
    if (argv.empty()) {
        throw Failure("cannot run an empty command");
    }
    int pipe_fds[2] = {-1, -1};
    if (output == Output::capture && ::pipe(pipe_fds) != 0) {
        throw Failure("cannot create a pipe: " + system_error_text());
    }
    FileDescriptor read_end(pipe_fds[0]);
    FileDescriptor write_end(pipe_fds[1]);
    std::vector<char*> args;
    for (const std::string& arg : argv) {
        args.push_back(const_cast<char*>(arg.c_str()));
    }
    args.push_back(nullptr);

    const pid_t pid = ::fork();
    if (pid < 0) {
        throw Failure("cannot start \"" + argv[0] + "\": " + system_error_text());
    }
    if (pid == 0) {
        exec_child(args, output, pipe_fds);
    }
    write_end.reset();
    ProcessResult result;
    if (output == Output::capture) {
        result.out = read_all(read_end.get());
    }
    result.exit_code = wait_for(pid, argv[0]);
    if (result.exit_code == 127) {
        throw Failure("cannot run \"" + argv[0] + "\" (is it installed and on PATH?)");
    }
    return result;
}

std::string self_executable() {
    std::error_code error;
    const auto path = std::filesystem::read_symlink("/proc/self/exe", error);
    if (error) {
        throw Failure("cannot find the running executable: " + error.message());
    }
    return path.string();
}

} // namespace tollgate::hook
