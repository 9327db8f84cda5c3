// SPDX-License-Identifier: MIT
// Fitting terminal output to a width: tables that shorten names and drop columns, wrapped lines.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

namespace tollgate::report {

// How a column's cells may be shortened when the table is too wide.
enum class Shorten {
    none,     // never shortened
    name,     // a qualified name: leading scopes go first, the last two stay while they can
    location, // PATH:LINE: leading folders go first, the file name and line stay while they can
    text,     // cut at the right
};

// One column of a terminal table.
struct TableColumn {
    std::string title;               // header text
    bool right_aligned = false;      // numbers are right-aligned
    Shorten shorten = Shorten::none; // how cells may be shortened
    int drop_rank = 0;               // 0: never dropped; otherwise dropped in rising rank order
};

// Whether a table is fitted to the width or shown whole.
enum class Fit { to_width, wide };

// Return the lines of a table of `columns` and `rows` (cells already safe for a terminal), two
// spaces between columns, trailing spaces trimmed. With Fit::to_width and a table wider than
// `width` columns (display_width): cells of name and location columns are shortened from the
// left, no further than the last two scopes or the file name, as far as needed; then columns
// are dropped in rising `drop_rank` until the table fits; then name, location and text cells
// are cut further (an ellipsis marking each cut). Fit::wide shows everything.
std::vector<std::string> layout_table(const std::vector<TableColumn>& columns,
                                      const std::vector<std::vector<std::string>>& rows,
                                      std::size_t width, Fit fit);

// Return `name` shortened from the left to at most `columns` display columns: whole leading
// scopes ("a::b::") are replaced by an ellipsis while more than `keep_scopes` scopes remain,
// then, if still too wide, characters; `name` itself when it fits. Template arguments and
// parameter lists count as part of their scope.
std::string shorten_name(const std::string& name, std::size_t columns, std::size_t keep_scopes);

// Return `location` ("PATH:LINE") shortened from the left to at most `columns` display columns:
// leading folders go first (replaced by an ellipsis), then characters; the line number stays.
std::string shorten_location(const std::string& location, std::size_t columns);

// Return `text` broken into lines of at most `width` display columns at spaces (a word longer
// than a line is broken inside), each line after the first indented by `indent` spaces. With
// Fit::wide, `text` is one line. Never returns an empty list.
std::vector<std::string> wrap_text(const std::string& text, std::size_t width, std::size_t indent,
                                   Fit fit);

} // namespace tollgate::report
