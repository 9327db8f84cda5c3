// SPDX-License-Identifier: MIT
// Text from a repository is data: make it valid UTF-8, neutralise control characters, and escape
// it for each output (terminal, Markdown, URL, HTML, JSON) or store it losslessly.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>

namespace tollgate::text {

// U+FFFD REPLACEMENT CHARACTER in UTF-8: what an invalid byte sequence shows as.
inline constexpr std::string_view k_replacement = "\xEF\xBF\xBD";

// Return whether `text` is well-formed UTF-8 (Unicode 15, section 3.9, table 3-7: no overlong
// forms, no surrogates, nothing above U+10FFFF).
bool is_valid_utf8(std::string_view text);

// Return the offset of the first byte of `text` that starts no well-formed UTF-8 sequence (the
// same rule as is_valid_utf8), or npos when all of it is well formed.
std::size_t first_invalid_utf8(std::string_view text);

// Return `text` with every maximal ill-formed subsequence replaced by one U+FFFD (Unicode 15,
// section 3.9, "U+FFFD Substitution of Maximal Subparts"): the rule nlohmann::json's
// error_handler_t::replace and Python's bytes.decode("utf-8", "replace") follow. Valid text is
// returned unchanged.
std::string to_valid_utf8(std::string_view text);

// Return valid UTF-8 `text` (see to_valid_utf8) with every control character written as a
// visible escape: C0 controls, DEL and C1 controls as `\xHH` (ESC -> `\x1b`, line feed ->
// `\x0a`), and the bidirectional formatting characters and line/paragraph separators (U+061C,
// U+200E, U+200F, U+2028-U+202E, U+2066-U+2069) as `\uHHHH`. Other text is unchanged.
std::string visible_text(std::string_view text);

// Return `text` safe for one terminal line: visible_text. Our own colour sequences are added
// after this, never passed through it.
inline std::string terminal_text(std::string_view text) {
    return visible_text(text);
}

// Return `text` cut to at most `max_bytes` bytes at a code point boundary, with "..." taking the
// place of what was cut (the result, "..." included, stays within `max_bytes`); `text` itself
// when it fits. Expects valid UTF-8.
std::string clip(std::string_view text, std::size_t max_bytes);

// Return the columns a terminal gives `text`: each code point counts 1, except combining marks,
// zero-width spaces and joiners, variation selectors and Hangul medial vowels (0 columns) and
// East Asian wide and fullwidth characters and wide emoji (2 columns), as Unicode Standard
// Annex #11 (East Asian Width) and glibc's wcwidth() give them; an ill-formed byte sequence
// counts as the one U+FFFD it becomes. Expects text made visible first (no control characters).
std::size_t display_width(std::string_view text);

// Which end of a text a cut removes.
enum class CutEnd { left, right };

// Return `text` cut to at most `columns` terminal columns (see display_width) at a code point
// boundary, an ellipsis "…" taking the place of what was cut from `end`; `text` itself when
// it fits. A `columns` of 0 gives an empty string.
std::string clip_columns(std::string_view text, std::size_t columns, CutEnd end);

// Return `text` (made visible, see visible_text) as Markdown inline text that renders as exactly
// that text in CommonMark 0.30 and GitHub-flavoured Markdown: backslash escapes (CommonMark
// section 2.4) for every character that could start markup (`\`, backtick, `*`, `_`, `~`, `[`,
// `]`, `<`, `>`, `&`, `|`, `$`), for any ASCII punctuation at the start (list, heading and
// quote markers), for the "." or ")" of a leading number, and for the ":" of "://" and the "."
// after "www" (no autolink; an e-mail address may still become a mailto: link, which backslash
// escapes cannot prevent); leading spaces become "&#32;". Safe in a table cell, a list item and
// a block quote.
std::string markdown_text(std::string_view text);

// Where a Markdown code span goes: in a GFM table cell a pipe must be written `\|`.
enum class MarkdownPlace { inline_text, table_cell };

// Return `text` (made visible) as a Markdown code span (CommonMark 0.30 section 6.1): fenced by
// one more backtick than its longest backtick run, padded with spaces when it starts or ends
// with a backtick, pipes written `\|` in a table cell. Empty text gives an empty string.
std::string markdown_code(std::string_view text, MarkdownPlace place);

// Return `text` with every byte outside RFC 3986's unreserved set (ALPHA DIGIT "-" "." "_" "~")
// and outside `keep` percent-encoded as "%XX" (uppercase hex), byte by byte: lossless, whatever
// the bytes are.
std::string percent_encode(std::string_view text, std::string_view keep = "");

// Return `url` with every byte that may not stand in a URL or that would end a Markdown link
// destination percent-encoded: controls, space, non-ASCII bytes and `"<>\^`{|}()`; "%" and the
// other reserved characters stay, so an encoded template keeps its meaning.
std::string url_text(std::string_view url);

// Return `text` (made visible) with `&`, `<`, `>`, `"` and `'` written as HTML character
// references: safe in HTML element content and in a quoted attribute value.
std::string html_text(std::string_view text);

// Return `text` as one word for a POSIX shell: itself when it holds only letters, digits and
// "_-./:+,@%=", else in single quotes with each quote written '\'' (POSIX.1-2017, Shell Command
// Language, 2.2.2 Single-Quotes: nothing inside them is special). For commands a report shows
// to be copied; a copied command runs nothing the text holds.
std::string shell_word(std::string_view text);

// Return `text` in a lossless, valid-UTF-8 form for stores that are read back: valid UTF-8 is
// kept, "%" becomes "%25" and each byte of an ill-formed sequence becomes "%XX". unstore_bytes
// undoes it exactly.
std::string store_bytes(std::string_view text);

// Return the bytes that store_bytes turned into `stored`, or nothing when `stored` holds a "%"
// not followed by two hex digits (a damaged store).
std::optional<std::string> unstore_bytes(std::string_view stored);

// Return `value` (an nlohmann::json or ordered_json) serialised with `indent` (-1: compact),
// every invalid UTF-8 sequence in a string written as U+FFFD (the same rule as to_valid_utf8),
// so serialising never throws. The one way reports write JSON.
template <typename Json>
std::string dump_json(const Json& value, int indent) {
    return value.dump(indent, ' ', false, Json::error_handler_t::replace);
}

} // namespace tollgate::text
