"""Reference agreement figures for src/core/agreement, computed by Debian's scikit-learn, NLTK and numpy.

stdin: a JSON list of requests; stdout: a JSON list with one answer per request, in order.
  {"op": "cohen", "a": [labels], "b": [labels]}
      -> sklearn.metrics.cohen_kappa_score(a, b); null when it is NaN (undefined), and null for empty
         input (sklearn raises on it; the caller expects "undefined" there).
  {"op": "nltk", "data": [[coder, item, label], ...], "measures": ["kappa", "pi", "alpha", ...]}
      -> {measure: value} from nltk.metrics.agreement.AnnotationTask; a measure that raises gives
         {"error": message} instead of a number.
  {"op": "percentile", "values": [numbers], "q": [percent, ...]}
      -> numpy.percentile(values, q) (linear interpolation, numpy's default).
Run with /usr/bin/python3 (python3-sklearn, python3-nltk, python3-numpy).
"""

import json
import math
import sys
import warnings

import numpy
from nltk.metrics.agreement import AnnotationTask
from sklearn.metrics import cohen_kappa_score


def finite_or_none(value):
    value = float(value)
    return value if math.isfinite(value) else None


def cohen(request):
    if len(request["a"]) == 0:
        return None
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # sklearn warns when kappa is 0/0; NaN is reported as null
        return finite_or_none(cohen_kappa_score(request["a"], request["b"]))


def nltk_measures(request):
    task = AnnotationTask(data=[tuple(row) for row in request["data"]])
    answer = {}
    for measure in request["measures"]:
        try:
            answer[measure] = finite_or_none(getattr(task, measure)())
        except (ZeroDivisionError, ValueError) as error:
            answer[measure] = {"error": f"{type(error).__name__}: {error}"}
    return answer


def percentile(request):
    return [float(x) for x in numpy.percentile(numpy.array(request["values"], dtype=float), request["q"])]


OPERATIONS = {"cohen": cohen, "nltk": nltk_measures, "percentile": percentile}


def main():
    requests = json.load(sys.stdin)
    json.dump([OPERATIONS[request["op"]](request) for request in requests], sys.stdout)


if __name__ == "__main__":
    main()
