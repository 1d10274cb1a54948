#!/usr/bin/env python3
"""A foldwise command: learner in plain Python (standard library only), protocol foldwise-command/1.

foldwise runs it once per fold as

    python3 examples/command/nearest_centroid.py TRAIN_CSV TEST_CSV PREDICTIONS_CSV

inside a fresh private folder. With prep=foldwise (the default) every feature column is a number
(imputed and one-hot encoded on the training rows of the fold); the target is the last column of
TRAIN_CSV. This program predicts the class whose training centroid is nearest (after scaling each
column by its training spread) and writes one probability column per class, so probabilistic
metrics work too. Option `temperature` (FOLDWISE_OPTION_TEMPERATURE) softens the probabilities.

Try it on the packhouse demo:

    foldwise eval examples/packhouse/fruit-grading.csv --target grade --drop lot_id --group orchard \
      --command 'centroid=python3 ./examples/command/nearest_centroid.py' \
      --learner 'command:centroid;temperature=0.5'

It is an example for users and is not run by the test suite (which only assumes Node).
"""
import csv
import json
import math
import os
import sys


def read_rows(path):
    with open(path, newline="", encoding="utf-8") as f:
        rows = list(csv.reader(f))
    return rows[0], rows[1:]


def main():
    train_path, test_path, out_path = sys.argv[-3:]
    job = json.load(open(os.environ["FOLDWISE_JOB"], encoding="utf-8"))
    if job["task"] != "classification" or job["prep"] != "foldwise":
        sys.exit("nearest_centroid.py: classification with prep=foldwise only")
    temperature = float(os.environ.get("FOLDWISE_OPTION_TEMPERATURE", "1"))

    header, train = read_rows(train_path)
    width = len(header) - 1
    xs = [[float(v) for v in row[:width]] for row in train]
    ys = [row[width] for row in train]

    # each column's training spread, so that no column dominates the distance
    n = len(xs)
    means = [sum(x[j] for x in xs) / n for j in range(width)]
    sds = [math.sqrt(sum((x[j] - means[j]) ** 2 for x in xs) / n) or 1.0 for j in range(width)]

    classes = job["classes"]
    centroids = {}
    for c in classes:
        members = [x for x, y in zip(xs, ys) if y == c]
        if members:
            centroids[c] = [sum(x[j] for x in members) / len(members) for j in range(width)]

    _, test = read_rows(test_path)
    with open(out_path, "w", newline="", encoding="utf-8") as f:
        out = csv.writer(f, lineterminator="\n")
        seen = list(centroids)  # classes absent from this training fold get probability 0
        out.writerow(seen)
        for row in test:
            q = [float(v) for v in row]
            d = [math.sqrt(sum(((q[j] - m[j]) / sds[j]) ** 2 for j in range(width))) for m in centroids.values()]
            low = min(d)
            w = [math.exp(-(di - low) / temperature) for di in d]
            total = sum(w)
            out.writerow([repr(wi / total) for wi in w])


if __name__ == "__main__":
    main()
