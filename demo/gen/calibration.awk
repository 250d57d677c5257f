# Writes a demo points file (product.md §7) for a calibration of the fictional lab.
#   -v spec="nitrate|0.1|0|0.5 1 5 10 25 50;sulfate|..."  analyte|slope|curvature|levels
#   -v reps=2 -v noise=1.0 (% of the response) -v seed=N
#   -v is_area=48000   with an internal standard: responses are areas, is_response its area
#   -v exclude="sulfate|4|0.28|air bubble in the loop"  one more injection at that level, its
#                      response times the factor, excluded with the reason
#   -v spoil="chloroform|1|1.45"  every injection at that level times the factor (not excluded)
BEGIN {
  n = read_spec(spec)
  state = seed + 0
  split(exclude, ex, "|")
  split(spoil, sp, "|")
  printf "analyte,level,replicate,nominal,response,%sexclude\n", is_area ? "is_response," : ""
  for (i = 1; i <= n; i++) {
    a = names[i]
    m = split(rest[a], levels, " ")
    for (l = 1; l <= m; l++) {
      x = levels[l] + 0
      last = reps + (a == ex[1] && l == ex[2] + 0 ? 1 : 0)
      for (r = 1; r <= last; r++) {
        y = respond(a, x) * jitter(noise)
        if (a == sp[1] && l == sp[2] + 0) y *= sp[3]
        reason = ""
        if (r > reps) { y *= ex[3]; reason = ex[4] }
        if (is_area) {
          area = is_area * jitter(2)
          printf "%s,%d,%d,%s,%.6g,%.6g,%s\n", a, l, r, x, y * area, area, reason
        } else {
          printf "%s,%d,%d,%s,%.4g,%s\n", a, l, r, x, y, reason
        }
      }
    }
  }
}
