// SPDX-License-Identifier: MIT
// Test support: load a page in Debian's headless Chromium and read the DOM it ends with, after
// the page's own scripts ran. The flags are the ones this machine's Chromium needs (no network:
// no background networking, updates or sync; a fresh profile).
#pragma once

#include "support/temp_repo.hpp"

#include <optional>
#include <string>

namespace tollgate::test {

// Return whether `chromium` is on the PATH.
inline bool have_chromium() {
    return run_command("command -v chromium", ".").exit_code == 0;
}

// Return the DOM of `page` (a file path) after loading, as Chromium's --dump-dom prints it, or
// nothing when Chromium failed.
inline std::optional<std::string> dump_dom(const std::string& page) {
    TempDir profile;
    const auto dom =
        run_command("chromium --headless --no-sandbox --disable-gpu --disable-quic "
                    "--disable-background-networking --disable-component-update --disable-sync "
                    "--no-first-run --user-data-dir=" +
                        shell_quote(profile.path()) + " --dump-dom " +
                        shell_quote("file://" + page) + " 2>/dev/null",
                    profile.path());
    if (dom.exit_code != 0) {
        return std::nullopt;
    }
    return dom.out;
}

// Return `html` with the character references an HTML serialiser writes in text (&amp; &lt;
// &gt; &quot; &nbsp;) turned back into characters.
inline std::string unescape_html(const std::string& html) {
    std::string out;
    for (std::size_t i = 0; i < html.size(); ++i) {
        bool replaced = false;
        for (const auto& [entity, text] : {std::pair<const char*, const char*>{"&amp;", "&"},
                                           {"&lt;", "<"},
                                           {"&gt;", ">"},
                                           {"&quot;", "\""},
                                           {"&nbsp;", "\xC2\xA0"}}) {
            const std::string e(entity);
            if (html.compare(i, e.size(), e) == 0) {
                out += text;
                i += e.size() - 1;
                replaced = true;
                break;
            }
        }
        if (!replaced) {
            out += html[i];
        }
    }
    return out;
}

} // namespace tollgate::test
