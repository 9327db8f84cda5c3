// SPDX-License-Identifier: MIT
// Worker processes: posix_spawn with a socket pair, frames of a 4-byte little-endian length and
// the bytes, deadlines with poll, and reaping.
#include "gate/isolate/worker_process.hpp"

#include "gate/common/errors.hpp"

#include <cerrno>
#include <csignal>
#include <cstring>
#include <fcntl.h>
#include <poll.h>
#include <spawn.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <thread>
#include <unistd.h>

namespace tollgate::isolate {

namespace {

int remaining_ms(Deadline deadline) {
    if (deadline == Deadline::max()) {
        return -1; // no deadline: poll waits as long as it takes
    }
    const auto left = std::chrono::duration_cast<std::chrono::milliseconds>(
        deadline - std::chrono::steady_clock::now());
    if (left.count() <= 0) {
        return 0;
    }
    return static_cast<int>(std::min<long long>(left.count(), 1000LL * 3600));
}

// Wait until `fd` is ready for `events` or `deadline` passes; return false on the deadline.
bool wait_for(int fd, short events, Deadline deadline) {
    for (;;) {
        pollfd entry{fd, events, 0};
        const int ready = ::poll(&entry, 1, remaining_ms(deadline));
        if (ready > 0) {
            return true;
        }
        if (ready == 0) {
            return false;
        }
        if (errno != EINTR) {
            return true; // let the following read or write report the error
        }
    }
}

enum class Io { done, gone, timed_out };

Io send_all(int fd, const char* data, std::size_t size, Deadline deadline) {
    while (size > 0) {
        if (!wait_for(fd, POLLOUT, deadline)) {
            return Io::timed_out;
        }
        const ssize_t sent = ::send(fd, data, size, MSG_NOSIGNAL | MSG_DONTWAIT);
        if (sent < 0) {
            if (errno == EINTR || errno == EAGAIN || errno == EWOULDBLOCK) {
                continue;
            }
            return Io::gone;
        }
        data += sent;
        size -= static_cast<std::size_t>(sent);
    }
    return Io::done;
}

Io receive_all(int fd, char* data, std::size_t size, Deadline deadline) {
    while (size > 0) {
        if (!wait_for(fd, POLLIN, deadline)) {
            return Io::timed_out;
        }
        const ssize_t got = ::recv(fd, data, size, MSG_DONTWAIT);
        if (got == 0) {
            return Io::gone;
        }
        if (got < 0) {
            if (errno == EINTR || errno == EAGAIN || errno == EWOULDBLOCK) {
                continue;
            }
            return Io::gone;
        }
        data += got;
        size -= static_cast<std::size_t>(got);
    }
    return Io::done;
}

void encode_length(std::size_t size, char (&header)[4]) {
    for (int i = 0; i < 4; ++i) {
        header[i] = static_cast<char>((size >> (8 * i)) & 0xffu);
    }
}

std::size_t decode_length(const char (&header)[4]) {
    std::size_t size = 0;
    for (int i = 0; i < 4; ++i) {
        size |= static_cast<std::size_t>(static_cast<unsigned char>(header[i])) << (8 * i);
    }
    return size;
}

WorkerExit exit_of(int status, bool for_time) {
    if (WIFEXITED(status)) {
        const int code = WEXITSTATUS(status);
        return {code == k_exit_out_of_memory ? WorkerEnd::out_of_memory : WorkerEnd::exited, code};
    }
    const int signal = WIFSIGNALED(status) ? WTERMSIG(status) : 0;
    if (for_time && signal == SIGKILL) {
        return {WorkerEnd::killed_for_time, signal};
    }
    if (signal == SIGXCPU) {
        return {WorkerEnd::cpu_limit, signal};
    }
    return {WorkerEnd::crashed, signal};
}

std::vector<char*> pointers(std::vector<std::string>& strings) {
    std::vector<char*> result;
    for (auto& text : strings) {
        result.push_back(text.data());
    }
    result.push_back(nullptr);
    return result;
}

} // namespace

WorkerProcess::WorkerProcess(const WorkerLaunch& launch) {
    int sockets[2] = {-1, -1};
    if (::socketpair(AF_UNIX, SOCK_STREAM | SOCK_CLOEXEC, 0, sockets) != 0) {
        throw Failure(std::string("cannot make a socket for the parser process: ") +
                      std::strerror(errno));
    }
    // Above the standard descriptors, so the dup2 onto k_worker_socket_fd cannot clobber it.
    const int child_end = ::fcntl(sockets[1], F_DUPFD_CLOEXEC, 10);
    ::close(sockets[1]);
    if (child_end < 0) {
        ::close(sockets[0]);
        throw Failure(std::string("cannot make a socket for the parser process: ") +
                      std::strerror(errno));
    }
    posix_spawn_file_actions_t actions;
    posix_spawn_file_actions_init(&actions);
    posix_spawn_file_actions_addopen(&actions, 0, "/dev/null", O_RDONLY, 0);
    posix_spawn_file_actions_addopen(&actions, 1, "/dev/null", O_WRONLY, 0);
    if (!launch.show_errors) {
        posix_spawn_file_actions_addopen(&actions, 2, "/dev/null", O_WRONLY, 0);
    }
    posix_spawn_file_actions_adddup2(&actions, child_end, k_worker_socket_fd);

    std::vector<std::string> argv_text = {launch.program};
    argv_text.insert(argv_text.end(), launch.arguments.begin(), launch.arguments.end());
    std::vector<std::string> env_text = launch.environment;
    std::vector<char*> argv = pointers(argv_text);
    std::vector<char*> envp = pointers(env_text);
    const int error =
        ::posix_spawn(&m_pid, launch.program.c_str(), &actions, nullptr, argv.data(), envp.data());
    posix_spawn_file_actions_destroy(&actions);
    ::close(child_end);
    if (error != 0) {
        ::close(sockets[0]);
        throw Failure("cannot start the parser process \"" + launch.program +
                      "\": " + std::strerror(error));
    }
    m_socket = sockets[0];
}

WorkerProcess::~WorkerProcess() {
    if (m_socket >= 0) {
        ::close(m_socket);
        m_socket = -1;
    }
    if (m_reaped || m_pid <= 0) {
        return;
    }
    // A worker exits at the end of its input; give it a moment, then make sure.
    for (int i = 0; i < 100; ++i) {
        int status = 0;
        const pid_t done = ::waitpid(m_pid, &status, WNOHANG);
        if (done == m_pid || (done < 0 && errno != EINTR)) {
            return;
        }
        std::this_thread::sleep_for(std::chrono::milliseconds(10));
    }
    ::kill(m_pid, SIGKILL);
    int status = 0;
    while (::waitpid(m_pid, &status, 0) < 0 && errno == EINTR) {
    }
}

bool WorkerProcess::send(const std::string& message, Deadline deadline) {
    char header[4];
    encode_length(message.size(), header);
    return send_all(m_socket, header, sizeof header, deadline) == Io::done &&
           send_all(m_socket, message.data(), message.size(), deadline) == Io::done;
}

WorkerProcess::Received WorkerProcess::receive(std::string& message, Deadline deadline) {
    char header[4];
    Io io = receive_all(m_socket, header, sizeof header, deadline);
    if (io == Io::done) {
        const std::size_t size = decode_length(header);
        if (size > k_max_message_bytes) {
            return Received::ended;
        }
        message.assign(size, '\0');
        io = receive_all(m_socket, message.data(), size, deadline);
    }
    switch (io) {
    case Io::done:
        return Received::message;
    case Io::timed_out:
        return Received::timed_out;
    case Io::gone:
        break;
    }
    return Received::ended;
}

WorkerExit WorkerProcess::stop(bool for_time) {
    if (m_socket >= 0) {
        ::close(m_socket);
        m_socket = -1;
    }
    int status = 0;
    if (!for_time) {
        // It closed its end: it is exiting or dead; wait a little before forcing it.
        for (int i = 0; i < 200; ++i) {
            const pid_t done = ::waitpid(m_pid, &status, WNOHANG);
            if (done == m_pid) {
                m_reaped = true;
                return exit_of(status, false);
            }
            std::this_thread::sleep_for(std::chrono::milliseconds(5));
        }
    }
    ::kill(m_pid, SIGKILL);
    while (::waitpid(m_pid, &status, 0) < 0 && errno == EINTR) {
    }
    m_reaped = true;
    return exit_of(status, for_time);
}

bool read_frame(int fd, std::string& message) {
    const Deadline never = Deadline::max();
    char header[4];
    if (receive_all(fd, header, sizeof header, never) != Io::done) {
        return false;
    }
    const std::size_t size = decode_length(header);
    if (size > k_max_message_bytes) {
        return false;
    }
    message.assign(size, '\0');
    return receive_all(fd, message.data(), size, never) == Io::done;
}

bool write_frame(int fd, const std::string& message) {
    const Deadline never = Deadline::max();
    char header[4];
    encode_length(message.size(), header);
    return send_all(fd, header, sizeof header, never) == Io::done &&
           send_all(fd, message.data(), message.size(), never) == Io::done;
}

} // namespace tollgate::isolate
