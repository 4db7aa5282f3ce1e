"""Reference truncated SVDs for `npm run bench`: SciPy's svds(solver='propack')
(Larsen's PROPACK, Lanczos bidiagonalisation with partial reorthogonalisation) and
scikit-learn's randomized_svd (Halko, Martinsson & Tropp 2011) on the bench's Matrix
Market files. Prints one JSON object on stdout.

usage: python3 reference.py <file.mtx> <k> [<k> ...]
"""
import json
import os
import sys
import time

os.environ.setdefault("SCIPY_USE_PROPACK", "1")  # SciPy 1.8-1.10 gate PROPACK behind this

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import svds
from sklearn.utils.extmath import randomized_svd


def read_mtx(path):
    """Coordinate real general reader: numpy's C parser, far faster than scipy.io.mmread."""
    with open(path, "rb") as f:
        data = f.read()
    pos = 0
    while data[pos : pos + 1] == b"%":
        pos = data.index(b"\n", pos) + 1
    end = data.index(b"\n", pos)
    rows, cols, nnz = (int(t) for t in data[pos:end].split())
    body = np.array(data[end + 1 :].split(), dtype=np.float64)
    trip = body.reshape(nnz, 3)
    return sp.csr_matrix(
        (trip[:, 2], (trip[:, 0].astype(np.int64) - 1, trip[:, 1].astype(np.int64) - 1)),
        shape=(rows, cols),
    )


def main():
    path = sys.argv[1]
    ks = [int(k) for k in sys.argv[2:]]
    t = time.perf_counter()
    a = read_mtx(path)
    out = {"read_s": time.perf_counter() - t, "rows": a.shape[0], "cols": a.shape[1], "nnz": int(a.nnz), "runs": []}
    for k in ks:
        t = time.perf_counter()
        s_p = svds(a, k=k, solver="propack", return_singular_vectors=True, random_state=0)[1]
        propack_s = time.perf_counter() - t
        t = time.perf_counter()
        s_r = randomized_svd(a, k, n_oversamples=20, n_iter=2, random_state=0)[1]
        randomized_s = time.perf_counter() - t
        out["runs"].append(
            {
                "k": k,
                "propack_s": propack_s,
                "propack_values": sorted(s_p.tolist(), reverse=True),
                "randomized_s": randomized_s,
                "randomized_values": sorted(s_r.tolist(), reverse=True),
            }
        )
    out["versions"] = {"scipy": __import__("scipy").__version__, "sklearn": __import__("sklearn").__version__}
    print(json.dumps(out))


if __name__ == "__main__":
    main()
