#!/usr/bin/python3
"""Write an invented CSV of N paired readings for `make bench-fit`.

Invented data (fictional Larkwater Valley Water Board, a conductivity
probe against reference standards): x from 1 to 500 µS/cm, y = 0.98 x + 0.3
with a scatter that grows with x. Usage: gen_fit_big.py N FILE
"""
import sys

import numpy as np

n, path = int(sys.argv[1]), sys.argv[2]
rng = np.random.default_rng(20261202)
x = 1 + rng.uniform(0, 499, n)
y = 0.98 * x + 0.3 + rng.normal(0, 1, n) * 0.01 * x
with open(path, "w", newline="") as f:
    f.write("standard_uS_cm,probe_uS_cm\n")
    # About 24 bytes a row ("%.6f,%.7f").
    np.savetxt(f, np.column_stack([x, y]), fmt=["%.6f", "%.7f"], delimiter=",")
