# make_delong.R writes outside reference values for sill's paired AUC test
# (internal/modelpair): DeLong, DeLong and Clarke-Pearson 1988, "Comparing
# the areas under two or more correlated receiver operating characteristic
# curves: a nonparametric approach", as computed by the R package pROC.
#
# It writes, in testdata/calibration-delong/:
#
#   delong_smooth.csv   label,a,b  300 seeded cases, two correlated models
#                       scored on them, rounded to 3 decimals
#   delong_ratings.csv  label,a,b  120 seeded cases rated 1..5 by two
#                       readers, so that ties are everywhere
#   delong.json         per file: both AUCs, pROC's DeLong variances and
#                       covariance, and roc.test's z and two-sided p
#
# Run by hand from the repository root with Debian's r-cran-proc:
#
#     Rscript testdata/calibration-delong/make_delong.R
#
# CI never runs it. R's own generator with a fixed seed makes the output
# deterministic. pROC is told the direction (controls < cases: a higher
# score is riskier) and the levels (0 = control, 1 = case) so that it
# never guesses them.

suppressPackageStartupMessages(library(pROC))
here <- "testdata/calibration-delong"

make_smooth <- function() {
  set.seed(19880901)
  n <- 300
  label <- as.integer(runif(n) < 0.35)
  common <- rnorm(n)
  a <- round(plogis(1.1 * label + 0.8 * common + 0.6 * rnorm(n) - 0.5), 3)
  b <- round(plogis(0.8 * label + 0.8 * common + 0.8 * rnorm(n) - 0.5), 3)
  data.frame(label = label, a = a, b = b)
}

make_ratings <- function() {
  set.seed(19830401)
  n <- 120
  label <- as.integer(runif(n) < 0.4)
  latent <- 1.2 * label + rnorm(n)
  cut5 <- function(x) as.integer(cut(x, c(-Inf, -0.5, 0.2, 0.8, 1.5, Inf)))
  a <- cut5(latent + 0.5 * rnorm(n))
  b <- cut5(0.7 * latent + 0.9 * rnorm(n))
  data.frame(label = label, a = a, b = b)
}

num <- function(x) sprintf("%.17g", x)

reference <- function(name, d) {
  write.csv(d, file.path(here, paste0(name, ".csv")), row.names = FALSE, quote = FALSE)
  ra <- roc(d$label, d$a, levels = c(0, 1), direction = "<", quiet = TRUE)
  rb <- roc(d$label, d$b, levels = c(0, 1), direction = "<", quiet = TRUE)
  t <- roc.test(ra, rb, method = "delong", paired = TRUE)
  paste0(
    '  "', name, '": {\n',
    '   "file": "', name, '.csv",\n',
    '   "auc_a": ', num(as.numeric(auc(ra))), ",\n",
    '   "auc_b": ', num(as.numeric(auc(rb))), ",\n",
    '   "var_a": ', num(var(ra, method = "delong")), ",\n",
    '   "var_b": ', num(var(rb, method = "delong")), ",\n",
    '   "cov_ab": ', num(cov(ra, rb, method = "delong")), ",\n",
    '   "z": ', num(as.numeric(t$statistic)), ",\n",
    '   "p": ', num(t$p.value), "\n",
    "  }"
  )
}

parts <- c(reference("delong_smooth", make_smooth()), reference("delong_ratings", make_ratings()))
out <- paste0(
  "{\n",
  ' "versions": {"R": "', R.version$major, ".", R.version$minor, '", "pROC": "', as.character(packageVersion("pROC")), '"},\n',
  ' "datasets": {\n', paste(parts, collapse = ",\n"), "\n }\n}\n"
)
cat(out, file = file.path(here, "delong.json"))
