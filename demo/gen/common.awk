# Shared by the demo's data generators: a portable pseudo-random sequence (Park-Miller minimal
# standard, exact in double arithmetic, so mawk and gawk give the same files) and the detector
# response of an analyte: response = slope*x + curvature*x^2.
function rnd() {
  state = (state * 16807) % 2147483647
  return state / 2147483647
}
function jitter(pct) { return 1 + pct / 100 * (2 * rnd() - 1) }
function respond(a, x) { return slope[a] * x + curv[a] * x * x }
function seed_from(text, i, h) {
  h = 7
  for (i = 1; i <= length(text); i++) h = (h * 31 + index(CHARS, substr(text, i, 1))) % 2147483647
  return h == 0 ? 1 : h
}
# spec: "name|slope|curvature|rest;name|..." → names[1..n], slope[], curv[], rest[]
function read_spec(spec, parts, f, i, n) {
  CHARS = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz-_ ."
  n = split(spec, parts, ";")
  for (i = 1; i <= n; i++) {
    split(parts[i], f, "|")
    names[i] = f[1]; slope[f[1]] = f[2] + 0; curv[f[1]] = f[3] + 0
    rest[f[1]] = parts[i]
    sub(/^[^|]*\|[^|]*\|[^|]*\|/, "", rest[f[1]])
  }
  return n
}
