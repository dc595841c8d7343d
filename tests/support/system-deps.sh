#!/usr/bin/env bash
# Installs the Debian packages the test suite runs for real: Mosquitto (broker), InfluxDB 1.x
# (time-series store), PostgreSQL 15 (results and workflow store, replicas) and Chromium (dashboard tests). Runs before `npm test`; does nothing when present.
set -euo pipefail
packages=(mosquitto mosquitto-clients influxdb postgresql-15 chromium)
missing=()
for p in "${packages[@]}"; do dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed' || missing+=("$p"); done
[ ${#missing[@]} -eq 0 ] && exit 0
if [ "$(id -u)" -ne 0 ]; then
  echo "thermargin tests need these Debian packages: ${missing[*]} — install them with: sudo apt-get install ${missing[*]}" >&2
  exit 1
fi
echo "installing Debian packages for the tests: ${missing[*]}" >&2
apt-get update -qq
DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null
