// SPDX-License-Identifier: MIT
// UTF-8 repair, visible control characters, and the escapes of each output.
#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <iterator>
#include <vector>

namespace tollgate::text {

namespace {

// One step of decoding: a code point and its length in bytes, or (when `valid` is false) the
// length of the maximal ill-formed subpart starting there (at least one byte).
struct Step {
    char32_t code_point = 0;
    std::size_t length = 1;
    bool valid = false;
};

// Decode the sequence starting at `at` by Unicode 15 table 3-7 (well-formed UTF-8 byte
// sequences): the second byte's range depends on the first; later bytes are 80..BF.
Step decode(std::string_view text, std::size_t at) {
    const auto byte = [&](std::size_t i) { return static_cast<unsigned char>(text[i]); };
    const unsigned char lead = byte(at);
    if (lead < 0x80) {
        return {lead, 1, true};
    }
    std::size_t need = 0;
    unsigned char low = 0x80, high = 0xBF;
    char32_t value = 0;
    if (lead >= 0xC2 && lead <= 0xDF) {
        need = 1;
        value = lead & 0x1Fu;
    } else if (lead >= 0xE0 && lead <= 0xEF) {
        need = 2;
        value = lead & 0x0Fu;
        low = lead == 0xE0 ? 0xA0 : 0x80;
        high = lead == 0xED ? 0x9F : 0xBF;
    } else if (lead >= 0xF0 && lead <= 0xF4) {
        need = 3;
        value = lead & 0x07u;
        low = lead == 0xF0 ? 0x90 : 0x80;
        high = lead == 0xF4 ? 0x8F : 0xBF;
    } else {
        return {0, 1, false};
    }
    for (std::size_t k = 1; k <= need; ++k) {
        if (at + k >= text.size()) {
            return {0, k, false};
        }
        const unsigned char next = byte(at + k);
        if (next < low || next > high) {
            return {0, k, false};
        }
        value = (value << 6) | (next & 0x3Fu);
        low = 0x80;
        high = 0xBF;
    }
    return {value, need + 1, true};
}

bool is_control(char32_t c) {
    return c < 0x20 || c == 0x7F || (c >= 0x80 && c <= 0x9F);
}

// Bidirectional formatting characters and the line/paragraph separators: invisible, and able to
// reorder or break what a reader sees.
bool is_format_control(char32_t c) {
    return c == 0x061C || c == 0x200E || c == 0x200F || (c >= 0x2028 && c <= 0x202E) ||
           (c >= 0x2066 && c <= 0x2069);
}

constexpr const char* k_hex = "0123456789abcdef";
constexpr const char* k_upper_hex = "0123456789ABCDEF";

bool is_ascii_punctuation(char c) {
    return (c >= '!' && c <= '/') || (c >= ':' && c <= '@') || (c >= '[' && c <= '`') ||
           (c >= '{' && c <= '~');
}

bool is_unreserved(char c) {
    return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '-' ||
           c == '.' || c == '_' || c == '~';
}

void append_percent(std::string& out, unsigned char byte) {
    out += '%';
    out += k_upper_hex[byte >> 4];
    out += k_upper_hex[byte & 0xF];
}

int hex_value(char c) {
    if (c >= '0' && c <= '9') {
        return c - '0';
    }
    if (c >= 'a' && c <= 'f') {
        return c - 'a' + 10;
    }
    if (c >= 'A' && c <= 'F') {
        return c - 'A' + 10;
    }
    return -1;
}

} // namespace

std::size_t first_invalid_utf8(std::string_view text) {
    for (std::size_t i = 0; i < text.size();) {
        const Step step = decode(text, i);
        if (!step.valid) {
            return i;
        }
        i += step.length;
    }
    return std::string_view::npos;
}

bool is_valid_utf8(std::string_view text) {
    return first_invalid_utf8(text) == std::string_view::npos;
}

std::string to_valid_utf8(std::string_view text) {
    if (is_valid_utf8(text)) {
        return std::string(text);
    }
    std::string out;
    out.reserve(text.size() + 8);
    for (std::size_t i = 0; i < text.size();) {
        const Step step = decode(text, i);
        if (step.valid) {
            out.append(text.substr(i, step.length));
        } else {
            out.append(k_replacement);
        }
        i += step.length;
    }
    return out;
}

std::string visible_text(std::string_view text) {
    const std::string valid = to_valid_utf8(text);
    std::string out;
    out.reserve(valid.size());
    for (std::size_t i = 0; i < valid.size();) {
        const Step step = decode(valid, i);
        const char32_t c = step.code_point;
        if (is_control(c)) {
            out += "\\x";
            out += k_hex[(c >> 4) & 0xF];
            out += k_hex[c & 0xF];
        } else if (is_format_control(c)) {
            out += "\\u";
            for (int shift = 12; shift >= 0; shift -= 4) {
                out += k_hex[(c >> shift) & 0xF];
            }
        } else {
            out.append(valid, i, step.length);
        }
        i += step.length;
    }
    return out;
}

std::string clip(std::string_view text, std::size_t max_bytes) {
    if (text.size() <= max_bytes) {
        return std::string(text);
    }
    constexpr std::string_view k_mark = "...";
    if (max_bytes < k_mark.size()) {
        return std::string(k_mark.substr(0, max_bytes));
    }
    std::size_t cut = max_bytes - k_mark.size();
    while (cut > 0 && (static_cast<unsigned char>(text[cut]) & 0xC0) == 0x80) {
        --cut; // never split a UTF-8 sequence
    }
    return std::string(text.substr(0, cut)) + std::string(k_mark);
}

namespace {

struct CodeRange {
    char32_t first;
    char32_t last;
};

// Code points a terminal shows in no column: combining marks (general category Mn/Me) of the
// common scripts, zero-width space and joiners, Hangul medial vowels and final consonants,
// variation selectors, the byte order mark. A subset of Markus Kuhn's wcwidth.c tables and
// glibc's, which the tests compare against (from memory, checked against glibc's wcwidth).
constexpr CodeRange k_zero_width[] = {
    {0x0300, 0x036F}, {0x0483, 0x0489}, {0x0591, 0x05BD},   {0x05BF, 0x05BF}, {0x05C1, 0x05C2},
    {0x05C4, 0x05C5}, {0x05C7, 0x05C7}, {0x0610, 0x061A},   {0x064B, 0x065F}, {0x0670, 0x0670},
    {0x06D6, 0x06DC}, {0x06DF, 0x06E4}, {0x06E7, 0x06E8},   {0x06EA, 0x06ED}, {0x0711, 0x0711},
    {0x0730, 0x074A}, {0x07A6, 0x07B0}, {0x0900, 0x0902},   {0x093A, 0x093A}, {0x093C, 0x093C},
    {0x0941, 0x0948}, {0x094D, 0x094D}, {0x0951, 0x0957},   {0x0962, 0x0963}, {0x0E31, 0x0E31},
    {0x0E34, 0x0E3A}, {0x0E47, 0x0E4E}, {0x1160, 0x11FF},   {0x1AB0, 0x1AFF}, {0x1DC0, 0x1DFF},
    {0x200B, 0x200F}, {0x20D0, 0x20FF}, {0x302A, 0x302D},   {0x3099, 0x309A}, {0xFE00, 0xFE0F},
    {0xFE20, 0xFE2F}, {0xFEFF, 0xFEFF}, {0xE0100, 0xE01EF},
};

// Code points a terminal shows in two columns: East Asian Wide and Fullwidth (UAX #11) and the
// emoji shown wide by default (from memory, checked against glibc's wcwidth).
constexpr CodeRange k_double_width[] = {
    {0x1100, 0x115F},   {0x231A, 0x231B},   {0x2329, 0x232A},   {0x23E9, 0x23EC},
    {0x23F0, 0x23F0},   {0x23F3, 0x23F3},   {0x25FD, 0x25FE},   {0x2614, 0x2615},
    {0x2648, 0x2653},   {0x267F, 0x267F},   {0x2693, 0x2693},   {0x26A1, 0x26A1},
    {0x26AA, 0x26AB},   {0x26BD, 0x26BE},   {0x26C4, 0x26C5},   {0x26CE, 0x26CE},
    {0x26D4, 0x26D4},   {0x26EA, 0x26EA},   {0x26F2, 0x26F3},   {0x26F5, 0x26F5},
    {0x26FA, 0x26FA},   {0x26FD, 0x26FD},   {0x2705, 0x2705},   {0x270A, 0x270B},
    {0x2728, 0x2728},   {0x274C, 0x274C},   {0x274E, 0x274E},   {0x2753, 0x2755},
    {0x2757, 0x2757},   {0x2795, 0x2797},   {0x27B0, 0x27B0},   {0x27BF, 0x27BF},
    {0x2B1B, 0x2B1C},   {0x2B50, 0x2B50},   {0x2B55, 0x2B55},   {0x2E80, 0x303E},
    {0x3041, 0x33FF},   {0x3400, 0x4DBF},   {0x4E00, 0x9FFF},   {0xA000, 0xA4CF},
    {0xA960, 0xA97F},   {0xAC00, 0xD7A3},   {0xF900, 0xFAFF},   {0xFE10, 0xFE19},
    {0xFE30, 0xFE6F},   {0xFF00, 0xFF60},   {0xFFE0, 0xFFE6},   {0x1F300, 0x1F64F},
    {0x1F680, 0x1F6FF}, {0x1F900, 0x1F9FF}, {0x20000, 0x2FFFD}, {0x30000, 0x3FFFD},
};

template <std::size_t N>
bool in_ranges(const CodeRange (&ranges)[N], char32_t c) {
    const auto* it =
        std::upper_bound(std::begin(ranges), std::end(ranges), c,
                         [](char32_t value, const CodeRange& r) { return value < r.first; });
    return it != std::begin(ranges) && c <= (it - 1)->last;
}

std::size_t code_point_width(const Step& step) {
    if (!step.valid) {
        return 1; // shown as one U+FFFD
    }
    if (in_ranges(k_zero_width, step.code_point)) {
        return 0;
    }
    return in_ranges(k_double_width, step.code_point) ? 2 : 1;
}

constexpr std::string_view k_ellipsis = "\xE2\x80\xA6"; // U+2026, one column

} // namespace

std::size_t display_width(std::string_view text) {
    std::size_t width = 0;
    for (std::size_t i = 0; i < text.size();) {
        const Step step = decode(text, i);
        width += code_point_width(step);
        i += step.length;
    }
    return width;
}

std::string clip_columns(std::string_view text, std::size_t columns, CutEnd end) {
    if (display_width(text) <= columns) {
        return std::string(text);
    }
    if (columns == 0) {
        return {};
    }
    // Code points with their byte offsets and widths, so that either end can be walked.
    struct Piece {
        std::size_t at, length, width;
    };
    std::vector<Piece> pieces;
    for (std::size_t i = 0; i < text.size();) {
        const Step step = decode(text, i);
        pieces.push_back({i, step.length, code_point_width(step)});
        i += step.length;
    }
    const std::size_t room = columns - 1; // the ellipsis takes one column
    std::size_t used = 0;
    if (end == CutEnd::right) {
        std::size_t stop = 0;
        while (stop < pieces.size() && used + pieces[stop].width <= room) {
            used += pieces[stop++].width;
        }
        // Marks that join the last kept character stay with it.
        while (stop < pieces.size() && pieces[stop].width == 0) {
            ++stop;
        }
        const std::size_t bytes = stop == pieces.size() ? text.size() : pieces[stop].at;
        return std::string(text.substr(0, bytes)) + std::string(k_ellipsis);
    }
    std::size_t start = pieces.size();
    while (start > 0 && used + pieces[start - 1].width <= room) {
        used += pieces[--start].width;
    }
    // A kept text does not start with a mark that belonged to a cut character.
    while (start < pieces.size() && pieces[start].width == 0) {
        ++start;
    }
    const std::size_t from = start == pieces.size() ? text.size() : pieces[start].at;
    return std::string(k_ellipsis) + std::string(text.substr(from));
}

std::string shell_word(std::string_view text) {
    const bool plain = !text.empty() && std::all_of(text.begin(), text.end(), [](char c) {
        return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') ||
               c == '_' || c == '-' || c == '.' || c == '/' || c == ':' || c == '+' || c == ',' ||
               c == '@' || c == '%' || c == '=';
    });
    if (plain) {
        return std::string(text);
    }
    std::string quoted = "'";
    for (const char c : text) {
        quoted += c == '\'' ? std::string("'\\''") : std::string(1, c);
    }
    return quoted + "'";
}

std::string markdown_text(std::string_view text) {
    const std::string visible = visible_text(text);
    std::string out;
    out.reserve(visible.size() + visible.size() / 4);
    const std::size_t first = visible.find_first_not_of(' ');
    const std::size_t digits_end =
        first == std::string::npos ? first : visible.find_first_not_of("0123456789", first);
    for (std::size_t i = 0; i < visible.size(); ++i) {
        const char c = visible[i];
        if (c == ' ' && i < first) {
            out += "&#32;"; // leading spaces would make a code block or move a list marker
            continue;
        }
        bool escape = false;
        switch (c) {
        case '\\':
        case '`':
        case '*':
        case '_':
        case '~':
        case '[':
        case ']':
        case '<':
        case '>':
        case '&':
        case '|':
        case '$': // GitHub renders $...$ as mathematics
            escape = true;
            break;
        case ':':
            escape = i + 1 < visible.size() && visible[i + 1] == '/'; // "https://" autolinks
            break;
        case '.':
        case ')':
            // "12." or "12)" opens an ordered list; "www." an autolink.
            escape = (i == digits_end && digits_end > first) ||
                     (c == '.' && i >= 3 && (visible[i - 3] | 0x20) == 'w' &&
                      (visible[i - 2] | 0x20) == 'w' && (visible[i - 1] | 0x20) == 'w');
            break;
        default:
            escape = i == first && is_ascii_punctuation(c);
        }
        if (escape) {
            out += '\\';
        }
        out += c;
    }
    return out;
}

std::string markdown_code(std::string_view text, MarkdownPlace place) {
    if (text.empty()) {
        return {};
    }
    std::string content = visible_text(text);
    std::size_t longest = 0;
    for (std::size_t i = 0; i < content.size();) {
        const std::size_t end = content.find_first_not_of('`', i);
        const std::size_t stop = end == std::string::npos ? content.size() : end;
        longest = std::max(longest, stop - i);
        const std::size_t next = content.find('`', stop);
        i = next == std::string::npos ? content.size() : next;
    }
    if (place == MarkdownPlace::table_cell) {
        std::string piped;
        for (const char c : content) {
            piped += c == '|' ? std::string("\\|") : std::string(1, c);
        }
        content = std::move(piped);
    }
    const std::string fence(longest + 1, '`');
    const bool pad = content.front() == '`' || content.back() == '`' ||
                     (content.front() == ' ' && content.back() == ' ');
    return fence + (pad ? " " : "") + content + (pad ? " " : "") + fence;
}

std::string percent_encode(std::string_view text, std::string_view keep) {
    std::string out;
    out.reserve(text.size());
    for (const char c : text) {
        if (is_unreserved(c) || keep.find(c) != std::string_view::npos) {
            out += c;
        } else {
            append_percent(out, static_cast<unsigned char>(c));
        }
    }
    return out;
}

std::string url_text(std::string_view url) {
    constexpr std::string_view k_unsafe = " \"<>\\^`{|}()";
    std::string out;
    out.reserve(url.size());
    for (const char c : url) {
        const auto byte = static_cast<unsigned char>(c);
        if (byte <= 0x20 || byte >= 0x7F || k_unsafe.find(c) != std::string_view::npos) {
            append_percent(out, byte);
        } else {
            out += c;
        }
    }
    return out;
}

std::string html_text(std::string_view text) {
    const std::string visible = visible_text(text);
    std::string out;
    out.reserve(visible.size());
    for (const char c : visible) {
        switch (c) {
        case '&':
            out += "&amp;";
            break;
        case '<':
            out += "&lt;";
            break;
        case '>':
            out += "&gt;";
            break;
        case '"':
            out += "&quot;";
            break;
        case '\'':
            out += "&#39;";
            break;
        default:
            out += c;
        }
    }
    return out;
}

std::string store_bytes(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (std::size_t i = 0; i < text.size();) {
        const Step step = decode(text, i);
        if (!step.valid) {
            for (std::size_t k = 0; k < step.length; ++k) {
                append_percent(out, static_cast<unsigned char>(text[i + k]));
            }
        } else if (text[i] == '%') {
            out += "%25";
        } else {
            out.append(text.substr(i, step.length));
        }
        i += step.length;
    }
    return out;
}

std::optional<std::string> unstore_bytes(std::string_view stored) {
    std::string out;
    out.reserve(stored.size());
    for (std::size_t i = 0; i < stored.size(); ++i) {
        if (stored[i] != '%') {
            out += stored[i];
            continue;
        }
        if (i + 2 >= stored.size()) {
            return std::nullopt;
        }
        const int high = hex_value(stored[i + 1]);
        const int low = hex_value(stored[i + 2]);
        if (high < 0 || low < 0) {
            return std::nullopt;
        }
        out += static_cast<char>(high * 16 + low);
        i += 2;
    }
    // Only the form store_bytes writes is accepted ("%41" for "A" is damage, not data).
    if (store_bytes(out) != stored) {
        return std::nullopt;
    }
    return out;
}

} // namespace tollgate::text
