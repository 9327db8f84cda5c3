// SPDX-License-Identifier: MIT
// A child process spoken to through one socket with length-prefixed messages, and the framing
// both ends use.
#pragma once

#include <chrono>
#include <string>
#include <sys/types.h>
#include <vector>

namespace tollgate::isolate {

// The file descriptor a worker process finds its socket on.
inline constexpr int k_worker_socket_fd = 3;

// The exit status a worker uses when an allocation failed (its address space limit was reached).
inline constexpr int k_exit_out_of_memory = 86;

// The exit status a worker uses when it could not set itself up (limits, confinement).
inline constexpr int k_exit_cannot_start = 87;

// The largest message either side accepts (a guard against a corrupted length).
inline constexpr std::size_t k_max_message_bytes = std::size_t(1) << 30;

using Deadline = std::chrono::steady_clock::time_point;

// How a worker process ended.
enum class WorkerEnd {
    exited,          // it exited by itself (status in `code`)
    out_of_memory,   // it exited with k_exit_out_of_memory
    cpu_limit,       // the kernel stopped it at its processor-time limit (SIGXCPU)
    killed_for_time, // this process killed it at the wall-clock deadline
    crashed,         // another signal ended it (SIGSEGV, SIGABRT, SIGKILL from elsewhere, ...)
};

// How a worker process ended, with its status.
struct WorkerExit {
    WorkerEnd end = WorkerEnd::exited; // the kind of end
    int code = 0;                      // exit status, or the signal number
};

// What to start.
struct WorkerLaunch {
    std::string program;                  // the executable's path
    std::vector<std::string> arguments;   // argv[1..]
    std::vector<std::string> environment; // the child's whole environment (NAME=VALUE)
    bool show_errors = false;             // its standard error goes to ours; else to /dev/null
};

// One running child process with a socket on its k_worker_socket_fd; standard input and output
// are /dev/null. Not copyable; the destructor closes the socket, waits briefly for the child to
// exit and kills it when it does not.
class WorkerProcess {
public:
    // Start `launch`. Throws Failure when the process cannot be started.
    explicit WorkerProcess(const WorkerLaunch& launch);
    ~WorkerProcess();
    WorkerProcess(const WorkerProcess&) = delete;
    WorkerProcess& operator=(const WorkerProcess&) = delete;

    // What a receive got.
    enum class Received { message, ended, timed_out };

    // Send `message` as one frame; return false when the child is gone or `deadline` passed.
    bool send(const std::string& message, Deadline deadline);
    // Receive one frame into `message`, waiting until `deadline`.
    Received receive(std::string& message, Deadline deadline);
    // Kill the child (when `for_time`, the end reads killed_for_time) or, when it is already
    // ending, reap it; return how it ended. The process is gone afterwards.
    WorkerExit stop(bool for_time);
    // Return the child's process id.
    pid_t pid() const { return m_pid; }

private:
    pid_t m_pid = -1;
    int m_socket = -1;
    bool m_reaped = false;
};

// Read one frame from `fd`, blocking; return false at the end of input or on a bad frame.
bool read_frame(int fd, std::string& message);

// Write `message` as one frame to `fd`, blocking; return false when the reader is gone.
bool write_frame(int fd, const std::string& message);

} // namespace tollgate::isolate
