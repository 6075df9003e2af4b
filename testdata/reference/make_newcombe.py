"""make_newcombe.py writes newcombe.json: statsmodels' intervals of the
difference between two independent proportions by Newcombe's hybrid score
method (Newcombe 1998, method 10), for internal/interval's Difference.

Run by hand from the repository root with Debian's interpreter and Debian's
python3-statsmodels package (CI never runs it; the Go test reads the file):

    /usr/bin/python3 testdata/reference/make_newcombe.py

The first four cases are the worked examples of Newcombe (1998), table II
(56/70-48/80, 9/10-3/10, 6/7-2/7, 5/56-0/29); the rest cover empty and full
proportions, non-integer (weighted) counts and other levels. Floats are
written with repr(), which round-trips exactly.
"""

import json
import sys

import statsmodels
from statsmodels.stats.proportion import confint_proportions_2indep

CASES = [
    (56, 70, 48, 80, 0.05),
    (9, 10, 3, 10, 0.05),
    (6, 7, 2, 7, 0.05),
    (5, 56, 0, 29, 0.05),
    (0, 10, 0, 20, 0.05),
    (10, 10, 20, 20, 0.05),
    (0, 15, 15, 15, 0.05),
    (261, 300, 219, 300, 0.05),
    (12.5, 40.25, 30.75, 61.5, 0.05),
    (3, 1000, 1, 5, 0.10),
    (870, 1000, 7300, 10000, 0.01),
    (1, 2, 1, 3, 0.50),
]

out = {
    "generator": "testdata/reference/make_newcombe.py",
    "method": "statsmodels.stats.proportion.confint_proportions_2indep(method=\"newcomb\", compare=\"diff\")",
    "versions": {"python": sys.version.split()[0], "statsmodels": statsmodels.__version__},
    "cases": [],
}
for s1, n1, s2, n2, alpha in CASES:
    low, high = confint_proportions_2indep(s1, n1, s2, n2, method="newcomb", compare="diff", alpha=alpha)
    out["cases"].append({"count1": float(s1), "nobs1": float(n1), "count2": float(s2), "nobs2": float(n2),
                         "alpha": alpha, "low": float(low), "high": float(high)})

with open("testdata/reference/newcombe.json", "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
