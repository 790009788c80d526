# Sourced by tools/dev, tools/sanitize.sh, tools/fuzz.sh and tools/browser-check.sh
# (from the top of the checkout). install_missing PACKAGE... installs with
# apt-get the Debian packages that are not installed yet; nothing else.
install_missing() {
    missing=""
    for p in "$@"; do
        dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing="$missing $p"
    done
    if [ -n "$missing" ]; then
        echo "installing:$missing"
        SUDO=""
        [ "$(id -u)" -ne 0 ] && SUDO="sudo"
        $SUDO apt-get update -qq
        # shellcheck disable=SC2086
        DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq $missing >/dev/null
    fi
}
