#!/usr/bin/env bash
# Plays the demo: three weeks in the life of the calibration curves of a fictional water lab —
# two ion chromatographs and a gas chromatograph, three methods, four reference-material lots.
# Installs missing Debian packages and builds (with progress), then plays each day with
# CURVEWARDEN_NOW pinned, so it prints the same every time, and says what to open at the end.
#
# Environment:
#   CURVEWARDEN_BIN        use this binary (skips the package check and the build)
#   CURVEWARDEN_DEMO_OUT   where the store, data, plots and reports go (default demo/out/,
#                          emptied first)
#   CURVEWARDEN_BUILD_DIR  the build folder (default build/, the one tests/run.sh uses)
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"
out="${CURVEWARDEN_DEMO_OUT:-$root/demo/out}"

if [ -n "${CURVEWARDEN_BIN:-}" ]; then
  cw=$(cd "$(dirname "$CURVEWARDEN_BIN")" && pwd)/$(basename "$CURVEWARDEN_BIN")
else
  echo "== Checking the Debian packages the build needs (installs what is missing)"
  "$root/.ci/install-deps"
  echo "== Building curvewarden in $build (the build tests/run.sh reuses; a few minutes the first time)"
  "$root/.ci/configure" "$build"
  cmake --build "$build" -j "$(nproc)" --target curvewarden curvewarden-docs
  cw="$build/curvewarden"
fi

rm -rf "$out" && mkdir -p "$out"/{data,log,plots,reports}
cp "$root"/demo/data/*.toml "$out/data/"
cd "$out"
unset CURVEWARDEN_AT
export CURVEWARDEN_DB=demo.db
export CURVEWARDEN_USER=r.okafor # the analyst; j.lindqvist reviews (both fictional)

# Bold headings on a terminal only: a log or a pipe gets plain text.
if [ -t 1 ]; then bold=$'\033[1m' plain=$'\033[0m'; else bold="" plain=""; fi
step() { printf '\n%s== %s%s\n' "$bold" "$*" "$plain"; }
day() { printf '\n%s######## %s%s\n' "$bold" "$*" "$plain"; }
# Commands are echoed as they can be pasted (in $out, after the exports echoed by `at`).
echo_cmd() {
  printf '$ curvewarden'
  printf ' %q' "$@"
  if [ -n "$pass_file" ]; then printf ' 3<%s' "$pass_file"; fi
  printf '\n'
}
# Signed acts (curve review, method revise, lot withdraw, instrument service, user changes) ask
# for the signer's passphrase without echo on a terminal; here they read it from descriptor 3.
pass_file=""
run_cw() {
  if [ -n "$pass_file" ]; then "$cw" "$@" 3<"$pass_file"; else "$cw" "$@"; fi
}
signed() { # USER show|brief ARGS...: the act signed by USER
  local user=$1 how=$2
  shift 2
  pass_file="$user.pass"
  "$how" "$@" --as "$user" --passphrase-fd 3
  pass_file=""
}
# Runs a command and shows all it prints; a non-zero exit is shown, never fatal.
show() {
  echo_cmd "$@"
  run_cw "$@" || printf '(exit %d)\n' "$?"
}
# Runs a routine command: its first line here, all of it in log/.
nlog=0
log=""
brief() {
  nlog=$((nlog + 1))
  log=$(printf 'log/%03d-%s.txt' "$nlog" "$1")
  echo_cmd "$@"
  local rc=0
  run_cw "$@" >"$log" 2>&1 || rc=$?
  printf '  %s' "$(head -n 1 "$log")"
  if [ "$rc" -ne 0 ]; then printf '  (exit %d)' "$rc"; fi
  printf '  [%s]\n' "$log"
}
excerpt() { # lines FROM-TO of the last brief command's log
  sed -n "$1,$2p" "$log"
  printf '  ... (%d lines in all: %s)\n' "$(wc -l <"$log")" "$log"
}
at() {
  export CURVEWARDEN_NOW="$1"
  printf '$ export CURVEWARDEN_NOW=%s\n' "$1"
}
# Ids the store hands out, read back through the tool's own CSV listings.
awaiting_review() { "$cw" curve list --state awaiting-review --instrument "$1" --csv | tail -n +2 | cut -d, -f1; }
last_run() { "$cw" run list --csv | tail -n 1 | cut -d, -f1; }
curve_of() { # instrument analyte state → the newest curve id in that state
  "$cw" curve list --instrument "$1" --analyte "$2" --state "$3" --csv | tail -n +2 | cut -d, -f1 | sort -n | tail -n 1
}
review_all() { # the second person approves every curve of an instrument awaiting review
  local id
  for id in $(awaiting_review "$1"); do
    signed j.lindqvist brief curve review "$id" --approve --reason "fit, residuals and exclusions checked"
  done
}

# ---- The lab's data: calibration points and instrument sequences, generated reproducibly ----
# (demo/gen/*.awk; detector responses of our own invention, with a little noise).
anion_spec="nitrate|0.1|0|0.5 1 5 10 25 50;sulfate|0.03|0|1 5 10 25 50 100"
cation_spec="sodium|0.05|-0.00008|1 5 10 20 50 80 100;potassium|0.08|-0.0004|0.5 1 2 5 10 15 20"
thm_spec="chloroform|0.02|0|1 5 10 20 50 100;bromodichloromethane|0.025|0|1 5 10 20 50 100"
anion_seq="nitrate|0.1|0|10|2:40;sulfate|0.03|0|25|10:90"
cation_seq="sodium|0.05|-0.00008|20|5:80;potassium|0.08|-0.0004|5|0.8:12"
thm_seq="chloroform|0.02|0|20|2:60;bromodichloromethane|0.025|0|20|1:30"
calibration() { # file spec seed [awk assignments...]
  local file=$1 spec=$2 seed=$3
  shift 3
  awk -f "$root/demo/gen/common.awk" -f "$root/demo/gen/calibration.awk" \
    -v spec="$spec" -v reps=2 -v noise=1.0 -v seed="$seed" "$@" >"data/$file"
}
sequence() { # file spec seed samples opening closing [awk assignments...]
  local file=$1 spec=$2 seed=$3 samples=$4 opening=$5 closing=$6
  shift 6
  awk -f "$root/demo/gen/common.awk" -f "$root/demo/gen/sequence.awk" -v spec="$spec" \
    -v seed="$seed" -v noise=1.0 -v samples="$samples" -v opening="$opening" -v closing="$closing" \
    "$@" >"data/$file"
}
samples_of() { # MMDD count → DW-MMDD-01 ... (the day's drinking-water samples)
  local i ids=""
  for i in $(seq 1 "$2"); do ids+="DW-$1-$(printf '%02d' "$i") "; done
  echo "${ids% }"
}
# One working day's sequences on the three instruments. The nitrate check recoveries on IC-02
# are the day's argument: the drift of week two lives there.
daily_runs() { # YYYY-MM-DD seed "nitrate opening/closing" [extra run-import args for IC-02]
  local date=$1 seed=$2 nitrate=$3 md
  md=$(echo "$date" | cut -c6-7,9-10)
  local ids
  ids=$(samples_of "$md" 6)
  sequence "run-IC-02-$date.csv" "$anion_seq" "$seed" "$ids" "${nitrate%/*} 100.2" "${nitrate#*/} 99.7" -v headers=ic02
  sequence "run-IC-01-$date.csv" "$cation_seq" "$((seed + 1))" "$ids" "99.6 100.4" "100.3 99.5"
  sequence "run-GC-01-$date.csv" "$thm_seq" "$((seed + 2))" "$ids" "101.5 98.2" "99.0 102.1" -v is_area=48000
  brief run import "data/run-IC-02-$date.csv" --method ANION-IC --instrument IC-02
  ic02_run=$(last_run)
  brief run import "data/run-IC-01-$date.csv" --method CATION-IC --instrument IC-01
  brief run import "data/run-GC-01-$date.csv" --method THM-GC --instrument GC-01
}

# The lab's two people (fictional) and their demo passphrases.
printf 'okafor: four calm rivers\n' >r.okafor.pass
printf 'lindqvist: seven late trains\n' >j.lindqvist.pass
echo "Working in $out (the store is $out/demo.db). To paste a command: cd $out; export CURVEWARDEN_DB=demo.db CURVEWARDEN_USER=r.okafor"

day "Week 1 — Monday 16 November 2026"
at 2026-11-16T07:00:00Z
step "Set up the lab and its users (Rosa Okafor, analyst and first admin; Jonas Lindqvist, reviewer),"
printf '   three instruments, three methods, four reference-material lots\n'
signed r.okafor show init --lab "Millbrook Water Laboratory" --tz Europe/Berlin --name "Rosa Okafor"
printf '$ cat r.okafor.pass j.lindqvist.pass | curvewarden user add j.lindqvist --name "Jonas Lindqvist" --role reviewer --passphrase-fd 0\n'
cat r.okafor.pass j.lindqvist.pass | "$cw" user add j.lindqvist --name "Jonas Lindqvist" --role reviewer --passphrase-fd 0
show user list
show instrument add IC-01 --name "Ion chromatograph, bay 1 (cations)"
show instrument add IC-02 --name "Ion chromatograph, bay 2 (anions)"
show instrument add GC-01 --name "Gas chromatograph with headspace sampler"
show method add data/anion-ic.toml
show method add data/cation-ic.toml
show method add data/thm-gc.toml
show lot add CRM-AN-0419 --material "Anion multi-element standard 1000 mg/L" --expires 2027-06-30 \
  --opened 2026-11-02 --in-use-days 60 --certificate "CoA 0419-B" --value nitrate=1000±4 --value sulfate=1000±5
show lot add CRM-AN-0502 --material "Anion standard 1000 mg/L, second lot" --expires 2027-09-30 \
  --certificate "CoA 0502-A" --value nitrate=1000±4 --value sulfate=1000±5
show lot add CRM-CAT-0211 --material "Cation standard 1000 mg/L" --expires 2027-03-31 \
  --certificate "CoA 0211" --value sodium=1000±3 --value potassium=1000±3
show lot add CRM-THM-0077 --material "Trihalomethane mix 2000 µg/mL in methanol" --expires 2026-12-04 \
  --certificate "CoA 0077-C" --value chloroform=2000±20 --value bromodichloromethane=2000±25
show instrument columns IC-02 \
  --set "position=Inj,kind=Type,sample=Sample ID,analyte=Component,response=Area,nominal=Expected,dilution=Dilution" \
  --reason "export layout of the IC-02 data system"

at 2026-11-16T07:30:00Z
step "Calibrate the anion method on IC-02 (one sulfate injection excluded, with its reason)"
calibration ical-IC-02-2026-11-16.csv "$anion_spec" 11 -v exclude="sulfate|4|0.28|air bubble in the loop (injection log)"
show curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points data/ical-IC-02-2026-11-16.csv \
  --note "weekly calibration"
step "Calibrate the cation method on IC-01 (a quadratic fit)"
calibration ical-IC-01-2026-11-16.csv "$cation_spec" 12
brief curve log --method CATION-IC --instrument IC-01 --lot CRM-CAT-0211 --points data/ical-IC-01-2026-11-16.csv
step "The first THM calibration on GC-01 fails the method's criteria: stored as rejected (exit 3)"
calibration ical-GC-01-2026-11-16a.csv "$thm_spec" 13 -v is_area=48000 -v spoil="chloroform|5|0.7"
show curve log --method THM-GC --instrument GC-01 --lot CRM-THM-0077 --points data/ical-GC-01-2026-11-16a.csv
at 2026-11-16T08:30:00Z
step "Fresh standards, injected again: accepted"
calibration ical-GC-01-2026-11-16b.csv "$thm_spec" 14 -v is_area=48000
brief curve log --method THM-GC --instrument GC-01 --lot CRM-THM-0077 --points data/ical-GC-01-2026-11-16b.csv

at 2026-11-16T09:00:00Z
step "The analyst cannot approve her own curve (exit 3, recorded); a second person reviews, signing"
signed r.okafor show curve review 1 --approve --reason "own work"
review_all IC-02
review_all IC-01
review_all GC-01
show curve list

at 2026-11-16T10:00:00Z
step "Monday's sequences: IC-02's export read through its saved column names"
daily_runs 2026-11-16 101 "100.4/99.6"
show run show "$ic02_run"

step "Tuesday to Friday: the same routine every morning"
at 2026-11-17T08:00:00Z
daily_runs 2026-11-17 111 "99.8/100.5"
at 2026-11-18T08:00:00Z
daily_runs 2026-11-18 121 "100.9/99.9"
at 2026-11-19T08:00:00Z
daily_runs 2026-11-19 131 "99.4/100.2"
at 2026-11-20T08:00:00Z
daily_runs 2026-11-20 141 "100.1/99.3"

day "Week 2 — Monday 23 November: weekly recalibration of the ion chromatographs"
at 2026-11-23T07:15:00Z
calibration ical-IC-02-2026-11-23.csv "$anion_spec" 21
brief curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points data/ical-IC-02-2026-11-23.csv
calibration ical-IC-01-2026-11-23.csv "$cation_spec" 22
brief curve log --method CATION-IC --instrument IC-01 --lot CRM-CAT-0211 --points data/ical-IC-01-2026-11-23.csv
at 2026-11-23T07:45:00Z
review_all IC-02
review_all IC-01
step "The nitrate check standard on IC-02 starts to read high, a little more each day"
at 2026-11-23T08:00:00Z
daily_runs 2026-11-23 201 "101.2/101.9"
at 2026-11-24T08:00:00Z
daily_runs 2026-11-24 211 "102.6/103.1"
at 2026-11-25T08:00:00Z
daily_runs 2026-11-25 221 "103.4/103.9"
at 2026-11-26T08:00:00Z
daily_runs 2026-11-26 231 "104.2/104.6"
step "Every check still passes (within ±10 %), but the control chart shows the drift: a 4-1s warning"
show trend --method ANION-IC --instrument IC-02 --analyte nitrate --last 12

day "Friday 27 November: the nitrate check fails in the middle of the run"
at 2026-11-27T08:00:00Z
ids=$(samples_of 1127 8)
sequence run-IC-02-2026-11-27.csv "$anion_seq" 241 "$ids" "104.8 100.1" "105.0 99.6" -v headers=ic02 -v mid="4:111.6 100.3"
show run import data/run-IC-02-2026-11-27.csv --method ANION-IC --instrument IC-02
failed_run=$(last_run)
step "Bracketing: nitrate results since the last passing check are rerun-required (status events; the rows are unchanged)"
show result list --status rerun-required
step "The same file imported again is refused"
show run import data/run-IC-02-2026-11-27.csv --method ANION-IC --instrument IC-02
step "The chart now has a 1-3s violation, which the method lists: the curve is stale"
show trend --method ANION-IC --instrument IC-02 --analyte nitrate --last 12 --plot plots/trend-nitrate-IC-02.svg
show curve list --instrument IC-02

at 2026-11-27T10:00:00Z
step "The instrument is serviced; its curves stop being valid; recalibrate and re-run the samples"
signed r.okafor show instrument service IC-02 --out --reason "nitrate check drift: suppressor replaced, eluent renewed (work order WO-5521)"
at 2026-11-27T11:30:00Z
signed r.okafor show instrument service IC-02 --back --reason "system suitability passed after service"
at 2026-11-27T12:00:00Z
calibration ical-IC-02-2026-11-27.csv "$anion_spec" 31
brief curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points data/ical-IC-02-2026-11-27.csv
at 2026-11-27T12:30:00Z
review_all IC-02
at 2026-11-27T13:00:00Z
sequence rerun-IC-02-2026-11-27.csv "$anion_seq" 251 "$ids" "100.3 100.0" "99.8 100.4" -v headers=ic02
show run import data/rerun-IC-02-2026-11-27.csv --method ANION-IC --instrument IC-02
show result list --sample DW-1127-02
brief run import "data/run-IC-01-2026-11-26.csv" --method CATION-IC --instrument IC-01 --again \
  --reason "demo: IC-01 re-injected Thursday's vials to confirm sodium"

day "Week 3 — Monday 30 November"
at 2026-11-30T07:15:00Z
calibration ical-IC-01-2026-11-30.csv "$cation_spec" 41
brief curve log --method CATION-IC --instrument IC-01 --lot CRM-CAT-0211 --points data/ical-IC-01-2026-11-30.csv
calibration ical-GC-01-2026-11-30.csv "$thm_spec" 42 -v is_area=48000
brief curve log --method THM-GC --instrument GC-01 --lot CRM-THM-0077 --points data/ical-GC-01-2026-11-30.csv
at 2026-11-30T07:45:00Z
review_all IC-01
review_all GC-01
at 2026-11-30T08:00:00Z
daily_runs 2026-11-30 301 "100.2/99.5"

day "Tuesday 1 December: the anion method is revised"
at 2026-12-01T07:00:00Z
signed r.okafor show method revise data/anion-ic-v2.toml --reason "guard column changed (change control CC-2026-114)"
step "Quantitation against version 1's curve is refused (exit 3), with the reason"
show quantify --method ANION-IC --instrument IC-02 --analyte nitrate --response 0.742 --sample DW-1201-99
at 2026-12-01T07:30:00Z
calibration ical-IC-02-2026-12-01.csv "$anion_spec" 51
brief curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0419 --points data/ical-IC-02-2026-12-01.csv
review_all IC-02
at 2026-12-01T08:00:00Z
daily_runs 2026-12-01 311 "99.7/100.6"

day "Wednesday 2 December: a lot is withdrawn"
at 2026-12-02T07:00:00Z
signed r.okafor show lot withdraw CRM-AN-0419 --reason "supplier notice SN-2026-88: nitrate value under investigation"
step "Which curves and results did it touch?"
brief trace lot CRM-AN-0419
excerpt 2 14
brief trace lot CRM-AN-0419 --csv
at 2026-12-02T07:30:00Z
step "Recalibrate with the second anion lot"
calibration ical-IC-02-2026-12-02.csv "$anion_spec" 61
show curve log --method ANION-IC --instrument IC-02 --lot CRM-AN-0502 --points data/ical-IC-02-2026-12-02.csv
review_all IC-02
at 2026-12-02T08:00:00Z
daily_runs 2026-12-02 321 "100.3/99.8"

at 2026-12-02T12:00:00Z
day "Wednesday noon: the board"
step "What expires this week (the THM lot ends on Friday and takes GC-01's curves with it)"
show expiring --this-week
show status
nitrate=$(curve_of IC-02 nitrate active)
step "Provenance of one of today's results: curve, lots, method version, checks, status history"
result=$("$cw" result list --run "$ic02_run" --status reported --csv | sed -n 2p | cut -d, -f1)
show trace result "$result"
step "Pictures and papers"
brief curve show "$nitrate" --plot plots/curve-"$nitrate"-nitrate.svg
brief curve show 2 --plot plots/curve-2-sulfate-excluded-injection.png
brief trend --method ANION-IC --instrument IC-02 --analyte nitrate --plot plots/trend-nitrate-IC-02.pdf
show report curve "$nitrate" --out reports/curve-"$nitrate".pdf
show report run "$failed_run" --out reports/run-"$failed_run".pdf
step "The whole trail still verifies"
show audit verify

printf '\nWhat to open (in %s):\n' "$out"
item() { printf '  %-44s %s\n' "$1" "$2"; }
item plots/trend-nitrate-IC-02.svg "the control chart: week two's drift, the 4-1s warnings, the 1-3s"
item "" "violation at the failing check (also as .pdf)"
item "plots/curve-$nitrate-nitrate.svg" "today's nitrate curve: calibrators, fit, confidence band, LOD/LOQ,"
item "" "the %RE panel"
item plots/curve-2-sulfate-excluded-injection.png "the excluded injection marked apart"
item "reports/curve-$nitrate.pdf" "the calibration report a reviewer signs"
item "reports/run-$failed_run.pdf" "Friday's failed run: every row, the bracketing outcome"
item log/ "the whole output of every routine command"
cat <<TXT
Which command shows what:
  curve show ID / curve list      a curve's fit, verdict and state now (or --at a moment)
  run show ID / result list       a run row by row / results by sample, run or status
  trend ...                       check-standard recoveries against the control limits
  trace result|curve|lot          provenance and the impact of a lot
  expiring / status               what runs out soon / the board
  audit log / audit verify        the trail and its hash chain
Curvewarden supports, and never replaces, the lab's quality system; a qualified person reviews
results before release.
TXT
