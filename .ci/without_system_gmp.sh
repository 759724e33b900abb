#!/usr/bin/env bash
# without_system_gmp.sh COMMAND...: run COMMAND in a private mount namespace (unshare -m, root) in which
# the system's GMP (every libgmp.so* the dynamic loader knows, and gmp.h) and the C compiler are hidden:
# each is bind-mounted over by an empty file or by a script that fails.  The rest of the machine (network,
# Python, TeX) is untouched, and the bind mounts vanish with the namespace.  Used by .ci/run stage 3 to
# install and test the manylinux wheel as on a machine that never had GMP or a compiler: the wheel must
# bring its own libgmp (amalgebra.libs/, found through the extension's RPATH).
set -euo pipefail
if [ "${1:-}" != "--inside" ]; then
    exec unshare --mount --propagation private bash "$0" --inside "$@"
fi
shift

hidden=()
hide() {  # hide FILE OVER: bind-mount OVER onto FILE (once per real file)
    local real
    real=$(readlink -f "$1")
    [ -e "$real" ] || return 0
    for seen in "${hidden[@]:-}"; do [ "$seen" = "$real" ] && return 0; done
    mount --bind "$2" "$real"
    hidden+=("$real")
}

stub=$(mktemp -d "${TMPDIR:-/tmp}/no-gmp.XXXXXX")
trap 'rm -rf "$stub"' EXIT
: >"$stub/empty"
printf '#!/bin/sh\necho "without_system_gmp.sh: the C compiler is hidden here" >&2\nexit 1\n' >"$stub/no-cc"
chmod 755 "$stub/no-cc"

# the shared library, under every name the loader's cache lists (and the usual directories)
while read -r path; do
    hide "$path" "$stub/empty"
done < <( { ldconfig -p | awk '/libgmp\.so/ {print $NF}'
            ls /lib/*/libgmp.so* /usr/lib/*/libgmp.so* /usr/lib/libgmp.so* /usr/local/lib/libgmp.so* 2>/dev/null
          } | sort -u )
# the headers
for header in /usr/include/gmp.h /usr/include/*/gmp.h /usr/local/include/gmp.h; do
    [ -e "$header" ] && hide "$header" "$stub/empty"
done
# the compilers
for cc in cc gcc c89 c99 clang "$(uname -m)-linux-gnu-gcc"; do
    path=$(command -v "$cc" 2>/dev/null) && hide "$path" "$stub/no-cc"
done
shopt -s nullglob
for path in /usr/bin/gcc-[0-9]* /usr/bin/*-linux-gnu-gcc-[0-9]*; do hide "$path" "$stub/no-cc"; done
shopt -u nullglob

# prove that they are gone before running anything
if printf '#include <gmp.h>\nint main(void){return 0;}\n' | cc -x c -o "$stub/probe" - 2>/dev/null; then
    echo "without_system_gmp.sh: a C compiler still works" >&2; exit 1
fi
if python3 -c 'import ctypes, sys
for name in ("libgmp.so.10", "libgmp.so"):
    try:
        ctypes.CDLL(name)
    except OSError:
        continue
    sys.exit(0)
sys.exit(1)'; then
    echo "without_system_gmp.sh: the system libgmp still loads" >&2; exit 1
fi
echo "CI: hidden in this mount namespace (${#hidden[@]} files): ${hidden[*]}"
"$@"
