#!/bin/sh
# Installs the Debian packages greybody needs to build, test and run, if any are
# missing: with apt-get when run as root, otherwise prints the exact command.
set -eu

packages="build-essential pkg-config libmicrohttpd-dev libjansson-dev libcurl4-openssl-dev
libcmocka-dev python3 python3-mpmath python3-numpy python3-scipy python3-yaml curl ca-certificates"
# Tools only the tests need (`tools/deps.sh --test`, as `make test` runs it); `make run` stays light.
# clang + compiler-rt: libFuzzer harnesses; valgrind: memcheck of the server; openssl: throw-away
# TLS certificates.
# systemd: systemd-analyze on the unit in deploy/; nginx + wrk: the load-balancing test; chromium +
# a font: the built-in page in a browser; prometheus: its promtool checks /metrics;
# python3-jsonschema: the integration answers against the contract.
test_packages="clang libclang-rt-14-dev valgrind openssl systemd nginx wrk chromium fonts-dejavu-core
prometheus python3-jsonschema"
[ "${1:-}" = "--test" ] && packages="$packages $test_packages"
# Node.js and npm drive the browser and the contract validator (packages from the npm registry,
# tests/browser and tests/spec).  A machine that already has an npm of its own keeps it.
if [ "${1:-}" = "--test" ] && ! command -v npm >/dev/null 2>&1; then
    packages="$packages nodejs npm"
fi
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
    # Daemons among them (nginx, prometheus) must not start on install: the tests run their own
    # on loopback ports.  policy-rc.d is Debian's switch for that; ours goes when we are done.
    if [ ! -e /usr/sbin/policy-rc.d ]; then
        printf '#!/bin/sh\nexit 101\n' > /usr/sbin/policy-rc.d
        chmod 755 /usr/sbin/policy-rc.d
        trap 'rm -f /usr/sbin/policy-rc.d' EXIT
    fi
    apt-get update -qq
    # shellcheck disable=SC2086
    apt-get install -y -qq --no-install-recommends $missing
else
    echo "greybody: these Debian packages are missing:$missing"
    echo "greybody: install them with:"
    echo "    sudo apt-get update && sudo apt-get install -y --no-install-recommends$missing"
    exit 1
fi
