// SPDX-License-Identifier: MIT
// Placeholder replaced by the libgit2 walker.
#include "gate/walker/repository.hpp"
#include "gate/common/errors.hpp"
namespace tollgate::walker {
struct Repository::Impl {};
Repository::Repository(std::unique_ptr<Impl> impl) : m_impl(std::move(impl)) {}
Repository::Repository(Repository&&) noexcept = default;
Repository& Repository::operator=(Repository&&) noexcept = default;
Repository::~Repository() = default;
Repository Repository::open(const std::string&) { throw Failure("walker unavailable"); }
std::string Repository::workdir() const { return {}; }
bool Repository::is_bare() const { return false; }
ObjectId Repository::resolve_commit(const std::string&) const { return {}; }
std::vector<TreeFile> Repository::list_c_family_files(const ObjectId&) const { return {}; }
std::string Repository::read_blob(const ObjectId&) const { return {}; }
std::optional<SourceFile> Repository::read_file(const ObjectId&, const std::string&) const { return {}; }
std::vector<SourceFile> Repository::read_c_family_files(const ObjectId&) const { return {}; }
std::vector<SourceFile> Repository::read_worktree_c_family_files() const { return {}; }
std::vector<std::string> Repository::reference_names() const { return {}; }
void* Repository::raw() const { return nullptr; }
}
