# The deterministic JSON writer of the R generators, which all source it: jarr() forces an
# array, numbers are written with the shortest of %.15g / %.17g that reads back to the same double.
# Not a generator itself (no gen_ prefix), so generate.sh does not run it.

out_dir <- file.path("test", "reference", "fixtures")
if (!dir.exists(out_dir)) stop("run from the repository root (", out_dir, " not found)")

# ---------------------------------------------------------------- a small deterministic JSON writer
jarr <- function(x) structure(list(v = x), class = "jarr") # force an array even for length 1
num <- function(x) {
  if (!is.finite(x)) stop("non-finite number in fixture")
  if (x == round(x) && abs(x) < 1e15) return(sprintf("%.0f", x))
  s <- sprintf("%.15g", x)
  if (as.numeric(s) != x) s <- sprintf("%.17g", x)
  s
}
str_json <- function(s) paste0('"', gsub('"', '\\\\"', gsub("\\\\", "\\\\\\\\", s)), '"')
to_json <- function(v, ind = "") {
  nxt <- paste0(ind, " ")
  if (inherits(v, "jarr")) v <- v$v
  else if (is.null(v)) return("null")
  else if (is.list(v) && !is.null(names(v))) {
    if (length(v) == 0) return("{}")
    items <- vapply(names(v), function(k) paste0(nxt, str_json(k), ": ", to_json(v[[k]], nxt)), "")
    return(paste0("{\n", paste(items, collapse = ",\n"), "\n", ind, "}"))
  } else if (is.list(v)) {
    if (length(v) == 0) return("[]")
    items <- vapply(v, function(e) paste0(nxt, to_json(e, nxt)), "")
    return(paste0("[\n", paste(items, collapse = ",\n"), "\n", ind, "]"))
  } else if (length(v) == 1) {
    if (is.character(v)) return(str_json(v))
    if (is.logical(v)) return(if (v) "true" else "false")
    return(num(v))
  }
  # atomic vector (or a forced array): one line
  if (is.character(v)) return(paste0("[", paste(vapply(v, str_json, ""), collapse = ", "), "]"))
  if (is.logical(v)) return(paste0("[", paste(ifelse(v, "true", "false"), collapse = ", "), "]"))
  paste0("[", paste(vapply(as.numeric(v), num, ""), collapse = ", "), "]")
}
write_json <- function(obj, name) {
  path <- file.path(out_dir, name)
  writeLines(to_json(obj), path, useBytes = TRUE)
  cat("wrote", path, "\n")
}
