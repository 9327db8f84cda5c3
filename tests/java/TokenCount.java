// SPDX-License-Identifier: MIT
// The reference count for Tollgate's Java check: for every method, constructor and initializer
// block of a Java file (members of nested classes and of enum constants' bodies included; lambdas,
// local and anonymous classes counted inside their function), the number of tokens the JDK's own
// scanner (com.sun.tools.javac.parser) finds in its extent (from com.sun.source's tree positions),
// reduced by the pair rules of Tollgate's convention java/1: the closing ) ] } add nothing, nor
// the > that close type argument lists (javac's tree tells them from the shift and comparison
// operators), nor the : of a conditional, and an annotation's @ and name are one token.
//
// Usage: java --add-exports jdk.compiler/com.sun.tools.javac.parser=ALL-UNNAMED
//             --add-exports jdk.compiler/com.sun.tools.javac.util=ALL-UNNAMED
//             TokenCount.java FILE.java...
// Output: one line per function, "FILE START_LINE END_LINE N", in source order.
import com.sun.source.tree.AnnotationTree;
import com.sun.source.tree.BinaryTree;
import com.sun.source.tree.BlockTree;
import com.sun.source.tree.ClassTree;
import com.sun.source.tree.CompilationUnitTree;
import com.sun.source.tree.ConditionalExpressionTree;
import com.sun.source.tree.MethodTree;
import com.sun.source.tree.NewClassTree;
import com.sun.source.tree.Tree;
import com.sun.source.tree.VariableTree;
import com.sun.source.util.JavacTask;
import com.sun.source.util.SourcePositions;
import com.sun.source.util.TreeScanner;
import com.sun.source.util.Trees;
import com.sun.tools.javac.parser.Scanner;
import com.sun.tools.javac.parser.ScannerFactory;
import com.sun.tools.javac.parser.Tokens.Token;
import com.sun.tools.javac.parser.Tokens.TokenKind;
import com.sun.tools.javac.util.Context;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.tools.JavaCompiler;
import javax.tools.JavaFileObject;
import javax.tools.StandardJavaFileManager;
import javax.tools.ToolProvider;

public class TokenCount {
    private record Span(long start, long end) {}

    private static final List<Span> functions = new ArrayList<>();
    private static CompilationUnitTree unit;
    private static SourcePositions positions;
    private static String source;

    public static void main(String[] args) throws Exception {
        for (String arg : args) {
            functions.clear();
            measure(Path.of(arg), arg);
        }
    }

    private static void measure(Path path, String name) throws Exception {
        source = Files.readString(path, StandardCharsets.UTF_8);
        JavaCompiler compiler = ToolProvider.getSystemJavaCompiler();
        StandardJavaFileManager files = compiler.getStandardFileManager(null, null, null);
        Iterable<? extends JavaFileObject> objects = files.getJavaFileObjects(path.toFile());
        JavacTask task = (JavacTask) compiler.getTask(null, files, null, List.of("-proc:none"),
                                                      null, objects);
        unit = task.parse().iterator().next();
        positions = Trees.instance(task).getSourcePositions();
        for (Tree type : unit.getTypeDecls()) {
            if (type instanceof ClassTree cls) {
                collect(cls);
            }
        }

        List<Token> tokens = new ArrayList<>();
        Scanner scanner = ScannerFactory.instance(new Context()).newScanner(source, false);
        for (scanner.nextToken(); scanner.token().kind != TokenKind.EOF; scanner.nextToken()) {
            tokens.add(scanner.token());
        }
        for (Span span : functions) {
            System.out.println(name + " " + line(span.start) + " " + line(span.end - 1) + " " +
                               count(span, tokens));
        }
    }

    private static long line(long position) {
        return unit.getLineMap().getLineNumber(position);
    }

    // The functions of a class body: methods with a body, initializer blocks, and the members of
    // nested classes and enum constants' bodies.
    private static void collect(ClassTree cls) {
        for (Tree member : cls.getMembers()) {
            if (member instanceof MethodTree method && method.getBody() != null) {
                add(member);
            } else if (member instanceof BlockTree) {
                add(member);
            } else if (member instanceof ClassTree nested) {
                collect(nested);
            } else if (member instanceof VariableTree variable && isEnumConstantWithBody(variable)) {
                collect(((NewClassTree) variable.getInitializer()).getClassBody());
            }
        }
    }

    private static boolean isEnumConstantWithBody(VariableTree variable) {
        if (!(variable.getInitializer() instanceof NewClassTree created) ||
            created.getClassBody() == null) {
            return false;
        }
        // An enum constant is written as its bare name: no type before it.
        int start = (int) positions.getStartPosition(unit, variable);
        return source.startsWith(variable.getName().toString(), start);
    }

    private static void add(Tree function) {
        // javac's tree places generated constructors at their class: only written ones count.
        long start = positions.getStartPosition(unit, function);
        long end = positions.getEndPosition(unit, function);
        if (start >= 0 && end > start) {
            functions.add(new Span(start, end));
        }
    }

    private static long count(Span span, List<Token> tokens) {
        long total = 0;
        long closers = 0;
        long greater = 0;
        for (Token token : tokens) {
            if (token.pos < span.start || token.pos >= span.end) {
                continue;
            }
            ++total;
            switch (token.kind) {
            case RPAREN, RBRACKET, RBRACE -> ++closers;
            case GT, GTGT, GTGTGT -> ++greater;
            default -> {}
            }
        }
        long[] inside = countInside(span, tokens);
        return total - closers - (greater - inside[0]) - inside[1] - inside[2];
    }

    // Binary > >> >>> operators, conditionals and annotation-name tokens within `span`.
    private static long[] countInside(Span span, List<Token> tokens) {
        long[] found = new long[3];
        new TreeScanner<Void, Void>() {
            private boolean within(Tree tree) {
                long at = positions.getStartPosition(unit, tree);
                return at >= span.start && at < span.end;
            }

            @Override
            public Void visitBinary(BinaryTree tree, Void unused) {
                if (within(tree)) {
                    switch (tree.getKind()) {
                    case GREATER_THAN, RIGHT_SHIFT, UNSIGNED_RIGHT_SHIFT -> ++found[0];
                    default -> {}
                    }
                }
                return super.visitBinary(tree, unused);
            }

            @Override
            public Void visitConditionalExpression(ConditionalExpressionTree tree, Void unused) {
                if (within(tree)) {
                    ++found[1];
                }
                return super.visitConditionalExpression(tree, unused);
            }

            @Override
            public Void visitAnnotation(AnnotationTree tree, Void unused) {
                if (within(tree)) {
                    long from = positions.getStartPosition(unit, tree.getAnnotationType());
                    long to = positions.getEndPosition(unit, tree.getAnnotationType());
                    for (Token token : tokens) {
                        if (token.pos >= from && token.pos < to) {
                            ++found[2];
                        }
                    }
                }
                return super.visitAnnotation(tree, unused);
            }
        }.scan(unit, null);
        return found;
    }
}
