"""make_calibration.py writes outside reference values for sill's
calibration tests (internal/calibration).

It reads testdata/reference/breast_cancer.csv (logistic-regression scores on
scikit-learn's bundled breast cancer data, written by
testdata/reference/make_reference.py) and writes, in testdata/calibration-delong/:

  calibration_ties.csv  score,label  seeded synthetic scores rounded to two
                        decimals, so that many scores sit exactly on bin
                        edges (0.1, 0.2, ..., and 0 and 1)
  calibration.json      scikit-learn's calibration_curve for both sets, with
                        n_bins 5 and 10 and strategy "uniform" and
                        "quantile"

calibration_curve returns (prob_true, prob_pred) for the non-empty bins
only. The count of rows in each bin and the expected calibration error are
not part of its output: the script recomputes the bin of every row exactly
as calibration_curve does (np.searchsorted over the inner edges, with the
edges from np.linspace or np.percentile) and counts them with np.bincount;
ECE is then sum(count/n * |prob_true - prob_pred|) over those bins. The
edges are written too.

Run by hand from the repository root with Debian's interpreter and Debian's
python3-sklearn:

    /usr/bin/python3 testdata/calibration-delong/make_calibration.py

CI never runs it. The output is deterministic (fixed numpy seed). The
library versions are recorded under "versions".
"""

import csv
import json
import os

import numpy as np
import sklearn
from sklearn.calibration import calibration_curve

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))


def read(path):
    scores, labels = [], []
    with open(path) as f:
        for row in csv.DictReader(f):
            scores.append(float(row["score"]))
            labels.append(int(row["label"]))
    return np.array(scores), np.array(labels)


def ties():
    rng = np.random.default_rng(20261201)
    n = 500
    labels = (rng.random(n) < 0.3).astype(int)
    latent = rng.normal(size=n) + 1.2 * labels
    scores = np.round(1 / (1 + np.exp(-(1.5 * latent - 1.0))), 2)
    # A few rows exactly at the ends and on edges.
    scores[:6] = [0.0, 1.0, 0.2, 0.5, 0.3, 0.7]
    path = os.path.join(HERE, "calibration_ties.csv")
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["score", "label"])
        for s, y in zip(scores, labels):
            w.writerow([repr(float(s)), int(y)])
    return read(path)


def reference(scores, labels, n_bins, strategy):
    prob_true, prob_pred = calibration_curve(labels, scores, n_bins=n_bins, strategy=strategy)
    if strategy == "quantile":
        edges = np.percentile(scores, np.linspace(0, 1, n_bins + 1) * 100)
    else:
        edges = np.linspace(0.0, 1.0, n_bins + 1)
    binids = np.searchsorted(edges[1:-1], scores)
    counts = np.bincount(binids, minlength=len(edges))
    nonzero = counts != 0
    counts = counts[nonzero]
    ece = float(np.sum(counts / len(scores) * np.abs(prob_true - prob_pred)))
    return {
        "n_bins": n_bins,
        "strategy": strategy,
        "edges": [float(e) for e in edges],
        "prob_true": [float(v) for v in prob_true],
        "prob_pred": [float(v) for v in prob_pred],
        "counts": [int(c) for c in counts],
        "ece": ece,
    }


def main():
    sets = {
        "breast_cancer": (read(os.path.join(ROOT, "testdata", "reference", "breast_cancer.csv")), "../reference/breast_cancer.csv"),
        "ties": (ties(), "calibration_ties.csv"),
    }
    out = {"versions": {"scikit-learn": sklearn.__version__, "numpy": np.__version__}, "datasets": {}}
    for name, ((scores, labels), path) in sets.items():
        out["datasets"][name] = {
            "file": path,
            "curves": [reference(scores, labels, b, s) for b in (5, 10) for s in ("uniform", "quantile")],
        }
    with open(os.path.join(HERE, "calibration.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
