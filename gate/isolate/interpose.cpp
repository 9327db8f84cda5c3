// SPDX-License-Identifier: MIT
// C library wrappers that confine a parser process's file access. Linked only into the tollgate
// executable and exported (interpose.list), so the dynamic linker binds libLLVM's and libstdc++'s
// calls of these names to them. Unconfined (every process until confine_paths), each wrapper
// forwards to the C library unchanged; confined, it asks check_path first and fails like the C
// library does (-1 or null, errno set) when the path is refused. Starting programs is refused.
#undef _FORTIFY_SOURCE // the fortified inline versions of open() would clash with ours

#include "gate/isolate/interposed.hpp"
#include "gate/isolate/path_guard.hpp"

#include <atomic>
#include <cerrno>
#include <climits>
#include <cstdarg>
#include <cstdio>
#include <cstring>
#include <dirent.h>
#include <dlfcn.h>
#include <fcntl.h>
#include <spawn.h>
#include <sys/stat.h>
#include <sys/statfs.h>
#include <sys/syscall.h>
#include <unistd.h>

// The C library's declarations carry nonnull attributes that decltype cannot keep in a template
// argument; the pointers below only forward, so the attributes do not matter there.
#pragma GCC diagnostic ignored "-Wignored-attributes"

using tollgate::isolate::check_path;
using tollgate::isolate::paths_confined;
using tollgate::isolate::PathUse;

namespace {

// Return the C library's definition of `name` (the next one after this executable's).
template <typename Function>
Function* next_definition(const char* name) {
    return reinterpret_cast<Function*>(::dlsym(RTLD_NEXT, name));
}

// The C library's function behind one wrapper, looked up once.
#define TOLLGATE_REAL(name)                                                                        \
    static std::atomic<decltype(&::name)> real_##name##_slot{nullptr};                             \
    auto real = real_##name##_slot.load(std::memory_order_relaxed);                                \
    if (real == nullptr) {                                                                         \
        real = next_definition<std::remove_pointer_t<decltype(&::name)>>(#name);                   \
        real_##name##_slot.store(real, std::memory_order_relaxed);                                 \
    }

bool writes(int flags) {
    return (flags & O_ACCMODE) != O_RDONLY || (flags & (O_CREAT | O_TRUNC | O_APPEND)) != 0;
}

bool mode_writes(const char* modes) {
    return modes == nullptr || modes[0] != 'r' || std::strchr(modes, '+') != nullptr;
}

// Fail like the C library: set errno, return -1.
int refuse(int error) {
    errno = error;
    return -1;
}

// Check `path` for `use`; return 0 or fail with -1 and errno.
int guard(const char* path, PathUse use, char* resolved = nullptr) {
    const int error = check_path(path, use, resolved);
    return error == 0 ? 0 : refuse(error);
}

// Open `resolved` (already checked) for reading without blocking, and keep it only when it is a
// regular file or a folder: a FIFO put in its place after the check is closed, never read.
template <typename Open>
int open_checked(Open&& open_real, const char* resolved, int flags, mode_t mode) {
    const int fd = open_real(resolved, flags | O_NONBLOCK, mode);
    if (fd < 0) {
        return fd;
    }
    struct stat info {};
    if (::fstat(fd, &info) != 0 || (!S_ISREG(info.st_mode) && !S_ISDIR(info.st_mode))) {
        ::close(fd);
        return refuse(ENOENT);
    }
    if ((flags & O_NONBLOCK) == 0) {
        ::fcntl(fd, F_SETFL, ::fcntl(fd, F_GETFL) & ~O_NONBLOCK);
    }
    return fd;
}

mode_t mode_argument(int flags, va_list& arguments) {
    if ((flags & O_CREAT) != 0 || (flags & O_TMPFILE) == O_TMPFILE) {
        return static_cast<mode_t>(va_arg(arguments, int));
    }
    return 0;
}

template <typename Open>
int open_guarded(Open&& open_real, const char* path, int flags, mode_t mode) {
    if (!paths_confined()) {
        return open_real(path, flags, mode);
    }
    if (writes(flags)) {
        return guard(path, PathUse::write) != 0 ? -1 : open_real(path, flags, mode);
    }
    char resolved[PATH_MAX];
    if (guard(path, PathUse::read, resolved) != 0) {
        return -1;
    }
    return open_checked(open_real, resolved, flags, mode);
}

template <typename Fopen>
FILE* fopen_guarded(Fopen&& fopen_real, const char* path, const char* modes) {
    if (!paths_confined()) {
        return fopen_real(path, modes);
    }
    if (mode_writes(modes)) {
        return guard(path, PathUse::write) != 0 ? nullptr : fopen_real(path, modes);
    }
    char resolved[PATH_MAX];
    if (guard(path, PathUse::read, resolved) != 0) {
        return nullptr;
    }
    const int flags = O_RDONLY | (std::strchr(modes, 'e') != nullptr ? O_CLOEXEC : 0);
    const int fd = open_checked(
        [](const char* p, int f, mode_t m) {
            return static_cast<int>(::syscall(SYS_openat, AT_FDCWD, p, f, m));
        },
        resolved, flags, 0);
    if (fd < 0) {
        return nullptr;
    }
    FILE* file = ::fdopen(fd, modes);
    if (file == nullptr) {
        ::close(fd);
    }
    return file;
}

// Checks in front of a call that takes a path first: metadata only, or a write.
#define TOLLGATE_INSPECT_CHECK(path, failure)                                                      \
    if (paths_confined() && guard(path, PathUse::inspect) != 0) {                                  \
        return failure;                                                                            \
    }

#define TOLLGATE_WRITE_CHECK(path, failure)                                                        \
    if (paths_confined() && guard(path, PathUse::write) != 0) {                                    \
        return failure;                                                                            \
    }

#define TOLLGATE_NO_PROGRAMS(failure)                                                              \
    if (paths_confined()) {                                                                        \
        errno = EPERM;                                                                             \
        return failure;                                                                            \
    }

} // namespace

extern "C" {

int open(const char* path, int flags, ...) {
    va_list arguments;
    va_start(arguments, flags);
    const mode_t mode = mode_argument(flags, arguments);
    va_end(arguments);
    TOLLGATE_REAL(open)
    return open_guarded(real, path, flags, mode);
}

int open64(const char* path, int flags, ...) {
    va_list arguments;
    va_start(arguments, flags);
    const mode_t mode = mode_argument(flags, arguments);
    va_end(arguments);
    TOLLGATE_REAL(open64)
    return open_guarded(real, path, flags, mode);
}

int openat(int folder, const char* path, int flags, ...) {
    va_list arguments;
    va_start(arguments, flags);
    const mode_t mode = mode_argument(flags, arguments);
    va_end(arguments);
    TOLLGATE_REAL(openat)
    if (paths_confined() && folder != AT_FDCWD && path[0] != '/') {
        return refuse(ENOENT); // relative to an open folder: not needed by the parser
    }
    return open_guarded(
        [real, folder](const char* p, int f, mode_t m) { return real(folder, p, f, m); }, path,
        flags, mode);
}

int creat(const char* path, mode_t mode) {
    TOLLGATE_REAL(creat)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path, mode);
}

FILE* fopen(const char* path, const char* modes) {
    TOLLGATE_REAL(fopen)
    return fopen_guarded(real, path, modes);
}

FILE* fopen64(const char* path, const char* modes) {
    TOLLGATE_REAL(fopen64)
    return fopen_guarded(real, path, modes);
}

int stat(const char* __restrict path, struct stat* __restrict info) __THROW {
    TOLLGATE_REAL(stat)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, info);
}

int stat64(const char* __restrict path, struct stat64* __restrict info) __THROW {
    TOLLGATE_REAL(stat64)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, info);
}

int lstat(const char* __restrict path, struct stat* __restrict info) __THROW {
    TOLLGATE_REAL(lstat)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, info);
}

int lstat64(const char* __restrict path, struct stat64* __restrict info) __THROW {
    TOLLGATE_REAL(lstat64)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, info);
}

int statfs(const char* path, struct statfs* info) __THROW {
    TOLLGATE_REAL(statfs)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, info);
}

int access(const char* path, int type) __THROW {
    TOLLGATE_REAL(access)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, type);
}

char* realpath(const char* __restrict path, char* __restrict resolved) __THROW {
    TOLLGATE_REAL(realpath)
    TOLLGATE_INSPECT_CHECK(path, nullptr)
    return real(path, resolved);
}

DIR* opendir(const char* path) {
    TOLLGATE_REAL(opendir)
    if (!paths_confined()) {
        return real(path);
    }
    char resolved[PATH_MAX];
    if (guard(path, PathUse::read, resolved) != 0) {
        return nullptr;
    }
    return real(resolved);
}

ssize_t readlink(const char* __restrict path, char* __restrict buffer, size_t size) __THROW {
    TOLLGATE_REAL(readlink)
    TOLLGATE_INSPECT_CHECK(path, -1)
    return real(path, buffer, size);
}

int mkdir(const char* path, mode_t mode) __THROW {
    TOLLGATE_REAL(mkdir)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path, mode);
}

int mknod(const char* path, mode_t mode, dev_t device) __THROW {
    TOLLGATE_REAL(mknod)
    TOLLGATE_NO_PROGRAMS(-1) // a confined parser never makes special files
    return real(path, mode, device);
}

int rename(const char* from, const char* to) __THROW {
    TOLLGATE_REAL(rename)
    TOLLGATE_WRITE_CHECK(from, -1)
    TOLLGATE_WRITE_CHECK(to, -1)
    return real(from, to);
}

int unlink(const char* path) __THROW {
    TOLLGATE_REAL(unlink)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path);
}

int rmdir(const char* path) __THROW {
    TOLLGATE_REAL(rmdir)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path);
}

int remove(const char* path) __THROW {
    TOLLGATE_REAL(remove)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path);
}

int link(const char* from, const char* to) __THROW {
    TOLLGATE_REAL(link)
    TOLLGATE_NO_PROGRAMS(-1) // a hard link could expose a file outside the roots
    return real(from, to);
}

int symlink(const char* from, const char* to) __THROW {
    TOLLGATE_REAL(symlink)
    TOLLGATE_NO_PROGRAMS(-1)
    return real(from, to);
}

int chmod(const char* path, mode_t mode) __THROW {
    TOLLGATE_REAL(chmod)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path, mode);
}

int truncate(const char* path, off_t length) __THROW {
    TOLLGATE_REAL(truncate)
    TOLLGATE_WRITE_CHECK(path, -1)
    return real(path, length);
}

int utimensat(int folder, const char* path, const struct timespec times[2], int flags) __THROW {
    TOLLGATE_REAL(utimensat)
    if (paths_confined()) {
        if (folder != AT_FDCWD && path[0] != '/') {
            return refuse(EACCES);
        }
        if (guard(path, PathUse::write) != 0) {
            return -1;
        }
    }
    return real(folder, path, times, flags);
}

int chdir(const char* path) __THROW {
    TOLLGATE_REAL(chdir)
    TOLLGATE_NO_PROGRAMS(-1) // relative paths are checked against the folder set at start
    return real(path);
}

int execve(const char* path, char* const argv[], char* const envp[]) __THROW {
    TOLLGATE_REAL(execve)
    TOLLGATE_NO_PROGRAMS(-1)
    return real(path, argv, envp);
}

int execv(const char* path, char* const argv[]) __THROW {
    TOLLGATE_REAL(execv)
    TOLLGATE_NO_PROGRAMS(-1)
    return real(path, argv);
}

int execvp(const char* file, char* const argv[]) __THROW {
    TOLLGATE_REAL(execvp)
    TOLLGATE_NO_PROGRAMS(-1)
    return real(file, argv);
}

int posix_spawn(pid_t* __restrict pid, const char* __restrict path,
                const posix_spawn_file_actions_t* actions, const posix_spawnattr_t* __restrict attr,
                char* const argv[], char* const envp[]) {
    TOLLGATE_REAL(posix_spawn)
    if (paths_confined()) {
        return EPERM;
    }
    return real(pid, path, actions, attr, argv, envp);
}

int posix_spawnp(pid_t* __restrict pid, const char* __restrict file,
                 const posix_spawn_file_actions_t* actions,
                 const posix_spawnattr_t* __restrict attr, char* const argv[], char* const envp[]) {
    TOLLGATE_REAL(posix_spawnp)
    if (paths_confined()) {
        return EPERM;
    }
    return real(pid, file, actions, attr, argv, envp);
}

int system(const char* command) {
    TOLLGATE_REAL(system)
    TOLLGATE_NO_PROGRAMS(-1)
    return real(command);
}

FILE* popen(const char* command, const char* modes) {
    TOLLGATE_REAL(popen)
    TOLLGATE_NO_PROGRAMS(nullptr)
    return real(command, modes);
}

const tollgate::isolate::InterposedFunction* tollgate_interposed_functions() {
    static const tollgate::isolate::InterposedFunction table[] = {
        {"open", reinterpret_cast<void*>(&open)},
        {"open64", reinterpret_cast<void*>(&open64)},
        {"openat", reinterpret_cast<void*>(&openat)},
        {"fopen", reinterpret_cast<void*>(&fopen)},
        {"fopen64", reinterpret_cast<void*>(&fopen64)},
        {"stat", reinterpret_cast<void*>(&stat)},
        {"stat64", reinterpret_cast<void*>(&stat64)},
        {"lstat", reinterpret_cast<void*>(&lstat)},
        {"lstat64", reinterpret_cast<void*>(&lstat64)},
        {"access", reinterpret_cast<void*>(&access)},
        {"realpath", reinterpret_cast<void*>(&realpath)},
        {"opendir", reinterpret_cast<void*>(&opendir)},
        {"readlink", reinterpret_cast<void*>(&readlink)},
        {"execve", reinterpret_cast<void*>(&execve)},
        {"posix_spawn", reinterpret_cast<void*>(&posix_spawn)},
        {nullptr, nullptr},
    };
    return table;
}

} // extern "C"
