# survey_reference.R writes survey_reference.csv: reference values for the
# linearised variance and Korn and Graubard's effective sample size of
# sampling weights, from R's survey package (Lumley), for
# TestSurveyReference in ../design_test.go. CI does not run it; run it by
# hand from this folder (Debian: apt-get install r-cran-survey):
#
#   Rscript survey_reference.R
#
# The design is one stage, no strata or clusters, each row drawn with the
# probability 1/weight (svydesign(ids = ~1, weights = ~weight)), which
# survey treats as drawn with replacement: var = n/(n-1) sum (w z)^2 for
# the linearised values z of a ratio. For each cut and figure it writes
# the estimate, its variance (svymean's vcov), the effective size that
# svyciprop(method = "beta") uses, n.eff = p(1-p)/var times Korn and
# Graubard's degrees-of-freedom factor (qt(alpha/2, nrow - 1) /
# qt(alpha/2, degf))^2, that factor itself, and svyciprop's interval
# (Clopper-Pearson at n.eff, for the record: sill takes Wilson's at the
# same n.eff). A figure within the true cases (recall) is a domain: the
# design is subset, which keeps every row for the variance.
suppressMessages(library(survey))
d <- read.csv("survey_sample.csv")
des <- svydesign(ids = ~1, weights = ~weight, data = d)
figures <- list(
  recall = list(y = quote(flagged), domain = quote(label == 1)),
  false_positive_rate = list(y = quote(flagged), domain = quote(label == 0)),
  precision = list(y = quote(label), domain = quote(flagged == 1)),
  flagged_share = list(y = quote(flagged), domain = NULL),
  base_rate = list(y = quote(label), domain = NULL)
)
out <- NULL
for (cut in c(0.5, 0.7)) {
  des <- update(des, flagged = as.numeric(score >= cut))
  for (name in names(figures)) {
    f <- figures[[name]]
    sub <- des
    if (!is.null(f$domain)) sub <- eval(bquote(subset(des, .(f$domain))))
    form <- eval(bquote(~ .(f$y)))
    m <- svymean(form, sub)
    ci <- svyciprop(form, sub, method = "beta", level = 0.95)
    p <- coef(m)[[1]]
    v <- vcov(m)[[1]]
    factor <- (qt(0.025, nrow(sub) - 1) / qt(0.025, degf(sub)))^2
    out <- rbind(out, data.frame(cut = cut, figure = name, estimate = p, variance = v,
      n_eff = p * (1 - p) / v * factor, df_factor = factor, rows = nrow(sub), degf = degf(sub),
      beta_low = attr(ci, "ci")[[1]], beta_high = attr(ci, "ci")[[2]]))
  }
}
cat(sprintf("# R %s, survey %s\n", getRversion(), packageVersion("survey")), file = "survey_reference.csv")
suppressWarnings(write.table(format(out, digits = 15), "survey_reference.csv", sep = ",", row.names = FALSE, quote = FALSE, append = TRUE))
