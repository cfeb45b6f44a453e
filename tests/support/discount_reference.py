"""The discount factor f_k(D) of every model of lib/design (docs/mathematics.md, "Discount models"),
shared by the committed fixture generators. Written from the published forms, not from the code:
exponential e^(−kD); hyperbolic 1/(1 + kD) (Mazur 1987); hyperboloid (1 + kD)^(−s); power-delay
1/(1 + k·D^s); exponential-power e^(−k·D^s); quasi-hyperbolic β·e^(−kD) for D > 0 and 1 at D = 0.

`lib` is the numeric module that does the work: numpy (float64 arrays) or mpmath (arbitrary
precision; pass its numbers as mp.mpf). A generator imports it with tests/support on sys.path.
"""
import numpy as np


def discount(model_id, k, D, s=1.0, beta=1.0, lib=np):
    if model_id == 'exponential':
        return lib.exp(-k * D)
    if model_id == 'hyperbolic':
        return 1 / (1 + k * D)
    if model_id == 'hyperboloid':
        return (1 + k * D) ** (-s)
    if model_id == 'power-delay':
        return 1 / (1 + k * D ** s)
    if model_id == 'exponential-power':
        return lib.exp(-k * D ** s)
    if model_id == 'quasi-hyperbolic':
        # D is a single delay here; exp(0·k) is 1 in the caller's own number type
        return lib.exp(0 * k) if D == 0 else beta * lib.exp(-k * D)
    raise ValueError(model_id)
