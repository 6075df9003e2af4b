# make_ci_auc.R writes outside reference values for sill's interval of one
# model's ROC AUC (internal/modelpair Single, DeLong's variance): pROC's
# ci.auc(method = "delong"), the normal interval AUC ± z·SE clipped to
# [0,1].
#
# It reads the committed delong_smooth.csv and delong_ratings.csv (written
# by make_delong.R; column a is the model) and writes, in
# testdata/calibration-delong/:
#
#   hanley_mcneil.csv   label,rating  the 109 CT images of Hanley and
#                       McNeil (1982, "The meaning and use of the area
#                       under a receiver operating characteristic (ROC)
#                       curve", Radiology, table 1; counts from memory):
#                       58 normal rated 33, 6, 6, 11, 2 and 51 abnormal
#                       rated 3, 2, 2, 11, 33 on ratings 1..5
#   ci_auc.json         per file: the AUC, var(method = "delong") and
#                       ci.auc(method = "delong") at 90% and 95%
#
# Run by hand from the repository root with Debian's r-cran-proc:
#
#     Rscript testdata/calibration-delong/make_ci_auc.R
#
# CI never runs it. pROC is told the direction (controls < cases) and the
# levels (0 = control, 1 = case) so that it never guesses them.

suppressPackageStartupMessages(library(pROC))
here <- "testdata/calibration-delong"

hanley_mcneil <- function() {
  normal <- c(33, 6, 6, 11, 2)
  abnormal <- c(3, 2, 2, 11, 33)
  data.frame(
    label = c(rep(0L, sum(normal)), rep(1L, sum(abnormal))),
    rating = c(rep(1:5, normal), rep(1:5, abnormal))
  )
}

num <- function(x) sprintf("%.17g", x)

reference <- function(name, file, column, d) {
  r <- roc(d$label, d[[column]], levels = c(0, 1), direction = "<", quiet = TRUE)
  ci90 <- ci.auc(r, conf.level = 0.90, method = "delong")
  ci95 <- ci.auc(r, conf.level = 0.95, method = "delong")
  paste0(
    '  "', name, '": {\n',
    '   "file": "', file, '",\n',
    '   "column": "', column, '",\n',
    '   "auc": ', num(as.numeric(auc(r))), ",\n",
    '   "var": ', num(var(r, method = "delong")), ",\n",
    '   "ci90": [', num(ci90[1]), ", ", num(ci90[3]), "],\n",
    '   "ci95": [', num(ci95[1]), ", ", num(ci95[3]), "]\n",
    "  }"
  )
}

hm <- hanley_mcneil()
write.csv(hm, file.path(here, "hanley_mcneil.csv"), row.names = FALSE, quote = FALSE)
read <- function(file) read.csv(file.path(here, file))
parts <- c(
  reference("hanley_mcneil", "hanley_mcneil.csv", "rating", hm),
  reference("delong_smooth", "delong_smooth.csv", "a", read("delong_smooth.csv")),
  reference("delong_ratings", "delong_ratings.csv", "a", read("delong_ratings.csv"))
)
out <- paste0(
  "{\n",
  ' "versions": {"R": "', R.version$major, ".", R.version$minor, '", "pROC": "', as.character(packageVersion("pROC")), '"},\n',
  ' "datasets": {\n', paste(parts, collapse = ",\n"), "\n }\n}\n"
)
cat(out, file = file.path(here, "ci_auc.json"))
