"""make_reference.py writes outside reference values for sill's engine tests.

It produces, in testdata/reference/:

  breast_cancer.csv          score,label  logistic-regression scores on
                                          scikit-learn's bundled breast cancer
                                          data (fit on even rows, scored on odd
                                          rows); label 1 = dataset target 1
  breast_cancer_feature.csv  score,label  raw "mean radius" feature (many ties,
                                          not a probability); label 1 = target 0
  ties_weights.csv           score,label,weight  seeded synthetic data with
                                          scores rounded to 1 decimal and
                                          integer weights 0..3
  reference.json             scikit-learn metrics and curves for each CSV
  wilson.json                statsmodels Wilson score intervals

It is run by hand from the repository root, with Debian's interpreter and
Debian's python3-sklearn and python3-statsmodels packages:

    /usr/bin/python3 testdata/reference/make_reference.py

CI never runs it; the Go tests read the files it wrote. The output is
deterministic: the breast cancer data ships inside scikit-learn (no download),
the model fit is deterministic, and the synthetic data uses a fixed numpy seed.
The library versions used are recorded under "versions" in reference.json
(committed run: scikit-learn 1.2.1, statsmodels 0.13.5, numpy 1.24.2).

Notes on scikit-learn conventions, for whoever maps these onto sill:

  * precision_recall_curve returns thresholds in ascending order, with
    precision[i] and recall[i] being the values when a case is flagged when
    score >= thresholds[i]. precision and recall carry one extra final point
    (precision=1, recall=0) that has no threshold.
  * roc_curve returns thresholds in descending order. Its first threshold is
    an invented one (max score + 1 in scikit-learn 1.2; +inf in later
    versions) giving the point fpr=tpr=0. drop_intermediate=False keeps one
    point per distinct score.
  * With sample_weight, scikit-learn drops zero-weight rows before building
    curves, so a score carried only by zero-weight rows is not a threshold.
  * Floats are written with repr(), which round-trips exactly.
"""

import csv
import json
import math
import os
import sys

import numpy as np
import scipy
import sklearn
import statsmodels
from sklearn.datasets import load_breast_cancer
from sklearn.linear_model import LogisticRegression
from sklearn.metrics import (
    average_precision_score,
    brier_score_loss,
    log_loss,
    precision_recall_curve,
    roc_auc_score,
    roc_curve,
)
from sklearn.preprocessing import StandardScaler
from statsmodels.stats.proportion import proportion_confint

OUT_DIR = os.path.join("testdata", "reference")

# LOG_LOSS_CLIP is sill's rule: probabilities are clipped to
# [LOG_LOSS_CLIP, 1 - LOG_LOSS_CLIP] before taking logs. scikit-learn 1.2's
# log_loss defaults to eps="auto" (float64 machine epsilon, about 2.2e-16),
# not 1e-15, and later versions drop the eps argument and stop clipping. So
# we clip ourselves with numpy before calling log_loss and also pass
# eps=LOG_LOSS_CLIP where the installed version still accepts it; both give
# the same clip.
LOG_LOSS_CLIP = 1e-15

SYNTHETIC_SEED = 20261201
SYNTHETIC_ROWS = 400


def write_csv(name, columns, rows):
    path = os.path.join(OUT_DIR, name)
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(columns)
        for row in rows:
            w.writerow(row)


def fmt_float(x):
    # repr of a Python float is the shortest string that round-trips exactly.
    return repr(float(x))


def breast_cancer_model():
    data = load_breast_cancer()
    x, y = data.data, data.target
    idx = np.arange(len(y))
    train, test = idx % 2 == 0, idx % 2 == 1
    scaler = StandardScaler().fit(x[train])
    model = LogisticRegression(max_iter=5000)
    model.fit(scaler.transform(x[train]), y[train])
    scores = model.predict_proba(scaler.transform(x[test]))[:, 1]
    labels = (y[test] == 1).astype(int)
    return scores, labels


def breast_cancer_feature():
    data = load_breast_cancer()
    names = list(data.feature_names)
    scores = data.data[:, names.index("mean radius")]
    labels = (data.target == 0).astype(int)  # 1 = malignant
    return scores, labels


def synthetic_ties_weights():
    rng = np.random.default_rng(SYNTHETIC_SEED)
    scores = np.round(rng.uniform(0.0, 1.0, SYNTHETIC_ROWS), 1)
    positive_rate = 0.1 + 0.8 * scores
    labels = (rng.uniform(0.0, 1.0, SYNTHETIC_ROWS) < positive_rate).astype(int)
    weights = rng.choice([0, 1, 2, 3], size=SYNTHETIC_ROWS, p=[0.1, 0.3, 0.3, 0.3])
    return scores, labels, weights


def sklearn_log_loss(labels, scores, weights):
    clipped = np.clip(scores, LOG_LOSS_CLIP, 1 - LOG_LOSS_CLIP)
    try:
        return log_loss(
            labels, clipped, labels=[0, 1], sample_weight=weights, eps=LOG_LOSS_CLIP
        )
    except TypeError:
        # eps argument removed; the numpy clip above already applied the rule.
        return log_loss(labels, clipped, labels=[0, 1], sample_weight=weights)


def floats(a):
    out = [float(v) for v in a]
    for v in out:
        if not math.isfinite(v):
            sys.exit("non-finite value in output; JSON cannot hold it")
    return out


def metrics(scores, labels, weights=None):
    probabilities = bool(np.all((scores >= 0) & (scores <= 1)))
    out = {
        "rows": int(len(scores)),
        "weighted": weights is not None,
        "roc_auc": float(roc_auc_score(labels, scores, sample_weight=weights)),
        "average_precision": float(
            average_precision_score(labels, scores, sample_weight=weights)
        ),
    }
    # Brier score and log loss are only defined for probabilities; the raw
    # feature file gets neither.
    if probabilities:
        out["brier"] = float(brier_score_loss(labels, scores, sample_weight=weights))
        out["log_loss"] = float(sklearn_log_loss(labels, scores, weights))
    precision, recall, pr_thresholds = precision_recall_curve(
        labels, scores, sample_weight=weights
    )
    out["precision_recall_curve"] = {
        "precision": floats(precision),
        "recall": floats(recall),
        "thresholds": floats(pr_thresholds),
    }
    fpr, tpr, roc_thresholds = roc_curve(
        labels, scores, sample_weight=weights, drop_intermediate=False
    )
    out["roc_curve"] = {
        "fpr": floats(fpr),
        "tpr": floats(tpr),
        "thresholds": floats(roc_thresholds),
    }
    return out


WILSON_CASES = [
    (0, 10),
    (1, 10),
    (5, 10),
    (10, 10),
    (3, 17),
    (81, 263),
    (0, 1),
    (1, 1),
    (50, 100),
    (999, 1000),
]
# Non-integer counts, as weighted tallies produce. statsmodels' Wilson formula
# only uses count/nobs and nobs, so it accepts them.
WILSON_FRACTIONAL_CASES = [
    (2.5, 7.5),
    (0.5, 3.0),
    (12.25, 40.75),
]
WILSON_ALPHAS = [0.05, 0.10, 0.01]


def wilson_table():
    cases = []
    for count, nobs in WILSON_CASES + WILSON_FRACTIONAL_CASES:
        for alpha in WILSON_ALPHAS:
            low, high = proportion_confint(count, nobs, alpha=alpha, method="wilson")
            cases.append(
                {
                    "count": float(count),
                    "nobs": float(nobs),
                    "alpha": alpha,
                    "low": float(low),
                    "high": float(high),
                }
            )
    return cases


def main():
    if not os.path.isdir(OUT_DIR):
        sys.exit("run from the repository root: %s not found" % OUT_DIR)

    versions = {
        "python": "%d.%d.%d" % sys.version_info[:3],
        "numpy": np.__version__,
        "scipy": scipy.__version__,
        "sklearn": sklearn.__version__,
        "statsmodels": statsmodels.__version__,
    }

    reference = {
        "versions": versions,
        "generator": "testdata/reference/make_reference.py",
        "log_loss_clip": LOG_LOSS_CLIP,
        "datasets": {},
    }

    scores, labels = breast_cancer_model()
    write_csv(
        "breast_cancer.csv",
        ["score", "label"],
        [(fmt_float(s), int(l)) for s, l in zip(scores, labels)],
    )
    reference["datasets"]["breast_cancer.csv"] = metrics(scores, labels)

    scores, labels = breast_cancer_feature()
    write_csv(
        "breast_cancer_feature.csv",
        ["score", "label"],
        [(fmt_float(s), int(l)) for s, l in zip(scores, labels)],
    )
    reference["datasets"]["breast_cancer_feature.csv"] = metrics(scores, labels)

    scores, labels, weights = synthetic_ties_weights()
    write_csv(
        "ties_weights.csv",
        ["score", "label", "weight"],
        [(fmt_float(s), int(l), int(w)) for s, l, w in zip(scores, labels, weights)],
    )
    reference["datasets"]["ties_weights.csv"] = metrics(
        scores, labels, weights.astype(float)
    )

    with open(os.path.join(OUT_DIR, "reference.json"), "w") as f:
        json.dump(reference, f, indent=1, allow_nan=False)
        f.write("\n")

    wilson = {
        "versions": versions,
        "generator": "testdata/reference/make_reference.py",
        "method": 'statsmodels.stats.proportion.proportion_confint(method="wilson")',
        "cases": wilson_table(),
    }
    with open(os.path.join(OUT_DIR, "wilson.json"), "w") as f:
        json.dump(wilson, f, indent=1, allow_nan=False)
        f.write("\n")


if __name__ == "__main__":
    main()
