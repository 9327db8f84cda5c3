# SPDX-License-Identifier: MIT
# Install layout (binary, man page, ready policies, CI templates) and the Debian package (CPack).
include(GNUInstallDirs)

install(FILES ${PROJECT_SOURCE_DIR}/gate/cli/tollgate.1 DESTINATION ${CMAKE_INSTALL_MANDIR}/man1)
install(FILES ${PROJECT_SOURCE_DIR}/policies/README.md ${PROJECT_SOURCE_DIR}/policies/starter.yaml
              ${PROJECT_SOURCE_DIR}/policies/strict.yaml ${PROJECT_SOURCE_DIR}/policies/legacy.yaml
        DESTINATION ${CMAKE_INSTALL_DATADIR}/tollgate/policies)
install(DIRECTORY ${PROJECT_SOURCE_DIR}/ci-templates/
        DESTINATION ${CMAKE_INSTALL_DATADIR}/tollgate/ci-templates USE_SOURCE_PERMISSIONS)

# "cpack -G DEB" in the build folder makes tollgate_VERSION_ARCH.deb for Debian 12. The runtime
# packages are those owning the libraries the binary links (dpkg -S on "ldd tollgate"), plus
# libclang's builtin headers (stddef.h, stdarg.h) that parsing needs.
set(CPACK_GENERATOR DEB)
set(CPACK_PACKAGE_NAME tollgate)
set(CPACK_PACKAGE_VERSION ${PROJECT_VERSION})
set(CPACK_PACKAGE_DESCRIPTION_SUMMARY ${PROJECT_DESCRIPTION})
set(CPACK_PACKAGE_CONTACT "Tollgate maintainers <tollgate@example.invalid>")
set(CPACK_PACKAGING_INSTALL_PREFIX /usr)
set(CPACK_DEBIAN_FILE_NAME DEB-DEFAULT)
set(CPACK_DEBIAN_PACKAGE_SECTION devel)
set(CPACK_DEBIAN_PACKAGE_DEPENDS
    "libclang1-14, libclang-common-14-dev, libgit2-1.5, libtree-sitter0, libyaml-cpp0.7, libspdlog1.10, libfmt9, libcurl4, ca-certificates, libstdc++6 (>= 12), libgcc-s1, libc6 (>= 2.34)")
set(CPACK_DEBIAN_PACKAGE_RECOMMENDS "git, libstdc++-12-dev")
set(CPACK_DEBIAN_PACKAGE_DESCRIPTION
    "${PROJECT_DESCRIPTION}\n Tollgate finds the C, C++ and Java functions a change touched between two commits,\n measures each before and after with Halstead's measures and judges the\n growth with the team's policy. Ships ready policies, CI templates and a\n pre-push hook.")
set(CPACK_STRIP_FILES ON)
include(CPack)
