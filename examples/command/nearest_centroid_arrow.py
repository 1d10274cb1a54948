#!/usr/bin/env python3
"""The nearest-centroid command: learner of nearest_centroid.py, reading Arrow files (format=arrow).

foldwise hands the fold over as Arrow IPC files (train.arrow, test.arrow) when the learner spec
says format=arrow; job.json's "format" says so too. This program needs pyarrow
(pip install pyarrow) and is an example for users, not run by the test suite.

    foldwise eval examples/packhouse/fruit-grading.csv --target grade --drop lot_id --group orchard \
      --command 'centroid-arrow=python3 ./examples/command/nearest_centroid_arrow.py' \
      --learner 'command:centroid-arrow;format=arrow'

With prep=foldwise (the default) every feature is a double column and the target (the last
column of train.arrow) a string column for classification. The predictions file stays CSV: one
probability column per class, the header naming the classes.
"""
import csv
import json
import math
import os
import sys

import pyarrow.feather as feather


def main():
    train_path, test_path, out_path = sys.argv[-3:]
    with open(os.environ["FOLDWISE_JOB"], encoding="utf-8") as f:
        job = json.load(f)
    if job["task"] != "classification":
        sys.exit("nearest_centroid_arrow.py: classification only")
    train = feather.read_table(train_path)
    test = feather.read_table(test_path)
    target = job["target"]
    features = [n for n in train.column_names if n != target]
    y = train.column(target).to_pylist()
    X = [train.column(n).to_pylist() for n in features]
    T = [test.column(n).to_pylist() for n in features]
    classes = job["classes"]
    spread = []
    for col in X:
        m = sum(col) / len(col)
        spread.append(math.sqrt(sum((v - m) ** 2 for v in col) / max(1, len(col) - 1)) or 1.0)
    centroids = {}
    for c in classes:
        idx = [i for i, v in enumerate(y) if v == c]
        centroids[c] = [sum(col[i] for i in idx) / len(idx) if idx else 0.0 for col in X]
    temperature = float(os.environ.get("FOLDWISE_OPTION_TEMPERATURE", "1"))
    with open(out_path, "w", newline="", encoding="utf-8") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(classes)
        for r in range(test.num_rows):
            d = [math.sqrt(sum(((T[j][r] - centroids[c][j]) / spread[j]) ** 2 for j in range(len(features)))) for c in classes]
            e = [math.exp(-(x - min(d)) / temperature) for x in d]
            s = sum(e)
            w.writerow([v / s for v in e])


if __name__ == "__main__":
    main()
