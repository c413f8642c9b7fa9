"""Decode IOB tag sequences with NLTK's conlltags2tree (reference for spansFromTags).

stdin: a JSON list of tag lists. stdout: a JSON list with, per sequence, its spans as
[start, end, slot] (token indices, end exclusive). Run with Debian's /usr/bin/python3 (python3-nltk).
"""

import json
import sys

from nltk.chunk.util import conlltags2tree
from nltk.tree import Tree


def spans_of(tags):
    # Words and part-of-speech tags are placeholders: conlltags2tree reads only the chunk tags.
    tree = conlltags2tree([(f"w{i}", "X", tag) for i, tag in enumerate(tags)])
    spans = []
    position = 0
    for child in tree:
        if isinstance(child, Tree):
            spans.append([position, position + len(child), child.label()])
            position += len(child)
        else:
            position += 1
    if position != len(tags):
        raise SystemExit(f"token count changed: {len(tags)} tags, {position} leaves")
    return spans


def main():
    sequences = json.load(sys.stdin)
    json.dump([spans_of(tags) for tags in sequences], sys.stdout)


if __name__ == "__main__":
    main()
