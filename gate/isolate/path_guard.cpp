// SPDX-License-Identifier: MIT
// The confinement check itself. It calls only C library functions that interpose.cpp does not
// replace (canonicalize_file_name, fstatat), so it never re-enters a wrapper.
#include "gate/isolate/path_guard.hpp"

#include "gate/isolate/interposed.hpp"

#include <atomic>
#include <cerrno>
#include <climits>
#include <cstdlib>
#include <cstring>
#include <dlfcn.h>
#include <fcntl.h>
#include <memory>
#include <mutex>
#include <sys/stat.h>
#include <unordered_map>

namespace tollgate::isolate {

namespace {

// Roots after resolution, immutable once published.
struct ResolvedPolicy {
    std::vector<std::string> read_roots;
    std::vector<std::string> given_write_roots; // as given, to keep their paths out of the memo
    std::vector<std::string> write_roots;

    // Decisions on read-only paths, which do not change while a parser runs: loading a
    // precompiled header checks every header it was built from, for every file parsed.
    struct Decision {
        int result = 0;
        std::string resolved;
    };
    mutable std::mutex memo_mutex;
    mutable std::unordered_map<std::string, Decision> memo;
};

std::atomic<const ResolvedPolicy*> g_policy{nullptr};

// Every policy ever published stays alive: a wrapper on another thread may still hold one.
std::vector<std::unique_ptr<ResolvedPolicy>>& published() {
    static auto* all = new std::vector<std::unique_ptr<ResolvedPolicy>>();
    return *all;
}

// Return `path` with symlinks and ".." resolved, or an empty string (errno set) when it does not
// resolve.
std::string resolve(const char* path) {
    char* resolved = ::canonicalize_file_name(path);
    if (resolved == nullptr) {
        return {};
    }
    std::string text = resolved;
    std::free(resolved);
    return text;
}

bool under(const std::string& path, const std::vector<std::string>& roots) {
    for (const std::string& root : roots) {
        if (path.size() >= root.size() && path.compare(0, root.size(), root) == 0 &&
            (path.size() == root.size() || path[root.size()] == '/' || root == "/")) {
            return true;
        }
    }
    return false;
}

bool exists_folder(const char* path) {
    struct stat info {};
    return ::fstatat(AT_FDCWD, path, &info, 0) == 0 && S_ISDIR(info.st_mode);
}

void copy_out(const std::string& path, char* resolved) {
    if (resolved != nullptr) {
        const std::size_t size = std::min<std::size_t>(path.size(), PATH_MAX - 1);
        std::memcpy(resolved, path.data(), size);
        resolved[size] = '\0';
    }
}

// Return true when `path` is a folder above one of `roots`.
bool above(const std::string& path, const std::vector<std::string>& roots) {
    for (const std::string& root : roots) {
        if (path == "/" || (root.size() > path.size() && root.compare(0, path.size(), path) == 0 &&
                            root[path.size()] == '/')) {
            return true;
        }
    }
    return false;
}

int check_read(const ResolvedPolicy& policy, const char* path, bool inspect, char* resolved) {
    const std::string real = resolve(path);
    if (real.empty()) {
        return errno == 0 ? ENOENT : errno;
    }
    if (!under(real, policy.read_roots) && !under(real, policy.write_roots) &&
        !(inspect && (above(real, policy.read_roots) || above(real, policy.write_roots)))) {
        return ENOENT;
    }
    // Never a device, a FIFO or a socket: opening one can block, never end or have effects.
    struct stat info {};
    if (::fstatat(AT_FDCWD, real.c_str(), &info, 0) != 0) {
        return errno;
    }
    if (!S_ISREG(info.st_mode) && !S_ISDIR(info.st_mode)) {
        return ENOENT;
    }
    copy_out(real, resolved);
    return 0;
}

int check_write(const ResolvedPolicy& policy, const char* path) {
    const std::string text = path;
    const auto slash = text.find_last_of('/');
    const std::string folder =
        slash == std::string::npos ? std::string(".") : (slash == 0 ? "/" : text.substr(0, slash));
    const std::string name = slash == std::string::npos ? text : text.substr(slash + 1);
    if (name.empty() || name == "." || name == "..") {
        return EACCES;
    }
    const std::string real_folder = resolve(folder.c_str());
    if (real_folder.empty() || !under(real_folder, policy.write_roots)) {
        return EACCES;
    }
    struct stat info {};
    if (::fstatat(AT_FDCWD, path, &info, AT_SYMLINK_NOFOLLOW) == 0 && !S_ISREG(info.st_mode) &&
        !S_ISDIR(info.st_mode)) {
        return EACCES; // never write through a symlink, or to a device or FIFO
    }
    return 0;
}

} // namespace

std::vector<std::string> system_include_roots() {
    std::vector<std::string> roots;
    for (const char* candidate :
         {"/usr/include", "/usr/local/include", "/usr/lib/gcc", TOLLGATE_LIBCLANG_RESOURCE_HINT}) {
        if (exists_folder(candidate)) {
            roots.emplace_back(candidate);
        }
    }
    return roots;
}

void confine_paths(const PathPolicy& policy) {
    auto resolved = std::make_unique<ResolvedPolicy>();
    for (const auto& [from, to] : {std::make_pair(&policy.read_roots, &resolved->read_roots),
                                   std::make_pair(&policy.write_roots, &resolved->write_roots)}) {
        for (const std::string& root : *from) {
            std::string real = root.empty() ? std::string() : resolve(root.c_str());
            if (!real.empty()) {
                to->push_back(std::move(real));
            }
        }
    }
    resolved->given_write_roots = policy.write_roots;
    static std::mutex mutex;
    std::lock_guard<std::mutex> lock(mutex);
    g_policy.store(resolved.get(), std::memory_order_release);
    published().push_back(std::move(resolved));
}

bool paths_confined() {
    return g_policy.load(std::memory_order_acquire) != nullptr;
}

int check_path(const char* path, PathUse use, char* resolved) {
    if (path == nullptr) {
        return EFAULT;
    }
    const ResolvedPolicy* policy = g_policy.load(std::memory_order_acquire);
    if (policy == nullptr) {
        copy_out(path, resolved);
        return 0;
    }
    if (use == PathUse::write) {
        const int saved = errno;
        const int result = check_write(*policy, path);
        errno = saved;
        return result;
    }
    // Paths in a write root (the cache) may appear during the run: never remembered.
    const bool memorable =
        !under(path, policy->given_write_roots) && !under(path, policy->write_roots);
    std::string key;
    if (memorable) {
        key.assign(path);
        key += use == PathUse::inspect ? '\1' : '\2';
        std::lock_guard<std::mutex> lock(policy->memo_mutex);
        const auto found = policy->memo.find(key);
        if (found != policy->memo.end()) {
            if (found->second.result == 0) {
                copy_out(found->second.resolved, resolved);
            }
            return found->second.result;
        }
    }
    const int saved = errno;
    errno = 0;
    char real[PATH_MAX];
    const int result = check_read(*policy, path, use == PathUse::inspect, real);
    errno = saved;
    if (result == 0) {
        copy_out(real, resolved);
    }
    if (memorable) {
        std::lock_guard<std::mutex> lock(policy->memo_mutex);
        policy->memo.emplace(std::move(key),
                             ResolvedPolicy::Decision{result, result == 0 ? real : ""});
    }
    return result;
}

bool interposer_bound() {
    const InterposedFunction* table =
        tollgate_interposed_functions != nullptr ? tollgate_interposed_functions() : nullptr;
    if (table == nullptr || table->name == nullptr) {
        return false;
    }
    for (; table->name != nullptr; ++table) {
        if (::dlsym(RTLD_DEFAULT, table->name) != table->address) {
            return false;
        }
    }
    return true;
}

} // namespace tollgate::isolate
