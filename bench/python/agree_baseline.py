"""Baseline for `npm run bench`: the pipeline a team would write in Python to get the same two
token kappas: parse two IOB column files, align utterances by `# id`, and call scikit-learn's
cohen_kappa_score on full tags and on slot types (B-X and I-X both X). Run with /usr/bin/python3
(Debian python3-sklearn)."""
import json
import sys

from sklearn.metrics import cohen_kappa_score


def read_columns(path):
    utterances = {}
    order = []
    current_id = None
    tags = []

    def flush():
        nonlocal current_id, tags
        if tags:
            key = current_id if current_id is not None else f"#{len(order)}"
            utterances[key] = tags
            order.append(key)
        current_id = None
        tags = []

    with open(path, encoding="utf-8-sig") as handle:
        for line in handle:
            line = line.rstrip("\r\n")
            if not line.strip():
                flush()
            elif line.startswith("# "):
                key, _, value = line[2:].partition(" = ")
                if key == "id":
                    current_id = value
            else:
                tags.append(line.split()[-1])
    flush()
    return utterances, order


def slot_of(tag):
    return "O" if tag == "O" else tag[2:]


def main():
    a, order = read_columns(sys.argv[1])
    b, _ = read_columns(sys.argv[2])
    tags_a, tags_b = [], []
    for key in order:
        other = b.get(key)
        if other is None:
            continue
        if len(other) != len(a[key]):
            sys.exit(f"token count differs in {key}")
        tags_a.extend(a[key])
        tags_b.extend(other)
    result = {
        "tokens": len(tags_a),
        "tag": cohen_kappa_score(tags_a, tags_b),
        "slot": cohen_kappa_score([slot_of(t) for t in tags_a], [slot_of(t) for t in tags_b]),
    }
    print(json.dumps(result))


if __name__ == "__main__":
    main()
