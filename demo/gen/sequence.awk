# Writes a demo run file (product.md §5.4): an instrument sequence of the fictional lab in
# injection order — an opening check standard, a blank, the samples, a closing check standard.
#   -v spec="nitrate|0.1|0|10|2:40;..."  analyte|slope|curvature|check nominal|sample range lo:hi
#   -v samples="DW-1116-01 DW-1116-02 ..."  sample ids (a sample's true level follows its id, so a
#                      re-run of the same sample reads about the same)
#   -v opening="100.4 99.8" -v closing="100.9 100.2"  check recoveries (%) per analyte, in spec order
#   -v mid="4:111.4 100.3"  optional: one more check after the 4th sample
#   -v headers=ic02    the headers IC-02's data system exports (else the layout of §5.4)
#   -v is_area=48000   with an internal standard -v noise=1.0 -v seed=N
BEGIN {
  n = read_spec(spec)
  for (i = 1; i <= n; i++) {
    split(rest[names[i]], f, "|")
    nominal[names[i]] = f[1] + 0
    split(f[2], range, ":"); lo[names[i]] = range[1] + 0; hi[names[i]] = range[2] + 0
  }
  m = split(samples, ids, " ")
  split(opening, open_rec, " "); split(closing, close_rec, " ")
  mid_after = 0
  if (mid != "") { split(mid, mm, ":"); mid_after = mm[1] + 0; split(mm[2], mid_rec, " ") }
  if (headers == "ic02") print "Inj,Type,Sample ID,Component,Area,Expected,Dilution"
  else printf "position,kind,sample,analyte,response,%sdilution,nominal\n", is_area ? "is_response," : ""
  pos = 0; state = seed + 0
  checks(open_rec, "CCV-1")
  for (i = 1; i <= n; i++) row("blank", "CCB-1", names[i], slope[names[i]] * 0.02 * (0.5 + rnd()), "", "")
  for (s = 1; s <= m; s++) {
    for (i = 1; i <= n; i++) {
      a = names[i]
      keep = state; state = seed_from(ids[s] a)
      x = lo[a] + (hi[a] - lo[a]) * rnd()
      state = keep
      dil = (s % 4 == 3) ? 2 : 1
      row("sample", ids[s], a, respond(a, x / dil) * jitter(noise), dil == 1 ? "" : dil, "")
    }
    if (s == mid_after) checks(mid_rec, "CCV-M")
  }
  checks(close_rec, "CCV-2")
}
function checks(rec, id, i, a) {
  for (i = 1; i <= n; i++) {
    a = names[i]
    row("check", id, a, respond(a, nominal[a] * rec[i] / 100), "", nominal[a])
  }
}
function row(kind, id, a, y, dil, nom, area) {
  ++pos
  if (headers == "ic02") {
    printf "%d,%s,%s,%s,%.4g,%s,%s\n", pos, kind, id, a, y, nom, dil
  } else if (is_area) {
    area = is_area * jitter(2)
    printf "%d,%s,%s,%s,%.6g,%.6g,%s,%s\n", pos, kind, id, a, y * area, area, dil, nom
  } else {
    printf "%d,%s,%s,%s,%.4g,%s,%s\n", pos, kind, id, a, y, dil, nom
  }
}
