// SPDX-License-Identifier: MIT
// What libclang's cursors tell about a function: its kind, qualified name, parameters, result.
#include "gate/lexer/cursor_facts.hpp"

#include "gate/lexer/clang_handles.hpp"

namespace tollgate::lexer {

bool is_function_cursor(CXCursorKind kind) {
    return kind == CXCursor_FunctionDecl || kind == CXCursor_CXXMethod ||
           kind == CXCursor_FunctionTemplate || kind == CXCursor_Constructor ||
           kind == CXCursor_Destructor || kind == CXCursor_ConversionFunction;
}

bool is_container_cursor(CXCursorKind kind) {
    return kind == CXCursor_Namespace || kind == CXCursor_ClassDecl ||
           kind == CXCursor_StructDecl || kind == CXCursor_UnionDecl ||
           kind == CXCursor_ClassTemplate || kind == CXCursor_ClassTemplatePartialSpecialization ||
           kind == CXCursor_LinkageSpec || kind == CXCursor_UnexposedDecl ||
           kind == CXCursor_FriendDecl;
}

std::string qualified_name(CXCursor cursor) {
    std::string name = take_string(clang_getCursorSpelling(cursor));
    CXCursor parent = clang_getCursorSemanticParent(cursor);
    while (!clang_Cursor_isNull(parent) && parent.kind != CXCursor_TranslationUnit &&
           !clang_isInvalid(parent.kind)) {
        if (is_container_cursor(parent.kind) && parent.kind != CXCursor_LinkageSpec &&
            parent.kind != CXCursor_UnexposedDecl) {
            std::string part = take_string(clang_getCursorSpelling(parent));
            if (part.empty()) {
                part = parent.kind == CXCursor_Namespace ? "(anonymous namespace)" : "(anonymous)";
            }
            name = part + "::" + name;
        }
        parent = clang_getCursorSemanticParent(parent);
    }
    return name;
}

namespace {

struct ParameterList {
    std::vector<std::string> types;
};

} // namespace

std::vector<std::string> parameter_types(CXCursor cursor) {
    ParameterList list;
    const int count = clang_Cursor_getNumArguments(cursor);
    if (count >= 0) {
        for (int i = 0; i < count; ++i) {
            list.types.push_back(take_string(clang_getTypeSpelling(
                clang_getCursorType(clang_Cursor_getArgument(cursor, static_cast<unsigned>(i))))));
        }
        return list.types;
    }
    clang_visitChildren(
        cursor,
        [](CXCursor child, CXCursor, CXClientData data) {
            if (child.kind == CXCursor_ParmDecl) {
                static_cast<ParameterList*>(data)->types.push_back(
                    take_string(clang_getTypeSpelling(clang_getCursorType(child))));
            }
            return CXChildVisit_Continue;
        },
        &list);
    return list.types;
}

bool has_result(CXCursor cursor) {
    if (cursor.kind == CXCursor_Constructor || cursor.kind == CXCursor_Destructor) {
        return false;
    }
    CXType result = clang_getCursorResultType(cursor);
    if (result.kind == CXType_Invalid) {
        result = clang_getResultType(clang_getCursorType(cursor));
    }
    return result.kind != CXType_Void && result.kind != CXType_Invalid;
}

} // namespace tollgate::lexer
