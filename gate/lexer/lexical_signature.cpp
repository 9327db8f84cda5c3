// SPDX-License-Identifier: MIT
// What the lexical scan reads from a definition's header: written name, parameters, result.
#include "gate/lexer/lexical_signature.hpp"

#include "gate/lexer/lexical_scan.hpp"
#include "gate/lexer/macro_names.hpp"

namespace tollgate::lexer {

namespace {

bool is_open(const SourceToken& token) {
    return is_punct(token, "(") || is_punct(token, "[") || is_punct(token, "{");
}

bool is_close(const SourceToken& token) {
    return is_punct(token, ")") || is_punct(token, "]") || is_punct(token, "}");
}

// Join tokens as a type is usually written: "const char *", "std::vector<int> &".
std::string join_type(const std::vector<SourceToken>& tokens, std::size_t begin, std::size_t end) {
    std::string text;
    for (std::size_t i = begin; i < end; ++i) {
        const std::string& s = tokens[i].spelling;
        const bool glue_left = s == "::" || s == "," || s == ">" || s == ">>" || s == ")" ||
                               s == "]" || s == "<" || s == "[";
        const bool glue_right = !text.empty() && (text.back() == ':' || text.back() == '<' ||
                                                  text.back() == '(' || text.back() == '[');
        if (!text.empty() && !glue_left && !glue_right) {
            text += ' ';
        }
        if (s == "," && !text.empty()) {
            text += ", ";
            continue;
        }
        text += s;
    }
    while (!text.empty() && text.back() == ' ') {
        text.pop_back();
    }
    return text;
}

} // namespace

// Describe the parameter list opened at `open`: types without names or default values.
Parameters describe_parameters(const std::vector<SourceToken>& tokens, std::size_t open) {
    Parameters result;
    const std::size_t close = match_bracket(tokens, open);
    if (close >= tokens.size() || close == open + 1) {
        return result;
    }
    if (close == open + 2 && is_keyword(tokens[open + 1], "void")) {
        return result;
    }
    std::vector<std::string> types;
    std::size_t begin = open + 1;
    int depth = 0;
    for (std::size_t i = open + 1; i <= close; ++i) {
        const SourceToken& token = tokens[i];
        if (i < close && (is_open(token) || is_punct(token, "<"))) {
            ++depth;
            continue;
        }
        if (i < close && (is_close(token) || is_punct(token, ">"))) {
            --depth;
            continue;
        }
        if (i < close && is_punct(token, ">>")) {
            depth -= 2;
            continue;
        }
        if (i == close || (depth == 0 && is_punct(token, ","))) {
            std::size_t end = i;
            for (std::size_t j = begin; j < i; ++j) {
                if (is_punct(tokens[j], "=")) {
                    end = j;
                    break;
                }
            }
            // Drop the parameter name: a final identifier after at least one type token.
            if (end > begin + 1 && tokens[end - 1].kind == core::LexKind::identifier) {
                --end;
            }
            types.push_back(join_type(tokens, begin, end));
            begin = i + 1;
        }
    }
    result.count = types.size();
    for (std::size_t i = 0; i < types.size(); ++i) {
        result.signature += (i == 0 ? "" : ", ") + types[i];
    }
    return result;
}

// Return the written name, from the start of its qualification to the parameter list:
// "Box::put", "operator+", "~Box", "Box::operator int".
std::string written_name(const std::vector<SourceToken>& tokens, std::size_t name, std::size_t open,
                         std::size_t statement_start) {
    std::string text;
    if (is_keyword(tokens[name], "operator")) {
        text = join_written(tokens, name, open);
    } else {
        text = tokens[name].spelling;
    }
    // Walk back over `~` and `Qualifier<...>::` parts.
    std::size_t i = name;
    if (i > statement_start && is_punct(tokens[i - 1], "~")) {
        text = "~" + text;
        --i;
    }
    while (i >= statement_start + 2 && is_punct(tokens[i - 1], "::")) {
        std::size_t q = i - 2;
        if (is_punct(tokens[q], ">")) {
            int depth = 0;
            while (q > statement_start) {
                if (is_punct(tokens[q], ">")) {
                    ++depth;
                } else if (is_punct(tokens[q], "<")) {
                    if (--depth == 0) {
                        break;
                    }
                }
                --q;
            }
            if (q == statement_start) {
                break;
            }
            --q;
        }
        if (tokens[q].kind != core::LexKind::identifier) {
            break;
        }
        text = tokens[q].spelling + "::" + text;
        i = q;
    }
    return text;
}

// Return true when the tokens before the name declare a result other than void.
bool has_result(const std::vector<SourceToken>& tokens, std::size_t first, std::size_t name,
                std::size_t body_open, const std::string& written, const std::string& class_name) {
    for (std::size_t i = name; i < body_open; ++i) {
        if (is_punct(tokens[i], "->")) {
            return !(i + 1 < body_open && is_keyword(tokens[i + 1], "void") && i + 2 == body_open);
        }
    }
    const auto last = written.rfind("::");
    const std::string base = last == std::string::npos ? written : written.substr(last + 2);
    if (!base.empty() && base[0] == '~') {
        return false;
    }
    if (last != std::string::npos) {
        const std::string qualifier = written.substr(0, last);
        const auto q = qualifier.rfind("::");
        const std::string owner = q == std::string::npos ? qualifier : qualifier.substr(q + 2);
        if (owner == base) {
            return false; // constructor
        }
    } else if (!class_name.empty() && base == class_name) {
        return false; // constructor declared in the class body
    }
    if (base.rfind("operator ", 0) == 0 &&
        base.find_first_of("+-*/&|<>=!~%^[]()") == std::string::npos) {
        return true; // conversion function
    }
    std::vector<std::string> words;
    for (std::size_t i = first; i < name; ++i) {
        const SourceToken& token = tokens[i];
        if (is_keyword(token, "template") && i + 1 < name && is_punct(tokens[i + 1], "<")) {
            const std::size_t close = match_bracket(tokens, i + 1);
            if (close >= name) {
                break;
            }
            i = close;
            continue;
        }
        if (token.kind == core::LexKind::keyword &&
            (token.spelling == "static" || token.spelling == "inline" ||
             token.spelling == "virtual" || token.spelling == "extern" ||
             token.spelling == "constexpr" || token.spelling == "explicit" ||
             token.spelling == "friend")) {
            continue;
        }
        if (is_punct(token, "::") || is_punct(token, "~")) {
            break; // the qualification of the name itself
        }
        words.push_back(token.spelling);
    }
    if (words.size() == 1 && words[0] == "void") {
        return false;
    }
    // Nothing before the name: a constructor, or C89's implicit int.
    return !words.empty() || class_name.empty();
}

} // namespace tollgate::lexer
