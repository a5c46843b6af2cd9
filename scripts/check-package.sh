#!/usr/bin/env bash
# Installs headroom as a user who does not clone it would: packs the tarball npm would publish
# (`npm pack`), installs it into an empty folder and runs `headroom demo` there. Fails unless the demo
# writes its report and recommends at least one further run. Run by .ci/run after the tests;
# dependencies come from npm's cache where `npm ci` left them.
set -euo pipefail
cd "$(dirname "$0")/.."

work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

npm run build --silent
tarball="$(npm pack --silent --pack-destination "$work" | tail -n 1)"
mkdir "$work/app"
cd "$work/app"
npm init -y >/dev/null
npm install --no-audit --no-fund --prefer-offline "$work/$tarball" >/dev/null
npx --no-install headroom --version
npx --no-install headroom demo --out demo --workers 1 >demo.txt
cat demo.txt
grep -Eq '^recommended: [1-9][0-9]* further run' demo.txt
test -s demo/report.html
test -s demo/decision.json
echo "check-package: $tarball installs and runs headroom demo"
