#!/usr/bin/env bash
# Build the native speed reference (native_ref: libint2 + Eigen RHF/UHF/MP2) outside the repo.
#
#   scripts/build-native-ref.sh            # build into ${NATIVE_REF_DIR:-$HOME/.cache/fieldbook/native-ref}
#   NATIVE_REF_DIR=/tmp/native-ref scripts/build-native-ref.sh
#
# Idempotent: installs missing Debian packages (only as root; otherwise prints what to install),
# re-copies the sources from ../shared/tools/native-ref (relative to the repo root) only when they
# changed, runs make (a no-op when up to date) and prints the binary path on the last line of stdout.
# Only used for the speed comparison in test/bench; correctness tests cite published values.
set -euo pipefail

REPO_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
SRC_DIR="$REPO_ROOT/../shared/tools/native-ref"
BUILD_DIR="${NATIVE_REF_DIR:-$HOME/.cache/fieldbook/native-ref}"
PACKAGES=(g++ make pkg-config libint2-dev libeigen3-dev libboost-dev nlohmann-json3-dev)

log() { echo "build-native-ref: $*" >&2; }
die() { log "error: $*"; exit 1; }

if [ ! -f "$SRC_DIR/native_ref.cpp" ] || [ ! -f "$SRC_DIR/Makefile" ]; then
  die "native-ref sources not found at $SRC_DIR (expected ../shared/tools/native-ref next to the repo root, with native_ref.cpp and Makefile)"
fi
SRC_DIR="$(cd "$SRC_DIR" && pwd)"

case "$BUILD_DIR" in
  "$REPO_ROOT"|"$REPO_ROOT"/*) die "NATIVE_REF_DIR ($BUILD_DIR) must be outside the repository" ;;
esac

# ---- Debian packages
missing=()
if command -v dpkg-query >/dev/null 2>&1; then
  for p in "${PACKAGES[@]}"; do
    if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed"; then
      missing+=("$p")
    fi
  done
else
  for t in g++ make pkg-config; do command -v "$t" >/dev/null 2>&1 || missing+=("$t"); done
  pkg-config --exists libint2 2>/dev/null || missing+=(libint2-dev)
fi
if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" -eq 0 ] && command -v apt-get >/dev/null 2>&1; then
    log "installing: ${missing[*]}"
    apt-get update
    DEBIAN_FRONTEND=noninteractive apt-get install -y "${missing[@]}"
  else
    die "missing packages: ${missing[*]}
  install them first, e.g.:  sudo apt-get update && sudo apt-get install -y ${PACKAGES[*]}"
  fi
fi

# ---- copy sources (only files that changed, so make stays a no-op when up to date)
mkdir -p "$BUILD_DIR/geometries"
copy_if_changed() {
  if ! cmp -s "$1" "$2"; then
    cp "$1" "$2"
    chmod u+w "$2"
  fi
}
for f in "$SRC_DIR"/*; do
  [ -f "$f" ] && copy_if_changed "$f" "$BUILD_DIR/$(basename "$f")"
done
for f in "$SRC_DIR"/geometries/*; do
  [ -f "$f" ] && copy_if_changed "$f" "$BUILD_DIR/geometries/$(basename "$f")"
done

# ---- build
log "building in $BUILD_DIR (about 1-2 minutes the first time)"
make -C "$BUILD_DIR" native_ref >&2
[ -x "$BUILD_DIR/native_ref" ] || die "make finished but $BUILD_DIR/native_ref is missing"

BASIS_DIR="$REPO_ROOT/../shared/reference/basis"
if [ -d "$BASIS_DIR" ]; then
  log "basis sets: export NATIVE_REF_BASIS_DIR=$(cd "$BASIS_DIR" && pwd)  (test/bench/native.ts finds it by itself)"
else
  log "warning: basis directory $BASIS_DIR not found; set NATIVE_REF_BASIS_DIR"
fi
echo "$BUILD_DIR/native_ref"
