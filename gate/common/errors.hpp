// SPDX-License-Identifier: MIT
// The two exception types that leave a command: usage errors (exit 2) and failures (exit 3).
#pragma once

#include <stdexcept>
#include <string>
#include <vector>

namespace tollgate {

// A user or configuration error: bad flag, unknown revision, broken policy or baseline.
// The message is a finished lowercase sentence; run_cli prints it and exits 2.
class UsageError : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// An environment or internal failure (libgit2, libclang, I/O). run_cli exits 3.
class Failure : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// Return `text` as one word of a shell command shown in a message: unchanged when it holds only
// characters a shell leaves alone, else in single quotes.
std::string shell_word(const std::string& text);

// Return the candidate in `candidates` closest to `word` by edit distance, or an empty string
// when none is close enough to suggest (distance more than a third of the word's length, min 2).
std::string closest_match(const std::string& word, const std::vector<std::string>& candidates);

} // namespace tollgate
