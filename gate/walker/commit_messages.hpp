// SPDX-License-Identifier: MIT
// The messages of a change's own commits (where a change may carry trailers).
#pragma once

#include "gate/walker/repository.hpp"

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::walker {

// One commit of a change and its whole message.
struct CommitMessage {
    ObjectId commit;     // the commit
    std::string message; // its message, as stored (the head's data: never obeyed)

    bool operator==(const CommitMessage& other) const {
        return commit == other.commit && message == other.message;
    }
};

// Return the messages of the commits reachable from `head` and not from `base` (git log
// base..head), newest first, at most `limit` of them. Returns none when `head` is reachable from
// `base`. Throws Failure when libgit2 fails.
std::vector<CommitMessage> commit_messages(const Repository& repository, const ObjectId& base,
                                           const ObjectId& head, std::size_t limit);

} // namespace tollgate::walker
