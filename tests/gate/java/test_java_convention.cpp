// SPDX-License-Identifier: MIT
// Convention java/1 applied by the Java front end (core/README.md, "The counting convention
// java/1"). The expected counts are ours, counted by hand: no published worked example of
// Halstead counts for a Java program was available.
#include "java_test_support.hpp"
#include "tollgate/core/classify_java.hpp"

#if TOLLGATE_JAVA_ENABLED

using namespace tollgate;
using core::Role;
using test::java_function;
using test::lex_java;
using test::table;

TEST_CASE("lex_java_file counts a small method by hand", "[java]") {
    // Ours, hand-counted under java/1.
    const auto file = lex_java(R"(class Stats {
    static int average(int[] xs, int n) {
        int sum = 0;
        for (int i = 0; i < n; i++) {
            sum += xs[i];
        }
        return n == 0 ? 0 : sum / n;
    }
})");
    REQUIRE(file.functions.size() == 1);
    const auto& average = file.functions[0];
    CHECK(average.qualified_name == "Stats.average");
    CHECK(average.signature == "int[], int");
    CHECK(average.potential_operands == 3);
    CHECK(average.start_line == 2);
    CHECK(average.end_line == 8);
    CHECK(table(average, Role::operator_token) ==
          std::map<std::string, std::uint64_t>{{"static", 1},
                                               {"int", 5},
                                               {"average", 1},
                                               {"()", 2},
                                               {"[]", 2},
                                               {",", 1},
                                               {"{}", 2},
                                               {"=", 2},
                                               {";", 5},
                                               {"for", 1},
                                               {"<", 1},
                                               {"++ (postfix)", 1},
                                               {"+=", 1},
                                               {"return", 1},
                                               {"==", 1},
                                               {"?:", 1},
                                               {"/", 1}});
    CHECK(
        table(average, Role::operand_token) ==
        std::map<std::string, std::uint64_t>{{"xs", 2}, {"n", 4}, {"sum", 3}, {"0", 4}, {"i", 4}});
}

TEST_CASE("lex_java_file applies the java/1 rules", "[java]") {
    const auto file = lex_java(R"(package p;
import java.util.*;
class Rules {
    @Override
    public String toString() {
        Map<String, List<Integer>> m = new HashMap<>();
        List<? extends Number> w = null;
        Runnable r = () -> System.out.println(this);
        java.util.function.Function<String, Integer> f = Integer::parseInt;
        int y = -x - 1 + +x;
        ++y; y--;
        return super.toString() + Math.max(y, 0);
    }
})");
    const auto& f = java_function(file, "Rules.toString");
    CHECK(f.qualified_name == "p.Rules.toString");
    const auto operators = table(f, Role::operator_token);
    const auto operands = table(f, Role::operand_token);
    SECTION("type argument lists count once each, the diamond too, however they close") {
        CHECK(operators.at("<>") == 5);
        CHECK(operators.count(">") == 0);
        CHECK(operators.count(">>") == 0);
    }
    SECTION("a wildcard's ? is not the conditional") {
        CHECK(operators.at("? (wildcard)") == 1);
        CHECK(operators.count("?:") == 0);
    }
    SECTION("an annotation is one operator with its @ and name") {
        CHECK(operators.at("@Override") == 1);
        CHECK(operators.count("@") == 0);
        CHECK(operators.count("Override") == 0);
    }
    SECTION("lambda arrows and method references are operators, the referenced method too") {
        CHECK(operators.at("->") == 1);
        CHECK(operators.at("::") == 1);
        CHECK(operators.at("parseInt") == 1);
    }
    SECTION("type names are operators wherever they stand, qualifiers by the file and spelling") {
        CHECK(operators.at("Integer") == 3); // two type arguments and a method reference
        CHECK(operators.at("String") == 3);  // result type and two type arguments
        CHECK(operators.at("Math") == 1);
        CHECK(operators.at("System") == 1);
        CHECK(operators.at("java") == 1); // a qualified type name: every part names a type
        CHECK(operands.at("out") == 1);
        CHECK(operators.at("println") == 1);
        CHECK(operators.at("max") == 1);
    }
    SECTION("this, super and null are operands") {
        CHECK(operands.at("this") == 1);
        CHECK(operands.at("super") == 1);
        CHECK(operands.at("null") == 1);
    }
    SECTION("unary and binary forms, prefix and postfix forms count apart") {
        CHECK(operators.at("- (unary)") == 1);
        CHECK(operators.at("-") == 1);
        CHECK(operators.at("+ (unary)") == 1);
        CHECK(operators.at("+") == 2);
        CHECK(operators.at("++ (prefix)") == 1);
        CHECK(operators.at("-- (postfix)") == 1);
    }
    SECTION("the defined method's own name is an operator") {
        CHECK(operators.at("toString") == 2); // defined, and called on super
    }
}

TEST_CASE("lex_java_file tells forms that share a spelling apart", "[java]") {
    const auto file = lex_java(R"(class Forms {
    <T extends Comparable<T> & java.io.Serializable> int forms(java.util.List<T> items, int k) {
        int total = 0;
        outer:
        for (T item : items) {
            try {
                total += switch (k) {
                    case 1 -> 10;
                    default -> k > 2 ? k < 5 ? 1 : 2 : 3;
                };
            } catch (IllegalStateException | IllegalArgumentException e) {
                break outer;
            }
        }
        assert total >= 0 : "negative";
        return total;
    }
})");
    const auto& f = java_function(file, "Forms.forms");
    const auto operators = table(f, Role::operator_token);
    CHECK(operators.at("& (bound)") == 1);
    CHECK(operators.count("&") == 0);
    CHECK(operators.at("| (catch)") == 1);
    CHECK(operators.at("-> (case)") == 2);
    CHECK(operators.count("->") == 0);
    CHECK(operators.at("?:") == 2);
    CHECK(operators.at(":") == 3); // label, enhanced for, assert
    CHECK(operators.at("<>") == 3);
    CHECK(operators.at(">") == 1); // k > 2 is a comparison
    CHECK(operators.at("<") == 1); // k < 5 is a comparison
    CHECK(f.signature == "java.util.List<T>, int");
}

TEST_CASE("lex_java_file lists functions as C++ does: nested members apart, local code inside",
          "[java]") {
    const auto file = lex_java(R"(package p.q;
import java.util.Comparator;
abstract class Outer {
    static Comparator<String> ORDER = (a, b) -> a.compareTo(b);
    abstract void hook();
    static { init(); }
    { count = 1; }
    void run() {
        class Local { void inside() { work(); } }
        Runnable r = new Runnable() { public void run() { work(); } };
        r.run();
    }
    static class Inner { int twice(int v) { return v * 2; } }
    enum Mode { FAST { int speed() { return 2; } }, SLOW; int speed() { return 1; } }
    record Pair(int a, int b) { Pair { if (a > b) throw new IllegalArgumentException(); } }
})");
    std::vector<std::string> names;
    for (const auto& function : file.functions) {
        names.push_back(function.qualified_name + "(" + function.signature + ")");
    }
    CHECK(names == std::vector<std::string>{
                       "p.q.Outer.(static initializer)()",
                       "p.q.Outer.(initializer)()",
                       "p.q.Outer.run()",
                       "p.q.Outer.Inner.twice(int)",
                       "p.q.Outer.Mode.FAST.speed()",
                       "p.q.Outer.Mode.speed()",
                       "p.q.Outer.Pair.Pair(int, int)",
                   });
    CHECK(file.warnings.empty());
    SECTION("local and anonymous classes count inside the enclosing method") {
        const auto& run = java_function(file, "Outer.run");
        const auto operators = table(run, Role::operator_token);
        CHECK(operators.at("run") == 3); // defined, the anonymous class's method, the call
        CHECK(operators.at("inside") == 1);
        CHECK(operators.at("work") == 2);
        CHECK(operators.at("Local") == 1);
        CHECK(operators.at("Runnable") == 2);
        CHECK(run.end_line == 12);
    }
}

TEST_CASE("lex_java_file honours the convention switches", "[java]") {
    const std::string code = R"(class S { int neg(int x) { return -x - 1; } })";
    core::Convention body_only;
    body_only.body_only = true;
    core::Convention name_operand;
    name_operand.function_name_as_operand = true;
    core::Convention merged;
    merged.merge_unary_binary = true;
    const auto plain = table(lex_java(code).functions.at(0), Role::operator_token);
    CHECK(plain.at("int") == 2);
    CHECK(plain.at("- (unary)") == 1);
    SECTION("body only leaves the signature out") {
        const auto ops =
            table(lex_java(code, "S.java", body_only).functions.at(0), Role::operator_token);
        CHECK(ops.count("int") == 0);
        CHECK(ops.count("neg") == 0);
        CHECK(ops.at("{}") == 1);
    }
    SECTION("the defined name can count as an operand") {
        const auto file = lex_java(code, "S.java", name_operand);
        const auto& f = file.functions.at(0);
        CHECK(table(f, Role::operand_token).at("neg") == 1);
        CHECK(table(f, Role::operator_token).count("neg") == 0);
    }
    SECTION("unary and binary minus can count as one") {
        CHECK(
            table(lex_java(code, "S.java", merged).functions.at(0), Role::operator_token).at("-") ==
            2);
    }
    SECTION("the fingerprint names java/1 with the same suffixes") {
        CHECK(core::java_fingerprint(body_only) == "java/1+body-only");
        CHECK(core::combined_fingerprint(merged, true) ==
              "c-family/2+merged-forms, java/1+merged-forms");
        CHECK(core::combined_fingerprint({}, false) == "c-family/2");
        CHECK(java::build_fingerprint({}) == "c-family/2, java/1");
    }
}

#endif
