# Sourced by tools/dev and the long checks of .ci/run (from the top of the
# checkout). install_missing PACKAGE... installs with apt-get the Debian
# packages that are not installed yet; nothing else. within_budget NAME SECONDS
# WHAT-FAILED COMMAND... runs COMMAND under a time budget and says which way it
# failed: over the budget, or WHAT-FAILED.
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

within_budget() {
    name=$1 budget=$2 failed=$3
    shift 3
    start=$(date +%s)
    if ! timeout "$budget" "$@"; then
        elapsed=$(( $(date +%s) - start ))
        if [ "$elapsed" -ge "$budget" ]; then
            echo "$name: the run exceeded its budget of $budget s" >&2
        else
            echo "$name: $failed" >&2
        fi
        exit 1
    fi
    echo "$name: passed in $(( $(date +%s) - start )) s"
}
