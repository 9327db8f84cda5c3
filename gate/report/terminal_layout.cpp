// SPDX-License-Identifier: MIT
// Terminal tables fitted to a width, and lines wrapped at spaces.
#include "gate/report/terminal_layout.hpp"

#include "gate/common/text_safety.hpp"

#include <algorithm>
#include <numeric>

namespace tollgate::report {

namespace {

using text::clip_columns;
using text::CutEnd;
using text::display_width;

constexpr std::size_t k_gap = 2;                   // spaces between columns
constexpr std::size_t k_keep_scopes = 2;           // scopes a shortened name keeps while it can
constexpr const char* k_ellipsis = "\xE2\x80\xA6"; // U+2026, one column

// Split `name` at "::" outside template arguments, parameter lists and brackets.
std::vector<std::string> scopes_of(const std::string& name) {
    std::vector<std::string> scopes;
    int depth = 0;
    std::size_t start = 0;
    for (std::size_t i = 0; i < name.size(); ++i) {
        const char c = name[i];
        if (c == '<' || c == '(' || c == '[') {
            ++depth;
        } else if (c == '>' || c == ')' || c == ']') {
            depth = std::max(0, depth - 1); // operator> and operator-> close nothing
        } else if (depth == 0 && c == ':' && i + 1 < name.size() && name[i + 1] == ':') {
            scopes.push_back(name.substr(start, i - start));
            start = i + 2;
            ++i;
        }
    }
    scopes.push_back(name.substr(start));
    return scopes;
}

std::string join(const std::vector<std::string>& parts, std::size_t from, const char* separator) {
    std::string joined;
    for (std::size_t i = from; i < parts.size(); ++i) {
        joined += (i == from ? "" : separator) + parts[i];
    }
    return joined;
}

// The narrowest a column's cells get by shortening whole scopes or folders only.
std::size_t least_width(const TableColumn& column, const std::string& cell) {
    switch (column.shorten) {
    case Shorten::name:
        return display_width(shorten_name(cell, 0, k_keep_scopes).empty()
                                 ? cell
                                 : shorten_name(cell, 0, k_keep_scopes));
    case Shorten::location:
        return display_width(shorten_location(cell, 0));
    case Shorten::none:
    case Shorten::text:
        break;
    }
    return display_width(cell);
}

std::string fit_cell(const TableColumn& column, const std::string& cell, std::size_t width) {
    switch (column.shorten) {
    case Shorten::name:
        return shorten_name(cell, width, k_keep_scopes);
    case Shorten::location:
        return shorten_location(cell, width);
    case Shorten::text:
        return clip_columns(cell, width, CutEnd::right);
    case Shorten::none:
        break;
    }
    return cell;
}

std::string pad(const std::string& cell, std::size_t width, bool right) {
    const std::size_t used = display_width(cell);
    const std::string spaces(width > used ? width - used : 0, ' ');
    return right ? spaces + cell : cell + spaces;
}

// Narrow the shrinkable columns (widest first) until the table fits `width` or none is above
// its floor.
void narrow(std::vector<std::size_t>& widths, const std::vector<std::size_t>& floors,
            const std::vector<bool>& shrinkable, std::size_t width) {
    const auto total = [&] {
        std::size_t sum = 0, shown = 0;
        for (std::size_t c = 0; c < widths.size(); ++c) {
            sum += widths[c];
            shown += widths[c] > 0 || floors[c] > 0 ? 1 : 0;
        }
        return sum + (shown > 0 ? (shown - 1) * k_gap : 0);
    };
    for (std::size_t now = total(); now > width;) {
        std::size_t widest = widths.size();
        for (std::size_t c = 0; c < widths.size(); ++c) {
            if (shrinkable[c] && widths[c] > floors[c] &&
                (widest == widths.size() || widths[c] > widths[widest])) {
                widest = c;
            }
        }
        if (widest == widths.size()) {
            return;
        }
        --widths[widest];
        --now;
    }
}

} // namespace

std::string shorten_name(const std::string& name, std::size_t columns, std::size_t keep_scopes) {
    if (display_width(name) <= columns) {
        return name;
    }
    const auto scopes = scopes_of(name);
    std::string shortest = name;
    for (std::size_t drop = 1; drop + keep_scopes <= scopes.size(); ++drop) {
        shortest = std::string(k_ellipsis) + "::" + join(scopes, drop, "::");
        if (display_width(shortest) <= columns) {
            return shortest;
        }
    }
    if (columns == 0) {
        return shortest == name ? std::string() : shortest; // the narrowest by whole scopes
    }
    const bool dropped = scopes.size() > keep_scopes;
    const std::string tail = join(scopes, dropped ? scopes.size() - keep_scopes : 0, "::");
    if (dropped && display_width(tail) < columns) {
        return std::string(k_ellipsis) + tail;
    }
    return clip_columns(tail, columns, CutEnd::left);
}

std::string shorten_location(const std::string& location, std::size_t columns) {
    if (columns > 0 && display_width(location) <= columns) {
        return location;
    }
    const auto colon = location.rfind(':');
    const bool has_line = colon != std::string::npos && colon + 1 < location.size() &&
                          location.find_first_not_of("0123456789", colon + 1) == std::string::npos;
    const std::string path = has_line ? location.substr(0, colon) : location;
    const std::string line = has_line ? location.substr(colon) : std::string();
    std::vector<std::string> folders;
    for (std::size_t start = 0;;) {
        const auto slash = path.find('/', start);
        folders.push_back(path.substr(start, slash == std::string::npos ? slash : slash - start));
        if (slash == std::string::npos) {
            break;
        }
        start = slash + 1;
    }
    std::string shortest = location;
    for (std::size_t drop = 1; drop < folders.size(); ++drop) {
        shortest = std::string(k_ellipsis) + "/" + join(folders, drop, "/") + line;
        if (columns > 0 && display_width(shortest) <= columns) {
            return shortest;
        }
    }
    if (columns == 0) {
        return shortest;
    }
    const std::size_t line_width = display_width(line);
    if (columns <= line_width) {
        return clip_columns(location, columns, CutEnd::left);
    }
    return clip_columns(folders.back(), columns - line_width, CutEnd::left) + line;
}

std::vector<std::string> layout_table(const std::vector<TableColumn>& columns,
                                      const std::vector<std::vector<std::string>>& rows,
                                      std::size_t width, Fit fit) {
    const std::size_t count = columns.size();
    std::vector<std::size_t> natural(count), least(count), floors(count);
    std::vector<bool> shrinkable(count), shown(count);
    for (std::size_t c = 0; c < count; ++c) {
        natural[c] = least[c] = display_width(columns[c].title);
        for (const auto& row : rows) {
            natural[c] = std::max(natural[c], display_width(row[c]));
            least[c] = std::max(least[c], least_width(columns[c], row[c]));
        }
        least[c] = std::min(least[c], natural[c]);
        shrinkable[c] = columns[c].shorten != Shorten::none;
        floors[c] = std::max<std::size_t>(display_width(columns[c].title), 6);
        floors[c] = std::min(floors[c], natural[c]);
        shown[c] = natural[c] > 0; // a column with nothing in it takes no room
    }
    std::vector<std::size_t> widths = natural;
    const auto total_of = [&](const std::vector<std::size_t>& w) {
        std::size_t sum = 0, n = 0;
        for (std::size_t c = 0; c < count; ++c) {
            if (shown[c]) {
                sum += w[c];
                ++n;
            }
        }
        return sum + (n > 0 ? (n - 1) * k_gap : 0);
    };
    if (fit == Fit::to_width && total_of(natural) > width) {
        // Drop columns while even whole-scope shortening cannot make the table fit.
        std::vector<std::size_t> order(count);
        std::iota(order.begin(), order.end(), 0);
        std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
            return columns[a].drop_rank < columns[b].drop_rank;
        });
        for (const std::size_t c : order) {
            if (total_of(least) <= width) {
                break;
            }
            if (columns[c].drop_rank > 0) {
                shown[c] = false;
            }
        }
        std::vector<std::size_t> used(count, 0), used_floor(count, 0);
        std::vector<bool> used_shrinkable(count, false);
        for (std::size_t c = 0; c < count; ++c) {
            if (shown[c]) {
                used[c] = natural[c];
                used_floor[c] = columns[c].shorten == Shorten::text ? natural[c] : least[c];
                used_shrinkable[c] = shrinkable[c];
            }
        }
        // First down to whole scopes and folders, then further when that is not enough.
        narrow(used, used_floor, used_shrinkable, width);
        for (std::size_t c = 0; c < count; ++c) {
            used_floor[c] = shown[c] ? std::min(used_floor[c], floors[c]) : 0;
        }
        narrow(used, used_floor, used_shrinkable, width);
        widths = used;
    }
    // Shortened cells may all end up narrower than their column: give the room back.
    std::vector<std::vector<std::string>> fitted;
    for (const auto& row : rows) {
        std::vector<std::string> cells;
        for (std::size_t c = 0; c < count; ++c) {
            cells.push_back(shown[c] ? fit_cell(columns[c], row[c], widths[c]) : std::string());
        }
        fitted.push_back(std::move(cells));
    }
    for (std::size_t c = 0; c < count && fit == Fit::to_width; ++c) {
        std::size_t used = std::min(widths[c], display_width(columns[c].title));
        for (const auto& cells : fitted) {
            used = std::max(used, display_width(cells[c]));
        }
        widths[c] = std::min(widths[c], used);
    }
    std::vector<std::string> lines;
    const auto emit = [&](const std::vector<std::string>& cells, bool header) {
        std::string line;
        bool first = true;
        for (std::size_t c = 0; c < count; ++c) {
            if (!shown[c]) {
                continue;
            }
            const std::string& cell = cells[c];
            line += (first ? "" : std::string(k_gap, ' ')) +
                    pad(header ? clip_columns(cell, widths[c], CutEnd::right) : cell, widths[c],
                        columns[c].right_aligned);
            first = false;
        }
        while (!line.empty() && line.back() == ' ') {
            line.pop_back();
        }
        lines.push_back(line);
    };
    std::vector<std::string> titles;
    for (const auto& column : columns) {
        titles.push_back(column.title);
    }
    emit(titles, true);
    for (const auto& cells : fitted) {
        emit(cells, false);
    }
    return lines;
}

std::vector<std::string> wrap_text(const std::string& text, std::size_t width, std::size_t indent,
                                   Fit fit) {
    if (fit == Fit::wide || display_width(text) <= width || width <= indent + 8) {
        return {text};
    }
    std::vector<std::string> lines;
    std::string line;
    std::size_t used = 0;
    std::size_t room = width;
    const std::string margin(indent, ' ');
    const auto finish = [&] {
        while (!line.empty() && line.back() == ' ') {
            line.pop_back();
        }
        lines.push_back(line);
        line = margin;
        used = indent;
        room = width;
    };
    // Leading spaces belong to the first line.
    const std::size_t lead = std::min(text.find_first_not_of(' '), text.size());
    line = text.substr(0, lead);
    used = lead;
    std::size_t pos = lead;
    while (pos < text.size()) {
        const auto space = text.find(' ', pos);
        std::string word = text.substr(pos, space == std::string::npos ? space : space - pos);
        pos = space == std::string::npos ? text.size() : space + 1;
        std::size_t word_width = display_width(word);
        const std::size_t separator = used > (lines.empty() ? lead : indent) ? 1 : 0;
        if (used + separator + word_width <= room) {
            line += (separator != 0 ? " " : "") + word;
            used += separator + word_width;
            continue;
        }
        if (used > (lines.empty() ? lead : indent)) {
            finish();
        }
        // A word wider than a whole line is broken inside.
        while (used + word_width > room) {
            const std::string piece = clip_columns(word, room - used + 1, CutEnd::right);
            // clip_columns ends the piece with an ellipsis: keep the text, not the mark.
            const std::string kept = piece.substr(0, piece.size() - 3);
            if (kept.empty()) {
                break;
            }
            line += kept;
            word = word.substr(kept.size());
            word_width = display_width(word);
            finish();
        }
        line += word;
        used += word_width;
    }
    if (!line.empty() && line != margin) {
        finish();
    }
    return lines.empty() ? std::vector<std::string>{text} : lines;
}

} // namespace tollgate::report
