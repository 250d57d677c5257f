#!/usr/bin/env bash
# Plays the demo: a week in the life of the calibration curves of a fictional water lab.
# Installs missing Debian packages, builds, then runs each step and says what to look at.
# The store goes to demo/out/demo.db (rebuilt on every run).
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"
data="$root/demo/data"
out="$root/demo/out"

echo "== Checking the Debian packages the build needs (installs what is missing)"
"$root/.ci/install-deps"
echo "== Building curvewarden in $build (the same build tests/run.sh uses; a few minutes the first time)"
"$root/.ci/configure" "$build"
cmake --build "$build" -j "$(nproc)" --target curvewarden curvewarden-docs

rm -rf "$out" && mkdir -p "$out"
export CURVEWARDEN_DB="$out/demo.db"
export CURVEWARDEN_USER="r.okafor"      # the bench analyst and the lab's first admin (fictional)
cw="$build/curvewarden"

# Bold headings on a terminal only: a log or a pipe gets plain text.
if [ -t 1 ]; then bold=$'\033[1m' plain=$'\033[0m'; else bold="" plain=""; fi
step() { printf '\n%s== %s%s\n' "$bold" "$*" "$plain"; }
show() { printf '$ curvewarden %s\n' "$*"; "$cw" "$@" || printf '(exit %d)\n' "$?"; }
# Signed acts read the passphrase from descriptor 3 here (on a terminal they ask without echo):
# signed_as() runs a command as USER with that user's demo passphrase.
printf 'okafor: four calm rivers\n' >"$out/r.okafor.pass"
printf 'lindqvist: seven late trains\n' >"$out/j.lindqvist.pass"
signed_as() {
  local user="$1"; shift
  printf '$ curvewarden %s   (as %s, signed)\n' "$*" "$user"
  CURVEWARDEN_USER="$user" "$cw" "$@" --passphrase-fd 3 3<"$out/$user.pass" || printf '(exit %d)\n' "$?"
}
at() { export CURVEWARDEN_NOW="$1"; }   # the demo fixes "now" so that it plays the same every time

at 2026-11-30T07:30:00Z
step "Set up the lab and its users, an instrument, a method and two reference-material lots"
signed_as r.okafor init --lab "Millbrook Water Laboratory" --tz Europe/Berlin --name "Rosa Okafor"
printf '$ curvewarden user add j.lindqvist --name "Jonas Lindqvist" --role reviewer   (signed; then his first passphrase)\n'
cat "$out/r.okafor.pass" "$out/j.lindqvist.pass" |
  "$cw" user add j.lindqvist --name "Jonas Lindqvist" --role reviewer --passphrase-fd 0
show user list
show instrument add IC-02 --name "Ion chromatograph, bay 2"
show method add "$data/anion-ic.toml"
show lot add CRM-AN-0419 --material "Anion multi-element standard 1000 mg/L" --expires 2027-06-30 \
  --opened 2026-11-02 --in-use-days 60 --certificate "CoA 0419-B" --value nitrate=1000±4 --value sulfate=1000±5
show lot add CRM-AN-0388 --material "Anion standard, second source" --expires 2026-12-03 --value nitrate=500±3 --value sulfate=500±3

at 2026-11-30T08:15:00Z
step "Log Monday's calibration (one curve per analyte; one injection excluded with its reason)"
show curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points "$data/ical-2026-11-30.csv" \
  --note "Monday calibration"

step "A calibration that fails the method's criteria is stored as rejected (exit 3)"
show curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points "$data/ical-poor.csv"

step "The analyst cannot approve her own curve; a second person can"
signed_as r.okafor curve review 1 --approve --reason "own work"
signed_as j.lindqvist curve review 1 --approve --reason "fit, residuals and exclusions checked"
signed_as j.lindqvist curve review 2 --approve --reason "fit, residuals and exclusions checked"
show curve list

at 2026-11-30T09:00:00Z
step "Opening check standard, then samples (one below the range, one above it)"
show check log --curve 1 --nominal 10 --response 1.003
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 0.742 --sample MW-1187
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 0.031 --dilution 2 --sample MW-1188
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 6.9 --sample MW-1189
show quantify --method ANION-IC --instrument IC-02 --analyte sulfate --response 1.21 --sample MW-1187 --json

at 2026-11-30T13:00:00Z
step "A failing check makes the curve stale and lists the results to re-run"
show quantify --curve 1 --response 1.52 --sample MW-1190
show check log --curve 1 --nominal 10 --response 0.861
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 0.5 --sample MW-1191

at 2026-12-01T07:00:00Z
step "Tuesday: the method is revised; Monday's curves stop being valid"
signed_as r.okafor method revise "$data/anion-ic-v2.toml" --reason "guard column changed (change control CC-2026-114)"
show quantify --curve 2 --response 1.0 --sample MW-1192
step "Time travel: the same curve as it was on Monday afternoon"
show curve show 2 --at 2026-11-30T14:00:00Z

at 2026-12-01T08:30:00Z
step "Recalibrate under version 2 with the second-source lot, which expires on Thursday"
show curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0388 --points "$data/ical-2026-12-01.csv"
signed_as j.lindqvist curve review 4 --approve --reason "fit and residuals checked"
signed_as j.lindqvist curve review 5 --approve --reason "fit and residuals checked"
show check log --curve 4 --nominal 10 --response 0.998
show check log --curve 5 --nominal 25 --response 0.751
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 1.52 --sample MW-1190-R

step "What expires this week (the lot limits the new curves), and the status board"
show expiring --this-week
show status

at 2026-12-01T10:00:00Z
step "Tuesday's sequence, as the instrument exports it: its headers saved once for IC-02, then the whole run imported with bracketing (exit 3: a check failed)"
show instrument columns IC-02 --set "position=Inj,kind=Type,sample=Sample ID,analyte=Component,response=Area,nominal=Expected,dilution=Dilution" \
  --reason "export layout of the IC-02 data system"
show run import "$data/seq-2026-12-01.csv" --method ANION-IC --instrument IC-02
show run import "$data/seq-2026-12-01.csv" --method ANION-IC --instrument IC-02
show result list --status rerun-required
show trace result 9
show trend --method ANION-IC --instrument IC-02 --analyte nitrate

step "A lot is withdrawn: which curves and results does it touch?"
signed_as r.okafor lot withdraw CRM-AN-0419 --reason "supplier recall notice R-7731"
show trace lot CRM-AN-0419
show trace lot CRM-AN-0419 --csv

step "Provenance of a reported value, and the audit trail"
show trace result 1
show trace curve 4
show audit log --entity curve --id 1
show audit verify

cat <<TXT

What to look at:
  - the fit report of curve 1: parameters with standard errors, r², s(y/x), LOD/LOQ, Mandel's test,
    the per-point %RE table and the excluded sulfate injection kept with its reason;
  - the rejected calibration (exit 3) stored with every failing criterion named;
  - refusals (exit 3) that name every reason with its date: above the range, failed check,
    method revised;
  - the run: the failing check at position 10 makes the nitrate results since the passing
    check before it rerun-required (status events, the rows unchanged) and refuses the rest;
    sulfate's last sample has no closing check; the same file again is refused;
  - 'trace lot' listing exactly the curves and results a withdrawn lot touched;
  - 'audit verify' recomputing the hash chain over every entry and fact row.
The store is $CURVEWARDEN_DB; try 'sqlite3 $CURVEWARDEN_DB "UPDATE lots SET material = 1"' (refused by a trigger).
Curvewarden supports, and never replaces, the lab's quality system; a qualified person reviews results before release.
TXT
