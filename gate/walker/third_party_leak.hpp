// SPDX-License-Identifier: MIT
// Exempt one libgit2 call from leak checking in sanitized builds.
#pragma once

#if defined(__SANITIZE_ADDRESS__)
#define TOLLGATE_LSAN 1
#include <sanitizer/lsan_interface.h>
#endif

namespace tollgate::walker {

// In a sanitized build, exempts the allocations made in its scope from LeakSanitizer; nothing in
// any other build. libgit2 1.5 (Debian 12) leaks small blocks when a shallow clone cuts a walk:
// 64 bytes inside git_merge_base and 16 bytes inside git_revwalk_next (a walk that hides a
// commit). libgit2 has no frame pointers, so LeakSanitizer's fast unwinder stops inside it and no
// suppression entry can name the call (tests/sanitizers/lsan.supp); a scope around exactly that
// call keeps every other libgit2 handle under watch. Only the libgit2 call may run in the scope.
class ThirdPartyLeakExemption {
public:
    ThirdPartyLeakExemption() {
#if defined(TOLLGATE_LSAN)
        __lsan_disable();
#endif
    }
    ~ThirdPartyLeakExemption() {
#if defined(TOLLGATE_LSAN)
        __lsan_enable();
#endif
    }
    ThirdPartyLeakExemption(const ThirdPartyLeakExemption&) = delete;
    ThirdPartyLeakExemption& operator=(const ThirdPartyLeakExemption&) = delete;
};

} // namespace tollgate::walker
