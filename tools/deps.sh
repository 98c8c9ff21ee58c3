#!/bin/sh
# Installs the Debian packages greybody needs to build, test and run, if any are
# missing: with apt-get when run as root, otherwise prints the exact command.
set -eu

packages="build-essential pkg-config libmicrohttpd-dev libjansson-dev libcurl4-openssl-dev
libcmocka-dev python3 python3-mpmath python3-numpy python3-scipy python3-yaml curl ca-certificates"
# Tools only the tests need (`tools/deps.sh --test`, as `make test` runs it); `make run` stays light.
# clang + compiler-rt: libFuzzer harnesses; valgrind: memcheck of the server; openssl: throw-away
# TLS certificates.
test_packages="clang libclang-rt-14-dev valgrind openssl"
[ "${1:-}" = "--test" ] && packages="$packages $test_packages"
[ -n "${GREYBODY_EXTRA_PACKAGES:-}" ] && packages="$packages $GREYBODY_EXTRA_PACKAGES"

missing=""
for package in $packages; do
    if ! dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q "install ok installed"; then
        missing="$missing $package"
    fi
done

if [ -z "$missing" ]; then
    exit 0
fi

if [ "$(id -u)" -eq 0 ]; then
    echo "greybody: installing missing packages:$missing"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    # shellcheck disable=SC2086
    apt-get install -y -qq --no-install-recommends $missing
else
    echo "greybody: these Debian packages are missing:$missing"
    echo "greybody: install them with:"
    echo "    sudo apt-get update && sudo apt-get install -y --no-install-recommends$missing"
    exit 1
fi
