"""Times the reference computations in SciPy/NumPy on the same matrices as the Loopwright bench.

Reads a JSON file of cases {name, n, A, B, Q, R, poles} from argv[1], prints JSON {name: median_ms}.
Run by test/bench/run.mjs in the same session, so the ratio is measured side by side.
"""
import json
import statistics
import sys
import time

import numpy as np
import scipy.linalg as la
import scipy.signal as sig


def median_ms(fn, repeats):
    """Median process CPU time per call (ms), as on the Loopwright side."""
    fn()  # warm-up
    samples = []
    for _ in range(repeats):
        start = time.process_time()
        fn()
        samples.append((time.process_time() - start) * 1000)
    return statistics.median(samples)


def main():
    cases = json.load(open(sys.argv[1]))
    out = {}
    for case in cases:
        A = np.array(case["A"])
        B = np.array(case["B"])
        n = A.shape[0]
        repeats = case["repeats"]
        kind = case["kind"]
        if kind == "eigenvalues":
            out[case["name"]] = median_ms(lambda: la.eigvals(A), repeats)
        elif kind == "expm":
            out[case["name"]] = median_ms(lambda: la.expm(A), repeats)
        elif kind == "care":
            Q, R = np.eye(n), np.eye(B.shape[1])
            out[case["name"]] = median_ms(lambda: la.solve_continuous_are(A, B, Q, R), repeats)
        elif kind == "dare":
            Q, R = np.eye(n), np.eye(B.shape[1])
            out[case["name"]] = median_ms(lambda: la.solve_discrete_are(A, B, Q, R), repeats)
        elif kind == "placement":
            poles = np.array(case["poles"])
            if case.get("skipScipy"):
                out[case["name"]] = None
            else:
                out[case["name"]] = median_ms(lambda: sig.place_poles(A, B, poles, method="KNV0", maxiter=30), repeats)
        elif kind == "svd":
            out[case["name"]] = median_ms(lambda: la.svdvals(A), repeats)
    try:
        from threadpoolctl import threadpool_info

        out["_blas"] = [f"{i.get('internal_api')} {i.get('version')} {i.get('architecture')} threads={i.get('num_threads')}" for i in threadpool_info()]
    except ImportError:
        out["_blas"] = ["threadpoolctl not installed"]
    print(json.dumps(out))


if __name__ == "__main__":
    main()
