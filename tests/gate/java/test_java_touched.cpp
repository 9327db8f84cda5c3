// SPDX-License-Identifier: MIT
// The touched set of Java changes against two outside references: git's own `git diff -U0` for
// the changed lines and Universal Ctags (Debian's universal-ctags) for method extents, on a
// scripted history of an invented ground-station service.
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#if TOLLGATE_JAVA_ENABLED

using namespace tollgate::test;

namespace {

using Lines = std::map<std::string, std::set<unsigned>>; // path -> changed lines

struct DiffSides {
    Lines base; // deleted or replaced lines, per base path
    Lines head; // added or replacing lines, per head path
};

void add_range(const std::string& text, std::set<unsigned>& lines) {
    const auto comma = text.find(',');
    const unsigned start = static_cast<unsigned>(std::stoul(text.substr(0, comma)));
    const unsigned count =
        comma == std::string::npos ? 1U : static_cast<unsigned>(std::stoul(text.substr(comma + 1)));
    for (unsigned line = start; line < start + count; ++line) {
        lines.insert(line);
    }
}

// Git's own changed lines between `base` and `head` (renames detected, as the gate does).
DiffSides git_changed_lines(const std::string& dir, const std::string& base,
                            const std::string& head) {
    const std::string out = git("-c core.quotePath=false diff -U0 --no-color --no-ext-diff "
                                "--diff-algorithm=myers --src-prefix=a/ --dst-prefix=b/ -M " +
                                    base + " " + head,
                                dir);
    DiffSides sides;
    std::istringstream lines(out);
    std::string line;
    std::string base_path;
    std::string head_path;
    while (std::getline(lines, line)) {
        if (line.rfind("--- ", 0) == 0) {
            base_path = line == "--- /dev/null" ? "" : line.substr(6);
        } else if (line.rfind("+++ ", 0) == 0) {
            head_path = line == "+++ /dev/null" ? "" : line.substr(6);
        } else if (line.rfind("@@ -", 0) == 0) {
            const auto plus = line.find(" +", 4);
            const auto end = line.find(" @@", plus);
            if (!base_path.empty()) {
                add_range(line.substr(4, plus - 4), sides.base[base_path]);
            }
            if (!head_path.empty()) {
                add_range(line.substr(plus + 2, end - plus - 2), sides.head[head_path]);
            }
        }
    }
    return sides;
}

struct Extent {
    std::string name; // package, scope and name joined with "."
    unsigned line = 0;
    unsigned end = 0;
};

// The methods ctags finds in `path` at `revision`, without those nested in another method's
// extent (methods of local and anonymous classes belong to their enclosing method).
std::vector<Extent> ctags_methods(const std::string& dir, const std::string& revision,
                                  const std::string& path, const TempDir& scratch) {
    const std::string copy =
        scratch.path() + "/" + std::to_string(std::hash<std::string>{}(revision + path)) + ".java";
    scratch.write(copy.substr(scratch.path().size() + 1),
                  git("show " + revision + ":" + path, dir));
    const auto run = run_command(
        "ctags --output-format=json --fields=+nes --languages=Java -f - " + shell_quote(copy), dir);
    REQUIRE(run.exit_code == 0);
    std::string package;
    std::vector<Extent> methods;
    std::istringstream lines(run.out);
    std::string line;
    while (std::getline(lines, line)) {
        const auto tag = nlohmann::json::parse(line);
        if (tag["kind"] == "package") {
            package = tag["name"];
        } else if (tag["kind"] == "method" && tag.contains("end")) {
            Extent extent;
            extent.name = tag.contains("scope") ? tag["scope"].get<std::string>() + "." +
                                                      tag["name"].get<std::string>()
                                                : tag["name"].get<std::string>();
            extent.line = tag["line"];
            extent.end = tag["end"];
            methods.push_back(extent);
        }
    }
    std::vector<Extent> outer;
    for (const auto& m : methods) {
        const bool nested = std::any_of(methods.begin(), methods.end(), [&](const Extent& o) {
            return &o != &m && o.line <= m.line && m.end <= o.end &&
                   (o.line != m.line || o.end != m.end);
        });
        if (!nested) {
            outer.push_back(m);
            outer.back().name = package.empty() ? m.name : package + "." + m.name;
        }
    }
    return outer;
}

// The reference touched set: methods of either side whose ctags extent meets a changed line.
std::set<std::string> reference_touched(const std::string& dir, const std::string& base,
                                        const std::string& head, const TempDir& scratch) {
    const DiffSides sides = git_changed_lines(dir, base, head);
    std::set<std::string> touched;
    for (const auto& [revision, lines] :
         {std::make_pair(base, &sides.base), std::make_pair(head, &sides.head)}) {
        for (const auto& [path, changed] : *lines) {
            for (const Extent& method : ctags_methods(dir, revision, path, scratch)) {
                const auto hit = changed.lower_bound(method.line);
                if (hit != changed.end() && *hit <= method.end) {
                    touched.insert(method.name);
                }
            }
        }
    }
    return touched;
}

std::set<std::string> gate_touched(const std::string& dir, const std::string& base,
                                   const std::string& head) {
    const auto result = run_tollgate(
        "check --no-pch-cache --base " + base + " --head " + head + " --report json:-", dir);
    INFO(result.err);
    REQUIRE(result.exit_code == 0);
    const auto report = nlohmann::json::parse(result.out);
    std::set<std::string> touched;
    for (const auto& f : report["functions"]) {
        touched.insert(f["function"].get<std::string>());
    }
    return touched;
}

const char* const k_station = R"(package com.skyline.ground;

import java.util.ArrayList;
import java.util.List;

public class StationLink {
    private final List<String> log = new ArrayList<>();
    private int retries;

    public StationLink(int retries) {
        this.retries = retries;
    }

    public boolean connect(String host) {
        for (int attempt = 0; attempt < retries; attempt++) {
            if (tryOnce(host, attempt)) {
                return true;
            }
        }
        return false;
    }

    private boolean tryOnce(String host, int attempt) {
        log.add(host + "#" + attempt);
        return attempt > 1;
    }

    public Runnable heartbeat() {
        return new Runnable() {
            public void run() {
                log.add("beat");
            }
        };
    }

    static class Backoff {
        long delay(int attempt) {
            return 100L << Math.min(attempt, 6);
        }
    }
}
)";

const char* const k_units = R"(package com.skyline.ground;

public final class Units {
    private Units() {
    }

    public static double toFahrenheit(double celsius) {
        return celsius * 9.0 / 5.0 + 32.0;
    }

    public static double toInches(double millimetres) {
        return millimetres / 25.4;
    }
}
)";

std::string replace(std::string text, const std::string& from, const std::string& to) {
    const auto at = text.find(from);
    REQUIRE(at != std::string::npos);
    return text.replace(at, from.size(), to);
}

} // namespace

TEST_CASE("check's touched Java methods agree with git diff -U0 and ctags extents", "[java]") {
    TempDir dir;
    TempDir scratch;
    init_repo(dir.path());
    dir.write("ground/StationLink.java", k_station);
    dir.write("ground/Units.java", k_units);
    std::vector<std::string> commits = {commit_all(dir.path(), "ground station link")};

    // 1: a body edit, a comment inside a method, an edit inside an anonymous class.
    std::string station = replace(k_station, "return attempt > 1;", "return attempt > 2;");
    station = replace(station, "        return false;\n    }",
                      "        // every attempt failed\n        return false;\n    }");
    station = replace(station, "log.add(\"beat\");", "log.add(\"beat \" + retries);");
    dir.write("ground/StationLink.java", station);
    commits.push_back(commit_all(dir.path(), "edits"));

    // 2: a method added, one removed, lines inserted above others (extents shift untouched).
    std::string units = replace(k_units,
                                "    public static double toInches(double millimetres) {\n"
                                "        return millimetres / 25.4;\n    }\n",
                                "    public static double toKelvin(double celsius) {\n"
                                "        return celsius + 273.15;\n    }\n");
    units = replace(units, "public final class Units {\n",
                    "public final class Units {\n    // conversions for the console\n\n");
    dir.write("ground/Units.java", units);
    commits.push_back(commit_all(dir.path(), "kelvin"));

    // 3: a file renamed with a small edit, a nested class's method changed.
    git("mv ground/Units.java ground/Conversions.java", dir.path());
    dir.write("ground/Conversions.java", replace(replace(units, "class Units", "class Conversions"),
                                                 "private Units()", "private Conversions()"));
    dir.write("ground/StationLink.java",
              replace(station, "Math.min(attempt, 6)", "Math.min(attempt + 1, 8)"));
    commits.push_back(commit_all(dir.path(), "rename"));

    // 4: a signature change and a method moved to the end of the class.
    station = read_text(dir.path() + "/ground/StationLink.java");
    station = replace(station, "public boolean connect(String host)",
                      "public boolean connect(CharSequence host)");
    station = replace(station,
                      "    private boolean tryOnce(String host, int attempt) {\n"
                      "        log.add(host + \"#\" + attempt);\n"
                      "        return attempt > 2;\n    }\n\n",
                      "");
    station = replace(station, "    static class Backoff {",
                      "    private boolean tryOnce(CharSequence host, int attempt) {\n"
                      "        log.add(host + \"#\" + attempt);\n"
                      "        return attempt > 2;\n    }\n\n    static class Backoff {");
    dir.write("ground/StationLink.java", station);
    commits.push_back(commit_all(dir.path(), "signatures"));

    std::size_t compared = 0;
    for (std::size_t i = 1; i < commits.size(); ++i) {
        CAPTURE(i);
        const auto expected = reference_touched(dir.path(), commits[i - 1], commits[i], scratch);
        CHECK_FALSE(expected.empty());
        CHECK(gate_touched(dir.path(), commits[i - 1], commits[i]) == expected);
        compared += expected.size();
    }
    CHECK(compared >= 10);
}

#endif
