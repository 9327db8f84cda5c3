// SPDX-License-Identifier: MIT
// Worker processes with small shell programs standing in for the parser: framing, deadlines,
// and how an end is read.
#include "gate/isolate/worker_process.hpp"

#include <catch2/catch.hpp>
#include <csignal>

using namespace tollgate;
using isolate::WorkerEnd;
using isolate::WorkerProcess;

namespace {

isolate::WorkerLaunch shell(const std::string& script) {
    isolate::WorkerLaunch launch;
    launch.program = "/bin/sh";
    launch.arguments = {"-c", script};
    launch.environment = {"PATH=/usr/bin:/bin"};
    return launch;
}

isolate::Deadline in_seconds(int seconds) {
    return std::chrono::steady_clock::now() + std::chrono::seconds(seconds);
}

} // namespace

TEST_CASE("WorkerProcess", "[isolate]") {
    SECTION("a frame sent comes back whole from a child that echoes its socket") {
        WorkerProcess echo(shell("exec cat <&3 >&3"));
        std::string message(100000, 'x');
        message[0] = '\0'; // any bytes, NUL included
        message.back() = '\xff';
        REQUIRE(echo.send(message, in_seconds(30)));
        std::string reply;
        REQUIRE(echo.receive(reply, in_seconds(30)) == WorkerProcess::Received::message);
        CHECK(reply == message);
    }
    SECTION("a child that does not answer is killed at the deadline") {
        WorkerProcess silent(shell("exec sleep 30"));
        std::string reply;
        CHECK(silent.receive(reply, in_seconds(1)) == WorkerProcess::Received::timed_out);
        const auto end = silent.stop(true);
        CHECK(end.end == WorkerEnd::killed_for_time);
    }
    SECTION("a child that dies on a signal reads as crashed") {
        WorkerProcess crashing(shell("kill -SEGV $$"));
        std::string reply;
        CHECK(crashing.receive(reply, in_seconds(30)) == WorkerProcess::Received::ended);
        const auto end = crashing.stop(false);
        CHECK(end.end == WorkerEnd::crashed);
        CHECK(end.code == SIGSEGV);
    }
    SECTION("the exit status for a failed allocation reads as out of memory") {
        WorkerProcess starving(shell("exit " + std::to_string(isolate::k_exit_out_of_memory)));
        std::string reply;
        CHECK(starving.receive(reply, in_seconds(30)) == WorkerProcess::Received::ended);
        CHECK(starving.stop(false).end == WorkerEnd::out_of_memory);
    }
    SECTION("the processor-time limit reads as such") {
        WorkerProcess spinning(shell("ulimit -St 1; while :; do :; done"));
        std::string reply;
        CHECK(spinning.receive(reply, in_seconds(60)) == WorkerProcess::Received::ended);
        CHECK(spinning.stop(false).end == WorkerEnd::cpu_limit);
    }
}
