"""The scikit-learn pipeline of the side-by-side benchmark (issue 5).

Reads the table with pandas.read_csv, then computes roc_auc_score,
average_precision_score, precision_recall_curve and roc_curve, as a
modeller would to pick a cut by hand. Run with Debian's python3-pandas and
python3-sklearn: /usr/bin/python3 bench/sklearn_pipeline.py FILE
"""
import sys

import pandas
from sklearn.metrics import (average_precision_score, precision_recall_curve,
                             roc_auc_score, roc_curve)


def main(path):
    frame = pandas.read_csv(path)
    score = frame["score"].to_numpy()
    label = frame["label"].to_numpy()
    auc = roc_auc_score(label, score)
    ap = average_precision_score(label, score)
    precision, recall, pr_cuts = precision_recall_curve(label, score)
    fpr, tpr, roc_cuts = roc_curve(label, score)
    print("rows %d roc_auc %.12f average_precision %.12f pr_cuts %d roc_cuts %d"
          % (len(frame), auc, ap, len(pr_cuts), len(roc_cuts)))


if __name__ == "__main__":
    main(sys.argv[1])
